//! Benchmark: EOO and AOO on a million generated records, timed against pyproj + shapely.
//!
//! Run with `cargo bench -p analysis --bench range` (or `cargo xtask bench`). If
//! `$WRACKLINE_PYTHON` or `target/venv/bin/python` exists (with pyproj, shapely and numpy),
//! the same points are written to a temporary file and `range_reference.py` computes and
//! times the same figures (gnomonic hull, geodesic area, equal-area cells over 16 origins);
//! the bench prints both, the speed ratio of the summary (EOO and AOO together, sharing each
//! record's trigonometry) against the reference's EOO + AOO, and whether the answers agree
//! within 0.1%. Timings are the best of three runs; generating and writing points is not timed.

use std::path::PathBuf;
use std::process::Command;
use std::time::{Duration, Instant};

use analysis::LatLon;
use analysis::random::SplitMix64;
use analysis::range::{AooGrid, GridPlan, aoo, eoo, summary};

const POINTS: usize = 1_000_000;
const RUNS: usize = 3;

fn main() {
    let points = coastline_points(POINTS, 0x5eed_2024);
    let grid = AooGrid::default();
    let plan = GridPlan::starting_with(grid);
    let (eoo_km2, eoo_time) = best_of(|| eoo(&points).expect("the coast lies in one hemisphere").area_km2);
    let (cells, aoo_time) = best_of(|| {
        let result = aoo(&points, &plan);
        (result.occupied_cells, result.min_occupied_cells)
    });
    let (together, summary_time) = best_of(|| {
        let s = summary(&points, &plan);
        (s.eoo.map(|e| e.area_km2), s.aoo.occupied_cells)
    });
    assert_eq!(together, (Some(eoo_km2), cells.0), "the summary gives the figures computed alone");
    println!("wrackline analysis, {POINTS} points (best of {RUNS}):");
    println!("  EOO {eoo_km2:.3} km² in {:.1} ms", ms(eoo_time));
    println!("  AOO {} cells (min {} over 16 origins) in {:.1} ms", cells.0, cells.1, ms(aoo_time));
    println!(
        "  EOO + AOO separately {:.1} ms; together in the summary {:.1} ms",
        ms(eoo_time + aoo_time),
        ms(summary_time)
    );
    match reference_python() {
        Some(python) => compare_with_python(&python, &points, &grid, eoo_km2, cells, summary_time),
        None => {
            println!("no Python with pyproj/shapely found; set WRACKLINE_PYTHON to compare");
            println!(
                "bench-row | EOO + AOO, {POINTS} points (`analysis/benches/range.rs`) | {:.0} ms | shapely + pyproj: not measured (no WRACKLINE_PYTHON) | — | ≥ 10×, within 0.1 %",
                ms(summary_time)
            );
        }
    }
}

/// Runs `f` [`RUNS`] times and returns its last result with the shortest time.
fn best_of<T>(mut f: impl FnMut() -> T) -> (T, Duration) {
    let mut best = Duration::MAX;
    let mut result = None;
    for _ in 0..RUNS {
        let start = Instant::now();
        result = Some(std::hint::black_box(f()));
        best = best.min(start.elapsed());
    }
    (result.expect("at least one run"), best)
}

fn ms(d: Duration) -> f64 {
    d.as_secs_f64() * 1000.0
}

/// Records scattered about a wiggly 500 km coastline, like strandings along a shore.
fn coastline_points(n: usize, seed: u64) -> Vec<LatLon> {
    let mut random = SplitMix64::new(seed);
    (0..n)
        .map(|_| {
            let t = random.uniform();
            let lon = -5.5 + 7.0 * t + 0.03 * normal(&mut random);
            let lat = 49.8 + 1.2 * (0.5 + 0.4 * (7.0 * t).sin()) + 0.03 * normal(&mut random);
            LatLon::new(lat, lon).expect("generated points are in range")
        })
        .collect()
}

/// Standard normal by the Box–Muller transform.
fn normal(random: &mut SplitMix64) -> f64 {
    let u = 1.0 - random.uniform();
    let v = random.uniform();
    (-2.0 * u.ln()).sqrt() * (std::f64::consts::TAU * v).cos()
}

fn reference_python() -> Option<PathBuf> {
    let candidate = std::env::var_os("WRACKLINE_PYTHON")
        .map(PathBuf::from)
        .unwrap_or_else(|| PathBuf::from(concat!(env!("CARGO_MANIFEST_DIR"), "/../target/venv/bin/python")));
    candidate.exists().then_some(candidate)
}

fn compare_with_python(
    python: &PathBuf,
    points: &[LatLon],
    grid: &AooGrid,
    eoo_km2: f64,
    cells: (usize, usize),
    rust_time: Duration,
) {
    let file = std::env::temp_dir().join(format!("wrackline-bench-points-{}.bin", std::process::id()));
    let bytes: Vec<u8> = points.iter().flat_map(|p| [p.lat(), p.lon()]).flat_map(f64::to_le_bytes).collect();
    std::fs::write(&file, bytes).expect("writing the points file");
    let script = concat!(env!("CARGO_MANIFEST_DIR"), "/benches/range_reference.py");
    let output = Command::new(python)
        .arg(script)
        .arg(&file)
        .args([grid.centre().lat(), grid.centre().lon(), grid.cell_size_km()].map(|v| v.to_string()))
        .output()
        .expect("running the Python reference");
    let _ = std::fs::remove_file(&file);
    if !output.status.success() {
        println!("Python reference failed: {}", String::from_utf8_lossy(&output.stderr));
        return;
    }
    let reference: serde_json::Value = serde_json::from_slice(&output.stdout).expect("reference prints JSON");
    let number = |key: &str| reference[key].as_f64().expect("numeric field");
    let python_time = number("eoo_seconds") + number("aoo_seconds");
    println!("shapely + pyproj ({}), same points:", reference["versions"]);
    println!("  EOO {:.3} km² in {:.1} ms", number("eoo_km2"), number("eoo_seconds") * 1000.0);
    println!(
        "  AOO {} cells (min {}) in {:.1} ms",
        number("aoo_cells"),
        number("aoo_min_cells"),
        number("aoo_seconds") * 1000.0
    );
    println!("  total {:.1} ms", python_time * 1000.0);
    let within = |ours: f64, theirs: f64| (ours - theirs).abs() <= 1e-3 * theirs.abs();
    let agree = within(eoo_km2, number("eoo_km2"))
        && within(cells.0 as f64, number("aoo_cells"))
        && within(cells.1 as f64, number("aoo_min_cells"));
    let speed_up = python_time / rust_time.as_secs_f64();
    println!("speed-up of the summary (EOO + AOO) {speed_up:.1}x; answers agree within 0.1%: {agree}");
    println!(
        "bench-row | EOO + AOO, {POINTS} points (`analysis/benches/range.rs`) | {:.0} ms, EOO {eoo_km2:.3} km², AOO {} cells | shapely + pyproj on the same points: {:.0} ms | {speed_up:.1}× faster, agree within 0.1 %: {agree} | ≥ 10×, within 0.1 % — {}",
        rust_time.as_secs_f64() * 1000.0,
        cells.0,
        python_time * 1000.0,
        if speed_up >= 10.0 && agree { "met" } else { "not met" }
    );
}
