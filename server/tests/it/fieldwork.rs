//! For the people who go out: a live animal reaches the responders through a signed
//! webhook and through email, each retried until the receiver takes it and never sent
//! twice for one record (real receivers on 127.0.0.1: a small HTTP server here, an SMTP
//! server from PyPI, aiosmtpd); the response log and the queue; samples, carcass
//! reports, their trail, and finding an animal from a sample's id on the server and on
//! the command line.

use std::collections::VecDeque;
use std::io::{BufRead as _, BufReader};
use std::process::{Child, Command, Stdio};
use std::sync::{Arc, Mutex};
use std::time::{Duration, Instant};

use axum::extract::State;
use axum::http::{HeaderMap, StatusCode};
use serde_json::{Value, json};
use wrackline_server::settings::{Responders, Settings, SmtpSecurity};

use crate::helpers::{REVIEWER_PASSWORD, Staff, TestApp, sign_in, spawn_app, spawn_app_with_settings, submission};

const SECRET: &str = "shared-secret-for-the-test";

/// Polls `check` until it gives `Some`, or fails naming `what` after 20 s.
async fn eventually<T>(what: &str, mut check: impl AsyncFnMut() -> Option<T>) -> T {
    let deadline = Instant::now() + Duration::from_secs(20);
    loop {
        if let Some(found) = check().await {
            return found;
        }
        assert!(Instant::now() < deadline, "{what}: not seen within 20 s");
        tokio::time::sleep(Duration::from_millis(50)).await;
    }
}

/// One request the webhook receiver got.
#[derive(Debug, Clone)]
struct Received {
    headers: HeaderMap,
    body: Vec<u8>,
    answered: u16,
}

impl Received {
    fn json(&self) -> Value {
        serde_json::from_slice(&self.body).expect("the webhook body is JSON")
    }
    fn header(&self, name: &str) -> String {
        self.headers.get(name).and_then(|v| v.to_str().ok()).unwrap_or_default().to_owned()
    }
}

/// A small HTTP receiver: answers each request with the next scripted status (200 once
/// the script is used up) and keeps what it got.
#[derive(Clone, Default)]
struct Receiver {
    got: Arc<Mutex<Vec<Received>>>,
    script: Arc<Mutex<VecDeque<u16>>>,
}

impl Receiver {
    async fn start(self, listener: tokio::net::TcpListener) -> Self {
        async fn take(State(receiver): State<Receiver>, headers: HeaderMap, body: axum::body::Bytes) -> StatusCode {
            let status = receiver.script.lock().unwrap().pop_front().unwrap_or(200);
            receiver.got.lock().unwrap().push(Received { headers, body: body.to_vec(), answered: status });
            StatusCode::from_u16(status).unwrap()
        }
        let app = axum::Router::new().route("/alerts", axum::routing::post(take)).with_state(self.clone());
        tokio::spawn(async move { axum::serve(listener, app).await.unwrap() });
        self
    }

    fn for_record(&self, record: &str) -> Vec<Received> {
        self.got.lock().unwrap().iter().filter(|r| r.json()["record_id"] == record).cloned().collect()
    }
}

fn responders() -> Responders {
    Responders { first_retry_ms: 50, ..Responders::default() }
}

fn with_webhook(url: String) -> Settings {
    Settings {
        responders: Responders { webhook: Some(url), webhook_secret: Some(SECRET.into()), ..responders() },
        ..Settings::default()
    }
}

fn alive(id: &str) -> Value {
    let mut record = submission(id);
    record["condition"] = json!("alive");
    record["species_guess"] = json!("thornback ray");
    record
}

fn new_id() -> String {
    uuid::Uuid::new_v4().to_string()
}

async fn detail(app: &TestApp, id: &str) -> Value {
    app.get(&format!("/api/review/records/{id}")).await.json().await.unwrap()
}

/// The signature computed independently, with Python's standard `hmac` module (RFC 2104).
fn python_signature(timestamp: &str, body: &[u8]) -> String {
    let script = "import hashlib, hmac, sys\n\
                  key, stamp = sys.argv[1].encode(), sys.argv[2].encode()\n\
                  print('sha256=' + hmac.new(key, stamp + b'.' + sys.stdin.buffer.read(), hashlib.sha256).hexdigest())";
    let mut child = Command::new("python3")
        .args(["-c", script, SECRET, timestamp])
        .stdin(Stdio::piped())
        .stdout(Stdio::piped())
        .spawn()
        .expect("python3");
    std::io::Write::write_all(&mut child.stdin.take().unwrap(), body).unwrap();
    let output = child.wait_with_output().unwrap();
    String::from_utf8(output.stdout).unwrap().trim().to_owned()
}

