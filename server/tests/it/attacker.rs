//! An outsider trying to find where sensitive records are: anonymous callers only, over
//! real HTTP, against every public output — box shrinking on CSV, GeoJSON, the
//! Darwin Core Archive and the sample register, date windows, name variants as taxon filters, the range figures
//! and map with the AOO grid shifted about, trends, effort, and the guided key's
//! nearby counts.
//!
//! The method: every record is sent to two servers. On the first ("real") each is where
//! it was found. On the second ("twin") each record the public may not see exactly is
//! stored where the public sees it instead: rounded to Chapman 2020's 0.1° grid by this
//! file's own rounding, or with no position where it is withheld; its notes and
//! observer's name are other words, and the survey walk has another stretch name and
//! its track lies elsewhere in the same 0.1° cell; its sample's id, storage, holder and
//! the injuries seen on its carcass are other words too. Every public request goes to both,
//! and the answers must be the same (only times that differ between two servers are
//! left out of the comparison). So every public answer depends on the
//! published places alone, and no sequence of public requests can narrow a record down
//! below its published uncertainty. A bisection attack then shows it concretely: it
//! homes in on the published place, not on where the animal was.

use std::collections::BTreeMap;
use std::io::Read as _;

use serde_json::{Value, json};

use crate::helpers::{TestApp, spawn_app_with_checklist, submission};

/// How the public may see a record, as this test expects it (not as the server says).
#[derive(Debug, Clone, Copy, PartialEq)]
enum Seen {
    /// As recorded: a confirmed record of a taxon that is not sensitive.
    Exact,
    /// Rounded to 0.1° (Chapman 2020 grid).
    Rounded,
    /// No position at all.
    Withheld,
}

/// One record of the scenario.
struct Find {
    id: &'static str,
    /// What the observer typed.
    guess: &'static str,
    /// What a reviewer confirmed it as, if anyone did.
    confirmed_as: Option<&'static str>,
    at: (f64, f64),
    /// Made on the survey walk.
    on_walk: bool,
    /// How the public sees it with the demo checklist (the angelshark at 0.1°), and with
    /// the angelshark's location withheld.
    seen: Seen,
    seen_when_angelsharks_are_withheld: Seen,
}

use Seen::{Exact, Rounded, Withheld};

const ANGEL: &str = "a77ac4e5-0000-4000-8000-000000000001";
const CATSHARK: &str = "a77ac4e5-0000-4000-8000-000000000002";
const WALK: &str = "a77ac4e5-0000-4000-8000-0000000000ff";

