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
    let response = app
        .reviewer
        .sign(app.client.post(format!("{}/api/review/records/{id}/actions", app.base)))
        .json(&action)
        .send()
        .await
        .unwrap();
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
    let order: Vec<&str> =
        queue.iter().map(|item| item["record"]["submission"]["client_id"].as_str().unwrap()).collect();
    assert_eq!(order, [ANGELSHARK, BIG_CATSHARK, OLD_CATSHARK]);
    let reasons = queue[0]["priority_reasons"].to_string();
    assert!(reasons.contains("protected") && reasons.contains("sensitive"), "{reasons}");
    assert!(queue[1]["priority_reasons"][0]["text"].as_str().unwrap().contains("known maximum"), "{}", queue[1]);
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
    let (status, body) =
        act(&app, OLD_CATSHARK, json!({"action": "request_details", "message": "Is there a photo of the underside?"}))
            .await;
    assert_eq!((status, body["review_state"].as_str()), (200, Some("details_requested")));
    let (status, _) = act(&app, OLD_CATSHARK, json!({"action": "confirm", "scientific_name": "Scyliorhinus stellaris", "taxon_rank": "species", "remark": "large spots: nursehound"})).await;
    assert_eq!(status, 200);
    let view = detail(&app, OLD_CATSHARK).await;
    assert_eq!(view["record"]["review_state"], "confirmed");
    let ids = view["identifications"].as_array().unwrap();
    assert_eq!(ids.len(), 2);
    assert_eq!(
        (ids[0]["taxon_name"].as_str(), ids[0]["current"].as_bool()),
        (Some("Scyliorhinus canicula"), Some(false))
    );
    assert_eq!(
        (ids[1]["taxon_name"].as_str(), ids[1]["current"].as_bool()),
        (Some("Scyliorhinus stellaris"), Some(true))
    );
    assert_eq!(ids[1]["identified_by"], "Test reviewer");
    let events = view["events"].as_array().unwrap();
    let steps: Vec<(&str, &str, &str)> = events
        .iter()
        .map(|e| (e["action"].as_str().unwrap(), e["from_state"].as_str().unwrap(), e["to_state"].as_str().unwrap()))
        .collect();
    assert_eq!(
        steps,
        [("request_details", "awaiting_review", "details_requested"), ("confirm", "details_requested", "confirmed")]
    );
    assert!(events.iter().all(|e| e["by"] == "Test reviewer" && e["at"].is_string()));
    assert_eq!(view["messages"][0]["body"], "Is there a photo of the underside?");

    let (status, body) = act(
        &app,
        OLD_CATSHARK,
        json!({"action": "confirm", "scientific_name": "Scyliorhinus", "taxon_rank": "kingdom"}),
    )
    .await;
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
    act(&app, OLD_CATSHARK, json!({"action": "request_details", "message": "Can you photograph the head from below?"}))
        .await;

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
            .text(
                "reply",
                json!({"client_id": "9a8b7c6d-5e4f-4a3b-8c2d-1e0f9a8b7c6d", "message": "Here it is."}).to_string(),
            )
            .part("photo", reqwest::multipart::Part::bytes(plain_jpeg(2)).file_name("head.jpg"));
        app.client
            .post(format!("{}/api/my/records/{OLD_CATSHARK}/replies", app.base))
            .bearer_auth(&phone)
            .multipart(form)
            .send()
    };
    assert_eq!(reply().await.unwrap().status(), 200);
    assert_eq!(reply().await.unwrap().status(), 200, "a resend is not a second reply");
    let view = detail(&app, OLD_CATSHARK).await;
    assert_eq!(view["record"]["review_state"], "awaiting_review", "back in the queue");
    assert_eq!(view["record"]["photos"].as_array().unwrap().len(), 2);
    assert_eq!(view["messages"].as_array().unwrap().len(), 2);
    assert_eq!(view["events"].as_array().unwrap().last().unwrap()["action"], "observer_reply");

    act(
        &app,
        OLD_CATSHARK,
        json!({"action": "confirm", "scientific_name": "Scyliorhinus canicula", "taxon_rank": "species"}),
    )
    .await;
    let seen = mine().await;
    assert_eq!(seen[0]["record"]["review_state"], "confirmed");
    assert_eq!(seen[0]["current_taxon"], "Scyliorhinus canicula");
}

