//! A photo as it arrives: written to a scratch file in the photo folder's `tmp/` while
//! its bytes come in, and hashed on the way, so an upload is never held whole in memory
//! and a photo over the size limit is refused as soon as it passes it. The scratch file
//! is removed when the photo is dropped, unless it was moved into place.

use std::path::Path;

use sha2::{Digest as _, Sha256};
use tempfile::TempPath;
use tokio::io::AsyncWriteExt as _;

use super::photos::{MAX_PHOTO_BYTES, PhotoFiles};

/// The first bytes kept in memory, for recognising the format without reading the file.
const HEAD_BYTES: usize = 16;

/// Why a photo could not be received.
#[derive(Debug, thiserror::Error)]
pub enum ReceiveError {
    #[error("it is larger than the limit of {mib} MiB ({MAX_PHOTO_BYTES} bytes) for one photo", mib = MAX_PHOTO_BYTES >> 20)]
    TooManyBytes,
    #[error("writing it to the server's disk failed: {0}")]
    Disk(#[from] std::io::Error),
}

/// A photo being received.
pub struct Receiving {
    file: tokio::fs::File,
    path: TempPath,
    hasher: Sha256,
    len: usize,
    head: Vec<u8>,
}

impl Receiving {
    /// Opens a scratch file for one photo.
    pub fn start(files: &PhotoFiles) -> std::io::Result<Self> {
        let (file, path) = tempfile::Builder::new().prefix("upload-").tempfile_in(files.scratch())?.into_parts();
        Ok(Self { file: tokio::fs::File::from_std(file), path, hasher: Sha256::new(), len: 0, head: Vec::new() })
    }

    /// Adds the next bytes; refuses the photo once it is over [`MAX_PHOTO_BYTES`].
    pub async fn write(&mut self, chunk: &[u8]) -> Result<(), ReceiveError> {
        self.len += chunk.len();
        if self.len > MAX_PHOTO_BYTES {
            return Err(ReceiveError::TooManyBytes);
        }
        if self.head.len() < HEAD_BYTES {
            self.head.extend(chunk.iter().take(HEAD_BYTES - self.head.len()));
        }
        self.hasher.update(chunk);
        self.file.write_all(chunk).await?;
        Ok(())
    }

    /// The whole photo has arrived.
    pub async fn finish(mut self) -> std::io::Result<ReceivedPhoto> {
        self.file.flush().await?;
        Ok(ReceivedPhoto {
            path: self.path,
            sha256: hex::encode(self.hasher.finalize()),
            byte_len: self.len,
            head: self.head,
        })
    }
}

/// A photo received in full into a scratch file, with its hash.
#[derive(Debug)]
pub struct ReceivedPhoto {
    path: TempPath,
    sha256: String,
    byte_len: usize,
    head: Vec<u8>,
}

impl ReceivedPhoto {
    /// A photo received from bytes already in memory (the demo loader, tests).
    pub fn from_bytes(files: &PhotoFiles, bytes: &[u8]) -> std::io::Result<Self> {
        let (mut file, path) = tempfile::Builder::new().prefix("upload-").tempfile_in(files.scratch())?.into_parts();
        std::io::Write::write_all(&mut file, bytes)?;
        Ok(Self {
            path,
            sha256: super::photos::sha256_hex(bytes),
            byte_len: bytes.len(),
            head: bytes.iter().take(HEAD_BYTES).copied().collect(),
        })
    }

    /// SHA-256 of the bytes, lower-case hex.
    pub fn sha256(&self) -> &str {
        &self.sha256
    }

    pub fn byte_len(&self) -> usize {
        self.byte_len
    }

    /// The first bytes, enough to recognise the format.
    pub fn head(&self) -> &[u8] {
        &self.head
    }

    /// Reads the whole photo (for decoding, inside the decode gate).
    pub fn read(&self) -> std::io::Result<Vec<u8>> {
        std::fs::read(&self.path)
    }

    /// Makes the bytes durable and moves the file to `target`.
    pub(super) fn persist(self, target: &Path) -> std::io::Result<()> {
        std::fs::File::open(&self.path)?.sync_all()?;
        self.path.persist(target).map_err(|err| err.error)
    }
}
