//! The same animal reported twice: found on arrival (also when both arrive at once),
//! shown to reviewers with reasons, merged into one organism or kept apart, and a merge
//! undone exactly. Nothing is ever deleted. Thresholds: `server/src/duplicates.rs`.

use std::sync::Arc;

use serde_json::{Value, json};

use crate::helpers::{TestApp, all_at_once, plain_jpeg, spawn_app, submission};

const FIRST: &str = "d0000000-0000-4000-8000-000000000001";
const SECOND: &str = "d0000000-0000-4000-8000-000000000002";
const THIRD: &str = "d0000000-0000-4000-8000-000000000003";

/// The same thornback ray: found fresh at Borth, then a day later 300 m along the beach.
fn carcass(id: &str, day: u32, north_m: f64) -> Value {
    let mut record = submission(id);
    record["species_guess"] = json!("thornback ray");
    record["setting"] = json!("beach_stranding");
    record["condition"] = json!(if day == 0 { "fresh_dead" } else { "decomposed" });
    record["observed_at"] = json!(format!("2025-06-{:02}T09:00:00+01:00", 1 + day));
    record["length"] = json!({"kind": "disc_width", "value": 50.0, "unit": "cm", "method": "measured"});
    // 1e-3° of latitude is about 111.3 m near 52.5°N (common practice).
    record["position"] = json!({"latitude": 52.4890 + north_m / 111_300.0, "longitude": -4.0530, "accuracy_m": 10.0, "source": "device"});
    record
}

async fn detail(app: &TestApp, id: &str) -> Value {
    app.get(&format!("/api/review/records/{id}")).await.json().await.unwrap()
}

async fn decide(app: &TestApp, id: &str, other: &str, same: bool) -> (u16, Value) {
    let url = format!("{}/api/review/records/{id}/duplicates/{other}", app.base);
    let response = app.reviewer.sign(app.client.post(url)).json(&json!({"same_animal": same})).send().await.unwrap();
    (response.status().as_u16(), response.json().await.unwrap_or(Value::Null))
}

/// Every row of the tables a merge touches or a reviewer's view depends on (the records,
/// animals, identifications, photos, the candidates and the decisions), to compare
/// before and after. `merges`, `merge_moves` and `review_events` are the history of the
/// merge and its undo, so they grow.
fn snapshot(app: &TestApp) -> Vec<String> {
    let conn = rusqlite::Connection::open(app.data_dir.join("wrackline.sqlite3")).unwrap();
    let mut rows = Vec::new();
    for (table, order) in [
        ("observations", "id"),
        ("organisms", "id"),
        ("identifications", "id"),
        ("observation_photos", "observation_id, position"),
        ("duplicate_candidates", "observation_a, observation_b"),
        ("duplicate_decisions", "id"),
    ] {
        let mut stmt = conn.prepare(&format!("SELECT * FROM {table} ORDER BY {order}")).unwrap();
        let columns = stmt.column_count();
        let mut query = stmt.query([]).unwrap();
        while let Some(row) = query.next().unwrap() {
            let values: Vec<String> = (0..columns).map(|i| format!("{:?}", row.get_ref(i).unwrap())).collect();
            rows.push(format!("{table}: {}", values.join(" | ")));
        }
    }
    rows
}

fn counts(app: &TestApp) -> Vec<i64> {
    let conn = rusqlite::Connection::open(app.data_dir.join("wrackline.sqlite3")).unwrap();
    [
        "observations",
        "organisms",
        "identifications",
        "photos",
        "observation_photos",
        "review_events",
        "duplicate_candidates",
        "duplicate_decisions",
        "merges",
    ]
    .iter()
    .map(|t| conn.query_row(&format!("SELECT COUNT(*) FROM {t}"), [], |r| r.get(0)).unwrap())
    .collect()
}

