//! EXIF read from JPEGs whose tags were written by exiftool, the reference writer, and
//! checked against the values given to it. Tag meanings per CIPA DC-008 (Exif 2.32):
//! DateTimeOriginal is local time with no zone, OffsetTimeOriginal its "±HH:MM" offset,
//! SubSecTimeOriginal the fraction; GPS latitude/longitude are three RATIONALs
//! (degrees, minutes, seconds) with N/S and E/W references; GPSAltitudeRef 1 is below
//! sea level; GPSHPositioningError is in metres.

use crate::helpers::{plain_jpeg, spawn_app, submission, with_exiftool};

async fn photo_exif(tags: &[&str]) -> serde_json::Value {
    let app = spawn_app().await;
    let jpeg = with_exiftool(&plain_jpeg(7), tags, app.data_dir.parent().unwrap());
    let answer = app.submit(&submission("3c2b1a09-8f7e-4d6c-9b5a-493827160504"), &[jpeg]).await;
    assert_eq!(answer.status, 200, "{}", answer.body);
    app.records().await[0]["photos"][0]["exif"].clone()
}

fn close(value: &serde_json::Value, expected: f64, tolerance: f64) -> bool {
    value.as_f64().is_some_and(|v| (v - expected).abs() <= tolerance)
}

#[tokio::test]
async fn time_offset_and_position_written_by_exiftool_are_read_back() {
    let exif = photo_exif(&[
        "-DateTimeOriginal=2025:06:01 14:05:09",
        "-OffsetTimeOriginal=+01:00",
        "-SubSecTimeOriginal=250",
        "-GPSLatitude=52.4153",
        "-GPSLatitudeRef=N",
        "-GPSLongitude=4.0829",
        "-GPSLongitudeRef=W",
        "-GPSAltitude=3.5",
        "-GPSAltitudeRef#=0",
        "-GPSHPositioningError=7.5",
        "-Orientation#=6",
    ])
    .await;
    assert_eq!(exif["taken_local"], "2025:06:01 14:05:09.250");
    assert_eq!(exif["offset"], "+01:00");
    assert_eq!(exif["taken_at"], "2025-06-01T14:05:09.250+01:00");
    assert_eq!(exif["offset_source"], "photo");
    // exiftool stores decimal degrees as d/m/s rationals; 1e-6° is about 0.1 m.
    assert!(close(&exif["latitude"], 52.4153, 1e-6), "{exif}");
    assert!(close(&exif["longitude"], -4.0829, 1e-6), "W is negative: {exif}");
    assert!(close(&exif["altitude_m"], 3.5, 1e-9), "{exif}");
    assert!(close(&exif["horizontal_error_m"], 7.5, 1e-9), "{exif}");
    assert_eq!(exif["orientation"], 6, "rotate 90 clockwise (CIPA DC-008 Orientation 6)");
}

#[tokio::test]
async fn southern_and_eastern_references_and_below_sea_level_are_signed() {
    let exif = photo_exif(&[
        "-GPSLatitude=33.9249",
        "-GPSLatitudeRef=S",
        "-GPSLongitude=18.4241",
        "-GPSLongitudeRef=E",
        "-GPSAltitude=2",
        "-GPSAltitudeRef#=1",
    ])
    .await;
    assert!(close(&exif["latitude"], -33.9249, 1e-6), "{exif}");
    assert!(close(&exif["longitude"], 18.4241, 1e-6), "{exif}");
    assert!(close(&exif["altitude_m"], -2.0, 1e-9), "{exif}");
    assert!(exif["taken_at"].is_null());
}

#[tokio::test]
async fn a_photo_without_an_offset_takes_the_record_offset_and_says_so() {
    // The record was made at +01:00 (see helpers::submission).
    let exif = photo_exif(&["-DateTimeOriginal=2025:06:01 14:05:09"]).await;
    assert!(exif["offset"].is_null());
    assert_eq!(exif["taken_at"], "2025-06-01T14:05:09+01:00");
    assert_eq!(exif["offset_source"], "record");
}

#[tokio::test]
async fn a_photo_with_no_exif_has_no_exif_facts() {
    let app = spawn_app().await;
    app.submit(&submission("3c2b1a09-8f7e-4d6c-9b5a-493827160504"), &[plain_jpeg(1)]).await;
    let exif = &app.records().await[0]["photos"][0]["exif"];
    assert!(exif["taken_at"].is_null() && exif["latitude"].is_null(), "{exif}");
}
