//! The same animal reported twice: found on arrival (also when both arrive at once),
//! shown to reviewers with reasons, merged into one organism or kept apart, and a merge
//! undone exactly. Nothing is ever deleted. Thresholds: `server/src/duplicates.rs`.

use serde_json::{Value, json};

use crate::helpers::{TestApp, plain_jpeg, spawn_app, submission};

const FIRST: &str = "d0000000-0000-4000-8000-000000000001";
const SECOND: &str = "d0000000-0000-4000-8000-000000000002";

/// The same thornback ray: found fresh at Borth, then a day later 300 m along the beach.
fn carcass(id: &str, day: u32, north_m: f64) -> Value {
    let mut record = submission(id);
    record["species_guess"] = json!("thornback ray");
    record["setting"] = json!("beach_stranding");
    record["condition"] = json!(if day == 0 { "fresh_dead" } else { "decomposed" });
    record["observed_at"] = json!(format!("2025-06-{:02}T09:00:00+01:00", 1 + day));
    record["length"] = json!({"kind": "disc_width", "value": 50.0, "unit": "cm", "method": "measured"});
    // 1e-3° of latitude is about 111.3 m near 52.5°N (common practice).
    record["position"] = json!({"latitude": 52.4890 + north_m / 111_300.0, "longitude": -4.0530, "accuracy_m": 10.0, "source": "device"});
    record
}

async fn detail(app: &TestApp, id: &str) -> Value {
    app.get(&format!("/api/review/records/{id}")).await.json().await.unwrap()
}

async fn decide(app: &TestApp, id: &str, other: &str, same: bool) -> (u16, Value) {
    let url = format!("{}/api/review/records/{id}/duplicates/{other}", app.base);
    let response = app.reviewer.sign(app.client.post(url)).json(&json!({"same_animal": same})).send().await.unwrap();
    (response.status().as_u16(), response.json().await.unwrap_or(Value::Null))
}

/// Every row of the tables a merge touches, to compare before and after.
fn snapshot(app: &TestApp) -> Vec<String> {
    let conn = rusqlite::Connection::open(app.data_dir.join("wrackline.sqlite3")).unwrap();
    let mut rows = Vec::new();
    for (table, order) in [("observations", "id"), ("organisms", "id"), ("identifications", "id"), ("observation_photos", "observation_id, position")] {
        let mut stmt = conn.prepare(&format!("SELECT * FROM {table} ORDER BY {order}")).unwrap();
        let columns = stmt.column_count();
        let mut query = stmt.query([]).unwrap();
        while let Some(row) = query.next().unwrap() {
            let values: Vec<String> = (0..columns).map(|i| format!("{:?}", row.get_ref(i).unwrap())).collect();
            rows.push(format!("{table}: {}", values.join(" | ")));
        }
    }
    rows
}

fn counts(app: &TestApp) -> Vec<i64> {
    let conn = rusqlite::Connection::open(app.data_dir.join("wrackline.sqlite3")).unwrap();
    ["observations", "organisms", "identifications", "photos", "observation_photos", "review_events", "duplicate_candidates", "duplicate_decisions", "merges"]
        .iter()
        .map(|t| conn.query_row(&format!("SELECT COUNT(*) FROM {t}"), [], |r| r.get(0)).unwrap())
        .collect()
}

#[tokio::test]
async fn a_carcass_reported_twice_is_found_with_its_reasons_both_ways() {
    let app = spawn_app().await;
    app.submit(&carcass(FIRST, 0, 0.0), &[plain_jpeg(1)]).await;
    app.submit(&carcass(SECOND, 1, 300.0), &[plain_jpeg(2)]).await;
    let first = detail(&app, FIRST).await;
    let duplicates = first["duplicates"].as_array().unwrap();
    assert_eq!(duplicates.len(), 1);
    assert_eq!(duplicates[0]["other"]["submission"]["client_id"], SECOND);
    let reasons = duplicates[0]["reasons"].to_string();
    assert!(reasons.contains("m apart") && reasons.contains("24.0 h apart") && reasons.contains("the same taxon, Raja clavata"), "{reasons}");
    assert!((duplicates[0]["distance_m"].as_f64().unwrap() - 300.0).abs() < 2.0);
    assert_eq!(detail(&app, SECOND).await["duplicates"][0]["other"]["submission"]["client_id"], FIRST);
    let queue: Vec<Value> = app.get("/api/review/queue").await.json().await.unwrap();
    assert!(queue.iter().all(|i| i["priority_reasons"].to_string().contains("possibly the same animal")));

    // A different species at the same place and time is not a candidate.
    let mut other = carcass("d0000000-0000-4000-8000-000000000003", 1, 100.0);
    other["species_guess"] = json!("spurdog");
    other["length"] = Value::Null;
    app.submit(&other, &[]).await;
    assert_eq!(detail(&app, "d0000000-0000-4000-8000-000000000003").await["duplicates"], json!([]));
}

