//! Typed Rust calls over `js/device.js`: the outbox in IndexedDB, the device's
//! position, storage persistence, a photo's bytes and its upload copy, and the upload
//! itself. Errors come back as the
//! browser's own message.

use serde::Deserialize;
use wasm_bindgen::prelude::*;
use wasm_bindgen_futures::JsFuture;

#[wasm_bindgen(module = "/js/device.js")]
extern "C" {
    #[wasm_bindgen(js_name = saveEntry)]
    fn save_entry_js(id: &str, json: &str, files: JsValue) -> js_sys::Promise;
    #[wasm_bindgen(js_name = listEntries)]
    fn list_entries_js() -> js_sys::Promise;
    #[wasm_bindgen(js_name = photosOf)]
    fn photos_of_js(id: &str) -> js_sys::Promise;
    #[wasm_bindgen(js_name = deleteEntry)]
    fn delete_entry_js(id: &str) -> js_sys::Promise;
    #[wasm_bindgen(js_name = requestPersistence)]
    fn request_persistence_js() -> js_sys::Promise;
    #[wasm_bindgen(js_name = storageEstimate)]
    fn storage_estimate_js() -> js_sys::Promise;
    #[wasm_bindgen(js_name = currentPosition)]
    fn current_position_js() -> js_sys::Promise;
    #[wasm_bindgen(js_name = sendRecord)]
    fn send_record_js(url: &str, json: &str, blobs: js_sys::Array) -> js_sys::Promise;
    #[wasm_bindgen(js_name = readBytes)]
    fn read_bytes_js(file: &web_sys::Blob) -> js_sys::Promise;
    #[wasm_bindgen(js_name = prepareUpload)]
    fn prepare_upload_js(file: &web_sys::Blob, long_edge: u32, quality: f64) -> js_sys::Promise;
}

/// A browser error, as text to show.
fn message(err: JsValue) -> String {
    err.dyn_ref::<js_sys::Error>()
        .map(|e| String::from(e.message()))
        .or_else(|| err.as_string())
        .unwrap_or_else(|| "unknown browser error".to_owned())
}

async fn wait(promise: js_sys::Promise) -> Result<JsValue, String> {
    JsFuture::from(promise).await.map_err(message)
}

/// Saves an entry's JSON; with `photos`, replaces its photos in the same transaction.
pub async fn save_entry(id: &str, json: &str, photos: Option<&[web_sys::Blob]>) -> Result<(), String> {
    let files = match photos {
        Some(list) => list.iter().map(JsValue::from).collect::<js_sys::Array>().into(),
        None => JsValue::NULL,
    };
    wait(save_entry_js(id, json, files)).await.map(|_| ())
}

/// Every stored entry's JSON text.
pub async fn list_entries() -> Result<Vec<String>, String> {
    let list: js_sys::Array = wait(list_entries_js()).await?.unchecked_into();
    Ok(list.iter().filter_map(|v| v.as_string()).collect())
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
}

pub async fn current_position() -> Result<DeviceFix, String> {
    let value = wait(current_position_js()).await?;
    serde_wasm_bindgen::from_value(value).map_err(|err| err.to_string())
}

/// The server's answer to an upload.
#[derive(Debug, Clone, Deserialize)]
pub struct Answer {
    pub status: u16,
    pub body: String,
}

/// Posts a record and its photos. `Err` means no answer arrived at all.
pub async fn send_record(url: &str, json: &str, photos: &[web_sys::Blob]) -> Result<Answer, String> {
    let blobs = photos.iter().map(JsValue::from).collect::<js_sys::Array>();
    let value = wait(send_record_js(url, json, blobs)).await?;
    serde_wasm_bindgen::from_value(value).map_err(|err| err.to_string())
}

/// A picked file's bytes.
pub async fn read_bytes(file: &web_sys::Blob) -> Result<Vec<u8>, String> {
    let array: js_sys::Uint8Array = wait(read_bytes_js(file)).await?.unchecked_into();
    Ok(array.to_vec())
}

/// The upload copy of a photo, made by the browser's decoder and canvas.
pub struct UploadCopy {
    pub blob: web_sys::Blob,
}

/// Why an upload copy could not be made.
pub enum PrepareError {
    /// The browser cannot decode this format (HEIC in most browsers but Safari).
    Undecodable(String),
    Other(String),
}

pub async fn prepare_upload(file: &web_sys::Blob, long_edge: u32, quality: f64) -> Result<UploadCopy, PrepareError> {
    let value = JsFuture::from(prepare_upload_js(file, long_edge, quality)).await.map_err(|err| {
        let undecodable = js_sys::Reflect::get(&err, &"undecodable".into()).ok().and_then(|v| v.as_bool()).unwrap_or(false);
        if undecodable { PrepareError::Undecodable(message(err)) } else { PrepareError::Other(message(err)) }
    })?;
    let blob = js_sys::Reflect::get(&value, &"blob".into())
        .ok()
        .filter(|b| b.is_instance_of::<web_sys::Blob>())
        .ok_or_else(|| PrepareError::Other("no upload copy came back".into()))?;
    Ok(UploadCopy { blob: blob.unchecked_into() })
}
