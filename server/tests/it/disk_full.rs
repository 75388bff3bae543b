//! A full disk and a read-only one, for real: the real binary with its data folder on a
//! small tmpfs of the test's own (32 MiB; never the machine's disk), filled with a file,
//! and its photo folder made read-only (a read-only bind mount: the disk itself cannot be
//! remounted read-only while the server holds its database open for writing). Every refusal is a 507 or 503 with `Retry-After` whose words
//! are true (nothing of the record was kept); nothing is half-written (no scratch file,
//! no photo file the database does not name); every acknowledged record is stored, and
//! each refused one is taken once there is room again.
//!
//! Mounting needs root (CI runs as root); anywhere else the test says why it is skipped
//! and passes.

use std::path::{Path, PathBuf};
use std::process::Command;

use reqwest::multipart::{Form, Part};
use serde_json::Value;

use crate::helpers::{plain_jpeg, sized_jpeg, submission};
use crate::process;

const TMPFS_MIB: u64 = 32;

/// A tmpfs mounted for one test, unmounted when dropped.
struct Tmpfs {
    path: PathBuf,
    _dir: tempfile::TempDir,
}

impl Tmpfs {
    fn mount() -> Option<Self> {
        let dir = tempfile::tempdir().ok()?;
        let path = dir.path().join("disk");
        std::fs::create_dir(&path).ok()?;
        let size = format!("size={TMPFS_MIB}m");
        let mounted = Command::new("mount").args(["-t", "tmpfs", "-o", &size, "tmpfs"]).arg(&path).output().ok()?;
        mounted.status.success().then_some(Self { path, _dir: dir })
    }

    /// Makes `folder` (inside the tmpfs) read-only, as a bind mount over itself: the
    /// database stays open for writing elsewhere on the disk, so the whole disk cannot be
    /// remounted read-only under a running server.
    fn read_only(&self, folder: &Path) {
        let bound = Command::new("mount").arg("--bind").arg(folder).arg(folder).status().unwrap();
        assert!(bound.success(), "bind mount {}", folder.display());
        let ro = Command::new("mount").args(["-o", "remount,bind,ro"]).arg(folder).status().unwrap();
        assert!(ro.success(), "read-only {}", folder.display());
    }

    fn writable(&self, folder: &Path) {
        assert!(Command::new("umount").arg(folder).status().unwrap().success(), "unmount {}", folder.display());
    }
}

impl Drop for Tmpfs {
    fn drop(&mut self) {
        let _ = Command::new("umount").arg("-l").arg(&self.path).status();
    }
}

struct Sent {
    status: u16,
    retry_after: Option<String>,
    body: Value,
}

async fn send(base: &str, id: &str, photo: Option<Vec<u8>>) -> Sent {
    let mut form = Form::new().text("record", submission(id).to_string());
    if let Some(bytes) = photo {
        form = form.part("photo", Part::bytes(bytes).file_name("p.jpg"));
    }
    let answer = match reqwest::Client::new().post(format!("{base}/api/observations")).multipart(form).send().await {
        Ok(a) => a,
        Err(e) => {
            println!("SEND FAILED {id} {e:?}");
            return Sent { status: 0, retry_after: None, body: Value::Null };
        }
    };
    let retry_after = answer.headers().get("retry-after").map(|v| v.to_str().unwrap().to_owned());
    Sent { status: answer.status().as_u16(), retry_after, body: answer.json().await.unwrap_or_default() }
}

/// Fills the disk with a file until `leave` bytes are free (or less).
fn fill(disk: &Path, leave: u64) -> PathBuf {
    let filler = disk.join("filler");
    let free = free_bytes(disk);
    let size = free.saturating_sub(leave);
    let file = std::fs::File::create(&filler).unwrap();
    let chunk = vec![7u8; 1 << 20];
    let mut written = 0;
    let mut writer = std::io::BufWriter::new(file);
    while written < size {
        let take = (size - written).min(chunk.len() as u64) as usize;
        if std::io::Write::write_all(&mut writer, &chunk[..take]).is_err() {
            break;
        }
        written += take as u64;
    }
    let _ = std::io::Write::flush(&mut writer);
    filler
}

fn free_bytes(path: &Path) -> u64 {
    let out = Command::new("df").args(["-B1", "--output=avail"]).arg(path).output().unwrap();
    String::from_utf8_lossy(&out.stdout).lines().nth(1).unwrap().trim().parse().unwrap()
}

/// Nothing half-written: no scratch file, and every photo file named by a stored photo.
fn assert_nothing_half_written(data_dir: &Path, when: &str) {
    let scratch = std::fs::read_dir(data_dir.join("photos/tmp")).unwrap().count();
    assert_eq!(scratch, 0, "{when}: scratch files left");
    let conn = rusqlite::Connection::open(data_dir.join("wrackline.sqlite3")).unwrap();
    let named: i64 = conn.query_row("SELECT COUNT(*) FROM photos", [], |row| row.get(0)).unwrap();
    let files = std::fs::read_dir(data_dir.join("photos"))
        .unwrap()
        .flatten()
        .filter(|e| e.file_name() != "tmp")
        .map(|e| std::fs::read_dir(e.path()).unwrap().count())
        .sum::<usize>();
    assert_eq!(files as i64, named * 3, "{when}: each stored photo has its three files, and no other file is there");
}

