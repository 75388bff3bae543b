//! Benchmark (not a timed test): durable ingest over HTTP against raw SQLite on the same
//! disk, in the same run.
//!
//! - Baseline: one connection inserting one row per transaction with
//!   `journal_mode = WAL` and `synchronous = FULL` (each commit synced, as the server's
//!   are), a row the size of a record's JSON, in a scratch folder beside the server's
//!   data. Measured before and after the HTTP run; their mean is the baseline.
//! - Ingest: the real server (router, connection limits, intake, group commit, the
//!   duplicate search) on 127.0.0.1, 64 clients each with its own device identity,
//!   each posting records (JSON only, multipart as the phone sends them) one after
//!   another, each counted when its receipt arrives — that is, once it is durable.
//!   The per-address pace is raised for the run: 64 clients on one address are one
//!   load generator, not 64 phones behind one router.
//!
//! The target is ingest ≥ 1.0 × the baseline. A second run with one photo per record
//! (a 400 × 300 JPEG) shows what decoding and files cost.
//!
//!     cargo bench -p wrackline-server --bench ingest

use std::sync::Arc;
use std::time::{Duration, Instant};

use serde_json::{Value, json};
use wrackline_server::AppState;
use wrackline_server::settings::Settings;

const CLIENTS: usize = 64;
const RECORDS_PER_CLIENT: usize = 60;
const PHOTO_RECORDS_PER_CLIENT: usize = 8;
const BASELINE_SECONDS: f64 = 3.0;

/// One-row transactions per second on a fresh SQLite file in `dir`.
fn raw_sqlite_rate(dir: &std::path::Path, row: &str) -> f64 {
    let path = dir.join(format!("baseline-{}.sqlite3", uuid::Uuid::new_v4()));
    let conn = rusqlite::Connection::open(&path).expect("baseline database");
    conn.pragma_update(None, "journal_mode", "WAL").expect("WAL");
    conn.pragma_update(None, "synchronous", "FULL").expect("FULL");
    conn.execute_batch("CREATE TABLE records (id INTEGER PRIMARY KEY, body TEXT NOT NULL)").expect("table");
    let started = Instant::now();
    let mut count = 0u64;
    while started.elapsed().as_secs_f64() < BASELINE_SECONDS {
        conn.execute_batch("BEGIN").expect("begin");
        conn.execute("INSERT INTO records (body) VALUES (?1)", [row]).expect("insert");
        conn.execute_batch("COMMIT").expect("commit");
        count += 1;
    }
    count as f64 / started.elapsed().as_secs_f64()
}

/// A record on the coast of Cardigan Bay, spread over places and a year of days so the
/// duplicate search finds what it would in a real network (few candidates).
fn record(client: usize, index: usize) -> Value {
    let n = (client * 7919 + index * 104_729) % 100_000;
    json!({
        "client_id": uuid::Uuid::new_v4(),
        "observed_at": format!("2025-{:02}-{:02}T{:02}:10:00+01:00", 1 + n % 12, 1 + n % 28, n % 24),
        "position": {"latitude": 51.6 + (n % 997) as f64 * 0.0012, "longitude": -4.2 - (n % 331) as f64 * 0.0015,
                     "accuracy_m": 8.0, "source": "device"},
        "species_guess": "small-spotted catshark",
        "length": {"kind": "total", "value": 40.0 + (n % 30) as f64, "unit": "cm", "method": "measured"},
        "sex": "male", "count": 1, "condition": "fresh_dead", "setting": "beach_stranding",
        "human_signs": ["hook"], "notes": "on the strandline below the cliff path", "observer_name": "Bench Observer"
    })
}

fn photo(seed: usize) -> Vec<u8> {
    let img = image::RgbImage::from_fn(400, 300, |x, y| {
        image::Rgb([(x as usize * 3 + seed) as u8, (y as usize * 5 + seed * 7) as u8, (x ^ y) as u8])
    });
    let mut bytes = Vec::new();
    image::codecs::jpeg::JpegEncoder::new_with_quality(&mut bytes, 85).encode_image(&img).expect("encode");
    bytes
}

