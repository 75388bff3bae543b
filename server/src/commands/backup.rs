//! `wrackline backup`, `restore` and `check`: the operator's copy of everything the
//! server holds, and the proof that a data folder (or a copy of one) is whole.
//!
//! A backup folder has a data folder's layout: `wrackline.sqlite3` and `photos/`. The
//! database is copied with SQLite's online backup API in one read transaction, so it is
//! the database as it was at one commit even while the server takes submissions; then
//! every photo file that copy names is copied and its SHA-256 checked on the way.
//! Photo files are written before the row that names them and never changed or
//! removed while named, so every photo the copy names is on disk to be copied.
//!
//! `check` runs SQLite's integrity and foreign-key checks and reads every original photo
//! the database names, comparing its SHA-256 with its name; it reads only, so it may run
//! beside a running server. `restore` checks a backup first, then copies it into an
//! empty data folder.

use std::fs::File;
use std::io::{Read as _, Write as _};
use std::path::{Path, PathBuf};
use std::time::Instant;

use anyhow::{Context as _, bail};
use sha2::{Digest as _, Sha256};

use crate::intake::photos::{PhotoFiles, Rendition};
use crate::store::backup::{self, DATABASE_FILE};

/// `wrackline backup --to DIR`.
#[derive(Debug, clap::Args)]
pub struct BackupArgs {
    /// A new or empty folder to write the backup into.
    #[arg(long, value_name = "DIR")]
    pub to: PathBuf,
}

/// `wrackline restore --from DIR`.
#[derive(Debug, clap::Args)]
pub struct RestoreArgs {
    /// A backup folder made by `wrackline backup`; it is checked before anything is copied.
    #[arg(long, value_name = "DIR")]
    pub from: PathBuf,
}

/// What `check` found in a data folder.
#[derive(Debug, Default)]
pub struct CheckReport {
    pub records: i64,
    pub photos: usize,
    /// What is wrong: the folder is not whole.
    pub problems: Vec<String>,
    /// What is worth knowing but harms nothing.
    pub notes: Vec<String>,
}

/// Copies the data folder `data_dir` into `args.to`.
pub fn backup(data_dir: &Path, args: &BackupArgs) -> anyhow::Result<()> {
    let started = Instant::now();
    refuse_if_it_holds_a_database(&args.to, "back up into")?;
    let records = backup::copy_database(&data_dir.join(DATABASE_FILE), &args.to.join(DATABASE_FILE))
        .with_context(|| format!("copying the database from {}", data_dir.display()))?;
    let copied = copy_photos(&args.to, &data_dir.join("photos"), &args.to.join("photos"))?;
    sync_folder(&args.to)?;
    if !copied.problems.is_empty() {
        bail!("the backup in {} is not whole:\n  {}", args.to.display(), copied.problems.join("\n  "));
    }
    println!(
        "backed up {records} records and {} photos ({:.1} MB) to {} in {:.1} s; check it with `wrackline check --data-dir {}`",
        copied.photos,
        copied.bytes as f64 / 1e6,
        args.to.display(),
        started.elapsed().as_secs_f64(),
        args.to.display()
    );
    Ok(())
}

/// Checks the backup `args.from`, then copies it into the empty data folder `data_dir`.
pub fn restore(data_dir: &Path, args: &RestoreArgs) -> anyhow::Result<()> {
    let report = check_folder(&args.from)?;
    if !report.problems.is_empty() {
        bail!(
            "{} is not a whole backup; nothing was restored:\n  {}",
            args.from.display(),
            report.problems.join("\n  ")
        );
    }
    refuse_if_it_holds_a_database(data_dir, "restore into")?;
    let records = backup::copy_database(&args.from.join(DATABASE_FILE), &data_dir.join(DATABASE_FILE))?;
    let copied = copy_photos(&args.from, &args.from.join("photos"), &data_dir.join("photos"))?;
    sync_folder(data_dir)?;
    if !copied.problems.is_empty() {
        bail!("the restore into {} is not whole:\n  {}", data_dir.display(), copied.problems.join("\n  "));
    }
    println!(
        "restored {records} records and {} photos from {} into {}",
        copied.photos,
        args.from.display(),
        data_dir.display()
    );
    Ok(())
}

/// Checks the data folder (or backup) `data_dir` and prints what it found; an error when
/// anything is wrong.
pub fn check(data_dir: &Path) -> anyhow::Result<()> {
    let report = check_folder(data_dir)?;
    for note in &report.notes {
        println!("note: {note}");
    }
    for problem in &report.problems {
        println!("problem: {problem}");
    }
    if !report.problems.is_empty() {
        bail!("{} has {} problem(s); see above", data_dir.display(), report.problems.len());
    }
    println!(
        "{}: the database passes SQLite's integrity and foreign-key checks; {} records; all {} photos present with matching SHA-256",
        data_dir.display(),
        report.records,
        report.photos
    );
    Ok(())
}

