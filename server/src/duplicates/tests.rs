//! The pair table and the index checks for the duplicates stage: each row is a change from
//! one base pair (a thornback ray stranded twice at Borth), the verdict it must get, the
//! range its score must fall in, and words its reasons must carry — with a near-miss on
//! each side of every threshold.

use chrono::{DateTime, Utc};
use shared_types::{Condition, LengthKind, Setting};

use super::*;
use crate::store::duplicates::{RawDup, RawPhoto};
use crate::taxa::TaxonIndex;

fn at(hours: f64) -> DateTime<Utc> {
    DateTime::parse_from_rfc3339("2026-03-01T08:00:00Z").unwrap().with_timezone(&Utc)
        + chrono::Duration::seconds((hours * 3600.0) as i64)
}

fn demo_names() -> TaxonIndex {
    TaxonIndex::new(crate::taxa::load_checklist(None).unwrap())
}

/// Raja clavata as the demo checklist has it (DW = 0.7 × TL, common practice there).
fn thornback() -> Species {
    species_named("Raja clavata", &demo_names())
}

const BORTH: (f64, f64) = (52.4890, -4.0530);

/// A thornback ray stranded at Borth, disc width 50 cm taped; rows change what they need.
fn ray(id: i64) -> DupRecord {
    DupRecord {
        observation_id: id,
        sightings: vec![Sighting::own(at(0.0), Some(BORTH), Some(10.0))],
        setting: Setting::BeachStranding,
        condition: Condition::FreshDead,
        species: thornback(),
        length: Some((LengthKind::DiscWidth, 50.0, false)),
        photo_hashes: vec![],
        original_hashes: vec![],
        photo_phashes: vec![],
    }
}

fn own(record: &mut DupRecord) -> &mut Sighting {
    &mut record.sightings[0]
}

/// 1e-3° of latitude is about 111.3 m near 52.5°N (common practice); distances here
/// are geodesic (GeographicLib's algorithm in `geo`), so a row's metres are within 0.1%.
fn north(record: &mut DupRecord, metres: f64) {
    let s = own(record);
    let (lat, lon) = s.position.unwrap();
    s.position = Some((lat + metres / 111_300.0, lon));
}

fn later(record: &mut DupRecord, hours: f64) {
    own(record).at = at(hours);
}

fn landed(base: &mut DupRecord, other: &mut DupRecord) {
    base.setting = Setting::AnglerCatch;
    other.setting = Setting::AnglerCatch;
}

fn both_uncertain(base: &mut DupRecord, other: &mut DupRecord, metres: f64) {
    own(base).uncertainty_m = Some(metres);
    own(other).uncertainty_m = Some(metres);
}

/// What a row expects.
enum Expect {
    /// A candidate, score in the range, reasons carrying every word.
    Candidate(f64, f64, &'static [&'static str]),
    /// Possible but under the line.
    Below(f64, f64, &'static [&'static str]),
    /// Ruled out, the reason carrying every word.
    Out(&'static [&'static str]),
}

type Edit = fn(&mut DupRecord, &mut DupRecord);

