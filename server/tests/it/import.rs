//! `wrackline import`, run as the real binary on the data directory of a running test
//! server: a messy spreadsheet through a mapping file (the example in
//! `demo-records/import/`), an archive exported by another wrackline server, re-runs that
//! add nothing, a changed row reported, a duplicate of a stored record linked, and the
//! imported records found in the review queue and the exports. Archives are read back
//! with python-dwca-reader 0.17.1 (PyPI), a general-purpose Darwin Core Archive reader.

use std::path::{Path, PathBuf};
use std::process::Command;

use serde_json::{Value, json};

use crate::helpers::{TestApp, export_path, spawn_app, submission};
use crate::python::{run_script, terms_extract};

const DWC: &str = "http://rs.tdwg.org/dwc/terms/";

fn example(name: &str) -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join("../demo-records/import").join(name)
}

/// Runs `wrackline import` on `app`'s data directory with `args`; (exit ok, stdout, stderr).
fn import(app: &TestApp, args: &[&str]) -> (bool, String, String) {
    let output = Command::new(env!("CARGO_BIN_EXE_wrackline"))
        .arg("--data-dir")
        .arg(&app.data_dir)
        .arg("import")
        .args(args)
        .output()
        .expect("running wrackline import");
    let text = |bytes: &[u8]| String::from_utf8_lossy(bytes).into_owned();
    (output.status.success(), text(&output.stdout), text(&output.stderr))
}

/// `import` with `--json`, the report read.
fn import_json(app: &TestApp, args: &[&str]) -> Value {
    let mut with_json = args.to_vec();
    with_json.push("--json");
    let (ok, stdout, stderr) = import(app, &with_json);
    assert!(ok, "import failed:\n{stderr}");
    serde_json::from_str(&stdout).unwrap_or_else(|err| panic!("{err}: {stdout}"))
}

fn sheet_args(mapping: &str) -> Vec<String> {
    vec![example("old-sheet.csv").display().to_string(), "--mapping".into(), example(mapping).display().to_string()]
}

async fn queue(app: &TestApp) -> Vec<Value> {
    let response = app.get("/api/review/queue").await;
    assert_eq!(response.status(), 200);
    response.json::<Vec<Value>>().await.unwrap()
}

/// The queue's records whose notes or names came from the sheet, by their first note word.
fn record_with<'a>(queue: &'a [Value], observer: &str, day: &str) -> &'a Value {
    queue
        .iter()
        .map(|item| &item["record"])
        .find(|r| {
            r["submission"]["observer_name"].as_str() == Some(observer)
                && r["submission"]["observed_at"].as_str().is_some_and(|t| t.starts_with(day))
        })
        .unwrap_or_else(|| panic!("a record by {observer} on {day} in the queue"))
}

