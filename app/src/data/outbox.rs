//! What the phone keeps: each record as an [`Entry`] with its sync state, stored in
//! IndexedDB beside its photos, so nothing is lost when the browser closes; and the
//! [`Outbox`] handle through which the screens and the sync loop share what is kept.

use std::time::Duration;

use leptos::prelude::*;
use serde::{Deserialize, Serialize};
use shared_types::{MyRecord, Receipt, Submission};

use crate::data::form_fields::Problem;
use crate::data::my_records;
use crate::data::replies::{self, ReplyEntry};
use crate::data::walks::{self, WalkEntry};
use crate::data::words::{self, t, t_args};
use crate::data::{device, labels};

/// Where a record is on its way to the server.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(tag = "state", rename_all = "snake_case")]
pub enum SyncState {
    /// Kept on the phone; not to be sent until the observer says so.
    Draft,
    /// Queued; sent at the next chance.
    Waiting,
    /// On its way: the phone has not had an answer yet. After a restart it is sent
    /// again, which is safe because the server recognises the record's id.
    Sent,
    /// The server has stored it.
    Received { receipt: Receipt },
    /// The server refused it for a reason the observer must fix: its words, and the
    /// field it named (to show them beside that control when the record is edited).
    Refused {
        reason: String,
        #[serde(default)]
        field: Option<String>,
    },
}

impl SyncState {
    pub fn label(&self) -> String {
        match self {
            Self::Draft => t("sync-draft"),
            Self::Waiting => t("sync-waiting"),
            Self::Sent => t("sync-sent"),
            Self::Received { .. } => t("sync-received"),
            Self::Refused { reason, field } => {
                let problem = Problem::from_server(field.as_deref(), reason).sentence();
                t_args("sync-refused", &[("problem", problem.into())])
            }
        }
    }

    pub fn css_class(&self) -> &'static str {
        match self {
            Self::Draft => "state draft",
            Self::Waiting | Self::Sent => "state waiting",
            Self::Received { .. } => "state received",
            Self::Refused { .. } => "state refused",
        }
    }

    /// Whether the sync loop should (re)send it.
    pub fn wants_sending(&self) -> bool {
        matches!(self, Self::Waiting | Self::Sent)
    }
}

/// One record on the phone.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Entry {
    pub submission: Submission,
    pub sync: SyncState,
    pub photo_count: usize,
    /// The last failed attempt's reason, shown while it waits.
    #[serde(default)]
    pub last_error: Option<String>,
    /// A walk to link this record to, chosen after the record reached the server.
    #[serde(default)]
    pub walk_link_pending: Option<uuid::Uuid>,
    /// The walk the server linked this record to after the fact (the link was sent
    /// and answered); the submission itself stays as it was sent.
    #[serde(default)]
    pub walk_linked: Option<uuid::Uuid>,
}

impl Entry {
    /// A record just saved by the observer, in `sync` (waiting to send, or a draft).
    pub fn new(submission: Submission, sync: SyncState, photo_count: usize) -> Self {
        Self { submission, sync, photo_count, last_error: None, walk_link_pending: None, walk_linked: None }
    }

    pub fn id(&self) -> String {
        self.submission.client_id.to_string()
    }

    /// The walk this record is on or going onto: in its submission, waiting to be
    /// linked, or linked by the server after the fact.
    pub fn walk(&self) -> Option<uuid::Uuid> {
        self.submission.walk_client_id.or(self.walk_link_pending).or(self.walk_linked)
    }

    /// Puts the record on a walk: inside the submission while it has not been sent, or
    /// as a link sent on its own once it may have reached the server (changing a sent
    /// record's content would make its resend a conflict).
    pub fn put_on_walk(&mut self, walk: uuid::Uuid) {
        if matches!(self.sync, SyncState::Received { .. } | SyncState::Sent) {
            self.walk_link_pending = Some(walk);
        } else {
            self.submission.walk_client_id = Some(walk);
        }
    }

    /// Notes how an attempt to send it went: its new state, and the reason it waits to
    /// be sent again, shown beside it. A receipt clears the last problem; a refusal
    /// carries its own reason and leaves the last problem as it was.
    pub fn note_attempt(&mut self, state: SyncState, retry_because: Option<String>) {
        if matches!(state, SyncState::Received { .. }) {
            self.last_error = None;
        }
        if let Some(reason) = retry_because {
            self.last_error = Some(reason);
        }
        self.sync = state;
    }

