//! People with a sign-in: `wrackline user add` on a real data directory (the binary
//! itself), the admin changing a role and resetting a password — each in the audit
//! trail — and an observer's name and contact, shown to reviewers on the record and sent nowhere else.

use std::io::Write as _;
use std::process::{Command, Stdio};

use serde_json::{Value, json};

use crate::helpers::{REVIEWER_PASSWORD, Staff, TestApp, sign_in, spawn_app, submission};

fn wrackline(data_dir: &std::path::Path) -> Command {
    let mut command = Command::new(env!("CARGO_BIN_EXE_wrackline"));
    command.arg("--data-dir").arg(data_dir).env_remove("WRACKLINE_PASSWORD");
    command
}

/// Serves `data_dir` on 127.0.0.1:0 in this process; the address.
async fn serve(data_dir: &std::path::Path) -> String {
    let state = wrackline_server::AppState::open(data_dir, None, wrackline_server::taxa::load_checklist(None).unwrap())
        .unwrap();
    let listener = tokio::net::TcpListener::bind("127.0.0.1:0").await.unwrap();
    let base = format!("http://{}", listener.local_addr().unwrap());
    tokio::spawn(async move { axum::serve(listener, wrackline_server::app(state)).await.unwrap() });
    base
}

#[tokio::test]
async fn user_add_makes_a_sign_in_that_works_and_refuses_bad_input_by_name() {
    let dir = tempfile::tempdir().unwrap();
    let added = wrackline(dir.path())
        .args(["user", "add", "--username", "Gwen", "--role", "reviewer", "--display-name", "Gwen Morgan"])
        .env("WRACKLINE_PASSWORD", "strandline-2026")
        .output()
        .unwrap();
    assert!(added.status.success(), "{}", String::from_utf8_lossy(&added.stderr));
    assert_eq!(String::from_utf8_lossy(&added.stdout).trim(), "added Gwen (reviewer)");

    // The password from standard input when WRACKLINE_PASSWORD is not set.
    let mut child = wrackline(dir.path())
        .args(["user", "add", "--username", "ifor", "--role", "admin"])
        .stdin(Stdio::piped())
        .stdout(Stdio::piped())
        .spawn()
        .unwrap();
    child.stdin.take().unwrap().write_all(b"a long enough one\n").unwrap();
    assert!(child.wait_with_output().unwrap().status.success());

    let short = wrackline(dir.path())
        .args(["user", "add", "--username", "nia", "--role", "reviewer"])
        .env("WRACKLINE_PASSWORD", "short")
        .output()
        .unwrap();
    assert!(!short.status.success());
    assert!(String::from_utf8_lossy(&short.stderr).contains("password"), "{}", String::from_utf8_lossy(&short.stderr));
    let taken = wrackline(dir.path())
        .args(["user", "add", "--username", "gwen", "--role", "admin"])
        .env("WRACKLINE_PASSWORD", "strandline-2026")
        .output()
        .unwrap();
    assert!(!taken.status.success());
    assert!(String::from_utf8_lossy(&taken.stderr).contains("taken"), "{}", String::from_utf8_lossy(&taken.stderr));

    let listed = wrackline(dir.path()).args(["user", "list"]).output().unwrap();
    let listed = String::from_utf8_lossy(&listed.stdout);
    assert!(
        listed.contains("gwen reviewer Gwen Morgan") && listed.contains("ifor admin ifor") && !listed.contains("nia"),
        "{listed}"
    );

    let base = serve(dir.path()).await;
    let client = reqwest::Client::new();
    let gwen = sign_in(&client, &base, "gwen", "strandline-2026").await.expect("the reviewer signs in");
    assert_eq!(gwen.sign(client.get(format!("{base}/api/review/queue"))).send().await.unwrap().status(), 200);
    assert_eq!(
        gwen.sign(client.get(format!("{base}/api/people"))).send().await.unwrap().status(),
        403,
        "a reviewer, not an admin"
    );
    let ifor = sign_in(&client, &base, "ifor", "a long enough one").await.expect("the admin signs in");
    let events: Vec<Value> =
        ifor.sign(client.get(format!("{base}/api/people/events"))).send().await.unwrap().json().await.unwrap();
    let added: Vec<(&str, &str, &Value)> =
        events.iter().map(|e| (e["username"].as_str().unwrap(), e["action"].as_str().unwrap(), &e["by"])).collect();
    assert_eq!(
        added,
        [("ifor", "added", &Value::Null), ("gwen", "added", &Value::Null)],
        "added on the server: no admin named"
    );
}

async fn admin_call(app: &TestApp, admin: &Staff, path: &str, body: Value) -> (u16, Value) {
    let response = admin.sign(app.client.put(format!("{}{path}", app.base))).json(&body).send().await.unwrap();
    (response.status().as_u16(), response.json().await.unwrap_or(Value::Null))
}