/// The angelshark of the report that started this (found again to 6 decimals through
/// the old `bbox`), name variants of the checklist's sensitive taxa confirmed as typed,
/// a name that resolves to nothing, a record nobody has reviewed, and a survey walk on
/// which an angelshark and a catshark were found. The catshark off the walk is the one
/// record the public sees as recorded.
const FINDS: &[Find] = &[
    find(ANGEL, "angelshark", Some("Squatina squatina"), (52.123456, -4.654321), Rounded, Withheld),
    find(CATSHARK, "small-spotted catshark", Some("Scyliorhinus canicula"), (52.4153, -4.0829), Exact, Exact),
    find("a77ac4e5-0000-4000-8000-000000000003", "angel", Some("Angel shark?"), (52.2871, -4.4012), Rounded, Withheld),
    find("a77ac4e5-0000-4000-8000-000000000004", "?", Some("Squatina sp."), (52.3342, -4.2468), Rounded, Withheld),
    find(
        "a77ac4e5-0000-4000-8000-000000000005",
        "angel",
        Some("Squatina squatina (Linnaeus, 1758)"),
        (52.0512, -4.7433),
        Rounded,
        Withheld,
    ),
    find(
        "a77ac4e5-0000-4000-8000-000000000006",
        "skate",
        Some("Dipturus cf. batis"),
        (52.4411, -4.1379),
        Rounded,
        Rounded,
    ),
    find("a77ac4e5-0000-4000-8000-000000000007", "skate", Some("common skate"), (52.5217, -4.0536), Rounded, Rounded),
    find("a77ac4e5-0000-4000-8000-000000000008", "maelgi", Some("Maelgi"), (52.1786, -4.5551), Rounded, Withheld),
    find("a77ac4e5-0000-4000-8000-000000000009", "skate", Some("Raja batis"), (52.6127, -4.0712), Rounded, Rounded),
    find("a77ac4e5-0000-4000-8000-00000000000a", "skate", Some("flapper-skate"), (52.7044, -4.1198), Rounded, Rounded),
    find(
        "a77ac4e5-0000-4000-8000-00000000000b",
        "white skate",
        Some("Rostroraja alba (Lacepède, 1803)"),
        (52.0033, -4.9512),
        Rounded,
        Rounded,
    ),
    find("a77ac4e5-0000-4000-8000-00000000000c", "skate", Some("Rajidae"), (52.3929, -4.1741), Rounded, Rounded),
    find(
        "a77ac4e5-0000-4000-8000-00000000000d",
        "angel",
        Some("Ｓｑｕａｔｉｎａ ｓｑｕａｔｉｎａ"),
        (52.2455, -4.3377),
        Rounded,
        Withheld,
    ),
    find("a77ac4e5-0000-4000-8000-00000000000e", "a skate", Some("skate?"), (52.4688, -4.1023), Rounded, Withheld),
    find("a77ac4e5-0000-4000-8000-00000000000f", "monkfish", Some("monkfish"), (52.5532, -4.0918), Rounded, Withheld),
    find(
        "a77ac4e5-0000-4000-8000-000000000010",
        "angel",
        Some("Squatina\u{200B}squatina"),
        (52.1123, -4.6789),
        Rounded,
        Withheld,
    ),
    find("a77ac4e5-0000-4000-8000-000000000011", "thornback ray", None, (52.3011, -4.3902), Rounded, Withheld),
    Find {
        on_walk: true,
        ..find(
            "a77ac4e5-0000-4000-8000-000000000012",
            "angelshark",
            Some("Squatina squatina"),
            (52.4987, -4.0573),
            Rounded,
            Withheld,
        )
    },
    Find {
        on_walk: true,
        ..find(
            "a77ac4e5-0000-4000-8000-000000000013",
            "catshark",
            Some("Scyliorhinus canicula"),
            (52.5012, -4.0561),
            Rounded,
            Withheld,
        )
    },
];

const fn find(
    id: &'static str,
    guess: &'static str,
    confirmed_as: Option<&'static str>,
    at: (f64, f64),
    seen: Seen,
    seen_when_angelsharks_are_withheld: Seen,
) -> Find {
    Find { id, guess, confirmed_as, at, on_walk: false, seen, seen_when_angelsharks_are_withheld }
}

/// Rounds to the 0.1° grid, as Chapman 2020 (GBIF) describes it; written here, not taken from the server.
fn to_tenth(value: f64) -> f64 {
    (value * 10.0).round() / 10.0
}

/// The demo checklist, or the same with the angelshark's location withheld.
fn checklist(angelsharks_withheld: bool) -> species_key::Checklist {
    let mut list: Value = serde_json::from_str(wrackline_server::taxa::DEMO_CHECKLIST).unwrap();
    if angelsharks_withheld {
        let taxa = list["taxa"].as_array_mut().unwrap();
        let angel = taxa.iter_mut().find(|t| t["scientificName"] == "Squatina squatina").unwrap();
        angel["sensitivity"] = json!("withhold");
    }
    species_key::Checklist::from_json(&list.to_string()).unwrap()
}

