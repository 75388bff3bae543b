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

/// The mark a benchmark puts before a line of the summary table: `bench-row | name |
/// result | baseline | ratio | target`.
pub const BENCH_ROW: &str = "bench-row |";

/// Runs a command in the workspace root, showing its output as it comes, and returns
/// the benchmark rows it printed ([`BENCH_ROW`] lines, the mark taken off).
pub fn collect_rows(mut command: Command) -> Result<Vec<String>> {
    use std::io::BufRead as _;
    command.current_dir(root()).stdout(std::process::Stdio::piped());
    let shown = format!("{command:?}");
    eprintln!("xtask: running {shown}");
    let mut child = command.spawn().with_context(|| format!("could not start {shown}"))?;
    let mut rows = Vec::new();
    let output = child.stdout.take().context("the benchmark's output")?;
    for line in std::io::BufReader::new(output).lines() {
        let line = line.with_context(|| format!("reading the output of {shown}"))?;
        println!("{line}");
        if let Some(row) = line.strip_prefix(BENCH_ROW) {
            rows.push(row.trim().to_owned());
        }
    }
    let status = child.wait().with_context(|| format!("waiting for {shown}"))?;
    if !status.success() {
        bail!("{shown} failed ({status})");
    }
    Ok(rows)
}

/// `cargo bench` of one benchmark, collecting its rows (see [`collect_rows`]).
pub fn cargo_bench(args: &[&str], env: &[(&str, &Path)]) -> Result<Vec<String>> {
    let mut command = Command::new(std::env::var("CARGO").unwrap_or_else(|_| "cargo".into()));
    command.arg("bench").args(args);
    for (name, value) in env {
        command.env(name, value);
    }
    collect_rows(command)
}

/// Runs a command to the end and exits with its status.
pub fn exec(mut command: Command) -> Result<()> {
    command.current_dir(root());
    let status = command.status().with_context(|| format!("could not start {command:?}"))?;
    std::process::exit(status.code().unwrap_or(1));
}

/// Every browser test file: each `*.test.mjs` in `tests/browser`, in name order, so a
/// new test file cannot be left out of the run.
fn browser_test_files(folder: &Path) -> Result<Vec<std::path::PathBuf>> {
    let mut files: Vec<_> = std::fs::read_dir(folder)
        .with_context(|| format!("listing {}", folder.display()))?
        .map(|entry| entry.map(|e| e.path()))
        .collect::<Result<_, _>>()
        .with_context(|| format!("listing {}", folder.display()))?;
    files.retain(|path| path.file_name().and_then(|n| n.to_str()).is_some_and(|n| n.ends_with(".test.mjs")));
    files.sort();
    if files.is_empty() {
        bail!("no *.test.mjs files in {}", folder.display());
    }
    Ok(files)
}

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
    command.args(browser_test_files(&folder)?);
    check(command)
}

/// One benchmark script from `tests/browser`, run to the end; its rows (see [`collect_rows`]).
pub fn browser_script(file: &str, dist: &Path, server: &Path) -> Result<Vec<String>> {
    let mut command = node(dist, server);
    command.arg(root().join("tests/browser").join(file));
    collect_rows(command)
}

/// The phone-side benchmark: the 12 MP upload copy in headless Chromium; its rows.
pub fn browser_bench(dist: &Path, bench_wasm: &Path, server: &Path) -> Result<Vec<String>> {
    let mut command = node(dist, server);
    command.arg(root().join("tests/browser/bench_prepare.mjs")).env("WRACKLINE_BENCH_WASM", bench_wasm);
    collect_rows(command)
}