/// The score arithmetic is written beside each row: place p = 1 − d/allowed, time
/// t = 1 − gap/window, score = 0.35 p + 0.35 t + 0.15 species + 0.15 length.
const TABLE: &[(&str, Edit, Expect)] = &[
    (
        "the same record twice",
        |_, _| {},
        Expect::Candidate(
            0.999,
            1.0,
            &["0 m apart", "0.0 h apart", "the same taxon, Raja clavata", "50 and 50 cm disc width, 0% apart"],
        ),
    ),
    // p = 1 − 500/2014, t = 1 − 24/168: 0.35 × 1.609 + 0.3 = 0.863
    (
        "a day later, 500 m along the beach, decomposed",
        |_, o| {
            later(o, 24.0);
            north(o, 500.0);
            o.condition = Condition::Decomposed;
        },
        Expect::Candidate(0.855, 0.87, &["500 m apart", "24.0 h apart", "condition fresh dead then decomposed"]),
    ),
    // The candidate line: p = 1 − 1007/2014 = 0.5; t = 1 − 150/168 → 0.513, t = 1 − 162/168 → 0.488.
    (
        "score just over the line",
        |_, o| {
            later(o, 150.0);
            north(o, 1_007.0);
            o.condition = Condition::Decomposed;
        },
        Expect::Candidate(0.505, 0.52, &["150.0 h apart"]),
    ),
    (
        "score just under the line",
        |_, o| {
            later(o, 162.0);
            north(o, 1_007.0);
            o.condition = Condition::Decomposed;
        },
        Expect::Below(0.48, 0.495, &["under the 0.5 line"]),
    ),
    // Carcass place: ±10 m and ±10 m in quadrature (14 m) + 2,000 m drift = 2,014 m.
    (
        "carcass 2,000 m away: inside 2,014 m",
        |_, o| {
            north(o, 2_000.0);
            later(o, 2.0);
        },
        Expect::Candidate(0.64, 0.66, &["within the 2014 m"]),
    ),
    (
        "carcass 2,030 m away: outside 2,014 m",
        |_, o| {
            north(o, 2_030.0);
            later(o, 2.0);
        },
        Expect::Out(&["beyond the 2014 m allowed", "plus 2000 m drift"]),
    ),
    // ±300 m each: 424 m in quadrature (a plain sum would give 600 m) + 2,000 m = 2,424 m.
    (
        "carcass ±300 m each, 2,400 m away: inside 2,424 m",
        |b, o| {
            both_uncertain(b, o, 300.0);
            north(o, 2_400.0);
            later(o, 2.0);
        },
        Expect::Candidate(0.64, 0.66, &["within the 2424 m"]),
    ),
    (
        "carcass ±300 m each, 2,450 m away: outside 2,424 m",
        |b, o| {
            both_uncertain(b, o, 300.0);
            north(o, 2_450.0);
            later(o, 2.0);
        },
        Expect::Out(&["beyond the 2424 m allowed", "±300 m and ±300 m in quadrature"]),
    ),
    // Landed fish: 14 m + 200 m drift = 214 m; t = 1 − 0.5/12.
    (
        "landed fish 200 m away: inside 214 m",
        |b, o| {
            landed(b, o);
            north(o, 200.0);
            later(o, 0.5);
        },
        Expect::Candidate(0.65, 0.67, &["within the 214 m"]),
    ),
    (
        "landed fish 230 m away: outside 214 m",
        |b, o| {
            landed(b, o);
            north(o, 230.0);
            later(o, 0.5);
        },
        Expect::Out(&["beyond the 214 m allowed"]),
    ),
    // ±50 m each: 71 m + 200 m = 271 m.
    (
        "landed fish ±50 m each, 260 m away: inside 271 m",
        |b, o| {
            landed(b, o);
            both_uncertain(b, o, 50.0);
            north(o, 260.0);
            later(o, 0.5);
        },
        Expect::Candidate(0.64, 0.66, &["within the 271 m"]),
    ),
    (
        "landed fish ±50 m each, 280 m away: outside 271 m",
        |b, o| {
            landed(b, o);
            both_uncertain(b, o, 50.0);
            north(o, 280.0);
            later(o, 0.5);
        },
        Expect::Out(&["beyond the 271 m allowed"]),
    ),
    // Time: 0.35 + 0.35 × (1 − 167/168) + 0.3 = 0.652; landed 0.35 + 0.35 × (0.5/12) + 0.3 = 0.665.
    (
        "carcass 167 h later: inside seven days",
        |_, o| later(o, 167.0),
        Expect::Candidate(0.645, 0.66, &["167.0 h apart, within 168 h"]),
    ),
    (
        "carcass 169 h later: outside seven days",
        |_, o| later(o, 169.0),
        Expect::Out(&["169.0 h apart, beyond the 168 h window for a carcass"]),
    ),
    (
        "landed fish 11.5 h later: inside 12 h",
        |b, o| {
            landed(b, o);
            later(o, 11.5);
        },
        Expect::Candidate(0.66, 0.67, &["11.5 h apart, within 12 h"]),
    ),
    (
        "landed fish 12.5 h later: outside 12 h",
        |b, o| {
            landed(b, o);
            later(o, 12.5);
        },
        Expect::Out(&["beyond the 12 h window for a landed fish"]),
    ),
    // Condition: 0.35 + 0.35 × (1 − 5/168) + 0.3 = 0.990.
    (
        "condition fresher later: alive after fresh dead",
        |_, o| {
            later(o, 5.0);
            o.condition = Condition::Alive;
        },
        Expect::Out(&["fresh dead then alive", "does not get fresher"]),
    ),
    (
        "condition the same later",
        |_, o| later(o, 5.0),
        Expect::Candidate(0.985, 0.995, &["condition fresh dead then fresh dead"]),
    ),
    (
        "condition worse later",
        |_, o| {
            later(o, 5.0);
            o.condition = Condition::RemainsOnly;
        },
        Expect::Candidate(0.985, 0.995, &["fresh dead then remains only"]),
    ),
    (
        "fresher but earlier is fine",
        |_, o| {
            later(o, -5.0);
            o.condition = Condition::Alive;
        },
        Expect::Candidate(0.985, 0.995, &["alive then fresh dead"]),
    ),
    // Species: 0.7 + 0.15 × 0.7 + 0.15 = 0.955; unnamed 0.7 + 0.075 + 0.15 = 0.925.
    (
        "a genus contains the species",
        |_, o| o.species = Species::lineage(&["Raja", "Rajidae"]),
        Expect::Candidate(0.95, 0.96, &["Raja and Raja clavata: one contains the other"]),
    ),
    (
        "another species contradicts",
        |_, o| o.species = Species::lineage(&["Raja brachyura", "Raja", "Rajidae"]),
        Expect::Out(&["are different taxa", "Raja brachyura"]),
    ),
    (
        "an unnamed record may still be it",
        |_, o| o.species = Species::Unnamed,
        Expect::Candidate(0.92, 0.93, &["one of them is not named"]),
    ),
    (
        "a name not on the checklist is treated as unnamed",
        |_, o| o.species = Species::NotOnChecklist("big ray".into()),
        Expect::Candidate(0.92, 0.93, &["“big ray” is not a checklist name"]),
    ),
    // Length, same kind: score 0.85 + 0.15 × (1 − difference/tolerance).
    (
        "disc width 50 and 62 taped, 19%: inside 20%",
        |_, o| o.length = Some((LengthKind::DiscWidth, 62.0, false)),
        Expect::Candidate(0.85, 0.86, &["19% apart (within the 20% allowed for taped disc widths)"]),
    ),
    (
        "disc width 50 and 63 taped, 21%: outside 20%",
        |_, o| o.length = Some((LengthKind::DiscWidth, 63.0, false)),
        Expect::Out(&["21% apart, beyond the 20% allowed for taped disc widths"]),
    ),
    (
        "disc width 50 and 76 estimated, 34%: inside 35%",
        |_, o| o.length = Some((LengthKind::DiscWidth, 76.0, true)),
        Expect::Candidate(0.85, 0.86, &["within the 35% allowed for estimated disc widths"]),
    ),
    (
        "disc width 50 and 78 estimated, 36%: outside 35%",
        |_, o| o.length = Some((LengthKind::DiscWidth, 78.0, true)),
        Expect::Out(&["beyond the 35% allowed for estimated disc widths"]),
    ),
    (
        "total length 50 and 58 taped, 14%: inside 15%",
        |b, o| {
            b.length = Some((LengthKind::Total, 50.0, false));
            o.length = Some((LengthKind::Total, 58.0, false));
        },
        Expect::Candidate(0.855, 0.87, &["within the 15% allowed for taped total lengths"]),
    ),
    (
        "total length 50 and 60 taped, 17%: outside 15%",
        |b, o| {
            b.length = Some((LengthKind::Total, 50.0, false));
            o.length = Some((LengthKind::Total, 60.0, false));
        },
        Expect::Out(&["beyond the 15% allowed for taped total lengths"]),
    ),
    (
        "fork length 50 and 55 taped, 9%: inside 10%",
        |b, o| {
            b.length = Some((LengthKind::Fork, 50.0, false));
            o.length = Some((LengthKind::Fork, 55.0, false));
        },
        Expect::Candidate(0.85, 0.865, &["within the 10% allowed for taped fork lengths"]),
    ),
    (
        "fork length 50 and 56 taped, 11%: outside 10% (a total length would pass)",
        |b, o| {
            b.length = Some((LengthKind::Fork, 50.0, false));
            o.length = Some((LengthKind::Fork, 56.0, false));
        },
        Expect::Out(&["beyond the 10% allowed for taped fork lengths"]),
    ),
    // Two kinds, species known: disc width 50 cm is 50 / 0.7 = 71.4 cm total length by the
    // checklist's equation; tolerance max(20%, 15%) + 5% = 25%.
    (
        "disc width 50 against total length 72, converted: 1%",
        |_, o| o.length = Some((LengthKind::Total, 72.0, false)),
        Expect::Candidate(
            0.99,
            1.0,
            &[
                "50 cm disc width",
                "72 cm total length",
                "cm total length for Raja clavata (the checklist's DW = 0.7 × TL + 0), 1% apart",
            ],
        ),
    ),
    (
        "disc width 50 against total length 94, converted: 24%, inside 25%",
        |_, o| o.length = Some((LengthKind::Total, 94.0, false)),
        Expect::Candidate(0.85, 0.86, &["24% apart (within the 25% allowed for taped lengths of two kinds)"]),
    ),
    (
        "disc width 50 against total length 96, converted: 26%, outside 25%",
        |_, o| o.length = Some((LengthKind::Total, 96.0, false)),
        Expect::Out(&["26% apart, beyond the 25% allowed"]),
    ),
    // Two kinds, no species: length says nothing (0.5): 0.7 + 0.075 + 0.075 = 0.85.
    (
        "disc width against total length, species unknown",
        |b, o| {
            b.species = Species::Unnamed;
            o.species = Species::Unnamed;
            o.length = Some((LengthKind::Total, 150.0, false));
        },
        Expect::Candidate(0.845, 0.855, &["are not comparable without a known species", "neither of them is named"]),
    ),
    // Photos alike lift the under-the-line pair (0.488) by 0.2 at 10 bits, not at 11.
    (
        "photos 10 bits apart lift a pair over the line",
        |b, o| {
            later(o, 162.0);
            north(o, 1_007.0);
            o.condition = Condition::Decomposed;
            b.photo_phashes = vec!["0000000000000000".into()];
            o.photo_phashes = vec!["00000000000003ff".into()];
        },
        Expect::Candidate(0.68, 0.695, &["perceptual hashes 10 bits apart"]),
    ),
    (
        "photos 11 bits apart do not",
        |b, o| {
            later(o, 162.0);
            north(o, 1_007.0);
            o.condition = Condition::Decomposed;
            b.photo_phashes = vec!["0000000000000000".into()];
            o.photo_phashes = vec!["00000000000007ff".into()];
        },
        Expect::Below(0.48, 0.495, &["under the 0.5 line"]),
    ),
    (
        "photos alike never override another species",
        |b, o| {
            b.photo_phashes = vec!["0000000000000000".into()];
            o.photo_phashes = vec!["0000000000000001".into()];
            o.species = Species::lineage(&["Squalus acanthias"]);
        },
        Expect::Out(&["are different taxa"]),
    ),
    (
        "the same photo file decides alone, a month later and another species",
        |b, o| {
            later(o, 24.0 * 30.0);
            o.species = Species::lineage(&["Squalus acanthias"]);
            b.photo_hashes = vec!["ab".repeat(32)];
            o.photo_hashes = vec!["ab".repeat(32)];
        },
        Expect::Candidate(1.0, 1.0, &["the same photo file (SHA-256 abababababab…)"]),
    ),
    (
        "the same original photo decides alone, with no position",
        |b, o| {
            own(o).position = None;
            b.original_hashes = vec!["cd".repeat(32)];
            o.original_hashes = vec!["cd".repeat(32)];
        },
        Expect::Candidate(1.0, 1.0, &["the same original photo, picked on both phones"]),
    ),
    (
        "different photo files say nothing alone",
        |b, o| {
            own(o).position = None;
            b.photo_hashes = vec!["ab".repeat(32)];
            o.photo_hashes = vec!["cd".repeat(32)];
        },
        Expect::Out(&["no position good enough to compare"]),
    ),
    // A photo's place for a record with none: ±8 m from its GPSHPositioningError.
    (
        "a record with no position matched by its photo's place",
        |_, o| {
            own(o).position = None;
            o.sightings.push(photo_at_borth());
        },
        Expect::Candidate(
            0.99,
            1.0,
            &[
                "the place of photo 1's EXIF (the phone's reading of the original, ±8 m) was used, because the record has no position",
            ],
        ),
    ),
    (
        "a position known to ±12 km is not compared",
        |_, o| own(o).uncertainty_m = Some(12_000.0),
        Expect::Out(&["uncertain by more than 10 km"]),
    ),
];