/// A server holding the scenario: each record where it was found (`twin` false), or
/// where this test expects the public to see it (`twin` true).
async fn server(angelsharks_withheld: bool, twin: bool) -> TestApp {
    let app = spawn_app_with_checklist(checklist(angelsharks_withheld)).await;
    let phone = app.new_device().await;
    // The twin's walk lies 0.02° further west: another track, the same 0.1° cell for its
    // start, the same length (a shift in longitude keeps every geodesic distance).
    let shift = if twin { -0.02 } else { 0.0 };
    let walk = json!({
        "client_id": WALK, "started_at": "2025-06-02T08:00:00+01:00", "ended_at": "2025-06-02T09:30:00+01:00",
        "stretch": if twin { "Somewhere Else" } else { "Secret Cove" }, "all_finds_reported": true,
        "typed_distance_m": null, "observer_name": "Walker",
        "track": [
            {"latitude": 52.4980, "longitude": -4.0580 + shift, "accuracy_m": 5.0, "at": "2025-06-02T08:00:00+01:00"},
            {"latitude": 52.5020, "longitude": -4.0550 + shift, "accuracy_m": 5.0, "at": "2025-06-02T09:30:00+01:00"}
        ]
    });
    assert_eq!(app.post_walk_as(&phone, &walk).await.status, 200);
    for (n, find) in FINDS.iter().enumerate() {
        let seen = if angelsharks_withheld { find.seen_when_angelsharks_are_withheld } else { find.seen };
        let mut record = submission(find.id);
        record["species_guess"] = json!(find.guess);
        record["observed_at"] = json!(format!("2025-06-0{}T1{}:10:00+01:00", 1 + n % 3, n % 10));
        let hidden = twin && seen != Exact;
        record["notes"] =
            json!(if hidden { "nothing to see".to_owned() } else { format!("by the {} rock", find.guess) });
        record["observer_name"] = json!(if hidden { "Someone Else" } else { "Test Observer" });
        let (lat, lon) = match (twin, seen) {
            (true, Rounded) => (to_tenth(find.at.0), to_tenth(find.at.1)),
            _ => find.at,
        };
        record["position"] = match (twin, seen) {
            (true, Withheld) => Value::Null,
            _ => json!({"latitude": lat, "longitude": lon, "accuracy_m": 10.0, "source": "device"}),
        };
        let answer = if find.on_walk {
            record["walk_client_id"] = json!(WALK);
            app.submit_as(&phone, &record, &[]).await
        } else {
            app.submit(&record, &[]).await
        };
        assert_eq!(answer.status, 200, "{}: {}", find.id, answer.body);
        if let Some(name) = find.confirmed_as {
            app.confirm(find.id, name, "species").await;
        }
        add_fieldwork(&app, find.id, n, hidden).await;
    }
    app
}

/// A sample and a carcass report on a find. A sample's id, its place of storage, its
/// holder and the injuries seen are free text: on the twin, a hidden find's are other words.
async fn add_fieldwork(app: &TestApp, id: &str, n: usize, hidden: bool) {
    let (code, stored_at, held_by, injuries) = if hidden {
        (format!("ELSEWHERE-{n}"), "another freezer", "Someone Else", "nothing to see")
    } else {
        (format!("COVE-{n}"), "freezer by Secret Cove", "Ann at Secret Cove", "hooked off Secret Cove")
    };
    let sample = json!({"kind": "tissue_for_genetics", "code": code, "preservation": "ethanol",
                        "stored_at": stored_at, "held_by": held_by, "notes": held_by});
    let carcass = json!({"fate": "taken_for_study", "examined_at": "2025-06-04T10:00:00+01:00", "body_condition": "poor",
                         "stomach": "empty", "injuries": injuries, "notes": held_by});
    for (method, path, body) in [
        (reqwest::Method::POST, format!("/api/review/records/{id}/samples"), sample),
        (reqwest::Method::PUT, format!("/api/review/records/{id}/carcass"), carcass),
    ] {
        let request = app.client.request(method, format!("{}{path}", app.base));
        let response = app.reviewer.sign(request).json(&body).send().await.unwrap();
        assert_eq!(response.status(), 200, "{path}");
    }
}

/// Both servers, the twin's phone given the real one's public id (a random label that
/// would otherwise differ between two servers, and is no place).
async fn real_and_twin(angelsharks_withheld: bool) -> (TestApp, TestApp) {
    let real = server(angelsharks_withheld, false).await;
    let twin = server(angelsharks_withheld, true).await;
    let database = |app: &TestApp| rusqlite::Connection::open(app.data_dir.join("wrackline.sqlite3")).unwrap();
    let id: String =
        database(&real).query_row("SELECT public_id FROM people WHERE role = 'observer'", [], |r| r.get(0)).unwrap();
    database(&twin).execute("UPDATE people SET public_id = ?1 WHERE role = 'observer'", [id]).unwrap();
    (real, twin)
}

/// An anonymous GET: the status and the body's bytes.
async fn anonymous(app: &TestApp, path: &str) -> (u16, Vec<u8>) {
    let response = app.client.get(format!("{}{path}", app.base)).send().await.unwrap();
    (response.status().as_u16(), response.bytes().await.unwrap().to_vec())
}

