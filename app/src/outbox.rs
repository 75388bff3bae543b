//! What the phone keeps: each record as an [`Entry`] with its sync state, stored in
//! IndexedDB beside its photos, so nothing is lost when the browser closes.

use serde::{Deserialize, Serialize};
use shared_types::{Receipt, Submission};

use crate::device;

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
    /// The server refused it for a reason the observer must fix.
    Refused { reason: String },
}

impl SyncState {
    pub fn label(&self) -> String {
        match self {
            Self::Draft => "draft".into(),
            Self::Waiting => "waiting to send".into(),
            Self::Sent => "sent, awaiting the server".into(),
            Self::Received { .. } => "received by the server".into(),
            Self::Refused { reason } => format!("refused by the server: {reason}"),
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
    pub fn id(&self) -> String {
        self.submission.client_id.to_string()
    }

    /// The walk this record is on or going onto: in its submission, waiting to be
    /// linked, or linked by the server after the fact.
    pub fn walk(&self) -> Option<uuid::Uuid> {
        self.submission.walk_client_id.or(self.walk_link_pending).or(self.walk_linked)
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
        let entry: Entry =
            serde_json::from_str(&json).map_err(|err| format!("a stored record could not be read: {err}"))?;
        entries.push(entry);
    }
    entries.sort_by_key(|e| std::cmp::Reverse(e.submission.observed_at));
    Ok(entries)
}

/// Changes the stored entry `id` as it is now (not as some earlier copy had it) and
/// saves it; returns the saved entry, or `None` if there is no such entry.
pub async fn update(id: &str, change: impl FnOnce(&mut Entry)) -> Result<Option<Entry>, String> {
    let Some(mut entry) = load_all().await?.into_iter().find(|e| e.id() == id) else { return Ok(None) };
    change(&mut entry);
    save(&entry, None).await?;
    Ok(Some(entry))
}
