//! The identification history as Darwin Core Identification rows, and a reviewer's
//! confirmation in the occurrence row: who (in full exports a display name or username,
//! in public ones the network's reviewers; never a contact) and when.

use serde_json::{Value, json};

use super::{DWC, download, row, term, unzip_all};
use crate::helpers::{TestApp, spawn_app, submission};
use crate::python::{run_script, terms_extract};

const RECORD: &str = "1b2c3d4e-0000-4000-8000-0000000000e1";
const SECOND: &str = "1b2c3d4e-0000-4000-8000-0000000000e2";
const REVIEWER_CONTACT: &str = "reviewer.private@example.org";

async fn confirm(app: &TestApp, id: &str, name: &str, remark: &str) {
    let action = json!({"action": "confirm", "scientific_name": name, "taxon_rank": "species", "remark": remark});
    let response = app
        .reviewer
        .sign(app.client.post(format!("{}/api/review/records/{id}/actions", app.base)))
        .json(&action)
        .send()
        .await
        .unwrap();
    assert_eq!(response.status(), 200, "{}", response.text().await.unwrap());
}

fn identifications(occurrence: &Value) -> Vec<&Value> {
    occurrence["extensions"]
        .as_array()
        .unwrap()
        .iter()
        .filter(|e| e["rowtype"] == format!("{DWC}Identification"))
        .collect()
}

fn field<'a>(extension: &'a Value, name: &str) -> &'a str {
    extension["data"][format!("{DWC}{name}")].as_str().unwrap_or_else(|| panic!("{name} in {extension}"))
}

#[tokio::test]
async fn a_confirmation_is_in_the_occurrence_and_every_identification_in_the_history() {
    let app = spawn_app().await;
    assert_eq!(app.submit(&submission(RECORD), &[]).await.status, 200);
    assert_eq!(app.submit(&submission(SECOND), &[]).await.status, 200);
    {
        let conn = rusqlite::Connection::open(app.data_dir.join("wrackline.sqlite3")).unwrap();
        conn.execute("UPDATE people SET contact = ?1 WHERE username = 'test-reviewer'", [REVIEWER_CONTACT]).unwrap();
    }
    let before = chrono::Utc::now();
    confirm(&app, RECORD, "Scyliorhinus stellaris", "large spots: nursehound").await;
    {
        // A reviewer with no display name is named by their username.
        let conn = rusqlite::Connection::open(app.data_dir.join("wrackline.sqlite3")).unwrap();
        conn.execute("UPDATE people SET display_name = NULL WHERE username = 'test-reviewer'", []).unwrap();
    }
    confirm(&app, SECOND, "Scyliorhinus canicula", "small spots").await;

    let dir = tempfile::tempdir().unwrap();
    let zip = download(&app, "format=dwca&audience=full", dir.path(), "history.zip").await;
    let archive = run_script("read_dwca.py", &[&zip, &terms_extract()]);
    // TDWG Darwin Core Text Guide: the extension is declared in meta.xml and read back by
    // python-dwca-reader; every term is in the TDWG term list.
    assert!(archive["extension_row_types"].as_array().unwrap().contains(&json!(format!("{DWC}Identification"))));
    assert_eq!(archive["unknown_terms"], json!([]));
    assert_eq!(archive["orphaned_extension_rows"]["identification.txt"], 0);

    let occurrence = row(&archive, RECORD);
    assert_eq!(term(occurrence, "scientificName"), "Scyliorhinus stellaris");
    assert_eq!(term(occurrence, "identifiedBy"), "Test reviewer");
    // TDWG Darwin Core dateIdentified: ISO 8601, here the moment the reviewer confirmed.
    let identified = chrono::DateTime::parse_from_rfc3339(term(occurrence, "dateIdentified")).unwrap();
    assert!(
        identified >= before - chrono::Duration::seconds(1),
        "{identified} is the confirmation, not the submission"
    );
    assert_eq!(term(occurrence, "identificationVerificationStatus"), "confirmed");
    assert!(term(occurrence, "identificationRemarks").contains("large spots: nursehound"));
    assert!(term(occurrence, "identificationRemarks").starts_with("identified by a reviewer"), "says how, in words");

    let history = identifications(occurrence);
    assert_eq!(history.len(), 2, "the observer's guess and the reviewer's identification: {history:?}");
    let guess = history
        .iter()
        .find(|h| field(h, "identificationVerificationStatus") == "superseded")
        .expect("the superseded guess");
    assert_eq!((field(guess, "scientificName"), field(guess, "taxonRank")), ("Scyliorhinus canicula", "species"));
    assert_eq!(field(guess, "identifiedBy"), "Test Observer");
    assert!(field(guess, "identificationRemarks").contains("as typed: small-spotted catshark"));
    // TDWG Darwin Core dateIdentified (ISO 8601): the observer named it when they made the
    // record, the submission's 2025-06-01T14:10:00+01:00 as an instant in UTC; not the
    // moment the server received it (regression: it was the receipt time).
    assert_eq!(field(guess, "dateIdentified"), "2025-06-01T13:10:00.000Z");
    let current = history
        .iter()
        .find(|h| field(h, "identificationVerificationStatus") == "confirmed")
        .expect("the current identification");
    assert_eq!(
        (field(current, "scientificName"), field(current, "identifiedBy")),
        ("Scyliorhinus stellaris", "Test reviewer")
    );
    assert!(field(current, "identificationID").starts_with(&format!("urn:uuid:{RECORD}#identification-")));

    assert_eq!(
        term(row(&archive, SECOND), "identifiedBy"),
        "test-reviewer",
        "the username when there is no display name"
    );
    let everything = unzip_all(&std::fs::read(&zip).unwrap());
    assert!(!everything.contains(REVIEWER_CONTACT), "a reviewer's contact never leaves the server");

    // The public archive credits the network's reviewers, not a person.
    let public_zip = download(&app, "format=dwca", dir.path(), "public.zip").await;
    let public = run_script("read_dwca.py", &[&public_zip, &terms_extract()]);
    for id in [RECORD, SECOND] {
        assert_eq!(term(row(&public, id), "identifiedBy"), "wrackline reviewer", "{id}");
    }
    let public_text = unzip_all(&std::fs::read(&public_zip).unwrap());
    assert!(!public_text.contains("Test reviewer") && !public_text.contains("test-reviewer"), "no reviewer's name");
    assert!(!public_text.contains("Test Observer"), "the observer did not agree to be named");
}

