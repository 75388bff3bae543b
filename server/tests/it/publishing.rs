//! The published dataset a harvester polls: `/dataset/archive.zip` and
//! `/dataset/eml.xml`, their identity (ETag, Last-Modified, the EML packageId's version)
//! kept while the published data stay the same and moved when they change, conditional
//! GET answered 304 (RFC 9110 §13), the operator's dataset description in the EML as
//! Python's XML parser reads it, and only the public form in the archive.

use std::io::Read as _;

use wrackline_server::settings::{Bounds, Dataset, Licence, Settings};

use crate::helpers::{TestApp, plain_jpeg, spawn_app_with_settings, submission};
use crate::python::run_script;

const FIRST: &str = "6f9a4c2e-1d3b-4e5f-8a7b-9c0d1e2f3a4b";
const SECOND: &str = "0b7e6d5c-4b3a-4291-8f7e-6d5c4b3a2910";

/// What identifies one published version.
#[derive(Debug, PartialEq)]
struct Identity {
    etag: String,
    last_modified: String,
    package_id: String,
}

async fn fetch(app: &TestApp, path: &str) -> (Identity, Vec<u8>) {
    let response = reqwest::get(format!("{}{path}", app.base)).await.unwrap();
    assert_eq!(response.status(), 200, "{path}");
    let header = |name: &str| response.headers()[name].to_str().unwrap().to_owned();
    let (etag, last_modified) = (header("etag"), header("last-modified"));
    let body = response.bytes().await.unwrap().to_vec();
    let eml = if path.ends_with(".zip") { eml_in(&body) } else { String::from_utf8(body.clone()).unwrap() };
    let package_id = eml.split("packageId=\"").nth(1).and_then(|r| r.split('"').next()).unwrap().to_owned();
    (Identity { etag, last_modified, package_id }, body)
}

fn eml_in(archive: &[u8]) -> String {
    let mut zip = zip::ZipArchive::new(std::io::Cursor::new(archive)).unwrap();
    let mut eml = String::new();
    zip.by_name("eml.xml").unwrap().read_to_string(&mut eml).unwrap();
    eml
}

fn occurrences_in(archive: &[u8]) -> String {
    let mut zip = zip::ZipArchive::new(std::io::Cursor::new(archive)).unwrap();
    let mut text = String::new();
    zip.by_name("occurrence.txt").unwrap().read_to_string(&mut text).unwrap();
    text
}

async fn status_with(app: &TestApp, path: &str, header: &str, value: &str) -> u16 {
    let client = reqwest::Client::new();
    client.get(format!("{}{path}", app.base)).header(header, value).send().await.unwrap().status().as_u16()
}

#[tokio::test]
async fn the_published_archive_keeps_its_identity_until_a_record_is_confirmed() {
    let app = spawn_app_with_settings(Settings::default()).await;
    app.submit(&submission(FIRST), &[plain_jpeg(1)]).await;
    app.confirm(FIRST, "Scyliorhinus canicula", "species").await;

    let (first, archive) = fetch(&app, "/dataset/archive.zip").await;
    assert!(occurrences_in(&archive).contains(FIRST));
    let (again, _) = fetch(&app, "/dataset/archive.zip").await;
    assert_eq!(again, first, "nothing changed: the same version");
    let (eml, _) = fetch(&app, "/dataset/eml.xml").await;
    assert_eq!((&eml.etag, &eml.package_id), (&first.etag, &first.package_id), "the EML is the archive's");

    // Conditional GET (RFC 9110 §13.1.2, §13.1.3): the harvester's copy is current.
    for path in ["/dataset/archive.zip", "/dataset/eml.xml"] {
        assert_eq!(status_with(&app, path, "if-none-match", &first.etag).await, 304, "{path}");
        assert_eq!(status_with(&app, path, "if-none-match", &format!("W/{}", first.etag)).await, 304, "{path}");
        assert_eq!(status_with(&app, path, "if-none-match", "\"another\"").await, 200, "{path}");
        assert_eq!(status_with(&app, path, "if-modified-since", &first.last_modified).await, 304, "{path}");
        assert_eq!(status_with(&app, path, "if-modified-since", "Thu, 01 Jan 2015 00:00:00 GMT").await, 200, "{path}");
    }

    // A new record awaiting review is not published: the same version, still 304.
    app.submit(&submission(SECOND), &[]).await;
    let (unconfirmed, archive) = fetch(&app, "/dataset/archive.zip").await;
    assert!(!occurrences_in(&archive).contains(SECOND), "only confirmed records are published");
    assert_eq!(unconfirmed, first, "the published data did not change");
    assert_eq!(status_with(&app, "/dataset/archive.zip", "if-none-match", &first.etag).await, 304);

    // Confirmed, it is published: a new version of the same dataset.
    tokio::time::sleep(std::time::Duration::from_millis(1100)).await; // Last-Modified has whole seconds
    app.confirm(SECOND, "Raja clavata", "species").await;
    let (changed, archive) = fetch(&app, "/dataset/archive.zip").await;
    assert!(occurrences_in(&archive).contains(SECOND));
    assert_ne!(changed.etag, first.etag);
    assert_ne!(changed.last_modified, first.last_modified);
    let dataset = |id: &str| id.split('/').next().unwrap().to_owned();
    assert_eq!(dataset(&changed.package_id), dataset(&first.package_id), "the same dataset");
    assert_ne!(changed.package_id, first.package_id, "a new version of it");
    assert_eq!(status_with(&app, "/dataset/archive.zip", "if-none-match", &first.etag).await, 200);
}

