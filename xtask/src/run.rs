//! Running other programs, with the command shown and a failure that names it.

use std::path::Path;
use std::process::Command;

use anyhow::{Context as _, Result, bail};

use crate::root;

/// Runs a command in the workspace root; an unsuccessful exit is an error.
pub fn check(mut command: Command) -> Result<()> {
    command.current_dir(root());
    let shown = format!("{command:?}");
    eprintln!("xtask: running {shown}");
    let status = command.status().with_context(|| format!("could not start {shown}"))?;
    if !status.success() {
        bail!("{shown} failed ({status})");
    }
    Ok(())
}

pub fn cargo(args: &[&str]) -> Result<()> {
    cargo_with_env(args, &[])
}

/// `cargo` with extra environment variables (e.g. `WRACKLINE_PYTHON` for the tests).
pub fn cargo_with_env(args: &[&str], env: &[(&str, &Path)]) -> Result<()> {
    let mut command = Command::new(std::env::var("CARGO").unwrap_or_else(|_| "cargo".into()));
    command.args(args);
    for (name, value) in env {
        command.env(name, value);
    }
    check(command)
}

/// Runs a command to the end and exits with its status.
pub fn exec(mut command: Command) -> Result<()> {
    command.current_dir(root());
    let status = command.status().with_context(|| format!("could not start {command:?}"))?;
    std::process::exit(status.code().unwrap_or(1));
}

/// The browser test files, run in this order.
const BROWSER_TESTS: &[&str] = &["offline_capture.test.mjs", "photos.test.mjs", "species_key.test.mjs", "walks.test.mjs", "review_round_trip.test.mjs", "review_screens.test.mjs", "figures.test.mjs"];

/// `node` with what the browser tests and scripts need to find: the real server
/// binary, the built app and the demo files.
fn node(dist: &Path, server: &Path) -> Command {
    let mut command = Command::new("node");
    command
        .env("WRACKLINE_BIN", server)
        .env("WRACKLINE_APP_DIR", dist)
        .env("WRACKLINE_DEMO_PHOTOS", root().join("demo-records/photos"))
        .env("WRACKLINE_CHECKLIST", root().join("demo-records/checklist.json"));
    command
}

/// The browser tests: node's test runner over `tests/browser`.
pub fn browser_tests(dist: &Path, server: &Path) -> Result<()> {
    let folder = root().join("tests/browser");
    let mut command = node(dist, server);
    command.arg("--test").arg("--test-concurrency=1");
    command.args(BROWSER_TESTS.iter().map(|file| folder.join(file)));
    check(command)
}

/// One script from `tests/browser` (a benchmark), run to the end.
pub fn browser_script(file: &str, dist: &Path, server: &Path) -> Result<()> {
    let mut command = node(dist, server);
    command.arg(root().join("tests/browser").join(file));
    check(command)
}

/// The phone-side benchmark: the 12 MP upload copy in headless Chromium.
pub fn browser_bench(dist: &Path, bench_wasm: &Path, server: &Path) -> Result<()> {
    let mut command = node(dist, server);
    command.arg(root().join("tests/browser/bench_prepare.mjs")).env("WRACKLINE_BENCH_WASM", bench_wasm);
    check(command)
}