/// What a public answer says about places: everything but the times at which the two
/// servers were set up (dateIdentified, when samples were added, the archive's pubDate)
/// and the archive's dataset ids (made from each installation's own random id).
fn comparable(path: &str, body: &[u8]) -> Value {
    if path.contains("format=csv") || path.contains("format=samples") {
        return Value::Array(table(std::str::from_utf8(body).unwrap(), b','));
    }
    if path.ends_with("eml.xml") {
        let text = String::from_utf8_lossy(body);
        return Value::String(
            text.lines()
                .filter(|l| {
                    !l.contains("packageId=") && !l.contains("<pubDate>") && !l.contains("<alternateIdentifier>")
                })
                .collect(),
        );
    }
    if path.contains("format=dwca") || path.ends_with(".zip") {
        let mut archive = zip::ZipArchive::new(std::io::Cursor::new(body)).unwrap();
        let mut files = BTreeMap::new();
        for i in 0..archive.len() {
            let mut file = archive.by_index(i).unwrap();
            let mut text = String::new();
            file.read_to_string(&mut text).unwrap();
            let name = file.name().unwrap().to_string();
            let value = match name.as_str() {
                "eml.xml" => Value::String(
                    text.lines()
                        .filter(|l| !["packageId=", "<pubDate>", "<alternateIdentifier>"].iter().any(|t| l.contains(t)))
                        .collect(),
                ),
                "meta.xml" => Value::String(text),
                _ => Value::Array(table(&text, b'\t')),
            };
            files.insert(name, value);
        }
        return json!(files);
    }
    match serde_json::from_slice::<Value>(body) {
        Ok(mut value) => {
            if let Some(features) = value.get_mut("features").and_then(Value::as_array_mut) {
                for feature in features {
                    feature["properties"].as_object_mut().unwrap().remove("dateIdentified");
                }
            }
            value
        }
        Err(_) => Value::String(String::from_utf8_lossy(body).into_owned()),
    }
}

/// Columns holding when the servers were set up, emptied before comparing.
const SET_UP_TIMES: [&str; 3] = ["dateIdentified", "sampleAddedAt", "relationshipEstablishedDate"];

/// Rows of a delimited table, with the [`SET_UP_TIMES`] columns emptied.
fn table(text: &str, delimiter: u8) -> Vec<Value> {
    let mut reader = csv::ReaderBuilder::new()
        .delimiter(delimiter)
        .has_headers(false)
        .quoting(delimiter == b',')
        .from_reader(text.as_bytes());
    let rows: Vec<Vec<String>> = reader.records().map(|r| r.unwrap().iter().map(str::to_owned).collect()).collect();
    let Some(header) = rows.first() else { return Vec::new() };
    let dates: Vec<usize> =
        header.iter().enumerate().filter(|(_, h)| SET_UP_TIMES.contains(&h.as_str())).map(|(i, _)| i).collect();
    rows.iter()
        .map(|row| {
            json!(
                row.iter()
                    .enumerate()
                    .map(|(i, v)| if dates.contains(&i) { "" } else { v.as_str() })
                    .collect::<Vec<_>>()
            )
        })
        .collect()
}

/// Asks both servers the same and requires the same answer; returns the real one.
async fn ask_both(real: &TestApp, twin: &TestApp, path: &str) -> (u16, Vec<u8>) {
    let (real_status, real_body) = anonymous(real, path).await;
    let (twin_status, twin_body) = anonymous(twin, path).await;
    assert_eq!(real_status, twin_status, "{path}: {}", String::from_utf8_lossy(&real_body));
    let (seen, published_only) = (comparable(path, &real_body), comparable(path, &twin_body));
    assert!(
        seen == published_only,
        "{path} answers differently when the records are stored where the public sees them, so it gives away more:\n\
         real: {seen}\ntwin: {published_only}"
    );
    (real_status, real_body)
}

/// Whether the public CSV for `query` lists the record `id`.
async fn csv_lists(real: &TestApp, twin: &TestApp, query: &str, id: &str) -> bool {
    let (status, body) = ask_both(real, twin, &format!("/api/export?format=csv&{query}")).await;
    assert_eq!(status, 200, "{query}");
    String::from_utf8(body).unwrap().contains(id)
}

/// Shrinks a box around `id` by halving it, latitude then longitude, `steps` times each;
/// returns where the attacker ends up (the box's south-west corner).
async fn bisect(real: &TestApp, twin: &TestApp, id: &str, state: &str, steps: usize) -> Option<(f64, f64)> {
    let (mut south, mut north, mut west, mut east) = (50.0, 55.0, -7.0, -2.0);
    let inside = |s: f64, w: f64, n: f64, e: f64| format!("bbox={s},{w},{n},{e}&{state}");
    if !csv_lists(real, twin, &inside(south, west, north, east), id).await {
        return None;
    }
    for _ in 0..steps {
        let middle = (south + north) / 2.0;
        if csv_lists(real, twin, &inside(south, west, middle, east), id).await {
            north = middle;
        } else {
            south = middle;
        }
    }
    for _ in 0..steps {
        let middle = (west + east) / 2.0;
        if csv_lists(real, twin, &inside(south, west, north, middle), id).await {
            east = middle;
        } else {
            west = middle;
        }
    }
    Some((south, west))
}

