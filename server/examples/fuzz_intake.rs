//! A mutation fuzz loop for the photo intake path, on the stable toolchain (cargo-fuzz
//! needs nightly). It starts from real seeds — the demo JPEGs (with EXIF), a PNG, and
//! the hostile shapes of `tests/it/hostile.rs` — and mutates them (bit flips, odd bytes,
//! inserted, deleted and duplicated runs, splices between seeds, truncation), then runs
//! each input through `intake::prepare_photo`: the magic-byte and size checks, EXIF,
//! the header pixel limits, decoding with limits, orientation, derivatives and the
//! perceptual hash — everything intake does with a photo before storing it. A second
//! loop mutates the submission JSON through `intake::parse_submission`.
//!
//! A panic or an input slower than `SLOW` is a finding: it is written to
//! `target/fuzz-findings/` and the run exits non-zero. There is no coverage guidance;
//! the seeds carry the structure, the mutations the surprise.
//!
//!     cargo run -p wrackline-server --example fuzz_intake -- --seconds 60 [--seed N]
//!     cargo run -p wrackline-server --example fuzz_intake -- --replay target/fuzz-findings/FILE

use std::panic::{AssertUnwindSafe, catch_unwind};
use std::path::PathBuf;
use std::time::{Duration, Instant};

use anyhow::{Context as _, Result, bail};
use chrono::{FixedOffset, Utc};
use wrackline_server::intake;

/// An input that takes longer than this is reported (a 2 MP photo takes ~50 ms).
const SLOW: Duration = Duration::from_secs(3);

/// xorshift64*: small, seeded, reproducible.
struct Rng(u64);

impl Rng {
    fn next(&mut self) -> u64 {
        self.0 ^= self.0 >> 12;
        self.0 ^= self.0 << 25;
        self.0 ^= self.0 >> 27;
        self.0.wrapping_mul(0x2545_F491_4F6C_DD1D)
    }
    fn below(&mut self, n: usize) -> usize {
        if n == 0 { 0 } else { (self.next() % n as u64) as usize }
    }
}

struct Options {
    seconds: u64,
    seed: u64,
    /// Run one saved photo input and report, instead of fuzzing.
    replay: Option<PathBuf>,
}

fn options() -> Result<Options> {
    let mut options = Options { seconds: 20, seed: Utc::now().timestamp_micros() as u64 | 1, replay: None };
    let mut args = std::env::args().skip(1);
    while let Some(arg) = args.next() {
        let value = args.next().with_context(|| format!("{arg} needs a value"))?;
        match arg.as_str() {
            "--seconds" => options.seconds = value.parse().context("--seconds takes a whole number")?,
            "--seed" => options.seed = value.parse::<u64>().context("--seed takes a whole number")? | 1,
            "--replay" => options.replay = Some(PathBuf::from(value)),
            other => bail!("unknown option {other}; use --seconds N [--seed N] or --replay FILE"),
        }
    }
    Ok(options)
}

fn seeds() -> Result<Vec<Vec<u8>>> {
    let root = PathBuf::from(env!("CARGO_MANIFEST_DIR"));
    let mut seeds = Vec::new();
    for name in ["catshark.jpg", "ray.jpg", "tope.jpg"] {
        let path = root.join("../demo-records/photos").join(name);
        seeds.push(std::fs::read(&path).with_context(|| format!("reading seed {}", path.display()))?);
    }
    for orientation in [1, 6] {
        let path = root.join(format!("tests/fixtures/orientation/oriented-{orientation}.png"));
        seeds.push(std::fs::read(&path).with_context(|| format!("reading seed {}", path.display()))?);
    }
    Ok(seeds)
}

/// One random change; several are stacked per input.
fn mutate(input: &mut Vec<u8>, seeds: &[Vec<u8>], rng: &mut Rng) {
    const ODD: [u8; 8] = [0x00, 0xFF, 0x7F, 0x80, 0x01, 0xD8, 0xD9, 0xE1];
    let len = input.len();
    match rng.below(8) {
        0 if len > 0 => {
            let at = rng.below(len);
            input[at] ^= 1 << rng.below(8);
        }
        1 if len > 0 => {
            let at = rng.below(len);
            input[at] = ODD[rng.below(ODD.len())];
        }
        2 if len > 1 => {
            // Big-endian 16/32-bit extremes: lengths, counts, offsets, dimensions.
            let at = rng.below(len - 1);
            let value: &[u8] =
                [&[0xFF, 0xFF][..], &[0x00, 0x00], &[0x7F, 0xFF, 0xFF, 0xFF], &[0xFF, 0xFF, 0xFF, 0xFF]][rng.below(4)];
            for (i, b) in value.iter().enumerate() {
                if let Some(slot) = input.get_mut(at + i) {
                    *slot = *b;
                }
            }
        }
        3 if len > 0 => {
            let at = rng.below(len);
            let end = (at + 1 + rng.below(256)).min(len);
            input.drain(at..end);
        }
        4 if len > 0 => {
            let at = rng.below(len);
            let end = (at + 1 + rng.below(512)).min(len);
            let copy = input[at..end].to_vec();
            let to = rng.below(len);
            input.splice(to..to, copy);
        }
        5 => {
            let other = &seeds[rng.below(seeds.len())];
            if !other.is_empty() {
                let from = rng.below(other.len());
                let cut = rng.below(len + 1);
                input.truncate(cut);
                input.extend_from_slice(&other[from..]);
            }
        }
        6 if len > 0 => input.truncate(rng.below(len)),
        _ => {
            let at = rng.below(len + 1);
            let fill: Vec<u8> = (0..rng.below(64)).map(|_| rng.next() as u8).collect();
            input.splice(at..at, fill);
        }
    }
}