#[tokio::test]
async fn the_metadata_describes_the_dataset_as_the_operator_set_it() {
    let dataset = Dataset {
        title: Some("Strandings & landings, Test Bay".into()),
        publisher: Some("Test Bay Stranding Network".into()),
        contact_name: Some("Records officer".into()),
        contact_email: Some("records@example.org".into()),
        coverage: Some("Coasts of Test Bay".into()),
        bounds: Some(Bounds::parse("51.9,-5.4,52.9,-3.9").unwrap()),
    };
    let settings = Settings { dataset, licence: Licence::CcByNc, ..Settings::default() };
    let app = spawn_app_with_settings(settings).await;
    let (_, eml) = fetch(&app, "/dataset/eml.xml").await;
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("eml.xml");
    std::fs::write(&path, &eml).unwrap();
    // Read with Python's xml.etree.ElementTree, as any XML reader would.
    let read = run_script("read_eml.py", &[&path]);
    assert_eq!(read["root"], "{eml://ecoinformatics.org/eml-2.1.1}eml");
    assert_eq!(read["title"], "Strandings & landings, Test Bay");
    assert_eq!(read["creator"], "Test Bay Stranding Network");
    assert_eq!(read["publisher"], "Test Bay Stranding Network");
    assert_eq!(read["contact_name"], "Records officer");
    assert_eq!(read["contact_email"], "records@example.org");
    assert_eq!(read["coverage"], "Coasts of Test Bay");
    assert_eq!(read["bounds"], serde_json::json!({"west": -5.4, "east": -3.9, "north": 52.9, "south": 51.9}));
    // The licence: the legal code linked (Creative Commons' address for BY-NC 4.0), and
    // the sentence in the archive's own words naming the publisher and what is allowed.
    assert_eq!(read["licence_url"], "http://creativecommons.org/licenses/by-nc/4.0/legalcode");
    let sentence = read["licence_sentence"].as_str().unwrap();
    assert!(sentence.starts_with("Test Bay Stranding Network shares these records under"), "{sentence}");
    assert!(sentence.contains("except for commercial purposes"), "{sentence}");
    assert!(!sentence.contains("This work is licensed under"), "{sentence}");
}

/// A restart keeps the published version's `Last-Modified`, so a harvester asking
/// `If-Modified-Since` after an upgrade or a reboot gets 304, not the same archive again
/// (RFC 9110 §13.1.3). The real binary, stopped and started on the same data folder.
#[tokio::test]
async fn a_restart_keeps_the_published_version_and_its_time() {
    let dir = tempfile::tempdir().unwrap();
    let identity = |server: &crate::process::Server| {
        let url = format!("{}/dataset/eml.xml", server.base);
        async move {
            let response = reqwest::get(url).await.unwrap();
            assert_eq!(response.status(), 200);
            let header = |name: &str| response.headers()[name].to_str().unwrap().to_owned();
            (header("etag"), header("last-modified"))
        }
    };
    // The public address is part of the version (photo links point under it); a real
    // installation keeps it, so both starts give the same one.
    let flags = ["--public-url", "https://records.example.org"];
    let server = crate::process::start(dir.path(), "127.0.0.1:0", &flags);
    let before = identity(&server).await;
    server.stop();
    tokio::time::sleep(std::time::Duration::from_millis(1100)).await; // Last-Modified has whole seconds
    let server = crate::process::start(dir.path(), "127.0.0.1:0", &flags);
    assert_eq!(identity(&server).await, before, "the same version, first built before the restart");
    let client = reqwest::Client::new();
    let asked = client.get(format!("{}/dataset/archive.zip", server.base)).header("if-modified-since", &before.1);
    assert_eq!(asked.send().await.unwrap().status(), 304);
    server.stop();
}
