//! Survey walks: the track's length against GeographicLib, GPS jitter filtered, a walk
//! with no finds kept, resends idempotent, records linked after the fact — only by the
//! phone that sent them (or a reviewer), only onto that phone's walks — and the effort
//! summary.

use serde_json::{Value, json};

use crate::helpers::{TestApp, all_at_once, spawn_app, submission};

const WALK: &str = "7a1b2c3d-4e5f-4a6b-8c7d-9e0f1a2b3c4d";

/// 60 fixes 20 s apart walking north along the beach from Borth, with a small
/// east–west wiggle; about 28 m between fixes.
fn beach_track() -> Vec<(f64, f64)> {
    (0..60).map(|i| (52.4890 + i as f64 * 0.00025, -4.0530 + 0.0001 * (i as f64 / 5.0).sin())).collect()
}

fn track_json(points: &[(f64, f64)], seconds_apart: i64) -> Value {
    let start = chrono::DateTime::parse_from_rfc3339("2026-04-12T09:00:00+01:00").unwrap();
    Value::Array(
        points
            .iter()
            .enumerate()
            .map(|(i, (lat, lon))| {
                json!({"latitude": lat, "longitude": lon, "accuracy_m": 6.0,
                       "at": (start + chrono::Duration::seconds(i as i64 * seconds_apart)).to_rfc3339()})
            })
            .collect(),
    )
}

fn walk(track: Value) -> Value {
    json!({
        "client_id": WALK,
        "started_at": "2026-04-12T09:00:00+01:00",
        "ended_at": "2026-04-12T09:25:00+01:00",
        "stretch": "Borth to Ynyslas",
        "all_finds_reported": true,
        "track": track,
        "typed_distance_m": null,
        "observer_name": "Test Walker"
    })
}

/// Posts a walk from a phone of its own (a new device identity each time, unless the
/// test needs the same phone: then `post_walk_as`).
async fn post_walk(app: &TestApp, body: &Value) -> (u16, Value) {
    let phone = app.new_device().await;
    let answer = app.post_walk_as(&phone, body).await;
    (answer.status, answer.body)
}

#[tokio::test]
async fn the_track_length_agrees_with_geographiclib() {
    let app = spawn_app().await;
    let (status, receipt) = post_walk(&app, &walk(track_json(&beach_track(), 20))).await;
    assert_eq!(status, 200, "{receipt}");
    // GeographicLib 2.1 (Karney 2013), Geodesic.WGS84.Inverse summed over the same 60
    // fixes: 1642.265313 m; pyproj 3.7.2 Geod(ellps="WGS84").line_length agrees to 1e-9 m.
    let length = receipt["effort"]["distance_m"].as_f64().unwrap();
    assert!((length - 1642.265313).abs() < 1e-3, "{length}");
    assert_eq!(receipt["effort"]["track"]["kept_points"], 60);
    assert_eq!(receipt["effort"]["duration_s"], 1500.0);
}

#[tokio::test]
async fn standing_still_and_gps_jumps_do_not_add_distance() {
    let app = spawn_app().await;
    let mut points = Vec::new();
    for (i, point) in beach_track().into_iter().enumerate() {
        points.push(point);
        if i % 10 == 0 {
            // A pause: four fixes scattered within about 3 m (1e-5° ≈ 1.1 m).
            for k in 1..=4 {
                points.push((point.0 + 2e-5 * (k % 2) as f64, point.1 - 2e-5 * (k % 3) as f64));
            }
        }
        if i == 30 {
            points.push((52.60, -4.0530)); // a 10 km jump in 20 seconds
        }
    }
    let (status, receipt) = post_walk(&app, &walk(track_json(&points, 20))).await;
    assert_eq!(status, 200, "{receipt}");
    let effort = &receipt["effort"];
    let length = effort["distance_m"].as_f64().unwrap();
    assert!((length - 1642.265313).abs() / 1642.265313 < 0.01, "within 1% of the clean track: {effort}");
    assert_eq!(effort["track"]["dropped_jumps"], 1, "{effort}");
    assert!(effort["track"]["dropped_jitter"].as_u64().unwrap() >= 20, "{effort}");
}

