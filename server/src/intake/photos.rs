//! Photo files on disk, stored once by content: the file name is the SHA-256 of the
//! bytes, so the same photo sent twice (or attached to two records) is one file.
//!
//! Each photo has its original and two derivatives (a `Rendition`). A file is written to a temporary name, synced, then renamed into place and the
//! folder synced, so a photo the server has acknowledged survives a power cut.

use std::fs::{self, File};
use std::io::Write as _;
use std::path::{Path, PathBuf};
use std::sync::atomic::{AtomicU64, Ordering};

use anyhow::Context as _;
use sha2::{Digest as _, Sha256};

/// The largest photo accepted, in bytes. Phone photos are 2–12 MB (common practice).
pub const MAX_PHOTO_BYTES: usize = 25 * 1024 * 1024;
/// The most photos one record may carry.
pub const MAX_PHOTOS_PER_RECORD: usize = 12;

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
}

impl PhotoFiles {
    pub fn open(root: &Path) -> anyhow::Result<Self> {
        fs::create_dir_all(root.join("tmp"))
            .with_context(|| format!("creating the photo folder {}", root.display()))?;
        Ok(Self { root: root.to_owned() })
    }

    /// Where a rendition of the photo with this hash lives (two-level fan-out keeps folders
    /// small); `None` unless the hash is 64 lower-case hex digits.
    pub fn path_of(&self, sha256: &str, rendition: Rendition) -> Option<PathBuf> {
        let valid = sha256.len() == 64 && sha256.bytes().all(|b| b.is_ascii_hexdigit() && !b.is_ascii_uppercase());
        valid.then(|| self.root.join(&sha256[..2]).join(format!("{sha256}{}", rendition.suffix())))
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
