//! Typed Rust calls over `js/device.js`: the outbox in IndexedDB, the device's
//! position, storage persistence, a photo's bytes and its upload copy, and the requests
//! themselves (what their answers mean is `api`'s business). Errors come back as the
//! browser's own message.

use serde::Deserialize;
use wasm_bindgen::prelude::*;
use wasm_bindgen_futures::JsFuture;

use crate::data::words::t;

#[wasm_bindgen(module = "/js/device.js")]
extern "C" {
    #[wasm_bindgen(js_name = saveEntry)]
    fn save_entry_js(id: &str, json: &str, files: JsValue, store: &str) -> js_sys::Promise;
    #[wasm_bindgen(js_name = listEntries)]
    fn list_entries_js(store: &str) -> js_sys::Promise;
    #[wasm_bindgen(js_name = photosOf)]
    fn photos_of_js(id: &str) -> js_sys::Promise;
    #[wasm_bindgen(js_name = deleteEntry)]
    fn delete_entry_js(id: &str) -> js_sys::Promise;
    #[wasm_bindgen(js_name = requestPersistence)]
    fn request_persistence_js() -> js_sys::Promise;
    #[wasm_bindgen(js_name = storageEstimate)]
    fn storage_estimate_js() -> js_sys::Promise;
    #[wasm_bindgen(js_name = currentPosition)]
    fn current_position_js(maximum_age_ms: f64) -> js_sys::Promise;
    #[wasm_bindgen(js_name = canInstall)]
    fn can_install_js() -> bool;
    #[wasm_bindgen(js_name = install)]
    fn install_js() -> js_sys::Promise;
    #[wasm_bindgen(js_name = saveWalk)]
    fn save_walk_js(id: &str, json: &str) -> js_sys::Promise;
    #[wasm_bindgen(js_name = listWalks)]
    fn list_walks_js() -> js_sys::Promise;
    #[wasm_bindgen(js_name = watchPosition)]
    fn watch_position_js(on_fix: &js_sys::Function, on_error: &js_sys::Function) -> i32;
    #[wasm_bindgen(js_name = stopWatching)]
    fn stop_watching_js(id: i32);
    #[wasm_bindgen(js_name = sendJson)]
    fn send_json_js(method: &str, url: &str, json: JsValue, headers: JsValue) -> js_sys::Promise;
    #[wasm_bindgen(js_name = sendRecord)]
    fn send_record_js(url: &str, json: &str, blobs: js_sys::Array, part: &str, headers: JsValue) -> js_sys::Promise;
    #[wasm_bindgen(js_name = readBytes)]
    fn read_bytes_js(file: &web_sys::Blob) -> js_sys::Promise;
    #[wasm_bindgen(js_name = originalSha256)]
    fn original_sha256_js(file: &web_sys::Blob) -> js_sys::Promise;
    #[wasm_bindgen(js_name = prepareUpload)]
    fn prepare_upload_js(file: &web_sys::Blob, long_edge: u32, quality: f64) -> js_sys::Promise;
}

/// A browser error, as text to show.
fn message(err: JsValue) -> String {
    err.dyn_ref::<js_sys::Error>()
        .map(|e| String::from(e.message()))
        .or_else(|| err.as_string())
        .unwrap_or_else(|| t("device-unknown-error"))
}

async fn wait(promise: js_sys::Promise) -> Result<JsValue, String> {
    JsFuture::from(promise).await.map_err(message)
}

/// Where outbox rows live in IndexedDB.
#[derive(Debug, Clone, Copy)]
pub enum Store {
    Records,
    Replies,
}

impl Store {
    fn name(self) -> &'static str {
        match self {
            Store::Records => "entries",
            Store::Replies => "replies",
        }
    }
}

/// Saves a row's JSON; with `photos`, replaces its photos in the same transaction.
pub async fn save_entry(store: Store, id: &str, json: &str, photos: Option<&[web_sys::Blob]>) -> Result<(), String> {
    let files = match photos {
        Some(list) => list.iter().map(JsValue::from).collect::<js_sys::Array>().into(),
        None => JsValue::NULL,
    };
    wait(save_entry_js(id, json, files, store.name())).await.map(|_| ())
}

