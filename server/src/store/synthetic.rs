//! Invented records in bulk, for benchmarks: many organisms with an identification, a
//! length, signs and shared photos, written straight into the tables in one transaction.
//! Nothing here runs in the server; the export benchmark fills a scratch database with it.

use rusqlite::{Connection, params};

use super::StoreError;

/// Guesses the records carry, some of them of sensitive species in the demo checklist.
const GUESSES: &[&str] = &["small-spotted catshark", "thornback ray", "tope", "angelshark", "blonde ray", "spurdog", "flapper skate", "some ray"];

/// Writes `count` invented organisms, one observation each, around Cardigan Bay.
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
        let mut photo = tx.prepare("INSERT INTO observation_photos (observation_id, photo_sha256, position) VALUES (?1, ?2, 0)")?;
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