#[tokio::test(flavor = "multi_thread", worker_threads = 4)]
async fn one_answer_resent_four_times_at_once_is_one_message() {
    let app = std::sync::Arc::new(spawn_app().await);
    let phone = app.new_device().await;
    assert_eq!(app.submit_as(&phone, &submission(OLD_CATSHARK), &[]).await.status, 200);
    act(&app, OLD_CATSHARK, json!({"action": "request_details", "message": "Which beach?"})).await;
    let send = || {
        let (app, phone) = (app.clone(), phone.clone());
        async move {
            let reply =
                json!({"client_id": "3c2b1a09-8f7e-4d6c-9b5a-4e3d2c1b0a9f", "message": "Borth, below the cliff."});
            let form = reqwest::multipart::Form::new().text("reply", reply.to_string());
            let url = format!("{}/api/my/records/{OLD_CATSHARK}/replies", app.base);
            app.client.post(url).bearer_auth(&phone).multipart(form).send().await.unwrap().status().as_u16()
        }
    };
    let statuses = crate::helpers::all_at_once((0..4).map(|_| send()).collect()).await;
    assert_eq!(statuses, [200; 4]);
    let view = detail(&app, OLD_CATSHARK).await;
    assert_eq!(view["messages"].as_array().unwrap().len(), 2, "the question and one answer: {}", view["messages"]);
    let replies = view["events"].as_array().unwrap().iter().filter(|e| e["action"] == "observer_reply").count();
    assert_eq!(replies, 1, "one reply in the audit trail");
}

#[tokio::test]
async fn the_record_map_shows_the_phone_the_photo_and_a_possible_duplicate() {
    let app = spawn_app().await;
    let dir = tempfile::tempdir().unwrap();
    // A photo whose own GPS (written by exiftool) is 300 m from the phone's position.
    let photo = crate::helpers::with_exiftool(
        &plain_jpeg(8),
        &["-GPSLatitude=52.4180", "-GPSLatitudeRef=N", "-GPSLongitude=4.0829", "-GPSLongitudeRef=W"],
        dir.path(),
    );
    app.submit(&record(OLD_CATSHARK, "small-spotted catshark", 50.0, "2025-01-10T10:00:00Z"), &[photo]).await;
    app.submit(&record(BIG_CATSHARK, "small-spotted catshark", 52.0, "2025-01-10T12:00:00Z"), &[]).await;
    let response = app.get(&format!("/api/review/records/{OLD_CATSHARK}/map.svg")).await;
    assert_eq!(response.status(), 200);
    assert_eq!(response.headers()["content-type"], "image/svg+xml");
    let svg = response.text().await.unwrap();
    assert!(
        svg.contains("this record (phone)")
            && svg.contains("photo 1 (its own GPS)")
            && svg.contains("possibly the same animal"),
        "{svg}"
    );
    assert!(svg.contains("<path d=\"M"), "the coastline is drawn");
}

/// A record whose phone read the original's EXIF (the upload copy carries none): taken
/// `days_before` the record, at `(lat, lon)`.
fn with_phone_exif(id: &str, observed_at: &str, days_before: i64, lat: f64, lon: f64) -> Value {
    let mut record = record(id, "small-spotted catshark", 50.0, observed_at);
    let taken = chrono::DateTime::parse_from_rfc3339(observed_at).unwrap() - chrono::Duration::days(days_before);
    record["photo_exif"] = json!([{"taken_local": taken.format("%Y:%m:%d %H:%M:%S").to_string(), "offset": "+00:00", "latitude": lat, "longitude": lon}]);
    record
}

fn ids(queue: &[Value]) -> Vec<&str> {
    queue.iter().map(|item| item["record"]["submission"]["client_id"].as_str().unwrap()).collect()
}

async fn queue(app: &TestApp, query: &str) -> Vec<Value> {
    let response = app.get(&format!("/api/review/queue?{query}")).await;
    assert_eq!(response.status(), 200, "{query}");
    response.json().await.unwrap()
}

