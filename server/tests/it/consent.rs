//! An observer's name is published with open data only when they said yes on their
//! phone; otherwise public exports carry a stable pseudonymous label, made from a random
//! id the server keeps, never from the phone's token.

use std::io::Read as _;

use serde_json::{Value, json};
use sha2::Digest as _;

use crate::helpers::{TestApp, spawn_app, submission};

const NAMED: &str = "c0a5e4f0-0000-4000-8000-000000000001";
const UNNAMED: &str = "c0a5e4f0-0000-4000-8000-000000000002";
const FOR_A_FRIEND: &str = "c0a5e4f0-0000-4000-8000-000000000003";
const WALK: &str = "c0a5e4f0-0000-4000-8000-0000000000ff";

/// A new phone identity with this profile; its token.
async fn phone(app: &TestApp, profile: Value) -> String {
    let response = app.client.post(format!("{}/api/devices", app.base)).json(&profile).send().await.unwrap();
    assert_eq!(response.status(), 200);
    response.json::<Value>().await.unwrap()["token"].as_str().unwrap().to_owned()
}

async fn set_profile(app: &TestApp, token: &str, profile: Value) {
    let url = format!("{}/api/my/profile", app.base);
    let response = app.client.put(url).bearer_auth(token).json(&profile).send().await.unwrap();
    assert_eq!(response.status(), 200, "{}", response.text().await.unwrap());
}

/// Every public export's text (CSV, GeoJSON, every file of the archive).
async fn public_text(app: &TestApp) -> String {
    let get = |format: &'static str| async move {
        app.client.get(format!("{}/api/export?format={format}", app.base)).send().await.unwrap().bytes().await.unwrap()
    };
    let mut text = String::from_utf8(get("csv").await.to_vec()).unwrap();
    text.push_str(std::str::from_utf8(&get("geojson").await).unwrap());
    let zip = get("dwca").await;
    let mut archive = zip::ZipArchive::new(std::io::Cursor::new(zip.to_vec())).unwrap();
    for i in 0..archive.len() {
        archive.by_index(i).unwrap().read_to_string(&mut text).unwrap();
    }
    text
}

/// The public CSV's recordedBy of a record.
async fn recorded_by(app: &TestApp, id: &str) -> String {
    let csv = app.client.get(format!("{}/api/export?format=csv", app.base)).send().await.unwrap().text().await.unwrap();
    let mut reader = csv::Reader::from_reader(csv.as_bytes());
    let column = reader.headers().unwrap().iter().position(|h| h == "recordedBy").unwrap();
    let row = reader.records().map(Result::unwrap).find(|r| r[0].contains(id)).unwrap();
    row[column].to_owned()
}

#[tokio::test]
async fn a_name_is_published_only_with_the_observers_consent() {
    let app = spawn_app().await;
    let gwen = phone(&app, json!({"display_name": "Gwen Named", "name_public": true})).await;
    // Asked nothing about naming: the conservative answer, no.
    let sam = phone(&app, json!({"display_name": "Sam Private", "contact": "sam@example.org"})).await;
    // Gwen's second record names someone else; only the name she gave beside her consent is published.
    for (token, id, name) in
        [(&gwen, NAMED, "Gwen Named"), (&sam, UNNAMED, "Sam Private"), (&gwen, FOR_A_FRIEND, "Tom Friend")]
    {
        let mut record = submission(id);
        record["observer_name"] = json!(name);
        assert_eq!(app.submit_as(token, &record, &[]).await.status, 200);
        app.confirm(id, "Scyliorhinus canicula", "species").await;
    }
    let walk = json!({
        "client_id": WALK, "started_at": "2025-06-02T08:00:00+01:00", "ended_at": "2025-06-02T09:00:00+01:00",
        "stretch": "Borth", "all_finds_reported": true, "track": [], "typed_distance_m": 2000.0,
        "observer_name": "Sam Private"
    });
    assert_eq!(app.post_walk_as(&sam, &walk).await.status, 200);

    assert_eq!(recorded_by(&app, NAMED).await, "Gwen Named");
    assert_eq!(recorded_by(&app, FOR_A_FRIEND).await, "Gwen Named");
    let label = recorded_by(&app, UNNAMED).await;
    assert!(label.starts_with("observer-") && label.len() == "observer-".len() + 12, "{label}");
    let public = public_text(&app).await;
    assert!(!public.contains("Sam Private"), "no name without consent, in any format or the walk's absences");
    assert!(!public.contains("Tom Friend"), "nor a name typed on a record");
    assert!(!public.contains("sam@example.org"));
    assert!(public.contains(&label), "the walk's absences carry the same label");
    // Not derived from the phone's token: neither it nor its SHA-256 holds the label's digits.
    let digits = label.trim_start_matches("observer-");
    assert!(!sam.contains(digits) && !hex::encode(sha2::Sha256::digest(sam.as_bytes())).contains(digits));
    // Reviewers' full export names both.
    let full = app.get("/api/export?format=csv&audience=full").await.text().await.unwrap();
    assert!(full.contains("Sam Private") && full.contains("Gwen Named"));

    // Saying yes later names the records; saying no again brings back the same label.
    set_profile(&app, &sam, json!({"display_name": "Sam Private", "name_public": true})).await;
    assert_eq!(recorded_by(&app, UNNAMED).await, "Sam Private");
    set_profile(&app, &sam, json!({"display_name": "Sam Private", "name_public": false})).await;
    assert_eq!(recorded_by(&app, UNNAMED).await, label, "the label is stable");
}