/// SQLite's checks, then every photo the database names: present, and its bytes hash to
/// its name; derivatives present (a missing one is made again when first asked for).
pub fn check_folder(data_dir: &Path) -> anyhow::Result<CheckReport> {
    let conn = backup::open_read_only(&data_dir.join(DATABASE_FILE))
        .with_context(|| format!("opening the database in {}", data_dir.display()))?;
    let mut report = CheckReport { problems: backup::integrity_problems(&conn)?, ..CheckReport::default() };
    report.records = backup::observation_count(&conn)?;
    let stored = backup::stored_photos(&conn)?;
    report.photos = stored.len();
    let files = PhotoFiles::at(&data_dir.join("photos"));
    let mut missing_derivatives = 0;
    for (sha256, byte_len) in &stored {
        let Some(original) = files.path_of(sha256, Rendition::Original) else {
            report.problems.push(format!("photo {sha256}: not a SHA-256 name"));
            continue;
        };
        match hash_file(&original) {
            Ok((found, len)) if found == *sha256 && len == *byte_len => {}
            Ok((found, len)) => report.problems.push(format!(
                "photo {sha256}: the file's SHA-256 is {found} ({len} bytes, {byte_len} recorded): it was changed or damaged"
            )),
            Err(err) if err.kind() == std::io::ErrorKind::NotFound => {
                report.problems.push(format!("photo {sha256}: the original file is missing ({})", original.display()))
            }
            Err(err) => report.problems.push(format!("photo {sha256}: reading {} failed: {err}", original.display())),
        }
        for rendition in [Rendition::Display, Rendition::Thumb] {
            if files.path_of(sha256, rendition).is_some_and(|path| !path.exists()) {
                missing_derivatives += 1;
            }
        }
    }
    if missing_derivatives > 0 {
        report.notes.push(format!(
            "{missing_derivatives} display or thumbnail copies are missing; the server makes each again from its original when first asked for it"
        ));
    }
    Ok(report)
}

/// What copying photos did.
#[derive(Debug, Default)]
struct Copied {
    photos: usize,
    bytes: u64,
    problems: Vec<String>,
}

/// Copies every photo the database in `with_database` names from the photo folder `from`
/// to `to`, checking each original's SHA-256 as it goes.
fn copy_photos(with_database: &Path, from: &Path, to: &Path) -> anyhow::Result<Copied> {
    let conn = backup::open_read_only(&with_database.join(DATABASE_FILE))?;
    let (source, target) = (PhotoFiles::at(from), PhotoFiles::at(to));
    let mut copied = Copied::default();
    for (sha256, _) in backup::stored_photos(&conn)? {
        for rendition in [Rendition::Original, Rendition::Display, Rendition::Thumb] {
            let (Some(from), Some(to)) = (source.path_of(&sha256, rendition), target.path_of(&sha256, rendition))
            else {
                copied.problems.push(format!("photo {sha256}: not a SHA-256 name"));
                break;
            };
            match copy_file(&from, &to) {
                Ok((found, len)) if rendition == Rendition::Original => {
                    if found != sha256 {
                        copied.problems.push(format!("photo {sha256}: the file's SHA-256 is {found}"));
                    }
                    copied.bytes += len;
                    copied.photos += 1;
                }
                Ok((_, len)) => copied.bytes += len,
                // A derivative is made again from its original when it is missing.
                Err(err) if err.kind() == std::io::ErrorKind::NotFound && rendition != Rendition::Original => {}
                Err(err) => copied.problems.push(format!("photo {sha256}: copying {} failed: {err}", from.display())),
            }
        }
    }
    for folder in std::fs::read_dir(to).into_iter().flatten().flatten() {
        if folder.path().is_dir() {
            sync_folder(&folder.path())?;
        }
    }
    Ok(copied)
}

/// Copies one file durably, returning the SHA-256 of what it copied and its length.
fn copy_file(from: &Path, to: &Path) -> std::io::Result<(String, u64)> {
    let mut source = File::open(from)?;
    if let Some(folder) = to.parent() {
        std::fs::create_dir_all(folder)?;
    }
    let mut target = File::create(to)?;
    let mut hasher = Sha256::new();
    let mut buffer = vec![0; 1 << 16];
    let mut len = 0;
    loop {
        let read = source.read(&mut buffer)?;
        if read == 0 {
            break;
        }
        hasher.update(&buffer[..read]);
        target.write_all(&buffer[..read])?;
        len += read as u64;
    }
    target.sync_all()?;
    Ok((hex::encode(hasher.finalize()), len))
}

/// The SHA-256 of a file and its length.
fn hash_file(path: &Path) -> std::io::Result<(String, u64)> {
    let mut file = File::open(path)?;
    let mut hasher = Sha256::new();
    let len = std::io::copy(&mut file, &mut hasher)?;
    Ok((hex::encode(hasher.finalize()), len))
}

/// Refuses a folder that already holds a database: a backup or restore never overwrites.
fn refuse_if_it_holds_a_database(folder: &Path, what: &str) -> anyhow::Result<()> {
    if folder.join(DATABASE_FILE).exists() {
        bail!(
            "{} already holds a database; {what} a new or empty folder (move the old one aside first)",
            folder.display()
        );
    }
    std::fs::create_dir_all(folder).with_context(|| format!("creating {}", folder.display()))
}

fn sync_folder(folder: &Path) -> anyhow::Result<()> {
    File::open(folder).and_then(|f| f.sync_all()).with_context(|| format!("syncing {}", folder.display()))
}
