//! Survey walks in archives: what a walk found comes from all of its records whatever the
//! filters, the area filter applies to walks, a walk that found a sensitive species is
//! generalised in public, and absences are never read back as records.

use std::process::Command;

use serde_json::{Value, json};

use super::{download, ext_term, extension_rows, row, term};
use crate::helpers::{TestApp, spawn_app, submission};
use crate::python::{run_script, terms_extract};

const BORTH: &str = "aaaaaaaa-0000-4000-8000-0000000000d1";
const ELSEWHERE: &str = "aaaaaaaa-0000-4000-8000-0000000000d2";
const CATSHARK: &str = "1b2c3d4e-0000-4000-8000-0000000000d3";
const RAY: &str = "1b2c3d4e-0000-4000-8000-0000000000d4";

/// Posts, from the phone with `phone` as its identity, an all-finds walk with a two-fix
/// track starting at (`lat`, `lon`).
async fn walk_at(app: &TestApp, phone: &str, id: &str, (lat, lon): (f64, f64), stretch: &str) {
    let walk = json!({
        "client_id": id, "started_at": "2026-04-12T09:00:00+01:00", "ended_at": "2026-04-12T10:30:00+01:00",
        "stretch": stretch, "all_finds_reported": true, "typed_distance_m": null, "observer_name": "Test Walker",
        "track": [
            {"latitude": lat, "longitude": lon, "accuracy_m": 5.0, "at": "2026-04-12T09:00:00+01:00"},
            {"latitude": lat + 0.001, "longitude": lon, "accuracy_m": 5.0, "at": "2026-04-12T09:02:00+01:00"}
        ]
    });
    let answer = app.post_walk_as(phone, &walk).await;
    assert_eq!(answer.status, 200, "{}", answer.body);
}

/// A find on `walk`, named as `guess`, from the walk's phone.
async fn find_on(app: &TestApp, phone: &str, id: &str, walk: &str, guess: &str) {
    let mut record = submission(id);
    record["walk_client_id"] = json!(walk);
    record["species_guess"] = json!(guess);
    record["observed_at"] = json!("2026-04-12T09:30:00+01:00");
    assert_eq!(app.submit_as(phone, &record, &[]).await.status, 200);
}

async fn archive(app: &TestApp, query: &str) -> Value {
    let dir = tempfile::tempdir().unwrap();
    let zip = download(app, query, dir.path(), "walks.zip").await;
    run_script("read_dwca.py", &[&zip, &terms_extract()])
}

/// `scientificName`s of the walk's absences (occurrenceStatus notDetected).
fn absences(archive: &Value, walk: &str) -> Vec<String> {
    let mut names: Vec<String> = extension_rows(row(archive, walk))
        .into_iter()
        .filter(|o| ext_term(o, "occurrenceStatus") == "notDetected")
        .map(|o| ext_term(o, "scientificName").to_owned())
        .collect();
    names.sort();
    names
}

#[tokio::test]
async fn a_filtered_archive_takes_what_each_walk_found_from_all_its_records() {
    let app = spawn_app().await;
    let phone = app.new_device().await;
    walk_at(&app, &phone, BORTH, (52.48912, -4.05331), "Borth to Ynyslas").await;
    find_on(&app, &phone, CATSHARK, BORTH, "small-spotted catshark").await;
    find_on(&app, &phone, RAY, BORTH, "thornback ray").await;
    let confirm = json!({"action": "confirm", "scientific_name": "Raja clavata", "taxon_rank": "species"});
    let response = app
        .reviewer
        .sign(app.client.post(format!("{}/api/review/records/{RAY}/actions", app.base)))
        .json(&confirm)
        .send()
        .await
        .unwrap();
    assert_eq!(response.status(), 200);
    // Only the confirmed ray passes the filter, but the catshark was found on the walk all the same.
    for query in ["format=dwca&state=confirmed", "format=dwca&taxon=Rajidae", "format=dwca"] {
        let archive = archive(&app, query).await;
        assert_eq!(archive["core_row_type"], "http://rs.tdwg.org/dwc/terms/Event");
        assert_eq!(absences(&archive, BORTH), Vec::<String>::new(), "{query}: both groups were found, so no absence");
    }
}

#[tokio::test]
async fn a_skate_identified_only_to_family_is_a_ray_find_on_its_walk() {
    let app = spawn_app().await;
    let phone = app.new_device().await;
    walk_at(&app, &phone, BORTH, (52.48912, -4.05331), "Borth to Ynyslas").await;
    let mut skate = super::higher_taxa::key_stop(RAY, "Rajidae", "family");
    skate["walk_client_id"] = json!(BORTH);
    skate["observed_at"] = json!("2026-04-12T09:30:00+01:00");
    assert_eq!(app.submit_as(&phone, &skate, &[]).await.status, 200);
    let archive = archive(&app, "format=dwca").await;
    // Rajidae lies wholly in Batoidea (demo checklist): a ray-and-skate find, so only sharks were not detected.
    assert_eq!(absences(&archive, BORTH), ["Selachimorpha"]);
}

