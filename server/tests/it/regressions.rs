//! One test per bug that earlier work found and fixed, named after the bug, so that a
//! bug coming back fails a test that says which one. Bugs already pinned by a test
//! elsewhere are listed in [`PINNED_ELSEWHERE`] with that test, rather than tested twice;
//! the last test here checks that each of those tests still exists.

use serde_json::{Value, json};

use crate::helpers::{TestApp, spawn_app, spawn_app_with_checklist, submission};

const FIRST: &str = "e0000000-0000-4000-8000-000000000001";
const SECOND: &str = "e0000000-0000-4000-8000-000000000002";

/// A thornback ray found on the beach at Borth, `north_m` metres north of the first.
fn carcass(id: &str, north_m: f64) -> Value {
    let mut record = submission(id);
    record["species_guess"] = json!("thornback ray");
    record["condition"] = json!("decomposed");
    record["length"] = Value::Null;
    // 1e-3° of latitude is about 111.3 m near 52.5°N (common practice).
    record["position"] = json!({"latitude": 52.4890 + north_m / 111_300.0, "longitude": -4.0530, "accuracy_m": 10.0, "source": "device"});
    record
}

/// Makes every search for duplicates fail after its record is stored, as a fault in
/// that follow-up work would, until the returned connection drops the trigger.
fn interrupt_duplicate_searches(app: &TestApp) -> rusqlite::Connection {
    let conn = rusqlite::Connection::open(app.data_dir.join("wrackline.sqlite3")).unwrap();
    conn.execute_batch(
        "CREATE TRIGGER interrupt BEFORE INSERT ON duplicate_searches
         BEGIN SELECT RAISE(ABORT, 'search interrupted by the test'); END;",
    )
    .unwrap();
    conn
}

async fn duplicate_reasons(app: &TestApp, id: &str) -> String {
    let detail: Value = app.get(&format!("/api/review/records/{id}")).await.json().await.unwrap();
    detail["duplicates"].to_string()
}

/// A 500 said "nothing was stored" although the record had been stored before the
/// failure, so the phone's user was told something untrue (601c39f).
#[tokio::test]
async fn a_failure_after_the_record_was_stored_does_not_say_nothing_was_stored() {
    let app = spawn_app().await;
    let _interrupted = interrupt_duplicate_searches(&app);
    let answer = app.submit(&carcass(FIRST, 0.0), &[]).await;
    assert_eq!(answer.status, 500, "{}", answer.body);
    assert_eq!(app.records().await.len(), 1, "the record was stored before the failure");
    assert_eq!(answer.body, json!({"error": "the server could not finish this request; try again later"}));
}

/// A search for duplicates that failed at start-up stopped the server from starting
/// (fdde89e).
#[tokio::test]
async fn a_duplicate_search_failing_at_start_up_does_not_stop_the_server() {
    let app = spawn_app().await;
    assert_eq!(app.submit(&carcass(FIRST, 0.0), &[]).await.status, 200);
    let interrupted = interrupt_duplicate_searches(&app);
    assert_eq!(app.submit(&carcass(SECOND, 300.0), &[]).await.status, 500, "stored, its search failed");
    let checklist = || wrackline_server::taxa::load_checklist(None).unwrap();
    let restarted = wrackline_server::AppState::open(&app.data_dir, None, checklist());
    assert!(restarted.is_ok(), "the search fails again, and the server starts: {:?}", restarted.err());
    assert_eq!(duplicate_reasons(&app, SECOND).await, "[]");
    // Once the fault is gone, the next start searches for it.
    drop(interrupted.execute_batch("DROP TRIGGER interrupt;"));
    wrackline_server::AppState::open(&app.data_dir, None, checklist()).unwrap();
    assert!(duplicate_reasons(&app, SECOND).await.contains("m apart"), "{}", duplicate_reasons(&app, SECOND).await);
}

