//! Benchmark (not a test): candidate search for a new record against 1,000,000 stored
//! records — median and 99th percentile through the R-tree, against a brute-force scan
//! scoring every stored record, both measured in this run.
//!
//! Run with `cargo bench -p wrackline-server --bench duplicates`.

use std::hint::black_box;
use std::time::{Duration, Instant};

use chrono::{DateTime, Utc};
use shared_types::{Condition, LengthKind, Setting};
use wrackline_server::duplicates::{DupRecord, Index, Sighting, Species, candidates, index_points, score};

const STORED: usize = 1_000_000;
const QUERIES: usize = 1_000;
const BRUTE_QUERIES: usize = 5;

/// A small deterministic generator, so every run times the same records.
struct Lcg(u64);

impl Lcg {
    fn unit(&mut self) -> f64 {
        self.0 = self.0.wrapping_mul(6364136223846793005).wrapping_add(1442695040888963407);
        (self.0 >> 11) as f64 / (1u64 << 53) as f64
    }
}

/// Invented records along 800 km of coast (a band 50–56°N, 2–10°W), over ten years.
fn record(id: i64, random: &mut Lcg) -> DupRecord {
    let along = random.unit();
    let start = DateTime::parse_from_rfc3339("2016-01-01T00:00:00Z").unwrap().with_timezone(&Utc);
    let at = start + chrono::Duration::seconds((random.unit() * 10.0 * 365.0 * 86_400.0) as i64);
    let position = (50.0 + 6.0 * along, -10.0 + 8.0 * along + 0.05 * random.unit());
    DupRecord {
        observation_id: id,
        sightings: vec![Sighting::own(at, Some(position), Some(5.0 + 40.0 * random.unit()))],
        setting: if random.unit() < 0.7 { Setting::BeachStranding } else { Setting::AnglerCatch },
        condition: Condition::Decomposed,
        species: Species::lineage(&[
            ["Raja clavata", "Scyliorhinus canicula", "Squalus acanthias"][(random.unit() * 3.0) as usize % 3]
        ]),
        length: Some((LengthKind::Total, 40.0 + 60.0 * random.unit(), false)),
        photo_hashes: Vec::new(),
        original_hashes: Vec::new(),
        photo_phashes: Vec::new(),
    }
}

fn percentile(times: &mut [Duration], p: f64) -> Duration {
    times.sort();
    times[((times.len() - 1) as f64 * p).round() as usize]
}

fn main() {
    let mut random = Lcg(2026);
    let stored: Vec<DupRecord> = (0..STORED as i64).map(|id| record(id, &mut random)).collect();
    let built = Instant::now();
    let index = Index::build(stored.iter().flat_map(index_points));
    println!("index of {} records built in {:.2} s", index.len(), built.elapsed().as_secs_f64());
    let queries: Vec<DupRecord> = (0..QUERIES as i64).map(|i| record(STORED as i64 + i, &mut random)).collect();

    let mut indexed = Vec::with_capacity(QUERIES);
    let mut found = 0;
    for query in &queries {
        let start = Instant::now();
        let near = index.possible_pairs(
            query.sightings[0].position.unwrap(),
            query.sightings[0].uncertainty_m,
            query.sightings[0].at,
        );
        found += black_box(candidates(query, near.iter().map(|&id| &stored[id as usize]))).len();
        indexed.push(start.elapsed());
    }
    let mut brute = Vec::with_capacity(BRUTE_QUERIES);
    let mut brute_found = 0;
    for query in &queries[..BRUTE_QUERIES] {
        let start = Instant::now();
        brute_found += black_box(stored.iter().filter_map(|r| score(query, r)).count());
        brute.push(start.elapsed());
    }
    let check: usize = queries[..BRUTE_QUERIES]
        .iter()
        .map(|q| {
            candidates(
                q,
                index
                    .possible_pairs(q.sightings[0].position.unwrap(), q.sightings[0].uncertainty_m, q.sightings[0].at)
                    .iter()
                    .map(|&id| &stored[id as usize]),
            )
            .len()
        })
        .sum();
    assert_eq!(check, brute_found, "the index finds exactly what a full scan finds");
    let median = percentile(&mut indexed, 0.5);
    let p99 = percentile(&mut indexed, 0.99);
    let brute_median = percentile(&mut brute, 0.5);
    println!("candidate search, {STORED} stored records, {QUERIES} new records ({found} candidates found):");
    println!(
        "  R-tree: median {:.3} ms, 99th percentile {:.3} ms",
        median.as_secs_f64() * 1e3,
        p99.as_secs_f64() * 1e3
    );
    println!("  brute-force scan ({BRUTE_QUERIES} records): median {:.1} ms", brute_median.as_secs_f64() * 1e3);
    println!("  brute force / R-tree (medians): {:.0}x", brute_median.as_secs_f64() / median.as_secs_f64());
    println!(
        "bench-row | duplicate candidates, {STORED} stored (`server/benches/duplicates.rs`) | median {:.3} ms, p99 {:.3} ms | brute-force scan: {:.1} ms | {:.0}× | median < 1 ms — {}",
        median.as_secs_f64() * 1e3,
        p99.as_secs_f64() * 1e3,
        brute_median.as_secs_f64() * 1e3,
        brute_median.as_secs_f64() / median.as_secs_f64(),
        if median.as_secs_f64() < 1e-3 { "met" } else { "not met" }
    );
}