#[tokio::test]
async fn photo_flags_from_the_phones_reading_raise_a_record_and_every_flag_filters() {
    let app = spawn_app().await;
    // The same position as `submission` (52.4153, -4.0829); 0.1° of latitude is about 11 km.
    app.submit(&with_phone_exif(BIG_CATSHARK, "2025-06-10T10:00:00Z", 3, 52.5153, -4.0829), &[plain_jpeg(1)]).await;
    app.submit(&record(OLD_CATSHARK, "small-spotted catshark", 50.0, "2025-01-10T10:00:00Z"), &[]).await;
    let all = queue(&app, "").await;
    assert_eq!(ids(&all), [BIG_CATSHARK, OLD_CATSHARK], "the photo flags put the newer record first");
    let reasons = all[0]["priority_reasons"].to_string();
    assert!(reasons.contains("photo older than the record: photo 1 was taken 3.0 days before it"), "{reasons}");
    assert!(reasons.contains("photo far from the record: photo 1 was taken 11.1 km from its place"), "{reasons}");

    let view = detail(&app, BIG_CATSHARK).await;
    let photo = &view["record"]["photos"][0];
    assert_eq!(photo["exif"]["taken_at"], Value::Null, "the upload copy says nothing itself");
    assert_eq!((&photo["check"]["time_reading"], &photo["check"]["place_reading"]), (&json!("phone"), &json!("phone")));
    assert_eq!(photo["check"]["seconds_before_record"], 3.0 * 86400.0);
    let map = app.get(&format!("/api/review/records/{BIG_CATSHARK}/map.svg")).await.text().await.unwrap();
    assert!(map.contains("photo 1 (its own GPS, as the phone read it)"), "the map falls back to the phone's reading");

    assert_eq!(ids(&queue(&app, "flag=taken_long_before_record").await), [BIG_CATSHARK]);
    assert_eq!(ids(&queue(&app, "flag=taken_far_from_record").await), [BIG_CATSHARK]);
    assert!(queue(&app, "flag=possible_duplicate").await.is_empty());
    // Two reports of one carcass a few hours apart at the same place.
    app.submit(&record(ANGELSHARK, "small-spotted catshark", 50.0, "2025-01-10T14:00:00Z"), &[]).await;
    assert_eq!(ids(&queue(&app, "flag=possible_duplicate").await), [OLD_CATSHARK, ANGELSHARK]);
    let refused = app.get("/api/review/queue?flag=odd").await;
    assert_eq!(refused.status(), 400);
    assert!(refused.text().await.unwrap().contains("possible_duplicate"), "names the flags it knows");
}

#[tokio::test]
async fn the_taxon_filter_takes_in_records_identified_at_any_rank_below() {
    let app = spawn_app().await;
    app.submit(&record(OLD_CATSHARK, "small-spotted catshark", 50.0, "2025-01-10T10:00:00Z"), &[]).await;
    app.submit(&record(BIG_CATSHARK, "a catshark of some kind", 50.0, "2025-03-10T10:00:00Z"), &[]).await;
    let (status, _) = act(&app, BIG_CATSHARK, json!({"action": "confirm", "scientific_name": "Scyliorhinus", "taxon_rank": "genus", "remark": "no view of the nasal flaps"})).await;
    assert_eq!(status, 200);
    let found = |query: &'static str| {
        let app = &app;
        async move {
            ids(&queue(app, &format!("state=any&{query}")).await).into_iter().map(str::to_owned).collect::<Vec<_>>()
        }
    };
    // Placement as in demo-records/checklist.json.
    assert_eq!(
        found("taxon=Scyliorhinidae").await,
        [OLD_CATSHARK, BIG_CATSHARK],
        "the genus record is found by its family"
    );
    assert_eq!(found("taxon=Carcharhiniformes").await, [OLD_CATSHARK, BIG_CATSHARK], "both by their order");
    assert_eq!(found("taxon=Scyliorhinus").await, [OLD_CATSHARK, BIG_CATSHARK]);
    assert_eq!(
        found("taxon=Scyliorhinus%20canicula").await,
        [OLD_CATSHARK],
        "a genus record is not one of its species"
    );
    assert_eq!(found("taxon=nursehound").await, Vec::<String>::new());
    assert_eq!(found("taxon=Rajidae").await, Vec::<String>::new());
}

