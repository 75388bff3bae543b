//! Records as CSV, one row per observation, with Darwin Core term names as column
//! headers wherever a term exists (TDWG Darwin Core quick reference). Columns with no
//! Darwin Core term have plain names of our own, after the Darwin Core ones.

use std::io::Write;

use shared_types::RecordView;

/// The header row, in order.
pub const COLUMNS: &[&str] = &[
    "occurrenceID",
    "basisOfRecord",
    "eventDate",
    "decimalLatitude",
    "decimalLongitude",
    "geodeticDatum",
    "coordinateUncertaintyInMeters",
    "verbatimIdentification",
    "individualCount",
    "sex",
    "vitality",
    "recordedBy",
    "occurrenceRemarks",
    "associatedMedia",
    "organismID",
    "condition",
    "setting",
    "humanSigns",
    "lengthKind",
    "lengthCm",
    "lengthMethod",
    "reviewState",
];

/// Writes every record; photo links are absolute, under `base_url`.
pub fn write(records: &[RecordView], base_url: &str, out: impl Write) -> anyhow::Result<()> {
    let mut writer = ::csv::Writer::from_writer(out);
    writer.write_record(COLUMNS)?;
    for record in records {
        writer.write_record(row(record, base_url))?;
    }
    writer.flush()?;
    Ok(())
}

fn row(record: &RecordView, base_url: &str) -> Vec<String> {
    let sub = &record.submission;
    let position = sub.position.as_ref();
    let text = |t: &Option<shared_types::Text>| t.as_ref().map(|t| t.as_str().to_owned()).unwrap_or_default();
    let media: Vec<String> = record.photos.iter().map(|p| format!("{base_url}/photos/{}", p.sha256)).collect();
    let signs: Vec<&str> = sub.human_signs.iter().map(|s| s.label()).collect();
    vec![
        format!("urn:uuid:{}", sub.client_id),
        "HumanObservation".into(),
        // ISO 8601 with the phone's offset, e.g. 2026-03-14T09:30:00+01:00.
        sub.observed_at.to_rfc3339(),
        position.map(|p| format!("{:.6}", p.latitude.get())).unwrap_or_default(),
        position.map(|p| format!("{:.6}", p.longitude.get())).unwrap_or_default(),
        if position.is_some() { "EPSG:4326".into() } else { String::new() },
        position.and_then(|p| p.accuracy_m).map(|a| format!("{:.0}", a.get().ceil())).unwrap_or_default(),
        text(&sub.species_guess),
        sub.count.get().to_string(),
        sub.sex.dwc().into(),
        sub.condition.vitality().into(),
        text(&sub.observer_name),
        text(&sub.notes),
        // Darwin Core recommends " | " between list items.
        media.join(" | "),
        format!("organism-{}", record.organism_id),
        sub.condition.label().into(),
        sub.setting.label().into(),
        signs.join(" | "),
        sub.length.map(|l| l.kind.label().to_owned()).unwrap_or_default(),
        sub.length.map(|l| format!("{:.1}", l.value.centimetres())).unwrap_or_default(),
        sub.length.map(|l| format!("{:?}", l.method).to_lowercase()).unwrap_or_default(),
        record.review_state.label().into(),
    ]
}