    /// "thornback ray, 62 cm total length · 2025-06-01 09:30 · 2 photos".
    pub fn summary(&self) -> String {
        let sub = &self.submission;
        let what = sub
            .species_guess
            .as_ref()
            .map(|g| g.as_str().to_owned())
            .filter(|g| !g.is_empty())
            .unwrap_or_else(|| t("record-unnamed"));
        let length = sub
            .length
            .map(|l| {
                let cm = words::number(l.value.centimetres(), 0);
                t_args("record-summary-length", &[("cm", cm.into()), ("kind", labels::length_kind(l.kind).into())])
            })
            .unwrap_or_default();
        let when = sub.observed_at.format("%Y-%m-%d %H:%M").to_string();
        t_args(
            "record-summary",
            &[
                ("what", what.into()),
                ("length", length.into()),
                ("when", when.into()),
                ("photos", self.photo_count.into()),
            ],
        )
    }

    /// The last problem, while it still matters: the record waits to be sent again, or
    /// it was received but a later walk link was refused.
    pub fn problem_shown(&self) -> Option<&str> {
        let matters = self.sync.wants_sending() || matches!(self.sync, SyncState::Received { .. });
        self.last_error.as_deref().filter(|_| matters)
    }
}

/// Saves an entry; with `photos`, its photos too, in one transaction.
pub async fn save(entry: &Entry, photos: Option<&[web_sys::Blob]>) -> Result<(), String> {
    let json = serde_json::to_string(entry).map_err(|err| err.to_string())?;
    device::save_entry(device::Store::Records, &entry.id(), &json, photos).await
}

/// Every entry, newest observation first. Entries that cannot be read are reported,
/// not dropped silently.
pub async fn load_all() -> Result<Vec<Entry>, String> {
    let mut entries = Vec::new();
    for json in device::list_entries(device::Store::Records).await? {
        let entry: Entry = serde_json::from_str(&json)
            .map_err(|err| t_args("outbox-unreadable", &[("error", err.to_string().into())]))?;
        entries.push(entry);
    }
    entries.sort_by_key(|e| std::cmp::Reverse(e.submission.observed_at));
    Ok(entries)
}

/// The entry `id` as stored now, if there is one.
pub async fn find(id: &str) -> Result<Option<Entry>, String> {
    Ok(load_all().await?.into_iter().find(|e| e.id() == id))
}

/// Deletes the entry `id` and its photos (a draft, or a record the server did not
/// accept, that the observer discards).
pub async fn discard(id: &str) -> Result<(), String> {
    device::delete_entry(id).await
}

/// Changes the stored entry `id` as it is now (not as some earlier copy had it) and
/// saves it; returns the saved entry, or `None` if there is no such entry.
pub async fn update(id: &str, change: impl FnOnce(&mut Entry)) -> Result<Option<Entry>, String> {
    let Some(mut entry) = load_all().await?.into_iter().find(|e| e.id() == id) else { return Ok(None) };
    change(&mut entry);
    save(&entry, None).await?;
    Ok(Some(entry))
}

/// What the sync loop tells the screen.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct SyncStatus {
    pub running: bool,
    pub next_retry: Option<Duration>,
    pub last_problem: Option<String>,
}

impl SyncStatus {
    /// "sending…", or the problem and when the next try is; empty when all is sent.
    pub fn words(&self) -> String {
        match (self.running, &self.next_retry, &self.last_problem) {
            (true, _, _) => t("sync-sending"),
            (false, Some(delay), Some(problem)) => {
                let seconds = words::number(delay.as_secs_f64().round(), 0);
                t_args("sync-retry", &[("problem", problem.as_str().into()), ("seconds", seconds.into())])
            }
            _ => String::new(),
        }
    }
}

/// What the phone keeps and what the screens show of it, handed around together.
#[derive(Clone, Copy)]
pub struct Outbox {
    pub entries: RwSignal<Vec<Entry>>,
    pub walks: RwSignal<Vec<WalkEntry>>,
    pub replies: RwSignal<Vec<ReplyEntry>>,
    /// The observer's records as the server last described them.
    pub my_records: RwSignal<Vec<MyRecord>>,
    pub status: RwSignal<SyncStatus>,
    /// The id of a record the server did not accept, opened in the form to be put right.
    pub editing: RwSignal<Option<String>>,
}

impl Default for Outbox {
    fn default() -> Self {
        Self::new()
    }
}