#[tokio::test]
async fn the_queue_comes_a_page_at_a_time_and_dates_are_checked() {
    let app = spawn_app().await;
    for (n, day) in ["2025-01-10", "2025-02-10", "2025-03-10"].iter().enumerate() {
        let id = format!("00000000-0000-4000-8000-00000000010{n}");
        app.submit(&record(&id, "small-spotted catshark", 50.0, &format!("{day}T10:00:00Z")), &[]).await;
    }
    let all = ids(&queue(&app, "").await).into_iter().map(str::to_owned).collect::<Vec<_>>();
    assert_eq!(all.len(), 3);
    assert_eq!(ids(&queue(&app, "limit=2").await), all[..2]);
    assert_eq!(ids(&queue(&app, "limit=2&offset=2").await), all[2..]);
    assert_eq!(ids(&queue(&app, "from=2025-02-01&to=2025-02-28").await), all[1..2]);
    let refused = app.get("/api/review/queue?from=10/02/2025").await;
    assert_eq!(refused.status(), 400);
    assert!(refused.text().await.unwrap().contains("from"), "names the parameter");
}

#[tokio::test]
async fn the_record_view_replays_the_guided_key_with_reasons() {
    let app = spawn_app().await;
    let mut keyed = record(OLD_CATSHARK, "small-spotted catshark", 50.0, "2025-01-10T10:00:00Z");
    keyed["key_choice"] = json!({"scientific_name": "Scyliorhinus canicula", "taxon_rank": "species", "probability": 0.8,
        "answers": {"bodyForm": "sharkLike", "gillSlits": "five", "analFin": "present", "dorsalSpines": "notSure"}});
    app.submit(&keyed, &[]).await;
    let view = detail(&app, OLD_CATSHARK).await;
    let key = &view["key"];
    let answers = key["answers"].to_string();
    // Questions and state names as demo-records/checklist.json words them.
    assert!(
        answers.contains("How many gill openings are there on each side?") && answers.contains("not sure"),
        "{answers}"
    );
    let suggestions = key["suggestions"].as_array().unwrap();
    assert!(!suggestions.is_empty() && suggestions.len() <= 5, "{key}");
    let total: f64 = suggestions.iter().map(|s| s["probability"].as_f64().unwrap()).sum();
    assert!(total > 0.0 && total <= 1.0 + 1e-9, "{total}");
    assert!(
        suggestions.iter().all(|s| s["probability"].as_f64() <= suggestions[0]["probability"].as_f64()),
        "most probable first"
    );
    assert!(suggestions[0]["reasons"].as_array().is_some_and(|r| !r.is_empty()), "{}", suggestions[0]);
    assert!(
        suggestions.iter().all(|s| !s["scientific_name"].as_str().unwrap().starts_with("Raja")),
        "rays are ruled out by a shark's body"
    );

    app.submit(&record(BIG_CATSHARK, "small-spotted catshark", 50.0, "2025-01-10T10:00:00Z"), &[]).await;
    assert_eq!(detail(&app, BIG_CATSHARK).await["key"], Value::Null, "no key used, nothing replayed");
}

fn recent(at: &Value) -> bool {
    let at = chrono::DateTime::parse_from_rfc3339(at.as_str().unwrap()).unwrap();
    (chrono::Utc::now() - at.with_timezone(&chrono::Utc)).num_seconds().abs() < 120
}

