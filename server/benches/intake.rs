//! Benchmark (not a timed test): how many 2-megapixel JPEGs per second the server's
//! photo intake handles on this machine's cores — SHA-256, EXIF, header checks,
//! decoding with limits, orientation, display and thumbnail derivatives, perceptual
//! hash, and the durable file writes — against a baseline measured in the same run
//! (SHA-256 alone). Also, single-threaded, what making the phone's upload copy of a
//! 12 MP JPEG costs with the `image` crate natively: a lower bound for doing it with
//! the same crate in wasm on the phone (see DEVELOPERS.md).
//!
//!     cargo bench -p wrackline-server --bench intake

use std::time::Instant;

use chrono::FixedOffset;
use image::{DynamicImage, RgbImage};
use wrackline_server::intake::{self, photos};

const PHOTOS: usize = 64;

/// A photo-like JPEG: smooth gradients with fine noise, quality 90 (like a phone's).
fn photo_like(width: u32, height: u32, seed: u32) -> Vec<u8> {
    let img = RgbImage::from_fn(width, height, |x, y| {
        let noise = (x.wrapping_mul(2_654_435_761) ^ y.wrapping_mul(40_503) ^ seed).wrapping_mul(2_246_822_519) >> 27;
        image::Rgb([
            (x * 255 / width) as u8 ^ noise as u8,
            (y * 255 / height) as u8,
            ((x + y + seed) % 200) as u8 + noise as u8,
        ])
    });
    let mut bytes = Vec::new();
    image::codecs::jpeg::JpegEncoder::new_with_quality(&mut bytes, 90).encode_image(&img).expect("encode");
    bytes
}

/// Adds real EXIF (time, offset, GPS, orientation) with exiftool when it is installed.
fn with_exif(jpeg: Vec<u8>, dir: &std::path::Path, index: usize) -> Vec<u8> {
    let path = dir.join(format!("bench-{index}.jpg"));
    std::fs::write(&path, &jpeg).expect("write");
    let tagged = std::process::Command::new("exiftool")
        .args(["-q", "-overwrite_original", "-DateTimeOriginal=2025:06:01 14:05:09", "-OffsetTimeOriginal=+01:00"])
        .args([
            "-GPSLatitude=52.4153",
            "-GPSLatitudeRef=N",
            "-GPSLongitude=4.0829",
            "-GPSLongitudeRef=W",
            "-Orientation#=6",
        ])
        .arg(&path)
        .status()
        .is_ok_and(|s| s.success());
    if tagged { std::fs::read(&path).expect("read") } else { jpeg }
}

/// Photos per second with `work` run over every photo, split across `threads`.
fn rate(photos: &[Vec<u8>], threads: usize, work: impl Fn(usize, &[u8]) + Sync) -> f64 {
    let started = Instant::now();
    std::thread::scope(|scope| {
        for part in 0..threads {
            let work = &work;
            scope.spawn(move || {
                for (index, photo) in photos.iter().enumerate().skip(part).step_by(threads) {
                    work(index, photo);
                }
            });
        }
    });
    photos.len() as f64 / started.elapsed().as_secs_f64()
}

/// Where one photo's intake time goes, one thread, milliseconds (median of 9).
fn stages(jpeg: &[u8]) {
    let time = |work: &dyn Fn()| {
        let mut runs: Vec<f64> = (0..9)
            .map(|_| {
                let started = Instant::now();
                work();
                started.elapsed().as_secs_f64() * 1000.0
            })
            .collect();
        runs.sort_by(f64::total_cmp);
        runs[4]
    };
    let decoded = image::load_from_memory_with_format(jpeg, image::ImageFormat::Jpeg).expect("decode");
    let display = decoded.resize(1280, 1280, image::imageops::FilterType::Triangle);
    let encode = |image: &DynamicImage| {
        let mut out = Vec::new();
        image::codecs::jpeg::JpegEncoder::new_with_quality(&mut out, 82)
            .encode_image(&DynamicImage::ImageRgb8(image.to_rgb8()))
            .expect("encode");
    };
    let thumb = display.resize(320, 320, image::imageops::FilterType::Triangle);
    println!(
        "  one photo, one thread (ms): EXIF {:.1} · decode {:.1} · rotate 90° {:.1} · resize to 1280 {:.1} · encode 1280 {:.1} · resize to 320 {:.1} · pHash of the 1280 copy {:.1} · of the 320 thumbnail (used) {:.1}",
        time(&|| drop(std::hint::black_box(shared_types::exif::read(jpeg)))),
        time(&|| drop(std::hint::black_box(image::load_from_memory_with_format(jpeg, image::ImageFormat::Jpeg)))),
        time(&|| drop(std::hint::black_box(decoded.rotate90()))),
        time(&|| drop(std::hint::black_box(decoded.resize(1280, 1280, image::imageops::FilterType::Triangle)))),
        time(&|| encode(&display)),
        time(&|| drop(std::hint::black_box(display.resize(320, 320, image::imageops::FilterType::Triangle)))),
        time(&|| drop(std::hint::black_box(wrackline_server::intake::images::perceptual_hash(&display)))),
        time(&|| drop(std::hint::black_box(wrackline_server::intake::images::perceptual_hash(&thumb)))),
    );
}

