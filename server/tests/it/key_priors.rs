//! What the guided key learns from the server besides the checklist: confirmed records
//! near a place, per species (`GET /api/checklist/nearby`) — counts only, confirmed
//! records only, and a sensitive species counted from its generalised position.

use serde_json::{Value, json};

use crate::helpers::{TestApp, spawn_app, submission};

async fn record(app: &TestApp, id: &str, guess: &str, lat: f64, lon: f64) {
    let mut record = submission(id);
    record["species_guess"] = json!(guess);
    record["position"] = json!({"latitude": lat, "longitude": lon, "accuracy_m": 10.0, "source": "device"});
    assert_eq!(app.submit(&record, &[]).await.status, 200);
}

async fn confirm(app: &TestApp, id: &str, name: &str) {
    let request = app.client.post(format!("{}/api/review/records/{id}/actions", app.base));
    let body = json!({"action": "confirm", "scientific_name": name, "taxon_rank": "species"});
    let response = app.reviewer.sign(request).json(&body).send().await.unwrap();
    assert_eq!(response.status(), 200, "{}", response.text().await.unwrap());
}

async fn nearby(app: &TestApp, query: &str) -> (u16, Value) {
    let response = app.client.get(format!("{}/api/checklist/nearby?{query}", app.base)).send().await.unwrap();
    (response.status().as_u16(), response.json().await.unwrap())
}

#[tokio::test]
async fn nearby_counts_confirmed_records_per_species_and_never_says_where() {
    let app = spawn_app().await;
    let catshark = "2c000000-0000-4000-8000-000000000001";
    record(&app, catshark, "small-spotted catshark", 52.41, -4.09).await;
    confirm(&app, catshark, "Scyliorhinus canicula").await;
    record(&app, "2c000000-0000-4000-8000-000000000002", "small-spotted catshark", 52.41, -4.09).await; // awaiting review
    // An angelshark ("tenthDegree" in the demo checklist, after Chapman 2020): recorded at
    // 52.46 N 4.26 W, published as 52.5 N 4.3 W.
    let angel = "2c000000-0000-4000-8000-000000000003";
    record(&app, angel, "angelshark", 52.46, -4.26).await;
    confirm(&app, angel, "Squatina squatina").await;

    // From 52.2 N 4.26 W both confirmed records are within 50 km.
    let (status, near) = nearby(&app, "lat=52.2&lon=-4.26").await;
    assert_eq!(status, 200, "{near}");
    assert_eq!(near["counts"], json!({"Scyliorhinus canicula": 1, "Squatina squatina": 1}), "the record awaiting review is not counted");
    assert_eq!(near["radius_km"], 50.0);
    let keys: Vec<&str> = near.as_object().unwrap().keys().map(String::as_str).collect();
    assert_eq!(keys, ["counts", "latitude", "longitude", "note", "radius_km"], "counts only: no record positions");

    // 52.03 N 4.26 W is about 48 km from where the angelshark was, but about 52 km from
    // its public position: a probe there must not find it.
    let (_, edge) = nearby(&app, "lat=52.03&lon=-4.26").await;
    assert_eq!(edge["counts"], json!({"Scyliorhinus canicula": 1}), "{edge}");

    let (status, refused) = nearby(&app, "lat=95&lon=-4.26").await;
    assert_eq!(status, 422);
    assert_eq!(refused["field"], "lat", "{refused}");
    let (status, missing) = nearby(&app, "lon=-4.26").await;
    assert_eq!((status, missing["field"].as_str()), (422, Some("lat")));
}
