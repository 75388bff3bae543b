//! Applies the numbered SQL files in `migrations/`, in order, once each.
//!
//! The files are compiled into the binary, so a deployed server needs no source tree.
//! SQLite's `user_version` holds how many have been applied. Landed migrations are
//! append-only: change the schema with a new file, never by editing an old one.

use rusqlite::Connection;

use super::StoreError;

/// Every migration, in the order it must run.
const MIGRATIONS: &[(&str, &str)] = &[
    ("0001_initial", include_str!("../../../migrations/0001_initial.sql")),
    ("0002_photo_derivatives", include_str!("../../../migrations/0002_photo_derivatives.sql")),
    ("0003_photo_flags", include_str!("../../../migrations/0003_photo_flags.sql")),
    ("0004_phone_exif", include_str!("../../../migrations/0004_phone_exif.sql")),
    ("0005_observation_flags", include_str!("../../../migrations/0005_observation_flags.sql")),
    ("0006_walk_details", include_str!("../../../migrations/0006_walk_details.sql")),
    ("0007_people_and_review", include_str!("../../../migrations/0007_people_and_review.sql")),
    ("0008_duplicates", include_str!("../../../migrations/0008_duplicates.sql")),
    ("0009_photo_reading_per_field", include_str!("../../../migrations/0009_photo_reading_per_field.sql")),
    ("0010_duplicate_moves", include_str!("../../../migrations/0010_duplicate_moves.sql")),
    ("0011_life_stage", include_str!("../../../migrations/0011_life_stage.sql")),
    (
        "0012_review_reasons_and_people_audit",
        include_str!("../../../migrations/0012_review_reasons_and_people_audit.sql"),
    ),
    ("0013_observer_identification_time", include_str!("../../../migrations/0013_observer_identification_time.sql")),
    ("0014_deployment_id", include_str!("../../../migrations/0014_deployment_id.sql")),
    ("0015_name_consent", include_str!("../../../migrations/0015_name_consent.sql")),
    ("0016_photo_cut_short", include_str!("../../../migrations/0016_photo_cut_short.sql")),
    ("0017_current_taxon_index", include_str!("../../../migrations/0017_current_taxon_index.sql")),
    ("0018_fieldwork", include_str!("../../../migrations/0018_fieldwork.sql")),
    ("0019_imported_records", include_str!("../../../migrations/0019_imported_records.sql")),
    ("0020_published_versions", include_str!("../../../migrations/0020_published_versions.sql")),
];

/// Migrations that rebuild a table other tables refer to. SQLite's procedure for that
/// (its documentation of ALTER TABLE, "other kinds of table schema changes") turns
/// foreign keys off outside the transaction, and checks them all before committing.
const REBUILDS_TABLES: &[&str] = &["0018_fieldwork"];

pub(super) fn apply(conn: &mut Connection) -> Result<(), StoreError> {
    let applied: usize = conn.query_row("PRAGMA user_version", [], |row| row.get::<_, i64>(0))? as usize;
    for (index, (name, sql)) in MIGRATIONS.iter().enumerate().skip(applied) {
        let rebuild = REBUILDS_TABLES.contains(name);
        let keys_were_on: bool = conn.query_row("PRAGMA foreign_keys", [], |row| row.get(0))?;
        if rebuild {
            conn.pragma_update(None, "foreign_keys", "OFF")?;
        }
        let outcome = apply_one(conn, index, name, sql, rebuild);
        if rebuild && keys_were_on {
            conn.pragma_update(None, "foreign_keys", "ON")?;
        }
        outcome?;
        tracing::info!(migration = name, "applied migration");
    }
    Ok(())
}

fn apply_one(
    conn: &mut Connection,
    index: usize,
    name: &'static str,
    sql: &str,
    rebuild: bool,
) -> Result<(), StoreError> {
    let tx = conn.transaction()?;
    tx.execute_batch(sql).map_err(|source| StoreError::Migration { name, source })?;
    if rebuild {
        let broken: i64 = tx.query_row("SELECT count(*) FROM pragma_foreign_key_check", [], |row| row.get(0))?;
        if broken > 0 {
            return Err(StoreError::Corrupt(format!("migration {name} would leave {broken} broken references")));
        }
    }
    tx.pragma_update(None, "user_version", (index + 1) as i64)?;
    tx.commit()?;
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The responder role rebuilds `people` (0013): a database with sign-ins, sessions
    /// and audit rows pointing at them keeps every row and every link.
    #[test]
    fn rebuilding_people_keeps_every_person_and_every_reference() {
        let mut conn = Connection::open_in_memory().unwrap();
        conn.pragma_update(None, "foreign_keys", "ON").unwrap();
        let before = MIGRATIONS.iter().position(|(name, _)| *name == "0018_fieldwork").unwrap();
        for (_, sql) in &MIGRATIONS[..before] {
            conn.execute_batch(sql).unwrap();
        }
        conn.pragma_update(None, "user_version", before as i64).unwrap();
        conn.execute_batch(
            "INSERT INTO people (id, role, display_name, created_at, username, password_hash) VALUES (7, 'reviewer', 'Rhian', 't', 'rhian', 'h');
             INSERT INTO people (id, role, display_name, contact, created_at, device_token_sha256) VALUES (8, 'observer', 'Gwen', 'gwen@example.org', 't', 'd');
             INSERT INTO sessions VALUES ('s', 7, 'c', 't', 'e');
             INSERT INTO people_events (person_id, by_person_id, action, at) VALUES (8, 7, 'added', 't');",
        )
        .unwrap();
        apply(&mut conn).unwrap();
        let people: Vec<(i64, String, Option<String>)> = conn
            .prepare("SELECT id, role, contact FROM people ORDER BY id")
            .unwrap()
            .query_map([], |row| Ok((row.get(0)?, row.get(1)?, row.get(2)?)))
            .unwrap()
            .collect::<Result<_, _>>()
            .unwrap();
        assert_eq!(people, [(7, "reviewer".into(), None), (8, "observer".into(), Some("gwen@example.org".into()))]);
        let broken: i64 =
            conn.query_row("SELECT count(*) FROM pragma_foreign_key_check", [], |row| row.get(0)).unwrap();
        assert_eq!(broken, 0, "every reference to people still holds");
        conn.execute("INSERT INTO people (role, created_at) VALUES ('responder', 't')", []).unwrap();
        assert!(conn.execute("INSERT INTO people (role, created_at) VALUES ('visitor', 't')", []).is_err());
    }

    #[test]
    fn migrations_apply_once_and_record_their_count() {
        let mut conn = Connection::open_in_memory().unwrap();
        apply(&mut conn).unwrap();
        apply(&mut conn).unwrap();
        let version: i64 = conn.query_row("PRAGMA user_version", [], |row| row.get(0)).unwrap();
        assert_eq!(version as usize, MIGRATIONS.len());
    }
}