/// Every other public output, asked in many ways: both servers must agree on each.
async fn probe_everything(real: &TestApp, twin: &TestApp) {
    let states = ["", "&state=any", "&state=awaiting_review", "&state=confirmed"];
    for format in ["csv", "geojson", "dwca", "samples"] {
        for state in states {
            ask_both(real, twin, &format!("/api/export?format={format}{state}")).await;
        }
    }
    // Date windows shrinking onto each day, alone and with a box around the true place.
    for day in ["2025-06-01", "2025-06-02", "2025-06-03"] {
        for window in [format!("from={day}"), format!("to={day}"), format!("from={day}&to={day}")] {
            for format in ["csv", "dwca", "samples"] {
                ask_both(real, twin, &format!("/api/export?format={format}&state=any&{window}")).await;
                ask_both(real, twin, &format!("/api/export?format={format}&{window}&bbox=52.12,-4.66,52.13,-4.65"))
                    .await;
            }
        }
    }
    // A small box around where each record really was, and around the walk's track.
    let walk_track = (52.5, -4.0565);
    for (lat, lon) in FINDS.iter().map(|f| f.at).chain([walk_track]) {
        let bbox = format!("bbox={},{},{},{}", lat - 0.005, lon - 0.005, lat + 0.005, lon + 0.005);
        for format in ["geojson", "dwca", "samples"] {
            ask_both(real, twin, &format!("/api/export?format={format}&state=any&{bbox}")).await;
        }
    }
    // Every name variant as a taxon filter.
    for find in FINDS {
        let name = urlencode(find.confirmed_as.unwrap_or(find.guess));
        ask_both(real, twin, &format!("/api/export?format=geojson&state=any&taxon={name}")).await;
    }
    // Range figures, maps and trends, the AOO grid moved by small steps around the angelshark.
    let taxa = ["Squatina%20squatina", "Squatina", "Squalomorphii", "Dipturus", "Rajidae", "Batoidea", "maelgi"];
    let centres = ["", "&grid_centre=52.1,-4.65", "&grid_centre=52.12,-4.654", "&grid_centre=52.1235,-4.6543"];
    for taxon in taxa {
        for centre in centres {
            for state in ["", "&state=any"] {
                ask_both(real, twin, &format!("/api/range?taxon={taxon}{centre}{state}")).await;
                ask_both(real, twin, &format!("/api/range/map.svg?taxon={taxon}{centre}{state}")).await;
            }
        }
        ask_both(real, twin, &format!("/api/range?taxon={taxon}&period=2024-2024,2025-2025")).await;
        ask_both(real, twin, &format!("/api/trend?taxon={taxon}&state=any")).await;
        ask_both(real, twin, &format!("/api/trend/chart.svg?taxon={taxon}&state=any&generation_length=3")).await;
    }
    ask_both(real, twin, "/api/range?state=any").await;
    ask_both(real, twin, "/api/effort?by=month").await;
    // The published dataset a harvester polls.
    ask_both(real, twin, "/dataset/archive.zip").await;
    ask_both(real, twin, "/dataset/eml.xml").await;

    // The key's nearby counts, probed on a grid around where the angelshark was.
    for i in -3..=3 {
        for j in -3..=3 {
            let (lat, lon) = (52.123456 + 0.07 * f64::from(i), -4.654321 + 0.07 * f64::from(j));
            ask_both(real, twin, &format!("/api/checklist/nearby?lat={lat:.4}&lon={lon:.4}")).await;
        }
    }
}

fn urlencode(text: &str) -> String {
    text.bytes()
        .map(|b| if b.is_ascii_alphanumeric() { (b as char).to_string() } else { format!("%{b:02X}") })
        .collect()
}

/// The public CSV of every state, by occurrenceID.
async fn public_rows(app: &TestApp) -> BTreeMap<String, BTreeMap<String, String>> {
    let (_, body) = anonymous(app, "/api/export?format=csv&state=any").await;
    let mut reader = csv::Reader::from_reader(body.as_slice());
    let header: Vec<String> = reader.headers().unwrap().iter().map(str::to_owned).collect();
    reader
        .records()
        .map(|r| {
            let row: BTreeMap<String, String> =
                header.iter().cloned().zip(r.unwrap().iter().map(str::to_owned)).collect();
            (row["occurrenceID"].trim_start_matches("urn:uuid:").to_owned(), row)
        })
        .collect()
}

