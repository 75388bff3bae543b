//! `spawn_app()`: a freshly migrated database in a temp dir and the server on port 0,
//! with typed request helpers.

use std::future::Future;
use std::path::{Path, PathBuf};
use std::sync::Arc;

use reqwest::multipart::{Form, Part};
use serde_json::{Value, json};
use wrackline_server::AppState;
use wrackline_server::settings::Settings;

pub struct TestApp {
    pub base: String,
    pub client: reqwest::Client,
    pub data_dir: PathBuf,
    /// A signed-in reviewer, for reading records back.
    pub reviewer: Staff,
    /// The server's photo decode gate, to count decodes running at once.
    pub decode_gate: wrackline_server::intake::gate::DecodeGate,
    _dir: tempfile::TempDir,
}

/// A signed-in reviewer or admin: the session cookie and its CSRF token.
#[derive(Clone)]
pub struct Staff {
    pub cookie: String,
    pub csrf: String,
}

impl Staff {
    /// Adds the session's headers to a request.
    pub fn sign(&self, request: reqwest::RequestBuilder) -> reqwest::RequestBuilder {
        request.header("cookie", &self.cookie).header("x-csrf-token", &self.csrf)
    }
}

pub const REVIEWER_PASSWORD: &str = "test-reviewer-pass";

pub async fn spawn_app() -> TestApp {
    spawn_app_with(None).await
}

pub async fn spawn_app_with(app_dir: Option<PathBuf>) -> TestApp {
    spawn(app_dir, Setup::default()).await
}

/// The server with room for `turns` photo decodes at once (the default is one per core).
pub async fn spawn_app_with_decode_turns(turns: usize) -> TestApp {
    spawn(None, Setup { decode_turns: Some(turns), ..Setup::default() }).await
}

/// The server started with `checklist` instead of the built-in demo checklist.
pub async fn spawn_app_with_checklist(checklist: species_key::Checklist) -> TestApp {
    spawn(None, Setup { checklist: Some(checklist), ..Setup::default() }).await
}

/// The server behind a reverse proxy on this machine: 127.0.0.1, where the tests connect
/// from, is a trusted proxy, so `X-Forwarded-For` and `X-Forwarded-Proto` count.
pub async fn spawn_app_behind_proxy() -> TestApp {
    let settings =
        Settings { trusted_proxies: vec![std::net::IpAddr::V4(std::net::Ipv4Addr::LOCALHOST)], ..Default::default() };
    spawn(None, Setup { settings: Some(settings), ..Setup::default() }).await
}

/// The server with these operator settings (the public address is still the one it listens on, unless set).
pub async fn spawn_app_with_settings(settings: Settings) -> TestApp {
    spawn(None, Setup { settings: Some(settings), ..Setup::default() }).await
}

/// What a test server differs in from the default.
#[derive(Default)]
struct Setup {
    decode_turns: Option<usize>,
    checklist: Option<species_key::Checklist>,
    settings: Option<Settings>,
}

/// The sign-ins every test server has: (username, role); all use [`REVIEWER_PASSWORD`].
pub const TEST_STAFF: [(&str, shared_types::Role); 3] = [
    ("test-reviewer", shared_types::Role::Reviewer),
    ("test-admin", shared_types::Role::Admin),
    ("test-responder", shared_types::Role::Responder),
];

async fn spawn(app_dir: Option<PathBuf>, setup: Setup) -> TestApp {
    let dir = tempfile::tempdir().expect("temp dir");
    let data_dir = dir.path().join("data");
    let checklist =
        setup.checklist.unwrap_or_else(|| wrackline_server::taxa::load_checklist(None).expect("demo checklist"));
    let settings = setup.settings.unwrap_or_default();
    let mut state = AppState::open_with(&data_dir, app_dir, checklist, settings).expect("open state");
    if let Some(turns) = setup.decode_turns {
        state.decode_gate = wrackline_server::intake::gate::DecodeGate::new(turns);
    }
    // As `wrackline serve` does: the responders' notifications, when set up.
    state.start_background_work().expect("background work starts");
    let decode_gate = state.decode_gate.clone();
    for (username, role) in TEST_STAFF {
        wrackline_server::people::add_staff(
            &state.store,
            None,
            username,
            role,
            format!("Test {}", role.code()),
            REVIEWER_PASSWORD.into(),
        )
        .await
        .expect("add staff");
    }
    let listener = tokio::net::TcpListener::bind("127.0.0.1:0").await.expect("bind");
    let base = format!("http://{}", listener.local_addr().unwrap());
    // As `wrackline serve` does: its connection limits and timeouts, each connection's
    // address for the rate limits, and the address it listens on as the public one when
    // none is set.
    tokio::spawn(wrackline_server::router::serve_until(listener, state, std::future::pending()));
    let client = reqwest::Client::new();
    let reviewer = sign_in(&client, &base, "test-reviewer", REVIEWER_PASSWORD).await.expect("reviewer signs in");
    TestApp { base, client, data_dir, reviewer, decode_gate, _dir: dir }
}