#[tokio::test]
async fn a_walk_with_no_finds_is_kept_and_a_resend_is_one_walk() {
    let app = spawn_app().await;
    let phone = app.new_device().await;
    let body = walk(track_json(&beach_track(), 20));
    let first = app.post_walk_as(&phone, &body).await;
    let again = app.post_walk_as(&phone, &body).await;
    assert_eq!((first.status, again.status), (200, 200));
    assert_eq!(first.body, again.body);
    let walks: Vec<Value> = app.get("/api/walks").await.json().await.unwrap();
    assert_eq!(walks.len(), 1);
    assert_eq!(walks[0]["record_client_ids"], json!([]), "no finds, still data");
    let mut changed = body.clone();
    changed["all_finds_reported"] = json!(false);
    assert_eq!(app.post_walk_as(&phone, &changed).await.status, 409);
    // Walk ids are public (eventID in exports): another phone cannot resend or claim it.
    let stranger = app.new_device().await;
    let claimed = app.post_walk_as(&stranger, &body).await;
    assert_eq!(claimed.status, 403, "{}", claimed.body);
    assert!(claimed.body["error"].as_str().unwrap().contains("another phone"), "{}", claimed.body);
    let anonymous = app.client.post(format!("{}/api/walks", app.base)).json(&body).send().await.unwrap();
    assert_eq!(anonymous.status(), 401, "a walk needs the phone's identity");
}

#[tokio::test(flavor = "multi_thread", worker_threads = 4)]
async fn a_walk_resent_six_times_at_once_is_stored_once() {
    let app = std::sync::Arc::new(spawn_app().await);
    let phone = app.new_device().await;
    let body = walk(track_json(&beach_track(), 20));
    let send = || {
        let (app, phone, body) = (app.clone(), phone.clone(), body.clone());
        async move { app.post_walk_as(&phone, &body).await }
    };
    let answers = all_at_once((0..6).map(|_| send()).collect()).await;
    assert!(answers.iter().all(|a| a.status == 200), "{:?}", answers.iter().map(|a| &a.body).collect::<Vec<_>>());
    assert!(answers.windows(2).all(|w| w[0].body == w[1].body), "one receipt for all");
    let walks: Vec<Value> = app.get("/api/walks").await.json().await.unwrap();
    assert_eq!(walks.len(), 1);
}

#[tokio::test]
async fn bad_walks_name_the_field() {
    let app = spawn_app().await;
    let cases = [
        ("ended_at", json!("2026-04-12T08:00:00+01:00"), "ended_at", "ends before it starts"),
        ("typed_distance_m", json!(-5.0), "typed_distance_m", "between 0 and 100000"),
        ("all_finds_reported", json!("yes"), "all_finds_reported", "invalid type"),
    ];
    for (key, value, field, words) in cases {
        let mut body = walk(json!([]));
        body[key] = value;
        let (status, answer) = post_walk(&app, &body).await;
        assert_eq!(status, 422, "{answer}");
        assert_eq!(answer["field"], field);
        assert!(answer["error"].as_str().unwrap().contains(words), "{answer}");
    }
    let mut both = walk(track_json(&beach_track(), 20));
    both["typed_distance_m"] = json!(1500.0);
    assert_eq!(post_walk(&app, &both).await.0, 422);
    assert!(app.get("/api/walks").await.json::<Vec<Value>>().await.unwrap().is_empty());
}

