//! wrackline's phone app: capture a record with no signal, keep it in an outbox that
//! survives closing the browser, and send it when a connection appears. The app never
//! decides what the server decides: it shows the server's receipts.
//!
//! Two layers, and imports go one way only:
//!
//! - [`data`]: the phone's data and logic — what it keeps (IndexedDB, localStorage), what
//!   it sends and when (the outbox and the sync loop with its backoff), the one client
//!   for the server's routes, local time and daylight saving, the checks a record must
//!   pass, the guided key's logic, and the words that need no screen. No view code, and
//!   it never imports [`screens`], so its pure parts are tested natively
//!   (`cargo test -p wrackline-app`).
//! - [`screens`]: the page and every screen, as Leptos views. They read and change the
//!   phone's state only through [`data`].
//!
//! Two bundles come from this crate, so a walker's phone never downloads the desk: the
//! phone's (the recording screens, served at `/` and kept for flight mode) and, with the
//! `desk` feature, the desk's (review, urgent animals, samples, people, figures and
//! downloads, served at `/desk/`). [`data`] is public so that each bundle may use only
//! part of it without dead-code warnings; the linker drops what a bundle does not call.

pub mod data;
mod screens;

pub use data::key::bench_next_question;

/// Runs when the module is loaded: takes away the page's loading message and mounts the app.
#[wasm_bindgen::prelude::wasm_bindgen(start)]
pub fn start() {
    console_error_panic_hook_lite();
    data::words::mark_page_language();
    data::page::remove_loading_message();
    #[cfg(not(feature = "desk"))]
    leptos::mount::mount_to_body(screens::phone::App);
    #[cfg(feature = "desk")]
    leptos::mount::mount_to_body(screens::desk::App);
}

/// Sends Rust panics to the browser console, so a failure is visible in a test log.
fn console_error_panic_hook_lite() {
    std::panic::set_hook(Box::new(|info| {
        web_sys::console::error_1(&format!("wrackline panicked: {info}").into());
    }));
}
