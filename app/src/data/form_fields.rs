//! The record form's fields as the observer types them (plain text while typed), and
//! the rules that turn them into a checked [`Submission`] — the same checks the server
//! runs — or into the list of problems to show. Also what a photo's GPS does to the
//! position, and the line that sets the device's own reading beside each photo's.

use shared_types::{
    AccuracyM, Condition, Count, HumanSign, KeyChoice, Latitude, Length, LengthKind, LengthUnit, LengthValue,
    LifeStage, Longitude, MeasureMethod, PhotoExif, Position, PositionSource, Setting, Sex, Submission,
    SubmissionProblem, Text,
};
use uuid::Uuid;

use crate::data::time::{self, Zone};

/// What the observer has typed so far, as text.
#[derive(Debug, Clone, Default)]
pub struct FormFields {
    pub when: String,
    pub latitude: String,
    pub longitude: String,
    pub accuracy_m: String,
    pub position_source: Option<PositionSource>,
    /// The preview URL of the photo whose GPS filled the position, while
    /// `position_source` is `Photo`: removing that photo clears the position.
    pub position_photo: Option<String>,
    pub species_guess: String,
    pub length_value: String,
    pub length_kind: Option<LengthKind>,
    pub length_unit: Option<LengthUnit>,
    pub length_method: Option<MeasureMethod>,
    pub sex: Option<Sex>,
    /// `None`: not said (the observer could not tell, or did not choose).
    pub life_stage: Option<LifeStage>,
    pub count: String,
    pub condition: Option<Condition>,
    pub setting: Option<Setting>,
    pub human_signs: Vec<HumanSign>,
    pub notes: String,
    pub observer_name: String,
    /// The guided key's pick, kept only while the species field still shows it.
    pub key_choice: Option<KeyChoice>,
}

fn optional_text(label: &str, text: &str, problems: &mut Vec<String>) -> Option<Text> {
    match Text::parse(text) {
        Ok(t) if t.as_str().is_empty() => None,
        Ok(t) => Some(t),
        Err(err) => {
            problems.push(format!("{label}: {err}"));
            None
        }
    }
}

impl FormFields {
    /// A fresh form: `when` (a `datetime-local` value, usually now), one animal,
    /// nothing else assumed.
    pub fn fresh(when: String, observer_name: String) -> Self {
        Self { when, count: "1".into(), observer_name, ..Self::default() }
    }

    /// Checks everything and builds the submission, its time kept with the zone's offset
    /// on that date, or lists every problem at once.
    pub fn to_submission(&self, client_id: Uuid, zone: &impl Zone) -> Result<Submission, Vec<String>> {
        let mut problems = Vec::new();
        let observed_at = time::parse_input(zone, &self.when);
        if observed_at.is_none() {
            problems.push("date and time: choose when the animal was seen".into());
        }
        let position = self.position(&mut problems);
        let length = self.length(&mut problems);
        let count = self
            .count
            .trim()
            .parse::<u32>()
            .map_err(|_| "count: a whole number".to_string())
            .and_then(|n| Count::parse(n).map_err(|e| format!("count: {e}")));
        let count = count.map_err(|p| problems.push(p)).ok();
        let condition = self.condition.or_else(|| {
            problems.push("condition: choose how the animal was found".into());
            None
        });
        let setting = self.setting.or_else(|| {
            problems.push("where: choose how it came to be seen".into());
            None
        });
        let species_guess = optional_text("species", &self.species_guess, &mut problems);
        let notes = optional_text("notes", &self.notes, &mut problems);
        let observer_name = optional_text("your name", &self.observer_name, &mut problems);
        if self.life_stage == Some(LifeStage::EggCase) && length.is_some() {
            problems.push(SubmissionProblem::LengthOfEggCase.to_string());
        }
        if !problems.is_empty() {
            return Err(problems);
        }
        Ok(Submission {
            client_id,
            observed_at: observed_at.expect("checked above"),
            position,
            species_guess,
            length,
            sex: self.sex.unwrap_or(Sex::Unknown),
            count: count.expect("checked above"),
            condition: condition.expect("checked above"),
            setting: setting.expect("checked above"),
            human_signs: self.human_signs.clone(),
            notes,
            observer_name,
            key_choice: self.key_choice.clone(),
            walk_client_id: None,
            photo_exif: Vec::new(),
            life_stage: self.life_stage,
        })
    }