#[tokio::test]
async fn a_carcass_reported_twice_is_found_with_its_reasons_both_ways() {
    let app = spawn_app().await;
    app.submit(&carcass(FIRST, 0, 0.0), &[plain_jpeg(1)]).await;
    app.submit(&carcass(SECOND, 1, 300.0), &[plain_jpeg(2)]).await;
    let first = detail(&app, FIRST).await;
    let duplicates = first["duplicates"].as_array().unwrap();
    assert_eq!(duplicates.len(), 1);
    assert_eq!(duplicates[0]["other"]["submission"]["client_id"], SECOND);
    let reasons = duplicates[0]["reasons"].to_string();
    assert!(
        reasons.contains("m apart")
            && reasons.contains("24.0 h apart")
            && reasons.contains("the same taxon, Raja clavata"),
        "{reasons}"
    );
    assert!((duplicates[0]["distance_m"].as_f64().unwrap() - 300.0).abs() < 2.0);
    assert_eq!(detail(&app, SECOND).await["duplicates"][0]["other"]["submission"]["client_id"], FIRST);
    let queue: Vec<Value> = app.get("/api/review/queue").await.json().await.unwrap();
    assert!(queue.iter().all(|i| i["priority_reasons"].to_string().contains("possibly the same animal")));

    // A different species at the same place and time is not a candidate.
    let mut other = carcass(THIRD, 1, 100.0);
    other["species_guess"] = json!("spurdog");
    other["length"] = Value::Null;
    app.submit(&other, &[]).await;
    assert_eq!(detail(&app, THIRD).await["duplicates"], json!([]));
}

/// Sends `record` from the phone with `token`; the answer's status.
async fn send_from(app: Arc<TestApp>, token: String, record: Value) -> u16 {
    app.submit_as(&token, &record, &[]).await.status
}

/// The client ids of the records offered as the same animal as `id`.
async fn partners(app: &TestApp, id: &str) -> Vec<String> {
    let found = detail(app, id).await;
    let duplicates = found["duplicates"].as_array().unwrap();
    duplicates.iter().map(|d| d["other"]["submission"]["client_id"].as_str().unwrap().to_owned()).collect()
}

#[tokio::test(flavor = "multi_thread", worker_threads = 4)]
async fn two_devices_sending_the_same_animal_at_once_become_candidates_of_each_other() {
    let app = Arc::new(spawn_app().await);
    // Each round is another animal, 20 km along the coast from the last: beyond any
    // drift allowance, so the rounds never meet.
    for round in 0..6 {
        let (first, second) = (uuid::Uuid::new_v4().to_string(), uuid::Uuid::new_v4().to_string());
        let (phone_a, phone_b) = (app.new_device().await, app.new_device().await);
        let north_m = f64::from(round) * 20_000.0;
        let statuses = all_at_once(vec![
            send_from(app.clone(), phone_a, carcass(&first, 0, north_m)),
            send_from(app.clone(), phone_b, carcass(&second, 0, north_m + 50.0)),
        ])
        .await;
        assert_eq!(statuses, [200, 200], "round {round}");
        assert_eq!(
            partners(&app, &first).await,
            std::slice::from_ref(&second),
            "round {round}: the first finds the second"
        );
        assert_eq!(
            partners(&app, &second).await,
            std::slice::from_ref(&first),
            "round {round}: the second finds the first"
        );
    }
}

#[tokio::test(flavor = "multi_thread", worker_threads = 4)]
async fn one_pair_merged_by_three_requests_at_once_is_merged_once() {
    let app = Arc::new(spawn_app().await);
    app.submit(&carcass(FIRST, 0, 0.0), &[]).await;
    app.submit(&carcass(SECOND, 1, 300.0), &[]).await;
    let merge = || {
        let app = app.clone();
        async move { decide(&app, SECOND, FIRST, true).await.0 }
    };
    let mut statuses = all_at_once(vec![merge(), merge(), merge()]).await;
    statuses.sort_unstable();
    assert_eq!(statuses, [200, 409, 409], "one merge; the others find the record merged already");
    let conn = rusqlite::Connection::open(app.data_dir.join("wrackline.sqlite3")).unwrap();
    let merges: i64 = conn.query_row("SELECT COUNT(*) FROM merges", [], |r| r.get(0)).unwrap();
    assert_eq!(merges, 1);
}