/// Runs one input; `Err` is a finding. A slow input is run again before it counts: on
/// a shared machine one slow wall-clock run may be another process's doing (a 900 s run
/// here once reported a 3.4 s input that replays in 0.14 s).
fn run_photo(bytes: &[u8]) -> Result<(), String> {
    let first = timed_photo(bytes)?;
    if first <= SLOW {
        return Ok(());
    }
    let again = timed_photo(bytes)?;
    if again > SLOW { Err(format!("slow: {first:?}, then {again:?}")) } else { Ok(()) }
}

fn timed_photo(bytes: &[u8]) -> Result<Duration, String> {
    let offset = FixedOffset::east_opt(3600).expect("one hour");
    let started = Instant::now();
    // Accepted or refused are both fine; only a panic is a finding.
    let _accepted_or_refused =
        catch_unwind(AssertUnwindSafe(|| intake::prepare_photo(bytes.to_vec(), offset).map(|_| ())))
            .map_err(|panic| format!("panic: {}", panic_text(&panic)))?;
    Ok(started.elapsed())
}

fn run_json(json: &[u8]) -> Result<(), String> {
    catch_unwind(AssertUnwindSafe(|| intake::parse_submission(json, Utc::now()).map(|_| ())))
        .map(|_| ())
        .map_err(|panic| format!("panic: {}", panic_text(&panic)))
}

fn panic_text(panic: &Box<dyn std::any::Any + Send>) -> String {
    panic
        .downcast_ref::<&str>()
        .map(|s| s.to_string())
        .or_else(|| panic.downcast_ref::<String>().cloned())
        .unwrap_or_default()
}

fn save_finding(kind: &str, bytes: &[u8], why: &str) -> Result<PathBuf> {
    let dir = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("../target/fuzz-findings");
    std::fs::create_dir_all(&dir)?;
    let path = dir.join(format!("{kind}-{}.bin", intake::photos::sha256_hex(bytes)));
    std::fs::write(&path, bytes)?;
    eprintln!("fuzz: FINDING ({why}) saved to {}", path.display());
    Ok(path)
}

const JSON_SEED: &str = r#"{"client_id":"6f9a4c2e-1d3b-4e5f-8a7b-9c0d1e2f3a4b","observed_at":"2025-06-01T14:10:00+01:00",
"position":{"latitude":52.4153,"longitude":-4.0829,"accuracy_m":8.0,"source":"device"},"species_guess":"catshark",
"length":{"kind":"total","value":54.0,"unit":"cm","method":"measured"},"sex":"male","count":1,"condition":"fresh_dead",
"setting":"beach_stranding","human_signs":["hook"],"notes":"n","observer_name":"o",
"photo_exif":[{"taken_local":"2025:06:01 14:05:09","offset":"+01:00","latitude":52.4,"longitude":-4.1,"orientation":6}]}"#;

fn main() -> Result<()> {
    // Panics are expected to be caught and reported here, not printed as they happen.
    std::panic::set_hook(Box::new(|_| {}));
    let options = options()?;
    if let Some(path) = &options.replay {
        let bytes = std::fs::read(path).with_context(|| format!("reading {}", path.display()))?;
        let started = Instant::now();
        let outcome = run_photo(&bytes);
        let offset = FixedOffset::east_opt(3600).expect("one hour");
        let verdict = intake::prepare_photo(bytes, offset)
            .map(|_| "accepted".to_owned())
            .unwrap_or_else(|p| format!("refused: {p}"));
        println!("fuzz: replay {} took {:?}: {verdict}; {outcome:?}", path.display(), started.elapsed());
        return Ok(());
    }
    let seeds = seeds()?;
    let mut rng = Rng(options.seed);
    let deadline = Instant::now() + Duration::from_secs(options.seconds);
    let (mut photos, mut jsons, mut findings) = (0u64, 0u64, 0u64);
    println!("fuzz: intake path for {} s, seed {}", options.seconds, options.seed);
    while Instant::now() < deadline {
        let mut input = seeds[rng.below(seeds.len())].clone();
        for _ in 0..1 + rng.below(6) {
            mutate(&mut input, &seeds, &mut rng);
        }
        if let Err(why) = run_photo(&input) {
            save_finding("photo", &input, &why)?;
            findings += 1;
        }
        photos += 1;
        let mut json = JSON_SEED.as_bytes().to_vec();
        for _ in 0..1 + rng.below(4) {
            mutate(&mut json, &[JSON_SEED.as_bytes().to_vec()], &mut rng);
        }
        if let Err(why) = run_json(&json) {
            save_finding("json", &json, &why)?;
            findings += 1;
        }
        jsons += 1;
    }
    println!("fuzz: {photos} photo inputs and {jsons} submission inputs, {findings} findings");
    if findings > 0 {
        bail!("{findings} findings in target/fuzz-findings/");
    }
    Ok(())
}
