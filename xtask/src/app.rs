//! Builds the app into `target/app-dist` as two bundles from one crate — the phone's at
//! the root, the desk's (the `desk` feature) in `desk/` — each: the wasm (cargo), its JS
//! bindings (wasm-bindgen as a library, so no CLI has to be installed), the wasm
//! optimised for size (release builds); then the static files, the service worker with a
//! cache version made from the hash of every file it keeps (the phone's only), and
//! brotli and gzip copies of each text and wasm file for the server to send to browsers
//! that accept them ([`crate::shrink`]).

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

/// One wasm bundle of the app: the crate built with `features`, its files named
/// `out_name` and placed in `folder` below the site's root.
struct Bundle {
    label: &'static str,
    out_name: &'static str,
    features: Option<&'static str>,
    folder: &'static str,
}

/// The phone's bundle at the root (recording, kept by the service worker for flight
/// mode) and the desk's below `/desk/` (review, live animals, samples, people, figures,
/// downloads), which a walker's phone never downloads.
const BUNDLES: [Bundle; 2] = [
    Bundle { label: "phone", out_name: "wrackline_app", features: None, folder: "" },
    Bundle { label: "desk", out_name: "wrackline_desk", features: Some("desk"), folder: DESK_FOLDER },
];

/// The desk's folder below the site's root; the service worker keeps nothing in it.
const DESK_FOLDER: &str = "desk";

/// Builds the app and returns the folder it is in.
pub fn build(profile: Profile) -> Result<PathBuf> {
    prerequisites::wasm_target()?;
    check_bindgen_version()?;
    if profile == Profile::Release
        && let Err(err) = prerequisites::npm_packages()
    {
        eprintln!("xtask: warning: {err:#}");
    }
    let dist = root().join("target/app-dist");
    if dist.exists() {
        fs::remove_dir_all(&dist).with_context(|| format!("clearing {}", dist.display()))?;
    }
    fs::create_dir_all(&dist)?;
    for bundle in &BUNDLES {
        build_bundle(bundle, profile, &dist.join(bundle.folder))?;
    }
    copy_static(&root().join("app/static"), &dist)?;
    write_service_worker(&dist)?;
    let mut files = Vec::new();
    site_files(&dist, &dist, &mut files)?;
    let sizes = shrink::precompress(&files.into_iter().map(|(_, path)| path).collect::<Vec<_>>())?;
    report_size(&dist, &sizes);
    Ok(dist)
}

/// Builds one bundle's wasm and its bindings into `out`.
fn build_bundle(bundle: &Bundle, profile: Profile, out: &Path) -> Result<()> {
    let (cargo_profile, folder) = match profile {
        Profile::Dev => ("dev", "debug"),
        Profile::Release => ("wasm-release", "wasm-release"),
    };
    let mut args =
        vec!["build", "-p", "wrackline-app", "--target", "wasm32-unknown-unknown", "--profile", cargo_profile];
    if let Some(features) = bundle.features {
        args.extend(["--features", features]);
    }
    run::cargo(&args)?;
    let wasm = root().join("target/wasm32-unknown-unknown").join(folder).join("wrackline_app.wasm");
    fs::create_dir_all(out)?;
    wasm_bindgen_cli_support::Bindgen::new()
        .input_path(&wasm)
        .web(true)?
        .out_name(bundle.out_name)
        .typescript(false)
        .generate(out)
        .with_context(|| format!("generating the {} bundle's wasm bindings", bundle.label))?;
    if profile == Profile::Release {
        let (before, after) = shrink::optimise_wasm(&out.join(format!("{}_bg.wasm", bundle.out_name)))?;
        eprintln!("xtask: {} wasm {:.0} KB built, {:.0} KB after wasm-opt", bundle.label, kb(before), kb(after));
    }
    Ok(())
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

/// Copies the static files (folders too), all but the service-worker template.
fn copy_static(from: &Path, to: &Path) -> Result<()> {
    for entry in fs::read_dir(from).with_context(|| format!("reading {}", from.display()))? {
        let entry = entry?;
        let target = to.join(entry.file_name());
        if entry.file_type()?.is_dir() {
            fs::create_dir_all(&target)?;
            copy_static(&entry.path(), &target)?;
        } else if entry.file_name() != "sw.js" {
            fs::copy(entry.path(), &target).with_context(|| format!("copying {}", entry.path().display()))?;
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

/// The service worker, keeping the phone's files (not the desk's) for flight mode.
fn write_service_worker(dist: &Path) -> Result<()> {
    let mut files = Vec::new();
    site_files(dist, dist, &mut files)?;
    files.retain(|(site_path, _)| !in_desk(site_path));
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

/// Whether a site path ("/desk/…") belongs to the desk's bundle.
fn in_desk(site_path: &str) -> bool {
    site_path.strip_prefix('/').and_then(|p| p.strip_prefix(DESK_FOLDER)).is_some_and(|rest| rest.starts_with('/'))
}

/// Prints what a phone downloads for the app code (wasm + JS) and for every file the
/// service worker keeps, raw and as sent with brotli and gzip, then the desk's code.
fn report_size(dist: &Path, sizes: &[(PathBuf, Sizes)]) {
    let sum = |files: &mut dyn Iterator<Item = &Sizes>| {
        files.fold(Sizes::default(), |a, s| Sizes {
            raw: a.raw + s.raw,
            gzip: a.gzip + s.gzip,
            brotli: a.brotli + s.brotli,
        })
    };
    let desk = |p: &Path| p.strip_prefix(dist).is_ok_and(|rel| rel.starts_with(DESK_FOLDER));
    let is_code = |p: &Path| p.extension().is_some_and(|e| e == "wasm" || e == "js");
    let phone_code = sum(&mut sizes.iter().filter(|(p, _)| is_code(p) && !desk(p)).map(|(_, s)| s));
    let phone_all = sum(&mut sizes.iter().filter(|(p, _)| !desk(p)).map(|(_, s)| s));
    let desk_code = sum(&mut sizes.iter().filter(|(p, _)| is_code(p) && desk(p)).map(|(_, s)| s));
    eprintln!(
        "xtask: phone app code (wasm + js) {:.0} KB raw, {:.0} KB gzip, {:.0} KB brotli; all its compressible files {:.0} KB raw, {:.0} KB brotli",
        kb(phone_code.raw),
        kb(phone_code.gzip),
        kb(phone_code.brotli),
        kb(phone_all.raw),
        kb(phone_all.brotli)
    );
    eprintln!(
        "xtask: desk app code (wasm + js, /{DESK_FOLDER}/, never on the phone) {:.0} KB raw, {:.0} KB gzip, {:.0} KB brotli",
        kb(desk_code.raw),
        kb(desk_code.gzip),
        kb(desk_code.brotli)
    );
}

#[cfg(test)]
mod tests {
    use super::in_desk;

    #[test]
    fn only_the_desk_folder_is_the_desk() {
        assert!(in_desk("/desk/index.html") && in_desk("/desk/wrackline_desk_bg.wasm"));
        assert!(!in_desk("/index.html") && !in_desk("/desktop.css") && !in_desk("/desk"));
    }
}