    fn position(&self, problems: &mut Vec<String>) -> Option<Position> {
        if self.latitude.trim().is_empty() && self.longitude.trim().is_empty() {
            return None;
        }
        let number = |label: &str, text: &str, problems: &mut Vec<String>| match text.trim().parse::<f64>() {
            Ok(n) => Some(n),
            Err(_) => {
                problems.push(format!("{label}: a number in decimal degrees, e.g. 52.4153"));
                None
            }
        };
        let latitude = number("latitude", &self.latitude, problems)
            .and_then(|n| Latitude::parse(n).map_err(|e| problems.push(e.to_string())).ok());
        let longitude = number("longitude", &self.longitude, problems)
            .and_then(|n| Longitude::parse(n).map_err(|e| problems.push(e.to_string())).ok());
        let accuracy_m = match self.accuracy_m.trim() {
            "" => None,
            text => text.parse::<f64>().ok().and_then(|n| AccuracyM::parse(n).ok()).or_else(|| {
                problems.push("accuracy: a positive number of metres".into());
                None
            }),
        };
        Some(Position {
            latitude: latitude?,
            longitude: longitude?,
            accuracy_m,
            source: self.position_source.unwrap_or(PositionSource::Typed),
        })
    }

    fn length(&self, problems: &mut Vec<String>) -> Option<Length> {
        let text = self.length_value.trim().replace(',', ".");
        if text.is_empty() {
            return None;
        }
        let unit = self.length_unit.unwrap_or(LengthUnit::Cm);
        let value = match text
            .parse::<f64>()
            .map_err(|_| "a number".to_string())
            .and_then(|v| LengthValue::parse(v, unit).map_err(|e| e.to_string()))
        {
            Ok(value) => value,
            Err(err) => {
                problems.push(format!("length: {err}"));
                return None;
            }
        };
        Some(Length {
            kind: self.length_kind.unwrap_or(LengthKind::Total),
            value,
            method: self.length_method.unwrap_or(MeasureMethod::Measured),
        })
    }
}

impl FormFields {
    /// Fills the position from a photo's EXIF GPS when the form has none (the device
    /// gave no fix), remembering which photo (by its preview URL) filled it; true when
    /// it did.
    pub fn fill_from_photo(&mut self, exif: &PhotoExif, preview_url: &str) -> bool {
        let (Some(lat), Some(lon)) = (exif.latitude, exif.longitude) else { return false };
        if !(self.latitude.trim().is_empty() && self.longitude.trim().is_empty()) {
            return false;
        }
        self.latitude = format!("{lat:.6}");
        self.longitude = format!("{lon:.6}");
        self.accuracy_m = exif.horizontal_error_m.filter(|e| *e >= 1.0).map(|e| format!("{e:.0}")).unwrap_or_default();
        self.position_source = Some(PositionSource::Photo);
        self.position_photo = Some(preview_url.to_owned());
        true
    }

    /// A photo is taken off the form: a position its GPS filled goes with it; one from
    /// the device or typed by the observer stays. True when the position was cleared.
    pub fn forget_photo_position(&mut self, preview_url: &str) -> bool {
        let filled_by_it =
            self.position_source == Some(PositionSource::Photo) && self.position_photo.as_deref() == Some(preview_url);
        if filled_by_it {
            self.latitude.clear();
            self.longitude.clear();
            self.accuracy_m.clear();
            self.position_source = None;
            self.position_photo = None;
        }
        filled_by_it
    }