#[tokio::test]
async fn every_review_action_writes_who_when_what_changed_and_why() {
    let app = spawn_app().await;
    let phone = app.new_device().await;
    assert_eq!(
        app.submit_as(&phone, &record(OLD_CATSHARK, "small-spotted catshark", 50.0, "2025-01-10T10:00:00Z"), &[])
            .await
            .status,
        200
    );
    act(&app, OLD_CATSHARK, json!({"action": "request_details", "message": "Is the underside pale?"})).await;
    let form = reqwest::multipart::Form::new().text(
        "reply",
        json!({"client_id": "9a8b7c6d-5e4f-4a3b-8c2d-1e0f9a8b7c6e", "message": "Yes, pale."}).to_string(),
    );
    assert_eq!(
        app.client
            .post(format!("{}/api/my/records/{OLD_CATSHARK}/replies", app.base))
            .bearer_auth(&phone)
            .multipart(form)
            .send()
            .await
            .unwrap()
            .status(),
        200
    );
    act(&app, OLD_CATSHARK, json!({"action": "not_confirmable", "reason": "photo too dark to see the spots"})).await;
    act(&app, OLD_CATSHARK, json!({"action": "confirm", "scientific_name": "Scyliorhinus stellaris", "taxon_rank": "species", "remark": "large spots after all"})).await;
    // The same animal reported again; merged, then the merge undone.
    app.submit(&record(BIG_CATSHARK, "small-spotted catshark", 50.0, "2025-01-10T12:00:00Z"), &[]).await;
    let pair = format!("{}/api/review/records/{OLD_CATSHARK}/duplicates/{BIG_CATSHARK}", app.base);
    let merged: Value = app
        .reviewer
        .sign(app.client.post(&pair))
        .json(&json!({"same_animal": true}))
        .send()
        .await
        .unwrap()
        .json()
        .await
        .unwrap();
    let undo = format!("{}/api/review/merges/{}/undo", app.base, merged["merge_id"]);
    assert_eq!(app.reviewer.sign(app.client.post(undo)).send().await.unwrap().status(), 200);

    let events = detail(&app, OLD_CATSHARK).await["events"].as_array().unwrap().clone();
    let rows: Vec<(&str, &str, &str)> = events
        .iter()
        .map(|e| (e["action"].as_str().unwrap(), e["from_state"].as_str().unwrap(), e["to_state"].as_str().unwrap()))
        .collect();
    assert_eq!(
        rows,
        [
            ("request_details", "awaiting_review", "details_requested"),
            ("observer_reply", "details_requested", "awaiting_review"),
            ("not_confirmable", "awaiting_review", "not_confirmable"),
            ("confirm", "not_confirmable", "confirmed"),
            ("merge", "confirmed", "confirmed"),
            ("undo_merge", "confirmed", "confirmed"),
        ]
    );
    assert!(
        events.iter().all(|e| recent(&e["at"]) && e["detail"].as_str().is_some_and(|d| !d.is_empty())),
        "when and what, every row: {events:?}"
    );
    let by: Vec<&str> = events.iter().map(|e| e["by"].as_str().unwrap_or_default()).collect();
    assert_eq!(by, ["Test reviewer", "Test Phone", "Test reviewer", "Test reviewer", "Test reviewer", "Test reviewer"]);
    let why: Vec<Option<&str>> = events.iter().map(|e| e["reason"].as_str()).collect();
    assert_eq!(
        why[..4],
        [
            Some("Is the underside pale?"),
            Some("Yes, pale."),
            Some("photo too dark to see the spots"),
            Some("large spots after all")
        ]
    );
    assert_eq!(events[2]["detail"], "marked not confirmable");
    assert_eq!(events[3]["detail"], "identified as Scyliorhinus stellaris (species); was Scyliorhinus canicula");
    let other = detail(&app, BIG_CATSHARK).await["events"].as_array().unwrap().clone();
    let steps: Vec<&str> = other.iter().map(|e| e["action"].as_str().unwrap()).collect();
    assert_eq!(steps, ["merge", "undo_merge"]);
    assert_eq!(
        (other[0]["to_state"].as_str(), other[1]["to_state"].as_str()),
        (Some("merged"), Some("awaiting_review"))
    );
}

