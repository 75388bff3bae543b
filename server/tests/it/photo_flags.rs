//! A photo's EXIF time and place against its record's: an old photo or one from
//! elsewhere is flagged for review, and the flag is kept with the record. EXIF written
//! by exiftool; distances checked against GeographicLib 2.0 (`Geodesic.WGS84.Inverse`).
//! The record (helpers::submission) is at 52.4153 N, 4.0829 W (accuracy 8 m), observed
//! 2025-06-01T14:10:00+01:00.

use crate::helpers::{plain_jpeg, spawn_app, submission, with_exiftool};

async fn check_of(tags: &[&str]) -> serde_json::Value {
    let app = spawn_app().await;
    let jpeg = with_exiftool(&plain_jpeg(9), tags, app.data_dir.parent().unwrap());
    let answer = app.submit(&submission("5e4d3c2b-1a09-4f8e-8d7c-6b5a49382716"), &[jpeg]).await;
    assert_eq!(answer.status, 200, "a flag is never a refusal: {}", answer.body);
    app.records().await[0]["photos"][0]["check"].clone()
}

fn near(value: &serde_json::Value, expected: f64, tolerance: f64) -> bool {
    value.as_f64().is_some_and(|v| (v - expected).abs() <= tolerance)
}

#[tokio::test]
async fn a_photo_three_days_older_than_the_record_is_flagged() {
    let check = check_of(&["-DateTimeOriginal=2025:05:29 14:10:00", "-OffsetTimeOriginal=+01:00"]).await;
    assert!(near(&check["seconds_before_record"], 3.0 * 86_400.0, 1e-9), "{check}");
    assert_eq!(check["flags"], serde_json::json!(["taken_long_before_record"]));
}

#[tokio::test]
async fn a_photo_five_kilometres_away_is_flagged() {
    let check =
        check_of(&["-GPSLatitude=52.46", "-GPSLatitudeRef=N", "-GPSLongitude=4.0829", "-GPSLongitudeRef=W"]).await;
    // GeographicLib 2.0: 52.4153,-4.0829 → 52.46,-4.0829 is 4974.0217 m; exiftool's
    // rationals keep ~1e-6° (≈ 0.1 m).
    assert!(near(&check["metres_from_record"], 4974.0217, 0.5), "{check}");
    assert_eq!(check["flags"], serde_json::json!(["taken_far_from_record"]));
}

#[tokio::test]
async fn a_photo_taken_nearby_the_same_day_raises_nothing() {
    let check = check_of(&[
        "-DateTimeOriginal=2025:06:01 12:10:00",
        "-GPSLatitude=52.4153",
        "-GPSLatitudeRef=N",
        "-GPSLongitude=4.07",
        "-GPSLongitudeRef=W",
        "-GPSHPositioningError=20",
    ])
    .await;
    // No OffsetTimeOriginal: the record's +01:00 is used, so two hours before.
    assert!(near(&check["seconds_before_record"], 7200.0, 1e-9), "{check}");
    // GeographicLib 2.0: 52.4153,-4.0829 → 52.4153,-4.07 is 877.7246 m.
    assert!(near(&check["metres_from_record"], 877.7246, 0.5), "{check}");
    assert_eq!(check["flags"], serde_json::json!([]));
}

#[tokio::test]
async fn a_photo_without_exif_has_nothing_to_compare() {
    let check = check_of(&["-Make=Test Camera"]).await;
    assert!(check["seconds_before_record"].is_null() && check["metres_from_record"].is_null(), "{check}");
    assert_eq!(check["flags"], serde_json::json!([]));
}

#[tokio::test]
async fn the_phones_reading_is_kept_apart_and_used_when_the_file_has_no_exif() {
    let app = spawn_app().await;
    let mut record = submission("5e4d3c2b-1a09-4f8e-8d7c-6b5a49382716");
    // What a phone sends for an upload copy made from an original it read (CIPA DC-008 fields).
    record["photo_exif"] = serde_json::json!([{
        "taken_local": "2025:05:29 14:10:00.5", "offset": "+01:00", "taken_at": "1999-01-01T00:00:00Z",
        "offset_source": "record", "latitude": 52.46, "longitude": -4.0829, "altitude_m": 2.0,
        "horizontal_error_m": 5.0, "orientation": 6
    }]);
    let answer = app.submit(&record, &[plain_jpeg(9)]).await;
    assert_eq!(answer.status, 200, "{}", answer.body);
    let photo = &app.records().await[0]["photos"][0];
    assert!(photo["exif"]["taken_at"].is_null(), "the server's own reading of the copy is empty: {photo}");
    // The server works out the instant itself, ignoring the phone's claim.
    assert_eq!(photo["phone_exif"]["taken_at"], "2025-05-29T14:10:00.500+01:00");
    assert_eq!(photo["phone_exif"]["offset_source"], "photo");
    assert_eq!((&photo["check"]["time_reading"], &photo["check"]["place_reading"]), (&"phone".into(), &"phone".into()));
    assert_eq!(photo["check"]["flags"], serde_json::json!(["taken_long_before_record", "taken_far_from_record"]));
}

