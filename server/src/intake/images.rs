//! Decoding a photo safely and making what the server shows of it.
//!
//! A photo file is hostile until proven otherwise. Its pixel dimensions are read from
//! the header and checked before any pixel is decoded (a small file may declare a
//! 100 000 × 100 000 image: a decompression bomb), and the decoder itself runs with the
//! `image` crate's limits set, so a header that lies still cannot make it allocate
//! without bound.
//!
//! What the server serves beyond reviewers is never the original: it is a thumbnail and
//! a display size, re-encoded from the decoded pixels with the EXIF orientation applied
//! (CIPA DC-008), so they carry no EXIF at all — no GPS, no camera serial, no time.

use std::io::Cursor;

use image::metadata::Orientation;
use image::{DynamicImage, ImageFormat, ImageReader, Limits};
use image_hasher::{HashAlg, HasherConfig};

use super::photos::PhotoFormat;

/// The longest side accepted, in pixels. Phone cameras stay below 10 000 px even at
/// 108–200 MP full resolution (from memory); anything longer is refused unread.
pub const MAX_SIDE_PX: u32 = 16_384;
/// The most pixels accepted: 64 MP decodes to at most 256 MiB (RGBA, 8 bits).
pub const MAX_PIXELS: u64 = 64_000_000;
/// What the decoder may allocate at once, a little over the largest accepted image.
const MAX_DECODER_BYTES: u64 = 320 * 1024 * 1024;
/// Long edge of the thumbnail (a list or a queue row) and of the display size (a
/// reviewer's screen), in pixels.
pub const THUMB_LONG_EDGE: u32 = 320;
pub const DISPLAY_LONG_EDGE: u32 = 1280;
/// JPEG quality of the derivatives (common practice: 80–85 is visually clean).
const JPEG_QUALITY: u8 = 82;

/// Why a photo could not be used, in words for the observer.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum ImageProblem {
    #[error("its header could not be read ({0})")]
    UnreadableHeader(String),
    #[error(
        "it declares {width} × {height} pixels; the limit is {MAX_SIDE_PX} px a side and {MAX_PIXELS} pixels in all"
    )]
    TooManyPixels { width: u32, height: u32 },
    #[error("it declares an empty image ({width} × {height} pixels)")]
    NoPixels { width: u32, height: u32 },
    #[error("its pixels could not be decoded ({0})")]
    Undecodable(String),
}

/// The served copies of one photo and its perceptual hash.
#[derive(Debug, Clone, PartialEq)]
pub struct Derivatives {
    /// The original's pixel size as stored (before orientation).
    pub width: u32,
    pub height: u32,
    pub thumb_jpeg: Vec<u8>,
    pub display_jpeg: Vec<u8>,
    /// 64-bit DCT perceptual hash, 16 hex digits (see [`perceptual_hash`]).
    pub phash: String,
}

/// Reads the declared pixel size from the header alone and checks it against the limits.
pub fn checked_dimensions(bytes: &[u8], format: PhotoFormat) -> Result<(u32, u32), ImageProblem> {
    let (width, height) =
        reader(bytes, format).into_dimensions().map_err(|err| ImageProblem::UnreadableHeader(err.to_string()))?;
    if width == 0 || height == 0 {
        return Err(ImageProblem::NoPixels { width, height });
    }
    if width > MAX_SIDE_PX || height > MAX_SIDE_PX || u64::from(width) * u64::from(height) > MAX_PIXELS {
        return Err(ImageProblem::TooManyPixels { width, height });
    }
    Ok((width, height))
}

/// Decodes the pixels with limits set, after the header check.
pub fn decode(bytes: &[u8], format: PhotoFormat) -> Result<DynamicImage, ImageProblem> {
    checked_dimensions(bytes, format)?;
    let mut reader = reader(bytes, format);
    reader.limits(limits());
    reader.decode().map_err(|err| ImageProblem::Undecodable(err.to_string()))
}

/// Decodes, orients and re-encodes one photo. `orientation` is the EXIF Orientation
/// value (1–8) read from the file; anything else means "as stored".
pub fn derive(bytes: &[u8], format: PhotoFormat, orientation: Option<u16>) -> Result<Derivatives, ImageProblem> {
    let (image, (width, height)) = upright(bytes, format, orientation)?;
    let display = fit(&image, DISPLAY_LONG_EDGE);
    let thumb = fit(&display, THUMB_LONG_EDGE);
    Ok(Derivatives {
        width,
        height,
        thumb_jpeg: encode_jpeg(&thumb)?,
        display_jpeg: encode_jpeg(&display)?,
        phash: perceptual_hash(&thumb),
    })
}