impl Outbox {
    /// Empty lists (loaded from storage by [`Outbox::load`]) and the cached records.
    pub fn new() -> Self {
        Self {
            entries: RwSignal::new(Vec::new()),
            walks: RwSignal::new(Vec::new()),
            replies: RwSignal::new(Vec::new()),
            my_records: RwSignal::new(my_records::cached()),
            status: RwSignal::new(SyncStatus::default()),
            editing: RwSignal::new(None),
        }
    }

    /// Reads everything kept on the phone into the lists; the error says what could
    /// not be read.
    pub async fn load(self) -> Result<(), String> {
        self.entries.set(load_all().await?);
        self.walks.set(walks::load_all().await?);
        self.replies.set(replies::load_all().await?);
        Ok(())
    }

    /// Re-reads the records, walks and answers into the lists after a change; a list
    /// that cannot be read stays as it was.
    pub async fn reload(self) {
        if let Ok(list) = load_all().await {
            self.entries.set(list);
        }
        if let Ok(list) = walks::load_all().await {
            self.walks.set(list);
        }
        if let Ok(list) = replies::load_all().await {
            self.replies.set(list);
        }
    }

    /// Whether nothing at all is kept on the phone: no record, walk or answer.
    pub fn holds_nothing(self) -> bool {
        self.entries.with_untracked(Vec::is_empty)
            && self.walks.with_untracked(Vec::is_empty)
            && self.replies.with_untracked(Vec::is_empty)
    }

    /// The walk going on now, if any.
    pub fn walk_going_on(self) -> Option<WalkEntry> {
        self.walks.with_untracked(|w| w.iter().find(|e| e.state == walks::WalkState::Walking).cloned())
    }
}

/// Above this share of the browser's storage quota the observer is warned to send.
const STORAGE_WARN_SHARE: f64 = 0.8;
/// Above this share a new record is not saved (the browser would refuse part-way); the
/// form is kept and the observer is told what to do.
const STORAGE_FULL_SHARE: f64 = 0.97;

/// Whether `new_bytes` more fit in `usage` of `quota` bytes; `Err` is the sentence to
/// show, `Ok(Some)` a warning to add to the saved note.
pub fn room_for(usage: f64, quota: f64, new_bytes: f64) -> Result<Option<String>, String> {
    if quota <= 0.0 {
        return Ok(None);
    }
    let after = usage + new_bytes;
    let megabytes = |b: f64| b / 1e6;
    if after > STORAGE_FULL_SHARE * quota {
        return Err(t_args(
            "storage-full",
            &[
                ("used", words::number(megabytes(after), 0).into()),
                ("quota", words::number(megabytes(quota), 0).into()),
            ],
        ));
    }
    Ok((after > STORAGE_WARN_SHARE * quota).then(|| {
        let used = words::number(megabytes(after), 0);
        format!(
            " {}",
            t_args(
                "storage-nearly-full",
                &[("used", used.into()), ("quota", words::number(megabytes(quota), 0).into())]
            )
        )
    }))
}

