//! The review queue and its actions: what comes first and why, the identification
//! history (nothing deleted, only superseded), the audit trail of every action, and the
//! conversation with the observer's phone.

use serde_json::{Value, json};

use crate::helpers::{TestApp, plain_jpeg, spawn_app, submission};

fn record(id: &str, guess: &str, length_cm: f64, observed_at: &str) -> Value {
    let mut record = submission(id);
    record["species_guess"] = json!(guess);
    record["length"]["value"] = json!(length_cm);
    record["observed_at"] = json!(observed_at);
    record
}

async fn act(app: &TestApp, id: &str, action: Value) -> (u16, Value) {
    let response = app.reviewer.sign(app.client.post(format!("{}/api/review/records/{id}/actions", app.base))).json(&action).send().await.unwrap();
    (response.status().as_u16(), response.json().await.unwrap_or(Value::Null))
}

async fn detail(app: &TestApp, id: &str) -> Value {
    app.get(&format!("/api/review/records/{id}")).await.json().await.unwrap()
}

const OLD_CATSHARK: &str = "00000000-0000-4000-8000-000000000001";
const BIG_CATSHARK: &str = "00000000-0000-4000-8000-000000000002";
const ANGELSHARK: &str = "00000000-0000-4000-8000-000000000003";

#[tokio::test]
async fn the_queue_puts_sensitive_and_flagged_records_first_then_the_oldest() {
    let app = spawn_app().await;
    app.submit(&record(OLD_CATSHARK, "small-spotted catshark", 50.0, "2025-01-10T10:00:00Z"), &[]).await;
    app.submit(&record(BIG_CATSHARK, "small-spotted catshark", 150.0, "2025-06-10T10:00:00Z"), &[]).await;
    // Angelshark: "tenthDegree" sensitivity in the demo checklist (illustrative, from memory).
    app.submit(&record(ANGELSHARK, "angelshark", 120.0, "2025-09-10T10:00:00Z"), &[]).await;
    let queue: Vec<Value> = app.get("/api/review/queue").await.json().await.unwrap();
    let order: Vec<&str> = queue.iter().map(|item| item["record"]["submission"]["client_id"].as_str().unwrap()).collect();
    assert_eq!(order, [ANGELSHARK, BIG_CATSHARK, OLD_CATSHARK]);
    let reasons = queue[0]["priority_reasons"].to_string();
    assert!(reasons.contains("protected") && reasons.contains("sensitive"), "{reasons}");
    assert!(queue[1]["priority_reasons"][0].as_str().unwrap().contains("known maximum"), "{}", queue[1]);
    assert_eq!(queue[2]["priority_reasons"], json!([]));

    let app = &app;
    let only = |query: &str| {
        let path = format!("/api/review/queue?{query}");
        async move { app.get(&path).await.json::<Vec<Value>>().await.unwrap().len() }
    };
    assert_eq!(only("flag=oversize").await, 1);
    assert_eq!(only("taxon=Scyliorhinidae").await, 2, "a family finds its species");
    assert_eq!(only("from=2025-06-01&to=2025-12-31").await, 2);
    assert_eq!(only("area=cardigan-bay").await, 3);
    assert_eq!(app.get("/api/review/queue?state=lost").await.status(), 400);
}

#[tokio::test]
async fn every_action_is_audited_and_identifications_are_superseded_not_deleted() {
    let app = spawn_app().await;
    app.submit(&record(OLD_CATSHARK, "small-spotted catshark", 50.0, "2025-01-10T10:00:00Z"), &[]).await;
    let (status, body) = act(&app, OLD_CATSHARK, json!({"action": "request_details", "message": "Is there a photo of the underside?"})).await;
    assert_eq!((status, body["review_state"].as_str()), (200, Some("details_requested")));
    let (status, _) = act(&app, OLD_CATSHARK, json!({"action": "confirm", "scientific_name": "Scyliorhinus stellaris", "taxon_rank": "species", "remark": "large spots: nursehound"})).await;
    assert_eq!(status, 200);
    let view = detail(&app, OLD_CATSHARK).await;
    assert_eq!(view["record"]["review_state"], "confirmed");
    let ids = view["identifications"].as_array().unwrap();
    assert_eq!(ids.len(), 2);
    assert_eq!((ids[0]["taxon_name"].as_str(), ids[0]["current"].as_bool()), (Some("Scyliorhinus canicula"), Some(false)));
    assert_eq!((ids[1]["taxon_name"].as_str(), ids[1]["current"].as_bool()), (Some("Scyliorhinus stellaris"), Some(true)));
    assert_eq!(ids[1]["identified_by"], "Test reviewer");
    let events = view["events"].as_array().unwrap();
    let steps: Vec<(&str, &str, &str)> = events.iter().map(|e| (e["action"].as_str().unwrap(), e["from_state"].as_str().unwrap(), e["to_state"].as_str().unwrap())).collect();
    assert_eq!(steps, [("request_details", "awaiting_review", "details_requested"), ("confirm", "details_requested", "confirmed")]);
    assert!(events.iter().all(|e| e["by"] == "Test reviewer" && e["at"].is_string()));
    assert_eq!(view["messages"][0]["body"], "Is there a photo of the underside?");

    let (status, body) = act(&app, OLD_CATSHARK, json!({"action": "confirm", "scientific_name": "Scyliorhinus", "taxon_rank": "kingdom"})).await;
    assert_eq!(status, 409, "{body}");
    assert!(body["error"].as_str().unwrap().contains("taxon_rank"));
    let (status, _) = act(&app, OLD_CATSHARK, json!({"action": "approve"})).await;
    assert_eq!(status, 422);
    assert_eq!(detail(&app, OLD_CATSHARK).await["events"].as_array().unwrap().len(), 2, "refusals change nothing");
}

