//! The phone's data and logic, with no view code: what the phone keeps and sends, what
//! it asks the server, and every rule and wording that needs no screen. The screens read
//! and change all of it through these modules; nothing here knows the screens exist.
//!
//! - Kept on the phone: [`outbox`] (records and their sync states, the [`outbox::Outbox`]
//!   handle the screens share), [`walks`] and [`walk_track`] (survey walks and their
//!   tracks), [`replies`] (answers to reviewers), [`my_records`] (the server's view of the
//!   observer's records), [`identity`] (the phone's identity and "About you"),
//!   [`checklist`] and [`nearby`] (what the guided key works from, cached for flight
//!   mode), [`site`] (the operator's responders' number, kept for flight mode), [`local`]
//!   (localStorage and sessionStorage), [`device`] (typed calls over `js/device.js`:
//!   IndexedDB, position, photos, requests, the browser's offer to install).
//! - Sent: [`sync`] (the send loop, backoff and what each answer means) over [`api`] (one
//!   typed client for every server route the app calls, and its error type).
//! - Rules and words: [`form_fields`] (the record form's fields and checks), [`photos`]
//!   (EXIF read on the phone, the upload copy), [`time`] (local time and its offset on a
//!   given date), [`key`] (the guided key's logic) and [`key_reasons`] (its reasons in words), [`figures`] and [`downloads`] (the
//!   figures' tables and the download links), [`readable`] (times and photo readings as
//!   people read them), [`page`] (what the page learns from the browser), [`fieldwork`]
//!   (the forms of the people who go out: responses, samples, carcass reports).

pub mod api;
pub mod checklist;
pub mod device;
pub mod downloads;
pub mod fieldwork;
pub mod figures;
pub mod form_fields;
pub mod identity;
pub mod key;
pub mod key_reasons;
pub mod labels;
pub mod local;
pub mod my_records;
pub mod nearby;
pub mod outbox;
pub mod page;
pub mod photos;
pub mod readable;
pub mod replies;
pub mod site;
pub mod sync;
pub mod time;
pub mod walk_track;
pub mod walks;
pub mod words;