#[tokio::test(flavor = "multi_thread", worker_threads = 2)]
async fn a_live_animal_reaches_the_webhook_signed_once_even_when_refused_at_first_and_resent() {
    let listener = tokio::net::TcpListener::bind("127.0.0.1:0").await.unwrap();
    let url = format!("http://{}/alerts", listener.local_addr().unwrap());
    let receiver = Receiver::default();
    receiver.script.lock().unwrap().extend([500, 503]);
    let receiver = receiver.start(listener).await;
    let app = spawn_app_with_settings(with_webhook(url)).await;

    let first = new_id();
    assert_eq!(app.submit(&alive(&first), &[]).await.status, 200);
    let tries = eventually("the webhook acknowledges the alert", async || {
        let tries = receiver.for_record(&first);
        tries.iter().any(|t| t.answered == 200).then_some(tries)
    })
    .await;
    assert_eq!(tries.iter().map(|t| t.answered).collect::<Vec<_>>(), [500, 503, 200], "retried until acknowledged");
    let delivery = tries[0].header("x-wrackline-delivery");
    assert!(tries.iter().all(|t| t.header("x-wrackline-delivery") == delivery), "one delivery id on every try");
    for tried in &tries {
        let expected = python_signature(&tried.header("x-wrackline-timestamp"), &tried.body);
        assert_eq!(
            tried.header("x-wrackline-signature"),
            expected,
            "HMAC-SHA256 of timestamp.body, as Python computes it"
        );
    }
    let body = tries[2].json();
    assert_eq!(body["event"], "live_animal");
    assert_eq!(body["species_guess"], "thornback ray");
    assert_eq!(body["latitude"], 52.4153);
    assert!(body.get("contact").is_none() && !String::from_utf8_lossy(&tries[2].body).contains("contact"));

    let shown = eventually("the reviewer sees the delivery", async || {
        let shown = detail(&app, &first).await;
        shown["notifications"][0]["delivered_at"].is_string().then_some(shown)
    })
    .await;
    assert_eq!(shown["urgent"], true);
    assert_eq!(shown["notifications"][0]["channel"], "webhook");
    assert_eq!(shown["notifications"][0]["attempts"], 3);

    // A resend of the same record, then a dead animal, then another live one: once the
    // last one's alert is in, the worker has passed everything made before it.
    assert_eq!(app.submit(&alive(&first), &[]).await.status, 200);
    let dead = new_id();
    assert_eq!(app.submit(&submission(&dead), &[]).await.status, 200);
    let second = new_id();
    assert_eq!(app.submit(&alive(&second), &[]).await.status, 200);
    eventually("the second alert", async || (!receiver.for_record(&second).is_empty()).then_some(())).await;
    assert_eq!(receiver.for_record(&first).len(), 3, "a resend notifies no one twice");
    assert!(receiver.for_record(&dead).is_empty(), "a dead animal is no alert");
    assert_ne!(receiver.for_record(&second)[0].header("x-wrackline-delivery"), delivery);
}

#[tokio::test(flavor = "multi_thread", worker_threads = 2)]
async fn a_webhook_that_was_down_gets_the_alert_when_it_comes_back() {
    let listener = tokio::net::TcpListener::bind("127.0.0.1:0").await.unwrap();
    let address = listener.local_addr().unwrap();
    drop(listener);
    let app = spawn_app_with_settings(with_webhook(format!("http://{address}/alerts"))).await;
    let id = new_id();
    assert_eq!(app.submit(&alive(&id), &[]).await.status, 200);
    let failing = eventually("two failed tries", async || {
        let shown = detail(&app, &id).await;
        (shown["notifications"][0]["attempts"].as_u64() >= Some(2)).then_some(shown)
    })
    .await;
    let error = failing["notifications"][0]["last_error"].as_str().unwrap();
    assert!(error.contains("no answer from the webhook"), "{error}");
    assert!(failing["notifications"][0]["delivered_at"].is_null());

    let receiver = Receiver::default().start(tokio::net::TcpListener::bind(address).await.unwrap()).await;
    eventually("the alert once the receiver is up", async || (!receiver.for_record(&id).is_empty()).then_some(()))
        .await;
    let shown = eventually("delivered", async || {
        let shown = detail(&app, &id).await;
        shown["notifications"][0]["delivered_at"].is_string().then_some(shown)
    })
    .await;
    assert!(shown["notifications"][0]["last_error"].is_null());
}

