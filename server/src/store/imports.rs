//! Where imported records came from (`imported_records`, migration 0019): the dataset,
//! the file and the source's own id for the row, written once per imported observation
//! and read back by exports (Darwin Core `datasetName`, `otherCatalogNumbers`).

use rusqlite::{Connection, OptionalExtension as _, params};

use super::StoreError;

/// One imported record's origin.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Provenance {
    /// The dataset the record was kept in before (Darwin Core `datasetName`).
    pub dataset_name: String,
    /// The file it was read from, as the operator named it.
    pub source_file: String,
    /// The source's id for the row: its occurrenceID, or `row-sha256:<hash>` of the row.
    pub source_row_id: String,
    /// The row's first line in the file (1 is the header).
    pub source_line: u64,
}

/// Records where observation `observation_id` came from. A second call for the same
/// observation keeps the first origin (a re-run of an import changes nothing).
pub fn record_provenance(
    conn: &Connection,
    observation_id: i64,
    origin: &Provenance,
    imported_at: &str,
) -> Result<bool, StoreError> {
    let added = conn.execute(
        "INSERT INTO imported_records (observation_id, dataset_name, source_file, source_row_id, source_line, imported_at)
         VALUES (?1, ?2, ?3, ?4, ?5, ?6) ON CONFLICT(observation_id) DO NOTHING",
        params![
            observation_id,
            origin.dataset_name,
            origin.source_file,
            origin.source_row_id,
            origin.source_line as i64,
            imported_at
        ],
    )?;
    Ok(added == 1)
}

/// Where observation `observation_id` came from, when it was imported.
pub fn provenance_of(conn: &Connection, observation_id: i64) -> Result<Option<Provenance>, StoreError> {
    Ok(conn
        .prepare_cached(
            "SELECT dataset_name, source_file, source_row_id, source_line FROM imported_records WHERE observation_id = ?1",
        )?
        .query_row([observation_id], |row| {
            Ok(Provenance {
                dataset_name: row.get(0)?,
                source_file: row.get(1)?,
                source_row_id: row.get(2)?,
                source_line: row.get::<_, i64>(3)? as u64,
            })
        })
        .optional()?)
}

/// How many possible duplicates the search linked to observation `observation_id`.
pub fn candidate_count(conn: &Connection, observation_id: i64) -> Result<u64, StoreError> {
    Ok(conn
        .prepare_cached("SELECT COUNT(*) FROM duplicate_candidates WHERE observation_a = ?1 OR observation_b = ?1")?
        .query_row([observation_id], |row| row.get::<_, i64>(0))? as u64)
}