#[tokio::test]
async fn a_question_reaches_the_observer_and_their_answer_with_a_photo_reaches_the_queue() {
    let app = spawn_app().await;
    let phone = app.new_device().await;
    assert_eq!(app.submit_as(&phone, &submission(OLD_CATSHARK), &[plain_jpeg(1)]).await.status, 200);
    act(&app, OLD_CATSHARK, json!({"action": "request_details", "message": "Can you photograph the head from below?"})).await;

    let mine = || {
        let request = app.client.get(format!("{}/api/my/records", app.base)).bearer_auth(&phone);
        async move { request.send().await.unwrap().json::<Vec<Value>>().await.unwrap() }
    };
    let seen = mine().await;
    assert_eq!(seen[0]["record"]["review_state"], "details_requested");
    assert_eq!(seen[0]["messages"][0]["body"], "Can you photograph the head from below?");
    assert_eq!(seen[0]["messages"][0]["author_role"], "reviewer");

    let reply = || {
        let form = reqwest::multipart::Form::new()
            .text("reply", json!({"client_id": "9a8b7c6d-5e4f-4a3b-8c2d-1e0f9a8b7c6d", "message": "Here it is."}).to_string())
            .part("photo", reqwest::multipart::Part::bytes(plain_jpeg(2)).file_name("head.jpg"));
        app.client.post(format!("{}/api/my/records/{OLD_CATSHARK}/replies", app.base)).bearer_auth(&phone).multipart(form).send()
    };
    assert_eq!(reply().await.unwrap().status(), 200);
    assert_eq!(reply().await.unwrap().status(), 200, "a resend is not a second reply");
    let view = detail(&app, OLD_CATSHARK).await;
    assert_eq!(view["record"]["review_state"], "awaiting_review", "back in the queue");
    assert_eq!(view["record"]["photos"].as_array().unwrap().len(), 2);
    assert_eq!(view["messages"].as_array().unwrap().len(), 2);
    assert_eq!(view["events"].as_array().unwrap().last().unwrap()["action"], "observer_reply");

    act(&app, OLD_CATSHARK, json!({"action": "confirm", "scientific_name": "Scyliorhinus canicula", "taxon_rank": "species"})).await;
    let seen = mine().await;
    assert_eq!(seen[0]["record"]["review_state"], "confirmed");
    assert_eq!(seen[0]["current_taxon"], "Scyliorhinus canicula");
}

#[tokio::test]
async fn the_record_map_shows_the_phone_the_photo_and_a_possible_duplicate() {
    let app = spawn_app().await;
    let dir = tempfile::tempdir().unwrap();
    // A photo whose own GPS (written by exiftool) is 300 m from the phone's position.
    let photo = crate::helpers::with_exiftool(&plain_jpeg(8), &["-GPSLatitude=52.4180", "-GPSLatitudeRef=N", "-GPSLongitude=4.0829", "-GPSLongitudeRef=W"], dir.path());
    app.submit(&record(OLD_CATSHARK, "small-spotted catshark", 50.0, "2025-01-10T10:00:00Z"), &[photo]).await;
    app.submit(&record(BIG_CATSHARK, "small-spotted catshark", 52.0, "2025-01-10T12:00:00Z"), &[]).await;
    let response = app.get(&format!("/api/review/records/{OLD_CATSHARK}/map.svg")).await;
    assert_eq!(response.status(), 200);
    assert_eq!(response.headers()["content-type"], "image/svg+xml");
    let svg = response.text().await.unwrap();
    assert!(svg.contains("this record (phone)") && svg.contains("photo 1 (its own GPS)") && svg.contains("possibly the same animal"), "{svg}");
    assert!(svg.contains("<path d=\"M"), "the coastline is drawn");
}