/// The SMTP server from PyPI (aiosmtpd), started by `server/tests/python/smtp_sink.py`:
/// each message it takes is a JSON line on its standard output.
struct SmtpSink {
    child: Child,
    lines: std::sync::mpsc::Receiver<Value>,
}

impl SmtpSink {
    fn start(port: u16) -> Self {
        let script = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/python/smtp_sink.py");
        let mut child = Command::new(crate::python::python())
            .arg(script)
            .arg(port.to_string())
            .stdout(Stdio::piped())
            .spawn()
            .expect("starting the SMTP server");
        let mut out = BufReader::new(child.stdout.take().unwrap()).lines();
        let ready = out.next().expect("the SMTP server says it is ready").unwrap();
        assert_eq!(ready, format!("ready {port}"));
        let (send, lines) = std::sync::mpsc::channel();
        std::thread::spawn(move || {
            for line in out.map_while(Result::ok) {
                let _ = send.send(serde_json::from_str(&line).expect("a JSON line"));
            }
        });
        Self { child, lines }
    }

    fn next(&self) -> Value {
        self.lines.recv_timeout(Duration::from_secs(20)).expect("an email within 20 s")
    }
}

impl Drop for SmtpSink {
    fn drop(&mut self) {
        let _ = self.child.kill();
        let _ = self.child.wait();
    }
}

fn free_port() -> u16 {
    std::net::TcpListener::bind("127.0.0.1:0").unwrap().local_addr().unwrap().port()
}

#[tokio::test(flavor = "multi_thread", worker_threads = 2)]
async fn email_reaches_every_responder_once_the_smtp_server_takes_it() {
    let port = free_port();
    let settings = Settings {
        responders: Responders {
            email_to: vec!["duty@strandings.example".into(), "vet@strandings.example".into()],
            smtp_server: Some(format!("127.0.0.1:{port}")),
            smtp_security: SmtpSecurity::None,
            smtp_from: Some("wrackline <alerts@strandings.example>".into()),
            ..responders()
        },
        ..Settings::default()
    };
    let app = spawn_app_with_settings(settings).await;
    let id = new_id();
    assert_eq!(app.submit(&alive(&id), &[]).await.status, 200);
    // No SMTP server yet: the first tries fail, and say why.
    let failing = eventually("a failed try", async || {
        let shown = detail(&app, &id).await;
        shown["notifications"][0]["last_error"].as_str().map(str::to_owned)
    })
    .await;
    assert!(failing.contains("SMTP server did not take the email"), "{failing}");

    let sink = SmtpSink::start(port);
    let email = sink.next();
    assert_eq!(email["to"], json!(["duty@strandings.example", "vet@strandings.example"]));
    assert_eq!(email["from"], "alerts@strandings.example");
    assert_eq!(email["subject"], "Live animal reported: thornback ray at 52.41530, -4.08290");
    let body = email["body"].as_str().unwrap();
    assert!(body.contains(&format!("Record {id}")) && body.contains("Where: 52.41530, -4.08290 ± 8 m"), "{body}");

    assert_eq!(app.submit(&alive(&id), &[]).await.status, 200, "a resend");
    let other = new_id();
    assert_eq!(app.submit(&alive(&other), &[]).await.status, 200);
    let next = sink.next();
    assert!(
        next["body"].as_str().unwrap().contains(&format!("Record {other}")),
        "the next email is the other record's, not a repeat"
    );
}

#[tokio::test]
async fn a_webhook_without_its_secret_stops_the_server_from_starting() {
    let dir = tempfile::tempdir().unwrap();
    let mut state = wrackline_server::AppState::open(
        &dir.path().join("data"),
        None,
        wrackline_server::taxa::load_checklist(None).unwrap(),
    )
    .unwrap();
    state.settings.responders.webhook = Some("http://127.0.0.1:9/alerts".into());
    let refused = state.start_background_work().unwrap_err().to_string();
    assert!(refused.contains("--responders-webhook-secret"), "{refused}");
}

async fn responder(app: &TestApp) -> Staff {
    sign_in(&app.client, &app.base, "test-responder", REVIEWER_PASSWORD).await.expect("the responder signs in")
}

async fn queue_first(app: &TestApp) -> String {
    let queue: Value = app.get("/api/review/queue").await.json().await.unwrap();
    queue[0]["record"]["submission"]["client_id"].as_str().unwrap().to_owned()
}

