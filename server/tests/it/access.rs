//! Who may do what: every route against every kind of caller (anonymous, the
//! observer who made the record, another observer, a reviewer, an admin), taken from
//! the router's own table — and a check that the table lists every route the router
//! file declares, so a new route cannot be left out of the matrix. Then sign-in itself:
//! wrong passwords, the rate limit, CSRF, signing out, turned-off sign-ins.

use serde_json::{Value, json};
use wrackline_server::router::{Access, ROUTES};

use crate::helpers::{REVIEWER_PASSWORD, Staff, TestApp, sign_in, spawn_app, submission};

const RECORD: &str = "6f9a4c2e-1d3b-4e5f-8a7b-9c0d1e2f3a4b";

/// `(method, path)` of every `.route(...)` call in router.rs, read from its source.
fn routes_in_router_source() -> Vec<(String, String)> {
    let source = include_str!("../../src/router.rs");
    let body = &source[source.find("pub fn app(").expect("fn app")..];
    let mut found = Vec::new();
    for (start, _) in body.match_indices(".route(") {
        let call = balanced(&body[start + ".route(".len()..]);
        let path = call.split('"').nth(1).expect("a path literal").to_owned();
        for (needle, method) in [("get(", "GET"), ("post(", "POST"), ("put(", "PUT"), ("delete(", "DELETE")] {
            let bytes = call.as_bytes();
            let mentioned = call.match_indices(needle).any(|(at, _)| at == 0 || !(bytes[at - 1].is_ascii_alphanumeric() || bytes[at - 1] == b'_'));
            if mentioned && !path.contains("{*rest}") {
                found.push((method.to_owned(), path.clone()));
            }
        }
    }
    found.sort();
    found
}

/// The text up to the parenthesis that closes the one just opened.
fn balanced(text: &str) -> &str {
    let mut depth = 1;
    for (at, c) in text.char_indices() {
        match c {
            '(' => depth += 1,
            ')' => {
                depth -= 1;
                if depth == 0 {
                    return &text[..at];
                }
            }
            _ => {}
        }
    }
    text
}

#[test]
fn the_access_table_lists_every_route_of_the_router() {
    let mut table: Vec<(String, String)> = ROUTES.iter().map(|r| (r.method.to_owned(), r.path.to_owned())).collect();
    table.sort();
    assert_eq!(table, routes_in_router_source(), "router.rs and its ROUTES table disagree");
}

#[derive(Debug, Clone, Copy, PartialEq)]
enum Who {
    Anonymous,
    Owner,
    OtherObserver,
    Reviewer,
    Admin,
}

fn allowed(access: Access, who: Who) -> bool {
    match access {
        Access::Public => true,
        Access::Observer => matches!(who, Who::Owner | Who::OtherObserver),
        Access::Reviewer => matches!(who, Who::Reviewer | Who::Admin),
        Access::Admin => who == Who::Admin,
    }
}

struct Callers {
    owner: String,
    other: String,
}

async fn staff(app: &TestApp, who: Who) -> Option<Staff> {
    let username = match who {
        Who::Reviewer => "test-reviewer",
        Who::Admin => "test-admin",
        _ => return None,
    };
    Some(sign_in(&app.client, &app.base, username, REVIEWER_PASSWORD).await.expect("signs in"))
}

async fn call(app: &TestApp, callers: &Callers, method: &str, path: &str, who: Who) -> u16 {
    let url = format!("{}{}", app.base, path.replace("{client_id}", RECORD).replace("{username}", "nobody-here").replace("{sha256}", &"0".repeat(64)).replace("{other_client_id}", "0b7e6d5c-4b3a-4291-8f7e-6d5c4b3a2910").replace("{merge_id}", "1"));
    let method = reqwest::Method::from_bytes(method.as_bytes()).unwrap();
    let mut request = app.client.request(method, url).header("content-type", "application/json").body("{}");
    match who {
        Who::Owner => request = request.bearer_auth(&callers.owner),
        Who::OtherObserver => request = request.bearer_auth(&callers.other),
        Who::Reviewer | Who::Admin => request = staff(app, who).await.unwrap().sign(request),
        Who::Anonymous => {}
    }
    request.send().await.unwrap().status().as_u16()
}

#[tokio::test]
async fn every_route_against_every_caller() {
    let app = spawn_app().await;
    let callers = Callers { owner: app.new_device().await, other: app.new_device().await };
    assert_eq!(app.submit_as(&callers.owner, &submission(RECORD), &[]).await.status, 200);
    let mut wrong = Vec::new();
    for route in ROUTES {
        for who in [Who::Anonymous, Who::Owner, Who::OtherObserver, Who::Reviewer, Who::Admin] {
            let status = call(&app, &callers, route.method, route.path, who).await;
            let refused = status == 401 || status == 403;
            if refused == allowed(route.access, who) {
                wrong.push(format!("{} {} as {who:?}: {status}", route.method, route.path));
            }
        }
    }
    assert!(wrong.is_empty(), "access not as the table says:\n{}", wrong.join("\n"));
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
    let form = reqwest::multipart::Form::new().text("reply", json!({"client_id": "0b7e6d5c-4b3a-4291-8f7e-6d5c4b3a2910", "message": "mine now"}).to_string());
    let response = app.client.post(format!("{}/api/my/records/{RECORD}/replies", app.base)).bearer_auth(other).multipart(form).send().await.unwrap();
    assert_eq!(response.status(), 404);
}

