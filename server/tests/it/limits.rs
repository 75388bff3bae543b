//! Limits on what one sender may ask of the server: the pace of one phone and of one
//! address (429 with `Retry-After`), turns for uploads (503 with `Retry-After`), the
//! free-space guard (507 with `Retry-After`, nothing written), and what is left on disk
//! after a refusal, a conflict or a crash (nothing the database does not name).

use std::time::Duration;

use serde_json::json;
use wrackline_server::settings::Settings;

use crate::helpers::{TestApp, plain_jpeg, spawn_app, spawn_app_with_settings, submission};

fn new_id() -> String {
    uuid::Uuid::new_v4().to_string()
}

/// Posts a record as the phone with `token` (or anonymously) and returns the status,
/// the `Retry-After` header and the body.
async fn post(app: &TestApp, token: Option<&str>, photos: &[Vec<u8>]) -> (u16, Option<String>, serde_json::Value) {
    let mut form = reqwest::multipart::Form::new().text("record", submission(&new_id()).to_string());
    for bytes in photos {
        form = form.part("photo", reqwest::multipart::Part::bytes(bytes.clone()).file_name("p.jpg"));
    }
    let mut request = app.client.post(format!("{}/api/observations", app.base)).multipart(form);
    if let Some(token) = token {
        request = request.bearer_auth(token);
    }
    let answer = request.send().await.unwrap();
    let retry = answer.headers().get("retry-after").map(|v| v.to_str().unwrap().to_owned());
    (answer.status().as_u16(), retry, answer.json().await.unwrap_or_default())
}

#[tokio::test]
async fn a_phone_past_its_pace_is_told_when_to_come_back_and_another_phone_is_not() {
    let settings = Settings { device_burst: 3, device_per_minute: 1, ..Settings::default() };
    let app = spawn_app_with_settings(settings).await;
    let (phone, other) = (app.new_device().await, app.new_device().await);
    for _ in 0..3 {
        assert_eq!(post(&app, Some(&phone), &[]).await.0, 200);
    }
    let (status, retry, body) = post(&app, Some(&phone), &[]).await;
    assert_eq!(status, 429, "{body}");
    // One a minute: the next one is taken a minute after the burst.
    let wait: u64 = retry.expect("Retry-After").parse().unwrap();
    assert!((55..=60).contains(&wait), "Retry-After {wait}");
    assert!(body["error"].as_str().unwrap().starts_with("this phone has sent many records just now"), "{body}");
    assert_eq!(post(&app, Some(&other), &[]).await.0, 200, "another phone has its own pace");
    assert_eq!(app.records().await.len(), 4, "the refused record was not stored");
}

#[tokio::test]
async fn an_address_past_its_pace_is_refused_whichever_phone_it_sends_for() {
    let settings = Settings { address_burst: 6, address_per_minute: 2, ..Settings::default() };
    let app = spawn_app_with_settings(settings).await;
    // Making two identities counts too: a new identity cannot dodge a phone's pace.
    let (phone, other) = (app.new_device().await, app.new_device().await);
    for token in [Some(phone.as_str()), Some(other.as_str()), None, None] {
        assert_eq!(post(&app, token, &[]).await.0, 200);
    }
    let (status, retry, body) = post(&app, None, &[]).await;
    assert_eq!(status, 429, "{body}");
    assert_eq!(retry.as_deref(), Some("30"), "two a minute: one in 30 s");
    assert!(body["error"].as_str().unwrap().contains("from this address"), "{body}");
}

#[tokio::test]
async fn an_upload_waiting_longer_than_its_turn_allows_is_answered_503() {
    let settings = Settings { max_uploads: 1, upload_wait_s: 1, ..Settings::default() };
    let app = spawn_app_with_settings(settings).await;
    // The one turn is held by an upload whose body is still coming.
    let mut slow = tokio::net::TcpStream::connect(app.base.trim_start_matches("http://")).await.unwrap();
    let head = "POST /api/observations HTTP/1.1\r\nHost: 127.0.0.1\r\nContent-Type: multipart/form-data; boundary=XX\r\nContent-Length: 5000\r\n\r\n--XX\r\n";
    tokio::io::AsyncWriteExt::write_all(&mut slow, head.as_bytes()).await.unwrap();
    tokio::time::sleep(Duration::from_millis(200)).await;
    let (status, retry, body) = post(&app, None, &[]).await;
    assert_eq!(status, 503, "{body}");
    assert_eq!(retry.as_deref(), Some("5"));
    assert!(body["error"].as_str().unwrap().starts_with("the server is receiving many uploads just now"), "{body}");
    drop(slow);
    // Once the slow upload is gone, its turn is free again.
    let answered = crate::helpers::eventually("a turn free again", Duration::from_secs(10), || async {
        let (status, ..) = post(&app, None, &[]).await;
        (status == 200).then_some(())
    });
    answered.await;
}

