//! The `wrackline` binary itself: `export` on a data directory the server wrote.

use std::process::Command;

use crate::helpers::{plain_jpeg, spawn_app, submission};

#[tokio::test]
async fn export_writes_the_same_records_to_a_file() {
    let app = spawn_app().await;
    app.submit(&submission("6f9a4c2e-1d3b-4e5f-8a7b-9c0d1e2f3a4b"), &[plain_jpeg(5)]).await;
    app.submit(&submission("0b7e6d5c-4b3a-4291-8f7e-6d5c4b3a2910"), &[]).await;
    let out = app.data_dir.parent().unwrap().join("records.csv");
    let export = |states: &[&str]| {
        Command::new(env!("CARGO_BIN_EXE_wrackline"))
            .arg("--data-dir")
            .arg(&app.data_dir)
            .args(["export", "--format", "csv", "--out"])
            .arg(&out)
            .args(states)
            .output()
            .unwrap()
    };
    let confirmed_only = export(&[]);
    assert!(confirmed_only.status.success());
    let said = String::from_utf8_lossy(&confirmed_only.stderr);
    assert!(said.contains("wrote 0 records (stored records in review state confirmed)"), "public default: {said}");
    let every_state = export(&["--state", "any"]);
    assert!(every_state.status.success(), "{}", String::from_utf8_lossy(&every_state.stderr));
    let text = std::fs::read_to_string(&out).unwrap();
    assert_eq!(text.lines().count(), 3, "header and two records:\n{text}");
    assert!(text.lines().next().unwrap().starts_with("occurrenceID,basisOfRecord,eventDate"));
}

#[test]
fn an_unknown_export_format_is_refused_by_name() {
    let output = Command::new(env!("CARGO_BIN_EXE_wrackline")).args(["export", "--format", "xls"]).output().unwrap();
    assert!(!output.status.success());
    let message = String::from_utf8_lossy(&output.stderr);
    assert!(message.contains("xls") && message.contains("csv"), "{message}");
}

#[test]
fn demo_walks_load_and_effort_sums_them() {
    // Runs `wrackline demo` long enough to load, then reads the effort back as JSON.
    let dir = tempfile::tempdir().unwrap();
    let mut demo = Command::new(env!("CARGO_BIN_EXE_wrackline"))
        .arg("--data-dir")
        .arg(dir.path())
        .args(["demo", "--bind", "127.0.0.1:0"])
        .stdout(std::process::Stdio::piped())
        .spawn()
        .unwrap();
    let mut stdout = std::io::BufReader::new(demo.stdout.take().unwrap());
    let mut line = String::new();
    while !line.contains("listening on") {
        line.clear();
        assert!(std::io::BufRead::read_line(&mut stdout, &mut line).unwrap() > 0, "demo stopped before serving");
    }
    demo.kill().unwrap();
    demo.wait().unwrap();
    let output = Command::new(env!("CARGO_BIN_EXE_wrackline"))
        .arg("--data-dir")
        .arg(dir.path())
        .args(["effort", "--json"])
        .output()
        .unwrap();
    assert!(output.status.success(), "{}", String::from_utf8_lossy(&output.stderr));
    let rows: serde_json::Value = serde_json::from_slice(&output.stdout).unwrap();
    let walks: u64 = rows.as_array().unwrap().iter().map(|r| r["walks"].as_u64().unwrap()).sum();
    assert_eq!(walks, 40, "every demo walk is counted once");
    let text =
        Command::new(env!("CARGO_BIN_EXE_wrackline")).arg("--data-dir").arg(dir.path()).arg("effort").output().unwrap();
    assert!(String::from_utf8_lossy(&text.stdout).contains("Borth to Ynyslas"));
}