/// Every stored row's JSON text.
pub async fn list_entries(store: Store) -> Result<Vec<String>, String> {
    let list: js_sys::Array = wait(list_entries_js(store.name())).await?.unchecked_into();
    Ok(list.iter().filter_map(|v| v.as_string()).collect())
}

/// Request headers, e.g. the device identity or the CSRF token.
fn headers(pairs: &[(&str, &str)]) -> JsValue {
    let object = js_sys::Object::new();
    for (name, value) in pairs {
        let _ = js_sys::Reflect::set(&object, &(*name).into(), &(*value).into());
    }
    object.into()
}

pub async fn photos_of(id: &str) -> Result<Vec<web_sys::Blob>, String> {
    let list: js_sys::Array = wait(photos_of_js(id)).await?.unchecked_into();
    Ok(list.iter().map(|v| v.unchecked_into()).collect())
}

pub async fn delete_entry(id: &str) -> Result<(), String> {
    wait(delete_entry_js(id)).await.map(|_| ())
}

/// True when the browser promised not to evict the outbox.
pub async fn request_persistence() -> bool {
    wait(request_persistence_js()).await.ok().and_then(|v| v.as_bool()).unwrap_or(false)
}

/// Bytes used and available to this site, when the browser says.
#[derive(Debug, Clone, Copy, Deserialize)]
pub struct StorageEstimate {
    pub usage: f64,
    pub quota: f64,
}

pub async fn storage_estimate() -> Option<StorageEstimate> {
    let value = wait(storage_estimate_js()).await.ok()?;
    serde_wasm_bindgen::from_value(value).ok()
}

/// The device's fix.
#[derive(Debug, Clone, Copy, Deserialize)]
pub struct DeviceFix {
    pub latitude: f64,
    pub longitude: f64,
    /// Metres.
    pub accuracy: f64,
    /// When the fix was taken, milliseconds since 1970.
    pub at: f64,
}

/// A fix no older than a minute (the form opening).
pub async fn current_position() -> Result<DeviceFix, String> {
    position_no_older_than(60_000.0).await
}

/// A fix taken now, not one the browser kept (saving a find on a walk).
pub async fn fresh_position() -> Result<DeviceFix, String> {
    position_no_older_than(0.0).await
}

async fn position_no_older_than(maximum_age_ms: f64) -> Result<DeviceFix, String> {
    let value = wait(current_position_js(maximum_age_ms)).await?;
    serde_wasm_bindgen::from_value(value).map_err(|err| err.to_string())
}

/// Whether the browser has offered to install the app.
pub fn can_install() -> bool {
    can_install_js()
}

/// Shows the browser's install question; true when the observer accepted.
pub async fn install() -> bool {
    wait(install_js()).await.ok().and_then(|v| v.as_bool()).unwrap_or(false)
}

/// The server's answer to an upload.
#[derive(Debug, Clone, Deserialize)]
pub struct Answer {
    pub status: u16,
    pub body: String,
}

/// Posts JSON (as form part `part`) and photos. `Err` means no answer arrived at all.
pub async fn send_form(
    url: &str,
    part: &str,
    json: &str,
    photos: &[web_sys::Blob],
    header_pairs: &[(&str, &str)],
) -> Result<Answer, String> {
    let blobs = photos.iter().map(JsValue::from).collect::<js_sys::Array>();
    let value = wait(send_record_js(url, json, blobs, part, headers(header_pairs))).await?;
    serde_wasm_bindgen::from_value(value).map_err(|err| err.to_string())
}

pub async fn save_walk(id: &str, json: &str) -> Result<(), String> {
    wait(save_walk_js(id, json)).await.map(|_| ())
}

pub async fn list_walks() -> Result<Vec<String>, String> {
    let list: js_sys::Array = wait(list_walks_js()).await?.unchecked_into();
    Ok(list.iter().filter_map(|v| v.as_string()).collect())
}

