//! Parallel uploads and parallel derivative remakes decode no more photos at once than
//! the server's decode gate allows, and every request still succeeds: they wait their
//! turn rather than being refused.

use std::sync::Arc;

use crate::helpers::{TestApp, sized_jpeg, spawn_app_with_decode_turns, submission};

const TURNS: usize = 2;
const PARALLEL: usize = 8;

/// Photos of different sizes (so different files), large enough that their decodes
/// overlap when nothing holds them back.
fn photos() -> Vec<Vec<u8>> {
    (0..PARALLEL).map(|i| sized_jpeg(1200 + i as u32 * 8, 900)).collect()
}

#[tokio::test(flavor = "multi_thread", worker_threads = 4)]
async fn parallel_uploads_wait_for_a_decode_turn() {
    let app = Arc::new(spawn_app_with_decode_turns(TURNS).await);
    let uploads: Vec<_> = photos()
        .into_iter()
        .map(|bytes| {
            let app = app.clone();
            tokio::spawn(async move { app.submit(&submission(&uuid::Uuid::new_v4().to_string()), &[bytes]).await })
        })
        .collect();
    for upload in uploads {
        let answer = upload.await.unwrap();
        assert_eq!(
            answer.status, 200,
            "a busy server keeps the request waiting, it does not refuse it: {}",
            answer.body
        );
    }
    assert_eq!(app.records().await.len(), PARALLEL);
    // Without the gate all eight decode side by side on the blocking pool.
    assert_eq!(app.decode_gate.most_at_once(), TURNS, "{PARALLEL} parallel uploads, {TURNS} decode turns");
}

#[tokio::test(flavor = "multi_thread", worker_threads = 4)]
async fn parallel_remakes_of_missing_derivatives_wait_for_a_decode_turn() {
    let app = Arc::new(spawn_app_with_decode_turns(TURNS).await);
    let answer = app.submit(&submission(&uuid::Uuid::new_v4().to_string()), &photos()).await;
    assert_eq!(answer.status, 200, "{}", answer.body);
    assert_eq!(app.decode_gate.most_at_once(), 1, "one record's photos are decoded one after another");
    let shas = remove_display_copies(&app).await;
    let remakes: Vec<_> = shas
        .into_iter()
        .map(|sha| {
            let app = app.clone();
            tokio::spawn(async move { app.get(&format!("/photos/{sha}")).await.status().as_u16() })
        })
        .collect();
    for remake in remakes {
        assert_eq!(remake.await.unwrap(), 200);
    }
    assert_eq!(app.decode_gate.most_at_once(), TURNS, "{PARALLEL} parallel remakes, {TURNS} decode turns");
}

/// Deletes every stored display copy, as if the photos predated derivatives.
async fn remove_display_copies(app: &TestApp) -> Vec<String> {
    let record = app.records().await.pop().unwrap();
    let shas: Vec<String> =
        record["photos"].as_array().unwrap().iter().map(|p| p["sha256"].as_str().unwrap().to_owned()).collect();
    for sha in &shas {
        std::fs::remove_file(app.data_dir.join("photos").join(&sha[..2]).join(format!("{sha}.display.jpg"))).unwrap();
    }
    shas
}
