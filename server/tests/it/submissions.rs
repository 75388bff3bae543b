//! Submitting records: the round trip, idempotent resends, conflicts, and refusals that
//! name what is wrong while storing nothing.

use serde_json::json;

use crate::helpers::{all_at_once, plain_jpeg, spawn_app, submission};

const ID: &str = "6f9a4c2e-1d3b-4e5f-8a7b-9c0d1e2f3a4b";

#[tokio::test]
async fn a_record_with_a_photo_makes_the_round_trip() {
    let app = spawn_app().await;
    let answer = app.submit(&submission(ID), &[plain_jpeg(1)]).await;
    assert_eq!(answer.status, 200, "{}", answer.body);
    assert_eq!(answer.body["client_id"], ID);
    assert_eq!(answer.body["photo_count"], 1);

    let records = app.records().await;
    assert_eq!(records.len(), 1);
    let record = &records[0];
    assert_eq!(record["submission"], submission(ID));
    assert_eq!(record["review_state"], "awaiting_review");
    let sha = record["photos"][0]["sha256"].as_str().unwrap();
    let original = app.get(&format!("/photos/{sha}/original")).await;
    assert_eq!(original.status(), 200);
    assert_eq!(original.bytes().await.unwrap().to_vec(), plain_jpeg(1));
    let display = app.get(&format!("/photos/{sha}")).await;
    assert_eq!(display.status(), 200);
    assert_eq!(display.headers()["content-type"], "image/jpeg");
}

#[tokio::test]
async fn a_resend_gets_the_same_receipt_and_makes_no_second_record() {
    let app = spawn_app().await;
    let first = app.submit(&submission(ID), &[plain_jpeg(1)]).await;
    let again = app.submit(&submission(ID), &[plain_jpeg(1)]).await;
    assert_eq!((first.status, again.status), (200, 200));
    assert_eq!(first.body, again.body);
    assert_eq!(app.records().await.len(), 1);
}

#[tokio::test(flavor = "multi_thread", worker_threads = 4)]
async fn concurrent_resends_of_one_record_store_it_once() {
    let app = std::sync::Arc::new(spawn_app().await);
    // Each round is another record, sent six times at once.
    for round in 0..4u8 {
        let id = uuid::Uuid::new_v4().to_string();
        let send = || {
            let (app, id) = (app.clone(), id.clone());
            async move { app.submit(&submission(&id), &[plain_jpeg(round)]).await }
        };
        let answers = all_at_once((0..6).map(|_| send()).collect()).await;
        assert!(
            answers.iter().all(|a| a.status == 200),
            "round {round}: {:?}",
            answers.iter().map(|a| &a.body).collect::<Vec<_>>()
        );
        assert!(answers.windows(2).all(|w| w[0].body == w[1].body), "round {round}: one receipt for all");
        assert_eq!(app.records().await.len(), usize::from(round) + 1, "round {round}: stored once");
    }
}

#[tokio::test]
async fn the_same_id_with_other_content_is_a_conflict() {
    let app = spawn_app().await;
    app.submit(&submission(ID), &[]).await;
    let mut changed = submission(ID);
    changed["count"] = json!(2);
    let answer = app.submit(&changed, &[]).await;
    assert_eq!(answer.status, 409);
    assert!(answer.body["error"].as_str().unwrap().contains("different content"), "{}", answer.body);
    // A different photo is different content too.
    assert_eq!(app.submit(&submission(ID), &[plain_jpeg(9)]).await.status, 409);
    let records = app.records().await;
    assert_eq!(records.len(), 1);
    assert_eq!(records[0]["submission"]["count"], 1, "the first version is kept");
}

/// `check(record, status, field, words)`: the refusal names the field and says why.
async fn check_refused(record: String, status: u16, field: Option<&str>, words: &str) {
    let app = spawn_app().await;
    let answer = app.submit_raw(&record, &[]).await;
    assert_eq!(answer.status, status, "{record} → {}", answer.body);
    assert_eq!(answer.body["field"].as_str(), field, "{}", answer.body);
    let message = answer.body["error"].as_str().unwrap();
    assert!(message.contains(words), "`{message}` should mention `{words}`");
    assert!(app.records().await.is_empty());
}

fn without(field: &str) -> String {
    let mut record = submission(ID);
    record.as_object_mut().unwrap().remove(field);
    record.to_string()
}

fn with(path: &[&str], value: serde_json::Value) -> String {
    let mut record = submission(ID);
    let mut target = &mut record;
    for key in &path[..path.len() - 1] {
        target = &mut target[*key];
    }
    target[path[path.len() - 1]] = value;
    record.to_string()
}