fn refused_for_room(sent: &Sent, what: &str) {
    assert_eq!(sent.status, 507, "{what}: {}", sent.body);
    assert_eq!(sent.retry_after.as_deref(), Some("300"), "{what}");
    assert_eq!(
        sent.body["error"], "the server's disk is full, so this was not stored; it can be sent again later",
        "{what}"
    );
}

#[tokio::test]
async fn a_full_disk_and_a_read_only_one_are_refused_with_retry_after_and_nothing_half_written() {
    let Some(disk) = Tmpfs::mount() else {
        eprintln!("skipped: mounting a test tmpfs needs root (CI runs as root)");
        return;
    };
    let data_dir = disk.path.join("data");
    let server = process::start(&data_dir, "127.0.0.1:0", &["--min-free-mb", "0"]);
    let base = server.base.clone();
    let mut acknowledged = Vec::new();
    let first = uuid::Uuid::new_v4().to_string();
    assert_eq!(send(&base, &first, Some(plain_jpeg(1))).await.status, 200);
    acknowledged.push(first);

    // Room for the record, not for its photo: the upload fails while it streams in.
    let filler = fill(&disk.path, 96 * 1024);
    let big = uuid::Uuid::new_v4().to_string();
    let photo = sized_jpeg(900, 700);
    assert!(photo.len() > 200 * 1024, "the photo is larger than the room left");
    refused_for_room(&send(&base, &big, Some(photo.clone())).await, "a photo larger than the room left");
    assert_nothing_half_written(&data_dir, "after a photo that did not fit");

    // No room at all: records without photos go in until the database cannot grow, then
    // each is refused the same way (never a 500).
    drop(fill(&disk.path.join("data"), 0));
    let mut refused = Vec::new();
    for _ in 0..40 {
        let id = uuid::Uuid::new_v4().to_string();
        let sent = send(&base, &id, None).await;
        match sent.status {
            200 => acknowledged.push(id),
            _ => {
                refused_for_room(&sent, "a record when nothing is free");
                refused.push(id);
            }
        }
    }
    assert!(!refused.is_empty(), "the full disk refused records");
    assert_nothing_half_written(&data_dir, "after records refused for a full database");

    // Room again: the refused records are taken when resent.
    std::fs::remove_file(&filler).unwrap();
    std::fs::remove_file(disk.path.join("data/filler")).unwrap();
    for id in refused.iter().chain([&big]) {
        let photo = (id == &big).then(|| photo.clone());
        assert_eq!(send(&base, id, photo).await.status, 200, "{id} after room was made");
        acknowledged.push(id.clone());
    }

    // A read-only photo folder: 503, nothing kept, the server still answers.
    let photos = data_dir.join("photos");
    disk.read_only(&photos);
    let unwritable = uuid::Uuid::new_v4().to_string();
    let sent = send(&base, &unwritable, Some(plain_jpeg(2))).await;
    assert_eq!(sent.status, 503, "{}", sent.body);
    assert_eq!(sent.retry_after.as_deref(), Some("300"));
    assert!(
        sent.body["error"].as_str().unwrap().starts_with("the server cannot write to its data folder"),
        "{}",
        sent.body
    );
    assert_eq!(reqwest::get(format!("{base}/healthz")).await.unwrap().status(), 200);
    disk.writable(&photos);
    assert_eq!(send(&base, &unwritable, Some(plain_jpeg(2))).await.status, 200, "writable again");
    acknowledged.push(unwritable);

    server.stop();
    let conn = rusqlite::Connection::open(data_dir.join("wrackline.sqlite3")).unwrap();
    for id in &acknowledged {
        let stored: i64 =
            conn.query_row("SELECT COUNT(*) FROM observations WHERE client_id = ?1", [id], |row| row.get(0)).unwrap();
        assert_eq!(stored, 1, "acknowledged {id} is stored once");
    }
    let checked = process::run(&data_dir, &["check"]);
    assert!(checked.status.success(), "{}", process::said(&checked));

    // The free-space guard: with less free than the operator keeps, refused before writing.
    let _filler = fill(&disk.path, 8 << 20);
    let guarded = process::start(&data_dir, "127.0.0.1:0", &["--min-free-mb", "16"]);
    let sent = send(&guarded.base, &uuid::Uuid::new_v4().to_string(), Some(plain_jpeg(3))).await;
    refused_for_room(&sent, "below the free space kept");
    assert_nothing_half_written(&data_dir, "after the guard refused");
    guarded.stop();
}
