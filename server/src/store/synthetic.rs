//! Invented records in bulk, for benchmarks and load tests: many organisms with an
//! identification, a length, signs and shared photos, and survey walks that half of them
//! were found on (so archives take the Event-core path, with absences), written straight
//! into the tables in one transaction. Nothing here runs in the server; the export
//! benchmark fills a scratch database with it.

use rusqlite::{Connection, params};

use super::StoreError;

/// Guesses the records carry, some of them of sensitive species in the demo checklist.
const GUESSES: &[&str] = &[
    "small-spotted catshark",
    "thornback ray",
    "tope",
    "angelshark",
    "blonde ray",
    "spurdog",
    "flapper skate",
    "some ray",
];

/// Records per invented survey walk; every other record of each run is found on it.
pub const RECORDS_PER_WALK: u64 = 40;

/// Writes `count` invented organisms, one observation each, around Cardigan Bay, and one
/// survey walk for every [`RECORDS_PER_WALK`] of them.
pub fn fill(conn: &mut Connection, count: u64) -> Result<(), StoreError> {
    let tx = conn.transaction()?;
    tx.execute(
        "INSERT OR IGNORE INTO photos (sha256, media_type, byte_len, stored_at) VALUES (?1, 'image/jpeg', 1000, '2026-01-01T00:00:00Z')",
        ["0".repeat(64)],
    )?;
    {
        let mut organism = tx.prepare("INSERT INTO organisms (id, created_at) VALUES (?1, '2026-01-01T00:00:00Z')")?;
        let mut observation = tx.prepare(
            "INSERT INTO observations (id, client_id, content_sha256, organism_id, observed_at, observed_at_utc, latitude, longitude,
                accuracy_m, position_source, count, condition, setting, sex, notes, observer_name, review_state, submission_json, received_at)
             VALUES (?1, ?2, '', ?1, ?3, ?4, ?5, ?6, ?7, 'device', 1, 'fresh_dead', 'beach_stranding', 'female', 'invented record',
                'Bench Observer', 'confirmed', '{}', '2026-01-01T00:00:00Z')",
        )?;
        let mut identification = tx.prepare(
            "INSERT INTO identifications (observation_id, taxon_name, identified_by, identified_at, basis)
             VALUES (?1, ?2, 'Bench Observer', '2026-01-01T00:00:00Z', 'observer guess')",
        )?;
        let mut length = tx.prepare(
            "INSERT INTO measurements (observation_id, kind, value, unit, value_cm, method) VALUES (?1, 'total', ?2, 'cm', ?2, 'measured')",
        )?;
        let mut sign = tx.prepare("INSERT INTO human_signs (observation_id, sign) VALUES (?1, 'hook')")?;
        let mut photo =
            tx.prepare("INSERT INTO observation_photos (observation_id, photo_sha256, position) VALUES (?1, ?2, 0)")?;
        let mut walk = tx.prepare(
            "INSERT INTO walks (client_id, started_at, ended_at, all_finds_reported, distance_m, received_at, content_sha256,
                submission_json, stretch, observer_name, duration_s, distance_source)
             VALUES (?1, ?2, ?3, ?4, ?5, '2026-01-01T00:00:00Z', '', ?6, 'Invented Strand', 'Bench Observer', 5400, 'track')",
        )?;
        let mut on_walk = tx.prepare("UPDATE observations SET walk_client_id = ?1 WHERE id = ?2")?;
        let zero_hash = "0".repeat(64);
        let mut state: u64 = 0x2545_f491_4f6c_dd1d;
        for id in 1..=count as i64 {
            // xorshift: the same invented data on every run.
            state ^= state << 13;
            state ^= state >> 7;
            state ^= state << 17;
            let unit = |shift: u32| ((state >> shift) & 0xffff) as f64 / 65_535.0;
            let day = 1 + (state % 28);
            let month = 1 + (state >> 8) % 12;
            let year = 2010 + (state >> 16) % 16;
            organism.execute([id])?;
            observation.execute(params![
                id,
                format!("00000000-0000-4000-8000-{id:012}"),
                format!("{year}-{month:02}-{day:02}T10:00:00+00:00"),
                format!("{year}-{month:02}-{day:02}T10:00:00Z"),
                52.0 + 0.5 * unit(20),
                -4.6 + 0.6 * unit(36),
                5.0 + 50.0 * unit(4),
            ])?;
            identification.execute(params![id, GUESSES[(state >> 40) as usize % GUESSES.len()]])?;
            let run = (id as u64 - 1) / RECORDS_PER_WALK;
            if (id as u64 - 1).is_multiple_of(RECORDS_PER_WALK) {
                let day = format!("{year}-{month:02}-{day:02}");
                let (lat, lon) = (52.0 + 0.5 * unit(20), -4.6 + 0.6 * unit(36));
                let invented = invented_walk(run, &day, (lat, lon));
                let json = serde_json::to_string(&invented).map_err(|err| StoreError::Corrupt(err.to_string()))?;
                let effort = invented.effort();
                walk.execute(params![
                    walk_id(run),
                    invented.started_at.to_rfc3339(),
                    invented.ended_at.to_rfc3339(),
                    invented.all_finds_reported,
                    effort.distance_m,
                    json,
                ])?;
            }
            if id % 2 == 0 {
                on_walk.execute(params![walk_id(run), id])?;
            }
            length.execute(params![id, 30.0 + 150.0 * unit(44)])?;
            if id % 4 == 0 {
                sign.execute([id])?;
            }
            if id % 10 == 0 {
                photo.execute(params![id, zero_hash])?;
            }
        }
    }
    tx.commit()?;
    Ok(())
}

fn walk_id(run: u64) -> String {
    format!("00000000-0000-4000-9000-{run:012}")
}

/// An invented walk of 1.5 hours on `day` with five fixes northwards from `start`; two
/// walks in three promise every find.
fn invented_walk(run: u64, day: &str, (lat, lon): (f64, f64)) -> shared_types::WalkSubmission {
    let at = |minutes: u32| {
        chrono::DateTime::parse_from_rfc3339(&format!("{day}T09:{minutes:02}:00+00:00")).expect("an invented time")
    };
    let track = (0..5)
        .map(|i| shared_types::TrackPoint {
            latitude: shared_types::Latitude::parse(lat + 0.002 * f64::from(i)).expect("an invented latitude"),
            longitude: shared_types::Longitude::parse(lon).expect("an invented longitude"),
            accuracy_m: shared_types::AccuracyM::parse(6.0).ok(),
            at: at(10 * i),
        })
        .collect();
    shared_types::WalkSubmission {
        client_id: uuid::Uuid::parse_str(&walk_id(run)).expect("an invented id"),
        started_at: at(0),
        ended_at: at(0) + chrono::Duration::minutes(90),
        stretch: shared_types::Text::parse("Invented Strand").ok(),
        all_finds_reported: !run.is_multiple_of(3),
        track,
        typed_distance_m: None,
        observer_name: shared_types::Text::parse("Bench Observer").ok(),
    }
}
