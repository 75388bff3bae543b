//! What the page learns from the browser: whether it is online, which screen the
//! address's `#…` part names, when either changes, whether the browser offers to
//! install the app, whether the safety cautions have been read on this phone, and how
//! good and fresh a position fix is in words.

use wasm_bindgen::JsCast;
use wasm_bindgen::closure::Closure;

use crate::data::local;
use crate::data::words::{self, t_args};

const SAFETY_KEY: &str = "wrackline.safety-read";

/// Whether the safety cautions have been read on this phone.
pub fn safety_read() -> bool {
    local::get(SAFETY_KEY).is_some()
}

pub fn remember_safety_read() {
    local::set(SAFETY_KEY, "yes");
}

/// Removes the loading message `index.html` shows until the app starts.
pub fn remove_loading_message() {
    if let Some(message) = web_sys::window().and_then(|w| w.document()).and_then(|d| d.get_element_by_id("loading")) {
        message.remove();
    }
}

/// Whether the browser thinks it is online (true when it cannot say).
pub fn online_now() -> bool {
    web_sys::window().map(|w| w.navigator().on_line()).unwrap_or(true)
}

/// Screens at least this wide (CSS px) are a desk's: filters start open there.
pub const WIDE_SCREEN_PX: f64 = 700.0;

/// Whether the window is a desk's rather than a phone's.
pub fn wide_screen() -> bool {
    web_sys::window().and_then(|w| w.inner_width().ok()).and_then(|w| w.as_f64()).is_some_and(|w| w >= WIDE_SCREEN_PX)
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

/// Calls `act` when the browser offers to install the app (`js/device.js` turns its
/// `beforeinstallprompt` into `wrackline-installable`).
pub fn on_installable(act: impl Fn() + 'static) {
    let Some(window) = web_sys::window() else { return };
    let closure = Closure::<dyn Fn()>::new(act);
    let _ = window.add_event_listener_with_callback("wrackline-installable", closure.as_ref().unchecked_ref());
    // The listener lives as long as the page.
    closure.forget();
}

/// "within 8 m, 3 s old": how good and how fresh a fix is, from its time and now (both
/// milliseconds since 1970).
pub fn fix_words(accuracy_m: f64, taken_ms: f64, now_ms: f64) -> String {
    let age_s = ((now_ms - taken_ms) / 1000.0).max(0.0).round();
    let whole = |value: f64| words::number(value, 0);
    let age = match age_s {
        s if s < 120.0 => t_args("fix-age-seconds", &[("n", whole(s).into())]),
        s if s < 7200.0 => t_args("fix-age-minutes", &[("n", whole((s / 60.0).floor()).into())]),
        s if s < 172_800.0 => t_args("fix-age-hours", &[("n", whole((s / 3600.0).floor()).into())]),
        s => t_args("fix-age-days", &[("n", whole((s / 86_400.0).floor()).into())]),
    };
    t_args("fix-within", &[("metres", whole(accuracy_m.max(1.0)).into()), ("age", age.into())])
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

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_fix_says_how_good_and_how_old_it_is() {
        assert_eq!(fix_words(8.4, 1_000.0, 4_000.0), "within 8 m, 3 s old");
        assert_eq!(fix_words(0.2, 0.0, 0.0), "within 1 m, 0 s old");
        assert_eq!(fix_words(25.0, 0.0, 290_000.0), "within 25 m, 4 min old");
        assert_eq!(fix_words(7.0, 0.0, 172_800_000.0), "within 7 m, 2 days old");
    }
}