/// What `sightings` makes of a record with no position whose photo's GPS says Borth.
fn photo_at_borth() -> Sighting {
    Sighting {
        at: at(0.0),
        position: Some(BORTH),
        uncertainty_m: Some(8.0),
        from_photo: Some("for one report the place of photo 1's EXIF (the phone's reading of the original, ±8 m) was used, because the record has no position".into()),
    }
}

fn check(name: &str, verdict: &Verdict, expected: &Expect) {
    let has_all = |text: &str, words: &[&str]| words.iter().all(|w| text.contains(w));
    match (verdict, expected) {
        (Verdict::Candidate(c), Expect::Candidate(lo, hi, words))
        | (Verdict::BelowLine(c), Expect::Below(lo, hi, words)) => {
            assert!((*lo..=*hi).contains(&c.score), "{name}: score {} outside {lo}–{hi}: {c:?}", c.score);
            assert!(has_all(&c.reasons.join(" | "), words), "{name}: reasons {:?} lack {words:?}", c.reasons);
        }
        (Verdict::RuledOut(why), Expect::Out(words)) => {
            assert!(has_all(why, words), "{name}: ruled out for {why:?}, expected {words:?}")
        }
        (other, _) => panic!("{name}: wrong verdict {other:?}"),
    }
}

#[test]
fn the_pair_table() {
    for (name, edit, expected) in TABLE {
        let (mut base, mut other) = (ray(1), ray(2));
        edit(&mut base, &mut other);
        check(name, &judge(&base, &other), expected);
        check(&format!("{name} (either order)"), &judge(&other, &base), expected);
    }
}