#[tokio::test]
async fn the_area_filter_applies_to_walks() {
    let app = spawn_app().await;
    let phone = app.new_device().await;
    walk_at(&app, &phone, BORTH, (52.48912, -4.05331), "Borth to Ynyslas").await;
    walk_at(&app, &phone, ELSEWHERE, (51.6210, -5.1030), "Freshwater West").await;
    let archive = archive(&app, "format=dwca&bbox=52.3,-4.2,52.6,-3.9").await;
    let events: Vec<&str> = archive["rows"].as_array().unwrap().iter().map(|r| r["id"].as_str().unwrap()).collect();
    assert_eq!(events, [format!("urn:uuid:{BORTH}")], "only the walk inside the box");
    let dir = tempfile::tempdir().unwrap();
    let none = download(&app, "format=dwca&bbox=10,10,11,11", dir.path(), "none.zip").await;
    let archive = run_script("read_dwca.py", &[&none, &terms_extract()]);
    assert_eq!(
        archive["core_row_type"], "http://rs.tdwg.org/dwc/terms/Occurrence",
        "no walk in the box: an occurrence core"
    );
}

#[tokio::test]
async fn a_walk_that_found_a_sensitive_species_is_generalised_in_public() {
    let app = spawn_app().await;
    let phone = app.new_device().await;
    walk_at(&app, &phone, BORTH, (52.48912, -4.05331), "Borth to Ynyslas").await;
    walk_at(&app, &phone, ELSEWHERE, (51.6210, -5.1030), "Freshwater West").await;
    find_on(&app, &phone, CATSHARK, ELSEWHERE, "angelshark").await;
    let public = archive(&app, "format=dwca").await;
    let sensitive = row(&public, ELSEWHERE);
    // Chapman 2020 (GBIF): the angelshark's records are rounded to 0.1° in public; so is the walk
    // that found it, and the stretch's name, which would place it, is withheld.
    assert_eq!(term(sensitive, "locality"), "");
    assert_eq!((term(sensitive, "decimalLatitude"), term(sensitive, "decimalLongitude")), ("51.6", "-5.1"));
    assert!(
        term(sensitive, "dataGeneralizations").contains("Locality withheld"),
        "{}",
        term(sensitive, "dataGeneralizations")
    );
    assert!(term(sensitive, "informationWithheld").contains("stretch"), "{}", term(sensitive, "informationWithheld"));
    assert_eq!(
        term(row(&public, BORTH), "locality"),
        "Borth to Ynyslas",
        "a walk with no sensitive find keeps its name"
    );
    let full = archive(&app, "format=dwca&audience=full").await;
    assert_eq!(term(row(&full, ELSEWHERE), "locality"), "Freshwater West", "assessors see it as recorded");
    assert_eq!(term(row(&full, ELSEWHERE), "decimalLatitude"), "51.621000");
}

#[tokio::test]
async fn range_from_an_event_core_archive_counts_finds_not_absences() {
    let app = spawn_app().await;
    let phone = app.new_device().await;
    walk_at(&app, &phone, BORTH, (52.48912, -4.05331), "Borth to Ynyslas").await;
    walk_at(&app, &phone, ELSEWHERE, (51.6210, -5.1030), "Freshwater West").await;
    find_on(&app, &phone, CATSHARK, BORTH, "small-spotted catshark").await;
    let dir = tempfile::tempdir().unwrap();
    let zip = download(&app, "format=dwca&audience=full", dir.path(), "events.zip").await;
    let archive = run_script("read_dwca.py", &[&zip, &terms_extract()]);
    let status = |walk: &str| {
        extension_rows(row(&archive, walk))
            .iter()
            .map(|o| ext_term(o, "occurrenceStatus").to_owned())
            .collect::<Vec<_>>()
    };
    assert_eq!(status(ELSEWHERE), ["notDetected", "notDetected"], "the archive does hold absences");
    let output =
        Command::new(env!("CARGO_BIN_EXE_wrackline")).args(["range", "--json", "--from"]).arg(&zip).output().unwrap();
    assert!(output.status.success(), "{}", String::from_utf8_lossy(&output.stderr));
    let report: Value = serde_json::from_slice(&output.stdout).unwrap();
    assert_eq!(
        report["records_read"], 1,
        "the catshark; the three absences (individualCount 0, notDetected) are not records"
    );
    let taxa: Vec<&str> = report["taxa"].as_array().unwrap().iter().map(|t| t["taxon"].as_str().unwrap()).collect();
    assert_eq!(taxa, ["Scyliorhinus canicula"]);
}
