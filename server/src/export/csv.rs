//! Records as CSV, one row per organism: the Darwin Core occurrence terms first (the same
//! columns as the archive's occurrence file, TDWG Darwin Core term names), then columns
//! with no Darwin Core term, with plain names of our own. Every value is made safe for
//! spreadsheets ([`super::cells`]).

use std::io::Write;

use rusqlite::Connection;

use super::cells::spreadsheet_safe;
use super::terms::OCCURRENCE_TERMS;
use super::{ExportError, ExportRequest, ExportSummary, each_occurrence};
use crate::protect::Publisher;
use crate::taxa::TaxonIndex;

/// Our own columns after the Darwin Core ones.
pub const OWN_COLUMNS: &[&str] =
    &["condition", "setting", "humanSigns", "lengthKind", "lengthCm", "lengthMethod", "reviewState"];

pub fn write<W: Write>(
    conn: &Connection,
    names: &TaxonIndex,
    request: &ExportRequest,
    out: W,
    progress: &mut dyn FnMut(),
) -> Result<ExportSummary, ExportError> {
    let mut writer = ::csv::Writer::from_writer(out);
    writer.write_record(OCCURRENCE_TERMS.iter().chain(OWN_COLUMNS))?;
    let publisher = Publisher::load(conn, names, request.audience)?;
    let summary = each_occurrence(conn, &publisher, request, progress, |o| {
        let length = o.length.as_ref();
        let own = [
            o.condition.to_owned(),
            o.setting.to_owned(),
            o.human_signs.clone(),
            length.map(|l| l.kind.label().to_owned()).unwrap_or_default(),
            length.map(|l| format!("{:.1}", l.value_cm)).unwrap_or_default(),
            length.map(|l| method(l.method).to_owned()).unwrap_or_default(),
            o.review_state.to_owned(),
        ];
        for value in o.dwc.iter().chain(own.iter()) {
            writer.write_field(spreadsheet_safe(value).as_bytes())?;
        }
        writer.write_record(None::<&[u8]>)?;
        Ok(())
    })?;
    writer.flush()?;
    Ok(summary)
}

/// `measured` or `estimated`.
pub fn method(method: shared_types::MeasureMethod) -> &'static str {
    match method {
        shared_types::MeasureMethod::Measured => "measured",
        shared_types::MeasureMethod::Estimated => "estimated",
    }
}