#[tokio::test]
async fn a_messy_spreadsheet_imports_through_a_mapping_file_and_again_adds_nothing() {
    let app = spawn_app().await;
    let args = sheet_args("old-sheet-mapping.toml");
    let args: Vec<&str> = args.iter().map(String::as_str).collect();

    // The dry run says what would happen, row by row, and writes nothing.
    let dry = import_json(&app, &[&args[..], &["--dry-run"]].concat());
    assert_eq!(dry["rows"], 8, "eight data rows, one with a newline inside a quoted field: {dry}");
    assert_eq!(dry["imported"], 5, "{dry}");
    let refused: Vec<(u64, &str)> = dry["refused"]
        .as_array()
        .unwrap()
        .iter()
        .map(|r| (r["line"].as_u64().unwrap(), r["column"].as_str().unwrap()))
        .collect();
    // Lines count the header as 1 and the quoted newline in row 1 as a line of its own.
    assert_eq!(refused, [(5, "Date found"), (6, "Lat"), (7, "Length (mm)")], "{dry}");
    let reasons = dry["refused"].to_string();
    assert!(reasons.contains("`31/02/2018` is not a date"), "{reasons}");
    // The phone's own refusals, word for word (shared-types' checked values).
    assert!(reasons.contains("latitude must be between -90 and 90 degrees, got 95"), "{reasons}");
    assert!(reasons.contains("longer than any shark or ray"), "{reasons}");
    assert!(!reasons.contains("at line 1 column"), "no position in JSON the operator never saw: {reasons}");
    assert!(queue(&app).await.is_empty(), "a dry run writes nothing");

    let (ok, text, progress) = import(&app, &args);
    assert!(ok, "{progress}");
    assert!(text.contains("imported 5 new records"), "{text}");
    assert!(progress.contains("rows 8/8 (100%)") && progress.contains("rows/s"), "progress on stderr: {progress}");

    // Values as the sheet meant them, read back as a reviewer sees them.
    let queue = queue(&app).await;
    assert_eq!(queue.len(), 5);
    for item in &queue {
        assert_eq!(item["record"]["review_state"], "awaiting_review", "imported records wait for review");
    }
    let ray = &record_with(&queue, "Gwen Evans", "2017-03-14")["submission"];
    assert_eq!(ray["observed_at"], "2017-03-14T09:30:00Z");
    assert_eq!(ray["position"]["latitude"], 52.41, "decimal comma");
    assert_eq!(ray["position"]["longitude"], -4.09);
    assert_eq!(ray["sex"], "female");
    assert_eq!(ray["condition"], "fresh_dead");
    assert_eq!(ray["setting"], "beach_stranding");
    assert_eq!(ray["length"], json!({"kind": "total", "value": 480.0, "unit": "mm", "method": "measured"}));
    assert_eq!(ray["notes"], "Tail damaged,\nhook in jaw", "a quoted newline kept");
    assert_eq!(ray["species_guess"], "Raja clavata");
    let catshark = &record_with(&queue, "Dai Morgan", "2017-06-02")["submission"];
    // 52°24.6'N 4°05.4'W = 52.41, -4.09 (sexagesimal arithmetic).
    assert!((catshark["position"]["latitude"].as_f64().unwrap() - 52.41).abs() < 1e-9);
    assert!((catshark["position"]["longitude"].as_f64().unwrap() + 4.09).abs() < 1e-9);
    assert_eq!(catshark["sex"], "unknown", "`unknown` is no value");
    assert_eq!(catshark["species_guess"], "small-spotted catshark", "an unknown scientific name gives way");
    assert_eq!(catshark["condition"], "decomposed");
    assert!(catshark["notes"].as_str().unwrap().contains("the source gives the day only"), "{catshark}");
    assert_eq!(catshark["observed_at"], "2017-06-02T12:00:00Z");
    let spurdog = &queue.iter().find(|i| i["record"]["submission"]["species_guess"] == "spurdog").unwrap()["record"];
    assert_eq!(spurdog["submission"]["condition"], "alive");
    assert_eq!(spurdog["submission"]["sex"], "male");

    // Again, with the TOML mapping and with the CSV one: nothing new.
    for mapping in ["old-sheet-mapping.toml", "old-sheet-mapping.csv"] {
        let args = sheet_args(mapping);
        let args: Vec<&str> = args.iter().map(String::as_str).collect();
        let again = import_json(&app, &args);
        assert_eq!((again["imported"].as_u64(), again["already_imported"].as_u64()), (Some(0), Some(5)), "{again}");
        assert_eq!(again["changed"], json!([]), "{mapping}: {again}");
    }
    let (_, text, _) = import(&app, &args);
    assert!(text.contains("nothing new"), "{text}");
    assert_eq!(app.records().await.len(), 5, "no record stored twice");

    // In the exports: the full export names the source; the public one generalises
    // records not yet reviewed (issue 11) and keeps their source id to itself.
    let full = download_csv(&app, "format=csv&audience=full&state=any").await;
    let ray_row = full.iter().find(|r| r["occurrenceRemarks"].starts_with("Tail damaged")).expect("the ray exported");
    assert_eq!(ray_row["datasetName"], "Invented bay strandings sheet 2017-2020");
    assert_eq!(ray_row["otherCatalogNumbers"], "Invented bay strandings sheet 2017-2020:CB-2017-001");
    assert_eq!(ray_row["decimalLatitude"], "52.410000", "as recorded, to the export's six decimals");
    let public = download_csv(&app, "format=csv&state=any").await;
    assert_eq!(public.len(), 5);
    for row in &public {
        assert_eq!(row["datasetName"], "Invented bay strandings sheet 2017-2020");
        assert_eq!(row["otherCatalogNumbers"], "", "no link to the source's exact record: {row:?}");
        assert!(!row["dataGeneralizations"].is_empty(), "unreviewed, so generalised: {row:?}");
    }
}

/// A CSV export as rows of (column → value).
async fn download_csv(app: &TestApp, query: &str) -> Vec<std::collections::HashMap<String, String>> {
    let response = app.get(&export_path(query)).await;
    assert_eq!(response.status(), 200, "{query}");
    let text = response.text().await.unwrap();
    let mut reader = csv::Reader::from_reader(text.as_bytes());
    let headers = reader.headers().unwrap().clone();
    reader
        .records()
        .map(|r| headers.iter().map(str::to_owned).zip(r.unwrap().iter().map(str::to_owned)).collect())
        .collect()
}

async fn download(app: &TestApp, query: &str, path: &Path) {
    let response = app.get(&export_path(query)).await;
    assert_eq!(response.status(), 200, "{query}");
    std::fs::write(path, response.bytes().await.unwrap()).unwrap();
}

