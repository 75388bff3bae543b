//! A client that starts a large export and stops reading must not stall the server: the
//! export waits on its own read-only connection while submissions go on.

use std::time::Duration;

use tokio::io::{AsyncReadExt as _, AsyncWriteExt as _};
use tokio::net::TcpStream;

use crate::helpers::{spawn_app, submission};

/// Invented records: enough CSV (tens of megabytes) to fill every buffer between the
/// export and a client that does not read.
const RECORDS: u64 = 60_000;

#[tokio::test]
async fn a_stalled_export_does_not_hold_up_submissions() {
    let app = spawn_app().await;
    {
        let mut conn = rusqlite::Connection::open(app.data_dir.join("wrackline.sqlite3")).unwrap();
        wrackline_server::store::synthetic::fill(&mut conn, RECORDS).unwrap();
    }
    let address = app.base.trim_start_matches("http://").to_owned();
    let socket = tokio::net::TcpSocket::new_v4().unwrap();
    socket.set_recv_buffer_size(4096).unwrap();
    let mut stream = socket.connect(address.parse().unwrap()).await.unwrap();
    let request =
        format!("GET /api/export?format=csv&state=any HTTP/1.1\r\nHost: {address}\r\nConnection: close\r\n\r\n");
    stream.write_all(request.as_bytes()).await.unwrap();
    let head = read_head(&mut stream).await;
    assert!(head.starts_with("HTTP/1.1 200"), "{head}");
    // The export is under way once rows of its body arrive. They are only peeked at: this
    // client reads nothing more until the end, so the export soon blocks on it.
    let mut first = [0u8; 1];
    let arrived = tokio::time::timeout(Duration::from_secs(20), stream.peek(&mut first)).await;
    assert_eq!(arrived.expect("the export's first rows never arrived").unwrap(), 1);

    let late = "1b2c3d4e-0000-4000-8000-00000000aaaa";
    let answer = tokio::time::timeout(Duration::from_secs(20), app.submit(&submission(late), &[])).await;
    let answer = answer.expect("a submission must not wait for a download nobody reads");
    assert_eq!(answer.status, 200);

    // The export goes on from where it stopped, and shows the records as they were when it began.
    let body = read_chunked(&mut stream, &head).await;
    let lines = body.lines().count();
    assert_eq!(lines as u64, RECORDS + 1, "a header and every invented record");
    assert!(!body.contains(late), "a read sees the database as it was when it began");
}

/// Reads up to the end of the response head, returning it (and keeping what follows it).
async fn read_head(stream: &mut TcpStream) -> String {
    let mut bytes = Vec::new();
    let mut byte = [0u8; 1];
    while !bytes.ends_with(b"\r\n\r\n") {
        assert_eq!(stream.read(&mut byte).await.unwrap(), 1, "the server closed before the head ended");
        bytes.push(byte[0]);
    }
    String::from_utf8(bytes).unwrap()
}

/// Reads a chunked body (RFC 9112 §7.1) to its end.
async fn read_chunked(stream: &mut TcpStream, head: &str) -> String {
    assert!(head.to_ascii_lowercase().contains("transfer-encoding: chunked"), "{head}");
    let mut raw = Vec::new();
    stream.read_to_end(&mut raw).await.unwrap();
    let mut body = Vec::new();
    let mut at = 0;
    loop {
        let line_end = at + raw[at..].windows(2).position(|w| w == b"\r\n").expect("a chunk size line");
        let size = usize::from_str_radix(std::str::from_utf8(&raw[at..line_end]).unwrap().trim(), 16).unwrap();
        if size == 0 {
            break;
        }
        body.extend_from_slice(&raw[line_end + 2..line_end + 2 + size]);
        at = line_end + 2 + size + 2;
    }
    String::from_utf8(body).unwrap()
}
