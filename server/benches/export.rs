//! Export benchmark: a Darwin Core Archive of 1,000,000 records, timed and with its peak
//! memory, beside a plain CSV export of the same records in the same run as the baseline.
//! Targets (issue 8): under 15 s and under 150 MB for the archive.
//!
//! Run with `cargo bench -p wrackline-server --bench export` (`WRACKLINE_BENCH_RECORDS`
//! sets another count). Each export runs as the real `wrackline export` process; its peak
//! resident memory is read from `/proc/<pid>/status` (VmHWM) while it runs.

use std::path::Path;
use std::process::Command;
use std::time::{Duration, Instant};

fn main() -> anyhow::Result<()> {
    let records: u64 = std::env::var("WRACKLINE_BENCH_RECORDS").ok().and_then(|n| n.parse().ok()).unwrap_or(1_000_000);
    let dir = tempfile::tempdir()?;
    let data = dir.path().join("data");
    let filled = Instant::now();
    {
        let state = wrackline_server::AppState::open(&data, None)?;
        state.store.run_here(|conn| wrackline_server::store::synthetic::fill(conn, records))?;
    }
    println!("filled {records} invented records in {:.1} s", filled.elapsed().as_secs_f64());
    let csv = export(&data, "csv", &dir.path().join("records.csv"))?;
    let dwca = export(&data, "dwca", &dir.path().join("records.zip"))?;
    let report = |name: &str, (time, peak_kb, bytes): (Duration, u64, u64)| {
        println!("{name:<22} {:>7.2} s  peak {:>6.1} MB  file {:>7.1} MB", time.as_secs_f64(), peak_kb as f64 / 1024.0, bytes as f64 / 1e6);
    };
    report("CSV export (baseline)", csv);
    report("Darwin Core Archive", dwca);
    println!(
        "archive / CSV: time × {:.2}, peak memory × {:.2}; targets: < 15 s ({}), < 150 MB ({})",
        dwca.0.as_secs_f64() / csv.0.as_secs_f64(),
        dwca.1 as f64 / csv.1 as f64,
        if dwca.0 < Duration::from_secs(15) { "met" } else { "missed" },
        if dwca.1 < 150 * 1024 { "met" } else { "missed" },
    );
    Ok(())
}

/// Runs `wrackline export` and returns its wall time, peak resident memory (kB) and output size.
fn export(data: &Path, format: &str, out: &Path) -> anyhow::Result<(Duration, u64, u64)> {
    let started = Instant::now();
    let mut child = Command::new(env!("CARGO_BIN_EXE_wrackline"))
        .arg("--data-dir")
        .arg(data)
        .args(["export", "--state", "any", "--format", format, "--out"])
        .arg(out)
        .stderr(std::process::Stdio::null())
        .spawn()?;
    let status_file = format!("/proc/{}/status", child.id());
    let mut peak_kb = 0;
    let status = loop {
        if let Some(status) = child.try_wait()? {
            break status;
        }
        if let Ok(text) = std::fs::read_to_string(&status_file) {
            peak_kb = peak_kb.max(high_water_kb(&text));
        }
        std::thread::sleep(Duration::from_millis(5));
    };
    let elapsed = started.elapsed();
    anyhow::ensure!(status.success(), "wrackline export --format {format} failed ({status})");
    Ok((elapsed, peak_kb, std::fs::metadata(out)?.len()))
}

fn high_water_kb(status: &str) -> u64 {
    status
        .lines()
        .find_map(|line| line.strip_prefix("VmHWM:"))
        .and_then(|rest| rest.trim().trim_end_matches("kB").trim().parse().ok())
        .unwrap_or(0)
}
