//! What the tests need beyond the Rust toolchain, installed when missing: the wasm
//! target (rustup), Chromium and exiftool (Debian packages, when running as root), the
//! npm packages (playwright-core for the browser tests, binaryen's wasm-opt for the
//! release build), and a Python virtualenv with the reference readers. When something
//! cannot be installed here, the error says what is missing and the command that
//! installs it.

use std::path::Path;
use std::process::Command;

use anyhow::{Context as _, Result, bail};

use crate::{root, run};

pub fn all() -> Result<()> {
    wasm_target()?;
    rust_components()?;
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
    run::check(command)
        .context("the wasm32 target is missing; install it with `rustup target add wasm32-unknown-unknown`")
}

/// rustfmt and clippy, which the test command runs before any test.
fn rust_components() -> Result<()> {
    for (component, probe) in [("rustfmt", ["fmt", "--version"]), ("clippy", ["clippy", "--version"])] {
        let present = Command::new("cargo").args(probe).output().map(|o| o.status.success()).unwrap_or(false);
        if !present {
            let mut command = Command::new("rustup");
            command.args(["component", "add", component]);
            run::check(command).with_context(|| {
                format!("{component} is missing; install it with `rustup component add {component}`")
            })?;
        }
    }
    Ok(())
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
    let wanted = [
        ("chromium", "chromium"),
        ("exiftool", "libimage-exiftool-perl"),
        ("node", "nodejs"),
        ("npm", "npm"),
        ("python3", "python3"),
    ];
    let missing: Vec<&str> =
        wanted.iter().filter(|(program, _)| !on_path(program)).map(|(_, package)| *package).collect();
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

/// playwright-core (no browser download: it drives Debian's Chromium) and binaryen
/// (`wasm-opt`, for the release build), from `tests/browser/package-lock.json`.
pub fn npm_packages() -> Result<()> {
    let folder = root().join("tests/browser");
    let installed =
        ["playwright-core", "binaryen"].iter().all(|p| Path::new(&folder.join("node_modules").join(p)).exists());
    if installed {
        return Ok(());
    }
    let mut command = Command::new("npm");
    command.args(["ci", "--no-audit", "--no-fund", "--prefix"]).arg(&folder);
    run::check(command).context("installing the browser-test packages; try: npm ci --prefix tests/browser")
}

/// The Python packages the export tests read archives and GeoJSON back with, the range
/// benchmark compares EOO and AOO against (pyproj + shapely), and the notification tests
/// receive email with (aiosmtpd, a local SMTP server).
const PYTHON_PACKAGES: &[&str] = &["python-dwca-reader==0.17.1", "shapely==2.2.0", "pyproj==3.7.2", "aiosmtpd==1.4.6"];

/// A virtualenv in `target/venv` with the reference Python packages; returns its Python,
/// which `test` and `bench` pass on as `WRACKLINE_PYTHON`.
pub fn python_venv() -> Result<std::path::PathBuf> {
    let venv = root().join("target/venv");
    let python = venv.join("bin/python");
    let marker = venv.join("wrackline-packages.txt");
    let wanted = PYTHON_PACKAGES.join("\n");
    if std::fs::read_to_string(&marker).is_ok_and(|have| have == wanted) {
        return Ok(python);
    }
    if !python.exists() {
        make_venv(&venv)?;
    }
    let mut pip = Command::new(&python);
    pip.args(["-m", "pip", "install", "--quiet", "--disable-pip-version-check"]).args(PYTHON_PACKAGES);
    run::check(pip).with_context(|| format!("installing {} into {}", PYTHON_PACKAGES.join(" "), venv.display()))?;
    std::fs::write(&marker, wanted)?;
    Ok(python)
}

fn make_venv(venv: &Path) -> Result<()> {
    let attempt = || {
        let mut command = Command::new("python3");
        command.args(["-m", "venv"]).arg(venv);
        run::check(command)
    };
    if attempt().is_ok() {
        return Ok(());
    }
    if !is_root() {
        bail!(
            "could not make a Python virtualenv at {}; install python3 and python3-venv (sudo apt-get install -y python3 python3-venv)",
            venv.display()
        );
    }
    let mut command = Command::new("apt-get");
    command
        .args(["install", "-y", "--no-install-recommends", "python3", "python3-venv"])
        .env("DEBIAN_FRONTEND", "noninteractive");
    run::check(command).context("installing python3-venv; try: apt-get install -y python3 python3-venv")?;
    let _ = std::fs::remove_dir_all(venv);
    attempt().context("making the Python virtualenv after installing python3-venv")
}
