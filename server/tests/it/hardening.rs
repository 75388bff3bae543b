//! What a browser, a proxy or a stranger's page can and cannot make the server do:
//! security headers on every answer, the origin check on every state-changing request,
//! sign-in as JSON only, links under the configured public address (never the `Host`
//! header), `X-Forwarded-For` believed only from trusted proxies, and `Retry-After` on 429.

use reqwest::header::{CONTENT_TYPE, HOST, ORIGIN, SET_COOKIE};
use serde_json::{Value, json};
use wrackline_server::settings::{PublicUrl, Settings};

use crate::helpers::{
    REVIEWER_PASSWORD, TestApp, plain_jpeg, spawn_app, spawn_app_behind_proxy, spawn_app_with, spawn_app_with_settings,
    submission,
};

const STRANGER: &str = "https://evil.example";
const RECORD: &str = "4a4d0000-0000-4000-8000-000000000001";

fn sign_in_body() -> String {
    json!({"username": "test-reviewer", "password": REVIEWER_PASSWORD}).to_string()
}

#[tokio::test]
async fn every_answer_carries_the_security_headers() {
    let dir = tempfile::tempdir().unwrap();
    std::fs::write(dir.path().join("index.html"), "<!doctype html><title>app</title>").unwrap();
    let app = spawn_app_with(Some(dir.path().to_owned())).await;
    for path in ["/", "/index.html", "/some/deep/link", "/api/checklist", "/api/nothing-here", "/api/review/queue"] {
        let response = app.client.get(format!("{}{path}", app.base)).send().await.unwrap();
        let headers = response.headers();
        let policy = headers["content-security-policy"].to_str().unwrap();
        // CSP Level 3 (W3C): own-origin scripts, WebAssembly compiled under 'wasm-unsafe-eval', no framing.
        for directive in [
            "default-src 'self'",
            "script-src 'self' 'wasm-unsafe-eval'",
            "frame-ancestors 'none'",
            "object-src 'none'",
        ] {
            assert!(policy.contains(directive), "{path}: {directive} in {policy}");
        }
        assert!(!policy.contains("unsafe-inline") && !policy.contains("'unsafe-eval'"), "{path}: {policy}");
        assert_eq!(headers["x-content-type-options"], "nosniff", "{path}");
        assert_eq!(headers["x-frame-options"], "DENY", "{path}");
        assert_eq!(headers["referrer-policy"], "no-referrer", "{path}");
    }
}

#[tokio::test]
async fn a_state_changing_request_from_another_origin_is_refused() {
    let app = spawn_app().await;
    let post = |path: &str, origin: Option<&str>| {
        let mut request = app.client.post(format!("{}{path}", app.base)).header(CONTENT_TYPE, "application/json");
        if let Some(origin) = origin {
            request = request.header(ORIGIN, origin);
        }
        request
    };
    // Sign-in (login CSRF) and a new phone identity, from a stranger's page.
    let signed_in = post("/api/session", Some(STRANGER)).body(sign_in_body()).send().await.unwrap();
    assert_eq!(signed_in.status(), 403);
    assert!(signed_in.headers().get(SET_COOKIE).is_none(), "no session for a forged sign-in");
    let body: Value = signed_in.json().await.unwrap();
    assert!(body["error"].as_str().unwrap().contains(STRANGER), "{body}");
    assert_eq!(post("/api/devices", Some(STRANGER)).body("{}").send().await.unwrap().status(), 403);
    assert_eq!(post("/api/devices", Some("null")).body("{}").send().await.unwrap().status(), 403, "an opaque origin");
    let marked = post("/api/devices", None).header("sec-fetch-site", "cross-site").body("{}").send().await.unwrap();
    assert_eq!(marked.status(), 403, "a browser's own mark of a cross-site request");
    // A reviewer's decision carrying the right CSRF token but sent from another site.
    app.submit(&submission(RECORD), &[]).await;
    let action = json!({"action": "not_confirmable", "reason": "photo too dark"});
    let url = format!("{}/api/review/records/{RECORD}/actions", app.base);
    let forged = app.reviewer.sign(app.client.post(&url)).header(ORIGIN, STRANGER).json(&action).send().await.unwrap();
    assert_eq!(forged.status(), 403);
    assert_eq!(app.records().await[0]["review_state"], "awaiting_review", "nothing changed");
    // The same requests from the server's own page, and from a script with no page at all, pass.
    let own = post("/api/session", Some(app.base.as_str())).body(sign_in_body()).send().await.unwrap();
    assert_eq!(own.status(), 200);
    assert_eq!(post("/api/devices", None).body("{}").send().await.unwrap().status(), 200);
    let decided = app.reviewer.sign(app.client.post(&url)).header(ORIGIN, app.base.as_str()).json(&action).send();
    assert_eq!(decided.await.unwrap().status(), 200);
    // Reading is not changing: a stranger's page may read what is public.
    let read = app.client.get(format!("{}/api/checklist", app.base)).header(ORIGIN, STRANGER).send().await.unwrap();
    assert_eq!(read.status(), 200);
}