#[tokio::test]
async fn bad_submissions_are_refused_with_the_field_named() {
    check_refused("{not json".into(), 400, None, "not valid JSON").await;
    check_refused(without("observed_at"), 422, Some("observed_at"), "missing field").await;
    check_refused(without("condition"), 422, Some("condition"), "missing field").await;
    check_refused(with(&["position", "latitude"], json!(95.0)), 422, Some("position.latitude"), "between -90 and 90")
        .await;
    check_refused(with(&["count"], json!(0)), 422, Some("count"), "count must be between 1").await;
    check_refused(with(&["length", "kind"], json!("wingspan")), 422, Some("length.kind"), "unknown variant").await;
    check_refused(with(&["length", "value"], json!(-3)), 422, Some("length"), "positive").await;
    check_refused(with(&["client_id"], json!("not-a-uuid")), 422, Some("client_id"), "UUID").await;
    check_refused(with(&["observed_at"], json!("2999-01-01T00:00:00Z")), 422, Some("observed_at"), "in the future")
        .await;
    check_refused(with(&["colour"], json!("grey")), 422, Some("colour"), "unknown field `colour`").await;
}

#[tokio::test]
async fn a_photo_that_is_not_an_image_is_refused_and_nothing_is_stored() {
    let app = spawn_app().await;
    let answer = app.submit(&submission(ID), &[plain_jpeg(1), b"just some text named photo.jpg".to_vec()]).await;
    assert_eq!(answer.status, 415);
    assert!(answer.body["error"].as_str().unwrap().starts_with("photo 2:"), "{}", answer.body);
    let answer = app.submit(&submission(ID), &[Vec::new()]).await;
    assert!(answer.body["error"].as_str().unwrap().contains("empty"), "{}", answer.body);
    assert!(app.records().await.is_empty());
    // The record can still be sent once it is put right.
    assert_eq!(app.submit(&submission(ID), &[plain_jpeg(1)]).await.status, 200);
}

#[tokio::test]
async fn a_form_without_a_record_part_is_refused() {
    let app = spawn_app().await;
    let form = reqwest::multipart::Form::new().part("photo", reqwest::multipart::Part::bytes(plain_jpeg(1)));
    let response = app.client.post(format!("{}/api/observations", app.base)).multipart(form).send().await.unwrap();
    assert_eq!(response.status(), 400);
    let body: serde_json::Value = response.json().await.unwrap();
    assert!(body["error"].as_str().unwrap().contains("`record`"), "{body}");
    let response = app.client.post(format!("{}/api/observations", app.base)).body("plain").send().await.unwrap();
    assert_eq!(response.status(), 400);
}

#[tokio::test]
async fn one_photo_in_two_records_is_stored_once() {
    let app = spawn_app().await;
    app.submit(&submission(ID), &[plain_jpeg(3)]).await;
    app.submit(&submission("0b7e6d5c-4b3a-4291-8f7e-6d5c4b3a2910"), &[plain_jpeg(3)]).await;
    let records = app.records().await;
    assert_eq!(records[0]["photos"][0]["sha256"], records[1]["photos"][0]["sha256"]);
    let files = walk(&app.data_dir.join("photos"))
        .into_iter()
        .filter(|p| !p.starts_with(app.data_dir.join("photos/tmp")))
        .count();
    assert_eq!(files, 3, "one original, one display copy, one thumbnail");
}

fn walk(dir: &std::path::Path) -> Vec<std::path::PathBuf> {
    std::fs::read_dir(dir)
        .unwrap()
        .flatten()
        .flat_map(|e| if e.path().is_dir() { walk(&e.path()) } else { vec![e.path()] })
        .collect()
}

#[tokio::test]
async fn the_same_photo_twice_in_one_record_is_one_photo_and_the_resend_gets_the_same_receipt() {
    // The rule (DEVELOPERS.md): a file sent twice in one record is kept once, at its
    // first position; the server accepts the record rather than refuse evidence.
    let app = spawn_app().await;
    let photos = [plain_jpeg(5), plain_jpeg(6), plain_jpeg(5)];
    let first = app.submit(&submission(ID), &photos).await;
    assert_eq!(first.status, 200, "{}", first.body);
    assert_eq!(first.body["photo_count"], 2, "two different files");
    let again = app.submit(&submission(ID), &photos).await;
    assert_eq!(first.body, again.body, "a resend gets the same receipt");
    let record = &app.records().await[0];
    let shas: Vec<&str> = record["photos"].as_array().unwrap().iter().map(|p| p["sha256"].as_str().unwrap()).collect();
    assert_eq!(shas.len(), 2);
    assert_ne!(shas[0], shas[1]);
}
