//! A merged animal is described by the report the merge kept (the earliest seen), with the
//! most precise position of its reports and every observer's name.

use serde_json::{Value, json};

use super::{row, term};
use crate::helpers::{TestApp, spawn_app, submission};
use crate::python::{run_script, terms_extract};

/// Seen on 3 June but sent first (the lower id); its phone had a good fix.
const SEEN_LATER: &str = "1b2c3d4e-0000-4000-8000-0000000000b1";
/// Seen on 1 June but sent second; a poorer fix.
const SEEN_EARLIER: &str = "1b2c3d4e-0000-4000-8000-0000000000b2";

async fn post_json(app: &TestApp, path: &str, body: Value) -> (u16, Value) {
    let response = app.reviewer.sign(app.client.post(format!("{}{path}", app.base))).json(&body).send().await.unwrap();
    let status = response.status().as_u16();
    (status, response.json().await.unwrap_or(Value::Null))
}

/// Two reports of one catshark merged by a reviewer, the kept one then confirmed.
async fn merged_and_confirmed() -> TestApp {
    let app = spawn_app().await;
    let mut later = submission(SEEN_LATER);
    later["observed_at"] = json!("2025-06-03T09:00:00+01:00");
    later["position"] = json!({"latitude": 52.41612, "longitude": -4.08305, "accuracy_m": 4.0, "source": "device"});
    later["observer_name"] = json!("Walker One");
    assert_eq!(app.submit(&later, &[]).await.status, 200);
    let mut earlier = submission(SEEN_EARLIER);
    earlier["position"] = json!({"latitude": 52.4153, "longitude": -4.0829, "accuracy_m": 35.0, "source": "device"});
    earlier["observer_name"] = json!("Walker Two");
    assert_eq!(app.submit(&earlier, &[]).await.status, 200);
    let (status, body) = post_json(
        &app,
        &format!("/api/review/records/{SEEN_LATER}/duplicates/{SEEN_EARLIER}"),
        json!({"same_animal": true}),
    )
    .await;
    assert_eq!((status, body["decision"].as_str()), (200, Some("same animal")), "{body}");
    // The merge keeps the report seen earliest; the reviewer confirms that one.
    let confirm = json!({"action": "confirm", "scientific_name": "Scyliorhinus canicula", "taxon_rank": "species"});
    let (status, body) = post_json(&app, &format!("/api/review/records/{SEEN_EARLIER}/actions"), confirm).await;
    assert_eq!(status, 200, "{body}");
    app
}

#[tokio::test]
async fn a_merged_animal_is_the_kept_report_with_the_best_position_and_every_observer() {
    let app = merged_and_confirmed().await;
    let dir = tempfile::tempdir().unwrap();
    let zip = super::download(&app, "format=dwca&state=confirmed", dir.path(), "merged.zip").await;
    let archive = run_script("read_dwca.py", &[&zip, &terms_extract()]);
    let rows = archive["rows"].as_array().unwrap();
    assert_eq!(rows.len(), 1, "the confirmed animal passes a confirmed-only filter, once: {rows:?}");
    let animal = row(&archive, SEEN_EARLIER);
    assert_eq!(term(animal, "identificationVerificationStatus"), "confirmed", "the kept report's state, not `merged`");
    assert_eq!(term(animal, "identifiedBy"), "Test reviewer", "the reviewer's identification");
    // The most precise of the two positions (the smaller uncertainty), whichever report has it.
    assert_eq!((term(animal, "decimalLatitude"), term(animal, "coordinateUncertaintyInMeters")), ("52.416120", "4"));
    // TDWG Darwin Core recordedBy: a list with " | " between, the primary observer first.
    assert_eq!(term(animal, "recordedBy"), "Walker Two | Walker One");
    assert_eq!(term(animal, "associatedOccurrences"), format!("same organism: urn:uuid:{SEEN_LATER}"));
    assert_eq!(
        term(animal, "eventDate"),
        "2025-06-01T13:10:00Z/2025-06-03T08:00:00Z",
        "ISO 8601 interval over both reports"
    );
}

#[tokio::test]
async fn the_merged_away_report_is_never_the_animal_in_csv_or_geojson() {
    let app = merged_and_confirmed().await;
    let csv = app.get("/api/export?format=csv&state=any").await.text().await.unwrap();
    let mut reader = csv::Reader::from_reader(csv.as_bytes());
    let headers = reader.headers().unwrap().clone();
    let records: Vec<csv::StringRecord> = reader.records().map(Result::unwrap).collect();
    assert_eq!(records.len(), 1, "{csv}");
    let value = |name: &str| records[0].get(headers.iter().position(|h| h == name).unwrap()).unwrap().to_owned();
    assert_eq!(value("occurrenceID"), format!("urn:uuid:{SEEN_EARLIER}"));
    assert_eq!(value("reviewState"), "confirmed");
    let geojson: Value = app.get("/api/export?format=geojson&state=merged").await.json().await.unwrap();
    assert_eq!(geojson["features"], json!([]), "no animal stands for its merged-away report");
}
