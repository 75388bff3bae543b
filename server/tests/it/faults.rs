//! The fault harness: the real `wrackline` binary on 127.0.0.1, 64 phones sending records
//! (some with photos) and resending whatever got no receipt, while the server is killed
//! with SIGKILL and started again three times. Then: every acknowledged record is stored
//! under the id its receipt gave, none is stored twice, no answer was a 5xx, every photo
//! is the file the phone sent (SHA-256), and `wrackline check` passes.
//!
//! The data folder starts with 104 records bunched at one beach over two days, and each
//! phone's first records come from the same spots: the duplicate index is bulk-loaded
//! from records clustered like that, and the new records are inserted into it (the shape
//! that made rstar panic, answering 500 to stored records). Later records spread along
//! the coast over a month, as a network's do.
//!
//! Sizes keep it inside the CI run (about a minute in a debug build); `cargo xtask bench`
//! measures throughput, not this.

use std::collections::{HashMap, HashSet};
use std::sync::atomic::{AtomicUsize, Ordering};
use std::sync::{Arc, Mutex};
use std::time::Duration;

use serde_json::{Value, json};
use sha2::{Digest as _, Sha256};

use crate::helpers::sized_jpeg;
use crate::process;

const PHONES: usize = 64;
const RECORDS_PER_PHONE: usize = 12;
const KILLS: usize = 3;
/// Records already stored at the beach when the harness begins (rstar 0.12's bulk load
/// left 99–111 such records in a tree that panicked on the inserts that follow).
const SEEDED: u64 = 104;
/// Each phone's first records are at the busy beach.
const AT_THE_BEACH: usize = 2;
/// The whole harness must finish within this.
const BOUND: Duration = Duration::from_secs(600);

/// What the phones saw.
#[derive(Default)]
struct Seen {
    /// Client id → the observation id its receipt gave.
    receipts: HashMap<String, i64>,
    /// Client id → the SHA-256 of each photo sent with it, in order.
    sent_photos: HashMap<String, Vec<String>>,
    /// Every 5xx answer: status and body.
    server_errors: Vec<(u16, String)>,
    /// Sends that got no answer (the server was down or died mid-request).
    no_answer: usize,
}

/// A record: the first few of each phone from the busy beach (50 × 13 spots a few metres
/// apart, on one of two days), the rest from one of 16 beaches 5.5 km apart over June.
fn record(phone: usize, index: usize) -> Value {
    let spot = phone * RECORDS_PER_PHONE + index;
    let (beach, day, hour) = if index < AT_THE_BEACH {
        (0, 1 + spot % 2, 8 + spot % 10)
    } else {
        (1 + phone % 16, 1 + spot % 30, 8 + spot % 10)
    };
    json!({
        "client_id": uuid::Uuid::new_v4(),
        "observed_at": format!("2025-06-{day:02}T{hour:02}:10:00+01:00"),
        "position": {"latitude": 52.4 + beach as f64 * 0.05 + (spot % 50) as f64 * 1e-4,
                     "longitude": -4.05 + (spot % 13) as f64 * 1e-4, "accuracy_m": 8.0, "source": "device"},
        "species_guess": "thornback ray",
        "sex": "unknown", "count": 1, "condition": "decomposed", "setting": "beach_stranding",
        "human_signs": [], "notes": null, "observer_name": format!("Phone {phone}")
    })
}

/// Every fourth record carries a photo of its own, every eighth also one it shares with
/// the next phone's (the same file in two records is one file on disk).
fn photos(phone: usize, index: usize) -> Vec<Vec<u8>> {
    let mut photos = Vec::new();
    if index.is_multiple_of(4) {
        photos.push(tinted(phone * 100 + index));
    }
    if index.is_multiple_of(8) {
        photos.push(tinted(1_000_000 + (phone / 2) * 100 + index));
    }
    photos
}

fn tinted(seed: usize) -> Vec<u8> {
    let mut jpeg = sized_jpeg(120, 90);
    // A comment segment after SOI makes each file's bytes (and hash) its own.
    let comment = format!("photo {seed}");
    let mut segment = vec![0xFF, 0xFE];
    segment.extend(((comment.len() + 2) as u16).to_be_bytes());
    segment.extend(comment.as_bytes());
    jpeg.splice(2..2, segment);
    jpeg
}

fn sha256(bytes: &[u8]) -> String {
    hex::encode(Sha256::digest(bytes))
}

