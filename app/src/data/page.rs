//! What the page learns from the browser: whether it is online, which screen the
//! address's `#…` part names, when either changes, and whether the safety cautions
//! have been read on this phone.

use wasm_bindgen::JsCast;
use wasm_bindgen::closure::Closure;

use crate::data::local;

const SAFETY_KEY: &str = "wrackline.safety-read";

/// Whether the safety cautions have been read on this phone.
pub fn safety_read() -> bool {
    local::get(SAFETY_KEY).is_some()
}

pub fn remember_safety_read() {
    local::set(SAFETY_KEY, "yes");
}

/// Whether the browser thinks it is online (true when it cannot say).
pub fn online_now() -> bool {
    web_sys::window().map(|w| w.navigator().on_line()).unwrap_or(true)
}

/// The address's `#…` part, which names the screen ("" for the record form).
pub fn current_hash() -> String {
    web_sys::window().and_then(|w| w.location().hash().ok()).unwrap_or_default()
}

/// Calls `act` whenever the address's `#…` part changes.
pub fn on_hash_change(act: impl Fn() + 'static) {
    let Some(window) = web_sys::window() else { return };
    let closure = Closure::<dyn Fn()>::new(act);
    let _ = window.add_event_listener_with_callback("hashchange", closure.as_ref().unchecked_ref());
    // The listener lives as long as the page.
    closure.forget();
}

/// Calls `act` whenever the browser says the connection came back or went away.
pub fn on_connection_change(act: impl Fn(bool) + 'static) {
    let Some(window) = web_sys::window() else { return };
    let act = std::rc::Rc::new(act);
    for (event, online) in [("online", true), ("offline", false)] {
        let act = act.clone();
        let closure = Closure::<dyn Fn()>::new(move || act(online));
        let _ = window.add_event_listener_with_callback(event, closure.as_ref().unchecked_ref());
        // The listener lives as long as the page.
        closure.forget();
    }
}
