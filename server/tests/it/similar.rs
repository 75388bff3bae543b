//! Near-duplicate photos by perceptual hash (64-bit DCT pHash): a resized, re-encoded
//! copy of a photo is near; a different photo is far. The photos are the invented demo
//! drawings in `demo-records/photos/`.

use image::GenericImageView as _;
use wrackline_server::duplicates::photos::{NEAR_DUPLICATE_BITS, hash_distance};
use wrackline_server::intake::images;

use crate::helpers::{TestApp, sized_jpeg, spawn_app, submission};

fn demo_photo(name: &str) -> Vec<u8> {
    std::fs::read(std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("../demo-records/photos").join(name)).unwrap()
}

/// Half the size, JPEG quality 60: what a messaging app does to a photo passed on.
fn resized_copy(jpeg: &[u8]) -> Vec<u8> {
    let image = image::load_from_memory(jpeg).unwrap();
    let (width, height) = image.dimensions();
    let smaller = image.resize_exact(width / 2, height / 2, image::imageops::FilterType::Lanczos3);
    let mut bytes = Vec::new();
    image::codecs::jpeg::JpegEncoder::new_with_quality(&mut bytes, 60).encode_image(&smaller.to_rgb8()).unwrap();
    bytes
}

async fn stored_sha(app: &TestApp, photo: Vec<u8>) -> String {
    let id = uuid::Uuid::new_v4().to_string();
    let answer = app.submit(&submission(&id), &[photo]).await;
    assert_eq!(answer.status, 200, "{}", answer.body);
    answer.body["observation_id"].as_i64().unwrap();
    let records = app.records().await;
    let record = records.iter().find(|r| r["submission"]["client_id"] == id.as_str()).unwrap();
    record["photos"][0]["sha256"].as_str().unwrap().to_owned()
}

fn hash_of(jpeg: &[u8]) -> String {
    let derived = images::derive(jpeg, wrackline_server::intake::photos::PhotoFormat::Jpeg, None).unwrap();
    derived.phash
}

#[test]
fn a_resized_reencoded_copy_is_near_and_other_photos_are_far() {
    let original = demo_photo("catshark.jpg");
    let near = hash_distance(&hash_of(&original), &hash_of(&resized_copy(&original))).unwrap();
    assert!(near <= 4, "resized copy is {near} bits away");
    // Not spurdog.jpg: it is drawn from the same template in the same pose, and is only
    // 4 bits away. pHash sees layout, not species; that is why duplicate review weighs
    // time, place and size too, and a person decides.
    for other in ["ray.jpg", "tope.jpg", "stingray.jpg"] {
        let far = hash_distance(&hash_of(&original), &hash_of(&demo_photo(other))).unwrap();
        assert!(far > NEAR_DUPLICATE_BITS, "{other} is only {far} bits away");
    }
    let pattern = hash_distance(&hash_of(&original), &hash_of(&sized_jpeg(960, 720))).unwrap();
    assert!(pattern > NEAR_DUPLICATE_BITS, "a synthetic pattern is only {pattern} bits away");
}

#[tokio::test]
async fn the_similar_route_lists_the_copy_and_not_the_other_photo() {
    let app = spawn_app().await;
    let original = demo_photo("catshark.jpg");
    let sha = stored_sha(&app, original.clone()).await;
    let copy = stored_sha(&app, resized_copy(&original)).await;
    let other = stored_sha(&app, demo_photo("ray.jpg")).await;
    let near: serde_json::Value = app.get(&format!("/api/photos/{sha}/similar")).await.json().await.unwrap();
    let listed: Vec<&str> = near.as_array().unwrap().iter().map(|p| p["sha256"].as_str().unwrap()).collect();
    assert_eq!(listed, [copy.as_str()], "{near}");
    assert!(!listed.contains(&other.as_str()));
    assert_eq!(near[0]["observation_ids"].as_array().unwrap().len(), 1);
    assert_eq!(app.get(&format!("/api/photos/{}/similar", "0".repeat(64))).await.status(), 404);
}