/// A fix from following the position; `at` is milliseconds since 1970.
#[derive(Debug, Clone, Copy, PartialEq, Deserialize)]
pub struct TimedFix {
    pub latitude: f64,
    pub longitude: f64,
    pub accuracy: f64,
    pub at: f64,
}

/// Follows the position until [`stop_watching`] is called with the returned id.
pub fn watch_position(on_fix: impl Fn(TimedFix) + 'static, on_error: impl Fn(String) + 'static) -> i32 {
    let fix = wasm_bindgen::closure::Closure::<dyn Fn(JsValue)>::new(move |value: JsValue| {
        if let Ok(fix) = serde_wasm_bindgen::from_value::<TimedFix>(value) {
            on_fix(fix);
        }
    });
    let error = wasm_bindgen::closure::Closure::<dyn Fn(JsValue)>::new(move |value: JsValue| on_error(message(value)));
    let id = watch_position_js(fix.as_ref().unchecked_ref(), error.as_ref().unchecked_ref());
    // The browser holds the callbacks until the watch is cleared; a walk is rare
    // enough that keeping them for the page's life costs nothing.
    fix.forget();
    error.forget();
    id
}

pub fn stop_watching(id: i32) {
    stop_watching_js(id);
}

/// Sends a request with an optional JSON body; `Err` means no answer arrived.
pub async fn send_json(
    method: &str,
    url: &str,
    json: Option<&str>,
    header_pairs: &[(&str, &str)],
) -> Result<Answer, String> {
    let body = json.map_or(JsValue::NULL, JsValue::from);
    let value = wait(send_json_js(method, url, body, headers(header_pairs))).await?;
    serde_wasm_bindgen::from_value(value).map_err(|err| err.to_string())
}

/// A picked file's bytes.
pub async fn read_bytes(file: &web_sys::Blob) -> Result<Vec<u8>, String> {
    let array: js_sys::Uint8Array = wait(read_bytes_js(file)).await?.unchecked_into();
    Ok(array.to_vec())
}

/// SHA-256 of a picked file, hex; `None` where the browser offers no digest.
pub async fn original_sha256(file: &web_sys::Blob) -> Result<Option<String>, String> {
    Ok(wait(original_sha256_js(file)).await?.as_string())
}

/// The upload copy of a photo, made by the browser's decoder and canvas.
pub struct UploadCopy {
    pub blob: web_sys::Blob,
    /// SHA-256 of the copy, hex; `None` where the browser offers no hashing.
    pub sha256: Option<String>,
}

/// Why an upload copy could not be made.
pub enum PrepareError {
    /// The browser cannot decode this format (HEIC in most browsers but Safari).
    Undecodable(String),
    /// The browser has no canvas that can save a picture (very old browsers).
    NoCanvas(String),
    Other(String),
}

pub async fn prepare_upload(file: &web_sys::Blob, long_edge: u32, quality: f64) -> Result<UploadCopy, PrepareError> {
    let value = JsFuture::from(prepare_upload_js(file, long_edge, quality)).await.map_err(|err| {
        let flag =
            |name: &str| js_sys::Reflect::get(&err, &name.into()).ok().and_then(|v| v.as_bool()).unwrap_or(false);
        if flag("undecodable") {
            PrepareError::Undecodable(message(err))
        } else if flag("noCanvas") {
            PrepareError::NoCanvas(message(err))
        } else {
            PrepareError::Other(message(err))
        }
    })?;
    let blob = js_sys::Reflect::get(&value, &"blob".into())
        .ok()
        .filter(|b| b.is_instance_of::<web_sys::Blob>())
        .ok_or_else(|| PrepareError::Other(t("device-no-upload-copy")))?;
    let sha256 = js_sys::Reflect::get(&value, &"sha256".into()).ok().and_then(|v| v.as_string());
    Ok(UploadCopy { blob: blob.unchecked_into(), sha256 })
}
