//! Life stage from the phone to every export, and an egg case that makes sense: a count,
//! no body length.

use serde_json::{Value, json};

use super::{download, row, term};
use crate::helpers::{spawn_app, submission};
use crate::python::{run_script, terms_extract};

const EGG_CASES: &str = "1b2c3d4e-0000-4000-8000-0000000000f1";
const JUVENILE: &str = "1b2c3d4e-0000-4000-8000-0000000000f2";

#[tokio::test]
async fn a_life_stage_reaches_csv_geojson_and_the_archive() {
    let app = spawn_app().await;
    let mut eggs = submission(EGG_CASES);
    eggs["life_stage"] = json!("egg_case");
    eggs["count"] = json!(4);
    eggs["length"] = Value::Null;
    eggs["condition"] = json!("remains_only");
    eggs["species_guess"] = json!("thornback ray");
    assert_eq!(app.submit(&eggs, &[]).await.status, 200, "an egg case needs no length");
    let mut young = submission(JUVENILE);
    young["life_stage"] = json!("juvenile");
    assert_eq!(app.submit(&young, &[]).await.status, 200);

    // Darwin Core lifeStage with the GBIF Life Stage vocabulary (rs.gbif.org/vocabulary/gbif/life_stage):
    // `egg` (listed under embryo), `juvenile`.
    let dir = tempfile::tempdir().unwrap();
    let archive =
        run_script("read_dwca.py", &[&download(&app, "format=dwca", dir.path(), "stages.zip").await, &terms_extract()]);
    let egg_row = row(&archive, EGG_CASES);
    assert_eq!((term(egg_row, "lifeStage"), term(egg_row, "individualCount")), ("egg", "4"));
    assert_eq!(term(egg_row, "scientificName"), "Raja clavata");
    let measurements = egg_row["extensions"]
        .as_array()
        .unwrap()
        .iter()
        .filter(|e| e["rowtype"].as_str().unwrap().ends_with("MeasurementOrFact"))
        .count();
    assert_eq!(measurements, 0, "no length row for egg cases");
    assert_eq!(term(row(&archive, JUVENILE), "lifeStage"), "juvenile");

    let csv = app.get("/api/export?format=csv&state=any").await.text().await.unwrap();
    let mut reader = csv::Reader::from_reader(csv.as_bytes());
    let column = reader.headers().unwrap().iter().position(|h| h == "lifeStage").expect("a lifeStage column");
    let mut stages: Vec<String> = reader.records().map(|r| r.unwrap()[column].to_owned()).collect();
    stages.sort();
    assert_eq!(stages, ["egg", "juvenile"]);

    let geojson: Value = app.get("/api/export?format=geojson&state=any").await.json().await.unwrap();
    let feature =
        geojson["features"].as_array().unwrap().iter().find(|f| f["id"] == format!("urn:uuid:{EGG_CASES}")).unwrap();
    assert_eq!(feature["properties"]["lifeStage"], "egg");
}

#[tokio::test]
async fn an_egg_case_with_a_body_length_is_refused_naming_the_length() {
    let app = spawn_app().await;
    let mut eggs = submission(EGG_CASES);
    eggs["life_stage"] = json!("egg_case");
    let answer = app.submit(&eggs, &[]).await;
    assert_eq!(answer.status, 422, "{}", answer.body);
    assert_eq!(answer.body["field"], "length");
    assert!(answer.body["error"].as_str().unwrap().contains("egg case"), "{}", answer.body);
    let mut unknown = submission(JUVENILE);
    unknown["life_stage"] = json!("larva");
    assert_eq!(app.submit(&unknown, &[]).await.status, 422, "only the stages the app offers");
}