#[tokio::test]
async fn observer_identifications_stored_with_their_receipt_time_are_redated_by_the_migration() {
    let app = spawn_app().await;
    assert_eq!(app.submit(&submission(RECORD), &[]).await.status, 200);
    let database = app.data_dir.join("wrackline.sqlite3");
    let stored = |conn: &rusqlite::Connection| -> String {
        conn.query_row("SELECT identified_at FROM identifications WHERE basis = 'observer guess'", [], |r| r.get(0))
            .unwrap()
    };
    // As a server before migration 0013 left it: the receipt time stored. The migration's
    // own SQL is run on it (rewinding the schema version would re-run every later
    // migration too).
    let conn = rusqlite::Connection::open(&database).unwrap();
    conn.execute("UPDATE identifications SET identified_at = '2025-06-09T08:00:00.000Z'", []).unwrap();
    assert_eq!(stored(&conn), "2025-06-09T08:00:00.000Z");
    let migration = concat!(env!("CARGO_MANIFEST_DIR"), "/../migrations/0013_observer_identification_time.sql");
    conn.execute_batch(&std::fs::read_to_string(migration).unwrap()).expect("the migration runs");
    assert_eq!(stored(&conn), "2025-06-01T13:10:00.000Z", "the submission's time, 14:10+01:00 in UTC");
}

#[tokio::test]
async fn an_event_core_archive_carries_the_history_with_each_occurrence() {
    let app = spawn_app().await;
    let walk = json!({
        "client_id": "aaaaaaaa-0000-4000-8000-0000000000e3", "started_at": "2026-04-12T09:00:00+01:00",
        "ended_at": "2026-04-12T10:30:00+01:00", "stretch": "Borth to Ynyslas", "all_finds_reported": true,
        "track": [], "typed_distance_m": 2000.0, "observer_name": "Test Walker"
    });
    let phone = app.new_device().await;
    assert_eq!(app.post_walk_as(&phone, &walk).await.status, 200);
    let mut on_walk = submission(RECORD);
    on_walk["walk_client_id"] = json!("aaaaaaaa-0000-4000-8000-0000000000e3");
    assert_eq!(app.submit_as(&phone, &on_walk, &[]).await.status, 200);
    confirm(&app, RECORD, "Scyliorhinus canicula", "as guessed").await;
    let dir = tempfile::tempdir().unwrap();
    let zip = download(&app, "format=dwca", dir.path(), "events.zip").await;
    let archive = run_script("read_dwca.py", &[&zip, &terms_extract()]);
    assert_eq!(archive["core_row_type"], format!("{DWC}Event"));
    assert_eq!(archive["unknown_terms"], json!([]));
    let walk_event = row(&archive, "aaaaaaaa-0000-4000-8000-0000000000e3");
    let history = identifications(walk_event);
    assert_eq!(history.len(), 2);
    assert!(history.iter().all(|h| field(h, "occurrenceID") == format!("urn:uuid:{RECORD}")), "each names its animal");
}
