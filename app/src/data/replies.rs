//! Answers to reviewers (a message and photos), kept in IndexedDB beside their photos
//! until the server has them, and sent by the sync loop like records. Photos in an
//! answer take the same path as a record's (`photos::pick`): EXIF read from the
//! original on the phone, only the upload copy kept and sent, the reading sent beside
//! it as data.

use serde::{Deserialize, Serialize};
use shared_types::{Reply, Text};
use uuid::Uuid;

use crate::data::api;
use crate::data::device::{self, Store};
use crate::data::photos::PickedPhoto;
use crate::data::words::{t, t_args};

/// Where an answer is on its way to the server.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(tag = "state", rename_all = "snake_case")]
pub enum ReplyState {
    Waiting,
    Received,
    Refused { reason: String },
}

/// An answer to a reviewer, kept on the phone until the server has it.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ReplyEntry {
    pub record_client_id: Uuid,
    pub reply: Reply,
    pub photo_count: usize,
    pub state: ReplyState,
}

impl ReplyEntry {
    /// An answer about `record` with the text and photos given, waiting to be sent; the
    /// error is the sentence to show.
    pub fn new(record: Uuid, text: &str, photos: &[PickedPhoto]) -> Result<Self, String> {
        let Ok(message) = Text::parse(text) else { return Err(t("mine-answer-too-long")) };
        if message.as_str().is_empty() && photos.is_empty() {
            return Err(t("mine-answer-empty"));
        }
        let photo_exif = photos.iter().map(|p| p.exif.clone()).collect();
        let reply = Reply { client_id: Uuid::new_v4(), message, photo_exif };
        Ok(Self { record_client_id: record, reply, photo_count: photos.len(), state: ReplyState::Waiting })
    }
}

pub async fn save(entry: &ReplyEntry, photos: Option<&[web_sys::Blob]>) -> Result<(), String> {
    let json = serde_json::to_string(entry).map_err(|err| err.to_string())?;
    device::save_entry(Store::Replies, &entry.reply.client_id.to_string(), &json, photos).await
}

pub async fn load_all() -> Result<Vec<ReplyEntry>, String> {
    device::list_entries(Store::Replies)
        .await?
        .iter()
        .map(|json| {
            serde_json::from_str(json).map_err(|err| t_args("replies-unreadable", &[("error", err.to_string().into())]))
        })
        .collect()
}

/// Sends waiting answers; returns the first problem worth a retry.
pub async fn send_waiting(token: &str) -> Option<String> {
    let mut problem = None;
    for mut entry in load_all().await.ok()?.into_iter().filter(|r| r.state == ReplyState::Waiting) {
        let photos = match device::photos_of(&entry.reply.client_id.to_string()).await {
            Ok(photos) if photos.len() == entry.photo_count => photos,
            _ => {
                problem.get_or_insert(t("replies-photos-missing"));
                continue;
            }
        };
        match api::send_reply(token, entry.record_client_id, &entry.reply, &photos).await {
            Ok(()) => entry.state = ReplyState::Received,
            Err(err) if err.is_temporary() => {
                problem.get_or_insert(err.to_string());
                continue;
            }
            Err(err) => entry.state = ReplyState::Refused { reason: err.to_string() },
        }
        if let Err(err) = save(&entry, None).await {
            problem.get_or_insert(err);
        }
    }
    problem
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn an_answer_needs_words_or_a_photo_and_no_more_words_than_a_text_holds() {
        let record = Uuid::from_u128(1);
        assert_eq!(ReplyEntry::new(record, "  ", &[]).unwrap_err(), "Write an answer or add a photo.");
        let too_long = "x".repeat(Text::MAX_CHARS + 1);
        assert_eq!(ReplyEntry::new(record, &too_long, &[]).unwrap_err(), "That answer is too long.");
        let entry = ReplyEntry::new(record, "It had a spine on its tail.", &[]).unwrap();
        assert_eq!((entry.record_client_id, entry.photo_count, entry.state), (record, 0, ReplyState::Waiting));
        assert_eq!(entry.reply.message.as_str(), "It had a spine on its tail.");
        assert_ne!(entry.reply.client_id, ReplyEntry::new(record, "again", &[]).unwrap().reply.client_id);
    }
}
