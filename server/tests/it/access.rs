//! Who may do what: every route of the router's own table (`router::ROUTES`, from
//! which the router is built) against every kind of caller — anonymous, the observer
//! whose record or walk the request names, another observer, a reviewer, an admin —
//! on resources that exist, so a 404 is never taken for "allowed". Then a check that
//! router.rs adds no route outside the table, and sign-in itself: wrong passwords, the
//! rate limits, the timing of unknown names, CSRF, the cookie, signing out, turned-off
//! sign-ins.

use std::time::{Duration, Instant};

use reqwest::multipart::{Form, Part};
use serde_json::{Value, json};
use wrackline_server::router::{Access, ROUTES, RouteSpec};

use crate::helpers::{
    REVIEWER_PASSWORD, Staff, TestApp, plain_jpeg, sign_in, spawn_app, spawn_app_behind_proxy, submission,
};

const RECORD: &str = "6f9a4c2e-1d3b-4e5f-8a7b-9c0d1e2f3a4b";
const OTHER_RECORD: &str = "0b7e6d5c-4b3a-4291-8f7e-6d5c4b3a2910";
const WALK: &str = "7a1b2c3d-4e5f-4a6b-8c7d-9e0f1a2b3c4d";
/// A walk not stored (yet): linking to it is decided by whose record it is alone.
const WALK_NOT_YET_SENT: &str = "7a1b2c3d-4e5f-4a6b-8c7d-000000000001";
/// A sample the matrix may look up and change.
const MATRIX_SAMPLE: &str = "MATRIX-1";
/// A sign-in the matrix may change (role, password, turned on) without locking anyone out.
const MATRIX_PERSON: &str = "matrix-person";

#[derive(Debug, Clone, Copy, PartialEq)]
enum Who {
    Anonymous,
    Owner,
    OtherObserver,
    Reviewer,
    Admin,
    Responder,
}

const EVERYONE: [Who; 6] = [Who::Anonymous, Who::Owner, Who::OtherObserver, Who::Reviewer, Who::Admin, Who::Responder];

/// What each kind of caller must get on a resource that exists and belongs to the owner.
fn allowed(access: Access, who: Who) -> bool {
    match access {
        Access::Public => true,
        Access::Device => matches!(who, Who::Owner | Who::OtherObserver),
        Access::OwnDevice => who == Who::Owner,
        Access::OwnDeviceOrReviewer => matches!(who, Who::Owner | Who::Reviewer | Who::Admin),
        Access::Reviewer => matches!(who, Who::Reviewer | Who::Admin),
        Access::Responder => matches!(who, Who::Responder | Who::Reviewer | Who::Admin),
        Access::Admin => who == Who::Admin,
    }
}

/// The refusal each caller must get: 401 with no identity, 403 with the wrong one.
fn refusal(who: Who) -> u16 {
    if who == Who::Anonymous { 401 } else { 403 }
}

/// Everything the requests name, made before the matrix runs.
struct Fixture {
    owner: String,
    other: String,
    photo: String,
    walk: Value,
}