/// Records per second from `CLIENTS` clients sending `per_client` records each, with a
/// photo each when `with_photos`.
async fn ingest_rate(base: &str, per_client: usize, with_photos: bool) -> (f64, usize) {
    let client = reqwest::Client::builder().pool_max_idle_per_host(CLIENTS).build().expect("client");
    let mut tokens = Vec::new();
    for _ in 0..CLIENTS {
        let body: Value = client
            .post(format!("{base}/api/devices"))
            .json(&json!({"display_name": "Bench Phone"}))
            .send()
            .await
            .expect("device")
            .json()
            .await
            .expect("token");
        tokens.push(body["token"].as_str().expect("a token").to_owned());
    }
    let start = Arc::new(tokio::sync::Barrier::new(CLIENTS + 1));
    let mut tasks = Vec::new();
    for (number, token) in tokens.into_iter().enumerate() {
        let (client, base, start) = (client.clone(), base.to_owned(), start.clone());
        let forms: Vec<(String, Option<Vec<u8>>)> = (0..per_client)
            .map(|index| (record(number, index).to_string(), with_photos.then(|| photo(number * 1000 + index))))
            .collect();
        tasks.push(tokio::spawn(async move {
            start.wait().await;
            let mut received = 0;
            for (json, photo) in forms {
                let mut form = reqwest::multipart::Form::new().text("record", json);
                if let Some(bytes) = photo {
                    form = form.part("photo", reqwest::multipart::Part::bytes(bytes).file_name("p.jpg"));
                }
                let answer = client
                    .post(format!("{base}/api/observations"))
                    .bearer_auth(&token)
                    .multipart(form)
                    .send()
                    .await
                    .expect("an answer");
                assert_eq!(answer.status(), 200, "{}", answer.text().await.unwrap_or_default());
                received += 1;
            }
            received
        }));
    }
    start.wait().await;
    let started = Instant::now();
    let mut received = 0;
    for task in tasks {
        received += task.await.expect("a client");
    }
    (received as f64 / started.elapsed().as_secs_f64(), received)
}

fn main() {
    let dir = tempfile::tempdir_in(env!("CARGO_TARGET_TMPDIR")).expect("scratch folder on the target disk");
    let row = record(0, 0).to_string();
    let before = raw_sqlite_rate(dir.path(), &row);

    let settings = Settings { address_burst: 1_000_000, address_per_minute: 1_000_000, ..Settings::default() };
    let checklist = wrackline_server::taxa::load_checklist(None).expect("demo checklist");
    let state = AppState::open_with(&dir.path().join("data"), None, checklist, settings).expect("server state");
    let runtime = tokio::runtime::Builder::new_multi_thread().enable_all().build().expect("runtime");
    let (json_rate, json_count, photo_rate, photo_count) = runtime.block_on(async move {
        let listener = tokio::net::TcpListener::bind("127.0.0.1:0").await.expect("bind");
        let base = format!("http://{}", listener.local_addr().expect("address"));
        tokio::spawn(wrackline_server::router::serve_until(listener, state, std::future::pending()));
        let (json_rate, json_count) = ingest_rate(&base, RECORDS_PER_CLIENT, false).await;
        let (photo_rate, photo_count) = ingest_rate(&base, PHOTO_RECORDS_PER_CLIENT, true).await;
        (json_rate, json_count, photo_rate, photo_count)
    });
    runtime.shutdown_timeout(Duration::from_secs(5));
    let after = raw_sqlite_rate(dir.path(), &row);
    let baseline = (before + after) / 2.0;

    println!("durable ingest over HTTP, {CLIENTS} clients, against raw SQLite on the same disk:");
    println!(
        "  baseline, raw SQLite one row per transaction (WAL, synchronous = FULL): {before:.0} and {after:.0} commits/s, mean {baseline:.0}"
    );
    println!("  HTTP ingest, JSON only: {json_count} records, {json_rate:.0} records/s");
    println!("  HTTP ingest, one 400 × 300 JPEG each: {photo_count} records, {photo_rate:.0} records/s");
    println!(
        "  ratio ingest / raw SQLite: {:.2} (JSON only), {:.2} (with a photo)",
        json_rate / baseline,
        photo_rate / baseline
    );
    println!(
        "bench-row | durable HTTP ingest, {CLIENTS} clients, JSON only (`server/benches/ingest.rs`) | {json_rate:.0} records/s | raw SQLite, one row per transaction, synchronous = FULL, same disk: {baseline:.0} commits/s | {:.2}× | ≥ 1.0× — {}",
        json_rate / baseline,
        if json_rate >= baseline { "met" } else { "not met" }
    );
    println!(
        "bench-row | durable HTTP ingest, {CLIENTS} clients, one 400 × 300 JPEG each (`server/benches/ingest.rs`) | {photo_rate:.0} records/s | the same raw SQLite: {baseline:.0} commits/s | {:.2}× | —",
        photo_rate / baseline
    );
}