/// Seeds the data folder: a migrated database with `SEEDED` records bunched at the beach,
/// each already searched for duplicates (their invented photo, which has no file, left
/// out, so `wrackline check` judges only what the phones sent).
fn seed(data_dir: &std::path::Path) {
    let checklist = wrackline_server::taxa::load_checklist(None).unwrap();
    drop(wrackline_server::AppState::open(data_dir, None, checklist).unwrap());
    let mut conn = rusqlite::Connection::open(data_dir.join("wrackline.sqlite3")).unwrap();
    wrackline_server::store::synthetic::fill(&mut conn, SEEDED).unwrap();
    conn.execute_batch(
        "UPDATE observations SET latitude = 52.4 + (id % 50) * 1e-4, longitude = -4.05 + (id % 13) * 1e-4,
             observed_at_utc = strftime('%Y-%m-%dT%H:%M:%SZ', '2025-06-01T00:00:00Z', '+' || (id % 48) || ' hours');
         INSERT INTO duplicate_searches (observation_id, searched_at) SELECT id, '2025-06-03T00:00:00Z' FROM observations;
         DELETE FROM observation_photos; DELETE FROM photos;",
    )
    .unwrap();
}

/// One phone: sends each of its records until it gets a receipt, resending after no
/// answer or a refusal that says "not now".
async fn phone(number: usize, base: Arc<Mutex<String>>, seen: Arc<Mutex<Seen>>, acknowledged: Arc<AtomicUsize>) {
    let client = reqwest::Client::builder().timeout(Duration::from_secs(20)).build().unwrap();
    let token = loop {
        let url = format!("{}/api/devices", base.lock().unwrap());
        if let Ok(answer) = client.post(url).json(&json!({"display_name": format!("Phone {number}")})).send().await
            && answer.status() == 200
        {
            break answer.json::<Value>().await.unwrap()["token"].as_str().unwrap().to_owned();
        }
        tokio::time::sleep(Duration::from_millis(100)).await;
    };
    for index in 0..RECORDS_PER_PHONE {
        let (record, photos) = (record(number, index), photos(number, index));
        let id = record["client_id"].as_str().unwrap().to_owned();
        seen.lock().unwrap().sent_photos.insert(id.clone(), photos.iter().map(|p| sha256(p)).collect());
        loop {
            let mut form = reqwest::multipart::Form::new().text("record", record.to_string());
            for (i, bytes) in photos.iter().enumerate() {
                form = form.part("photo", reqwest::multipart::Part::bytes(bytes.clone()).file_name(format!("{i}.jpg")));
            }
            let url = format!("{}/api/observations", base.lock().unwrap());
            match client.post(url).bearer_auth(&token).multipart(form).send().await {
                Ok(answer) if answer.status() == 200 => {
                    let receipt: Value = answer.json().await.unwrap();
                    let observation = receipt["observation_id"].as_i64().unwrap();
                    let mut seen = seen.lock().unwrap();
                    if let Some(earlier) = seen.receipts.insert(id.clone(), observation) {
                        assert_eq!(earlier, observation, "record {id}: two receipts with different ids");
                    }
                    acknowledged.fetch_add(1, Ordering::SeqCst);
                    break;
                }
                Ok(answer) => {
                    let status = answer.status().as_u16();
                    let body = answer.text().await.unwrap_or_default();
                    assert!(status >= 500 || status == 429, "record {id}: refused {status}: {body}");
                    if status >= 500 {
                        seen.lock().unwrap().server_errors.push((status, body));
                    }
                }
                Err(_) => seen.lock().unwrap().no_answer += 1,
            }
            tokio::time::sleep(Duration::from_millis(100)).await;
        }
    }
}

