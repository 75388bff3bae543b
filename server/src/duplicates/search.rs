//! The search for duplicates of one stored record, and the index built at start-up.
//!
//! A search runs after its record is stored and is marked done in the savepoint that
//! keeps its candidates (`duplicate_searches`), so one that failed is run again in the
//! background (`later.rs`), on the phone's resend and at the next start.

use std::sync::{Arc, Mutex};

use chrono::{DateTime, Utc};

use super::{Index, candidates, from_raw, index_points, raw_index_points};
use crate::store::duplicates::{raw_records, records_after, save_candidates, searched, sharing_a_photo};
use crate::store::{self, Store, StoreError};
use crate::taxa::TaxonIndex;

/// Searches for other reports of the same animal as the stored record `observation_id`
/// and keeps the candidates for reviewers, unless that was done already (a resend).
pub async fn search_once(
    store: &Store,
    index: &Arc<Mutex<Index>>,
    names: &Arc<TaxonIndex>,
    observation_id: i64,
    now: DateTime<Utc>,
) -> Result<(), StoreError> {
    let (index, names) = (index.clone(), names.clone());
    store.write(move |conn| search_unless_done(conn, &index, &names, observation_id, now)).await
}

/// [`search`], unless it was done already for this record (a resend, a retry).
pub fn search_unless_done(
    conn: &mut rusqlite::Connection,
    index: &Mutex<Index>,
    names: &TaxonIndex,
    observation_id: i64,
    now: DateTime<Utc>,
) -> Result<(), StoreError> {
    if searched(conn, observation_id)? {
        return Ok(());
    }
    search(conn, index, names, observation_id, now)
}

/// The search for one stored record: records holding the same photo (file or original)
/// at any time and place, and the index's neighbours of each of its places; the record's
/// places join the index. Searches run one at a time on the store's writer thread
/// (`Store::write`), which covers the index query and insert together, so of two
/// arrivals of one animal the second always finds the first (the race test in
/// `tests/it/duplicates.rs` fails when the insert moves outside it). Marks the search
/// done in the savepoint that keeps the candidates.
pub fn search(
    conn: &mut rusqlite::Connection,
    index: &Mutex<Index>,
    names: &TaxonIndex,
    observation_id: i64,
    now: DateTime<Utc>,
) -> Result<(), StoreError> {
    let Some(new) = raw_records(conn, &[observation_id])?.pop().and_then(|raw| from_raw(&raw, names)) else {
        // Merged already, or its stored codes do not read: nothing to look for.
        return save_candidates(conn, observation_id, &[], now);
    };
    // The same photo file is a candidate at any distance and time, with or without a position.
    let mut near = sharing_a_photo(conn, observation_id)?;
    {
        let mut index = index.lock().unwrap_or_else(|p| p.into_inner());
        for point in index_points(&new) {
            near.extend(index.possible_pairs(point.1, point.2, point.3));
        }
        for point in index_points(&new) {
            index.insert(point);
        }
    }
    near.retain(|id| *id != observation_id);
    near.sort_unstable();
    near.dedup();
    let others: Vec<_> = raw_records(conn, &near)?.iter().filter_map(|r| from_raw(r, names)).collect();
    let found: Vec<_> = candidates(&new, &others).into_iter().map(|(id, c)| (id, c.score, c.reasons)).collect();
    save_candidates(conn, observation_id, &found, now)
}

/// Takes into the index the places of records another process stored since it last took
/// one in (`wrackline import` beside a running server, or the server beside an import),
/// read on a reader, not the writer, so a large import does not hold up other writes.
/// Called before a record is stored, so its search then finds them. Records of this
/// process taken in early are harmless: adding a place twice changes nothing and a
/// record is never its own candidate. While one call reads, others go on without
/// waiting for it.
pub async fn take_in_records_stored_elsewhere(store: &Store, index: &Arc<Mutex<Index>>) -> Result<(), StoreError> {
    let Some(turn) = CatchingUp::begin(index) else { return Ok(()) };
    let newest = turn.newest;
    let stored = store.read(move |conn| records_after(conn, newest)).await?;
    let mut index = index.lock().unwrap_or_else(|p| p.into_inner());
    for raw in &stored {
        for point in raw_index_points(raw) {
            index.insert(point);
        }
        index.taken_in_up_to(raw.observation_id);
    }
    Ok(())
}

/// One caller's turn to take in other processes' records; the turn ends when it is
/// dropped, however the caller stops (an error, a cancelled request).
struct CatchingUp<'a> {
    index: &'a Mutex<Index>,
    newest: i64,
}

impl<'a> CatchingUp<'a> {
    fn begin(index: &'a Mutex<Index>) -> Option<Self> {
        let mut locked = index.lock().unwrap_or_else(|p| p.into_inner());
        locked.begin_catching_up().then(|| Self { index, newest: locked.newest() })
    }
}

impl Drop for CatchingUp<'_> {
    fn drop(&mut self) {
        self.index.lock().unwrap_or_else(|p| p.into_inner()).end_catching_up();
    }
}

/// The index of every stored record's places, merged records too (an undo brings them
/// back), with the search run for any record stored without one (it failed after the
/// record was stored). A search that fails again is logged and tried again at the next
/// start or resend; the server still starts.
pub fn build_index(store: &Store, taxa: &Arc<TaxonIndex>) -> Result<Arc<Mutex<Index>>, StoreError> {
    let raws = store.run_here(|conn| records_after(conn, 0))?;
    let mut built = Index::build(raws.iter().flat_map(raw_index_points));
    built.taken_in_up_to(raws.iter().map(|raw| raw.observation_id).max().unwrap_or(0));
    let index = Arc::new(Mutex::new(built));
    drop(raws);
    let now = Utc::now();
    for id in store.run_here(|conn| store::duplicates::unsearched(conn))? {
        let (index, taxa) = (index.clone(), taxa.clone());
        if let Err(err) = store.run_here(move |conn| search(conn, &index, &taxa, id, now)) {
            tracing::warn!(observation = id, error = %err, "search for duplicates failed at start-up");
        }
    }
    Ok(index)
}
