//! The hostile catalogue: what a stranger (or a broken phone) may send, each case sent to
//! the real server and answered as it should be. Every case is either refused with a
//! 4xx that names the problem — the field, for JSON — and stores nothing, or accepted
//! harmlessly where that is right; the server answers `/healthz` after each. Limits on
//! the pace of senders, uploads at once, free space, slow and idle connections are in
//! `limits.rs` and `slow_clients.rs`.
//!
//! Accepted harmlessly, by design: faulty EXIF (a loop, absurd counts) is "no EXIF
//! facts", never a refusal (the photo is still evidence); a JPEG cut short in its scan
//! data decodes as far as its data goes (the rest grey) and is kept, because it may be
//! the only copy of the observer's evidence, flagged for the reviewer as cut short; a
//! JPEG with bytes appended after its end (a JPEG/ZIP or JPEG/HTML polyglot) decodes as
//! the JPEG it is — what the server serves beyond reviewers is re-encoded from pixels,
//! so the appended part never leaves it, and the original is sent with
//! `X-Content-Type-Options: nosniff`.

mod forge;

use reqwest::multipart::{Form, Part};
use serde_json::{Value, json};

use crate::helpers::{TestApp, plain_jpeg, sized_jpeg, spawn_app, submission};
use forge::*;

const ID: &str = "9d8c7b6a-5f4e-4d3c-8b2a-1f0e9d8c7b6a";

/// The catalogue has at least this many cases.
const AT_LEAST: usize = 60;