#[tokio::test]
async fn records_join_their_walk_when_made_on_it_or_after_the_fact() {
    let app = spawn_app().await;
    let phone = app.new_device().await;
    let on_walk = "11111111-2222-4333-8444-555555555555";
    let later = "66666666-7777-4888-8999-aaaaaaaaaaaa";
    let mut record = submission(on_walk);
    record["walk_client_id"] = json!(WALK);
    // The record may arrive before its walk.
    assert_eq!(app.submit_as(&phone, &record, &[]).await.status, 200);
    assert_eq!(app.submit_as(&phone, &submission(later), &[]).await.status, 200);
    assert_eq!(app.post_walk_as(&phone, &walk(track_json(&beach_track(), 20))).await.status, 200);

    let link = |token: &str, id: &str, walk: &str| {
        let request = app
            .client
            .put(format!("{}/api/observations/{id}/walk", app.base))
            .bearer_auth(token)
            .json(&json!({"walk_client_id": walk}));
        async move { request.send().await.unwrap().status().as_u16() }
    };
    assert_eq!(link(&phone, later, WALK).await, 200);
    assert_eq!(link(&phone, later, WALK).await, 200, "linking again is harmless");
    assert_eq!(link(&phone, later, "00000000-0000-4000-8000-000000000000").await, 409, "not moved to another walk");
    assert_eq!(link(&phone, "00000000-0000-4000-8000-00000000abcd", WALK).await, 404);

    let walks: Vec<Value> = app.get("/api/walks").await.json().await.unwrap();
    assert_eq!(walks[0]["record_client_ids"], json!([on_walk, later]));
    let view: Value = app.get(&format!("/api/observations/{later}")).await.json().await.unwrap();
    assert_eq!(view["walk_client_id"], WALK);
}

#[tokio::test]
async fn nobody_else_can_put_records_on_a_walk() {
    let app = spawn_app().await;
    let (phone, stranger) = (app.new_device().await, app.new_device().await);
    let mine = "11111111-2222-4333-8444-000000000001";
    let theirs = "11111111-2222-4333-8444-000000000002";
    assert_eq!(app.post_walk_as(&phone, &walk(track_json(&beach_track(), 20))).await.status, 200);
    assert_eq!(app.submit_as(&phone, &submission(mine), &[]).await.status, 200);
    assert_eq!(app.submit_as(&stranger, &submission(theirs), &[]).await.status, 200);
    let link = |token: Option<&str>, id: &str| {
        let mut request =
            app.client.put(format!("{}/api/observations/{id}/walk", app.base)).json(&json!({"walk_client_id": WALK}));
        if let Some(token) = token {
            request = request.bearer_auth(token);
        }
        async move { request.send().await.unwrap().status().as_u16() }
    };
    assert_eq!(link(None, mine).await, 401, "ids are public: knowing one is not enough");
    assert_eq!(link(Some(&stranger), mine).await, 403, "another phone's record");
    assert_eq!(link(Some(&stranger), theirs).await, 403, "their own record onto another phone's walk");
    let mut sneaked = submission("11111111-2222-4333-8444-000000000003");
    sneaked["walk_client_id"] = json!(WALK);
    let refused = app.submit_as(&stranger, &sneaked, &[]).await;
    assert_eq!((refused.status, refused.body["field"].as_str()), (422, Some("walk_client_id")), "{}", refused.body);
    let walks: Vec<Value> = app.get("/api/walks").await.json().await.unwrap();
    assert_eq!(walks[0]["record_client_ids"], json!([]), "nothing joined the walk");

    // A reviewer may link any record (a correction the observer asked for).
    let by_reviewer = app
        .reviewer
        .sign(app.client.put(format!("{}/api/observations/{mine}/walk", app.base)))
        .json(&json!({"walk_client_id": WALK}))
        .send()
        .await
        .unwrap();
    assert_eq!(by_reviewer.status(), 200);
    let walks: Vec<Value> = app.get("/api/walks").await.json().await.unwrap();
    assert_eq!(walks[0]["record_client_ids"], json!([mine]));
}

#[tokio::test]
async fn effort_is_summed_per_stretch_and_period() {
    let app = spawn_app().await;
    post_walk(&app, &walk(track_json(&beach_track(), 20))).await;
    let mut typed = walk(json!([]));
    typed["client_id"] = json!("8b2c3d4e-5f60-4b7c-8d9e-0f1a2b3c4d5e");
    typed["typed_distance_m"] = json!(2500.0);
    typed["started_at"] = json!("2026-04-20T14:00:00+01:00");
    typed["ended_at"] = json!("2026-04-20T15:30:00+01:00");
    typed["all_finds_reported"] = json!(false);
    assert_eq!(post_walk(&app, &typed).await.0, 200);
    let rows: Vec<Value> = app.get("/api/effort?by=month").await.json().await.unwrap();
    assert_eq!(rows.len(), 1, "{rows:?}");
    let row = &rows[0];
    assert_eq!((row["stretch"].as_str(), row["period"].as_str()), (Some("Borth to Ynyslas"), Some("2026-04")));
    assert_eq!((row["walks"].as_u64(), row["all_finds_walks"].as_u64()), (Some(2), Some(1)));
    let km = row["kilometres"].as_f64().unwrap();
    assert!((km - (1.642265313 + 2.5)).abs() < 1e-6, "{km}");
    assert!((row["hours"].as_f64().unwrap() - (25.0 / 60.0 + 1.5)).abs() < 1e-9);
}