/// [`room_for`] with the browser's own estimate; no estimate, no warning.
pub async fn storage_room(new_bytes: f64) -> Result<Option<String>, String> {
    match device::storage_estimate().await {
        Some(estimate) => room_for(estimate.usage, estimate.quota, new_bytes),
        None => Ok(None),
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::data::form_fields::tests::{filled, saved_at};
    use crate::data::time::tests::LONDON;

    fn entry(sync: SyncState) -> Entry {
        Entry::new(filled().to_submission(uuid::Uuid::nil(), &LONDON, saved_at()).unwrap(), sync, 2)
    }

    fn receipt() -> Receipt {
        serde_json::from_str(
            r#"{"client_id":"00000000-0000-0000-0000-000000000000","observation_id":1,"received_at":"2025-06-01T13:10:00Z","photo_count":2}"#,
        )
        .unwrap()
    }

    #[test]
    fn each_state_has_its_words_and_its_class() {
        let cases = [
            (SyncState::Draft, "draft", "state draft", false),
            (SyncState::Waiting, "waiting to send", "state waiting", true),
            (SyncState::Sent, "sent, awaiting the server", "state waiting", true),
            (SyncState::Received { receipt: receipt() }, "received by the server", "state received", false),
            (
                SyncState::Refused {
                    reason: "the time 2030-01-01 10:00:00 +01:00 is in the future".into(),
                    field: Some("observed_at".into()),
                },
                "not accepted by the server: When: the time 2030-01-01 10:00:00 +01:00 is in the future",
                "state refused",
                false,
            ),
        ];
        for (state, label, class, sent) in cases {
            assert_eq!((state.label().as_str(), state.css_class(), state.wants_sending()), (label, class, sent));
        }
    }

    #[test]
    fn the_summary_says_what_how_big_when_and_how_many_photos() {
        assert_eq!(
            entry(SyncState::Waiting).summary(),
            "thornback ray, 62 cm total length · 2025-06-01 14:10 · 2 photos"
        );
        let mut unnamed = entry(SyncState::Draft);
        unnamed.submission.species_guess = None;
        unnamed.submission.length = None;
        assert_eq!(unnamed.summary(), "unnamed animal · 2025-06-01 14:10 · 2 photos");
    }

    #[test]
    fn an_unsent_record_goes_on_a_walk_inside_itself_a_sent_one_by_a_link() {
        let walk = uuid::Uuid::from_u128(7);
        for state in [SyncState::Draft, SyncState::Waiting, SyncState::Refused { reason: "x".into(), field: None }] {
            let mut unsent = entry(state);
            unsent.put_on_walk(walk);
            assert_eq!((unsent.submission.walk_client_id, unsent.walk_link_pending), (Some(walk), None));
            assert_eq!(unsent.walk(), Some(walk));
        }
        for state in [SyncState::Sent, SyncState::Received { receipt: receipt() }] {
            let mut sent = entry(state);
            sent.put_on_walk(walk);
            assert_eq!((sent.submission.walk_client_id, sent.walk_link_pending), (None, Some(walk)));
            assert_eq!(sent.walk(), Some(walk));
        }
    }

    #[test]
    fn an_attempt_keeps_the_reason_to_retry_and_a_receipt_clears_it() {
        let mut record = entry(SyncState::Sent);
        record.note_attempt(SyncState::Waiting, Some("no connection to the server".into()));
        assert_eq!(record.sync, SyncState::Waiting);
        assert_eq!(record.problem_shown(), Some("no connection to the server"));
        let refused = SyncState::Refused { reason: "must be between 1 and 10000".into(), field: Some("count".into()) };
        let mut refused_record = record.clone();
        refused_record.note_attempt(refused.clone(), None);
        assert_eq!(refused_record.sync, refused);
        assert_eq!(refused_record.problem_shown(), None, "a refusal shows its own reason, not the last problem");
        record.note_attempt(SyncState::Received { receipt: receipt() }, None);
        assert_eq!((record.last_error.as_deref(), record.problem_shown()), (None, None));
    }

    #[test]
    fn a_refused_walk_link_is_shown_beside_the_received_record() {
        let mut received = entry(SyncState::Received { receipt: receipt() });
        received.last_error = Some("could not add to the walk: this walk belongs to another phone".into());
        assert_eq!(received.problem_shown(), Some("could not add to the walk: this walk belongs to another phone"));
    }

    #[test]
    fn a_record_kept_before_walks_existed_still_reads() {
        let mut json: serde_json::Value = serde_json::to_value(entry(SyncState::Waiting)).unwrap();
        for field in ["last_error", "walk_link_pending", "walk_linked"] {
            json.as_object_mut().unwrap().remove(field);
        }
        let read: Entry = serde_json::from_value(json).unwrap();
        assert_eq!(read, entry(SyncState::Waiting));
    }

    #[test]
    fn a_record_is_refused_before_storage_is_full_and_warned_about_before_that() {
        let mb = 1e6;
        assert_eq!(room_for(10.0 * mb, 100.0 * mb, 5.0 * mb), Ok(None));
        let warning = room_for(78.0 * mb, 100.0 * mb, 5.0 * mb).unwrap().expect("a warning over 80%");
        assert!(warning.contains("nearly full (83 of 100 MB)"), "{warning}");
        let full = room_for(95.0 * mb, 100.0 * mb, 5.0 * mb).unwrap_err();
        assert!(full.starts_with("Not saved: this phone's storage for wrackline is full (100 of 100 MB"), "{full}");
        assert!(full.ends_with("Your form is kept as it is."), "{full}");
        assert_eq!(room_for(95.0 * mb, 0.0, 5.0 * mb), Ok(None), "no quota known: no warning");
    }

    #[test]
    fn the_status_line_says_sending_or_the_problem_and_the_next_try() {
        assert_eq!(SyncStatus::default().words(), "");
        assert_eq!(SyncStatus { running: true, ..SyncStatus::default() }.words(), "sending…");
        let waiting = SyncStatus {
            running: false,
            next_retry: Some(Duration::from_secs(8)),
            last_problem: Some("no connection to the server".into()),
        };
        assert_eq!(waiting.words(), "no connection to the server; trying again in 8 s");
    }
}