#[tokio::test(flavor = "multi_thread", worker_threads = 4)]
async fn sixty_four_phones_lose_and_double_nothing_through_three_kills() {
    let dir = tempfile::tempdir().unwrap();
    let data_dir = dir.path().join("data");
    seed(&data_dir);
    let flags = ["--address-burst", "1000000", "--address-per-minute", "1000000", "--max-uploads", "64"];
    let mut server = Some(process::start(&data_dir, "127.0.0.1:0", &flags));
    let bind = server.as_ref().unwrap().base.trim_start_matches("http://").to_owned();
    let base = Arc::new(Mutex::new(server.as_ref().unwrap().base.clone()));
    let (seen, acknowledged) = (Arc::new(Mutex::new(Seen::default())), Arc::new(AtomicUsize::new(0)));
    let total = PHONES * RECORDS_PER_PHONE;
    let logs = Mutex::new(Vec::new());
    let run = async {
        let phones: Vec<_> =
            (0..PHONES).map(|n| tokio::spawn(phone(n, base.clone(), seen.clone(), acknowledged.clone()))).collect();
        for kill in 1..=KILLS {
            // Kill when a quarter, a half and three quarters have their receipts.
            while acknowledged.load(Ordering::SeqCst) < total * kill / (KILLS + 1) {
                tokio::time::sleep(Duration::from_millis(20)).await;
            }
            let killed = server.take().unwrap();
            logs.lock().unwrap().push(killed.log());
            killed.kill();
            let restarted = tokio::task::spawn_blocking({
                let (data_dir, bind) = (data_dir.clone(), bind.clone());
                move || process::start(&data_dir, &bind, &flags)
            });
            server = Some(restarted.await.unwrap());
        }
        for phone in phones {
            phone.await.expect("a phone panicked");
        }
    };
    tokio::time::timeout(BOUND, run).await.expect("the harness finished within its bound");
    let server = server.unwrap();
    let seen = std::mem::take(&mut *seen.lock().unwrap());
    assert!(
        seen.server_errors.is_empty(),
        "{} answers were 5xx, e.g. {:?}; server log:\n{}",
        seen.server_errors.len(),
        &seen.server_errors[..seen.server_errors.len().min(3)],
        server.log()
    );
    assert_eq!(seen.receipts.len(), total, "every record got its receipt in the end");
    // The follow-up work is done too: every record has been searched for duplicates
    // (a search that failed is retried in the background).
    let unsearched = || {
        let conn = rusqlite::Connection::open(data_dir.join("wrackline.sqlite3")).unwrap();
        conn.query_row(
            "SELECT COUNT(*) FROM observations o WHERE NOT EXISTS (SELECT 1 FROM duplicate_searches s WHERE s.observation_id = o.id)",
            [],
            |row| row.get::<_, i64>(0),
        )
        .unwrap()
    };
    let deadline = tokio::time::Instant::now() + Duration::from_secs(30);
    while unsearched() > 0 {
        let left = unsearched();
        assert!(
            tokio::time::Instant::now() < deadline,
            "{left} records were never searched for duplicates; server log:\n{}",
            server.log()
        );
        tokio::time::sleep(Duration::from_millis(100)).await;
    }
    logs.lock().unwrap().push(server.log());
    server.stop();
    // The server never panicked (a panic caught in follow-up work is retried, but it is
    // still a bug: rstar's panicked here).
    for (start, log) in logs.lock().unwrap().iter().enumerate() {
        let shown: String = log.chars().take(3000).collect();
        assert!(!log.contains("panicked"), "start {start} of the server panicked:\n{shown}");
    }

    let conn = rusqlite::Connection::open(data_dir.join("wrackline.sqlite3")).unwrap();
    let stored: HashMap<String, i64> = conn
        .prepare("SELECT client_id, id FROM observations")
        .unwrap()
        .query_map([], |row| Ok((row.get(0)?, row.get(1)?)))
        .unwrap()
        .collect::<Result<_, _>>()
        .unwrap();
    assert_eq!(stored.len(), SEEDED as usize + total, "none lost, none doubled");
    let lost: Vec<_> = seen.receipts.iter().filter(|(id, observation)| stored.get(*id) != Some(observation)).collect();
    assert!(lost.is_empty(), "acknowledged but not stored as acknowledged: {lost:?}");
    // Each record holds exactly the photos its phone sent, in order, by SHA-256.
    let mut linked: HashMap<String, Vec<String>> = HashMap::new();
    let mut rows = conn
        .prepare(
            "SELECT o.client_id, op.photo_sha256 FROM observation_photos op JOIN observations o ON o.id = op.observation_id
             WHERE o.id > ?1 ORDER BY o.id, op.position",
        )
        .unwrap();
    for row in rows.query_map([SEEDED as i64], |row| Ok((row.get::<_, String>(0)?, row.get::<_, String>(1)?))).unwrap()
    {
        let (id, sha) = row.unwrap();
        linked.entry(id).or_default().push(sha);
    }
    let with_photos: HashMap<&String, &Vec<String>> = seen.sent_photos.iter().filter(|(_, p)| !p.is_empty()).collect();
    assert_eq!(linked.len(), with_photos.len(), "records with photos");
    for (id, sent) in with_photos {
        assert_eq!(linked.get(id), Some(sent), "record {id}: its photos, by SHA-256");
    }
    let distinct: HashSet<&String> = seen.sent_photos.values().flatten().collect();
    let files: i64 = conn.query_row("SELECT COUNT(*) FROM photos", [], |row| row.get(0)).unwrap();
    assert_eq!(files as usize, distinct.len(), "a photo sent in two records is stored once");
    drop(rows);
    let checked = process::run(&data_dir, &["check"]);
    assert!(checked.status.success(), "wrackline check: {}", process::said(&checked));
    assert!(process::said(&checked).contains("photos present with matching SHA-256"), "{}", process::said(&checked));
    println!("fault harness: {total} records, {} sends got no answer across {KILLS} kills", seen.no_answer);
}
