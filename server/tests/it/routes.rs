//! The routes around the records: health, unknown API paths, the app's own files and
//! its deep links, and the CSV export over HTTP.

use crate::helpers::{plain_jpeg, spawn_app, spawn_app_with, submission};

#[tokio::test]
async fn healthz_answers_ok() {
    let app = spawn_app().await;
    let response = app.get("/healthz").await;
    assert_eq!(response.status(), 200);
    assert_eq!(response.text().await.unwrap(), "ok");
}

#[tokio::test]
async fn an_unknown_api_path_is_a_json_404_not_the_app() {
    let app = spawn_app().await;
    let response = app.get("/api/nothing-here").await;
    assert_eq!(response.status(), 404);
    let body: serde_json::Value = response.json().await.unwrap();
    assert!(body["error"].is_string());
    assert_eq!(app.get("/photos/not-a-hash").await.status(), 404);
    assert_eq!(app.get("/api/observations/not-a-uuid").await.status(), 400);
    assert_eq!(app.get("/api/observations/6f9a4c2e-1d3b-4e5f-8a7b-9c0d1e2f3a4b").await.status(), 404);
}

#[tokio::test]
async fn the_app_is_served_and_deep_links_get_its_index_page() {
    let dir = tempfile::tempdir().unwrap();
    std::fs::write(dir.path().join("index.html"), "<!doctype html><title>app</title>").unwrap();
    std::fs::write(dir.path().join("sw.js"), "// worker").unwrap();
    let app = spawn_app_with(Some(dir.path().to_owned())).await;
    let worker = app.get("/sw.js").await;
    assert_eq!(worker.status(), 200);
    assert_eq!(worker.headers()["cache-control"], "no-cache", "a new service worker must be seen promptly");
    let deep = app.get("/records/some/where").await;
    assert_eq!(deep.status(), 200);
    assert!(deep.text().await.unwrap().contains("<title>app</title>"));
}

#[tokio::test]
async fn the_csv_export_uses_darwin_core_terms_and_links_photos() {
    let app = spawn_app().await;
    let id = "6f9a4c2e-1d3b-4e5f-8a7b-9c0d1e2f3a4b";
    app.submit(&submission(id), &[plain_jpeg(4)]).await;
    let response = app.get("/api/export?format=csv&state=any").await;
    assert_eq!(response.status(), 200);
    assert!(response.headers()["content-type"].to_str().unwrap().starts_with("text/csv"));
    let text = response.text().await.unwrap();
    let mut reader = csv::Reader::from_reader(text.as_bytes());
    let header = reader.headers().unwrap().clone();
    let rows: Vec<csv::StringRecord> = reader.records().map(Result::unwrap).collect();
    assert_eq!(rows.len(), 1);
    let cell = |name: &str| {
        rows[0][header.iter().position(|h| h == name).unwrap_or_else(|| panic!("column {name}"))].to_owned()
    };
    // Term names and vocabularies from the TDWG Darwin Core term list.
    assert_eq!(cell("occurrenceID"), format!("urn:uuid:{id}"));
    assert_eq!(cell("basisOfRecord"), "HumanObservation");
    assert_eq!(cell("eventDate"), "2025-06-01T14:10:00+01:00", "ISO 8601 with offset");
    assert_eq!(cell("decimalLatitude"), "52.415300");
    assert_eq!(cell("decimalLongitude"), "-4.082900");
    assert_eq!(cell("geodeticDatum"), "EPSG:4326");
    assert_eq!(cell("coordinateUncertaintyInMeters"), "8");
    assert_eq!(cell("vitality"), "dead");
    assert_eq!(cell("sex"), "male");
    assert_eq!(cell("individualCount"), "1");
    let media = cell("associatedMedia");
    assert!(media.starts_with(&format!("{}/photos/", app.base)), "{media}");
    let photo = reqwest::get(&media).await.unwrap();
    assert_eq!(photo.status(), 200, "the link in the export works");
    assert_eq!(app.get("/api/export?format=xml").await.status(), 400);
}

/// The body and the headers that matter for one request of `path` with `accept`.
async fn fetched(app: &crate::helpers::TestApp, path: &str, accept: Option<&str>) -> (String, String, String) {
    let mut request = app.client.get(format!("{}{path}", app.base));
    if let Some(accept) = accept {
        request = request.header("accept-encoding", accept);
    }
    let response = request.send().await.unwrap();
    assert_eq!(response.status(), 200, "{path} with {accept:?}");
    let header = |name: &str| response.headers().get(name).map(|v| v.to_str().unwrap().to_owned()).unwrap_or_default();
    let (encoding, vary) = (header("content-encoding"), header("vary"));
    (response.text().await.unwrap(), encoding, vary)
}

#[tokio::test]
async fn the_apps_files_go_out_precompressed_to_browsers_that_accept_it() {
    // The build writes NAME.br and NAME.gz beside each file; which one is sent follows
    // Accept-Encoding (RFC 9110 §12.5.3), brotli preferred, and the answer says it varies
    // with Accept-Encoding so no cache hands a brotli body to a client that cannot read it.
    // Marker bodies stand in for the compressed bytes: the test checks which file is sent.
    let dir = tempfile::tempdir().unwrap();
    for (name, body) in [
        ("app.wasm", "raw wasm"),
        ("app.wasm.br", "brotli wasm"),
        ("app.wasm.gz", "gzip wasm"),
        ("index.html", "raw page"),
        ("index.html.br", "brotli page"),
        ("index.html.gz", "gzip page"),
    ] {
        std::fs::write(dir.path().join(name), body).unwrap();
    }
    let app = spawn_app_with(Some(dir.path().to_owned())).await;
    let cases = [
        (Some("gzip, deflate, br"), "brotli wasm", "br"),
        (Some("gzip"), "gzip wasm", "gzip"),
        (Some("identity"), "raw wasm", ""),
        (None, "raw wasm", ""),
    ];
    for (accept, body, encoding) in cases {
        let (got, sent_encoding, vary) = fetched(&app, "/app.wasm", accept).await;
        assert_eq!((got.as_str(), sent_encoding.as_str()), (body, encoding), "Accept-Encoding {accept:?}");
        assert!(vary.to_ascii_lowercase().contains("accept-encoding"), "Vary for {accept:?}: {vary:?}");
    }
    // A deep link gets the page, compressed the same way.
    let (page, encoding, _) = fetched(&app, "/records/some/where", Some("gzip, br")).await;
    assert_eq!((page.as_str(), encoding.as_str()), ("brotli page", "br"));
}