#[tokio::test]
async fn reply_photos_get_the_records_offset_and_the_photo_checks() {
    let app = spawn_app().await;
    let phone = app.new_device().await;
    // Observed 14:10 at +01:00 (`submission`).
    assert_eq!(app.submit_as(&phone, &submission(OLD_CATSHARK), &[]).await.status, 200);
    let dir = tempfile::tempdir().unwrap();
    // exiftool writes a DateTimeOriginal with no offset: the record's offset applies.
    let own_time =
        crate::helpers::with_exiftool(&plain_jpeg(5), &["-DateTimeOriginal=2025:06:01 13:00:00"], dir.path());
    let phone_read =
        json!({"taken_local": "2025:05:20 09:00:00", "offset": "+01:00", "latitude": 52.4153, "longitude": -4.0829});
    let form = reqwest::multipart::Form::new()
        .text("reply", json!({"client_id": "9a8b7c6d-5e4f-4a3b-8c2d-1e0f9a8b7c6f", "message": "two more", "photo_exif": [json!({}), phone_read]}).to_string())
        .part("photo", reqwest::multipart::Part::bytes(own_time).file_name("a.jpg"))
        .part("photo", reqwest::multipart::Part::bytes(plain_jpeg(6)).file_name("b.jpg"));
    let answer = app
        .client
        .post(format!("{}/api/my/records/{OLD_CATSHARK}/replies", app.base))
        .bearer_auth(&phone)
        .multipart(form)
        .send()
        .await
        .unwrap();
    assert_eq!(answer.status(), 200, "{}", answer.text().await.unwrap());
    let view = detail(&app, OLD_CATSHARK).await;
    let photos = view["record"]["photos"].as_array().unwrap();
    assert_eq!(photos[0]["exif"]["taken_at"], "2025-06-01T13:00:00+01:00", "read with the record's offset, not as UTC");
    assert_eq!(photos[0]["exif"]["offset_source"], "record");
    assert_eq!(
        (photos[0]["check"]["time_reading"].as_str(), photos[0]["check"]["seconds_before_record"].as_f64()),
        (Some("received_file"), Some(4200.0))
    );
    assert_eq!(photos[1]["phone_exif"]["taken_at"], "2025-05-20T09:00:00+01:00");
    assert_eq!(
        (&photos[1]["check"]["time_reading"], &photos[1]["check"]["place_reading"]),
        (&json!("phone"), &json!("phone"))
    );
    assert_eq!(photos[1]["check"]["flags"], json!(["taken_long_before_record"]));
    assert!(
        view["priority_reasons"].to_string().contains("photo older than the record: photo 2"),
        "{}",
        view["priority_reasons"]
    );
}

#[tokio::test]
async fn the_record_view_says_how_the_name_reads_and_where_the_public_sees_the_record() {
    let app = spawn_app().await;
    let id = "7e7e0000-0000-4000-8000-000000000001";
    assert_eq!(app.submit(&record(id, "Angel-shark?", 120.0, "2025-06-01T10:00:00+01:00"), &[]).await.status, 200);
    let reading = &detail(&app, id).await["name_reading"];
    assert_eq!(reading["typed"], "Squatina squatina", "a guess that resolves is kept under its checklist name");
    assert_eq!(reading["resolved"], true);
    let public = reading["public_place"].as_str().unwrap();
    assert!(public.contains("0.1 degree") && public.contains("not yet confirmed"), "{public}");

    let (status, _) = act(
        &app,
        id,
        json!({"action": "confirm", "scientific_name": "juvenile Raja clavata?", "taxon_rank": "species"}),
    )
    .await;
    assert_eq!(status, 200);
    let reading = &detail(&app, id).await["name_reading"];
    assert_eq!(reading["resolved"], false);
    let words = reading["reading"].as_str().unwrap();
    assert!(words.contains("not resolved") && words.contains("Raja clavata") && words.contains("juvenile"), "{words}");
    assert!(reading["public_place"].as_str().unwrap().contains("a name not resolved to a checklist taxon"));

    let (status, _) =
        act(&app, id, json!({"action": "confirm", "scientific_name": "thornback ray", "taxon_rank": "species"})).await;
    assert_eq!(status, 200);
    let reading = &detail(&app, id).await["name_reading"];
    assert!(reading["reading"].as_str().unwrap().starts_with("Raja clavata (species): matched a common name"));
    assert_eq!(reading["public_place"], "as recorded", "confirmed, and not a sensitive species");
}
