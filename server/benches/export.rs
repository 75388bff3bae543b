//! Export benchmark: a Darwin Core Archive of 1,000,000 records, timed and with its peak
//! memory, beside a plain CSV export of the same records in the same run as the baseline.
//! Targets (issue 8): under 15 s and under 150 MB for the archive.
//!
//! The invented records include survey walks (one per 40 records, half of the records on
//! one), so the archive takes the Event-core path with absences and incidental events.
//!
//! Run with `cargo bench -p wrackline-server --bench export` (`WRACKLINE_BENCH_RECORDS`
//! sets another count). Each export runs as the real `wrackline export` process; its peak
//! resident memory is read from `/proc/<pid>/status` (VmHWM, the kernel's high-water mark,
//! which only grows) and its CPU time from `/proc/<pid>/schedstat` (nanoseconds on a CPU)
//! every 5 ms while it runs. On a shared machine the wall time includes waiting for a
//! core; the CPU time does not, so both are printed.

use std::path::Path;
use std::process::Command;
use std::time::{Duration, Instant};

fn main() -> anyhow::Result<()> {
    let records: u64 = std::env::var("WRACKLINE_BENCH_RECORDS").ok().and_then(|n| n.parse().ok()).unwrap_or(1_000_000);
    let dir = tempfile::tempdir()?;
    let data = dir.path().join("data");
    let filled = Instant::now();
    {
        std::fs::create_dir_all(&data)?;
        let store = wrackline_server::store::Store::open(&data.join("wrackline.sqlite3"))?;
        store.run_here(move |conn| wrackline_server::store::synthetic::fill(conn, records))?;
    }
    let walks = records.div_ceil(wrackline_server::store::synthetic::RECORDS_PER_WALK);
    println!("filled {records} invented records and {walks} survey walks in {:.1} s", filled.elapsed().as_secs_f64());
    let csv = export(&data, "csv", &dir.path().join("records.csv"))?;
    let dwca = export(&data, "dwca", &dir.path().join("records.zip"))?;
    let report = |name: &str, run: &Run| {
        println!(
            "{name:<22} {:>7.2} s wall  {:>7.2} s CPU  peak {:>6.1} MB  file {:>7.1} MB",
            run.wall.as_secs_f64(),
            run.cpu.as_secs_f64(),
            run.peak_kb as f64 / 1024.0,
            run.bytes as f64 / 1e6
        );
    };
    report("CSV export (baseline)", &csv);
    report("Darwin Core Archive", &dwca);
    println!(
        "archive / CSV: wall time × {:.2}, peak memory × {:.2}; targets: < 15 s ({}), < 150 MB ({})",
        dwca.wall.as_secs_f64() / csv.wall.as_secs_f64(),
        dwca.peak_kb as f64 / csv.peak_kb as f64,
        if dwca.wall < Duration::from_secs(15) { "met" } else { "missed" },
        if dwca.peak_kb < 150 * 1024 { "met" } else { "missed" },
    );
    println!(
        "bench-row | Darwin Core Archive, {records} records + {walks} walks (`server/benches/export.rs`) | {:.1} s, peak {:.0} MB | CSV of the same: {:.1} s, {:.0} MB | × {:.2} time, × {:.1} memory | < 15 s, < 150 MB — {}",
        dwca.wall.as_secs_f64(),
        dwca.peak_kb as f64 / 1024.0,
        csv.wall.as_secs_f64(),
        csv.peak_kb as f64 / 1024.0,
        dwca.wall.as_secs_f64() / csv.wall.as_secs_f64(),
        dwca.peak_kb as f64 / csv.peak_kb as f64,
        if dwca.wall < Duration::from_secs(15) && dwca.peak_kb < 150 * 1024 { "met" } else { "not met" }
    );
    Ok(())
}

/// What one export process took.
struct Run {
    wall: Duration,
    /// Time on a CPU, as last read before the process ended (within 5 ms).
    cpu: Duration,
    /// Peak resident memory, kB.
    peak_kb: u64,
    /// Size of what it wrote.
    bytes: u64,
}

/// Runs `wrackline export` and measures it.
fn export(data: &Path, format: &str, out: &Path) -> anyhow::Result<Run> {
    let started = Instant::now();
    let mut child = Command::new(env!("CARGO_BIN_EXE_wrackline"))
        .arg("--data-dir")
        .arg(data)
        .args(["export", "--state", "any", "--format", format, "--out"])
        .arg(out)
        .stderr(std::process::Stdio::null())
        .spawn()?;
    let status_file = format!("/proc/{}/status", child.id());
    let schedstat_file = format!("/proc/{}/schedstat", child.id());
    let (mut peak_kb, mut cpu_ns) = (0, 0);
    let status = loop {
        if let Some(status) = child.try_wait()? {
            break status;
        }
        if let Ok(text) = std::fs::read_to_string(&status_file) {
            peak_kb = peak_kb.max(high_water_kb(&text));
        }
        if let Some(ns) =
            std::fs::read_to_string(&schedstat_file).ok().and_then(|t| t.split_whitespace().next()?.parse().ok())
        {
            cpu_ns = ns;
        }
        std::thread::sleep(Duration::from_millis(5));
    };
    let wall = started.elapsed();
    anyhow::ensure!(status.success(), "wrackline export --format {format} failed ({status})");
    Ok(Run { wall, cpu: Duration::from_nanos(cpu_ns), peak_kb, bytes: std::fs::metadata(out)?.len() })
}

fn high_water_kb(status: &str) -> u64 {
    status
        .lines()
        .find_map(|line| line.strip_prefix("VmHWM:"))
        .and_then(|rest| rest.trim().trim_end_matches("kB").trim().parse().ok())
        .unwrap_or(0)
}
