//! Benchmark only, never shipped: the phone's upload copy made the other way, with the
//! `image` crate compiled to wasm — EXIF Orientation read with the shared reader, decode,
//! orient, shrink to the long edge, JPEG — so `tests/browser/bench_prepare.mjs` can time
//! it beside the app's browser-decoder route in the same Chromium run.

use image::metadata::Orientation;
use image::{DynamicImage, ImageFormat};
use wasm_bindgen::prelude::*;

/// The upload copy of a JPEG as JPEG bytes.
#[wasm_bindgen]
pub fn upload_copy(bytes: &[u8], long_edge: u32, quality: u8) -> Result<Vec<u8>, JsError> {
    let orientation = shared_types::exif::read(bytes)
        .orientation
        .and_then(|o| u8::try_from(o).ok())
        .and_then(Orientation::from_exif)
        .unwrap_or(Orientation::NoTransforms);
    let mut image =
        image::load_from_memory_with_format(bytes, ImageFormat::Jpeg).map_err(|err| JsError::new(&err.to_string()))?;
    image.apply_orientation(orientation);
    let copy = if image.width().max(image.height()) > long_edge {
        image.resize(long_edge, long_edge, image::imageops::FilterType::Triangle)
    } else {
        image
    };
    let mut out = Vec::new();
    image::codecs::jpeg::JpegEncoder::new_with_quality(&mut out, quality)
        .encode_image(&DynamicImage::ImageRgb8(copy.to_rgb8()))
        .map_err(|err| JsError::new(&err.to_string()))?;
    Ok(out)
}
