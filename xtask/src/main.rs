//! `cargo xtask <task>`: everything needed to build, demo and test wrackline from a
//! fresh machine, in plain Rust so that no extra tool has to be installed by hand.
//!
//! - `build [--dev]`: the app (the phone's and the desk's wasm bundles + bindings + static
//!   files + service worker) into `target/app-dist`.
//! - `demo [ARGS…]`: build everything, then run `wrackline demo` (ARGS go to it).
//! - `test`: install what the tests need (wasm target, rustfmt and clippy, Chromium,
//!   exiftool, npm packages, a Python venv in target/venv), check formatting and lints
//!   (`cargo fmt --check`, `cargo clippy -D warnings`; the tidy rules run as a test of
//!   xtask), build, and run every test: Rust unit and integration tests, the app's own
//!   unit tests (natively, for each bundle), then the browser tests, then the intake fuzz loop for 15 s.
//!   `ci` is the same.
//! - `fuzz [--seconds N] [--seed N]`: the intake fuzz loop (`server/examples/fuzz_intake.rs`).
//! - `tidy`: the workspace's written rules and module layers ([`tidy`]), printed.
//! - `bench`: the benchmarks, each printing ratios against a baseline measured in the
//!   same run (never timed tests: machines here are shared and noisy), then one table of
//!   them all: durable HTTP ingest against raw SQLite, photo intake, duplicates, exports,
//!   range figures, the key, the phone's upload copy.

mod app;
mod prerequisites;
mod run;
mod shrink;
mod tidy;

use std::path::PathBuf;

use anyhow::{Context as _, Result, bail};

fn main() -> Result<()> {
    let mut args = std::env::args().skip(1);
    let task = args.next().unwrap_or_default();
    let rest: Vec<String> = args.collect();
    match task.as_str() {
        "build" => app::build(profile(&rest)).map(|_| ()),
        "demo" => demo(&rest),
        "test" | "ci" => test(),
        "fuzz" => fuzz(&rest),
        "bench" => bench(),
        "tidy" => tidy::run(&root()),
        _ => bail!(
            "usage: cargo xtask <build [--dev] | demo [wrackline demo options] | test | ci | fuzz [--seconds N] [--seed N] | bench | tidy>\n  unknown task `{task}`"
        ),
    }
}

fn profile(args: &[String]) -> app::Profile {
    if args.iter().any(|a| a == "--dev") { app::Profile::Dev } else { app::Profile::Release }
}

/// The workspace root (xtask lives one folder below it).
pub fn root() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR")).parent().expect("xtask sits inside the workspace").to_owned()
}

fn demo(args: &[String]) -> Result<()> {
    prerequisites::wasm_target()?;
    // The app first: the server's build embeds it.
    app::build(app::Profile::Release)?;
    run::cargo(&["build", "--release", "-p", "wrackline-server"])?;
    let binary = root().join("target/release/wrackline");
    let mut command = std::process::Command::new(binary);
    command.arg("demo").args(args);
    run::exec(command)
}

fn test() -> Result<()> {
    let started = std::time::Instant::now();
    prerequisites::all()?;
    let python = prerequisites::python_venv()?;
    lint()?;
    let dist = app::build(app::Profile::Release)?;
    run::cargo_with_env(
        &["test", "--workspace", "--exclude", "wrackline-app", "--exclude", "upload-copy-bench"],
        &[("WRACKLINE_PYTHON", &python)],
    )?;
    // The app's data layer (sync states, backoff, error decoding, time), natively: no browser.
    run::cargo(&["test", "-p", "wrackline-app"])?;
    run::cargo(&["test", "-p", "wrackline-app", "--features", "desk"])?;
    run::cargo(&["build", "-p", "wrackline-server"])?;
    run::browser_tests(&dist, &root().join("target/debug/wrackline"))?;
    fuzz(&["--seconds".into(), "15".into()])?;
    println!("xtask test: every suite passed in {:.0} s", started.elapsed().as_secs_f64());
    Ok(())
}

/// The written rules first, cheapest first: formatting, then lints (native crates and the
/// wasm-only ones for their own target), each failing the run on any finding.
fn lint() -> Result<()> {
    run::cargo(&["fmt", "--all", "--", "--check"])?;
    run::cargo(&[
        "clippy",
        "--workspace",
        "--exclude",
        "wrackline-app",
        "--exclude",
        "upload-copy-bench",
        "--all-targets",
        "--",
        "-D",
        "warnings",
    ])?;
    run::cargo(&[
        "clippy",
        "-p",
        "wrackline-app",
        "-p",
        "upload-copy-bench",
        "--target",
        "wasm32-unknown-unknown",
        "--",
        "-D",
        "warnings",
    ])?;
    // The desk's bundle is the same crate with other screens: linted on its own too.
    run::cargo(&[
        "clippy",
        "-p",
        "wrackline-app",
        "--features",
        "desk",
        "--target",
        "wasm32-unknown-unknown",
        "--",
        "-D",
        "warnings",
    ])
}

/// The intake fuzz loop; it exits non-zero on a finding (saved in `target/fuzz-findings/`).
fn fuzz(args: &[String]) -> Result<()> {
    let mut cargo_args = vec!["run", "-p", "wrackline-server", "--example", "fuzz_intake", "--"];
    cargo_args.extend(args.iter().map(String::as_str));
    run::cargo(&cargo_args)
}

/// Benchmarks, not timed tests: they print numbers and pass whatever they are. Each
/// prints its rows of the summary (result, baseline measured in the same run, ratio,
/// target); the summary table of every row follows the last, then the figures recorded
/// in `docs/benchmarks.md` to compare with.
fn bench() -> Result<()> {
    prerequisites::all()?;
    let python = prerequisites::python_venv()?;
    let mut rows = Vec::new();
    rows.extend(run::cargo_bench(&["-p", "species-key", "--bench", "next_question"], &[])?);
    rows.extend(run::cargo_bench(&["-p", "analysis", "--bench", "range"], &[("WRACKLINE_PYTHON", &python)])?);
    for bench in ["ingest", "intake", "duplicates", "export"] {
        rows.extend(run::cargo_bench(&["-p", "wrackline-server", "--bench", bench], &[])?);
    }
    let bench_wasm = app::build_bench_wasm()?;
    let dist = app::build(app::Profile::Release)?;
    run::cargo(&["build", "--release", "-p", "wrackline-server"])?;
    let server = root().join("target/release/wrackline");
    rows.extend(run::browser_script("bench_key.mjs", &dist, &server)?);
    rows.extend(run::browser_script("bench_first_load.mjs", &dist, &server)?);
    rows.extend(run::browser_bench(&dist, &bench_wasm, &server)?);
    println!("\nEvery benchmark of this run, each with its baseline measured in the same run:\n");
    println!("| benchmark | result | baseline in the same run | ratio | target |");
    println!("|---|---|---|---|---|");
    for row in &rows {
        println!("| {row} |");
    }
    print_recorded_figures()
}

/// The figures recorded in `docs/benchmarks.md`, printed after a run to compare with.
fn print_recorded_figures() -> Result<()> {
    let file = root().join("docs/benchmarks.md");
    let text = std::fs::read_to_string(&file).with_context(|| format!("reading {}", file.display()))?;
    println!("\nRecorded figures ({}), to compare with this run:\n", file.display());
    text.lines().filter(|line| line.starts_with('|')).for_each(|line| println!("{line}"));
    Ok(())
}