/// Exports and the review queue read names from the built-in demo checklist, not the
/// one the server was started with (16a6fa5).
#[tokio::test]
async fn exports_and_the_queue_read_names_from_the_checklist_the_server_was_started_with() {
    // The demo checklist with one more common name (invented) for the thornback ray.
    let mut list: Value = serde_json::from_str(&std::fs::read_to_string(demo_checklist_path()).unwrap()).unwrap();
    let ray = list["taxa"].as_array_mut().unwrap().iter_mut().find(|t| t["scientificName"] == "Raja clavata").unwrap();
    ray["commonNames"].as_array_mut().unwrap().push(json!("borth roker"));
    let checklist = species_key::Checklist::from_json(&list.to_string()).unwrap();
    let app = spawn_app_with_checklist(checklist).await;
    let mut record = carcass(FIRST, 0.0);
    record["species_guess"] = json!("borth roker");
    assert_eq!(app.submit(&record, &[]).await.status, 200);

    let export = app.get("/api/export?format=csv&taxon=borth%20roker&state=any").await;
    assert_eq!(export.status(), 200, "the server's own checklist names the taxon");
    let csv = export.text().await.unwrap();
    assert!(csv.contains(FIRST) && csv.contains("Raja clavata"), "{csv}");
    let queue: Vec<Value> = app.get("/api/review/queue?taxon=borth%20roker").await.json().await.unwrap();
    assert_eq!(queue.len(), 1, "{queue:?}");
}

fn demo_checklist_path() -> std::path::PathBuf {
    std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("../demo-records/checklist.json")
}

/// A photo's GPS uncertainty sent as a negative number was repeated in the reasons for a
/// possible duplicate as "±-50 m" (fdde89e); it is no uncertainty, so none is given.
#[tokio::test]
async fn a_negative_photo_uncertainty_is_not_given_as_one_in_duplicate_reasons() {
    let app = spawn_app().await;
    assert_eq!(app.submit(&carcass(FIRST, 0.0), &[]).await.status, 200);
    let mut placeless = carcass(SECOND, 0.0);
    placeless["position"] = Value::Null;
    placeless["photo_exif"] = json!([{"taken_local": "2025:06:01 13:10:00", "offset": "+01:00",
        "latitude": 52.4890 + 300.0 / 111_300.0, "longitude": -4.0530, "horizontal_error_m": -50.0}]);
    let photo = crate::helpers::plain_jpeg(4);
    assert_eq!(app.submit(&placeless, &[photo]).await.status, 200);
    let reasons = duplicate_reasons(&app, SECOND).await;
    assert!(
        reasons.contains(
            "photo 1's EXIF (the phone's reading of the original) was used, because the record has no position"
        ),
        "{reasons}"
    );
    assert!(!reasons.contains("±-"), "{reasons}");
}

