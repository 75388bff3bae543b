//! Decoding a photo safely and making what the server shows of it.
//!
//! A photo file is hostile until proven otherwise. Its pixel dimensions are read from
//! the header and checked before any pixel is decoded (a small file may declare a
//! 100 000 × 100 000 image: a decompression bomb), also against the file's size: a real
//! image of that many pixels cannot be smaller than the format's coding allows
//! ([`fewest_bytes`]), so a 2 KB file declaring 64 megapixels is refused unread rather
//! than costing a second and hundreds of megabytes to decode. The decoder itself runs
//! with the `image` crate's limits set, so a header that lies still cannot make it
//! allocate without bound.
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
    #[error(
        "it declares {width} × {height} pixels in only {bytes} bytes; an image of that size takes at least {fewest} bytes, so the file is damaged or forged"
    )]
    Implausible { width: u32, height: u32, bytes: usize, fewest: u64 },
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
    let fewest = fewest_bytes(format, width, height);
    if (bytes.len() as u64) < fewest {
        return Err(ImageProblem::Implausible { width, height, bytes: bytes.len(), fewest });
    }
    Ok((width, height))
}

/// The fewest bytes a file of this format can take for `width` × `height` pixels.
///
/// - JPEG (ITU-T T.81, Huffman coding; arithmetic-coded JPEGs are not decoded here):
///   every 8 × 8 block of every scan codes at least its DC difference, and a Huffman
///   code is at least one bit long, so a full image is at least one bit per block of
///   one component: pixels / 64 / 8 bytes.
/// - PNG (ISO/IEC 15948): the pixels of a 1-bit greyscale image, each row with its
///   filter byte, are compressed with deflate, whose densest coding is 1032 to 1 (zlib's
///   technical notes, from memory): (⌈width / 8⌉ + 1) × height / 1032 bytes.
///
/// Both are far below any real photo (phone JPEGs run at 1–4 bits per pixel, common
/// practice), so only a forged or damaged header falls below them.
pub fn fewest_bytes(format: PhotoFormat, width: u32, height: u32) -> u64 {
    let (width, height) = (u64::from(width), u64::from(height));
    match format {
        PhotoFormat::Jpeg => (width * height / 64) / 8,
        PhotoFormat::Png => (width.div_ceil(8) + 1) * height / 1032,
    }
}

/// Whether a JPEG ends before its image data does: no end-of-image marker (FFD9) after
/// the start of its first scan. The segments before the scan are stepped over by their
/// lengths, so an EXIF thumbnail's own markers are not mistaken for the image's; within
/// the scan data an FF byte is always followed by 00 or a restart marker (ITU-T T.81
/// B.1.1.5), so FFD9 there can only be the end. A PNG cut short does not decode at all,
/// so it is refused rather than flagged.
pub fn cut_short(bytes: &[u8], format: PhotoFormat) -> bool {
    if format != PhotoFormat::Jpeg {
        return false;
    }
    let Some(scan) = first_scan(bytes) else { return true };
    !bytes[scan..].windows(2).any(|pair| pair == [0xFF, 0xD9])
}

/// Where the first start-of-scan (FFDA) segment begins, walking the segments from SOI.
fn first_scan(bytes: &[u8]) -> Option<usize> {
    let mut at = 2;
    loop {
        while bytes.get(at) == Some(&0xFF) && bytes.get(at + 1) == Some(&0xFF) {
            at += 1; // fill bytes before a marker
        }
        let (&marker_start, &marker) = (bytes.get(at)?, bytes.get(at + 1)?);
        if marker_start != 0xFF {
            return None;
        }
        if marker == 0xDA {
            return Some(at);
        }
        let length = u16::from_be_bytes([*bytes.get(at + 2)?, *bytes.get(at + 3)?]) as usize;
        at += 2 + length;
    }
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
    fn the_fewest_bytes_follow_the_coding_of_each_format() {
        // JPEG: one bit per 8 × 8 block. 8000 × 8000 px is 1 000 000 blocks: 125 000 bytes.
        assert_eq!(fewest_bytes(PhotoFormat::Jpeg, 8000, 8000), 125_000);
        // PNG: (1000 bytes of 1-bit pixels + 1 filter byte) × 8000 rows / 1032.
        assert_eq!(fewest_bytes(PhotoFormat::Png, 8000, 8000), 7_759);
    }

    #[test]
    fn a_jpeg_without_its_end_marker_after_the_scan_is_cut_short() {
        let image = image::RgbImage::from_fn(64, 64, |x, y| image::Rgb([x as u8 * 4, y as u8 * 4, 90]));
        let mut whole = Vec::new();
        image::codecs::jpeg::JpegEncoder::new_with_quality(&mut whole, 85).encode_image(&image).unwrap();
        assert!(!cut_short(&whole, PhotoFormat::Jpeg));
        assert!(cut_short(&whole[..whole.len() - 2], PhotoFormat::Jpeg), "without FFD9");
        assert!(cut_short(&whole[..whole.len() / 2], PhotoFormat::Jpeg));
        assert!(!cut_short(&[whole.clone(), b"PK appended".to_vec()].concat(), PhotoFormat::Jpeg));
    }

    #[test]
    fn orientation_outside_one_to_eight_means_as_stored() {
        // CIPA DC-008 defines 1–8 only.
        assert_eq!(orientation_of(Some(0)), Orientation::NoTransforms);
        assert_eq!(orientation_of(Some(9)), Orientation::NoTransforms);
        assert_eq!(orientation_of(None), Orientation::NoTransforms);
        assert_eq!(orientation_of(Some(6)), Orientation::Rotate90);
    }
}