#[tokio::test]
async fn with_too_little_free_space_a_record_is_refused_507_before_anything_is_written() {
    let settings = Settings { min_free_mb: u64::MAX >> 21, ..Settings::default() };
    let app = spawn_app_with_settings(settings).await;
    let (status, retry, body) = post(&app, None, &[plain_jpeg(1)]).await;
    assert_eq!(status, 507, "{body}");
    assert_eq!(retry.as_deref(), Some("300"));
    assert_eq!(
        body["error"], "the server's disk is full, so this was not stored; it can be sent again later",
        "it says what is true: nothing of it was kept"
    );
    assert!(app.records().await.is_empty());
    assert_eq!(photo_files(&app), 0, "no photo file written");
    // A walk is refused the same way.
    let phone = app.new_device().await;
    let walk = json!({"client_id": new_id(), "started_at": "2025-06-01T09:00:00+01:00",
        "ended_at": "2025-06-01T10:00:00+01:00", "stretch": null, "all_finds_reported": true,
        "typed_distance_m": 1500.0, "observer_name": null});
    assert_eq!(app.post_walk_as(&phone, &walk).await.status, 507);
}

#[tokio::test]
async fn a_conflicting_resend_writes_no_photo_file() {
    let app = spawn_app().await;
    let id = new_id();
    assert_eq!(app.submit(&submission(&id), &[plain_jpeg(1)]).await.status, 200);
    let before = photo_files(&app);
    let mut changed = submission(&id);
    changed["count"] = json!(2);
    let answer = app.submit(&changed, &[plain_jpeg(2)]).await;
    assert_eq!(answer.status, 409, "{}", answer.body);
    assert_eq!(photo_files(&app), before, "the refused record's photo was never written");
}

#[tokio::test(flavor = "multi_thread", worker_threads = 4)]
async fn of_two_versions_of_one_record_sent_at_once_only_the_stored_ones_photo_files_stay() {
    let app = std::sync::Arc::new(spawn_app().await);
    for round in 0..6u8 {
        let id = new_id();
        let send = |count: u32, seed: u8| {
            let (app, id) = (app.clone(), id.clone());
            async move {
                let mut record = submission(&id);
                record["count"] = json!(count);
                app.submit(&record, &[plain_jpeg(seed)]).await.status
            }
        };
        let answers = crate::helpers::all_at_once(vec![send(1, 100 + round), send(2, 200 + round)]).await;
        let mut sorted = answers.clone();
        sorted.sort();
        assert_eq!(sorted, [200, 409], "round {round}: one stored, one refused as a conflict");
        let conn = rusqlite::Connection::open(app.data_dir.join("wrackline.sqlite3")).unwrap();
        let named: i64 = conn.query_row("SELECT COUNT(*) FROM photos", [], |row| row.get(0)).unwrap();
        assert_eq!(photo_files(&app) as i64, named * 3, "round {round}: the refused version's photo files are removed");
    }
}

#[tokio::test]
async fn a_start_removes_leftover_temporary_files_and_photo_files_no_record_names() {
    let app = spawn_app().await;
    assert_eq!(app.submit(&submission(&new_id()), &[plain_jpeg(1)]).await.status, 200);
    let kept = photo_files(&app);
    let photos = app.data_dir.join("photos");
    std::fs::write(photos.join("tmp/upload-left-by-a-crash"), b"half a photo").unwrap();
    let orphan = "ab".repeat(32);
    std::fs::create_dir_all(photos.join("ab")).unwrap();
    std::fs::write(photos.join("ab").join(&orphan), b"a photo whose record never committed").unwrap();
    std::fs::write(photos.join("ab").join(format!("{orphan}.thumb.jpg")), b"its thumbnail").unwrap();
    let checklist = wrackline_server::taxa::load_checklist(None).unwrap();
    drop(wrackline_server::AppState::open(&app.data_dir, None, checklist).unwrap());
    assert_eq!(std::fs::read_dir(photos.join("tmp")).unwrap().count(), 0, "tmp/ is emptied");
    assert!(!photos.join("ab").join(&orphan).exists(), "the file no record names is removed");
    assert_eq!(photo_files(&app), kept, "every file a record names is kept");
}

/// Photo files stored (originals and derivatives), the scratch folder left out.
fn photo_files(app: &TestApp) -> usize {
    let root = app.data_dir.join("photos");
    std::fs::read_dir(&root)
        .unwrap()
        .flatten()
        .filter(|e| e.file_name() != "tmp")
        .map(|e| std::fs::read_dir(e.path()).map_or(0, |d| d.count()))
        .sum()
}