#[test]
fn a_photo_time_is_used_when_the_record_time_is_flagged_and_the_better_sighting_wins() {
    let mut base = ray(1);
    base.setting = Setting::AnglerCatch;
    let mut other = base.clone();
    other.observation_id = 2;
    // Written up three days later; its photo was taken an hour after the first report.
    own(&mut other).at = at(72.0);
    assert!(matches!(judge(&base, &other), Verdict::RuledOut(_)));
    other.sightings.push(Sighting {
        at: at(1.0),
        position: Some(BORTH),
        uncertainty_m: Some(5.0),
        from_photo: Some("for one report the time of photo 1's EXIF was used".into()),
    });
    let Verdict::Candidate(found) = judge(&base, &other) else { panic!("the photo's time matches") };
    assert!(found.reasons.iter().any(|r| r.contains("the time of photo 1's EXIF")), "{found:?}");
    assert!((found.gap_hours - 1.0).abs() < 1e-9);
    // When the record's own time fits better, it is used and no photo reason is given.
    own(&mut other).at = at(0.5);
    let Verdict::Candidate(found) = judge(&base, &other) else { panic!() };
    assert!(found.reasons.iter().all(|r| !r.contains("photo 1")), "{found:?}");
}

fn raw(position: Option<(f64, f64)>, photos: Vec<RawPhoto>) -> RawDup {
    RawDup {
        observation_id: 7,
        at_utc: "2026-03-04T08:00:00Z".into(),
        position,
        accuracy_m: Some(10.0),
        setting: "angler_catch".into(),
        condition: "fresh_dead".into(),
        taxon_name: Some("big ray".into()),
        length: None,
        photos,
    }
}