    /// Sets the device's own fix as the position.
    pub fn set_device_position(&mut self, latitude: f64, longitude: f64, accuracy_m: f64) {
        self.latitude = format!("{latitude:.6}");
        self.longitude = format!("{longitude:.6}");
        self.accuracy_m = format!("{:.0}", accuracy_m.max(1.0));
        self.position_source = Some(PositionSource::Device);
    }

    /// "this device says: 2025-06-01 14:10 (UTC+01:00) · 52.41530, -4.08290 ±9 m": the
    /// record's time and the device's own fix, to set beside what each photo says.
    pub fn device_says(&self, zone: &impl Zone) -> String {
        let place = match (self.latitude.trim(), self.longitude.trim(), self.position_source) {
            (lat, lon, Some(PositionSource::Device)) if !lat.is_empty() && !lon.is_empty() => {
                format!("{lat}, {lon} ±{} m", self.accuracy_m)
            }
            _ => "no position".to_owned(),
        };
        format!(
            "this device says: {} ({}) · {place}",
            self.when.replace('T', " "),
            time::offset_label(zone, &self.when)
        )
    }
}

#[cfg(test)]
pub(crate) mod tests {
    use super::*;
    use crate::data::time::tests::LONDON;

    /// A form filled in as an observer would: a thornback ray on the strandline at
    /// Aberystwyth on 1 June 2025, 62,5 cm total length (comma decimal).
    pub(crate) fn filled() -> FormFields {
        FormFields {
            latitude: "52.4153".into(),
            longitude: " -4.0829 ".into(),
            accuracy_m: "9".into(),
            position_source: Some(PositionSource::Device),
            species_guess: "thornback ray".into(),
            length_value: "62,5".into(),
            condition: Some(Condition::ALL[0]),
            setting: Some(Setting::ALL[0]),
            ..FormFields::fresh("2025-06-01T14:10".into(), "Sam".into())
        }
    }

    fn submission(fields: &FormFields) -> Submission {
        fields.to_submission(Uuid::nil(), &LONDON).expect("a complete form")
    }

    #[test]
    fn a_complete_form_becomes_the_submission_with_the_offset_of_its_date() {
        let sub = submission(&filled());
        assert_eq!(sub.observed_at.to_rfc3339(), "2025-06-01T14:10:00+01:00");
        let position = sub.position.expect("a position");
        assert_eq!((position.latitude.get(), position.longitude.get()), (52.4153, -4.0829));
        assert_eq!(position.accuracy_m.map(|a| a.get()), Some(9.0));
        assert_eq!(position.source, PositionSource::Device);
        let length = sub.length.expect("a length");
        assert_eq!(
            (length.value.centimetres(), length.kind, length.method),
            (62.5, LengthKind::Total, MeasureMethod::Measured)
        );
        assert_eq!(sub.count.get(), 1);
        assert_eq!(sub.sex, Sex::Unknown);
        assert_eq!(sub.species_guess.as_ref().map(Text::as_str), Some("thornback ray"));
        assert_eq!(sub.observer_name.as_ref().map(Text::as_str), Some("Sam"));
        assert_eq!((sub.notes, sub.walk_client_id, sub.life_stage), (None, None, None));
        // In winter the same wall-clock time is kept with the winter offset.
        let winter = submission(&FormFields { when: "2025-12-01T14:10".into(), ..filled() });
        assert_eq!(winter.observed_at.to_rfc3339(), "2025-12-01T14:10:00+00:00");
    }

    #[test]
    fn every_problem_is_listed_at_once() {
        let fields = FormFields {
            when: String::new(),
            latitude: "north".into(),
            count: "two".into(),
            condition: None,
            setting: None,
            ..filled()
        };
        let problems = fields.to_submission(Uuid::nil(), &LONDON).unwrap_err();
        assert_eq!(
            problems,
            [
                "date and time: choose when the animal was seen",
                "latitude: a number in decimal degrees, e.g. 52.4153",
                "count: a whole number",
                "condition: choose how the animal was found",
                "where: choose how it came to be seen",
            ]
        );
    }