/// Runs the `requests` on tasks of their own that wait at one barrier, so they all start
/// together — on a multi-thread runtime, in parallel — and returns their outputs in order.
/// For tests of what happens when requests really arrive at once.
pub async fn all_at_once<T, F>(requests: Vec<F>) -> Vec<T>
where
    T: Send + 'static,
    F: Future<Output = T> + Send + 'static,
{
    let barrier = Arc::new(tokio::sync::Barrier::new(requests.len()));
    let tasks: Vec<_> = requests
        .into_iter()
        .map(|request| {
            let barrier = barrier.clone();
            tokio::spawn(async move {
                barrier.wait().await;
                request.await
            })
        })
        .collect();
    let mut outputs = Vec::with_capacity(tasks.len());
    for task in tasks {
        outputs.push(task.await.expect("a request task panicked"));
    }
    outputs
}

/// Polls `check` until it returns `Some`, for at most `within`; panics naming `what`
/// when it never does. For conditions reached in the background (never a fixed sleep).
pub async fn eventually<T, F, Fut>(what: &str, within: std::time::Duration, mut check: F) -> T
where
    F: FnMut() -> Fut,
    Fut: Future<Output = Option<T>>,
{
    let deadline = tokio::time::Instant::now() + within;
    loop {
        if let Some(found) = check().await {
            return found;
        }
        assert!(tokio::time::Instant::now() < deadline, "{what}: not within {within:?}");
        tokio::time::sleep(std::time::Duration::from_millis(50)).await;
    }
}

/// Signs in over HTTP, or says what the server answered.
pub async fn sign_in(
    client: &reqwest::Client,
    base: &str,
    username: &str,
    password: &str,
) -> Result<Staff, (u16, Value)> {
    let response = client
        .post(format!("{base}/api/session"))
        .json(&json!({"username": username, "password": password}))
        .send()
        .await
        .unwrap();
    let status = response.status().as_u16();
    let cookie = response
        .headers()
        .get("set-cookie")
        .and_then(|v| v.to_str().ok())
        .map(|v| v.split(';').next().unwrap_or_default().to_owned());
    let body: Value = response.json().await.unwrap_or(Value::Null);
    match (status, cookie) {
        (200, Some(cookie)) => Ok(Staff { cookie, csrf: body["csrf_token"].as_str().unwrap_or_default().to_owned() }),
        _ => Err((status, body)),
    }
}

/// A valid submission; tests change what they need.
pub fn submission(client_id: &str) -> Value {
    json!({
        "client_id": client_id,
        "observed_at": "2025-06-01T14:10:00+01:00",
        "position": {"latitude": 52.4153, "longitude": -4.0829, "accuracy_m": 8.0, "source": "device"},
        "species_guess": "small-spotted catshark",
        "length": {"kind": "total", "value": 54.0, "unit": "cm", "method": "measured"},
        "sex": "male",
        "count": 1,
        "condition": "fresh_dead",
        "setting": "beach_stranding",
        "human_signs": ["hook"],
        "notes": "on the strandline below the cliff path",
        "observer_name": "Test Observer"
    })
}

pub struct Answer {
    pub status: u16,
    pub body: Value,
}

impl TestApp {
    /// Posts `record` (as given, so tests can send broken JSON) with photos.
    pub async fn submit_raw(&self, record: &str, photos: &[Vec<u8>]) -> Answer {
        let mut form = Form::new().text("record", record.to_owned());
        for (i, bytes) in photos.iter().enumerate() {
            form = form.part("photo", Part::bytes(bytes.clone()).file_name(format!("p{i}.jpg")));
        }
        let response =
            self.client.post(format!("{}/api/observations", self.base)).multipart(form).send().await.unwrap();
        let status = response.status().as_u16();
        let body = response.json().await.unwrap_or(Value::Null);
        Answer { status, body }
    }

    pub async fn submit(&self, record: &Value, photos: &[Vec<u8>]) -> Answer {
        self.submit_raw(&record.to_string(), photos).await
    }

    /// Every record, as the signed-in reviewer sees them.
    pub async fn records(&self) -> Vec<Value> {
        let value: Value = self.get("/api/observations").await.json().await.unwrap();
        value.as_array().expect("a list").clone()
    }

    /// A GET as the signed-in reviewer.
    pub async fn get(&self, path: &str) -> reqwest::Response {
        self.reviewer.sign(self.client.get(format!("{}{path}", self.base))).send().await.unwrap()
    }

    /// Confirms a record as the signed-in reviewer, under `name` at `rank`.
    pub async fn confirm(&self, client_id: &str, name: &str, rank: &str) {
        let request = self.client.post(format!("{}/api/review/records/{client_id}/actions", self.base));
        let body = json!({"action": "confirm", "scientific_name": name, "taxon_rank": rank});
        let response = self.reviewer.sign(request).json(&body).send().await.unwrap();
        assert_eq!(response.status(), 200, "confirming {client_id}: {}", response.text().await.unwrap());
    }

