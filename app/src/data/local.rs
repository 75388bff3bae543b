//! The browser's small key–value stores: localStorage, which outlives the page (settings,
//! the phone's identity, caches for flight mode), and sessionStorage, which ends with the
//! tab (a reviewer's CSRF token). One place reads and writes them, so a browser that
//! keeps nothing is handled the same way everywhere: reads find nothing, and writes of
//! what can be made again are dropped.

fn local_storage() -> Option<web_sys::Storage> {
    web_sys::window()?.local_storage().ok().flatten()
}

fn session_storage() -> Option<web_sys::Storage> {
    web_sys::window()?.session_storage().ok().flatten()
}

/// The value kept under `key` in localStorage.
pub fn get(key: &str) -> Option<String> {
    local_storage()?.get_item(key).ok().flatten()
}

/// Keeps `value` under `key` in localStorage, if the browser lets it.
pub fn set(key: &str, value: &str) {
    let _ = try_set(key, value);
}

/// Why a value could not be kept (the caller words it: the words module reads this one).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum NotKept {
    /// The browser has no localStorage (or does not let this page use it).
    NoStorage,
    /// The browser refused the value: storage full or blocked.
    Refused,
}

/// Keeps `value` under `key` in localStorage; the error says why it could not.
pub fn try_set(key: &str, value: &str) -> Result<(), NotKept> {
    let storage = local_storage().ok_or(NotKept::NoStorage)?;
    storage.set_item(key, value).map_err(|_| NotKept::Refused)
}

/// The value kept under `key` for this tab.
pub fn session_get(key: &str) -> Option<String> {
    session_storage()?.get_item(key).ok().flatten()
}

/// Keeps `value` under `key` for this tab, if the browser lets it.
pub fn session_set(key: &str, value: &str) {
    if let Some(storage) = session_storage() {
        let _ = storage.set_item(key, value);
    }
}
