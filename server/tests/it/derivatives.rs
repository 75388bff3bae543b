//! What the server serves of a photo: a display copy and a thumbnail, upright, with no
//! EXIF (read back with exiftool, the reference reader); the original as received.
//! Orientation is checked pixel for pixel against Pillow 11.3.0's
//! `ImageOps.exif_transpose` (fixtures made by `tests/fixtures/orientation/make_orientation.py`).

use std::path::PathBuf;

use wrackline_server::intake::exif;
use wrackline_server::intake::images;
use wrackline_server::intake::photos::PhotoFormat;

use crate::helpers::{exiftool_tags, sized_jpeg, spawn_app, submission, with_exiftool};

const ID: &str = "2a3b4c5d-6e7f-4a8b-9c0d-1e2f3a4b5c6d";

const GPS_AND_TIME: &[&str] = &[
    "-DateTimeOriginal=2025:06:01 14:05:09",
    "-OffsetTimeOriginal=+01:00",
    "-GPSLatitude=52.4153",
    "-GPSLatitudeRef=N",
    "-GPSLongitude=4.0829",
    "-GPSLongitudeRef=W",
    "-GPSHPositioningError=7.5",
    "-Make=Test Camera",
    "-SerialNumber=123456",
];

fn size_of(jpeg: &[u8]) -> (u32, u32) {
    let image = image::load_from_memory_with_format(jpeg, image::ImageFormat::Jpeg).expect("a JPEG");
    (image.width(), image.height())
}

#[tokio::test]
async fn derivatives_are_smaller_upright_and_carry_no_exif_while_the_original_keeps_it() {
    let app = spawn_app().await;
    let scratch = app.data_dir.parent().unwrap().to_owned();
    // Orientation 6: the camera was turned; the stored 2000 × 1500 is shown 1500 × 2000 (CIPA DC-008).
    let tags: Vec<&str> = GPS_AND_TIME.iter().copied().chain(["-Orientation#=6"]).collect();
    let original = with_exiftool(&sized_jpeg(2000, 1500), &tags, &scratch);
    let answer = app.submit(&submission(ID), std::slice::from_ref(&original)).await;
    assert_eq!(answer.status, 200, "{}", answer.body);
    let photo = &app.records().await[0]["photos"][0];
    assert_eq!((photo["width"].as_u64(), photo["height"].as_u64()), (Some(2000), Some(1500)));
    let sha = photo["sha256"].as_str().unwrap();

    let display = app.get(&format!("/photos/{sha}")).await.bytes().await.unwrap().to_vec();
    let thumb = app.get(&format!("/photos/{sha}/thumb")).await.bytes().await.unwrap().to_vec();
    let served_original = app.get(&format!("/photos/{sha}/original")).await.bytes().await.unwrap().to_vec();
    assert_eq!(size_of(&display), (960, 1280), "long edge 1280, turned upright");
    assert_eq!(size_of(&thumb), (240, 320), "long edge 320, turned upright");
    assert_eq!(served_original, original, "the original is the file as received");

    // exiftool reads the original's GPS (so the check below can fail) and none in the copies.
    let original_tags = exiftool_tags(&served_original, &scratch);
    assert!(original_tags.iter().any(|t| t == "GPS:GPSLatitude"), "{original_tags:?}");
    for (name, bytes) in [("display", &display), ("thumb", &thumb)] {
        let tags = exiftool_tags(bytes, &scratch);
        let leaked: Vec<&String> = tags
            .iter()
            .filter(|t| t.starts_with("GPS:") || t.starts_with("IFD0:") || t.starts_with("ExifIFD:"))
            .collect();
        assert!(leaked.is_empty(), "{name} carries EXIF: {leaked:?} (all tags: {tags:?})");
    }
}

#[tokio::test]
async fn a_small_photo_is_not_enlarged() {
    let app = spawn_app().await;
    app.submit(&submission(ID), &[sized_jpeg(300, 200)]).await;
    let sha = app.records().await[0]["photos"][0]["sha256"].as_str().unwrap().to_owned();
    let display = app.get(&format!("/photos/{sha}")).await.bytes().await.unwrap();
    assert_eq!(size_of(&display), (300, 200));
}

#[tokio::test]
async fn derivatives_missing_on_disk_are_made_again_from_the_original() {
    let app = spawn_app().await;
    app.submit(&submission(ID), &[sized_jpeg(1600, 900)]).await;
    let sha = app.records().await[0]["photos"][0]["sha256"].as_str().unwrap().to_owned();
    let display_file = app.data_dir.join("photos").join(&sha[..2]).join(format!("{sha}.display.jpg"));
    std::fs::remove_file(&display_file).unwrap();
    let display = app.get(&format!("/photos/{sha}")).await;
    assert_eq!(display.status(), 200);
    assert_eq!(size_of(&display.bytes().await.unwrap()), (1280, 720));
    assert!(display_file.exists());
}

#[tokio::test]
async fn unknown_photos_are_not_found_in_every_rendition() {
    let app = spawn_app().await;
    let unknown = "0".repeat(64);
    for path in
        [format!("/photos/{unknown}"), format!("/photos/{unknown}/thumb"), format!("/photos/{unknown}/original")]
    {
        assert_eq!(app.get(&path).await.status(), 404, "{path}");
    }
}

fn fixture(name: &str) -> Vec<u8> {
    let path = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("tests/fixtures/orientation").join(name);
    std::fs::read(&path).unwrap_or_else(|err| panic!("{}: {err}", path.display()))
}

#[test]
fn orientation_one_to_eight_matches_pillow_exif_transpose_pixel_for_pixel() {
    for orientation in 1..=8 {
        let oriented = fixture(&format!("oriented-{orientation}.png"));
        // The Orientation tag is read by our EXIF reader from the PNG's eXIf chunk.
        let read = exif::read(&oriented).orientation;
        assert_eq!(read, Some(orientation), "Orientation written by Pillow 11.3.0");
        let (ours, _) = images::upright(&oriented, PhotoFormat::Png, read).unwrap();
        let pillow = image::load_from_memory(&fixture(&format!("upright-{orientation}.png"))).unwrap().to_rgb8();
        assert_eq!(
            ours.to_rgb8(),
            pillow,
            "Orientation {orientation}: ours differs from Pillow 11.3.0 ImageOps.exif_transpose"
        );
    }
}