    /// Posts a survey walk as the phone with `token`.
    pub async fn post_walk_as(&self, token: &str, walk: &Value) -> Answer {
        let response =
            self.client.post(format!("{}/api/walks", self.base)).bearer_auth(token).json(walk).send().await.unwrap();
        let status = response.status().as_u16();
        Answer { status, body: response.json().await.unwrap_or(Value::Null) }
    }

    /// A new phone identity.
    pub async fn new_device(&self) -> String {
        let body: Value = self
            .client
            .post(format!("{}/api/devices", self.base))
            .json(&json!({"display_name": "Test Phone"}))
            .send()
            .await
            .unwrap()
            .json()
            .await
            .unwrap();
        body["token"].as_str().expect("a token").to_owned()
    }

    /// Submits as a phone with its device identity.
    pub async fn submit_as(&self, token: &str, record: &Value, photos: &[Vec<u8>]) -> Answer {
        let mut form = Form::new().text("record", record.to_string());
        for (i, bytes) in photos.iter().enumerate() {
            form = form.part("photo", Part::bytes(bytes.clone()).file_name(format!("p{i}.jpg")));
        }
        let response = self
            .client
            .post(format!("{}/api/observations", self.base))
            .bearer_auth(token)
            .multipart(form)
            .send()
            .await
            .unwrap();
        let status = response.status().as_u16();
        Answer { status, body: response.json().await.unwrap_or(Value::Null) }
    }
}

/// A small real JPEG (a gradient), encoded by the `image` crate, without EXIF.
pub fn plain_jpeg(seed: u8) -> Vec<u8> {
    let img = image::RgbImage::from_fn(64, 48, |x, y| image::Rgb([x as u8 * 4, y as u8 * 5, seed]));
    let mut bytes = Vec::new();
    image::codecs::jpeg::JpegEncoder::new_with_quality(&mut bytes, 85).encode_image(&img).unwrap();
    bytes
}

/// Writes EXIF tags into a JPEG with exiftool (Debian's libimage-exiftool-perl), the
/// reference writer, and returns the new bytes.
pub fn with_exiftool(jpeg: &[u8], tags: &[&str], dir: &Path) -> Vec<u8> {
    let path = dir.join(format!("exif-{}.jpg", uuid::Uuid::new_v4()));
    std::fs::write(&path, jpeg).unwrap();
    let output = std::process::Command::new("exiftool")
        .arg("-overwrite_original")
        .args(tags)
        .arg(&path)
        .output()
        .expect("exiftool must be installed for these tests (apt-get install libimage-exiftool-perl); `cargo xtask test` installs it");
    assert!(output.status.success(), "exiftool failed: {}", String::from_utf8_lossy(&output.stderr));
    std::fs::read(&path).unwrap()
}

/// A real JPEG of the given size with detail everywhere (so it compresses like a photo,
/// not like a flat colour), encoded by the `image` crate, without EXIF.
pub fn sized_jpeg(width: u32, height: u32) -> Vec<u8> {
    let img = image::RgbImage::from_fn(width, height, |x, y| {
        let wave = ((x * 7 + y * 3) % 64) as u8;
        image::Rgb([(x % 251) as u8 ^ wave, (y % 241) as u8, ((x + y) % 239) as u8])
    });
    let mut bytes = Vec::new();
    image::codecs::jpeg::JpegEncoder::new_with_quality(&mut bytes, 85).encode_image(&img).unwrap();
    bytes
}

/// Every tag exiftool (the reference reader) finds in `bytes`, as `group:tag` names
/// (`-G1`), with file-system and composite pseudo-tags left out.
pub fn exiftool_tags(bytes: &[u8], dir: &Path) -> Vec<String> {
    let path = dir.join(format!("read-{}.jpg", uuid::Uuid::new_v4()));
    std::fs::write(&path, bytes).unwrap();
    let output = std::process::Command::new("exiftool")
        .args(["-json", "-G1", "-a", "-u"])
        .arg(&path)
        .output()
        .expect("exiftool");
    assert!(output.status.success(), "exiftool failed: {}", String::from_utf8_lossy(&output.stderr));
    let parsed: Value = serde_json::from_slice(&output.stdout).unwrap();
    parsed[0]
        .as_object()
        .unwrap()
        .keys()
        .filter(|key| {
            !["SourceFile", "ExifTool:", "System:", "File:", "Composite:"].iter().any(|skip| key.starts_with(skip))
        })
        .cloned()
        .collect()
}

/// `/api/export?{query}`, for every review state unless the query names one (the export's
/// own default is confirmed records only; these tests export records still awaiting review).
pub fn export_path(query: &str) -> String {
    if query.contains("state=") { format!("/api/export?{query}") } else { format!("/api/export?{query}&state=any") }
}
