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
];

pub(super) fn apply(conn: &mut Connection) -> Result<(), StoreError> {
    let applied: usize = conn.query_row("PRAGMA user_version", [], |row| row.get::<_, i64>(0))? as usize;
    for (index, (name, sql)) in MIGRATIONS.iter().enumerate().skip(applied) {
        let tx = conn.transaction()?;
        tx.execute_batch(sql).map_err(|source| StoreError::Migration { name, source })?;
        tx.pragma_update(None, "user_version", (index + 1) as i64)?;
        tx.commit()?;
        tracing::info!(migration = name, "applied migration");
    }
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn migrations_apply_once_and_record_their_count() {
        let mut conn = Connection::open_in_memory().unwrap();
        apply(&mut conn).unwrap();
        apply(&mut conn).unwrap();
        let version: i64 = conn.query_row("PRAGMA user_version", [], |row| row.get(0)).unwrap();
        assert_eq!(version as usize, MIGRATIONS.len());
    }
}