#[tokio::test]
async fn two_devices_sending_the_same_animal_at_once_become_candidates_of_each_other() {
    let app = std::sync::Arc::new(spawn_app().await);
    let (phone_a, phone_b) = (app.new_device().await, app.new_device().await);
    let (a, b) = (app.clone(), app.clone());
    let first = tokio::spawn(async move { a.submit_as(&phone_a, &carcass(FIRST, 0, 0.0), &[plain_jpeg(3)]).await.status });
    let second = tokio::spawn(async move { b.submit_as(&phone_b, &carcass(SECOND, 0, 50.0), &[plain_jpeg(4)]).await.status });
    assert_eq!((first.await.unwrap(), second.await.unwrap()), (200, 200));
    assert_eq!(detail(&app, FIRST).await["duplicates"][0]["other"]["submission"]["client_id"], SECOND);
    assert_eq!(detail(&app, SECOND).await["duplicates"][0]["other"]["submission"]["client_id"], FIRST);
}

#[tokio::test]
async fn a_merge_makes_one_animal_and_undoing_it_restores_every_row() {
    let app = spawn_app().await;
    app.submit(&carcass(FIRST, 0, 0.0), &[plain_jpeg(1)]).await;
    app.submit(&carcass(SECOND, 1, 300.0), &[plain_jpeg(2)]).await;
    let before = snapshot(&app);
    let counts_before = counts(&app);

    let (status, merged) = decide(&app, SECOND, FIRST, true).await;
    assert_eq!(status, 200, "{merged}");
    let merge_id = merged["merge_id"].as_i64().unwrap();
    let second = detail(&app, SECOND).await;
    assert_eq!(second["record"]["review_state"], "merged");
    assert_eq!(second["record"]["organism_id"], detail(&app, FIRST).await["record"]["organism_id"]);
    // Exports count the animal once, with both reports' photos and the interval.
    let csv = app.get("/api/export?format=csv").await.text().await.unwrap();
    assert_eq!(csv.lines().count(), 2, "header and one animal:\n{csv}");
    assert!(csv.contains("2025-06-01T08:00:00Z/2025-06-02T08:00:00Z"), "{csv}");
    // TDWG Darwin Core associatedOccurrences: the other report of the same organism.
    assert!(csv.contains(&format!("same organism: urn:uuid:{SECOND}")), "{csv}");
    assert!(counts(&app).iter().zip(&counts_before).all(|(after, before)| after >= before), "nothing deleted by a merge");
    assert_eq!(decide(&app, SECOND, FIRST, true).await.0, 409, "a merged record is not merged twice");

    let undo = app.reviewer.sign(app.client.post(format!("{}/api/review/merges/{merge_id}/undo", app.base))).send().await.unwrap();
    assert_eq!(undo.status(), 200);
    assert_eq!(snapshot(&app), before, "the records and animals are exactly as before the merge");
    let again = app.reviewer.sign(app.client.post(format!("{}/api/review/merges/{merge_id}/undo", app.base))).send().await.unwrap();
    assert_eq!(again.status(), 404, "a merge is undone once");
    let history: Vec<String> = detail(&app, SECOND).await["events"].as_array().unwrap().iter().map(|e| e["action"].as_str().unwrap().to_owned()).collect();
    assert_eq!(history, ["merge", "undo_merge"]);
}

#[tokio::test]
async fn different_animals_are_remembered_and_not_suggested_again() {
    let app = spawn_app().await;
    app.submit(&carcass(FIRST, 0, 0.0), &[]).await;
    app.submit(&carcass(SECOND, 1, 300.0), &[]).await;
    assert_eq!(decide(&app, FIRST, SECOND, false).await.0, 200);
    assert_eq!(detail(&app, FIRST).await["duplicates"][0]["decision"], "different animals");
    let queue: Vec<Value> = app.get("/api/review/queue").await.json().await.unwrap();
    assert!(queue.iter().all(|i| !i["priority_reasons"].to_string().contains("possibly the same animal")), "no longer suggested");
}