#[tokio::test]
async fn an_admin_changes_a_role_and_resets_a_password_and_both_are_audited() {
    let app = spawn_app().await;
    let admin = sign_in(&app.client, &app.base, "test-admin", REVIEWER_PASSWORD).await.unwrap();
    let reviewer = sign_in(&app.client, &app.base, "test-reviewer", REVIEWER_PASSWORD).await.unwrap();
    let people = |who: &Staff| who.sign(app.client.get(format!("{}/api/people", app.base))).send();
    assert_eq!(people(&reviewer).await.unwrap().status(), 403);

    assert_eq!(admin_call(&app, &admin, "/api/people/test-reviewer/role", json!({"role": "admin"})).await.0, 200);
    assert_eq!(people(&reviewer).await.unwrap().status(), 200, "the new role applies to the sign-in at once");
    let (status, body) = admin_call(&app, &admin, "/api/people/test-admin/role", json!({"role": "reviewer"})).await;
    assert_eq!(status, 409, "not one's own role: {body}");
    assert_eq!(admin_call(&app, &admin, "/api/people/test-reviewer/role", json!({"role": "observer"})).await.0, 422);
    assert_eq!(admin_call(&app, &admin, "/api/people/nobody/role", json!({"role": "admin"})).await.0, 404);
    assert_eq!(admin_call(&app, &admin, "/api/people/test-reviewer/role", json!({"role": "reviewer"})).await.0, 200);

    let (status, body) =
        admin_call(&app, &admin, "/api/people/test-reviewer/password", json!({"password": "short"})).await;
    assert_eq!((status, body["field"].as_str()), (422, Some("password")));
    assert_eq!(
        admin_call(&app, &admin, "/api/people/test-reviewer/password", json!({"password": "a fresh password"})).await.0,
        200
    );
    assert_eq!(people(&reviewer).await.unwrap().status(), 401, "a reset ends the person's sessions");
    assert_eq!(
        sign_in(&app.client, &app.base, "test-reviewer", REVIEWER_PASSWORD).await.err().unwrap().0,
        401,
        "the old password is gone"
    );
    assert!(sign_in(&app.client, &app.base, "test-reviewer", "a fresh password").await.is_ok());

    let events: Vec<Value> = admin
        .sign(app.client.get(format!("{}/api/people/events", app.base)))
        .send()
        .await
        .unwrap()
        .json()
        .await
        .unwrap();
    let trail: Vec<(&str, &str, Option<&str>, Option<&str>)> = events
        .iter()
        .take(3)
        .map(|e| {
            (e["username"].as_str().unwrap(), e["action"].as_str().unwrap(), e["detail"].as_str(), e["by"].as_str())
        })
        .collect();
    assert_eq!(
        trail,
        [
            ("test-reviewer", "password_reset", Some("sessions ended"), Some("test-admin")),
            ("test-reviewer", "role_changed", Some("admin → reviewer"), Some("test-admin")),
            ("test-reviewer", "role_changed", Some("reviewer → admin"), Some("test-admin")),
        ],
        "newest first; refusals leave no row"
    );
    assert!(events.iter().all(|e| e["at"].is_string()));
    assert!(!serde_json::to_string(&events).unwrap().contains("fresh password"), "no password in the trail");
}

#[tokio::test]
async fn an_observers_contact_is_shown_to_reviewers_on_the_record_and_sent_nowhere_else() {
    let app = spawn_app().await;
    let phone = app.new_device().await;
    let record = "6f9a4c2e-1d3b-4e5f-8a7b-9c0d1e2f3a4b";
    app.submit_as(&phone, &submission(record), &[]).await;
    let saved = app
        .client
        .put(format!("{}/api/my/profile", app.base))
        .bearer_auth(&phone)
        .json(&json!({"display_name": "Gwen", "contact": "gwen@example.org"}))
        .send()
        .await
        .unwrap();
    assert_eq!(saved.status(), 200);
    assert_eq!(saved.json::<Value>().await.unwrap()["contact_given"], true);
    let anonymous = app
        .client
        .put(format!("{}/api/my/profile", app.base))
        .json(&json!({"display_name": "X", "contact": null}))
        .send()
        .await
        .unwrap();
    assert_eq!(anonymous.status(), 401);

    // The reviewer deciding on the record sees who to ask.
    let detail: Value = app.get(&format!("/api/review/records/{record}")).await.json().await.unwrap();
    assert_eq!(detail["observer"], json!({"display_name": "Gwen", "contact": "gwen@example.org"}));
    let mut seen = String::new();
    for path in [
        "/api/observations".to_owned(),
        "/api/review/queue".into(),
        "/api/export?format=csv&state=any".into(),
        "/api/export?format=geojson&state=any".into(),
        "/api/export?format=csv&audience=full&state=any".into(),
    ] {
        seen.push_str(&app.get(&path).await.text().await.unwrap());
    }
    seen.push_str(
        &app.client
            .get(format!("{}/api/my/records", app.base))
            .bearer_auth(&phone)
            .send()
            .await
            .unwrap()
            .text()
            .await
            .unwrap(),
    );
    assert!(!seen.contains("gwen@example.org"), "the contact left the server");
    let database = rusqlite::Connection::open(app.data_dir.join("wrackline.sqlite3")).unwrap();
    let kept: String =
        database.query_row("SELECT contact FROM people WHERE display_name = 'Gwen'", [], |row| row.get(0)).unwrap();
    assert_eq!(kept, "gwen@example.org", "kept for reviewers on the server");
}
