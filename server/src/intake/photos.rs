//! Photo files on disk, stored once by content: the file name is the SHA-256 of the
//! bytes, so the same photo sent twice (or attached to two records) is one file.
//!
//! Each photo has its original and two derivatives (a `Rendition`). A file is written to
//! a temporary name in `tmp/`, synced, then renamed into place and the folder synced, so
//! a photo the server has acknowledged survives a power cut. An upload arrives in `tmp/`
//! too (`received.rs`) and its original is renamed into place, never copied.
//!
//! Files are written before the database row that names them, so a failure between the
//! two (a full disk, a crash) leaves a file no row names. A request that fails removes
//! the files it placed unless another request holds them ([`PhotoFiles::pin`]) or a
//! stored row names them; whatever a crash leaves behind, and anything left in `tmp/`,
//! is removed at the next start ([`PhotoFiles::sweep`]).

use std::collections::{HashMap, HashSet};
use std::fs::{self, File};
use std::io::Write as _;
use std::path::{Path, PathBuf};
use std::sync::atomic::{AtomicU64, Ordering};
use std::sync::{Arc, Mutex};

use anyhow::Context as _;
use sha2::{Digest as _, Sha256};

pub use shared_types::limits::MAX_PHOTOS_PER_RECORD;

/// The largest photo accepted, in bytes. Phone photos are 2–12 MB (common practice).
pub const MAX_PHOTO_BYTES: usize = 25 * 1024 * 1024;

/// Image formats accepted, recognised by their first bytes rather than by name.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum PhotoFormat {
    Jpeg,
    Png,
}

impl PhotoFormat {
    /// Recognises the format from the file's magic bytes.
    pub fn sniff(bytes: &[u8]) -> Option<Self> {
        if bytes.starts_with(&[0xFF, 0xD8, 0xFF]) {
            Some(Self::Jpeg)
        } else if bytes.starts_with(&[0x89, b'P', b'N', b'G', 0x0D, 0x0A, 0x1A, 0x0A]) {
            Some(Self::Png)
        } else {
            None
        }
    }

    pub fn media_type(self) -> &'static str {
        match self {
            Self::Jpeg => "image/jpeg",
            Self::Png => "image/png",
        }
    }
}

/// SHA-256 of the bytes, lower-case hex.
pub fn sha256_hex(bytes: &[u8]) -> String {
    hex::encode(Sha256::digest(bytes))
}

/// The copies kept of each photo: the original as received (reviewers only) and the
/// two derivatives made from it (see `intake::images`), stored beside it.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Rendition {
    Original,
    Display,
    Thumb,
}

impl Rendition {
    fn suffix(self) -> &'static str {
        match self {
            Self::Original => "",
            Self::Display => ".display.jpg",
            Self::Thumb => ".thumb.jpg",
        }
    }
}

/// The folder photos live in.
#[derive(Debug, Clone)]
pub struct PhotoFiles {
    root: PathBuf,
    /// Photos a request is placing or linking right now, by hash, with how many hold
    /// each: such a file is never removed as unused.
    pins: Arc<Mutex<HashMap<String, usize>>>,
}

/// What the start-up sweep removed.
#[derive(Debug, Default, Clone, Copy, PartialEq, Eq)]
pub struct Swept {
    /// Leftover temporary files (uploads and writes a crash interrupted).
    pub temporary: usize,
    /// Photo files no stored photo names.
    pub unreferenced: usize,
}

impl PhotoFiles {
    pub fn open(root: &Path) -> anyhow::Result<Self> {
        fs::create_dir_all(root.join("tmp"))
            .with_context(|| format!("creating the photo folder {}", root.display()))?;
        Ok(Self { root: root.to_owned(), pins: Arc::default() })
    }

    /// The photo folder at `root` as it is, creating nothing: for reading a data folder
    /// or a backup (`wrackline check`, `backup`).
    pub fn at(root: &Path) -> Self {
        Self { root: root.to_owned(), pins: Arc::default() }
    }

    /// The photo folder.
    pub fn root(&self) -> &Path {
        &self.root
    }

    /// The folder for files being written or received.
    pub fn scratch(&self) -> PathBuf {
        self.root.join("tmp")
    }

    /// Bytes free for the server on the photo folder's file system.
    pub fn free_bytes(&self) -> std::io::Result<u64> {
        let stats = rustix::fs::statvfs(&self.root).map_err(std::io::Error::from)?;
        Ok(stats.f_bavail.saturating_mul(stats.f_frsize))
    }

    /// Whether the photo folder's file system is mounted read-only.
    pub fn read_only(&self) -> std::io::Result<bool> {
        let stats = rustix::fs::statvfs(&self.root).map_err(std::io::Error::from)?;
        Ok(stats.f_flag.contains(rustix::fs::StatVfsMountFlags::RDONLY))
    }

    /// Holds the photo with this hash for as long as the pin lives: it is not removed as
    /// unused meanwhile.
    pub fn pin(&self, sha256: &str) -> PhotoPin {
        *self.pins.lock().unwrap_or_else(|p| p.into_inner()).entry(sha256.to_owned()).or_default() += 1;
        PhotoPin { pins: self.pins.clone(), sha256: sha256.to_owned() }
    }

