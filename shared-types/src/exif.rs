//! Reads what a photo's EXIF says about when and where it was taken (CIPA DC-008).
//!
//! Shared because both sides read it: the phone from the original before it makes the
//! upload copy (which carries no EXIF), the server from the file it receives. A photo
//! without EXIF, or with EXIF that cannot be read, simply has no EXIF facts: that is
//! never a reason to refuse the record.

use crate::record::{OffsetSource, PhotoExif};
use chrono::{DateTime, FixedOffset, NaiveDateTime, TimeZone};
use exif::{In, Reader, Tag, Value};

/// EXIF facts straight from the file, before the record's offset is applied.
pub fn read(bytes: &[u8]) -> PhotoExif {
    read_if_present(bytes).unwrap_or_default()
}

/// EXIF facts, or `None` when no EXIF block could be found in `bytes` — which may be
/// only the start of a file: a JPEG's EXIF (APP1, at most 64 KiB) comes before its
/// pixels, and the reader stops as soon as it has it.
pub fn read_if_present(bytes: &[u8]) -> Option<PhotoExif> {
    // Phones and editors write EXIF with small faults (a stray next-IFD pointer, an
    // odd count); keep what can be read rather than losing the whole block.
    let exif = Reader::new()
        .continue_on_error(true)
        .read_from_container(&mut std::io::Cursor::new(bytes))
        .or_else(|err| err.distill_partial_result(|_faults| ()))
        .ok()?;
    let ascii = |tag| exif.get_field(tag, In::PRIMARY).and_then(|f| ascii_value(&f.value));
    let taken_local = ascii(Tag::DateTimeOriginal).map(|time| match ascii(Tag::SubSecTimeOriginal) {
        Some(sub) if sub.chars().all(|c| c.is_ascii_digit()) && !sub.is_empty() => format!("{time}.{sub}"),
        _ => time,
    });
    Some(PhotoExif {
        taken_local,
        offset: ascii(Tag::OffsetTimeOriginal),
        latitude: signed_degrees(&exif, Tag::GPSLatitude, Tag::GPSLatitudeRef, "S"),
        longitude: signed_degrees(&exif, Tag::GPSLongitude, Tag::GPSLongitudeRef, "W"),
        altitude_m: altitude(&exif),
        horizontal_error_m: rational(&exif, Tag::GPSHPositioningError),
        orientation: exif
            .get_field(Tag::Orientation, In::PRIMARY)
            .and_then(|f| f.value.get_uint(0))
            .and_then(|v| u16::try_from(v).ok())
            .filter(|v| (1..=8).contains(v)),
        taken_at: None,
        offset_source: None,
        device_offset: None,
        original_sha256: None,
    })
}

/// Turns the photo's local time into an instant and says which offset did it: the
/// photo's own OffsetTimeOriginal when present, else the phone's offset at the photo's
/// local time (`device_offset`, sent by the phone), else the record's UTC offset.
pub fn resolve_time(mut exif: PhotoExif, record_offset: FixedOffset) -> PhotoExif {
    let Some(local) = exif.taken_local.as_deref().and_then(parse_exif_time) else {
        return exif;
    };
    let own = exif.offset.as_deref().and_then(parse_offset).map(|o| (o, OffsetSource::Photo));
    let device = || exif.device_offset.as_deref().and_then(parse_offset).map(|o| (o, OffsetSource::Device));
    let (offset, source) = own.or_else(device).unwrap_or((record_offset, OffsetSource::Record));
    exif.taken_at = offset.from_local_datetime(&local).single();
    exif.offset_source = exif.taken_at.map(|_| source);
    exif
}

fn ascii_value(value: &Value) -> Option<String> {
    match value {
        Value::Ascii(parts) => parts
            .first()
            .map(|bytes| String::from_utf8_lossy(bytes).trim_end_matches('\0').trim().to_owned())
            .filter(|s| !s.is_empty()),
        _ => None,
    }
}

/// `YYYY:MM:DD HH:MM:SS[.fraction]`, as DateTimeOriginal (+ SubSecTimeOriginal) write it.
fn parse_exif_time(text: &str) -> Option<NaiveDateTime> {
    NaiveDateTime::parse_from_str(text, "%Y:%m:%d %H:%M:%S%.f").ok()
}

/// `±HH:MM`, as OffsetTimeOriginal writes it.
fn parse_offset(text: &str) -> Option<FixedOffset> {
    DateTime::parse_from_str(&format!("2000-01-01T00:00:00{text}"), "%Y-%m-%dT%H:%M:%S%:z").ok().map(|t| *t.offset())
}

/// Degrees, minutes, seconds as three RATIONALs, negative for the given reference.
fn signed_degrees(exif: &exif::Exif, tag: Tag, ref_tag: Tag, negative_ref: &str) -> Option<f64> {
    let field = exif.get_field(tag, In::PRIMARY)?;
    let Value::Rational(parts) = &field.value else { return None };
    if parts.len() < 3 || parts.iter().any(|r| r.denom == 0) {
        return None;
    }
    let degrees = parts[0].to_f64() + parts[1].to_f64() / 60.0 + parts[2].to_f64() / 3600.0;
    let reference = exif.get_field(ref_tag, In::PRIMARY).and_then(|f| ascii_value(&f.value))?;
    let signed = if reference.eq_ignore_ascii_case(negative_ref) { -degrees } else { degrees };
    signed.is_finite().then_some(signed)
}

