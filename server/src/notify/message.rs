//! What the responders are told of a live animal: the same facts for the webhook's
//! JSON and the email's text. The observer's contact is not among them (contacts never
//! leave the server); the record's id lets a reviewer find it.

use serde::Serialize;
use shared_types::RecordView;

/// The facts of one urgent record, as sent.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Alert {
    /// Always `live_animal`.
    pub event: &'static str,
    /// The same on every retry of this notification.
    pub delivery_id: String,
    pub record_id: String,
    pub received_at: String,
    /// When the observer saw the animal, with their UTC offset.
    pub observed_at: String,
    pub latitude: Option<f64>,
    pub longitude: Option<f64>,
    /// The position's uncertainty, metres.
    pub accuracy_m: Option<f64>,
    pub species_guess: Option<String>,
    pub count: u32,
    /// `beach_stranding`, `angler_catch`…
    pub setting: String,
    pub length: Option<String>,
    pub notes: Option<String>,
    pub photos: usize,
}

impl Alert {
    pub fn of(record: &RecordView, delivery_id: &str) -> Self {
        let s = &record.submission;
        Self {
            event: "live_animal",
            delivery_id: delivery_id.to_owned(),
            record_id: s.client_id.to_string(),
            received_at: record.received_at.to_rfc3339(),
            observed_at: s.observed_at.to_rfc3339(),
            latitude: s.position.map(|p| p.latitude.get()),
            longitude: s.position.map(|p| p.longitude.get()),
            accuracy_m: s.position.and_then(|p| p.accuracy_m.map(|a| a.get())),
            species_guess: s.species_guess.as_ref().map(|t| t.as_str().to_owned()),
            count: s.count.get(),
            setting: shared_types::codes::code(&s.setting),
            length: s.length.as_ref().map(|l| format!("{} {} {}", l.value.value, l.value.unit.code(), l.kind.label())),
            notes: s.notes.as_ref().map(|t| t.as_str().to_owned()),
            photos: record.photos.len(),
        }
    }

    /// The email's subject.
    pub fn subject(&self) -> String {
        let what = self.species_guess.as_deref().unwrap_or("shark or ray");
        match (self.latitude, self.longitude) {
            (Some(lat), Some(lon)) => format!("Live animal reported: {what} at {lat:.5}, {lon:.5}"),
            _ => format!("Live animal reported: {what} (no position given)"),
        }
    }

    /// The email's body, plain text.
    pub fn text(&self) -> String {
        let mut lines = vec![
            "A live animal has been reported to wrackline.".to_owned(),
            String::new(),
            format!("Seen: {}", self.observed_at),
            match (self.latitude, self.longitude) {
                (Some(lat), Some(lon)) => format!(
                    "Where: {lat:.5}, {lon:.5}{} (geo:{lat:.5},{lon:.5})",
                    self.accuracy_m.map(|a| format!(" ± {a:.0} m")).unwrap_or_default()
                ),
                _ => "Where: no position given".to_owned(),
            },
            format!("What: {} (count {})", self.species_guess.as_deref().unwrap_or("not named"), self.count),
            format!("Setting: {}", self.setting.replace('_', " ")),
        ];
        lines.extend(self.length.as_ref().map(|l| format!("Length: {l}")));
        lines.extend(self.notes.as_ref().map(|n| format!("Observer's notes: {n}")));
        lines.push(format!("Photos: {}", self.photos));
        lines.push(String::new());
        lines.push(format!(
            "Record {} (received {}); log what you did on the record in wrackline.",
            self.record_id, self.received_at
        ));
        lines.push(format!("Delivery {}", self.delivery_id));
        lines.join("\n")
    }
}
