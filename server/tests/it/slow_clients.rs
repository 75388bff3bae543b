//! Slow and idle clients, and many at once: a raw TCP client against the real server
//! with short timeouts set, so a client that never finishes its headers, sits idle on a
//! kept-alive connection or trickles its body is cut off, the number of open
//! connections stays capped, and the health check is answered again once the slow ones
//! are gone. Waits are bounded generously (these check that a limit exists, not how
//! fast anything is).

use std::time::Duration;

use tokio::io::{AsyncReadExt as _, AsyncWriteExt as _};
use tokio::net::TcpStream;
use wrackline_server::settings::Settings;

use crate::helpers::{TestApp, spawn_app_with_settings};

/// Far longer than any timeout set here, far shorter than forever.
const PATIENCE: Duration = Duration::from_secs(15);

fn short_timeouts() -> Settings {
    Settings { header_timeout_s: 1, body_idle_timeout_s: 1, body_deadline_s: 3, ..Settings::default() }
}

async fn connect(app: &TestApp) -> TcpStream {
    TcpStream::connect(app.base.trim_start_matches("http://")).await.expect("connect")
}

/// Everything the server sends until it closes the connection (or `PATIENCE` runs out:
/// then `None`).
async fn until_closed(stream: &mut TcpStream) -> Option<String> {
    let mut got = Vec::new();
    let read = tokio::time::timeout(PATIENCE, async {
        let mut buffer = [0u8; 4096];
        loop {
            match stream.read(&mut buffer).await {
                Ok(0) | Err(_) => return,
                Ok(n) => got.extend_from_slice(&buffer[..n]),
            }
        }
    })
    .await;
    read.ok().map(|()| String::from_utf8_lossy(&got).into_owned())
}

#[tokio::test]
async fn a_client_that_never_finishes_its_headers_is_cut_off() {
    let app = spawn_app_with_settings(short_timeouts()).await;
    let mut stream = connect(&app).await;
    stream.write_all(b"POST /api/observations HTTP/1.1\r\nHost: 127.0.0.1\r\n").await.unwrap();
    let said = until_closed(&mut stream).await;
    assert!(said.is_some(), "the connection was still open after {PATIENCE:?}");
}

#[tokio::test]
async fn a_kept_alive_connection_left_idle_is_closed() {
    let app = spawn_app_with_settings(short_timeouts()).await;
    let mut stream = connect(&app).await;
    stream.write_all(b"GET /healthz HTTP/1.1\r\nHost: 127.0.0.1\r\n\r\n").await.unwrap();
    let said = until_closed(&mut stream).await.expect("closed after the idle time");
    assert!(said.starts_with("HTTP/1.1 200"), "the request itself was answered: {said:?}");
}

/// Multipart headers for a record upload whose body is `length` bytes.
fn upload_head(length: usize) -> Vec<u8> {
    format!(
        "POST /api/observations HTTP/1.1\r\nHost: 127.0.0.1\r\nContent-Type: multipart/form-data; boundary=XX\r\nContent-Length: {length}\r\n\r\n"
    )
    .into_bytes()
}

#[tokio::test]
async fn a_body_that_stops_arriving_is_answered_408() {
    let app = spawn_app_with_settings(short_timeouts()).await;
    let mut stream = connect(&app).await;
    stream.write_all(&upload_head(100_000)).await.unwrap();
    stream
        .write_all(b"--XX\r\nContent-Disposition: form-data; name=\"photo\"; filename=\"p.jpg\"\r\n\r\n\xFF\xD8\xFF")
        .await
        .unwrap();
    let said = until_closed(&mut stream).await.expect("answered and closed");
    assert!(said.starts_with("HTTP/1.1 408"), "{said}");
    assert!(said.contains("the upload stopped arriving"), "{said}");
    assert_eq!(scratch_files(&app), 0, "the part received is not kept");
}

#[tokio::test]
async fn a_body_trickled_slower_than_its_deadline_is_answered_408() {
    let app = spawn_app_with_settings(short_timeouts()).await;
    let mut stream = connect(&app).await;
    stream.write_all(&upload_head(100_000)).await.unwrap();
    stream
        .write_all(b"--XX\r\nContent-Disposition: form-data; name=\"photo\"; filename=\"p.jpg\"\r\n\r\n")
        .await
        .unwrap();
    // A byte every 300 ms never trips the idle timeout (1 s), only the deadline (3 s).
    let trickle = async {
        for _ in 0..100 {
            if stream.write_all(b"x").await.is_err() {
                break;
            }
            tokio::time::sleep(Duration::from_millis(300)).await;
        }
    };
    let _ = tokio::time::timeout(PATIENCE, trickle).await;
    let said = until_closed(&mut stream).await.expect("answered and closed");
    assert!(said.starts_with("HTTP/1.1 408"), "{said}");
}

#[tokio::test]
async fn open_connections_are_capped_and_the_health_check_comes_back_once_the_slow_ones_are_cut_off() {
    let settings = Settings { max_connections: 16, header_timeout_s: 3, ..Settings::default() };
    let app = spawn_app_with_settings(settings).await;
    let mut slow = Vec::new();
    for _ in 0..40 {
        let mut stream = connect(&app).await;
        let _ = stream.write_all(b"GET /healthz HTTP/1.1\r\n").await;
        slow.push(stream);
    }
    // Those over the cap are closed as they come; the rest wait for the header timeout
    // (3 s), so within the first second exactly the ones over the cap are closed.
    let closed = futures_util::future::join_all(slow.iter_mut().map(|stream| async move {
        let mut byte = [0u8; 1];
        matches!(tokio::time::timeout(Duration::from_secs(1), stream.read(&mut byte)).await, Ok(Ok(0) | Err(_)))
    }))
    .await;
    let closed_at_once = closed.iter().filter(|c| **c).count();
    // The test client's own kept-alive connection (the sign-in's) may hold one more place.
    assert!(
        (40 - 16..=40 - 16 + 2).contains(&closed_at_once),
        "at most 16 stay open and the rest are closed as they come: {closed_at_once} of 40 closed"
    );
    let fresh = reqwest::Client::new();
    let healthy = tokio::time::timeout(PATIENCE, async {
        loop {
            if let Ok(answer) = fresh.get(format!("{}/healthz", app.base)).send().await
                && answer.status() == 200
            {
                return;
            }
            tokio::time::sleep(Duration::from_millis(100)).await;
        }
    })
    .await;
    assert!(healthy.is_ok(), "the health check was not answered within {PATIENCE:?}");
    drop(slow);
}

/// Files in the photo folder's scratch folder.
fn scratch_files(app: &TestApp) -> usize {
    std::fs::read_dir(app.data_dir.join("photos/tmp")).map_or(0, |d| d.count())
}