    /// Removes every rendition of a photo that the caller placed for a request that then
    /// failed, unless another request holds it or `named` says a stored row names it.
    /// The caller holds one pin of its own. Returns whether the files were removed.
    pub fn discard_if_unused(
        &self,
        sha256: &str,
        named: impl FnOnce(&str) -> anyhow::Result<bool>,
    ) -> anyhow::Result<bool> {
        // The lock is held across the check and the removal, so no other request can
        // take a pin (and find the file present) in between.
        let pins = self.pins.lock().unwrap_or_else(|p| p.into_inner());
        if pins.get(sha256).copied().unwrap_or(0) > 1 || named(sha256)? {
            return Ok(false);
        }
        for rendition in [Rendition::Original, Rendition::Display, Rendition::Thumb] {
            if let Some(path) = self.path_of(sha256, rendition) {
                match fs::remove_file(&path) {
                    Ok(()) => {}
                    Err(err) if err.kind() == std::io::ErrorKind::NotFound => {}
                    Err(err) => return Err(err).with_context(|| format!("removing {}", path.display())),
                }
            }
        }
        Ok(true)
    }

    /// At start-up, before any request: removes every file in `tmp/` and every photo
    /// file whose hash is not among those `known` lists for its folder (the two hex
    /// digits the folder is named by).
    pub fn sweep(&self, mut known: impl FnMut(&str) -> anyhow::Result<HashSet<String>>) -> anyhow::Result<Swept> {
        let mut swept = Swept::default();
        for entry in fs::read_dir(self.scratch()).context("listing the photo folder's tmp/")? {
            let path = entry?.path();
            let removed = if path.is_dir() { fs::remove_dir_all(&path) } else { fs::remove_file(&path) };
            removed.with_context(|| format!("removing {}", path.display()))?;
            swept.temporary += 1;
        }
        for folder in fs::read_dir(&self.root).context("listing the photo folder")? {
            let folder = folder?.path();
            let Some(prefix) = folder.file_name().and_then(|n| n.to_str()).filter(|n| is_fan_out(n)) else {
                continue;
            };
            let named = known(prefix)?;
            for file in fs::read_dir(&folder).with_context(|| format!("listing {}", folder.display()))? {
                let file = file?.path();
                let name = file.file_name().and_then(|n| n.to_str()).unwrap_or_default();
                if !named.contains(name.get(..64).unwrap_or(name)) {
                    fs::remove_file(&file).with_context(|| format!("removing {}", file.display()))?;
                    swept.unreferenced += 1;
                }
            }
        }
        Ok(swept)
    }

    /// Where a rendition of the photo with this hash lives (two-level fan-out keeps folders
    /// small); `None` unless the hash is 64 lower-case hex digits.
    pub fn path_of(&self, sha256: &str, rendition: Rendition) -> Option<PathBuf> {
        let valid = sha256.len() == 64 && sha256.bytes().all(|b| b.is_ascii_hexdigit() && !b.is_ascii_uppercase());
        valid.then(|| self.root.join(&sha256[..2]).join(format!("{sha256}{}", rendition.suffix())))
    }

    /// Moves a received upload into place as the original of its photo, durably, unless
    /// that file exists already (then the upload is dropped). Returns whether it placed it.
    pub fn place(&self, received: super::received::ReceivedPhoto) -> anyhow::Result<bool> {
        let target = self.path_of(received.sha256(), Rendition::Original).context("photo hash is not valid")?;
        if target.exists() {
            return Ok(false);
        }
        let folder = target.parent().context("photo path has no folder")?;
        fs::create_dir_all(folder)?;
        received.persist(&target)?;
        File::open(folder)?.sync_all()?;
        Ok(true)
    }

    /// Writes the bytes durably as this rendition of the photo, unless that file exists already.
    pub fn put(&self, sha256: &str, rendition: Rendition, bytes: &[u8]) -> anyhow::Result<()> {
        let target = self.path_of(sha256, rendition).context("photo hash is not 64 lower-case hex digits")?;
        if target.exists() {
            return Ok(());
        }
        let folder = target.parent().context("photo path has no folder")?;
        fs::create_dir_all(folder)?;
        // A unique temporary name, so two uploads of the same photo never share one.
        static NEXT: AtomicU64 = AtomicU64::new(0);
        let unique = NEXT.fetch_add(1, Ordering::Relaxed);
        let temp =
            self.root.join("tmp").join(format!("{sha256}{}.{}.{unique}", rendition.suffix(), std::process::id()));
        let mut file = File::create(&temp).with_context(|| format!("creating {}", temp.display()))?;
        file.write_all(bytes)?;
        file.sync_all()?;
        if let Err(err) = fs::rename(&temp, &target) {
            let _ = fs::remove_file(&temp);
            return Err(err).with_context(|| format!("moving photo into {}", target.display()));
        }
        File::open(folder)?.sync_all()?;
        Ok(())
    }
}

/// A photo held by a request (see [`PhotoFiles::pin`]); let go when dropped.
#[derive(Debug)]
pub struct PhotoPin {
    pins: Arc<Mutex<HashMap<String, usize>>>,
    sha256: String,
}

impl PhotoPin {
    pub fn sha256(&self) -> &str {
        &self.sha256
    }
}

impl Drop for PhotoPin {
    fn drop(&mut self) {
        let mut pins = self.pins.lock().unwrap_or_else(|p| p.into_inner());
        if let Some(count) = pins.get_mut(&self.sha256) {
            *count -= 1;
            if *count == 0 {
                pins.remove(&self.sha256);
            }
        }
    }
}

/// Whether a folder name is one of the 256 two-hex-digit folders photos fan out into.
fn is_fan_out(name: &str) -> bool {
    name.len() == 2 && name.bytes().all(|b| b.is_ascii_hexdigit() && !b.is_ascii_uppercase())
}