fn rational(exif: &exif::Exif, tag: Tag) -> Option<f64> {
    match &exif.get_field(tag, In::PRIMARY)?.value {
        Value::Rational(parts) => parts.first().filter(|r| r.denom != 0).map(|r| r.to_f64()),
        _ => None,
    }
}

/// GPSAltitude, negative when GPSAltitudeRef says below sea level (1).
fn altitude(exif: &exif::Exif) -> Option<f64> {
    let metres = rational(exif, Tag::GPSAltitude)?;
    let below = exif.get_field(Tag::GPSAltitudeRef, In::PRIMARY).and_then(|f| f.value.get_uint(0)) == Some(1);
    Some(if below { -metres } else { metres })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn offsets_and_times_parse_as_cipa_dc_008_writes_them() {
        // CIPA DC-008: DateTimeOriginal "YYYY:MM:DD HH:MM:SS"; OffsetTimeOriginal "±HH:MM".
        assert_eq!(parse_offset("+01:00").unwrap().local_minus_utc(), 3600);
        assert_eq!(parse_offset("-03:30").unwrap().local_minus_utc(), -12600);
        assert!(parse_offset("1 hour").is_none());
        assert!(parse_exif_time("2025:06:01 14:05:09").is_some());
        assert!(parse_exif_time("2025:06:01 14:05:09.250").is_some());
        assert!(parse_exif_time("0000:00:00 00:00:00").is_none());
    }

    #[test]
    fn the_record_offset_is_used_only_when_the_photo_has_none() {
        let record = FixedOffset::east_opt(2 * 3600).unwrap();
        let mut exif = PhotoExif { taken_local: Some("2025:06:01 14:05:09".into()), ..Default::default() };
        let resolved = resolve_time(exif.clone(), record);
        assert_eq!(resolved.offset_source, Some(OffsetSource::Record));
        assert_eq!(resolved.taken_at.unwrap().to_rfc3339(), "2025-06-01T14:05:09+02:00");
        exif.offset = Some("+01:00".into());
        let resolved = resolve_time(exif, record);
        assert_eq!(resolved.offset_source, Some(OffsetSource::Photo));
        assert_eq!(resolved.taken_at.unwrap().to_rfc3339(), "2025-06-01T14:05:09+01:00");
    }

    #[test]
    fn the_phones_offset_at_the_photo_beats_the_records_across_a_clock_change() {
        // A photo taken on Saturday 29 March 2025 at 14:00 in London (GMT, +00:00), with
        // no OffsetTimeOriginal; the record made on Sunday after clocks went forward
        // (BST, +01:00). UK daylight saving starts the last Sunday of March (from memory).
        let record = FixedOffset::east_opt(3600).unwrap();
        let exif = PhotoExif {
            taken_local: Some("2025:03:29 14:00:00".into()),
            device_offset: Some("+00:00".into()),
            ..Default::default()
        };
        let resolved = resolve_time(exif.clone(), record);
        assert_eq!(resolved.offset_source, Some(OffsetSource::Device));
        assert_eq!(resolved.taken_at.unwrap().to_rfc3339(), "2025-03-29T14:00:00+00:00");
        // The photo's own offset still comes first.
        let own = resolve_time(PhotoExif { offset: Some("+02:00".into()), ..exif.clone() }, record);
        assert_eq!(own.offset_source, Some(OffsetSource::Photo));
        // An offset the phone garbled is no offset: the record's is used, and said.
        let garbled = resolve_time(PhotoExif { device_offset: Some("GMT".into()), ..exif }, record);
        assert_eq!(garbled.offset_source, Some(OffsetSource::Record));
    }

    #[test]
    fn garbage_is_no_exif_rather_than_an_error() {
        assert_eq!(read(b"not a photo at all"), PhotoExif::default());
        assert_eq!(read_if_present(b"not a photo at all"), None);
    }

    /// A JPEG: SOI, an APP1 "Exif" segment holding a big-endian TIFF whose IFD0 has one
    /// Orientation entry (CIPA DC-008 §4.5.4, tag 0x0112 SHORT), then `scan` bytes
    /// standing for the pixels.
    fn jpeg_with_orientation(orientation: u16, scan: usize) -> Vec<u8> {
        let mut tiff = b"MM\0\x2a\0\0\0\x08\0\x01".to_vec();
        tiff.extend([0x01, 0x12, 0x00, 0x03, 0, 0, 0, 1]);
        tiff.extend(orientation.to_be_bytes());
        tiff.extend([0, 0, 0, 0, 0, 0]);
        let mut jpeg = vec![0xFF, 0xD8, 0xFF, 0xE1];
        jpeg.extend(((tiff.len() + 8) as u16).to_be_bytes());
        jpeg.extend(b"Exif\0\0");
        jpeg.extend(tiff);
        jpeg.extend([0xFF, 0xDA, 0x00, 0x02]);
        jpeg.extend(std::iter::repeat_n(0x55, scan));
        jpeg
    }

    #[test]
    fn the_start_of_a_jpeg_holds_its_exif() {
        let whole = jpeg_with_orientation(6, 1 << 20);
        let head = &whole[..256 * 1024];
        assert_eq!(read_if_present(head).and_then(|e| e.orientation), Some(6));
        assert_eq!(read_if_present(head), read_if_present(&whole));
        // Cut before the EXIF ends: not found, so the phone reads the whole file.
        assert_eq!(read_if_present(&whole[..20]), None);
    }
}