fn phone_photo(json: &str, flags: &[&str]) -> RawPhoto {
    RawPhoto {
        number: 1,
        sha256: "ab".repeat(32),
        time_reading: Some("phone".into()),
        place_reading: Some("phone".into()),
        phone_exif_json: Some(json.into()),
        flags: flags.iter().map(|f| (*f).to_owned()).collect(),
        ..RawPhoto::default()
    }
}

#[test]
fn sightings_use_the_photo_only_when_the_record_lacks_a_place_or_the_photo_is_flagged() {
    let record_at = at(72.0);
    let phone = r#"{"taken_local":"2026:03:01 09:00:00","offset":"+01:00","taken_at":"2026-03-01T09:00:00+01:00","offset_source":"photo","latitude":52.489,"longitude":-4.053,"altitude_m":null,"horizontal_error_m":8.0,"orientation":null}"#;
    // No position: the phone's reading gives time and place, GPSHPositioningError as uncertainty.
    let found = sightings(&raw(None, vec![phone_photo(phone, &[])]), record_at);
    assert_eq!(found.len(), 2);
    assert_eq!(found[1].position, Some((52.489, -4.053)));
    assert_eq!(found[1].uncertainty_m, Some(8.0));
    assert_eq!(found[1].at, at(0.0));
    assert!(found[1].from_photo.as_deref().unwrap().contains("the time and place of photo 1's EXIF (the phone's reading of the original, ±8 m) was used, because the record has no position"));
    // A position and no flag: the record's own only.
    assert_eq!(sightings(&raw(Some(BORTH), vec![phone_photo(phone, &[])]), record_at).len(), 1);
    // Flagged as taken long before: the photo's time (and place) are tried too.
    let found =
        sightings(&raw(Some((52.5, -4.06)), vec![phone_photo(phone, &["taken_long_before_record"])]), record_at);
    assert_eq!(found[1].at, at(0.0));
    assert!(found[1].from_photo.as_deref().unwrap().contains("photo 1 was flagged as taken long before the record"));
    // The server's reading of the received file, when intake compared that one.
    let file = RawPhoto {
        number: 2,
        time_reading: Some("received_file".into()),
        place_reading: Some("received_file".into()),
        file_taken_at: Some("2026-03-01T08:30:00+00:00".into()),
        file_position: Some((52.49, -4.05)),
        file_error_m: Some(30.0),
        flags: vec!["taken_far_from_record".into()],
        ..RawPhoto::default()
    };
    let found = sightings(&raw(Some((52.6, -4.2)), vec![file]), record_at);
    assert_eq!((found[1].position, found[1].uncertainty_m, found[1].at), (Some((52.49, -4.05)), Some(30.0), at(0.5)));
    assert!(found[1].from_photo.as_deref().unwrap().contains("the EXIF of the file received, ±30 m) was used, because photo 2 was flagged as taken far from the record's place"));
    // Field by field: the time from the phone's reading, the place from the file received.
    let mixed = RawPhoto {
        time_reading: Some("phone".into()),
        place_reading: Some("received_file".into()),
        file_position: Some((52.49, -4.05)),
        file_error_m: Some(30.0),
        ..phone_photo(phone, &["taken_far_from_record"])
    };
    let found = sightings(&raw(Some((52.6, -4.2)), vec![mixed]), record_at);
    assert_eq!((found[1].position, found[1].uncertainty_m, found[1].at), (Some((52.49, -4.05)), Some(30.0), at(0.0)));
    assert!(
        found[1]
            .from_photo
            .as_deref()
            .unwrap()
            .contains("the phone's reading of the original for the time, the EXIF of the file received for the place")
    );
    // A phone reading off the globe is not a place.
    let off = r#"{"taken_local":null,"offset":null,"taken_at":null,"offset_source":null,"latitude":95.0,"longitude":-4.05,"altitude_m":null,"horizontal_error_m":null,"orientation":null}"#;
    assert_eq!(sightings(&raw(None, vec![phone_photo(off, &[])]), record_at).len(), 1);
}