/// Decodes (with the checks of [`decode`]) and turns the pixels upright; also returns
/// the stored size, before orientation.
pub fn upright(
    bytes: &[u8],
    format: PhotoFormat,
    orientation: Option<u16>,
) -> Result<(DynamicImage, (u32, u32)), ImageProblem> {
    let mut image = decode(bytes, format)?;
    let stored = (image.width(), image.height());
    image.apply_orientation(orientation_of(orientation));
    Ok((image, stored))
}

/// CIPA DC-008 Orientation 1–8 as the transform that makes the image upright.
pub fn orientation_of(value: Option<u16>) -> Orientation {
    value.and_then(|v| u8::try_from(v).ok()).and_then(Orientation::from_exif).unwrap_or(Orientation::NoTransforms)
}

/// The 64-bit DCT perceptual hash ("pHash": 32 × 32 greyscale, 2-D DCT, the 8 × 8
/// lowest frequencies compared with their median, as image_hasher 3.1 documents
/// "Median + DCT" to be the basis of pHash), as 16 hex digits. The median (not the
/// mean, which the DC term drags up) makes about half the bits ones on any picture.
///
/// Chosen over a difference hash because it survives what happens to a photo passed
/// around — re-encoding, resizing, mild brightness or contrast changes — with fewer
/// false matches, and over an average hash because gradients in sand and water fool
/// that one. It is computed on the upright thumbnail, so the same picture sent with
/// and without an Orientation tag hashes alike; the hash looks at 32 × 32 pixels only,
/// and starting from 320 px rather than 1280 px makes it about ten times cheaper
/// (`cargo bench --bench intake` prints both). Rotated or cropped copies are not near:
/// that is for a reviewer's eye.
pub fn perceptual_hash(image: &DynamicImage) -> String {
    let hasher = HasherConfig::new().hash_size(8, 8).hash_alg(HashAlg::Median).preproc_dct().to_hasher();
    hex::encode(hasher.hash_image(image).as_bytes())
}

fn reader(bytes: &[u8], format: PhotoFormat) -> ImageReader<Cursor<&[u8]>> {
    let format = match format {
        PhotoFormat::Jpeg => ImageFormat::Jpeg,
        PhotoFormat::Png => ImageFormat::Png,
    };
    ImageReader::with_format(Cursor::new(bytes), format)
}

fn limits() -> Limits {
    let mut limits = Limits::default();
    limits.max_image_width = Some(MAX_SIDE_PX);
    limits.max_image_height = Some(MAX_SIDE_PX);
    limits.max_alloc = Some(MAX_DECODER_BYTES);
    limits
}

/// Shrinks (never enlarges) so the long edge is at most `long_edge`.
fn fit(image: &DynamicImage, long_edge: u32) -> DynamicImage {
    if image.width().max(image.height()) <= long_edge {
        image.clone()
    } else {
        image.resize(long_edge, long_edge, image::imageops::FilterType::Triangle)
    }
}

/// Baseline JPEG from the pixels alone: the encoder writes no EXIF or other metadata.
/// Transparency (PNG) is dropped; JPEG has none.
fn encode_jpeg(image: &DynamicImage) -> Result<Vec<u8>, ImageProblem> {
    let mut bytes = Vec::new();
    image::codecs::jpeg::JpegEncoder::new_with_quality(&mut bytes, JPEG_QUALITY)
        .encode_image(&DynamicImage::ImageRgb8(image.to_rgb8()))
        .map_err(|err| ImageProblem::Undecodable(format!("re-encoding failed: {err}")))?;
    Ok(bytes)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn orientation_outside_one_to_eight_means_as_stored() {
        // CIPA DC-008 defines 1–8 only.
        assert_eq!(orientation_of(Some(0)), Orientation::NoTransforms);
        assert_eq!(orientation_of(Some(9)), Orientation::NoTransforms);
        assert_eq!(orientation_of(None), Orientation::NoTransforms);
        assert_eq!(orientation_of(Some(6)), Orientation::Rotate90);
    }
}
