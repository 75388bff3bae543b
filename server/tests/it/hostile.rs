//! Hostile photo files, each sent as the one photo of an otherwise valid record. Every
//! one is either refused with a 4xx that names the problem (and nothing is stored), or
//! accepted harmlessly where that is right; the server answers `/healthz` after each.
//!
//! Accepted harmlessly, by design: faulty EXIF (a loop, absurd counts) is "no EXIF
//! facts", never a refusal (the photo is still evidence); a JPEG cut short in its scan
//! data decodes as far as its data goes (the rest grey) and is kept, because it may be
//! the only copy of the observer's evidence; a JPEG with bytes appended
//! after its end (a JPEG/ZIP or JPEG/HTML polyglot) decodes as the JPEG it is — what the
//! server serves beyond reviewers is re-encoded from pixels, so the appended part never
//! leaves it, and the original is sent with `X-Content-Type-Options: nosniff`.

use crate::helpers::{TestApp, plain_jpeg, sized_jpeg, spawn_app, submission};

const ID: &str = "9d8c7b6a-5f4e-4d3c-8b2a-1f0e9d8c7b6a";

enum Expect {
    /// Refused with this status and a message containing these words.
    Refused(u16, &'static str),
    /// Stored; the served display copy is a clean JPEG.
    Accepted,
}

async fn check(app: &TestApp, name: &str, bytes: Vec<u8>, expect: Expect) {
    let before = app.records().await.len();
    let answer = app.submit(&submission(&uuid::Uuid::new_v4().to_string()), &[bytes]).await;
    match expect {
        Expect::Refused(status, words) => {
            assert_eq!(answer.status, status, "{name}: {}", answer.body);
            let message = answer.body["error"].as_str().unwrap_or_default();
            assert!(
                message.starts_with("photo 1: ") && message.contains(words),
                "{name}: {message:?} should say {words:?}"
            );
            assert_eq!(app.records().await.len(), before, "{name}: a refused record must store nothing");
        }
        Expect::Accepted => {
            assert_eq!(answer.status, 200, "{name}: {}", answer.body);
            let records = app.records().await;
            let sha = records.last().unwrap()["photos"][0]["sha256"].as_str().unwrap().to_owned();
            let display = app.get(&format!("/photos/{sha}")).await.bytes().await.unwrap();
            assert!(
                image::load_from_memory_with_format(&display, image::ImageFormat::Jpeg).is_ok(),
                "{name}: display copy"
            );
        }
    }
    assert_eq!(app.get("/healthz").await.status(), 200, "{name}: the server must still be serving");
}

#[tokio::test]
async fn hostile_files_are_refused_cleanly_or_accepted_harmlessly() {
    let app = spawn_app().await;
    let jpeg = sized_jpeg(400, 300);
    let cases: Vec<(&str, Vec<u8>, Expect)> = vec![
        ("zero bytes", Vec::new(), Expect::Refused(415, "empty")),
        (
            "text renamed .jpg",
            b"Dear reviewer, this is not a photo.\n".to_vec(),
            Expect::Refused(415, "not a JPEG or PNG"),
        ),
        (
            "JPEG magic then text",
            [&[0xFF, 0xD8, 0xFF][..], b"<html><script>alert(1)</script>"].concat(),
            Expect::Refused(422, "header could not be read"),
        ),
        ("truncated JPEG (header only)", jpeg[..200].to_vec(), Expect::Refused(422, "could not be")),
        ("truncated JPEG (half the scan)", jpeg[..jpeg.len() / 2].to_vec(), Expect::Accepted),
        (
            "PNG declaring 100 000 × 100 000",
            png_declaring(100_000, 100_000),
            Expect::Refused(413, "100000 × 100000 pixels"),
        ),
        ("PNG declaring 0 × 0", png_declaring(0, 0), Expect::Refused(422, "header could not be read")),
        (
            "JPEG declaring 65 500 × 65 500",
            jpeg_declaring(&jpeg, 65_500, 65_500),
            Expect::Refused(413, "65500 × 65500 pixels"),
        ),
        (
            "JPEG declaring 20 000 × 4 000 (too long a side)",
            jpeg_declaring(&jpeg, 20_000, 4_000),
            Expect::Refused(413, "16384 px a side"),
        ),
        ("EXIF IFD loop (IFD0 points to itself)", with_app1(&jpeg, &tiff_ifd_loop()), Expect::Accepted),
        ("EXIF with huge declared counts", with_app1(&jpeg, &tiff_huge_counts()), Expect::Accepted),
        ("PNG chunk declaring 2 GiB of data", png_with_huge_chunk(), Expect::Refused(422, "could not be")),
        (
            "JPEG segment declaring more bytes than the file",
            jpeg_with_long_segment(&jpeg),
            Expect::Refused(422, "could not be"),
        ),
        ("polyglot: JPEG with a ZIP appended", [jpeg.clone(), zip_with_html()].concat(), Expect::Accepted),
        (
            "polyglot: HTML that starts like a PNG",
            [&png_declaring(16, 16)[..33], b"<html><body>hi</body></html>"].concat(),
            Expect::Refused(422, "could not be"),
        ),
    ];
    for (name, bytes, expect) in cases {
        check(&app, name, bytes, expect).await;
    }
}

/// Photo files stored (originals and derivatives), the scratch folder left out.
fn stored_files(app: &TestApp) -> usize {
    let root = app.data_dir.join("photos");
    std::fs::read_dir(&root)
        .unwrap()
        .flatten()
        .filter(|e| e.file_name() != "tmp")
        .map(|e| std::fs::read_dir(e.path()).map_or(0, |d| d.count()))
        .sum()
}

/// A record over a size limit is refused with 413 and a message naming the limit; nothing
/// of it is stored and the server goes on serving.
async fn check_over_limit(app: &TestApp, name: &str, photos: &[Vec<u8>], words: &str) {
    let before = app.records().await.len();
    let answer = app.submit(&submission(&uuid::Uuid::new_v4().to_string()), photos).await;
    assert_eq!(answer.status, 413, "{name}: {}", answer.body);
    let message = answer.body["error"].as_str().unwrap_or_default();
    assert!(message.contains(words), "{name}: {message:?} should say {words:?}");
    assert_eq!(app.records().await.len(), before, "{name}: a refused record must store nothing");
    assert_eq!(stored_files(app), 0, "{name}: no photo file may be written");
    assert_eq!(app.get("/healthz").await.status(), 200, "{name}: the server must still be serving");
}

#[tokio::test]
async fn a_photo_one_byte_over_the_limit_and_a_record_with_one_photo_too_many_are_refused() {
    let app = spawn_app().await;
    let mut over = sized_jpeg(400, 300);
    over.resize(25 * 1024 * 1024 + 1, 0);
    check_over_limit(
        &app,
        "one byte over 25 MiB",
        &[over],
        "photo 1: it is larger than the limit of 25 MiB (26214400 bytes) for one photo",
    )
    .await;
    let thirteen: Vec<Vec<u8>> = (0..13).map(|i| plain_jpeg(i as u8)).collect();
    check_over_limit(&app, "13 photos", &thirteen, "at most 12 photos, this one has 13").await;
    // The limits themselves pass: exactly 25 MiB is not refused for its size, 12 photos are fine.
    let mut exactly = sized_jpeg(400, 300);
    exactly.resize(25 * 1024 * 1024, 0);
    let twelve: Vec<Vec<u8>> = (0..12).map(|i| plain_jpeg(i as u8)).collect();
    for (name, photos) in [("exactly 25 MiB", vec![exactly]), ("12 photos", twelve)] {
        let answer = app.submit(&submission(&uuid::Uuid::new_v4().to_string()), &photos).await;
        assert_eq!(answer.status, 200, "{name}: {}", answer.body);
    }
}

#[tokio::test]
async fn a_faulty_exif_block_gives_no_exif_facts() {
    let app = spawn_app().await;
    let answer = app.submit(&submission(ID), &[with_app1(&plain_jpeg(2), &tiff_ifd_loop())]).await;
    assert_eq!(answer.status, 200, "{}", answer.body);
    let exif = &app.records().await[0]["photos"][0]["exif"];
    assert!(exif["latitude"].is_null() && exif["taken_local"].is_null(), "{exif}");
}

#[tokio::test]
async fn a_bad_second_photo_refuses_the_record_and_stores_no_file() {
    let app = spawn_app().await;
    let answer = app.submit(&submission(ID), &[plain_jpeg(1), png_declaring(100_000, 100_000)]).await;
    assert_eq!(answer.status, 413, "{}", answer.body);
    assert!(answer.body["error"].as_str().unwrap().starts_with("photo 2: "), "{}", answer.body);
    assert!(app.records().await.is_empty());
    let files =
        std::fs::read_dir(app.data_dir.join("photos")).unwrap().flatten().filter(|e| e.file_name() != "tmp").count();
    assert_eq!(files, 0, "the good first photo must not be written before the bad second one is found");
}

#[tokio::test]
async fn the_original_is_sent_with_nosniff() {
    let app = spawn_app().await;
    app.submit(&submission(ID), &[[plain_jpeg(4), zip_with_html()].concat()]).await;
    let sha = app.records().await[0]["photos"][0]["sha256"].as_str().unwrap().to_owned();
    for path in [format!("/photos/{sha}"), format!("/photos/{sha}/thumb"), format!("/photos/{sha}/original")] {
        let response = app.get(&path).await;
        assert_eq!(response.headers()["x-content-type-options"], "nosniff", "{path}");
        assert_eq!(response.headers()["content-type"], "image/jpeg", "{path}");
    }
}

/// A PNG signature and an IHDR chunk declaring `width` × `height` (8-bit RGB), with a
/// correct CRC (PNG specification, ISO/IEC 15948), then a tiny IDAT and IEND.
fn png_declaring(width: u32, height: u32) -> Vec<u8> {
    let mut ihdr = Vec::new();
    ihdr.extend(width.to_be_bytes());
    ihdr.extend(height.to_be_bytes());
    ihdr.extend([8, 2, 0, 0, 0]);
    let mut png = vec![0x89, b'P', b'N', b'G', 0x0D, 0x0A, 0x1A, 0x0A];
    png.extend(chunk(b"IHDR", &ihdr));
    png.extend(chunk(b"IDAT", &[0x78, 0x9C, 0x63, 0x00, 0x00, 0x00, 0x01, 0x00, 0x01]));
    png.extend(chunk(b"IEND", &[]));
    png
}

/// A 16 × 16 PNG whose IDAT chunk claims 0x7FFF_FFFF bytes (the PNG maximum) and holds 9.
fn png_with_huge_chunk() -> Vec<u8> {
    let mut png = png_declaring(16, 16);
    let idat = png.windows(4).position(|w| w == b"IDAT").expect("an IDAT chunk") - 4;
    png[idat..idat + 4].copy_from_slice(&0x7FFF_FFFFu32.to_be_bytes());
    png
}

/// The JPEG with an APP2 segment right after SOI whose length field claims 65 535 bytes
/// and whose data stops after 16 (JPEG, ITU-T T.81 B.1.1.4).
fn jpeg_with_long_segment(jpeg: &[u8]) -> Vec<u8> {
    let mut segment = vec![0xFF, 0xE2, 0xFF, 0xFF];
    segment.extend([0x41; 16]);
    [&jpeg[..2], &segment[..]].concat()
}

fn chunk(kind: &[u8; 4], data: &[u8]) -> Vec<u8> {
    let mut out = (data.len() as u32).to_be_bytes().to_vec();
    out.extend(kind);
    out.extend(data);
    let mut crc = crc32fast::Hasher::new();
    crc.update(kind);
    crc.update(data);
    out.extend(crc.finalize().to_be_bytes());
    out
}

/// The JPEG with its SOF0 frame header rewritten to declare another size (JPEG,
/// ITU-T T.81 B.2.2: after FFC0, length(2), precision(1), height(2), width(2)).
fn jpeg_declaring(jpeg: &[u8], width: u16, height: u16) -> Vec<u8> {
    let mut out = jpeg.to_vec();
    let at = out.windows(2).position(|w| w == [0xFF, 0xC0]).expect("a baseline JPEG has SOF0");
    out[at + 5..at + 7].copy_from_slice(&height.to_be_bytes());
    out[at + 7..at + 9].copy_from_slice(&width.to_be_bytes());
    out
}

/// The JPEG with an APP1 "Exif" segment carrying `tiff` inserted after SOI (CIPA DC-008 §4.5.4).
fn with_app1(jpeg: &[u8], tiff: &[u8]) -> Vec<u8> {
    let mut segment = vec![0xFF, 0xE1];
    segment.extend(((tiff.len() + 8) as u16).to_be_bytes());
    segment.extend(b"Exif\0\0");
    segment.extend(tiff);
    [&jpeg[..2], &segment[..], &jpeg[2..]].concat()
}

/// Big-endian TIFF whose IFD0 holds an Exif IFD pointer and a GPS IFD pointer that both
/// point back at IFD0, and whose next-IFD offset is IFD0 itself.
fn tiff_ifd_loop() -> Vec<u8> {
    let mut tiff = b"MM\0\x2a\0\0\0\x08".to_vec();
    tiff.extend(2u16.to_be_bytes());
    tiff.extend(entry(0x8769, 4, 1, 8));
    tiff.extend(entry(0x8825, 4, 1, 8));
    tiff.extend(8u32.to_be_bytes());
    tiff
}

/// Big-endian TIFF whose IFD0 claims 65 535 entries, the first of which is an ASCII Make
/// of 4 294 967 295 bytes.
fn tiff_huge_counts() -> Vec<u8> {
    let mut tiff = b"MM\0\x2a\0\0\0\x08".to_vec();
    tiff.extend(u16::MAX.to_be_bytes());
    tiff.extend(entry(0x010F, 2, u32::MAX, 8));
    tiff.extend(entry(0x8825, 4, 1, 8));
    tiff
}

fn entry(tag: u16, kind: u16, count: u32, value: u32) -> Vec<u8> {
    [
        tag.to_be_bytes().to_vec(),
        kind.to_be_bytes().to_vec(),
        count.to_be_bytes().to_vec(),
        value.to_be_bytes().to_vec(),
    ]
    .concat()
}

/// A stored (uncompressed) ZIP holding `index.html` (PKWARE APPNOTE 4.3: local header,
/// data, central directory, end record), so "JPEG + ZIP" opens as either.
fn zip_with_html() -> Vec<u8> {
    let name = b"index.html";
    let data = b"<html><script>alert('polyglot')</script></html>";
    let crc = crc32fast::hash(data);
    let sizes = [crc.to_le_bytes(), (data.len() as u32).to_le_bytes(), (data.len() as u32).to_le_bytes()].concat();
    let mut zip = b"PK\x03\x04\x14\0\0\0\0\0\0\0\0\0".to_vec();
    zip.extend(&sizes);
    zip.extend((name.len() as u16).to_le_bytes());
    zip.extend(0u16.to_le_bytes());
    zip.extend(name);
    zip.extend(data);
    let central_at = zip.len() as u32;
    let mut central = b"PK\x01\x02\x14\0\x14\0\0\0\0\0\0\0\0\0".to_vec();
    central.extend(&sizes);
    central.extend((name.len() as u16).to_le_bytes());
    central.extend([0u8; 12]);
    central.extend(0u32.to_le_bytes());
    central.extend(name);
    let central_len = central.len() as u32;
    zip.extend(central);
    zip.extend(b"PK\x05\x06\0\0\0\0\x01\0\x01\0");
    zip.extend(central_len.to_le_bytes());
    zip.extend(central_at.to_le_bytes());
    zip.extend(0u16.to_le_bytes());
    zip
}