enum Body {
    None,
    Json(Value),
    /// A multipart form with one JSON part of this name.
    Form(&'static str, Value),
}

fn sample_json(code: &str) -> Value {
    json!({"kind": "vertebrae", "code": code, "preservation": "frozen", "stored_at": "freezer 1", "held_by": "the lab", "notes": null})
}

fn walk_json() -> Value {
    json!({
        "client_id": WALK, "started_at": "2026-04-12T09:00:00+01:00", "ended_at": "2026-04-12T10:00:00+01:00",
        "stretch": "Borth to Ynyslas", "all_finds_reported": true, "track": [], "typed_distance_m": 2000.0, "observer_name": null
    })
}

async fn fixture(app: &TestApp) -> Fixture {
    let (owner, other) = (app.new_device().await, app.new_device().await);
    assert_eq!(app.submit_as(&owner, &submission(RECORD), &[plain_jpeg(3)]).await.status, 200);
    assert_eq!(app.submit_as(&owner, &submission(OTHER_RECORD), &[]).await.status, 200);
    let walk = walk_json();
    assert_eq!(app.post_walk_as(&owner, &walk).await.status, 200);
    // Two earlier years of effort with finds, so the trend routes have three years.
    for (year, finds) in [(2024, 2), (2025, 1)] {
        let id = uuid::Uuid::new_v4();
        let mut earlier = walk_json();
        earlier["client_id"] = json!(id);
        earlier["started_at"] = json!(format!("{year}-04-12T09:00:00+01:00"));
        earlier["ended_at"] = json!(format!("{year}-04-12T10:00:00+01:00"));
        assert_eq!(app.post_walk_as(&owner, &earlier).await.status, 200);
        for _ in 0..finds {
            let mut find = submission(&uuid::Uuid::new_v4().to_string());
            find["observed_at"] = json!(format!("{year}-04-12T09:30:00+01:00"));
            find["walk_client_id"] = json!(id);
            assert_eq!(app.submit_as(&owner, &find, &[]).await.status, 200);
        }
    }
    let record: Value = app.get(&format!("/api/observations/{RECORD}")).await.json().await.unwrap();
    let photo = record["photos"][0]["sha256"].as_str().unwrap().to_owned();
    let admin = staff(app, Who::Admin).await.unwrap();
    let person = json!({"username": MATRIX_PERSON, "role": "reviewer", "display_name": "Matrix", "password": "matrix-person-pass"});
    assert_eq!(
        admin.sign(app.client.post(format!("{}/api/people", app.base))).json(&person).send().await.unwrap().status(),
        200
    );
    let url = format!("{}/api/review/records/{RECORD}/samples", app.base);
    let added = app.reviewer.sign(app.client.post(url)).json(&sample_json(MATRIX_SAMPLE)).send().await.unwrap();
    assert_eq!(added.status(), 200);
    Fixture { owner, other, photo, walk }
}

async fn staff(app: &TestApp, who: Who) -> Option<Staff> {
    let username = match who {
        Who::Reviewer => "test-reviewer",
        Who::Admin => "test-admin",
        Who::Responder => "test-responder",
        _ => return None,
    };
    Some(sign_in(&app.client, &app.base, username, REVIEWER_PASSWORD).await.expect("signs in"))
}

/// A standing merge of two fresh records, for the undo route.
async fn fresh_merge(app: &TestApp) -> i64 {
    let (a, b) = (uuid::Uuid::new_v4().to_string(), uuid::Uuid::new_v4().to_string());
    app.submit(&submission(&a), &[]).await;
    app.submit(&submission(&b), &[]).await;
    let url = format!("{}/api/review/records/{a}/duplicates/{b}", app.base);
    let merged: Value = app
        .reviewer
        .sign(app.client.post(url))
        .json(&json!({"same_animal": true}))
        .send()
        .await
        .unwrap()
        .json()
        .await
        .unwrap();
    merged["merge_id"].as_i64().expect("a merge")
}

/// The path and body that exercise `route` on the owner's resources. A route this
/// does not know fails the test, so a new route gets a request here.
async fn request_for(app: &TestApp, fx: &Fixture, route: &RouteSpec) -> (String, Body) {
    let mut path = route
        .path
        .replace("{client_id}", RECORD)
        .replace("{other_client_id}", OTHER_RECORD)
        .replace("{sha256}", &fx.photo)
        .replace("{username}", MATRIX_PERSON)
        .replace("{code}", MATRIX_SAMPLE);
    if path.contains("{merge_id}") {
        path = path.replace("{merge_id}", &fresh_merge(app).await.to_string());
    }
    let fresh = || uuid::Uuid::new_v4().to_string();
    let body = match (route.method(), route.path) {
        ("GET", "/api/range" | "/api/range/map.svg") => {
            path.push_str("?taxon=Scyliorhinus%20canicula&state=any");
            Body::None
        }
        ("GET", "/api/checklist/nearby") => {
            path.push_str("?lat=52.4153&lon=-4.0829");
            Body::None
        }
        ("GET", "/api/trend" | "/api/trend/chart.svg") => {
            path.push_str("?state=any&generation_length=8");
            Body::None
        }
        ("GET", "/api/export") => {
            path.push_str("?format=csv");
            Body::None
        }
        ("GET", _) | ("DELETE", "/api/session") => Body::None,
        ("POST", "/api/observations") => Body::Form("record", submission(&fresh())),
        ("PUT", "/api/observations/{client_id}/walk") => Body::Json(json!({"walk_client_id": WALK_NOT_YET_SENT})),
        ("POST", "/api/walks") => Body::Json(fx.walk.clone()),
        ("POST", "/api/session") => Body::Json(json!({"username": "test-reviewer", "password": REVIEWER_PASSWORD})),
        ("POST", "/api/devices") => Body::Json(json!({})),
        ("PUT", "/api/my/profile") => Body::Json(json!({"display_name": "Matrix", "contact": null})),
        ("POST", "/api/my/records/{client_id}/replies") => {
            Body::Form("reply", json!({"client_id": fresh(), "message": "matrix"}))
        }
        ("POST", "/api/review/records/{client_id}/actions") => {
            Body::Json(json!({"action": "request_details", "message": "matrix?"}))
        }
        ("POST", "/api/review/records/{client_id}/duplicates/{other_client_id}") => {
            Body::Json(json!({"same_animal": false}))
        }
        ("POST", "/api/review/merges/{merge_id}/undo") => Body::None,
        ("POST", "/api/people") => Body::Json(
            json!({"username": format!("m-{}", &fresh()[..8]), "role": "reviewer", "display_name": "M", "password": "matrix-person-pass"}),
        ),
        ("POST", "/api/review/records/{client_id}/responses") => Body::Json(
            json!({"who_went": "Matrix", "went_at": "2026-04-12T10:00:00+01:00", "outcome": "not_found", "notes": null}),
        ),
        ("POST", "/api/review/records/{client_id}/samples") => Body::Json(sample_json(&format!("M-{}", &fresh()[..8]))),
        ("PUT", "/api/samples/{code}") => Body::Json(sample_json(MATRIX_SAMPLE)),
        ("PUT", "/api/review/records/{client_id}/carcass") => Body::Json(json!({
            "fate": "buried", "examined_at": null, "body_condition": null, "stomach": null, "injuries": null, "notes": null
        })),
        ("PUT", "/api/people/{username}/disabled") => Body::Json(json!({"disabled": false})),
        ("PUT", "/api/people/{username}/role") => Body::Json(json!({"role": "reviewer"})),
        ("PUT", "/api/people/{username}/password") => Body::Json(json!({"password": "matrix-person-pass"})),
        _ => panic!("the access matrix has no request for {route:?}: add one in request_for"),
    };
    (path, body)
}

async fn call(app: &TestApp, fx: &Fixture, route: &RouteSpec, who: Who) -> (u16, String) {
    let (path, body) = request_for(app, fx, route).await;
    let method = reqwest::Method::from_bytes(route.method().as_bytes()).unwrap();
    let mut request = app.client.request(method, format!("{}{path}", app.base));
    request = match body {
        Body::None => request,
        Body::Json(value) => request.json(&value),
        Body::Form(part, value) => request.multipart(Form::new().part(part, Part::text(value.to_string()))),
    };
    match who {
        Who::Owner => request = request.bearer_auth(&fx.owner),
        Who::OtherObserver => request = request.bearer_auth(&fx.other),
        Who::Reviewer | Who::Admin | Who::Responder => request = staff(app, who).await.unwrap().sign(request),
        Who::Anonymous => {}
    }
    let response = request.send().await.unwrap();
    let status = response.status().as_u16();
    (status, response.text().await.unwrap_or_default().chars().take(160).collect())
}

#[tokio::test]
async fn every_route_against_every_caller() {
    let app = spawn_app().await;
    let fx = fixture(&app).await;
    let mut wrong = Vec::new();
    for route in ROUTES {
        for who in EVERYONE {
            let (status, body) = call(&app, &fx, route, who).await;
            let expected = if allowed(route.access, who) {
                "2xx"
            } else if refusal(who) == 401 {
                "401"
            } else {
                "403"
            };
            let fine = match expected {
                "2xx" => (200..300).contains(&status),
                _ => status == refusal(who),
            };
            if !fine {
                wrong.push(format!("{route:?} as {who:?}: {status}, expected {expected}: {body}"));
            }
        }
    }
    assert!(wrong.is_empty(), "access not as the table says:\n{}", wrong.join("\n"));
}

/// router.rs builds the router from `ROUTES` alone: no route, nest, merge or method
/// helper outside the table (a `patch(` or `.nest(` added by hand would slip past the
/// matrix), and the table's handlers use only `on(m, …)`, whose method comes from the
/// table itself.
#[test]
fn the_router_is_built_from_its_table_alone() {
    let source = include_str!("../../src/router.rs");
    let app_body = &source[source.find("pub fn app(").expect("fn app")..];
    let app_body = &app_body[..app_body.find("\n}\n").expect("end of fn app")];
    let routes: Vec<&str> =
        app_body.match_indices(".route(").map(|(at, _)| app_body[at..].lines().next().unwrap()).collect();
    assert_eq!(routes.len(), 2, "only the table's loop and the /api 404 may add routes: {routes:?}");
    assert!(routes.iter().any(|r| r.contains(".route(spec.path, (spec.handler)(spec.verb.filter()))")), "{routes:?}");
    assert!(routes.iter().any(|r| r.contains(".route(\"/api/{*rest}\", any(api_not_found))")), "{routes:?}");
    for forbidden in [".nest(", ".nest_service(", ".merge(", ".route_service(", ".route_layer(", ".fallback("] {
        assert!(!app_body.contains(forbidden), "fn app must not call {forbidden}");
    }
    let table = &source[source.find("pub const ROUTES").expect("ROUTES")..];
    let table = &table[..table.find("\n];").expect("end of ROUTES")];
    // Every call in the table, by the name before its parenthesis.
    let known = ["route", "on", "layer", "max", "RouteSpec"];
    for (at, _) in table.match_indices('(') {
        let name: String = table[..at]
            .chars()
            .rev()
            .take_while(|c| c.is_alphanumeric() || *c == '_')
            .collect::<String>()
            .chars()
            .rev()
            .collect();
        assert!(
            name.is_empty() || known.contains(&name.as_str()),
            "unknown call `{name}(` in ROUTES: only route(…, |m| on(m, handler)) is allowed"
        );
    }
    let entries = table.matches("route(").count();
    assert_eq!(entries, ROUTES.len(), "each table entry is one route(…)");
    // Whitespace and a block are rustfmt's choice: `|m| on(m, …)` or `|m| { on(m, …) }`.
    let squeezed: String = table.split_whitespace().collect();
    let handlers = squeezed.matches("|m|on(m,").count() + squeezed.matches("|m|{on(m,").count();
    assert_eq!(handlers, ROUTES.len(), "each handler is |m| on(m, …)");
}

/// Every method a listed path does not list is refused by the router (405), so a
/// handler cannot answer a method the table does not give it.
#[tokio::test]
async fn methods_not_in_the_table_are_not_answered() {
    let app = spawn_app().await;
    let mut wrong = Vec::new();
    for route in ROUTES {
        let path = route
            .path
            .replace("{client_id}", RECORD)
            .replace("{other_client_id}", OTHER_RECORD)
            .replace("{sha256}", &"0".repeat(64))
            .replace("{username}", "x")
            .replace("{merge_id}", "1");
        for method in ["GET", "POST", "PUT", "DELETE", "PATCH"] {
            if ROUTES.iter().any(|r| r.path == route.path && r.method() == method) {
                continue;
            }
            let request = app
                .client
                .request(reqwest::Method::from_bytes(method.as_bytes()).unwrap(), format!("{}{path}", app.base));
            let status = app.reviewer.sign(request).send().await.unwrap().status().as_u16();
            if status != 405 {
                wrong.push(format!("{method} {path}: {status}"));
            }
        }
    }
    assert!(wrong.is_empty(), "methods answered outside the table:\n{}", wrong.join("\n"));
}

#[tokio::test]
async fn another_observer_sees_nothing_of_a_record_that_is_not_theirs() {
    let app = spawn_app().await;
    let (owner, other) = (app.new_device().await, app.new_device().await);
    app.submit_as(&owner, &submission(RECORD), &[]).await;
    let mine = |token: String| {
        let request = app.client.get(format!("{}/api/my/records", app.base)).bearer_auth(token);
        async move { request.send().await.unwrap().json::<Vec<Value>>().await.unwrap() }
    };
    assert_eq!(mine(owner.clone()).await.len(), 1);
    assert!(mine(other.clone()).await.is_empty());
    let form = Form::new().text("reply", json!({"client_id": OTHER_RECORD, "message": "mine now"}).to_string());
    let response = app
        .client
        .post(format!("{}/api/my/records/{RECORD}/replies", app.base))
        .bearer_auth(other)
        .multipart(form)
        .send()
        .await
        .unwrap();
    assert_eq!(response.status(), 403);
    let view: Value = app.get(&format!("/api/review/records/{RECORD}")).await.json().await.unwrap();
    assert_eq!(view["messages"], json!([]), "nothing was added");
}

#[tokio::test]
async fn sign_in_refuses_wrong_passwords_then_locks_the_name_from_that_address_only() {
    let app = spawn_app_behind_proxy().await;
    for _ in 0..wrackline_server::people::auth::MAX_FAILURES {
        let (status, body) = sign_in(&app.client, &app.base, "test-reviewer", "not the password").await.err().unwrap();
        assert_eq!(status, 401);
        assert!(body["error"].as_str().unwrap().contains("wrong username or password"));
    }
    let (status, body) = sign_in(&app.client, &app.base, "test-reviewer", REVIEWER_PASSWORD).await.err().unwrap();
    assert_eq!(status, 429, "even the right password waits out the lock: {body}");
    assert!(body["error"].as_str().unwrap().contains("try again in 15 minutes"), "{body}");
    // Other names are not locked, and the reviewer can still sign in from elsewhere
    // (the test connects from 127.0.0.1, a trusted proxy here, so the server reads
    // X-Forwarded-For as a reverse proxy on the same machine would set it).
    assert!(sign_in(&app.client, &app.base, "test-admin", REVIEWER_PASSWORD).await.is_ok());
    let elsewhere = app
        .client
        .post(format!("{}/api/session", app.base))
        .header("x-forwarded-for", "198.51.100.7")
        .json(&json!({"username": "test-reviewer", "password": REVIEWER_PASSWORD}))
        .send()
        .await
        .unwrap();
    assert_eq!(elsewhere.status(), 200, "a stranger's failures do not lock the reviewer out everywhere");
}

async fn sign_in_from(app: &TestApp, address: &str, username: &str, password: &str) -> u16 {
    let request = app.client.post(format!("{}/api/session", app.base)).header("x-forwarded-for", address);
    request.json(&json!({"username": username, "password": password})).send().await.unwrap().status().as_u16()
}

#[tokio::test]
async fn one_address_trying_many_names_is_stopped() {
    let app = spawn_app_behind_proxy().await;
    for n in 0..wrackline_server::people::auth::MAX_FAILURES_PER_ADDRESS {
        assert_eq!(sign_in_from(&app, "203.0.113.9", &format!("guess-{n}"), "not the password").await, 401);
    }
    assert_eq!(
        sign_in_from(&app, "203.0.113.9", "test-reviewer", REVIEWER_PASSWORD).await,
        429,
        "this address is out for a while"
    );
    assert_eq!(
        sign_in_from(&app, "203.0.113.10", "test-reviewer", REVIEWER_PASSWORD).await,
        200,
        "other addresses are not"
    );
}

/// Guesses sent in parallel get no more tries than guesses sent one after another: the
/// lock counts a guess before its (slow) password check, not after.
#[tokio::test(flavor = "multi_thread", worker_threads = 4)]
async fn wrong_passwords_sent_at_once_get_no_more_tries_than_the_lock_allows() {
    let app = std::sync::Arc::new(spawn_app_behind_proxy().await);
    let guess = || {
        let app = app.clone();
        async move { sign_in_from(&app, "203.0.113.77", "test-reviewer", "not the password").await }
    };
    let limit = wrackline_server::people::auth::MAX_FAILURES;
    let statuses = crate::helpers::all_at_once((0..3 * limit).map(|_| guess()).collect()).await;
    let tried = statuses.iter().filter(|s| **s == 401).count();
    let refused = statuses.iter().filter(|s| **s == 429).count();
    assert_eq!((tried, refused), (limit, 2 * limit), "{} guesses at once: {statuses:?}", 3 * limit);
}

/// An unknown username costs the same argon2 work as a known one with a wrong
/// password, so the answer's timing does not say which names exist.
#[tokio::test]
async fn unknown_names_take_as_long_as_wrong_passwords() {
    let app = spawn_app_behind_proxy().await;
    let timed = |username: &'static str, address: &'static str| {
        let app = &app;
        async move {
            let started = Instant::now();
            assert_eq!(sign_in_from(app, address, username, "not the password").await, 401);
            started.elapsed()
        }
    };
    let mut known = Vec::new();
    let mut unknown = Vec::new();
    for round in 0..3 {
        let address = ["192.0.2.1", "192.0.2.2", "192.0.2.3"][round];
        known.push(timed("test-reviewer", address).await);
        unknown.push(timed("nobody-by-this-name", address).await);
    }
    known.sort();
    unknown.sort();
    let (known, unknown) = (known[1], unknown[1]);
    assert!(known > Duration::from_millis(5), "argon2 takes a few milliseconds at least: {known:?}");
    assert!(unknown.as_secs_f64() > 0.5 * known.as_secs_f64(), "unknown name {unknown:?} vs wrong password {known:?}");
}

#[tokio::test]
async fn the_session_cookie_is_http_only_and_same_site_and_csrf_is_required() {
    let app = spawn_app().await;
    let response = app
        .client
        .post(format!("{}/api/session", app.base))
        .json(&json!({"username": "test-reviewer", "password": REVIEWER_PASSWORD}))
        .send()
        .await
        .unwrap();
    let cookie = response.headers()["set-cookie"].to_str().unwrap().to_owned();
    assert!(cookie.contains("HttpOnly") && cookie.contains("SameSite=Strict"), "{cookie}");
    assert!(!cookie.contains("Secure"), "plain HTTP (the demo on 127.0.0.1): no Secure flag: {cookie}");
    app.submit(&submission(RECORD), &[]).await;
    let action = json!({"action": "not_confirmable", "reason": "photo too dark"});
    let url = format!("{}/api/review/records/{RECORD}/actions", app.base);
    let without = app.client.post(&url).header("cookie", &app.reviewer.cookie).json(&action).send().await.unwrap();
    assert_eq!(without.status(), 403);
    let wrong = app
        .client
        .post(&url)
        .header("cookie", &app.reviewer.cookie)
        .header("x-csrf-token", "guess")
        .json(&action)
        .send()
        .await
        .unwrap();
    assert_eq!(wrong.status(), 403);
    let right = app.reviewer.sign(app.client.post(&url)).json(&action).send().await.unwrap();
    assert_eq!(right.status(), 200);
}

#[tokio::test]
async fn behind_an_https_proxy_the_cookie_is_secure() {
    let app = spawn_app_behind_proxy().await;
    let response = app
        .client
        .post(format!("{}/api/session", app.base))
        .header("x-forwarded-proto", "https")
        .json(&json!({"username": "test-reviewer", "password": REVIEWER_PASSWORD}))
        .send()
        .await
        .unwrap();
    let cookie = response.headers()["set-cookie"].to_str().unwrap().to_owned();
    assert!(cookie.contains("; Secure"), "{cookie}");
}

#[tokio::test]
async fn signing_out_and_turning_off_end_the_sign_in() {
    let app = spawn_app().await;
    let session = sign_in(&app.client, &app.base, "test-reviewer", REVIEWER_PASSWORD).await.unwrap();
    let out = session.sign(app.client.delete(format!("{}/api/session", app.base))).send().await.unwrap();
    assert_eq!(out.status(), 200);
    assert_eq!(
        session.sign(app.client.get(format!("{}/api/review/queue", app.base))).send().await.unwrap().status(),
        401
    );

    let admin = sign_in(&app.client, &app.base, "test-admin", REVIEWER_PASSWORD).await.unwrap();
    let off = admin
        .sign(app.client.put(format!("{}/api/people/test-reviewer/disabled", app.base)))
        .json(&json!({"disabled": true}))
        .send()
        .await
        .unwrap();
    assert_eq!(off.status(), 200);
    assert_eq!(app.get("/api/review/queue").await.status(), 401, "its sessions ended");
    assert_eq!(sign_in(&app.client, &app.base, "test-reviewer", REVIEWER_PASSWORD).await.err().unwrap().0, 401);
    let people: Vec<Value> =
        admin.sign(app.client.get(format!("{}/api/people", app.base))).send().await.unwrap().json().await.unwrap();
    let listed = serde_json::to_string(&people).unwrap();
    assert!(listed.contains("test-reviewer") && !listed.contains("argon2"), "no hashes leave the server: {listed}");
}

#[tokio::test]
async fn a_second_tab_with_only_the_cookie_gets_the_csrf_token_back_and_can_act_and_sign_out() {
    // A second tab or a restarted browser keeps the cookie but not the token the sign-in
    // returned; `GET /api/session` gives it back (never cached), and it works.
    let app = spawn_app().await;
    app.submit(&submission(RECORD), &[]).await;
    let session = app.client.get(format!("{}/api/session", app.base)).header("cookie", &app.reviewer.cookie);
    let answer = session.send().await.unwrap();
    assert_eq!(answer.headers()["cache-control"], "no-store");
    let body: Value = answer.json().await.unwrap();
    assert_eq!(body["signed_in"], true);
    let recovered = body["csrf_token"].as_str().expect("the session's CSRF token").to_owned();
    assert_eq!(recovered, app.reviewer.csrf, "the same token the sign-in returned");
    let action = json!({"action": "request_details", "message": "Which beach?"});
    let url = format!("{}/api/review/records/{RECORD}/actions", app.base);
    let with = |request: reqwest::RequestBuilder| {
        request.header("cookie", &app.reviewer.cookie).header("x-csrf-token", &recovered)
    };
    assert_eq!(with(app.client.post(&url)).json(&action).send().await.unwrap().status(), 200);
    let out = with(app.client.delete(format!("{}/api/session", app.base))).send().await.unwrap();
    assert_eq!(out.status(), 200);
    // Signed out, the token gives nothing: no session, no token.
    let after: Value = app.client.get(format!("{}/api/session", app.base)).send().await.unwrap().json().await.unwrap();
    assert_eq!((after["signed_in"].as_bool(), after.get("csrf_token")), (Some(false), None));
    // Nobody without the cookie learns a token.
    let phone = app.new_device().await;
    let as_phone: Value = app
        .client
        .get(format!("{}/api/session", app.base))
        .bearer_auth(&phone)
        .send()
        .await
        .unwrap()
        .json()
        .await
        .unwrap();
    assert_eq!(as_phone["csrf_token"], Value::Null);
}

/// The sample register rides on `/api/export`: its public form is for anyone, its full form
/// (storage, holders, sensitive species as recorded) for reviewers and admins only.
#[tokio::test]
async fn the_full_sample_register_is_for_reviewers_and_admins_only() {
    let app = spawn_app().await;
    let fx = fixture(&app).await;
    let mut wrong = Vec::new();
    for who in EVERYONE {
        for (query, allowed_here) in [
            ("format=samples&state=any", true),
            ("format=samples&audience=full&state=any", matches!(who, Who::Reviewer | Who::Admin)),
        ] {
            let mut request = app.client.get(format!("{}/api/export?{query}", app.base));
            request = match who {
                Who::Owner => request.bearer_auth(&fx.owner),
                Who::OtherObserver => request.bearer_auth(&fx.other),
                Who::Reviewer | Who::Admin | Who::Responder => staff(&app, who).await.unwrap().sign(request),
                Who::Anonymous => request,
            };
            let response = request.send().await.unwrap();
            let status = response.status().as_u16();
            let body = response.text().await.unwrap(); // The full register says where the sample is kept.
            let fine = if allowed_here {
                status == 200 && (!query.contains("full") || body.contains("freezer 1"))
            } else {
                status == 403 && body.contains("reviewers and admins") && !body.contains(MATRIX_SAMPLE)
            };
            if !fine {
                wrong.push(format!("{query} as {who:?}: {status} {}", body.chars().take(160).collect::<String>()));
            }
        }
    }
    assert!(wrong.is_empty(), "{}", wrong.join("\n"));
}