#[tokio::test]
async fn a_merge_makes_one_animal_and_undoing_it_restores_every_row() {
    let app = spawn_app().await;
    app.submit(&carcass(FIRST, 0, 0.0), &[plain_jpeg(1)]).await;
    app.submit(&carcass(SECOND, 1, 300.0), &[plain_jpeg(2)]).await;
    let before = snapshot(&app);
    let counts_before = counts(&app);

    let (status, merged) = decide(&app, SECOND, FIRST, true).await;
    assert_eq!(status, 200, "{merged}");
    let merge_id = merged["merge_id"].as_i64().unwrap();
    let second = detail(&app, SECOND).await;
    assert_eq!(second["record"]["review_state"], "merged");
    assert_eq!(second["record"]["organism_id"], detail(&app, FIRST).await["record"]["organism_id"]);
    // Exports count the animal once, with both reports' photos and the interval.
    let csv = app.get("/api/export?format=csv&state=any").await.text().await.unwrap();
    assert_eq!(csv.lines().count(), 2, "header and one animal:\n{csv}");
    assert!(csv.contains("2025-06-01T08:00:00Z/2025-06-02T08:00:00Z"), "{csv}");
    // TDWG Darwin Core associatedOccurrences: the other report of the same organism.
    assert!(csv.contains(&format!("same organism: urn:uuid:{SECOND}")), "{csv}");
    assert!(
        counts(&app).iter().zip(&counts_before).all(|(after, before)| after >= before),
        "nothing deleted by a merge"
    );
    assert_eq!(decide(&app, SECOND, FIRST, true).await.0, 409, "a merged record is not merged twice");

    assert_eq!(undo(&app, merge_id).await, 200);
    assert_eq!(
        snapshot(&app),
        before,
        "the records, animals, candidates and decisions are exactly as before the merge"
    );
    assert_eq!(undo(&app, merge_id).await, 404, "a merge is undone once");
    // The pair is a candidate again, undecided, and back in the queue as one.
    let pair = &detail(&app, FIRST).await["duplicates"][0];
    assert_eq!((&pair["decision"], &pair["merge_id"]), (&Value::Null, &Value::Null), "{pair}");
    let queue: Vec<Value> = app.get("/api/review/queue").await.json().await.unwrap();
    assert_eq!(
        queue.iter().filter(|i| i["priority_reasons"].to_string().contains("possibly the same animal")).count(),
        2
    );
    // The audit trail keeps the merge and its undo, with who did them.
    for id in [FIRST, SECOND] {
        let events = detail(&app, id).await["events"].as_array().unwrap().clone();
        let actions: Vec<&str> = events.iter().map(|e| e["action"].as_str().unwrap()).collect();
        assert_eq!(actions, ["merge", "undo_merge"], "{id}");
    }
    let conn = rusqlite::Connection::open(app.data_dir.join("wrackline.sqlite3")).unwrap();
    let undone: (Option<String>, Option<i64>) = conn
        .query_row("SELECT undone_at, undone_by FROM merges WHERE id = ?1", [merge_id], |r| Ok((r.get(0)?, r.get(1)?)))
        .unwrap();
    assert!(undone.0.is_some() && undone.1.is_some(), "{undone:?}");
}

async fn undo(app: &TestApp, merge_id: i64) -> u16 {
    let url = format!("{}/api/review/merges/{merge_id}/undo", app.base);
    app.reviewer.sign(app.client.post(url)).send().await.unwrap().status().as_u16()
}

fn organism(app: &TestApp, client_id: &str) -> (i64, String) {
    let conn = rusqlite::Connection::open(app.data_dir.join("wrackline.sqlite3")).unwrap();
    conn.query_row("SELECT organism_id, review_state FROM observations WHERE client_id = ?1", [client_id], |r| {
        Ok((r.get(0)?, r.get(1)?))
    })
    .unwrap()
}