#[tokio::test]
async fn trends_on_stored_records_are_encounter_rates_per_kilometre_of_all_finds_walks() {
    let app = spawn_app().await;
    // (walk id, year, km, all finds, records on it)
    let plan = [
        ("9a000000-0000-4000-8000-000000000001", 2024, 2000.0, true, 2),
        ("9a000000-0000-4000-8000-000000000002", 2025, 4000.0, true, 1),
        ("9a000000-0000-4000-8000-000000000003", 2026, 4000.0, true, 0),
        ("9a000000-0000-4000-8000-000000000004", 2026, 9000.0, false, 3),
    ];
    let phone = app.new_device().await;
    let mut n = 0;
    for (id, year, metres, all_finds, records) in plan {
        let mut body = walk(json!([]));
        body["client_id"] = json!(id);
        body["started_at"] = json!(format!("{year}-05-01T09:00:00+01:00"));
        body["ended_at"] = json!(format!("{year}-05-01T11:00:00+01:00"));
        body["typed_distance_m"] = json!(metres);
        body["all_finds_reported"] = json!(all_finds);
        assert_eq!(app.post_walk_as(&phone, &body).await.status, 200);
        for _ in 0..records {
            n += 1;
            let mut record = submission(&format!("9b000000-0000-4000-8000-{n:012}"));
            record["observed_at"] = json!(format!("{year}-05-01T10:00:00+01:00"));
            record["walk_client_id"] = json!(id);
            assert_eq!(app.submit_as(&phone, &record, &[]).await.status, 200);
        }
    }
    let mut outside = submission("9c000000-0000-4000-8000-000000000001");
    outside["observed_at"] = json!("2025-07-01T10:00:00+01:00");
    app.submit(&outside, &[]).await;

    let report: Value = app.get("/api/trend?state=any&generation_length=8").await.json().await.unwrap();
    let years: Vec<(i64, u64, f64)> = report["years"]
        .as_array()
        .unwrap()
        .iter()
        .map(|y| (y["year"].as_i64().unwrap(), y["count"].as_u64().unwrap(), y["effort"].as_f64().unwrap()))
        .collect();
    assert_eq!(years, [(2024, 2, 2.0), (2025, 1, 4.0), (2026, 0, 4.0)], "{report}");
    assert!(report["notes"].to_string().contains("encounter rates per kilometre"), "{}", report["notes"]);
    // Beside the rates, the animals recorded each year whatever the effort: 2025 has one
    // on a walk and one outside, 2026 three on a walk where not every find was reported.
    let counts: Vec<(i64, u64)> = report["yearly_counts"]
        .as_array()
        .unwrap()
        .iter()
        .map(|y| (y["year"].as_i64().unwrap(), y["count"].as_u64().unwrap()))
        .collect();
    assert_eq!(counts, [(2024, 2), (2025, 2), (2026, 3)], "{report}");
    let hours: Value = app.get("/api/trend?state=any&generation_length=8&effort=hours").await.json().await.unwrap();
    assert_eq!(hours["years"][0]["effort"], 2.0, "two hours walked in 2024");
}

#[tokio::test]
async fn a_trend_from_fewer_than_three_years_is_refused_in_plain_words() {
    let app = spawn_app().await;
    assert_eq!(post_walk(&app, &walk(track_json(&beach_track(), 20))).await.0, 200);
    let response = app.get("/api/trend?state=any&generation_length=8").await;
    assert_eq!(response.status(), 400);
    let body: Value = response.json().await.unwrap();
    assert_eq!(body["error"], "a trend needs counts from at least 3 years; these records cover 1");
}
