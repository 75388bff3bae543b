//! Records as a GeoJSON FeatureCollection (RFC 7946): one Point feature per organism,
//! coordinates in longitude, latitude order on WGS84, Darwin Core values as properties.
//! A feature whose location is withheld has a null geometry (RFC 7946 §3.2). The export's
//! notes (what was generalised, names not on the checklist) follow the features as a
//! foreign member `notes` (RFC 7946 §6.1). Records are points, so there are no polygons
//! and no winding order to keep. The terms that hold numbers ([`NUMBER_TERMS`]) are JSON
//! numbers, so GIS tools read them as numbers; other property values are text, made safe
//! for spreadsheets as in every format ([`super::cells`]), so a value reads the same
//! whichever file it came from.

use std::io::Write;

use rusqlite::Connection;
use serde_json::{Map, Value};

use super::cells::spreadsheet_safe;
use super::terms::OCCURRENCE_TERMS;
use super::{ExportError, ExportRequest, ExportSummary, Occurrence, each_occurrence};
use crate::protect::Publisher;
use crate::taxa::TaxonIndex;

pub fn write<W: Write>(
    conn: &Connection,
    names: &TaxonIndex,
    request: &ExportRequest,
    mut out: W,
    progress: &mut dyn FnMut(),
) -> Result<ExportSummary, ExportError> {
    out.write_all(b"{\"type\":\"FeatureCollection\",\"features\":[\n")?;
    let mut first = true;
    let publisher = Publisher::load(conn, names, request.audience)?;
    let summary = each_occurrence(conn, &publisher, request, progress, |o| {
        if !first {
            out.write_all(b",\n")?;
        }
        first = false;
        write_feature(&mut out, o)
    })?;
    out.write_all(b"\n],\"notes\":")?;
    serde_json::to_writer(&mut out, &summary.notes())?;
    out.write_all(b"}\n")?;
    out.flush()?;
    Ok(summary)
}

/// The Darwin Core terms whose values are numbers.
pub const NUMBER_TERMS: &[&str] =
    &["decimalLatitude", "decimalLongitude", "coordinateUncertaintyInMeters", "individualCount"];

/// A property's JSON value: a number for [`NUMBER_TERMS`] (text if it does not read as
/// one, which the exports never write), else spreadsheet-safe text.
fn property(term: &str, value: &str) -> Value {
    if NUMBER_TERMS.contains(&term) {
        let number = value
            .parse::<i64>()
            .map(serde_json::Number::from)
            .ok()
            .or_else(|| value.parse::<f64>().ok().and_then(serde_json::Number::from_f64));
        if let Some(number) = number {
            return Value::Number(number);
        }
    }
    Value::String(spreadsheet_safe(value).into_owned())
}

fn write_feature(out: &mut impl Write, o: &Occurrence) -> Result<(), ExportError> {
    let mut properties = Map::new();
    for (term, value) in OCCURRENCE_TERMS.iter().zip(&o.dwc) {
        if !value.is_empty() {
            properties.insert((*term).to_owned(), property(term, value));
        }
    }
    write!(out, "{{\"type\":\"Feature\",\"id\":")?;
    serde_json::to_writer(&mut *out, &o.dwc[0])?;
    match o.place.position {
        // Longitude first (RFC 7946 §3.1.1), printed to the precision published.
        Some((lat, lon)) => write!(
            out,
            ",\"geometry\":{{\"type\":\"Point\",\"coordinates\":[{lon:.*},{lat:.*}]}}",
            o.place.decimals, o.place.decimals
        )?,
        None => out.write_all(b",\"geometry\":null")?,
    }
    out.write_all(b",\"properties\":")?;
    serde_json::to_writer(&mut *out, &properties)?;
    out.write_all(b"}")?;
    Ok(())
}