fn term<'a>(row: &'a Value, name: &str) -> &'a str {
    row["data"][format!("{DWC}{name}")].as_str().unwrap_or("")
}

const FIRST: &str = "3d1f6a0c-7b2e-4c59-9e18-2a4b6c8d0e1f";
const SECOND: &str = "8c2e4a6b-1d3f-4e5a-b7c9-0d1e2f3a4b5c";

#[tokio::test]
async fn an_archive_exported_by_one_server_imports_into_another_with_its_values() {
    let source = spawn_app().await;
    let mut first = submission(FIRST);
    first["observed_at"] = json!("2024-09-12T07:40:00+01:00");
    first["life_stage"] = json!("adult");
    assert_eq!(source.submit(&first, &[]).await.status, 200);
    let mut second = submission(SECOND);
    second["species_guess"] = json!("thornback ray");
    second["position"] = json!({"latitude": 52.2901, "longitude": -4.2188, "accuracy_m": 25.0, "source": "typed"});
    second["length"] = json!({"kind": "disc_width", "value": 19.0, "unit": "inch", "method": "estimated"});
    second["sex"] = json!("female");
    second["count"] = json!(2);
    second["notes"] = json!("two together at the tideline");
    assert_eq!(source.submit(&second, &[]).await.status, 200);
    source.confirm(FIRST, "Scyliorhinus canicula", "species").await;

    let dir = tempfile::tempdir().unwrap();
    let zip = dir.path().join("bay-network.zip");
    download(&source, "format=dwca&audience=full&state=any", &zip).await;
    // python-dwca-reader reads it, so it is a valid archive, before wrackline reads it.
    let exported = run_script("read_dwca.py", &[&zip, &terms_extract()]);
    assert_eq!(exported["rows"].as_array().unwrap().len(), 2);

    let target = spawn_app().await;
    let zip_arg = zip.display().to_string();
    let args = [zip_arg.as_str(), "--default", "setting=beach_stranding", "--default", "condition=fresh_dead"];
    let report = import_json(&target, &args);
    assert_eq!((report["rows"].as_u64(), report["imported"].as_u64()), (Some(2), Some(2)), "{report}");
    assert_eq!(report["dataset_name"], "bay-network", "the file's name by default");

    let records = target.records().await;
    let find = |guess: &str| {
        records.iter().find(|r| r["submission"]["species_guess"] == guess).unwrap_or_else(|| panic!("{guess}"))
    };
    let catshark = &find("small-spotted catshark")["submission"];
    assert_eq!(catshark["observed_at"], "2024-09-12T07:40:00+01:00", "the time with the observer's offset");
    assert_eq!(catshark["position"]["latitude"], 52.4153);
    assert_eq!(catshark["position"]["longitude"], -4.0829);
    assert_eq!(catshark["position"]["accuracy_m"], 8.0);
    assert_eq!(catshark["sex"], "male");
    assert_eq!(catshark["life_stage"], "adult");
    assert_eq!(catshark["notes"], "on the strandline below the cliff path");
    assert_eq!(catshark["observer_name"], "Test Observer");
    assert_eq!(catshark["length"], json!({"kind": "total", "value": 54.0, "unit": "cm", "method": "measured"}));
    let ray = &find("thornback ray")["submission"];
    assert_eq!(ray["count"], 2);
    assert_eq!(ray["sex"], "female");
    // 19 in = 48.26 cm, exported to a tenth of a centimetre (48.3).
    assert_eq!(ray["length"], json!({"kind": "disc_width", "value": 48.3, "unit": "cm", "method": "estimated"}));
    assert_eq!(ray["position"]["accuracy_m"], 25.0);

    // Again: nothing new.
    let again = import_json(&target, &args);
    assert_eq!((again["imported"].as_u64(), again["already_imported"].as_u64()), (Some(0), Some(2)), "{again}");
    assert_eq!(target.records().await.len(), 2);

    // Its own archive names where each record came from, and still reads.
    let out = dir.path().join("again.zip");
    download(&target, "format=dwca&audience=full&state=any", &out).await;
    let archive = run_script("read_dwca.py", &[&out, &terms_extract()]);
    for row in archive["rows"].as_array().unwrap() {
        assert_eq!(term(row, "datasetName"), "bay-network");
        assert!(term(row, "otherCatalogNumbers").starts_with("bay-network:urn:uuid:"), "{row}");
    }
}

/// The observers of the records the review screen shows as possible duplicates of `client_id`.
async fn duplicates_named(app: &TestApp, client_id: &str) -> Vec<String> {
    let detail: Value = app.get(&format!("/api/review/records/{client_id}")).await.json().await.unwrap();
    let duplicates = detail["duplicates"].as_array().unwrap_or_else(|| panic!("{detail}"));
    duplicates.iter().map(|d| d["other"]["submission"]["observer_name"].as_str().unwrap().to_owned()).collect()
}