#[tokio::test]
async fn the_files_own_reading_wins_and_says_so() {
    let check = check_of(&[
        "-DateTimeOriginal=2025:06:01 14:00:00",
        "-GPSLatitude=52.4153",
        "-GPSLatitudeRef=N",
        "-GPSLongitude=4.0829",
        "-GPSLongitudeRef=W",
    ])
    .await;
    assert_eq!((&check["time_reading"], &check["place_reading"]), (&"received_file".into(), &"received_file".into()));
}

/// A record whose one photo (EXIF by exiftool) comes with the phone's reading `phone`.
async fn check_with_phone(tags: &[&str], phone: serde_json::Value) -> serde_json::Value {
    let app = spawn_app().await;
    let jpeg = with_exiftool(&plain_jpeg(9), tags, app.data_dir.parent().unwrap());
    let mut record = submission("5e4d3c2b-1a09-4f8e-8d7c-6b5a49382716");
    record["photo_exif"] = serde_json::json!([phone]);
    let answer = app.submit(&record, &[jpeg]).await;
    assert_eq!(answer.status, 200, "{}", answer.body);
    app.records().await[0]["photos"][0]["check"].clone()
}

#[tokio::test]
async fn a_file_with_a_time_but_no_gps_keeps_the_phones_gps() {
    // The received file says when (2 h before the record) but not where; the phone read
    // GPS 5 km away from the original. Each field comes from the reading that has it.
    let check = check_with_phone(
        &["-DateTimeOriginal=2025:06:01 12:10:00", "-OffsetTimeOriginal=+01:00"],
        serde_json::json!({"taken_local": "2025:06:01 12:10:00", "offset": "+01:00", "latitude": 52.46, "longitude": -4.0829}),
    )
    .await;
    assert_eq!(check["time_reading"], "received_file", "{check}");
    assert_eq!(check["place_reading"], "phone", "{check}");
    assert!(near(&check["seconds_before_record"], 7200.0, 1e-9), "{check}");
    // GeographicLib 2.0: 52.4153,-4.0829 → 52.46,-4.0829 is 4974.0217 m.
    assert!(near(&check["metres_from_record"], 4974.0217, 0.01), "{check}");
    assert_eq!(check["flags"], serde_json::json!(["taken_far_from_record"]));
}

#[tokio::test]
async fn a_file_with_gps_but_no_time_keeps_the_phones_time() {
    let check = check_with_phone(
        &["-GPSLatitude=52.4153", "-GPSLatitudeRef=N", "-GPSLongitude=4.0829", "-GPSLongitudeRef=W"],
        serde_json::json!({"taken_local": "2025:05:29 14:10:00", "offset": "+01:00"}),
    )
    .await;
    assert_eq!(
        (&check["time_reading"], &check["place_reading"]),
        (&"phone".into(), &"received_file".into()),
        "{check}"
    );
    assert!(near(&check["seconds_before_record"], 3.0 * 86_400.0, 1e-9), "{check}");
    assert_eq!(check["flags"], serde_json::json!(["taken_long_before_record"]));
}

#[tokio::test]
async fn a_photo_taken_before_a_clock_change_keeps_the_phones_offset_at_that_time() {
    // Taken Saturday 29 March 2025, 14:00 in London (GMT, +00:00), no OffsetTimeOriginal;
    // the record made on Monday 31 March at 10:00 BST (+01:00), after UK clocks went
    // forward on Sunday 30 March (last Sunday of March, from memory). The phone sends
    // the offset it had at the photo's local time; the server uses it, not the record's.
    let app = spawn_app().await;
    let mut record = submission("5e4d3c2b-1a09-4f8e-8d7c-6b5a49382716");
    record["observed_at"] = "2025-03-31T10:00:00+01:00".into();
    record["photo_exif"] = serde_json::json!([{"taken_local": "2025:03:29 14:00:00", "device_offset": "+00:00"}]);
    // The file itself (an original, as an older app sent) has the same time, no offset.
    let jpeg =
        with_exiftool(&plain_jpeg(9), &["-DateTimeOriginal=2025:03:29 14:00:00"], app.data_dir.parent().unwrap());
    let answer = app.submit(&record, &[jpeg]).await;
    assert_eq!(answer.status, 200, "{}", answer.body);
    let photo = &app.records().await[0]["photos"][0];
    for reading in [&photo["phone_exif"], &photo["exif"]] {
        assert_eq!(
            reading["taken_at"], "2025-03-29T14:00:00Z",
            "14:00 at +00:00, not 13:00Z as the record's +01:00 would make it: {photo}"
        );
        assert_eq!(reading["offset_source"], "device", "{photo}");
    }
    assert_eq!(photo["phone_exif"]["device_offset"], "+00:00");
    // 2025-03-31T09:00Z − 2025-03-29T14:00Z = 43 h.
    assert!(near(&photo["check"]["seconds_before_record"], 43.0 * 3600.0, 1e-9), "{photo}");
}

#[tokio::test]
async fn more_phone_readings_than_photos_is_refused() {
    let app = spawn_app().await;
    let mut record = submission("5e4d3c2b-1a09-4f8e-8d7c-6b5a49382716");
    record["photo_exif"] = serde_json::json!([{}, {}]);
    let answer = app.submit(&record, &[plain_jpeg(9)]).await;
    assert_eq!(answer.status, 422, "{}", answer.body);
    assert_eq!(answer.body["field"], "photo_exif");
    assert!(app.records().await.is_empty());
}
