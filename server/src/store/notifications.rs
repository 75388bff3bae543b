//! Notifications to responders in the database: one row per urgent record and channel,
//! made once (a resend finds it there), then marked delivered or given its next try.

use chrono::{DateTime, Utc};
use rusqlite::{Connection, OptionalExtension, params};
use shared_types::NotificationView;

use super::StoreError;

fn time_text(at: DateTime<Utc>) -> String {
    at.to_rfc3339_opts(chrono::SecondsFormat::Millis, true)
}

fn parse_utc(text: &str) -> Result<DateTime<Utc>, StoreError> {
    DateTime::parse_from_rfc3339(text)
        .map(|t| t.with_timezone(&Utc))
        .map_err(|err| StoreError::Corrupt(format!("timestamp {text}: {err}")))
}

/// Makes the notifications of the record `observation_id` by each of `channels`, due at
/// once, unless they exist. Returns how many were new.
pub fn enqueue(
    conn: &Connection,
    observation_id: i64,
    channels: &[&str],
    now: DateTime<Utc>,
) -> Result<usize, StoreError> {
    let mut made = 0;
    for channel in channels {
        made += conn.execute(
            "INSERT OR IGNORE INTO notifications (observation_id, channel, delivery_id, next_attempt_at, created_at)
             VALUES (?1, ?2, ?3, ?4, ?4)",
            params![observation_id, channel, uuid::Uuid::new_v4().to_string(), time_text(now)],
        )?;
    }
    Ok(made)
}

/// A notification whose turn has come.
#[derive(Debug, Clone, PartialEq)]
pub struct Due {
    pub id: i64,
    pub observation_id: i64,
    pub channel: String,
    /// The same on every try, so a receiver can tell a retry from a new alert.
    pub delivery_id: String,
    pub attempts: u32,
}

/// Undelivered notifications due by `now`, oldest first.
pub fn due(conn: &Connection, now: DateTime<Utc>, limit: usize) -> Result<Vec<Due>, StoreError> {
    let mut stmt = conn.prepare(
        "SELECT id, observation_id, channel, delivery_id, attempts FROM notifications
         WHERE delivered_at IS NULL AND next_attempt_at <= ?1 ORDER BY next_attempt_at, id LIMIT ?2",
    )?;
    let rows = stmt.query_map(params![time_text(now), limit as i64], |row| {
        Ok(Due {
            id: row.get(0)?,
            observation_id: row.get(1)?,
            channel: row.get(2)?,
            delivery_id: row.get(3)?,
            attempts: row.get(4)?,
        })
    })?;
    Ok(rows.collect::<Result<_, _>>()?)
}

/// When the next undelivered notification is due, if any.
pub fn next_due(conn: &Connection) -> Result<Option<DateTime<Utc>>, StoreError> {
    let next: Option<String> = conn
        .query_row("SELECT min(next_attempt_at) FROM notifications WHERE delivered_at IS NULL", [], |row| row.get(0))
        .optional()?
        .flatten();
    next.as_deref().map(parse_utc).transpose()
}

/// The receiver acknowledged it.
pub fn delivered(conn: &Connection, id: i64, now: DateTime<Utc>) -> Result<(), StoreError> {
    conn.execute(
        "UPDATE notifications SET attempts = attempts + 1, delivered_at = ?2, last_error = NULL WHERE id = ?1",
        params![id, time_text(now)],
    )?;
    Ok(())
}

/// A try failed: why, and when to try again.
pub fn failed(conn: &Connection, id: i64, error: &str, next_at: DateTime<Utc>) -> Result<(), StoreError> {
    conn.execute(
        "UPDATE notifications SET attempts = attempts + 1, last_error = ?2, next_attempt_at = ?3 WHERE id = ?1",
        params![id, error, time_text(next_at)],
    )?;
    Ok(())
}

/// How the responders were told of the record `observation_id`, by channel.
pub fn of_record(conn: &Connection, observation_id: i64) -> Result<Vec<NotificationView>, StoreError> {
    let mut stmt = conn.prepare(
        "SELECT channel, attempts, delivered_at, last_error FROM notifications WHERE observation_id = ?1 ORDER BY channel",
    )?;
    let rows = stmt
        .query_map([observation_id], |row| {
            Ok((row.get::<_, String>(0)?, row.get::<_, u32>(1)?, row.get::<_, Option<String>>(2)?, row.get(3)?))
        })?
        .collect::<Result<Vec<_>, _>>()?;
    rows.into_iter()
        .map(|(channel, attempts, delivered, last_error)| {
            Ok(NotificationView {
                channel,
                attempts,
                delivered_at: delivered.as_deref().map(parse_utc).transpose()?,
                last_error,
            })
        })
        .collect()
}

/// Urgent records received since `since` with no notification by `channel`: those whose
/// arrival was cut short before their notification was made.
pub fn urgent_unnotified(conn: &Connection, channel: &str, since: DateTime<Utc>) -> Result<Vec<i64>, StoreError> {
    let mut stmt = conn.prepare(
        "SELECT o.id FROM observations o
         WHERE json_extract(o.submission_json, '$.condition') = 'alive' AND o.received_at >= ?1
           AND NOT EXISTS (SELECT 1 FROM notifications n WHERE n.observation_id = o.id AND n.channel = ?2)
         ORDER BY o.id",
    )?;
    let ids = stmt.query_map(params![time_text(since), channel], |row| row.get(0))?;
    Ok(ids.collect::<Result<_, _>>()?)
}