/// What a case sends.
enum Send {
    /// A valid record with this one photo.
    Photo(Vec<u8>),
    /// A valid record with these changes to its JSON (a JSON pointer and the value it gets).
    Record(Vec<(&'static str, Value)>),
    /// This text as the record part.
    RecordText(String),
    /// A multipart form of these parts (name, bytes) to `POST /api/observations`.
    Parts(Vec<(&'static str, Vec<u8>)>),
    /// A body of this content type to `POST /api/observations`.
    Body(&'static str, Vec<u8>),
    /// JSON to another route, as `who` sends it.
    Json { method: &'static str, path: &'static str, who: Who, body: String },
    /// A reply (multipart `reply` part) to the phone's own record.
    Reply(Value, usize),
}

/// Who sends a JSON case.
#[derive(Clone, Copy)]
enum Who {
    Anyone,
    Phone,
    Reviewer,
}

enum Expect {
    /// Refused with this status and a message containing these words (and, for a refused
    /// JSON field, naming it).
    Refused(u16, &'static str),
    RefusedField(u16, &'static str, &'static str),
    /// Stored; the served display copy is a clean JPEG.
    Accepted,
    /// Stored, its first photo flagged for the reviewer.
    Flagged(&'static str),
}

/// The set-up every case shares: a phone identity and a stored record of that phone's.
struct Stage {
    phone: String,
    own_record: String,
}

async fn stage(app: &TestApp) -> Stage {
    let phone = app.new_device().await;
    let own_record = uuid::Uuid::new_v4().to_string();
    assert_eq!(app.submit_as(&phone, &submission(&own_record), &[]).await.status, 200);
    Stage { phone, own_record }
}

/// A record JSON with `changes` applied at their JSON pointers.
fn changed(changes: &[(&str, Value)]) -> Value {
    let mut record = submission(&uuid::Uuid::new_v4().to_string());
    for (pointer, value) in changes {
        let (parent, key) = pointer.rsplit_once('/').unwrap();
        let target = if parent.is_empty() { &mut record } else { record.pointer_mut(parent).unwrap() };
        match target {
            Value::Object(map) => {
                map.insert(key.to_owned(), value.clone());
            }
            Value::Array(items) => items[key.parse::<usize>().unwrap()] = value.clone(),
            other => panic!("{pointer}: {other} holds no field"),
        }
    }
    record
}

/// Sends one case; returns the status and the body (JSON, or the text as a JSON string).
async fn send(app: &TestApp, stage: &Stage, case: Send) -> (u16, Value) {
    let url = |path: &str| format!("{}{path}", app.base);
    let request = match case {
        Send::Photo(bytes) => {
            let record = submission(&uuid::Uuid::new_v4().to_string()).to_string();
            let form = Form::new().text("record", record).part("photo", Part::bytes(bytes).file_name("p.jpg"));
            app.client.post(url("/api/observations")).multipart(form)
        }
        Send::Record(changes) => {
            let form = Form::new().text("record", changed(&changes).to_string());
            app.client.post(url("/api/observations")).multipart(form)
        }
        Send::RecordText(text) => app.client.post(url("/api/observations")).multipart(Form::new().text("record", text)),
        Send::Parts(parts) => {
            let form = parts
                .into_iter()
                .fold(Form::new(), |form, (name, bytes)| form.part(name, Part::bytes(bytes).file_name("part")));
            app.client.post(url("/api/observations")).multipart(form)
        }
        Send::Body(content_type, bytes) => {
            app.client.post(url("/api/observations")).header("content-type", content_type).body(bytes)
        }
        Send::Json { method, path, who, body } => {
            let path = path.replace("{own}", &stage.own_record);
            let request = app
                .client
                .request(method.parse().unwrap(), url(&path))
                .header("content-type", "application/json")
                .body(body);
            match who {
                Who::Anyone => request,
                Who::Phone => request.bearer_auth(&stage.phone),
                Who::Reviewer => app.reviewer.sign(request),
            }
        }
        Send::Reply(reply, photos) => {
            let mut form = Form::new().text("reply", reply.to_string());
            for seed in 0..photos {
                form = form.part("photo", Part::bytes(plain_jpeg(seed as u8)).file_name("p.jpg"));
            }
            let path = format!("/api/my/records/{}/replies", stage.own_record);
            app.client.post(url(&path)).bearer_auth(&stage.phone).multipart(form)
        }
    };
    let answer = request.send().await.expect("an answer");
    let status = answer.status().as_u16();
    let text = answer.text().await.unwrap_or_default();
    (status, serde_json::from_str(&text).unwrap_or(Value::String(text)))
}

async fn check(app: &TestApp, stage: &Stage, name: &str, case: Send, expect: Expect) {
    let before = app.records().await.len();
    let (status, body) = send(app, stage, case).await;
    let message = body["error"].as_str().or(body.as_str()).unwrap_or_default().to_owned();
    match expect {
        Expect::Refused(want, words) | Expect::RefusedField(want, _, words) => {
            assert_eq!(status, want, "{name}: {body}");
            assert!(message.contains(words), "{name}: {message:?} should say {words:?}");
            if let Expect::RefusedField(_, field, _) = expect {
                assert_eq!(body["field"], field, "{name}: the refusal names the field: {body}");
            }
            assert_eq!(app.records().await.len(), before, "{name}: a refused record must store nothing");
        }
        Expect::Accepted | Expect::Flagged(_) => {
            assert_eq!(status, 200, "{name}: {body}");
            let records = app.records().await;
            let photo =
                &records.iter().find(|r| r["submission"]["client_id"] == body["client_id"]).unwrap()["photos"][0];
            let sha = photo["sha256"].as_str().unwrap().to_owned();
            let display = app.get(&format!("/photos/{sha}")).await.bytes().await.unwrap();
            assert!(
                image::load_from_memory_with_format(&display, image::ImageFormat::Jpeg).is_ok(),
                "{name}: display copy"
            );
            let flags = photo["check"]["flags"].to_string();
            match expect {
                Expect::Flagged(flag) => assert!(flags.contains(flag), "{name}: flagged {flag}: {flags}"),
                _ => assert_eq!(flags, "[]", "{name}: no flag"),
            }
        }
    }
    assert_eq!(app.get("/healthz").await.status(), 200, "{name}: the server must still be serving");
}

fn text(chars: usize) -> Value {
    Value::String("x".repeat(chars))
}

fn json_case(method: &'static str, path: &'static str, who: Who, body: Value) -> Send {
    Send::Json { method, path, who, body: body.to_string() }
}

/// A walk with `changes` (JSON pointer, value).
fn walk(changes: &[(&str, Value)]) -> Value {
    let mut walk = json!({"client_id": uuid::Uuid::new_v4(), "started_at": "2025-06-01T09:00:00+01:00",
        "ended_at": "2025-06-01T10:00:00+01:00", "stretch": null, "all_finds_reported": true,
        "typed_distance_m": 1500.0, "observer_name": null});
    for (key, value) in changes {
        walk[*key] = value.clone();
    }
    walk
}

fn track(points: usize) -> Value {
    let point = |i: usize| {
        json!({"latitude": 52.4 + i as f64 * 1e-6, "longitude": -4.05, "accuracy_m": 5.0,
               "at": format!("2025-06-01T09:{:02}:{:02}+01:00", (i / 60) % 60, i % 60)})
    };
    Value::Array((0..points).map(point).collect())
}

fn exif_entries(count: usize) -> Value {
    Value::Array((0..count).map(|_| json!({})).collect())
}

fn answers(entries: usize, key_chars: usize, value_chars: usize) -> Value {
    let map: serde_json::Map<String, Value> = (0..entries)
        .map(|i| (format!("{i}{}", "k".repeat(key_chars.saturating_sub(i.to_string().len()))), text(value_chars)))
        .collect();
    json!({"scientific_name": "Raja clavata", "taxon_rank": "species", "probability": 0.8, "answers": map})
}

#[tokio::test]
async fn the_hostile_catalogue_is_refused_cleanly_or_accepted_harmlessly() {
    let app = spawn_app().await;
    let stage = stage(&app).await;
    let jpeg = sized_jpeg(400, 300);
    let record_json = submission(ID).to_string();
    use Expect::{Accepted, Flagged, Refused, RefusedField};
    use Who::{Anyone, Phone, Reviewer};
    let cases: Vec<(&str, Send, Expect)> = vec![
        // Photo files.
        ("zero bytes", Send::Photo(Vec::new()), Refused(415, "empty")),
        (
            "text renamed .jpg",
            Send::Photo(b"Dear reviewer, this is not a photo.\n".to_vec()),
            Refused(415, "not a JPEG or PNG"),
        ),
        (
            "JPEG magic then text",
            Send::Photo([&[0xFF, 0xD8, 0xFF][..], b"<html><script>alert(1)</script>"].concat()),
            Refused(422, "header could not be read"),
        ),
        ("a GIF", Send::Photo(other_format("gif")), Refused(415, "not a JPEG or PNG")),
        ("a WebP", Send::Photo(other_format("webp")), Refused(415, "not a JPEG or PNG")),
        ("a BMP", Send::Photo(other_format("bmp")), Refused(415, "not a JPEG or PNG")),
        ("truncated JPEG (header only)", Send::Photo(jpeg[..200].to_vec()), Refused(422, "could not be")),
        (
            "truncated JPEG (just after the scan header)",
            Send::Photo(jpeg_cut_after_scan_header(&jpeg)),
            Flagged("cut_short"),
        ),
        ("truncated JPEG (half the scan)", Send::Photo(jpeg[..jpeg.len() / 2].to_vec()), Flagged("cut_short")),
        ("JPEG without its end marker", Send::Photo(jpeg[..jpeg.len() - 2].to_vec()), Flagged("cut_short")),
        (
            "truncated PNG (half)",
            Send::Photo({
                let png = real_png(64, 64);
                png[..png.len() / 2].to_vec()
            }),
            Refused(422, "could not be decoded"),
        ),
        ("arithmetic-coded JPEG", Send::Photo(jpeg_arithmetic(&jpeg)), Refused(422, "could not be")),
        (
            "PNG declaring 100 000 × 100 000",
            Send::Photo(png_declaring(100_000, 100_000)),
            Refused(413, "100000 × 100000 pixels"),
        ),
        ("PNG declaring 0 × 0", Send::Photo(png_declaring(0, 0)), Refused(422, "header could not be read")),
        ("PNG declaring 8 000 × 8 000 in 70 bytes", Send::Photo(png_declaring(8_000, 8_000)), Refused(422, "in only")),
        (
            "JPEG declaring 65 500 × 65 500",
            Send::Photo(jpeg_declaring(&jpeg, 65_500, 65_500)),
            Refused(413, "65500 × 65500 pixels"),
        ),
        (
            "JPEG declaring 20 000 × 4 000 (too long a side)",
            Send::Photo(jpeg_declaring(&jpeg, 20_000, 4_000)),
            Refused(413, "16384 px a side"),
        ),
        (
            "2 KB JPEG declaring 8 000 × 8 000",
            Send::Photo(jpeg_declaring(&plain_jpeg(3), 8_000, 8_000)),
            Refused(422, "takes at least 125000 bytes"),
        ),
        (
            "JPEG declaring 4 000 × 3 000 in a few KB",
            Send::Photo(jpeg_declaring(&plain_jpeg(4), 4_000, 3_000)),
            Refused(422, "damaged or forged"),
        ),
        ("EXIF IFD loop (IFD0 points to itself)", Send::Photo(with_app1(&jpeg, &tiff_ifd_loop())), Accepted),
        ("EXIF with huge declared counts", Send::Photo(with_app1(&jpeg, &tiff_huge_counts())), Accepted),
        ("PNG chunk declaring 2 GiB of data", Send::Photo(png_with_huge_chunk()), Refused(422, "could not be")),
        (
            "JPEG segment declaring more bytes than the file",
            Send::Photo(jpeg_with_long_segment(&jpeg)),
            Refused(422, "could not be"),
        ),
        ("polyglot: JPEG with a ZIP appended", Send::Photo([jpeg.clone(), zip_with_html()].concat()), Accepted),
        (
            "polyglot: HTML that starts like a PNG",
            Send::Photo([&png_declaring(16, 16)[..33], b"<html><body>hi</body></html>"].concat()),
            Refused(422, "could not be"),
        ),
        ("a 1 × 1 PNG", Send::Photo(real_png(1, 1)), Accepted),
        // The record's JSON: every string and list has a limit, and the refusal names it.
        (
            "65 answers to the key",
            Send::Record(vec![("/key_choice", answers(65, 4, 4))]),
            RefusedField(422, "key_choice.answers", "at most 64 entries"),
        ),
        (
            "an answer's name of 201 characters",
            Send::Record(vec![("/key_choice", answers(1, 201, 4))]),
            RefusedField(422, "key_choice.answers", "a key: at most 200 characters"),
        ),
        (
            "an answer of 201 characters",
            Send::Record(vec![("/key_choice", answers(1, 4, 201))]),
            RefusedField(422, "key_choice.answers", "at most 200 characters"),
        ),
        (
            "a taxon rank of 201 characters",
            Send::Record(vec![(
                "/key_choice",
                json!({"scientific_name": "Raja clavata", "taxon_rank": "x".repeat(201), "probability": 0.5}),
            )]),
            RefusedField(422, "key_choice.taxon_rank", "at most 200 characters"),
        ),
        (
            "a scientific name of 4 001 characters",
            Send::Record(vec![(
                "/key_choice",
                json!({"scientific_name": "x".repeat(4001), "taxon_rank": "species", "probability": 0.5}),
            )]),
            RefusedField(422, "key_choice.scientific_name", "at most 4000 are allowed"),
        ),
        (
            "13 EXIF readings",
            Send::Record(vec![("/photo_exif", exif_entries(13))]),
            RefusedField(422, "photo_exif", "at most 12 items"),
        ),
        (
            "an EXIF time of 65 characters",
            Send::Record(vec![("/photo_exif", json!([{"taken_local": "2".repeat(65)}]))]),
            RefusedField(422, "photo_exif[0].taken_local", "at most 64 characters"),
        ),
        (
            "an EXIF offset of 65 characters",
            Send::Record(vec![("/photo_exif", json!([{"offset": "+".repeat(65)}]))]),
            RefusedField(422, "photo_exif[0].offset", "at most 64 characters"),
        ),
        (
            "a device offset of 65 characters",
            Send::Record(vec![("/photo_exif", json!([{"device_offset": "+".repeat(65)}]))]),
            RefusedField(422, "photo_exif[0].device_offset", "at most 64 characters"),
        ),
        (
            "EXIF for a photo not sent",
            Send::Record(vec![("/photo_exif", exif_entries(1))]),
            RefusedField(422, "photo_exif", "lists EXIF for 1 photos but 0 came"),
        ),
        (
            "six signs of fishing",
            Send::Record(vec![(
                "/human_signs",
                json!(["hook", "line", "net_marks", "fins_removed", "boat_strike", "hook"]),
            )]),
            RefusedField(422, "human_signs", "at most 5 items"),
        ),
        (
            "a sign named twice",
            Send::Record(vec![("/human_signs", json!(["hook", "hook"]))]),
            RefusedField(422, "human_signs", "lists Hook twice"),
        ),
        (
            "notes of 4 001 characters",
            Send::Record(vec![("/notes", text(4001))]),
            RefusedField(422, "notes", "at most 4000 are allowed"),
        ),
        (
            "a species guess of 4 001 characters",
            Send::Record(vec![("/species_guess", text(4001))]),
            RefusedField(422, "species_guess", "at most 4000 are allowed"),
        ),
        (
            "an observer name of 4 001 characters",
            Send::Record(vec![("/observer_name", text(4001))]),
            RefusedField(422, "observer_name", "at most 4000 are allowed"),
        ),
        (
            "a field the record does not have",
            Send::Record(vec![("/payload", text(10))]),
            RefusedField(422, "payload", "unknown field"),
        ),
        (
            "a client id that is not a UUID",
            Send::Record(vec![("/client_id", json!("../../etc/passwd"))]),
            RefusedField(422, "client_id", "UUID"),
        ),
        (
            "latitude 91",
            Send::Record(vec![("/position/latitude", json!(91.0))]),
            RefusedField(422, "position.latitude", "between -90 and 90"),
        ),
        ("a count of 0", Send::Record(vec![("/count", json!(0))]), RefusedField(422, "count", "between 1 and")),
        (
            "a time in the year 2999",
            Send::Record(vec![("/observed_at", json!("2999-01-01T00:00:00Z"))]),
            RefusedField(422, "observed_at", "in the future"),
        ),
        (
            "a record part of 300 KB",
            Send::RecordText(format!("{{\"notes\": \"{}\"}}", " ".repeat(300 * 1024))),
            RefusedField(413, "record", "over the limit of 256 KiB"),
        ),
        (
            "JSON nested 10 000 deep in a field",
            Send::Record(vec![(
                "/notes",
                serde_json::from_str(&format!("{}{}", "[".repeat(100), "]".repeat(100))).unwrap(),
            )]),
            RefusedField(422, "notes", "invalid type: sequence"),
        ),
        (
            "JSON nested 10 000 deep",
            Send::RecordText(format!("{}{}", "[".repeat(10_000), "]".repeat(10_000))),
            RefusedField(422, "[0]", "invalid type: sequence"),
        ),
        ("a record that is not JSON", Send::RecordText("record=yes".into()), Refused(400, "not valid JSON")),
        // The upload's form.
        (
            "13 photos",
            Send::Parts(
                std::iter::once(("record", record_json.clone().into_bytes()))
                    .chain((0..13).map(|i| ("photo", plain_jpeg(i))))
                    .collect(),
            ),
            Refused(413, "at most 12 photos, this one has 13"),
        ),
        (
            "a part that is neither record nor photo",
            Send::Parts(vec![("record", record_json.clone().into_bytes()), ("script", b"alert(1)".to_vec())]),
            Refused(400, "unexpected form part `script`"),
        ),
        ("a form with no record", Send::Parts(vec![("photo", plain_jpeg(5))]), Refused(400, "no `record` part")),
        (
            "JSON instead of a form",
            Send::Body("application/json", record_json.clone().into_bytes()),
            Refused(400, "boundary"),
        ),
        // Other routes a stranger or a phone can reach.
        (
            "a username of 201 characters",
            json_case("POST", "/api/session", Anyone, json!({"username": "x".repeat(201), "password": "p"})),
            RefusedField(422, "username", "at most 200 characters"),
        ),
        (
            "a password of 1 025 characters",
            json_case("POST", "/api/session", Anyone, json!({"username": "x", "password": "p".repeat(1025)})),
            RefusedField(422, "password", "at most 1024 characters"),
        ),
        (
            "a sign-in body of 100 KB",
            Send::Json { method: "POST", path: "/api/session", who: Anyone, body: " ".repeat(100 * 1024) },
            Refused(413, "length limit"),
        ),
        (
            "a phone's name of 4 001 characters",
            json_case("POST", "/api/devices", Anyone, json!({"display_name": "x".repeat(4001)})),
            RefusedField(422, "display_name", "at most 4000 are allowed"),
        ),
        (
            "a new phone's body of 100 KB",
            Send::Json { method: "POST", path: "/api/devices", who: Anyone, body: " ".repeat(100 * 1024) },
            Refused(413, "length limit"),
        ),
        (
            "a contact of 4 001 characters",
            json_case("PUT", "/api/my/profile", Phone, json!({"contact": "x".repeat(4001)})),
            RefusedField(422, "contact", "at most 4000 are allowed"),
        ),
        (
            "a walk of 20 001 track points",
            json_case(
                "POST",
                "/api/walks",
                Phone,
                walk(&[("track", track(20_001)), ("typed_distance_m", Value::Null)]),
            ),
            RefusedField(422, "track", "at most 20000 items"),
        ),
        (
            "a walk body over 4 MiB",
            Send::Json { method: "POST", path: "/api/walks", who: Phone, body: " ".repeat(4 * 1024 * 1024 + 1) },
            Refused(413, "length limit"),
        ),
        (
            "a stretch name of 4 001 characters",
            json_case("POST", "/api/walks", Phone, walk(&[("stretch", text(4001))])),
            RefusedField(422, "stretch", "at most 4000 are allowed"),
        ),
        (
            "a link body that is not a walk id",
            json_case("PUT", "/api/observations/{own}/walk", Phone, json!({"walk_client_id": "x".repeat(300)})),
            RefusedField(422, "walk_client_id", "UUID"),
        ),
        (
            "a reply of 4 001 characters",
            Send::Reply(json!({"client_id": uuid::Uuid::new_v4(), "message": "x".repeat(4001)}), 0),
            RefusedField(422, "message", "at most 4000 are allowed"),
        ),
        (
            "a reply with 13 EXIF readings",
            Send::Reply(
                json!({"client_id": uuid::Uuid::new_v4(), "message": "here", "photo_exif": exif_entries(13)}),
                1,
            ),
            RefusedField(422, "photo_exif", "at most 12 items"),
        ),
        (
            "a reviewer's taxon rank of 201 characters",
            json_case(
                "POST",
                "/api/review/records/{own}/actions",
                Reviewer,
                json!({"action": "confirm", "scientific_name": "Raja clavata", "taxon_rank": "x".repeat(201), "remark": null}),
            ),
            RefusedField(422, "taxon_rank", "at most 200 characters"),
        ),
        (
            "a reviewer's remark of 4 001 characters",
            json_case(
                "POST",
                "/api/review/records/{own}/actions",
                Reviewer,
                json!({"action": "confirm", "scientific_name": "Raja clavata", "taxon_rank": "species", "remark": "x".repeat(4001)}),
            ),
            RefusedField(422, "remark", "at most 4000 are allowed"),
        ),
    ];
    assert!(cases.len() >= AT_LEAST, "the catalogue holds {} cases; at least {AT_LEAST} were promised", cases.len());
    for (name, case, expect) in cases {
        check(&app, &stage, name, case, expect).await;
    }
}

/// Photo files stored (originals and derivatives), the scratch folder left out.
fn stored_files(app: &TestApp) -> usize {
    let root = app.data_dir.join("photos");
    std::fs::read_dir(&root)
        .unwrap()
        .flatten()
        .filter(|e| e.file_name() != "tmp")
        .map(|e| std::fs::read_dir(e.path()).map_or(0, |d| d.count()))
        .sum()
}

/// A record over a size limit is refused with 413 and a message naming the limit; nothing
/// of it is stored and the server goes on serving.
async fn check_over_limit(app: &TestApp, name: &str, photos: &[Vec<u8>], words: &str) {
    let before = app.records().await.len();
    let answer = app.submit(&submission(&uuid::Uuid::new_v4().to_string()), photos).await;
    assert_eq!(answer.status, 413, "{name}: {}", answer.body);
    let message = answer.body["error"].as_str().unwrap_or_default();
    assert!(message.contains(words), "{name}: {message:?} should say {words:?}");
    assert_eq!(app.records().await.len(), before, "{name}: a refused record must store nothing");
    assert_eq!(stored_files(app), 0, "{name}: no photo file may be written");
    assert_eq!(app.get("/healthz").await.status(), 200, "{name}: the server must still be serving");
}

#[tokio::test]
async fn a_photo_one_byte_over_the_limit_and_a_record_with_one_photo_too_many_are_refused() {
    let app = spawn_app().await;
    let mut over = sized_jpeg(400, 300);
    over.resize(25 * 1024 * 1024 + 1, 0);
    check_over_limit(
        &app,
        "one byte over 25 MiB",
        &[over],
        "photo 1: it is larger than the limit of 25 MiB (26214400 bytes) for one photo",
    )
    .await;
    let thirteen: Vec<Vec<u8>> = (0..13).map(|i| plain_jpeg(i as u8)).collect();
    check_over_limit(&app, "13 photos", &thirteen, "at most 12 photos, this one has 13").await;
    // The limits themselves pass: exactly 25 MiB is not refused for its size, 12 photos are fine.
    let mut exactly = sized_jpeg(400, 300);
    exactly.resize(25 * 1024 * 1024, 0);
    let twelve: Vec<Vec<u8>> = (0..12).map(|i| plain_jpeg(i as u8)).collect();
    for (name, photos) in [("exactly 25 MiB", vec![exactly]), ("12 photos", twelve)] {
        let answer = app.submit(&submission(&uuid::Uuid::new_v4().to_string()), &photos).await;
        assert_eq!(answer.status, 200, "{name}: {}", answer.body);
    }
}

#[tokio::test]
async fn a_faulty_exif_block_gives_no_exif_facts() {
    let app = spawn_app().await;
    let answer = app.submit(&submission(ID), &[with_app1(&plain_jpeg(2), &tiff_ifd_loop())]).await;
    assert_eq!(answer.status, 200, "{}", answer.body);
    let exif = &app.records().await[0]["photos"][0]["exif"];
    assert!(exif["latitude"].is_null() && exif["taken_local"].is_null(), "{exif}");
}

#[tokio::test]
async fn a_bad_second_photo_refuses_the_record_and_stores_no_file() {
    let app = spawn_app().await;
    let answer = app.submit(&submission(ID), &[plain_jpeg(1), png_declaring(100_000, 100_000)]).await;
    assert_eq!(answer.status, 413, "{}", answer.body);
    assert!(answer.body["error"].as_str().unwrap().starts_with("photo 2: "), "{}", answer.body);
    assert!(app.records().await.is_empty());
    let files =
        std::fs::read_dir(app.data_dir.join("photos")).unwrap().flatten().filter(|e| e.file_name() != "tmp").count();
    assert_eq!(files, 0, "the good first photo must not be written before the bad second one is found");
}

#[tokio::test]
async fn the_original_is_sent_with_nosniff() {
    let app = spawn_app().await;
    app.submit(&submission(ID), &[[plain_jpeg(4), zip_with_html()].concat()]).await;
    let sha = app.records().await[0]["photos"][0]["sha256"].as_str().unwrap().to_owned();
    for path in [format!("/photos/{sha}"), format!("/photos/{sha}/thumb"), format!("/photos/{sha}/original")] {
        let response = app.get(&path).await;
        assert_eq!(response.headers()["x-content-type-options"], "nosniff", "{path}");
        assert_eq!(response.headers()["content-type"], "image/jpeg", "{path}");
    }
}