    #[test]
    fn values_out_of_range_are_refused_with_the_shared_checks() {
        let far_north = FormFields { latitude: "91".into(), ..filled() };
        let problems = far_north.to_submission(Uuid::nil(), &LONDON).unwrap_err();
        assert_eq!(problems.len(), 1, "{problems:?}");
        assert!(problems[0].contains("90"), "{problems:?}");
        let too_long = FormFields { length_value: "40".into(), length_unit: Some(LengthUnit::M), ..filled() };
        let problems = too_long.to_submission(Uuid::nil(), &LONDON).unwrap_err();
        assert!(problems[0].starts_with("length: "), "{problems:?}");
        let none = FormFields { count: "0".into(), ..filled() };
        assert!(none.to_submission(Uuid::nil(), &LONDON).unwrap_err()[0].starts_with("count: "));
        let bad_accuracy = FormFields { accuracy_m: "-3".into(), ..filled() };
        assert_eq!(
            bad_accuracy.to_submission(Uuid::nil(), &LONDON).unwrap_err(),
            ["accuracy: a positive number of metres"]
        );
    }

    #[test]
    fn an_egg_case_has_a_count_and_no_length() {
        let egg_case = FormFields { life_stage: Some(LifeStage::EggCase), ..filled() };
        let problems = egg_case.to_submission(Uuid::nil(), &LONDON).unwrap_err();
        assert_eq!(problems, [SubmissionProblem::LengthOfEggCase.to_string()]);
        let counted = FormFields { length_value: String::new(), count: "12".into(), ..egg_case };
        assert_eq!(submission(&counted).count.get(), 12);
    }

    #[test]
    fn no_position_and_blank_texts_are_left_out() {
        let fields = FormFields {
            latitude: " ".into(),
            longitude: String::new(),
            species_guess: String::new(),
            observer_name: String::new(),
            length_value: String::new(),
            ..filled()
        };
        let sub = submission(&fields);
        assert_eq!((sub.position, sub.species_guess, sub.observer_name, sub.length), (None, None, None, None));
    }

    #[test]
    fn a_photos_gps_fills_only_an_empty_position_and_goes_with_the_photo() {
        let exif = PhotoExif {
            latitude: Some(52.41531),
            longitude: Some(-4.08291),
            horizontal_error_m: Some(7.4),
            ..PhotoExif::default()
        };
        let mut typed = filled();
        assert!(!typed.fill_from_photo(&exif, "blob:1"), "a position already there stays");
        let mut empty = FormFields { latitude: String::new(), longitude: String::new(), ..filled() };
        assert!(empty.fill_from_photo(&exif, "blob:1"));
        assert_eq!(
            (empty.latitude.as_str(), empty.longitude.as_str(), empty.accuracy_m.as_str()),
            ("52.415310", "-4.082910", "7")
        );
        assert_eq!(empty.position_source, Some(PositionSource::Photo));
        assert!(!empty.clone().forget_photo_position("blob:2"), "another photo's removal leaves it");
        assert!(empty.forget_photo_position("blob:1"));
        assert_eq!((empty.latitude.as_str(), empty.position_source), ("", None));
        assert!(!typed.forget_photo_position("blob:1"), "a device position stays");
        let no_gps = PhotoExif::default();
        assert!(!FormFields::default().fill_from_photo(&no_gps, "blob:3"));
    }

    #[test]
    fn the_device_says_its_time_with_the_offset_and_only_its_own_fix() {
        assert_eq!(
            filled().device_says(&LONDON),
            "this device says: 2025-06-01 14:10 (UTC+01:00) · 52.4153, -4.0829 ±9 m"
        );
        let typed = FormFields { position_source: Some(PositionSource::Typed), ..filled() };
        assert_eq!(typed.device_says(&LONDON), "this device says: 2025-06-01 14:10 (UTC+01:00) · no position");
    }
}
