//! Identifications above species (the key stopped at a genus or family) export their name
//! and rank, and are generalised like the most sensitive of their species.

use serde_json::{Value, json};

use crate::helpers::{TestApp, spawn_app, submission};

const GENUS: &str = "1b2c3d4e-0000-4000-8000-0000000000c1";
const FAMILY: &str = "1b2c3d4e-0000-4000-8000-0000000000c2";

/// A record whose observer stopped the key at `name` (`rank`), at a place given to 4 decimals.
pub(super) fn key_stop(id: &str, name: &str, rank: &str) -> Value {
    let mut record = submission(id);
    record["species_guess"] = json!("a big skate");
    record["key_choice"] = json!({"scientific_name": name, "taxon_rank": rank, "probability": 0.74, "answers": {}});
    record["position"] = json!({"latitude": 52.3467, "longitude": -4.1234, "accuracy_m": 10.0, "source": "device"});
    record
}

async fn app_with_key_stops() -> TestApp {
    let app = spawn_app().await;
    assert_eq!(app.submit(&key_stop(GENUS, "Dipturus", "genus"), &[]).await.status, 200);
    assert_eq!(app.submit(&key_stop(FAMILY, "Rajidae", "family"), &[]).await.status, 200);
    app
}

/// CSV rows as maps from column name to value.
async fn csv_rows(app: &TestApp, query: &str) -> Vec<std::collections::HashMap<String, String>> {
    let text = app.get(&crate::helpers::export_path(&format!("format=csv&{query}"))).await.text().await.unwrap();
    let mut reader = csv::Reader::from_reader(text.as_bytes());
    let headers = reader.headers().unwrap().clone();
    reader
        .records()
        .map(|r| headers.iter().map(str::to_owned).zip(r.unwrap().iter().map(str::to_owned)).collect())
        .collect()
}

#[tokio::test]
async fn a_genus_or_family_pick_exports_its_name_and_rank_generalised_like_its_strictest_species() {
    let app = app_with_key_stops().await;
    let public = csv_rows(&app, "").await;
    let by_id = |id: &str| public.iter().find(|r| r["occurrenceID"] == format!("urn:uuid:{id}")).unwrap();
    // TDWG Darwin Core taxonRank values: genus, family.
    assert_eq!((by_id(GENUS)["scientificName"].as_str(), by_id(GENUS)["taxonRank"].as_str()), ("Dipturus", "genus"));
    assert_eq!((by_id(FAMILY)["scientificName"].as_str(), by_id(FAMILY)["taxonRank"].as_str()), ("Rajidae", "family"));
    // Demo checklist: every Dipturus is tenthDegree; Rajidae holds them. Chapman 2020 (GBIF): 0.1° grid.
    for id in [GENUS, FAMILY] {
        assert_eq!(
            (by_id(id)["decimalLatitude"].as_str(), by_id(id)["decimalLongitude"].as_str()),
            ("52.3", "-4.1"),
            "{id}"
        );
        assert!(by_id(id)["dataGeneralizations"].contains("0.1 degree"), "{id}");
    }
    let full = app.get("/api/export?format=csv&audience=full&state=any").await.text().await.unwrap();
    assert!(full.contains("52.346700"), "assessors get it as recorded");
}

#[tokio::test]
async fn a_taxon_filter_takes_in_identifications_at_or_below_its_rank() {
    let app = app_with_key_stops().await;
    let ids = |rows: Vec<std::collections::HashMap<String, String>>| {
        let mut ids: Vec<String> = rows.into_iter().map(|r| r["occurrenceID"].clone()).collect();
        ids.sort();
        ids
    };
    assert_eq!(
        ids(csv_rows(&app, "taxon=Rajidae").await).len(),
        2,
        "a genus and the family itself are inside the family"
    );
    assert_eq!(
        ids(csv_rows(&app, "taxon=Dipturus").await),
        [format!("urn:uuid:{GENUS}")],
        "the family may be another genus"
    );
    assert!(ids(csv_rows(&app, "taxon=Dipturus%20batis").await).is_empty(), "a genus may be the other species");
}

#[tokio::test]
async fn the_review_queue_puts_a_genus_of_protected_species_first() {
    let app = app_with_key_stops().await;
    let mut catshark = submission("1b2c3d4e-0000-4000-8000-0000000000c3");
    catshark["observed_at"] = json!("2025-05-01T10:00:00+01:00");
    assert_eq!(app.submit(&catshark, &[]).await.status, 200, "older, so first were nothing else to go by");
    let queue: Value = app.get("/api/review/queue").await.json().await.unwrap();
    let items = queue.as_array().unwrap();
    assert_eq!(items.len(), 3);
    let reasons = items[0]["priority_reasons"].to_string();
    assert!(reasons.contains("Dipturus is protected") || reasons.contains("Rajidae is protected"), "{reasons}");
    assert_eq!(
        items[2]["record"]["submission"]["client_id"], "1b2c3d4e-0000-4000-8000-0000000000c3",
        "the catshark last"
    );
}
