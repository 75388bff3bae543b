//! What the tests need beyond the Rust toolchain, installed when missing: the wasm
//! target (rustup), Chromium and exiftool (Debian packages, when running as root), and
//! the browser-test npm packages. When something cannot be installed here, the error
//! says what is missing and the command that installs it.

use std::path::Path;
use std::process::Command;

use anyhow::{Context as _, Result, bail};

use crate::{root, run};

pub fn all() -> Result<()> {
    wasm_target()?;
    debian_packages()?;
    npm_packages()
}

/// Adds the wasm32 target unless its standard library is already there.
pub fn wasm_target() -> Result<()> {
    let output = Command::new("rustc")
        .args(["--print", "target-libdir", "--target", "wasm32-unknown-unknown"])
        .output()
        .context("running rustc")?;
    let libdir = String::from_utf8_lossy(&output.stdout).trim().to_owned();
    let present = std::fs::read_dir(&libdir)
        .map(|dir| dir.flatten().any(|e| e.file_name().to_string_lossy().starts_with("libstd-")))
        .unwrap_or(false);
    if present {
        return Ok(());
    }
    let mut command = Command::new("rustup");
    command.args(["target", "add", "wasm32-unknown-unknown"]);
    run::check(command).context("the wasm32 target is missing; install it with `rustup target add wasm32-unknown-unknown`")
}

fn on_path(program: &str) -> bool {
    std::env::var_os("PATH")
        .map(|paths| std::env::split_paths(&paths).any(|dir| dir.join(program).is_file()))
        .unwrap_or(false)
}

fn is_root() -> bool {
    Command::new("id").arg("-u").output().map(|o| o.stdout.starts_with(b"0\n")).unwrap_or(false)
}

/// Chromium for the browser tests, exiftool to write reference EXIF.
fn debian_packages() -> Result<()> {
    let wanted = [("chromium", "chromium"), ("exiftool", "libimage-exiftool-perl"), ("node", "nodejs"), ("npm", "npm")];
    let missing: Vec<&str> = wanted.iter().filter(|(program, _)| !on_path(program)).map(|(_, package)| *package).collect();
    if missing.is_empty() {
        return Ok(());
    }
    let install = format!("apt-get install -y {}", missing.join(" "));
    if !is_root() {
        bail!("missing: {}. Install with: sudo apt-get update && sudo {install}", missing.join(", "));
    }
    let mut update = Command::new("apt-get");
    update.arg("update");
    run::check(update)?;
    let mut command = Command::new("apt-get");
    command.args(["install", "-y", "--no-install-recommends"]).args(&missing).env("DEBIAN_FRONTEND", "noninteractive");
    run::check(command).with_context(|| format!("installing {}; try: {install}", missing.join(", ")))
}

/// playwright-core (no browser download: it drives Debian's Chromium).
fn npm_packages() -> Result<()> {
    let folder = root().join("tests/browser");
    if Path::new(&folder.join("node_modules/playwright-core")).exists() {
        return Ok(());
    }
    let mut command = Command::new("npm");
    command.args(["ci", "--no-audit", "--no-fund", "--prefix"]).arg(&folder);
    run::check(command).context("installing the browser-test packages; try: npm ci --prefix tests/browser")
}