#[tokio::test]
async fn a_live_animal_stays_first_in_the_queue_until_a_response_is_logged() {
    let app = spawn_app().await;
    let mut protected = submission(&new_id());
    protected["species_guess"] = json!("angelshark");
    assert_eq!(app.submit(&protected, &[]).await.status, 200);
    let live = new_id();
    assert_eq!(app.submit(&alive(&live), &[]).await.status, 200);
    assert_eq!(queue_first(&app).await, live, "a live animal outranks a protected species");

    let staff = responder(&app).await;
    let urgent: Value =
        staff.sign(app.client.get(format!("{}/api/urgent", app.base))).send().await.unwrap().json().await.unwrap();
    assert_eq!(urgent.as_array().unwrap().len(), 1);
    assert_eq!(urgent[0]["record"]["submission"]["client_id"], live.as_str());

    let url = format!("{}/api/review/records/{live}/responses", app.base);
    let empty =
        json!({"who_went": " ", "went_at": "2025-06-01T15:00:00+01:00", "outcome": "returned_to_sea", "notes": null});
    let refused = staff.sign(app.client.post(&url)).json(&empty).send().await.unwrap();
    assert_eq!(refused.status(), 422);
    assert_eq!(refused.json::<Value>().await.unwrap()["field"], "who_went");
    let report = json!({"who_went": "Nia and Tom", "went_at": "2025-06-01T15:00:00+01:00", "outcome": "returned_to_sea", "notes": "swam off strongly"});
    assert_eq!(staff.sign(app.client.post(&url)).json(&report).send().await.unwrap().status(), 200);

    assert_ne!(queue_first(&app).await, live, "answered: it takes its ordinary place");
    let shown = detail(&app, &live).await;
    assert_eq!(shown["responses"][0]["outcome"], "returned_to_sea");
    assert_eq!(shown["responses"][0]["logged_by"], "Test responder");
    assert!(!shown["priority_reasons"].to_string().contains("no response logged"));
    let reviewer_only = staff.sign(app.client.get(format!("{}/api/review/queue", app.base))).send().await.unwrap();
    assert_eq!(reviewer_only.status(), 403, "responders see live animals, not the review queue");
}

#[tokio::test]
async fn the_urgent_list_shows_reviewers_the_finders_contact_and_responders_only_the_find() {
    let app = spawn_app().await;
    let phone = app.new_device().await;
    let live = new_id();
    assert_eq!(app.submit_as(&phone, &alive(&live), &[]).await.status, 200);
    let profile = json!({"display_name": "Gwen", "contact": "gwen@example.org"});
    let saved =
        app.client.put(format!("{}/api/my/profile", app.base)).bearer_auth(&phone).json(&profile).send().await.unwrap();
    assert_eq!(saved.status(), 200);

    let as_reviewer: Value = app.get("/api/urgent").await.json().await.unwrap();
    assert_eq!(as_reviewer[0]["record"]["submission"]["client_id"], live.as_str());
    assert_eq!(as_reviewer[0]["finder"]["contact"], "gwen@example.org", "reviewers reach the finder");
    assert!(as_reviewer[0]["notifications"].is_array(), "each channel's delivery state travels with it");

    let staff = responder(&app).await;
    let response = staff.sign(app.client.get(format!("{}/api/urgent", app.base))).send().await.unwrap();
    let text = response.text().await.unwrap();
    let as_responder: Value = serde_json::from_str(&text).unwrap();
    assert_eq!(as_responder[0]["record"]["submission"]["client_id"], live.as_str());
    assert!(as_responder[0]["finder"].is_null(), "a responder is not given the finder's contact");
    assert!(!text.contains("gwen@example.org"), "nor anywhere else in the answer");
}

fn sample(code: &str, kind: &str, stored_at: &str) -> Value {
    json!({"kind": kind, "code": code, "preservation": "frozen", "stored_at": stored_at, "held_by": "Aber marine lab", "notes": null})
}

async fn post(app: &TestApp, path: &str, body: &Value) -> (u16, Value) {
    let response = app.reviewer.sign(app.client.post(format!("{}{path}", app.base))).json(body).send().await.unwrap();
    (response.status().as_u16(), response.json().await.unwrap_or(Value::Null))
}

async fn put(app: &TestApp, path: &str, body: &Value) -> (u16, Value) {
    let response = app.reviewer.sign(app.client.put(format!("{}{path}", app.base))).json(body).send().await.unwrap();
    (response.status().as_u16(), response.json().await.unwrap_or(Value::Null))
}

