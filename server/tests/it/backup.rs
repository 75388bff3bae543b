//! `wrackline backup`, `check` and `restore` as an operator runs them: the real binary,
//! a backup taken while the server is taking submissions, checked, damaged, restored.

use std::sync::Arc;
use std::sync::atomic::{AtomicBool, AtomicUsize, Ordering};

use serde_json::Value;

use crate::helpers::{plain_jpeg, submission};
use crate::process;

/// Sends records with a photo each until `stop`, counting the receipts.
async fn keep_sending(base: String, stop: Arc<AtomicBool>, received: Arc<AtomicUsize>) {
    let client = reqwest::Client::new();
    let mut seed = 0u8;
    while !stop.load(Ordering::SeqCst) {
        seed = seed.wrapping_add(1);
        let form = reqwest::multipart::Form::new()
            .text("record", submission(&uuid::Uuid::new_v4().to_string()).to_string())
            .part("photo", reqwest::multipart::Part::bytes(plain_jpeg(seed)).file_name("p.jpg"));
        let answer = client.post(format!("{base}/api/observations")).multipart(form).send().await.unwrap();
        assert_eq!(answer.status(), 200, "{}", answer.text().await.unwrap_or_default());
        received.fetch_add(1, Ordering::SeqCst);
    }
}

fn count_records(data_dir: &std::path::Path) -> i64 {
    let conn = rusqlite::Connection::open(data_dir.join("wrackline.sqlite3")).unwrap();
    conn.query_row("SELECT COUNT(*) FROM observations", [], |row| row.get(0)).unwrap()
}

#[tokio::test(flavor = "multi_thread", worker_threads = 2)]
async fn a_backup_taken_while_records_arrive_checks_whole_and_restores() {
    let dir = tempfile::tempdir().unwrap();
    let (data_dir, backup_dir) = (dir.path().join("data"), dir.path().join("backup"));
    let server = process::start(&data_dir, "127.0.0.1:0", &[]);
    let (stop, received) = (Arc::new(AtomicBool::new(false)), Arc::new(AtomicUsize::new(0)));
    let sender = tokio::spawn(keep_sending(server.base.clone(), stop.clone(), received.clone()));
    while received.load(Ordering::SeqCst) < 10 {
        tokio::time::sleep(std::time::Duration::from_millis(20)).await;
    }
    let before = received.load(Ordering::SeqCst);
    let backup = {
        let (data_dir, backup_dir) = (data_dir.clone(), backup_dir.clone());
        tokio::task::spawn_blocking(move || process::run(&data_dir, &["backup", "--to", backup_dir.to_str().unwrap()]))
            .await
            .unwrap()
    };
    let during = received.load(Ordering::SeqCst);
    stop.store(true, Ordering::SeqCst);
    sender.await.unwrap();
    assert!(backup.status.success(), "{}", process::said(&backup));
    assert!(during > before, "records kept arriving while the backup ran ({before} → {during})");
    let saved = count_records(&backup_dir);
    assert!(saved >= before as i64, "the backup holds every record acknowledged before it began");

    let checked = process::run(&backup_dir, &["check"]);
    assert!(checked.status.success(), "{}", process::said(&checked));
    assert!(process::said(&checked).contains(&format!("{saved} records")), "{}", process::said(&checked));

    // A backup is never written over.
    let again = process::run(&data_dir, &["backup", "--to", backup_dir.to_str().unwrap()]);
    assert!(!again.status.success());
    assert!(process::said(&again).contains("already holds a database"), "{}", process::said(&again));

    // Restored into an empty folder, it serves the same records.
    server.stop();
    let restored_dir = dir.path().join("restored");
    let restored = process::run(&restored_dir, &["restore", "--from", backup_dir.to_str().unwrap()]);
    assert!(restored.status.success(), "{}", process::said(&restored));
    assert_eq!(count_records(&restored_dir), saved);
    let refused = process::run(&restored_dir, &["restore", "--from", backup_dir.to_str().unwrap()]);
    assert!(process::said(&refused).contains("already holds a database"), "{}", process::said(&refused));
    let server = process::start(&restored_dir, "127.0.0.1:0", &[]);
    let health = reqwest::get(format!("{}/healthz", server.base)).await.unwrap();
    assert_eq!(health.status(), 200);
    server.stop();
    assert!(process::run(&restored_dir, &["check"]).status.success());
}

#[tokio::test]
async fn check_names_a_damaged_or_missing_photo_and_restore_refuses_such_a_backup() {
    let dir = tempfile::tempdir().unwrap();
    let data_dir = dir.path().join("data");
    let server = process::start(&data_dir, "127.0.0.1:0", &[]);
    let client = reqwest::Client::new();
    let mut shas = Vec::new();
    for seed in [1u8, 2] {
        let form = reqwest::multipart::Form::new()
            .text("record", submission(&uuid::Uuid::new_v4().to_string()).to_string())
            .part("photo", reqwest::multipart::Part::bytes(plain_jpeg(seed)).file_name("p.jpg"));
        let answer = client.post(format!("{}/api/observations", server.base)).multipart(form).send().await.unwrap();
        assert_eq!(answer.status(), 200);
        let _: Value = answer.json().await.unwrap();
        shas.push(wrackline_server::intake::photos::sha256_hex(&plain_jpeg(seed)));
    }
    server.stop();
    assert!(process::run(&data_dir, &["check"]).status.success());
    let original = |sha: &str| data_dir.join("photos").join(&sha[..2]).join(sha);
    // One photo changed by a byte, one gone.
    let mut bytes = std::fs::read(original(&shas[0])).unwrap();
    bytes[100] ^= 0xFF;
    std::fs::write(original(&shas[0]), bytes).unwrap();
    std::fs::remove_file(original(&shas[1])).unwrap();
    let checked = process::run(&data_dir, &["check"]);
    assert!(!checked.status.success());
    let said = process::said(&checked);
    assert!(said.contains(&format!("photo {}: the file's SHA-256 is", shas[0])), "{said}");
    assert!(said.contains(&format!("photo {}: the original file is missing", shas[1])), "{said}");
    let restored_dir = dir.path().join("restored");
    let refused = process::run(&restored_dir, &["restore", "--from", data_dir.to_str().unwrap()]);
    assert!(!refused.status.success());
    assert!(
        process::said(&refused).contains("is not a whole backup; nothing was restored"),
        "{}",
        process::said(&refused)
    );
    assert!(!restored_dir.join("wrackline.sqlite3").exists(), "nothing was copied");
}