#[tokio::test]
async fn merging_an_animal_that_holds_other_reports_moves_them_all_and_undoes_latest_first() {
    let app = spawn_app().await;
    app.submit(&carcass(FIRST, 0, 0.0), &[plain_jpeg(1)]).await;
    app.submit(&carcass(SECOND, 1, 300.0), &[plain_jpeg(2)]).await;
    app.submit(&carcass(THIRD, 2, 600.0), &[plain_jpeg(3)]).await;
    let start = snapshot(&app);
    // The third report joins the second's animal; then that animal (two reports) joins the first's.
    let (status, inner) = decide(&app, THIRD, SECOND, true).await;
    assert_eq!(status, 200, "{inner}");
    let after_inner = snapshot(&app);
    let (status, outer) = decide(&app, SECOND, FIRST, true).await;
    assert_eq!(status, 200, "{outer}");
    let animal = organism(&app, FIRST).0;
    assert_eq!(organism(&app, SECOND), (animal, "merged".to_owned()));
    assert_eq!(organism(&app, THIRD), (animal, "merged".to_owned()), "the report the second held moved with it");
    let csv = app.get("/api/export?format=csv&state=any").await.text().await.unwrap();
    assert_eq!(csv.lines().count(), 2, "one animal:\n{csv}");
    // Every pair among the three reads as one animal, and the pair joined by the outer
    // merge offers that merge to undo.
    let first = detail(&app, FIRST).await;
    assert!(
        first["duplicates"].as_array().unwrap().iter().all(|d| d["decision"] == "same animal"),
        "{}",
        first["duplicates"]
    );
    assert!(first["duplicates"].as_array().unwrap().iter().all(|d| d["merge_id"] == outer["merge_id"]));
    // The inner merge cannot be undone under the outer one.
    assert_eq!(undo(&app, inner["merge_id"].as_i64().unwrap()).await, 409);
    assert_eq!(undo(&app, outer["merge_id"].as_i64().unwrap()).await, 200);
    assert_eq!(snapshot(&app), after_inner, "the second's animal is whole again, as it was");
    assert_eq!(undo(&app, inner["merge_id"].as_i64().unwrap()).await, 200);
    assert_eq!(snapshot(&app), start);
}

#[tokio::test]
async fn different_animals_are_remembered_and_not_suggested_again() {
    let app = spawn_app().await;
    app.submit(&carcass(FIRST, 0, 0.0), &[]).await;
    app.submit(&carcass(SECOND, 1, 300.0), &[]).await;
    assert_eq!(decide(&app, FIRST, SECOND, false).await.0, 200);
    assert_eq!(detail(&app, FIRST).await["duplicates"][0]["decision"], "different animals");
    let queue: Vec<Value> = app.get("/api/review/queue").await.json().await.unwrap();
    assert!(
        queue.iter().all(|i| !i["priority_reasons"].to_string().contains("possibly the same animal")),
        "no longer suggested"
    );
}

fn reasons_between(detail: &Value, other: &str) -> String {
    detail["duplicates"]
        .as_array()
        .unwrap()
        .iter()
        .find(|d| d["other"]["submission"]["client_id"] == other)
        .map(|d| d["reasons"].to_string())
        .unwrap_or_default()
}

#[tokio::test]
async fn a_record_without_a_position_is_found_by_the_same_photo_file() {
    let app = spawn_app().await;
    app.submit(&carcass(FIRST, 0, 0.0), &[plain_jpeg(9)]).await;
    let mut placeless = carcass(SECOND, 1, 0.0);
    placeless["position"] = Value::Null;
    assert_eq!(app.submit(&placeless, &[plain_jpeg(9)]).await.status, 200);
    let reasons = reasons_between(&detail(&app, SECOND).await, FIRST);
    assert!(reasons.contains("the same photo file"), "{reasons:?}");
}

