//! wrackline's phone app: capture a record with no signal, keep it in an outbox that
//! survives closing the browser, and send it when a connection appears.
//!
//! Modules: [`device`] (browser storage, position, upload, via `js/device.js`),
//! [`nearby`] (confirmed records near the record, for the key's prior, kept per area),
//! [`outbox`] (what the phone keeps and each record's sync state), [`sync`] (sending,
//! retries with backoff), [`form`] (the record form), [`photos`] (EXIF read on the phone,
//! the upload copy), [`key`] (the guided species key and its [`pictures`]), [`walks`]
//! (survey walks and their tracks), [`identity`] (the phone's device identity), [`mine`]
//! (the observer's records and answers to reviewers), [`review`] (the reviewers'
//! screens), [`figures`] (range and trend figures), [`exports`] (downloads of the records),
//! [`screens`] (the page around it), [`readable`] (times and photo readings as people read them).
//! The app never decides what the server decides: it shows the server's receipts.

mod device;
mod exports;
mod figures;
mod form;
mod identity;
mod key;
mod mine;
mod nearby;
mod outbox;
mod photos;
mod pictures;
mod readable;
mod review;
mod screens;
mod sync;
mod walks;

pub use key::bench_next_question;

/// Runs when the module is loaded: mounts the app.
#[wasm_bindgen::prelude::wasm_bindgen(start)]
pub fn start() {
    console_error_panic_hook_lite();
    leptos::mount::mount_to_body(screens::App);
}

/// Sends Rust panics to the browser console, so a failure is visible in a test log.
fn console_error_panic_hook_lite() {
    std::panic::set_hook(Box::new(|info| {
        web_sys::console::error_1(&format!("wrackline panicked: {info}").into());
    }));
}