fn main() {
    let dir = tempfile::tempdir().expect("temp dir");
    let threads = std::thread::available_parallelism().map_or(2, |n| n.get());
    let photos: Vec<Vec<u8>> =
        (0..PHOTOS).map(|i| with_exif(photo_like(1632, 1224, i as u32), dir.path(), i)).collect();
    let mean_mb = photos.iter().map(Vec::len).sum::<usize>() as f64 / PHOTOS as f64 / 1e6;
    println!(
        "server intake: {PHOTOS} JPEGs of 1632 × 1224 (2.0 MP, {mean_mb:.2} MB each, EXIF by exiftool), {threads} threads"
    );

    let baseline = rate(&photos, threads, |_, bytes| {
        std::hint::black_box(photos::sha256_hex(bytes));
    });
    let no_writes = rate(&photos, threads, |_, bytes| {
        std::hint::black_box(
            intake::prepare_photo(bytes.to_vec(), FixedOffset::east_opt(3600).expect("offset")).expect("a good photo"),
        );
    });
    let files = photos::PhotoFiles::open(&dir.path().join("photos")).expect("photo folder");
    let offset = FixedOffset::east_opt(3600).expect("offset");
    let full = rate(&photos, threads, |_, bytes| {
        let (bytes, derived, stored) = intake::prepare_photo(bytes.to_vec(), offset).expect("a good photo");
        files.put(&stored.sha256, photos::Rendition::Original, &bytes).expect("write");
        files.put(&stored.sha256, photos::Rendition::Display, &derived.display_jpeg).expect("write");
        files.put(&stored.sha256, photos::Rendition::Thumb, &derived.thumb_jpeg).expect("write");
    });
    println!("  baseline, SHA-256 only:                           {baseline:8.1} photos/s");
    println!("  the same without the file writes:                 {no_writes:8.1} photos/s");
    println!("  intake (hash + EXIF + checks + decode + derivatives + pHash + fsync'd writes): {full:8.1} photos/s");
    println!("  ratio intake / baseline:                          {:8.4}", full / baseline);
    println!(
        "bench-row | server photo intake, 2 MP JPEGs, {threads} threads (`server/benches/intake.rs`) | {full:.1} photos/s | SHA-256 only: {baseline:.0} photos/s | {:.4} | —",
        full / baseline
    );

    stages(&photos[0]);

    let twelve = photo_like(4000, 3000, 7);
    let runs = 5;
    let mut times = Vec::new();
    for _ in 0..runs {
        let started = Instant::now();
        let mut image = image::load_from_memory_with_format(&twelve, image::ImageFormat::Jpeg).expect("decode");
        image.apply_orientation(image::metadata::Orientation::Rotate90);
        let copy = image.resize(2048, 2048, image::imageops::FilterType::Triangle);
        let mut out = Vec::new();
        image::codecs::jpeg::JpegEncoder::new_with_quality(&mut out, 88)
            .encode_image(&DynamicImage::ImageRgb8(copy.to_rgb8()))
            .expect("encode");
        times.push(started.elapsed().as_secs_f64() * 1000.0);
    }
    times.sort_by(f64::total_cmp);
    println!(
        "phone upload copy with the image crate, native, 1 thread: 12 MP ({:.1} MB) → 2048 px JPEG, median {:.0} ms of {runs} (min {:.0}, max {:.0})",
        twelve.len() as f64 / 1e6,
        times[runs / 2],
        times[0],
        times[runs - 1]
    );
}