#[test]
fn names_resolve_to_the_checklist_or_count_as_unnamed() {
    let names = demo_names();
    let Species::Named { lineage, taxon } = species_named("thornback ray", &names) else { panic!() };
    assert_eq!(lineage, ["Raja clavata", "Raja", "Rajidae", "Rajiformes", "Batoidea"]);
    assert!(taxon.is_some());
    let Species::Named { lineage, taxon } = species_named("Raja", &names) else { panic!() };
    assert_eq!(lineage[..2], ["Raja", "Rajidae"]);
    assert!(taxon.is_none());
    assert_eq!(species_named(" big ray ", &names), Species::NotOnChecklist("big ray".into()));
    // Through from_raw: "big ray" against Raja clavata is no contradiction.
    let big = from_raw(&raw(Some(BORTH), vec![]), &names).unwrap();
    let mut thornback_landed = ray(8);
    thornback_landed.setting = Setting::AnglerCatch;
    own(&mut thornback_landed).at = at(72.0);
    let found = score(&big, &thornback_landed).expect("a free-text name does not rule the pair out");
    assert!(found.reasons.iter().any(|r| r.contains("“big ray” is not a checklist name")), "{found:?}");
}

#[test]
fn length_tolerances_are_stated_for_every_kind() {
    for kind in LengthKind::ALL {
        assert!(LENGTH_TOLERANCES.iter().any(|(k, taped, by_eye)| *k == kind && taped < by_eye), "{kind:?}");
    }
    assert_eq!(length_tolerance(LengthKind::Fork, false), 0.10);
    assert_eq!(length_tolerance(LengthKind::DiscWidth, true), 0.35);
}

