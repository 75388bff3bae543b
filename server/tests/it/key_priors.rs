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
    assert_eq!(
        near["counts"],
        json!({"Scyliorhinus canicula": 1, "Squatina squatina": 1}),
        "the record awaiting review is not counted"
    );
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

#[tokio::test]
async fn a_pick_stopped_at_a_genus_is_exported_at_that_rank_and_generalised_like_its_species() {
    let app = spawn_app().await;
    // "The key says Dipturus": both its species are "tenthDegree" in the demo checklist
    // (Chapman 2020), so the public export rounds the genus-rank record to 0.1° too.
    let mut record = submission("2c000000-0000-4000-8000-000000000010");
    record["species_guess"] = json!("genus Dipturus");
    record["position"] = json!({"latitude": 52.3467, "longitude": -4.2611, "accuracy_m": 10.0, "source": "device"});
    record["key_choice"] = json!({"scientific_name": "Dipturus", "taxon_rank": "genus", "probability": 0.93, "answers": {"bodyForm": "rayLike"}});
    assert_eq!(app.submit(&record, &[]).await.status, 200);
    let public: Value = app
        .client
        .get(format!("{}/api/export?format=geojson&state=any", app.base))
        .send()
        .await
        .unwrap()
        .json()
        .await
        .unwrap();
    let feature = &public["features"][0];
    assert_eq!(
        (feature["properties"]["scientificName"].as_str(), feature["properties"]["taxonRank"].as_str()),
        (Some("Dipturus"), Some("genus"))
    );
    assert_eq!(
        feature["geometry"]["coordinates"],
        json!([-4.3, 52.3]),
        "RFC 7946 lon, lat; rounded as its species are"
    );
    let skates: Value = app
        .client
        .get(format!("{}/api/export?format=geojson&state=any&taxon=Rajidae", app.base))
        .send()
        .await
        .unwrap()
        .json()
        .await
        .unwrap();
    assert_eq!(skates["features"].as_array().unwrap().len(), 1, "a genus record is in its family");
    let one_species: Value = app
        .client
        .get(format!("{}/api/export?format=geojson&state=any&taxon=Dipturus%20batis", app.base))
        .send()
        .await
        .unwrap()
        .json()
        .await
        .unwrap();
    assert_eq!(one_species["features"].as_array().unwrap().len(), 0, "but not in one of its species");
}
