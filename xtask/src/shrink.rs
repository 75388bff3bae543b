//! Making the first load small: the wasm optimised for size with `wasm-opt` (binaryen
//! from npm: Debian's binaryen 108 writes wasm that Chromium rejects), and every text and
//! wasm file of the built app written beside itself as `.br` (brotli) and `.gz` (gzip),
//! so the server sends the smaller copy a browser accepts without compressing on each
//! request. A phone on a slow link downloads about a quarter of the raw bytes.

use std::fs;
use std::io::Write as _;
use std::path::{Path, PathBuf};
use std::process::Command;

use anyhow::{Context as _, Result};

use crate::root;

/// Files worth compressing: text and wasm. Pictures (PNG) are compressed already.
const COMPRESSIBLE: &[&str] = &["html", "js", "css", "wasm", "svg", "webmanifest", "json"];

/// Brotli's best quality and its largest usual window (RFC 7932 allows 10 to 24 bits).
const BROTLI_QUALITY: u32 = 11;
const BROTLI_WINDOW_BITS: u32 = 22;

/// The wasm features Rust's wasm32 target emits by default and Chromium runs; wasm-opt
/// must be told, or it refuses the module (the bindings carry no feature section).
const WASM_FEATURES: &[&str] = &[
    "--enable-bulk-memory",
    "--enable-nontrapping-float-to-int",
    "--enable-sign-ext",
    "--enable-mutable-globals",
    "--enable-reference-types",
    "--enable-multivalue",
];

/// The npm binaryen's `wasm-opt` (installed with the browser-test packages), if present.
fn wasm_opt() -> Option<PathBuf> {
    let path = root().join("tests/browser/node_modules/binaryen/bin/wasm-opt");
    path.is_file().then_some(path)
}

/// Optimises `wasm` in place for size (`-Oz`); without binaryen the wasm stays as built
/// and a warning says how to get it. Returns the bytes before and after.
pub fn optimise_wasm(wasm: &Path) -> Result<(u64, u64)> {
    let before = fs::metadata(wasm).with_context(|| format!("reading {}", wasm.display()))?.len();
    let Some(tool) = wasm_opt() else {
        eprintln!(
            "xtask: warning: wasm-opt not found (npm binaryen in tests/browser); the app's wasm is not size-optimised. \
             Install it with: npm ci --prefix tests/browser"
        );
        return Ok((before, before));
    };
    let optimised = wasm.with_extension("opt.wasm");
    let mut command = Command::new("node");
    command.arg(&tool).arg(wasm).arg("-Oz").args(WASM_FEATURES).arg("-o").arg(&optimised);
    eprintln!("xtask: running wasm-opt -Oz on {}", wasm.display());
    let status = command.status().context("could not start node to run wasm-opt")?;
    anyhow::ensure!(status.success(), "wasm-opt failed ({status}) on {}", wasm.display());
    fs::rename(&optimised, wasm)?;
    let after = fs::metadata(wasm)?.len();
    Ok((before, after))
}

fn compressible(path: &Path) -> bool {
    path.extension().and_then(|e| e.to_str()).is_some_and(|ext| COMPRESSIBLE.contains(&ext))
}

/// Brotli at [`BROTLI_QUALITY`].
pub fn brotli(bytes: &[u8]) -> Result<Vec<u8>> {
    let mut out = Vec::new();
    {
        let mut writer = brotli::CompressorWriter::new(&mut out, 64 * 1024, BROTLI_QUALITY, BROTLI_WINDOW_BITS);
        writer.write_all(bytes)?;
    }
    Ok(out)
}

/// Gzip at its best level (9).
pub fn gzip(bytes: &[u8]) -> Result<Vec<u8>> {
    let mut encoder = flate2::write::GzEncoder::new(Vec::new(), flate2::Compression::best());
    encoder.write_all(bytes)?;
    Ok(encoder.finish()?)
}

/// Sizes of one file as sent: raw, gzip and brotli.
#[derive(Debug, Clone, Copy, Default)]
pub struct Sizes {
    pub raw: u64,
    pub gzip: u64,
    pub brotli: u64,
}

/// Writes `NAME.br` and `NAME.gz` beside every compressible file in `files` (a copy only
/// when it is smaller than the file); the sizes of each.
pub fn precompress(files: &[PathBuf]) -> Result<Vec<(PathBuf, Sizes)>> {
    let mut sizes = Vec::new();
    for path in files.iter().filter(|p| compressible(p)) {
        let bytes = fs::read(path).with_context(|| format!("reading {}", path.display()))?;
        let raw = bytes.len() as u64;
        let mut these = Sizes { raw, gzip: raw, brotli: raw };
        for (suffix, packed) in [("br", brotli(&bytes)?), ("gz", gzip(&bytes)?)] {
            if (packed.len() as u64) < raw {
                let target = PathBuf::from(format!("{}.{suffix}", path.display()));
                fs::write(&target, &packed).with_context(|| format!("writing {}", target.display()))?;
                match suffix {
                    "br" => these.brotli = packed.len() as u64,
                    _ => these.gzip = packed.len() as u64,
                }
            }
        }
        sizes.push((path.clone(), these));
    }
    Ok(sizes)
}

#[cfg(test)]
mod tests {
    use std::io::Read as _;

    use super::*;

    #[test]
    fn both_copies_decode_to_the_original_bytes() {
        // Decoded by the brotli crate's decompressor and flate2's gzip decoder (RFC 7932,
        // RFC 1952), the copies the server sends must be the file, byte for byte.
        let text = "wrackline ".repeat(2000).into_bytes();
        let mut from_brotli = Vec::new();
        brotli::Decompressor::new(&brotli(&text).unwrap()[..], 4096).read_to_end(&mut from_brotli).unwrap();
        assert_eq!(from_brotli, text);
        let mut from_gzip = Vec::new();
        flate2::read::GzDecoder::new(&gzip(&text).unwrap()[..]).read_to_end(&mut from_gzip).unwrap();
        assert_eq!(from_gzip, text);
    }

    #[test]
    fn copies_are_written_only_for_text_and_wasm_and_only_when_smaller() {
        let dir = tempdir();
        let page = dir.join("index.html");
        let icon = dir.join("icon-192.png");
        let tiny = dir.join("tiny.js");
        fs::write(&page, "<p>wrackline</p>".repeat(500)).unwrap();
        fs::write(&icon, vec![7u8; 4000]).unwrap();
        fs::write(&tiny, "1").unwrap();
        let sizes = precompress(&[page.clone(), icon.clone(), tiny.clone()]).unwrap();
        assert_eq!(sizes.len(), 2, "the PNG is left alone");
        assert!(dir.join("index.html.br").is_file() && dir.join("index.html.gz").is_file());
        assert!(!dir.join("icon-192.png.br").exists());
        assert!(!dir.join("tiny.js.br").exists() && !dir.join("tiny.js.gz").exists(), "no copy larger than the file");
        let (_, page_sizes) = sizes[0];
        assert!(page_sizes.brotli < page_sizes.raw / 10 && page_sizes.gzip < page_sizes.raw / 10, "{page_sizes:?}");
        fs::remove_dir_all(dir).unwrap();
    }

    fn tempdir() -> PathBuf {
        let dir = std::env::temp_dir().join(format!("wrackline-shrink-{}", std::process::id()));
        fs::create_dir_all(&dir).unwrap();
        dir
    }
}