#[tokio::test]
async fn sign_in_takes_json_only() {
    let app = spawn_app().await;
    for media_type in ["text/plain", "application/x-www-form-urlencoded", "multipart/form-data; boundary=x"] {
        let response = app
            .client
            .post(format!("{}/api/session", app.base))
            .header(CONTENT_TYPE, media_type)
            .body(sign_in_body())
            .send()
            .await
            .unwrap();
        assert_eq!(response.status(), 415, "{media_type}");
        assert!(response.headers().get(SET_COOKIE).is_none(), "{media_type}");
        let body: Value = response.json().await.unwrap();
        assert!(body["error"].as_str().unwrap().contains("application/json"), "{body}");
    }
    let json =
        app.client.post(format!("{}/api/session", app.base)).header(CONTENT_TYPE, "application/json; charset=utf-8");
    assert_eq!(json.body(sign_in_body()).send().await.unwrap().status(), 200);
}

#[tokio::test]
async fn links_point_under_the_configured_public_address_never_the_host_header() {
    let settings =
        Settings { public_url: Some(PublicUrl::parse("https://records.example.org").unwrap()), ..Default::default() };
    let app = spawn_app_with_settings(settings).await;
    assert_eq!(app.submit(&submission(RECORD), &[plain_jpeg(3)]).await.status, 200);
    app.confirm(RECORD, "Scyliorhinus canicula", "species").await;
    let csv = app
        .client
        .get(format!("{}/api/export?format=csv", app.base))
        .header(HOST, "evil.example")
        .send()
        .await
        .unwrap()
        .text()
        .await
        .unwrap();
    assert!(csv.contains("https://records.example.org/photos/"), "{csv}");
    assert!(!csv.contains("evil.example"), "the Host header is never copied into a link");
    // People reach it over HTTPS, so the session cookie is Secure.
    let signed_in = app
        .client
        .post(format!("{}/api/session", app.base))
        .header(CONTENT_TYPE, "application/json")
        .body(sign_in_body())
        .send()
        .await
        .unwrap();
    assert!(signed_in.headers()[SET_COOKIE].to_str().unwrap().contains("; Secure"));
}

/// Fails `MAX_FAILURES` sign-ins for the reviewer, each claiming another address.
async fn fail_from_many_claimed_addresses(app: &TestApp, claimed: impl Fn(usize) -> String) {
    for n in 0..wrackline_server::people::auth::MAX_FAILURES {
        let response = app
            .client
            .post(format!("{}/api/session", app.base))
            .header("x-forwarded-for", claimed(n))
            .json(&json!({"username": "test-reviewer", "password": "not the password"}))
            .send()
            .await
            .unwrap();
        assert_eq!(response.status(), 401);
    }
}

async fn sign_in_claiming(app: &TestApp, forwarded: &str) -> reqwest::Response {
    app.client
        .post(format!("{}/api/session", app.base))
        .header("x-forwarded-for", forwarded)
        .header("x-forwarded-proto", "https")
        .json(&json!({"username": "test-reviewer", "password": REVIEWER_PASSWORD}))
        .send()
        .await
        .unwrap()
}

#[tokio::test]
async fn x_forwarded_for_from_a_peer_that_is_no_trusted_proxy_is_ignored() {
    let app = spawn_app().await;
    // Rotating the header does not make a guesser into many addresses: they are all 127.0.0.1.
    fail_from_many_claimed_addresses(&app, |n| format!("198.51.100.{n}")).await;
    let locked = sign_in_claiming(&app, "203.0.113.200").await;
    assert_eq!(locked.status(), 429, "the claimed address changed nothing");
    // RFC 9110 §10.2.3: Retry-After in seconds; the lock lasts at most the 15-minute window.
    let wait: u64 = locked.headers()["retry-after"].to_str().unwrap().parse().unwrap();
    assert!((1..=15 * 60).contains(&wait), "{wait}");
    // And X-Forwarded-Proto from a stranger does not mark the cookie Secure.
    let other = spawn_app().await;
    let response = sign_in_claiming(&other, "203.0.113.200").await;
    assert!(!response.headers()[SET_COOKIE].to_str().unwrap().contains("Secure"));
}

#[tokio::test]
async fn behind_a_trusted_proxy_the_client_is_the_last_address_it_did_not_add_itself() {
    let app = spawn_app_behind_proxy().await;
    // The proxy (127.0.0.1) appends the address it saw; what the client put in front is its own claim.
    fail_from_many_claimed_addresses(&app, |n| format!("10.0.0.{n}, 203.0.113.5")).await;
    assert_eq!(sign_in_claiming(&app, "192.0.2.99, 203.0.113.5").await.status(), 429, "still 203.0.113.5");
    let elsewhere = sign_in_claiming(&app, "203.0.113.6, 127.0.0.1").await;
    assert_eq!(elsewhere.status(), 200, "a trusted proxy in the chain is skipped: the client is 203.0.113.6");
    assert!(elsewhere.headers()[SET_COOKIE].to_str().unwrap().contains("; Secure"), "the proxy said HTTPS");
}