#[tokio::test]
async fn no_sequence_of_public_requests_finds_a_sensitive_record_more_precisely_than_published() {
    let (real, twin) = real_and_twin(false).await;

    // Box shrinking: 24 halvings a side would pin a point to 5 decimals. It finds the
    // published 0.1° place, not where the angelshark was.
    let (lat, lon) = bisect(&real, &twin, ANGEL, "state=confirmed", 24).await.expect("the angelshark is public");
    assert!((lat - 52.1).abs() < 1e-5 && (lon + 4.7).abs() < 1e-5, "the attacker ends at {lat}, {lon}");
    assert!((lat - 52.123456).abs() > 0.02 && (lon + 4.654321).abs() > 0.04, "not where it was");
    // The control: the catshark, confirmed and not sensitive, is public as recorded, so
    // the same attack finds it where it was — the attack works.
    let (lat, lon) = bisect(&real, &twin, CATSHARK, "state=confirmed", 24).await.unwrap();
    assert!((lat - 52.4153).abs() < 1e-5 && (lon + 4.0829).abs() < 1e-5, "the control ends at {lat}, {lon}");

    probe_everything(&real, &twin).await;

    // What the public is shown of each record, checked against this test's own table.
    let rows = public_rows(&real).await;
    for find in FINDS {
        let row = &rows[find.id];
        let shown = (row["decimalLatitude"].as_str(), row["decimalLongitude"].as_str());
        match find.seen {
            Exact => assert_eq!(shown, (format!("{:.6}", find.at.0).as_str(), format!("{:.6}", find.at.1).as_str())),
            Rounded => {
                let expected = (format!("{:.1}", to_tenth(find.at.0)), format!("{:.1}", to_tenth(find.at.1)));
                assert_eq!(shown, (expected.0.as_str(), expected.1.as_str()), "{} ({})", find.id, find.guess);
                assert!(row["dataGeneralizations"].contains("0.1 degree"), "{}", find.id);
                for free_text in ["verbatimIdentification", "occurrenceRemarks", "recordedBy", "associatedMedia"] {
                    assert_eq!(row[free_text], "", "{}: {free_text} is free text", find.id);
                }
                assert_eq!(row["eventDate"].len(), 10, "{}: the day only", find.id);
            }
            Withheld => unreachable!("nothing is withheld with the demo checklist"),
        }
    }

    // The comparison is not blind: reviewers' full exports differ between the two servers.
    let full = "/api/export?format=csv&audience=full&state=any";
    let real_full = real.get(full).await.text().await.unwrap();
    let twin_full = twin.get(full).await.text().await.unwrap();
    assert_ne!(real_full, twin_full, "the twin really holds other places");
    assert!(real_full.contains("52.123456"));
    // And other sample ids: the public register names only those of records shown as recorded.
    let register = "/api/export?format=samples&audience=full&state=any";
    let twin_register = twin.get(register).await.text().await.unwrap();
    assert!(
        twin_register.contains("ELSEWHERE-") && !real.get(register).await.text().await.unwrap().contains("ELSEWHERE-")
    );
    let (_, public_register) = anonymous(&real, "/api/export?format=samples&state=any").await;
    let public_register = String::from_utf8(public_register).unwrap();
    assert!(public_register.contains("COVE-") && !public_register.contains("Secret Cove"), "{public_register}");
}

#[tokio::test]
async fn a_species_whose_location_is_withheld_is_never_placed_by_any_request() {
    let (real, twin) = real_and_twin(true).await;
    assert_eq!(bisect(&real, &twin, ANGEL, "state=any", 1).await, None, "no box holds it, however large");
    probe_everything(&real, &twin).await;
    let rows = public_rows(&real).await;
    for find in FINDS.iter().filter(|f| f.seen_when_angelsharks_are_withheld == Withheld) {
        let row = &rows[find.id];
        assert_eq!((row["decimalLatitude"].as_str(), row["decimalLongitude"].as_str()), ("", ""), "{}", find.id);
        assert_eq!(row["coordinateUncertaintyInMeters"], "", "{}", find.id);
        assert!(row["dataGeneralizations"].contains("withheld"), "{}", find.id);
    }
}