#[tokio::test]
async fn a_changed_row_is_reported_and_a_duplicate_of_a_stored_record_is_linked() {
    let app = spawn_app().await;
    assert_eq!(app.submit(&submission(FIRST), &[]).await.status, 200);
    let dir = tempfile::tempdir().unwrap();
    let sheet = dir.path().join("sheet.csv");
    // The same catshark, typed into a spreadsheet by someone else, and another find.
    let rows = "occurrenceID,eventDate,decimalLatitude,decimalLongitude,scientificName,sex,individualCount,recordedBy\n\
                S-1,2025-06-01T14:25:00+01:00,52.4156,-4.0832,Scyliorhinus canicula,male,1,Another Walker\n\
                S-2,2023-02-11,51.60,-5.10,Raja clavata,female,1,Another Walker\n\
                S-3,2023-02-12,51.60,-5.10,Raja clavata,,0,Another Walker\n";
    std::fs::write(&sheet, rows).unwrap();
    let path = sheet.display().to_string();
    let args = [path.as_str(), "--default", "setting=beach_stranding", "--default", "condition=fresh_dead"];
    let report = import_json(&app, &args);
    assert_eq!(report["imported"], 2, "{report}");
    assert_eq!(report["absences"], 1, "individualCount 0 is an absence: {report}");
    assert_eq!(report["with_possible_duplicates"], 1, "{report}");
    assert_eq!(duplicates_named(&app, FIRST).await, ["Another Walker"]);

    // The second row changed since: reported, not stored again, the stored record kept.
    std::fs::write(&sheet, rows.replace("S-2,2023-02-11,51.60", "S-2,2023-02-11,51.61")).unwrap();
    let dry = import_json(&app, &[&args[..], &["--dry-run"]].concat());
    assert_eq!(dry["changed"].as_array().unwrap().len(), 1, "{dry}");
    let report = import_json(&app, &args);
    assert_eq!((report["imported"].as_u64(), report["already_imported"].as_u64()), (Some(0), Some(1)), "{report}");
    assert_eq!(report["changed"][0]["source_row_id"], "S-2", "{report}");
    assert_eq!(report["changed"][0]["line"], 3, "{report}");
    assert_eq!(app.records().await.len(), 3, "the phone's record and two imported, none twice");
}

/// The other order: the import runs while the server serves, and a phone then sends the
/// same animal. The running server's search must find the imported record, though a
/// separate process stored it after the server built its index at start.
#[tokio::test]
async fn a_record_sent_after_an_import_into_the_running_server_finds_the_imported_duplicate() {
    let app = spawn_app().await;
    let dir = tempfile::tempdir().unwrap();
    let sheet = dir.path().join("sheet.csv");
    let rows = "occurrenceID,eventDate,decimalLatitude,decimalLongitude,scientificName,sex,individualCount,recordedBy\n\
                S-1,2025-06-01T14:25:00+01:00,52.4156,-4.0832,Scyliorhinus canicula,male,1,Another Walker\n";
    std::fs::write(&sheet, rows).unwrap();
    let path = sheet.display().to_string();
    let args = [path.as_str(), "--default", "setting=beach_stranding", "--default", "condition=fresh_dead"];
    let report = import_json(&app, &args);
    assert_eq!(report["imported"], 1, "{report}");
    assert_eq!(app.submit(&submission(FIRST), &[]).await.status, 200);
    assert_eq!(duplicates_named(&app, FIRST).await, ["Another Walker"]);
}

#[tokio::test]
async fn files_that_are_not_csv_nor_zip_or_are_too_large_are_refused_by_name() {
    let app = spawn_app().await;
    let dir = tempfile::tempdir().unwrap();
    let photo = dir.path().join("records.csv");
    std::fs::write(&photo, crate::helpers::plain_jpeg(1)).unwrap();
    let (ok, _, said) = import(&app, &[photo.to_str().unwrap()]);
    assert!(!ok && said.contains("not a CSV file (it is not UTF-8 text) nor a zip archive"), "{said}");
    let sheet = example("old-sheet.csv");
    let (ok, _, said) = import(&app, &[sheet.to_str().unwrap(), "--max-bytes", "100"]);
    assert!(!ok && said.contains("larger than the limit of 100"), "{said}");
    let fake_zip = dir.path().join("fake.zip");
    std::fs::write(&fake_zip, b"PK\x03\x04 not really a zip").unwrap();
    let (ok, _, said) = import(&app, &[fake_zip.to_str().unwrap()]);
    assert!(!ok && said.contains("not a readable zip archive"), "{said}");
    assert!(app.records().await.is_empty());
}
