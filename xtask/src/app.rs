//! Builds the app into `target/app-dist`: the wasm (cargo), its JS bindings
//! (wasm-bindgen as a library, so no CLI has to be installed), the wasm optimised for
//! size (release builds), the static files, the service worker with a cache version made
//! from the hash of every file it keeps, and brotli and gzip copies of each text and wasm
//! file for the server to send to browsers that accept them ([`crate::shrink`]).

use std::fs;
use std::path::{Path, PathBuf};

use anyhow::{Context as _, Result, bail};
use sha2::{Digest as _, Sha256};

use crate::shrink::{self, Sizes};
use crate::{prerequisites, root, run};

/// The wasm-bindgen version this xtask's bindings step is built from; it must equal
/// the `wasm-bindgen` the app links (one version per lockfile, see Cargo.lock).
const BINDGEN_VERSION: &str = "0.2.130";

#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Profile {
    Dev,
    Release,
}

/// Builds the app and returns the folder it is in.
pub fn build(profile: Profile) -> Result<PathBuf> {
    prerequisites::wasm_target()?;
    check_bindgen_version()?;
    if profile == Profile::Release
        && let Err(err) = prerequisites::npm_packages()
    {
        eprintln!("xtask: warning: {err:#}");
    }
    let (cargo_profile, folder) = match profile {
        Profile::Dev => ("dev", "debug"),
        Profile::Release => ("wasm-release", "wasm-release"),
    };
    run::cargo(&["build", "-p", "wrackline-app", "--target", "wasm32-unknown-unknown", "--profile", cargo_profile])?;
    let wasm = root().join("target/wasm32-unknown-unknown").join(folder).join("wrackline_app.wasm");
    let dist = root().join("target/app-dist");
    if dist.exists() {
        fs::remove_dir_all(&dist).with_context(|| format!("clearing {}", dist.display()))?;
    }
    fs::create_dir_all(&dist)?;
    wasm_bindgen_cli_support::Bindgen::new()
        .input_path(&wasm)
        .web(true)?
        .out_name("wrackline_app")
        .typescript(false)
        .generate(&dist)
        .context("generating the wasm bindings")?;
    if profile == Profile::Release {
        let (before, after) = shrink::optimise_wasm(&dist.join("wrackline_app_bg.wasm"))?;
        eprintln!("xtask: wasm {:.0} KB built, {:.0} KB after wasm-opt", kb(before), kb(after));
    }
    copy_static(&root().join("app/static"), &dist)?;
    write_service_worker(&dist)?;
    let mut files = Vec::new();
    site_files(&dist, &dist, &mut files)?;
    let sizes = shrink::precompress(&files.into_iter().map(|(_, path)| path).collect::<Vec<_>>())?;
    report_size(&sizes);
    Ok(dist)
}

/// Builds the wasm benchmark crate (`tests/upload-copy-bench`) with its bindings into
/// `target/bench-wasm`, for `tests/browser/bench_prepare.mjs`.
pub fn build_bench_wasm() -> Result<PathBuf> {
    prerequisites::wasm_target()?;
    check_bindgen_version()?;
    run::cargo(&[
        "build",
        "-p",
        "upload-copy-bench",
        "--target",
        "wasm32-unknown-unknown",
        "--profile",
        "wasm-release",
    ])?;
    let wasm = root().join("target/wasm32-unknown-unknown/wasm-release/upload_copy_bench.wasm");
    let out = root().join("target/bench-wasm");
    fs::create_dir_all(&out)?;
    wasm_bindgen_cli_support::Bindgen::new()
        .input_path(&wasm)
        .web(true)?
        .out_name("upload_copy_bench")
        .typescript(false)
        .generate(&out)
        .context("generating the benchmark's wasm bindings")?;
    Ok(out)
}

fn check_bindgen_version() -> Result<()> {
    let lock = fs::read_to_string(root().join("Cargo.lock")).context("reading Cargo.lock")?;
    let locked = lock
        .split("[[package]]")
        .find(|block| block.contains("name = \"wasm-bindgen\"\n"))
        .and_then(|block| block.lines().find_map(|l| l.strip_prefix("version = \"")))
        .map(|v| v.trim_end_matches('"').to_owned());
    match locked {
        Some(version) if version == BINDGEN_VERSION => Ok(()),
        Some(version) => bail!(
            "Cargo.lock has wasm-bindgen {version} but xtask's bindings step is {BINDGEN_VERSION}; pin both to the same version (app/Cargo.toml and xtask/Cargo.toml)"
        ),
        None => Ok(()), // not locked yet: cargo will lock the app's `=` pin.
    }
}

/// Copies the static files, all but the service-worker template.
fn copy_static(from: &Path, to: &Path) -> Result<()> {
    for entry in fs::read_dir(from).with_context(|| format!("reading {}", from.display()))? {
        let entry = entry?;
        if entry.file_name() != "sw.js" {
            fs::copy(entry.path(), to.join(entry.file_name()))
                .with_context(|| format!("copying {}", entry.path().display()))?;
        }
    }
    Ok(())
}

/// Every file below `dir`, as sorted site paths ("/style.css").
fn site_files(dir: &Path, base: &Path, out: &mut Vec<(String, PathBuf)>) -> Result<()> {
    for entry in fs::read_dir(dir)? {
        let path = entry?.path();
        if path.is_dir() {
            site_files(&path, base, out)?;
        } else {
            let relative = path.strip_prefix(base)?.to_string_lossy().replace('\\', "/");
            out.push((format!("/{relative}"), path));
        }
    }
    out.sort();
    Ok(())
}

fn write_service_worker(dist: &Path) -> Result<()> {
    let mut files = Vec::new();
    site_files(dist, dist, &mut files)?;
    let mut hasher = Sha256::new();
    for (site_path, path) in &files {
        hasher.update(site_path.as_bytes());
        hasher.update(fs::read(path)?);
    }
    let version = &hex::encode(hasher.finalize())[..16];
    let list: Vec<String> = files.iter().map(|(site_path, _)| format!("'{site_path}'")).collect();
    let template = fs::read_to_string(root().join("app/static/sw.js"))?;
    let worker = template
        .replace("__CACHE_VERSION__", version)
        .replace("__SHELL_FILES__", &format!("[\n  {},\n]", list.join(",\n  ")));
    fs::write(dist.join("sw.js"), worker)?;
    eprintln!("xtask: service worker caches {} files as version {version}", files.len());
    Ok(())
}

fn kb(bytes: u64) -> f64 {
    bytes as f64 / 1024.0
}

/// Prints what a phone downloads for the app code (wasm + JS) and for every file the
/// service worker keeps, raw and as sent with brotli and gzip.
fn report_size(sizes: &[(PathBuf, Sizes)]) {
    let sum = |files: &mut dyn Iterator<Item = &Sizes>| {
        files.fold(Sizes::default(), |a, s| Sizes {
            raw: a.raw + s.raw,
            gzip: a.gzip + s.gzip,
            brotli: a.brotli + s.brotli,
        })
    };
    let is_code = |p: &Path| p.extension().is_some_and(|e| e == "wasm" || e == "js");
    let code = sum(&mut sizes.iter().filter(|(p, _)| is_code(p)).map(|(_, s)| s));
    let all = sum(&mut sizes.iter().map(|(_, s)| s));
    eprintln!(
        "xtask: app code (wasm + js) {:.0} KB raw, {:.0} KB gzip, {:.0} KB brotli; all compressible files {:.0} KB raw, {:.0} KB brotli",
        kb(code.raw),
        kb(code.gzip),
        kb(code.brotli),
        kb(all.raw),
        kb(all.brotli)
    );
}