#[tokio::test]
async fn a_sample_leads_back_to_its_animal_its_other_samples_and_its_trail() {
    let app = spawn_app().await;
    let (first, second) = (new_id(), new_id());
    assert_eq!(app.submit(&submission(&first), &[crate::helpers::plain_jpeg(5)]).await.status, 200);
    let mut later = submission(&second);
    later["observed_at"] = json!("2025-06-02T09:00:00+01:00");
    assert_eq!(app.submit(&later, &[]).await.status, 200);

    assert_eq!(
        post(
            &app,
            &format!("/api/review/records/{first}/samples"),
            &sample("WRK-T-001", "tissue_for_genetics", "freezer 2, rack B")
        )
        .await
        .0,
        200
    );
    assert_eq!(
        post(
            &app,
            &format!("/api/review/records/{first}/samples"),
            &sample("WRK-V-001", "vertebrae", "dry store shelf 4")
        )
        .await
        .0,
        200
    );
    assert_eq!(
        post(
            &app,
            &format!("/api/review/records/{second}/samples"),
            &sample("WRK-S-001", "stomach_contents", "ethanol cabinet")
        )
        .await
        .0,
        200
    );
    let (status, body) =
        post(&app, &format!("/api/review/records/{second}/samples"), &sample("WRK-T-001", "other", "x")).await;
    assert_eq!((status, body["error"].as_str().unwrap().contains("already has the id WRK-T-001")), (409, true));
    let (status, body) =
        post(&app, &format!("/api/review/records/{second}/samples"), &sample("tube 7", "other", "x")).await;
    assert_eq!((status, body["field"].as_str()), (422, Some("code")));

    // The two reports are one animal: its samples are found from either.
    assert_eq!(
        post(&app, &format!("/api/review/records/{first}/duplicates/{second}"), &json!({"same_animal": true})).await.0,
        200
    );
    let (status, _) =
        put(&app, "/api/samples/WRK-T-001", &sample("WRK-T-001", "tissue_for_genetics", "freezer 3, rack A")).await;
    assert_eq!(status, 200);
    let carcass = json!({"fate": "taken_for_study", "examined_at": "2025-06-03T10:00:00+01:00", "body_condition": "poor",
                         "stomach": "empty", "injuries": "hook in the jaw", "notes": null});
    assert_eq!(put(&app, &format!("/api/review/records/{second}/carcass"), &carcass).await.0, 200);

    let found: Value = app.get("/api/samples/WRK-S-001").await.json().await.unwrap();
    assert_eq!(found["record"]["submission"]["client_id"], first.as_str(), "the animal's kept report");
    assert_eq!(found["record"]["photos"].as_array().unwrap().len(), 1);
    let codes: Vec<&str> =
        found["samples_of_the_animal"].as_array().unwrap().iter().map(|s| s["code"].as_str().unwrap()).collect();
    assert_eq!(codes, ["WRK-T-001", "WRK-V-001", "WRK-S-001"]);
    assert_eq!(found["samples_of_the_animal"][0]["stored_at"], "freezer 3, rack A");
    assert_eq!(found["carcass"]["fate"], "taken_for_study");
    let trail: Vec<&str> = found["events"].as_array().unwrap().iter().map(|e| e["detail"].as_str().unwrap()).collect();
    assert!(
        trail.iter().any(|d| d.starts_with("sample changed: was WRK-T-001")
            && d.contains("freezer 2, rack B")
            && d.contains("now WRK-T-001")),
        "{trail:?}"
    );
    assert!(trail.iter().any(|d| d.starts_with("carcass report: taken for study")), "{trail:?}");
    assert_eq!(app.get("/api/samples/NOPE-1").await.status(), 404);

    let shown = detail(&app, &second).await;
    assert_eq!(shown["samples"].as_array().unwrap().len(), 3, "the record view lists the animal's samples");

    // The command line finds the same, from the data directory alone.
    let output = Command::new(env!("CARGO_BIN_EXE_wrackline"))
        .args(["sample", "show", "WRK-V-001", "--data-dir"])
        .arg(&app.data_dir)
        .output()
        .unwrap();
    let text = String::from_utf8_lossy(&output.stdout);
    assert!(output.status.success(), "{}", String::from_utf8_lossy(&output.stderr));
    assert!(
        text.contains("Sample WRK-V-001: vertebrae, frozen, stored at dry store shelf 4, held by Aber marine lab"),
        "{text}"
    );
    assert!(text.contains(&format!("Animal: record {first}")), "{text}");
    assert!(text.contains("Samples of this animal (3):") && text.contains("WRK-S-001: stomach contents"), "{text}");
    assert!(text.contains("Carcass: taken for study"), "{text}");
    let missing = Command::new(env!("CARGO_BIN_EXE_wrackline"))
        .args(["sample", "show", "NOPE-1", "--data-dir"])
        .arg(&app.data_dir)
        .output()
        .unwrap();
    assert!(!missing.status.success());
    assert!(String::from_utf8_lossy(&missing.stderr).contains("no sample with the id NOPE-1"));
}