/// The phone's reading of one photo, as `Submission::photo_exif` carries it.
fn phone_exif(local: &str, north_m: f64) -> Value {
    json!({"taken_local": local, "offset": "+01:00", "latitude": 52.4890 + north_m / 111_300.0, "longitude": -4.0530, "horizontal_error_m": 8.0})
}

#[tokio::test]
async fn a_photo_place_stands_in_for_a_missing_one_and_a_photo_time_for_a_flagged_one() {
    let app = spawn_app().await;
    // A carcass with no position from the phone, but its photo's GPS (read on the phone,
    // the upload copy carries none) puts it 300 m from the first report.
    app.submit(&carcass(FIRST, 0, 0.0), &[plain_jpeg(1)]).await;
    let mut placeless = carcass(SECOND, 1, 0.0);
    placeless["position"] = Value::Null;
    placeless["photo_exif"] = json!([phone_exif("2025:06:02 09:00:00", 300.0)]);
    assert_eq!(app.submit(&placeless, &[plain_jpeg(2)]).await.status, 200);
    let reasons = reasons_between(&detail(&app, SECOND).await, FIRST);
    assert!(
        reasons.contains("the time and place of photo 1's EXIF (the phone's reading of the original, ±8 m) was used, because the record has no position"),
        "{reasons:?}"
    );

    // A landed fish written up three days later: past the 12 h window by the record's
    // time, but its photo (flagged as taken long before the record) was taken an hour
    // after the first report.
    let mut catch = carcass(THIRD, 10, 0.0);
    catch["setting"] = json!("angler_catch");
    catch["condition"] = json!("fresh_dead");
    app.submit(&catch, &[plain_jpeg(3)]).await;
    let mut late = carcass("d0000000-0000-4000-8000-000000000004", 13, 20.0);
    late["setting"] = json!("angler_catch");
    late["condition"] = json!("fresh_dead");
    late["photo_exif"] = json!([phone_exif("2025:06:11 10:00:00", 20.0)]);
    assert_eq!(app.submit(&late, &[plain_jpeg(4)]).await.status, 200);
    let late_detail = detail(&app, "d0000000-0000-4000-8000-000000000004").await;
    assert_eq!(late_detail["record"]["photos"][0]["check"]["flags"], json!(["taken_long_before_record"]));
    let reasons = reasons_between(&late_detail, THIRD);
    assert!(
        reasons.contains("the time and place of photo 1's EXIF")
            && reasons.contains("flagged as taken long before the record"),
        "{reasons:?}"
    );
    assert!(reasons.contains("1.0 h apart"), "{reasons:?}");
}

#[tokio::test]
async fn the_same_original_photo_on_two_phones_makes_candidates_across_any_distance() {
    let app = spawn_app().await;
    // FIPS 180-4 test vector: SHA-256("abc").
    let original = "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad";
    let mut first = carcass(FIRST, 0, 0.0);
    first["photo_exif"] = json!([{"original_sha256": original.to_uppercase()}]);
    let mut second = carcass(SECOND, 20, 50_000.0);
    second["species_guess"] = json!("spurdog");
    second["photo_exif"] = json!([{"original_sha256": original}]);
    // Two different upload copies (two phones re-encode differently).
    assert_eq!(app.submit(&first, &[plain_jpeg(5)]).await.status, 200);
    assert_eq!(app.submit(&second, &[plain_jpeg(6)]).await.status, 200);
    let reasons = reasons_between(&detail(&app, SECOND).await, FIRST);
    assert!(
        reasons.contains("the same original photo, picked on both phones (SHA-256 of the original ba7816bf8f01…)"),
        "{reasons:?}"
    );
    // A digest that is not one is refused, naming the field.
    let mut bad = carcass("d0000000-0000-4000-8000-000000000005", 0, 0.0);
    bad["photo_exif"] = json!([{"original_sha256": "not-a-digest"}]);
    let refused = app.submit(&bad, &[plain_jpeg(7)]).await;
    assert_eq!(refused.status, 422, "{}", refused.body);
    assert!(refused.body.to_string().contains("original_sha256"), "{}", refused.body);
}