#[tokio::test]
async fn sign_in_refuses_wrong_passwords_then_locks_the_name_for_a_while() {
    let app = spawn_app().await;
    for _ in 0..wrackline_server::auth::MAX_FAILURES {
        let (status, body) = sign_in(&app.client, &app.base, "test-reviewer", "not the password").await.err().unwrap();
        assert_eq!(status, 401);
        assert!(body["error"].as_str().unwrap().contains("wrong username or password"));
    }
    let (status, body) = sign_in(&app.client, &app.base, "test-reviewer", REVIEWER_PASSWORD).await.err().unwrap();
    assert_eq!(status, 429, "even the right password waits out the lock: {body}");
    assert!(body["error"].as_str().unwrap().contains("try again in 15 minutes"), "{body}");
    // Other names are not locked.
    assert!(sign_in(&app.client, &app.base, "test-admin", REVIEWER_PASSWORD).await.is_ok());
}

#[tokio::test]
async fn the_session_cookie_is_http_only_and_same_site_and_csrf_is_required() {
    let app = spawn_app().await;
    let response = app.client.post(format!("{}/api/session", app.base)).json(&json!({"username": "test-reviewer", "password": REVIEWER_PASSWORD})).send().await.unwrap();
    let cookie = response.headers()["set-cookie"].to_str().unwrap().to_owned();
    assert!(cookie.contains("HttpOnly") && cookie.contains("SameSite=Strict"), "{cookie}");
    app.submit(&submission(RECORD), &[]).await;
    let action = json!({"action": "not_confirmable", "reason": "photo too dark"});
    let url = format!("{}/api/review/records/{RECORD}/actions", app.base);
    let without = app.client.post(&url).header("cookie", &app.reviewer.cookie).json(&action).send().await.unwrap();
    assert_eq!(without.status(), 403);
    let wrong = app.client.post(&url).header("cookie", &app.reviewer.cookie).header("x-csrf-token", "guess").json(&action).send().await.unwrap();
    assert_eq!(wrong.status(), 403);
    let right = app.reviewer.sign(app.client.post(&url)).json(&action).send().await.unwrap();
    assert_eq!(right.status(), 200);
}

#[tokio::test]
async fn signing_out_and_turning_off_end_the_sign_in() {
    let app = spawn_app().await;
    let session = sign_in(&app.client, &app.base, "test-reviewer", REVIEWER_PASSWORD).await.unwrap();
    let out = session.sign(app.client.delete(format!("{}/api/session", app.base))).send().await.unwrap();
    assert_eq!(out.status(), 200);
    assert_eq!(session.sign(app.client.get(format!("{}/api/review/queue", app.base))).send().await.unwrap().status(), 401);

    let admin = sign_in(&app.client, &app.base, "test-admin", REVIEWER_PASSWORD).await.unwrap();
    let off = admin.sign(app.client.put(format!("{}/api/people/test-reviewer/disabled", app.base))).json(&json!({"disabled": true})).send().await.unwrap();
    assert_eq!(off.status(), 200);
    assert_eq!(app.get("/api/review/queue").await.status(), 401, "its sessions ended");
    assert_eq!(sign_in(&app.client, &app.base, "test-reviewer", REVIEWER_PASSWORD).await.err().unwrap().0, 401);
    let people: Vec<Value> = admin.sign(app.client.get(format!("{}/api/people", app.base))).send().await.unwrap().json().await.unwrap();
    let listed = serde_json::to_string(&people).unwrap();
    assert!(listed.contains("test-reviewer") && !listed.contains("argon2"), "no hashes leave the server: {listed}");
}

#[tokio::test]
async fn an_admin_adds_a_reviewer_who_can_then_sign_in() {
    let app = spawn_app().await;
    let admin = sign_in(&app.client, &app.base, "test-admin", REVIEWER_PASSWORD).await.unwrap();
    let add = |body: Value| admin.sign(app.client.post(format!("{}/api/people", app.base))).json(&body).send();
    let short = add(json!({"username": "gwen", "role": "reviewer", "display_name": "Gwen", "password": "short"})).await.unwrap();
    assert_eq!(short.status(), 422);
    let added = add(json!({"username": "gwen", "role": "reviewer", "display_name": "Gwen", "password": "a long enough one"})).await.unwrap();
    assert_eq!(added.status(), 200);
    let again = add(json!({"username": "gwen", "role": "reviewer", "display_name": "Gwen", "password": "a long enough one"})).await.unwrap();
    assert_eq!(again.status(), 409);
    assert!(sign_in(&app.client, &app.base, "gwen", "a long enough one").await.is_ok());
}