#[test]
fn the_index_finds_neighbours_across_the_antimeridian_and_only_in_the_time_window() {
    let index = Index::build([
        (1, (0.0, 179.9999), None, at(0.0)),
        (2, (0.0, -179.9999), None, at(1.0)),
        (3, (0.0, 170.0), None, at(0.0)),
        (4, (0.0, 179.9999), None, at(24.0 * 30.0)),
    ]);
    // 0.0002° of longitude at the equator is about 22 m (common practice); record 4
    // is a month later.
    assert_eq!(index.possible_pairs((0.0, 179.9999), None, at(0.0)), [1, 2]);
}

#[test]
fn the_search_reaches_every_pair_judge_can_place() {
    // Every combination of distance and uncertainties near the edge: whenever the pair is
    // not ruled out by place or time, the index must return it.
    let mut checked = 0;
    for u in [1.0, 10.0, 300.0, 2_000.0, 9_000.0] {
        for v in [1.0, 50.0, 800.0, 9_900.0] {
            let allowed = f64::hypot(u, v) + DRIFT_CARCASS_M;
            for fraction in [0.5, 0.9, 0.99, 0.999] {
                let a = DupRecord { sightings: vec![Sighting::own(at(0.0), Some(BORTH), Some(u))], ..ray(1) };
                let mut b = DupRecord { sightings: vec![Sighting::own(at(160.0), Some(BORTH), Some(v))], ..ray(2) };
                b.condition = Condition::Decomposed;
                north(&mut b, allowed * fraction);
                let placed = !matches!(judge(&a, &b), Verdict::RuledOut(_));
                let index = Index::build(index_points(&b));
                let found = index.possible_pairs(BORTH, Some(u), at(0.0));
                if placed {
                    checked += 1;
                    assert_eq!(found, [2], "u {u}, v {v}, {fraction} of {allowed:.0} m");
                }
            }
        }
    }
    assert_eq!(checked, 80, "every pair in the sweep is within its allowed gap");
}

#[test]
fn a_large_uncertainty_widens_only_its_own_search_box() {
    // Record 1 is known to ±8 km, 100 km south; records 2 and 3 are 5 km apart with ±10 m.
    // With one box size for all (as wide as the largest uncertainty) a search at 2 would
    // reach 3; with a box per place it does not.
    let index = Index::build([
        (1, (51.6, -4.0), Some(8_000.0), at(0.0)),
        (2, (52.5, -4.0), Some(10.0), at(0.0)),
        (3, (52.545, -4.0), Some(10.0), at(0.0)),
    ]);
    assert_eq!(index.possible_pairs((52.5, -4.0), Some(10.0), at(1.0)), [2]);
    // The uncertain record is still found where it could be the same animal: 9 km away.
    assert_eq!(index.possible_pairs((51.681, -4.0), Some(10.0), at(1.0)), [1]);
    // A position worse than 10 km is neither indexed nor searched.
    let mut index = Index::build([(4, (52.5, -4.0), Some(50_000.0), at(0.0))]);
    assert!(index.is_empty());
    assert!(index.possible_pairs((52.5, -4.0), Some(50_000.0), at(0.0)).is_empty());
    // Adding the same place of the same record twice keeps one entry.
    index.insert((5, (52.5, -4.0), Some(10.0), at(0.0)));
    index.insert((5, (52.5, -4.0), Some(10.0), at(0.0)));
    assert_eq!(index.len(), 1);
}