#[tokio::test]
async fn a_search_that_failed_after_the_record_was_stored_runs_again_on_a_resend_and_at_start_up() {
    let app = spawn_app().await;
    app.submit(&carcass(FIRST, 0, 0.0), &[]).await;
    let db = app.data_dir.join("wrackline.sqlite3");
    let conn = rusqlite::Connection::open(&db).unwrap();
    conn.execute_batch("CREATE TRIGGER interrupt BEFORE INSERT ON duplicate_searches BEGIN SELECT RAISE(ABORT, 'search interrupted by the test'); END;").unwrap();
    assert_eq!(
        app.submit(&carcass(SECOND, 1, 300.0), &[]).await.status,
        500,
        "the search fails after the record is stored"
    );
    // 1,900 m south of the first report, 2,200 m from the second: only its own search
    // can find the first.
    assert_eq!(app.submit(&carcass(THIRD, 0, -1_900.0), &[]).await.status, 500);
    assert_eq!(app.records().await.len(), 3);
    assert_eq!(detail(&app, SECOND).await["duplicates"], json!([]));
    conn.execute_batch("DROP TRIGGER interrupt;").unwrap();
    // The phone resends: the same receipt, and now the search.
    let resent = app.submit(&carcass(SECOND, 1, 300.0), &[]).await;
    assert_eq!(resent.status, 200, "{}", resent.body);
    assert!(reasons_between(&detail(&app, SECOND).await, FIRST).contains("24.0 h apart"));
    // The third is never resent: the next start searches for it.
    let checklist = wrackline_server::taxa::load_checklist(None).unwrap();
    assert_eq!(detail(&app, THIRD).await["duplicates"], json!([]));
    wrackline_server::AppState::open(&app.data_dir, None, checklist).unwrap();
    assert!(
        reasons_between(&detail(&app, THIRD).await, FIRST).contains("1900 m apart"),
        "{}",
        detail(&app, THIRD).await["duplicates"]
    );
}

/// Starts a second server on the same data directory, as a restart would.
async fn restart(app: &TestApp) -> String {
    let checklist = wrackline_server::taxa::load_checklist(None).unwrap();
    let state = wrackline_server::AppState::open(&app.data_dir, None, checklist).unwrap();
    let listener = tokio::net::TcpListener::bind("127.0.0.1:0").await.unwrap();
    let base = format!("http://{}", listener.local_addr().unwrap());
    tokio::spawn(async move { axum::serve(listener, wrackline_server::app(state)).await.unwrap() });
    base
}

#[tokio::test]
async fn a_merge_undone_after_a_restart_leaves_the_record_findable() {
    let app = spawn_app().await;
    app.submit(&carcass(FIRST, 0, 0.0), &[]).await;
    app.submit(&carcass(SECOND, 1, 300.0), &[]).await;
    let (_, merged) = decide(&app, SECOND, FIRST, true).await;
    let base = restart(&app).await;
    let url = format!("{base}/api/review/merges/{}/undo", merged["merge_id"]);
    assert_eq!(app.reviewer.sign(app.client.post(url)).send().await.unwrap().status(), 200);
    // 1,900 m north of the second report, 2,200 m from the first (over its 2,014 m).
    let third = carcass(THIRD, 2, 2_200.0);
    let form = reqwest::multipart::Form::new().text("record", third.to_string());
    let sent = app.client.post(format!("{base}/api/observations")).multipart(form).send().await.unwrap();
    assert_eq!(sent.status(), 200);
    let found = detail(&app, THIRD).await;
    assert!(
        reasons_between(&found, SECOND).contains("m apart"),
        "the second report is in the restarted index: {}",
        found["duplicates"]
    );
    assert_eq!(reasons_between(&found, FIRST), "");
}