/// Bugs fixed earlier whose test lives with the feature: (what went wrong, the commit
/// that fixed it or "this work", the test's file from the server crate, the test).
const PINNED_ELSEWHERE: &[(&str, &str, &str, &str)] = &[
    (
        "guesses sent at once each got a password check past the sign-in limit (15 of 15 where 5 are allowed)",
        "this work",
        "tests/it/access.rs",
        "wrong_passwords_sent_at_once_get_no_more_tries_than_the_lock_allows",
    ),
    (
        "a stranger's wrong passwords from one address locked a reviewer out everywhere",
        "5c5cb03",
        "tests/it/access.rs",
        "sign_in_refuses_wrong_passwords_then_locks_the_name_from_that_address_only",
    ),
    (
        "an unknown username was answered faster than a wrong password, telling which names exist",
        "5c5cb03",
        "tests/it/access.rs",
        "unknown_names_take_as_long_as_wrong_passwords",
    ),
    (
        "a merge moved only the report named, leaving the animal's other reports behind",
        "0138699",
        "tests/it/duplicates.rs",
        "merging_an_animal_that_holds_other_reports_moves_them_all_and_undoes_latest_first",
    ),
    (
        "undoing a merge left a decision behind, so the pair was never offered again",
        "0138699",
        "tests/it/duplicates.rs",
        "a_merge_makes_one_animal_and_undoing_it_restores_every_row",
    ),
    (
        "a search for duplicates that failed after its record was stored never ran again",
        "2416d0b",
        "tests/it/duplicates.rs",
        "a_search_that_failed_after_the_record_was_stored_runs_again_on_a_resend_and_at_start_up",
    ),
    (
        "a free-text name such as \"big ray\" ruled a pair out as two species",
        "2416d0b",
        "src/duplicates/tests.rs",
        "names_resolve_to_the_checklist_or_count_as_unnamed",
    ),
    (
        "one very uncertain record made every later search for duplicates as wide as itself (slow)",
        "2416d0b",
        "src/duplicates/tests.rs",
        "a_large_uncertainty_widens_only_its_own_search_box",
    ),
    (
        "a download nobody read held the database writer, so no record could be sent meanwhile",
        "16032d4",
        "tests/it/exports/slow_client.rs",
        "a_stalled_export_does_not_hold_up_submissions",
    ),
    (
        "the same photo twice in one record was counted twice in the first receipt and once in a resend's",
        "37c4418",
        "tests/it/submissions.rs",
        "the_same_photo_twice_in_one_record_is_one_photo_and_the_resend_gets_the_same_receipt",
    ),
    (
        "a photo without an offset took the record's, an hour out across a clock change",
        "37c4418",
        "tests/it/photo_flags.rs",
        "a_photo_taken_before_a_clock_change_keeps_the_phones_offset_at_that_time",
    ),
    (
        "an answer's photos skipped intake: no offset, no photo checks",
        "6041e2b",
        "tests/it/review.rs",
        "reply_photos_get_the_records_offset_and_the_photo_checks",
    ),
    (
        "any phone could put records on a walk, whose id is public in exports",
        "6041e2b",
        "tests/it/walks.rs",
        "nobody_else_can_put_records_on_a_walk",
    ),
    (
        "the taxon filter of the review queue worked upward, finding a genus record under one of its species",
        "8969061",
        "tests/it/review.rs",
        "the_taxon_filter_takes_in_records_identified_at_any_rank_below",
    ),
    (
        "the reviewer's map left out a photo's GPS that only the phone had read",
        "8969061",
        "tests/it/review.rs",
        "photo_flags_from_the_phones_reading_raise_a_record_and_every_flag_filters",
    ),
    (
        "a genus of protected species was not put first in the review queue",
        "da89f12",
        "tests/it/exports/higher_taxa.rs",
        "the_review_queue_puts_a_genus_of_protected_species_first",
    ),
    (
        "a family with a sensitive species showed its record positions (hull corners, map) to anyone",
        "7e38d6c",
        "tests/it/assess_cli.rs",
        "a_family_with_a_sensitive_species_keeps_its_places_for_reviewers",
    ),
    (
        "an export filter changed a walk's absences: finds outside the filter counted as not found",
        "b950a1f",
        "tests/it/exports/walks.rs",
        "a_filtered_archive_takes_what_each_walk_found_from_all_its_records",
    ),
    (
        "range --from counted a walk's absences as records",
        "b950a1f",
        "tests/it/exports/walks.rs",
        "range_from_an_event_core_archive_counts_finds_not_absences",
    ),
    (
        "a report merged into another animal was exported as an animal of its own",
        "b950a1f",
        "tests/it/exports/merged.rs",
        "the_merged_away_report_is_never_the_animal_in_csv_or_geojson",
    ),
    (
        "a pick stopped at a genus lost its name and rank in exports",
        "0f40b19",
        "tests/it/key_priors.rs",
        "a_pick_stopped_at_a_genus_is_exported_at_that_rank_and_generalised_like_its_species",
    ),
    (
        "identificationRemarks said only \"reviewer\"",
        "19ca1a4",
        "tests/it/exports/history.rs",
        "a_confirmation_is_in_the_occurrence_and_every_identification_in_the_history",
    ),
    (
        "answers a refreshed checklist no longer knows made the key's ranking fail",
        "9d15b53",
        "../species-key/tests/it/ranking.rs",
        "answers_a_changed_checklist_no_longer_knows_are_set_aside_with_the_reason",
    ),
];

#[test]
fn every_bug_pinned_elsewhere_names_a_test_that_exists() {
    let crate_dir = std::path::Path::new(env!("CARGO_MANIFEST_DIR"));
    for (bug, _, file, test) in PINNED_ELSEWHERE {
        let source = std::fs::read_to_string(crate_dir.join(file)).unwrap_or_else(|err| panic!("{file}: {err}"));
        let at = source.find(&format!("fn {test}(")).unwrap_or_else(|| panic!("no test `{test}` in {file} for: {bug}"));
        let attributes = &source[source[..at].rfind("\n\n").unwrap_or(0)..at];
        assert!(attributes.contains("test]") || attributes.contains("test(flavor"), "`{test}` in {file} is not a test");
    }
}
