//! The record form's fields as the observer types them (plain text while typed), and
//! the rules that turn them into a checked [`Submission`] — the same checks the server
//! runs, dates included — or into problems, each tied to the control it is about and
//! worded with the form's own labels ([`Control`], [`Problem`]). A server's refusal is
//! put into the same words ([`Problem::from_server`]). Also what a photo's time and GPS
//! do to the record's time and position, the one tap back to the phone's own, and the
//! line that sets the phone's reading beside each photo's.

use chrono::{DateTime, Utc};
use shared_types::{
    AccuracyM, Condition, Count, HumanSign, KeyChoice, Latitude, Length, LengthKind, LengthUnit, LengthValue,
    LifeStage, Longitude, MeasureMethod, PhotoExif, Position, PositionSource, Setting, Sex, Submission,
    SubmissionProblem, Text,
};
use uuid::Uuid;

use crate::data::photos;
use crate::data::time::{self, Zone};
use crate::data::words::{t, t_args};

/// A control on the record form, named as the form labels it.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Control {
    When,
    Latitude,
    Longitude,
    Accuracy,
    Species,
    Length,
    Count,
    LifeStage,
    Condition,
    HowFound,
    Signs,
    Notes,
    Photos,
    Name,
}

impl Control {
    /// The control's code, the same in every language: the `data-control` of the place
    /// its problems are shown, which tests and styles find it by.
    pub fn code(self) -> &'static str {
        match self {
            Self::When => "when",
            Self::Latitude => "latitude",
            Self::Longitude => "longitude",
            Self::Accuracy => "accuracy",
            Self::Species => "species",
            Self::Length => "length",
            Self::Count => "count",
            Self::LifeStage => "life_stage",
            Self::Condition => "condition",
            Self::HowFound => "how_found",
            Self::Signs => "signs",
            Self::Notes => "notes",
            Self::Photos => "photos",
            Self::Name => "name",
        }
    }

    /// The control's name as the form shows it, in the person's language.
    pub fn name(self) -> String {
        match self {
            Self::When => t("form-when"),
            Self::Latitude => t("form-latitude"),
            Self::Longitude => t("form-longitude"),
            Self::Accuracy => t("form-accuracy"),
            Self::Species => t("form-species-short"),
            Self::Length => t("form-length"),
            Self::Count => t("form-count"),
            Self::LifeStage => t("form-life-stage"),
            Self::Condition => t("form-condition"),
            Self::HowFound => t("form-how-found"),
            Self::Signs => t("form-signs-short"),
            Self::Notes => t("form-notes"),
            Self::Photos => t("form-photos"),
            Self::Name => t("form-your-name"),
        }
    }

    /// The control a server's field path (`ErrorBody::field`) is about; `None` for a
    /// path the form has no control for.
    pub fn from_server_field(path: &str) -> Option<Self> {
        let head = path.split(['.', '[']).next().unwrap_or(path);
        Some(match head {
            "observed_at" => Self::When,
            "position" if path.ends_with("longitude") => Self::Longitude,
            "position" if path.ends_with("accuracy_m") => Self::Accuracy,
            "position" => Self::Latitude,
            "species_guess" | "key_choice" => Self::Species,
            "length" => Self::Length,
            "count" => Self::Count,
            "life_stage" => Self::LifeStage,
            "condition" => Self::Condition,
            "setting" => Self::HowFound,
            "human_signs" => Self::Signs,
            "notes" => Self::Notes,
            "observer_name" => Self::Name,
            "photo" | "photos" | "photo_exif" => Self::Photos,
            _ => return None,
        })
    }
}

/// Something to fix before a record can be saved or sent, and where.
#[derive(Debug, Clone, PartialEq)]
pub struct Problem {
    /// The control it is about; `None`: the record as a whole.
    pub control: Option<Control>,
    /// What is wrong, in plain words.
    pub words: String,
}

impl Problem {
    fn at(control: Control, words: impl Into<String>) -> Self {
        Self { control: Some(control), words: words.into() }
    }

    /// "When: this is in the future…": the label, then the words.
    pub fn sentence(&self) -> String {
        match self.control {
            Some(control) => format!("{}: {}", control.name(), self.words),
            None => self.words.clone(),
        }
    }

    /// A server's refusal (its message and the field path it names) in the form's terms.
    pub fn from_server(field: Option<&str>, message: &str) -> Self {
        Self { control: field.and_then(Control::from_server_field), words: message.to_owned() }
    }
}

/// Where the record's time came from.
#[derive(Debug, Clone, Copy, Default, PartialEq, Eq)]
pub enum WhenSource {
    /// This phone's clock when the form opened.
    #[default]
    Device,
    /// A photo's own time (it was taken earlier: the record is written up later).
    Photo { number: usize },
    /// Typed or chosen by the observer.
    Typed,
}

/// A photo time earlier than the record's by at least this is offered as the record's
/// time (a photo taken a minute before saving tells nothing new).
pub const PHOTO_EARLIER_MINUTES: i64 = 2;

/// What the observer has typed so far, as text.
#[derive(Debug, Clone, Default)]
pub struct FormFields {
    pub when: String,
    pub when_source: WhenSource,
    /// This phone's time when the form opened, to go back to from a photo's.
    pub device_when: String,
    pub latitude: String,
    pub longitude: String,
    pub accuracy_m: String,
    pub position_source: Option<PositionSource>,
    /// The preview URL of the photo whose GPS filled the position, while
    /// `position_source` is `Photo`: removing that photo clears the position.
    pub position_photo: Option<String>,
    /// This phone's last fix (latitude, longitude, accuracy), to go back to from a photo's.
    pub device_position: Option<(String, String, String)>,
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

fn optional_text(control: Control, text: &str, problems: &mut Vec<Problem>) -> Option<Text> {
    match Text::parse(text) {
        Ok(t) if t.as_str().is_empty() => None,
        Ok(t) => Some(t),
        Err(_) => {
            problems.push(Problem::at(control, t_args("problem-too-long", &[("max", Text::MAX_CHARS.into())])));
            None
        }
    }
}

/// A whole-record check of the shared rules, tied to its control.
fn submission_problem(problem: &SubmissionProblem) -> Problem {
    match problem {
        SubmissionProblem::InTheFuture(_) => Problem::at(Control::When, t("problem-future")),
        SubmissionProblem::RepeatedSign(_) => Problem::at(Control::Signs, t("problem-sign-twice")),
        SubmissionProblem::UnknownRank(_) | SubmissionProblem::BadProbability(_) => {
            Problem::at(Control::Species, t("problem-key-pick"))
        }
        SubmissionProblem::LengthOfEggCase => Problem::at(Control::Length, t("problem-egg-case-length")),
    }
}

impl FormFields {
    /// A fresh form: `when` (a `datetime-local` value, usually now), one animal,
    /// nothing else assumed.
    pub fn fresh(when: String, observer_name: String) -> Self {
        Self { device_when: when.clone(), when, count: "1".into(), observer_name, ..Self::default() }
    }

    /// The same form filled from a record kept on the phone (to edit one the server did
    /// not accept): the time in this phone's local time, every field as sent.
    pub fn from_submission(sub: &Submission, zone: &impl Zone) -> Self {
        let when = time::input_value_at(zone, &sub.observed_at);
        let position = sub.position;
        let length = sub.length;
        Self {
            device_when: when.clone(),
            when,
            when_source: WhenSource::Typed,
            latitude: position.map(|p| format!("{:.6}", p.latitude.get())).unwrap_or_default(),
            longitude: position.map(|p| format!("{:.6}", p.longitude.get())).unwrap_or_default(),
            accuracy_m: position.and_then(|p| p.accuracy_m).map(|a| format!("{:.0}", a.get())).unwrap_or_default(),
            position_source: position.map(|p| p.source),
            species_guess: sub.species_guess.as_ref().map(|t| t.as_str().to_owned()).unwrap_or_default(),
            length_value: length.map(|l| format!("{}", l.value.value)).unwrap_or_default(),
            length_kind: length.map(|l| l.kind),
            length_unit: length.map(|l| l.value.unit),
            length_method: length.map(|l| l.method),
            sex: Some(sub.sex),
            life_stage: sub.life_stage,
            count: sub.count.get().to_string(),
            condition: Some(sub.condition),
            setting: Some(sub.setting),
            human_signs: sub.human_signs.clone(),
            notes: sub.notes.as_ref().map(|t| t.as_str().to_owned()).unwrap_or_default(),
            observer_name: sub.observer_name.as_ref().map(|t| t.as_str().to_owned()).unwrap_or_default(),
            key_choice: sub.key_choice.clone(),
            ..Self::default()
        }
    }

    /// Checks everything the server checks (with `now` for the time) and builds the
    /// submission, its time kept with the zone's offset on that date, or lists every
    /// problem at once.
    pub fn to_submission(
        &self,
        client_id: Uuid,
        zone: &impl Zone,
        now: DateTime<Utc>,
    ) -> Result<Submission, Vec<Problem>> {
        let mut problems = Vec::new();
        let observed_at = time::parse_input(zone, &self.when);
        if observed_at.is_none() {
            problems.push(Problem::at(Control::When, t("problem-choose-when")));
        }
        let position = self.position(&mut problems);
        let length = self.length(&mut problems);
        let count = self
            .count
            .trim()
            .parse::<u32>()
            .ok()
            .and_then(|n| Count::parse(n).ok())
            .ok_or_else(|| {
                problems.push(Problem::at(Control::Count, t_args("problem-count", &[("max", Count::MAX.into())])))
            })
            .ok();
        let condition = self.condition.or_else(|| {
            problems.push(Problem::at(Control::Condition, t("problem-choose-condition")));
            None
        });
        let setting = self.setting.or_else(|| {
            problems.push(Problem::at(Control::HowFound, t("problem-choose-how-found")));
            None
        });
        let species_guess = optional_text(Control::Species, &self.species_guess, &mut problems);
        let notes = optional_text(Control::Notes, &self.notes, &mut problems);
        let observer_name = optional_text(Control::Name, &self.observer_name, &mut problems);
        let (Some(observed_at), Some(count), Some(condition), Some(setting)) = (observed_at, count, condition, setting)
        else {
            return Err(problems);
        };
        let submission = Submission {
            client_id,
            observed_at,
            position,
            species_guess,
            length,
            sex: self.sex.unwrap_or(Sex::Unknown),
            count,
            condition,
            setting,
            human_signs: self.human_signs.clone(),
            notes,
            observer_name,
            key_choice: self.key_choice.clone(),
            walk_client_id: None,
            photo_exif: Vec::new(),
            life_stage: self.life_stage,
        };
        if let Err(problem) = submission.check(now) {
            problems.push(submission_problem(&problem));
        }
        if problems.is_empty() { Ok(submission) } else { Err(problems) }
    }

    fn position(&self, problems: &mut Vec<Problem>) -> Option<Position> {
        if self.latitude.trim().is_empty() && self.longitude.trim().is_empty() {
            return None;
        }
        let number = |control: Control, text: &str, problems: &mut Vec<Problem>| match text
            .trim()
            .replace(',', ".")
            .parse::<f64>()
        {
            Ok(n) => Some(n),
            Err(_) => {
                problems.push(Problem::at(control, t("problem-degrees")));
                None
            }
        };
        let latitude = number(Control::Latitude, &self.latitude, problems).and_then(|n| {
            Latitude::parse(n).map_err(|_| problems.push(Problem::at(Control::Latitude, t("problem-latitude")))).ok()
        });
        let longitude = number(Control::Longitude, &self.longitude, problems).and_then(|n| {
            Longitude::parse(n).map_err(|_| problems.push(Problem::at(Control::Longitude, t("problem-longitude")))).ok()
        });
        let accuracy_m = match self.accuracy_m.trim() {
            "" => None,
            text => text.parse::<f64>().ok().and_then(|n| AccuracyM::parse(n).ok()).or_else(|| {
                problems.push(Problem::at(Control::Accuracy, t("problem-accuracy")));
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

    fn length(&self, problems: &mut Vec<Problem>) -> Option<Length> {
        let text = self.length_value.trim().replace(',', ".");
        if text.is_empty() {
            return None;
        }
        let unit = self.length_unit.unwrap_or(LengthUnit::Cm);
        let value = match text
            .parse::<f64>()
            .map_err(|_| t("problem-a-number"))
            .and_then(|v| LengthValue::parse(v, unit).map_err(|e| e.to_string()))
        {
            Ok(value) => value,
            Err(err) => {
                problems.push(Problem::at(Control::Length, err));
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
        if !(self.latitude.trim().is_empty() && self.longitude.trim().is_empty()) {
            return false;
        }
        self.place_from_photo(exif, preview_url)
    }

    fn place_from_photo(&mut self, exif: &PhotoExif, preview_url: &str) -> bool {
        let (Some(lat), Some(lon)) = (exif.latitude, exif.longitude) else { return false };
        self.latitude = format!("{lat:.6}");
        self.longitude = format!("{lon:.6}");
        self.accuracy_m = exif.horizontal_error_m.filter(|e| *e >= 1.0).map(|e| format!("{e:.0}")).unwrap_or_default();
        self.position_source = Some(PositionSource::Photo);
        self.position_photo = Some(preview_url.to_owned());
        true
    }

    /// What a newly added photo (number `number` on the form) does to the record: when
    /// its own time is earlier than the record's (the record is written up later) or the
    /// record has none, the photo's time becomes the record's, and its GPS the record's
    /// place; a time or place the observer typed stays. Otherwise its GPS only fills an
    /// empty position. True when the record changed.
    pub fn offer_photo(&mut self, exif: &PhotoExif, number: usize, preview_url: &str, zone: &impl Zone) -> bool {
        let Some(taken) = exif.taken_at.filter(|_| self.when_source != WhenSource::Typed) else {
            return self.fill_from_photo(exif, preview_url);
        };
        let earlier = time::parse_input(zone, &self.when)
            .is_none_or(|current| current - taken >= chrono::Duration::minutes(PHOTO_EARLIER_MINUTES));
        if !earlier {
            return self.fill_from_photo(exif, preview_url);
        }
        self.when = time::input_value_at(zone, &taken);
        self.when_source = WhenSource::Photo { number };
        if self.position_source != Some(PositionSource::Typed) {
            self.place_from_photo(exif, preview_url);
        }
        true
    }

    /// The one tap back from a photo's time and place to this phone's own.
    pub fn keep_device_time_and_place(&mut self) {
        self.when = self.device_when.clone();
        self.when_source = WhenSource::Device;
        if self.position_source == Some(PositionSource::Photo)
            && let Some((lat, lon, accuracy)) = self.device_position.clone()
        {
            (self.latitude, self.longitude, self.accuracy_m) = (lat, lon, accuracy);
            self.position_source = Some(PositionSource::Device);
            self.position_photo = None;
        }
    }

    /// The note under the time while it is a photo's: which photo, when it was taken and
    /// how long before this phone's time.
    pub fn time_note(&self, zone: &impl Zone) -> Option<String> {
        let WhenSource::Photo { number } = self.when_source else { return None };
        let (taken, now) = (time::parse_input(zone, &self.when)?, time::parse_input(zone, &self.device_when)?);
        let args = [
            ("number", number.into()),
            ("taken", self.when.replace('T', " ").into()),
            ("before", time::span_words(now - taken).into()),
        ];
        Some(if self.position_source == Some(PositionSource::Photo) {
            t_args("form-photo-time-and-place", &args)
        } else {
            t_args("form-photo-time", &args)
        })
    }

    /// A fix from this phone's location service arrived on its own (at the form's
    /// opening, or at saving on a walk): remembered, and used unless the position is a
    /// photo's or typed.
    pub fn note_device_fix(&mut self, latitude: f64, longitude: f64, accuracy_m: f64) -> bool {
        let fix = (format!("{latitude:.6}"), format!("{longitude:.6}"), format!("{:.0}", accuracy_m.max(1.0)));
        self.device_position = Some(fix);
        let free = matches!(self.position_source, None | Some(PositionSource::Device));
        if free {
            self.set_device_position(latitude, longitude, accuracy_m);
        }
        free
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

    /// Sets this phone's own fix as the position (the observer asked for it).
    pub fn set_device_position(&mut self, latitude: f64, longitude: f64, accuracy_m: f64) {
        self.latitude = format!("{latitude:.6}");
        self.longitude = format!("{longitude:.6}");
        self.accuracy_m = format!("{:.0}", accuracy_m.max(1.0));
        self.position_source = Some(PositionSource::Device);
        self.position_photo = None;
        self.device_position = Some((self.latitude.clone(), self.longitude.clone(), self.accuracy_m.clone()));
    }

    /// "this phone says: 2025-06-01 14:10 (UTC+01:00) · 52.415300, -4.082900 within 9 m":
    /// this phone's own time and fix, to set beside what each photo says.
    pub fn device_says(&self, zone: &impl Zone) -> String {
        let place = match &self.device_position {
            Some((lat, lon, accuracy)) => photos::place_words(lat, lon, Some(accuracy.clone())),
            None => t("photo-no-position"),
        };
        let args = [
            ("time", self.device_when.replace('T', " ").into()),
            ("offset", time::offset_label(zone, &self.device_when).into()),
            ("place", place.into()),
        ];
        t_args("form-device-says", &args)
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

    /// The server's clock when these forms are saved: the evening of 1 June 2025.
    pub(crate) fn saved_at() -> DateTime<Utc> {
        DateTime::parse_from_rfc3339("2025-06-01T20:00:00Z").unwrap().with_timezone(&Utc)
    }

    fn submission(fields: &FormFields) -> Submission {
        fields.to_submission(Uuid::nil(), &LONDON, saved_at()).expect("a complete form")
    }

    fn problems(fields: &FormFields) -> Vec<String> {
        fields.to_submission(Uuid::nil(), &LONDON, saved_at()).unwrap_err().iter().map(Problem::sentence).collect()
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
        let winter = submission(&FormFields { when: "2024-12-01T14:10".into(), ..filled() });
        assert_eq!(winter.observed_at.to_rfc3339(), "2024-12-01T14:10:00+00:00");
    }

    #[test]
    fn every_problem_is_listed_at_once_with_the_forms_own_labels() {
        let fields = FormFields {
            when: String::new(),
            latitude: "north".into(),
            count: "two".into(),
            condition: None,
            setting: None,
            ..filled()
        };
        assert_eq!(
            problems(&fields),
            [
                "When: choose the date and time the animal was seen",
                "Latitude: a number in decimal degrees, e.g. 52.4153",
                "How many: a whole number from 1 to 10000",
                "Condition: choose the state the animal was in",
                "How it was found: choose how it came to be found",
            ]
        );
        let controls: Vec<_> =
            fields.to_submission(Uuid::nil(), &LONDON, saved_at()).unwrap_err().iter().map(|p| p.control).collect();
        assert_eq!(controls[0], Some(Control::When), "each problem names the control to show it beside");
    }

    #[test]
    fn a_time_in_the_future_is_refused_on_the_phone_as_the_server_would() {
        // The server refuses a time more than CLOCK_TOLERANCE_MINUTES ahead of its clock
        // (shared_types::Submission::check); the form runs the same check first.
        let tomorrow = FormFields { when: "2025-06-02T09:00".into(), ..filled() };
        assert_eq!(problems(&tomorrow), ["When: this is in the future: give the time the animal was seen"]);
        let in_tolerance = FormFields { when: "2025-06-01T21:05".into(), ..filled() };
        assert!(in_tolerance.to_submission(Uuid::nil(), &LONDON, saved_at()).is_ok(), "a clock a few minutes fast");
    }

    #[test]
    fn values_out_of_range_are_refused_with_the_shared_checks() {
        assert_eq!(problems(&FormFields { latitude: "91".into(), ..filled() }), ["Latitude: between -90 and 90"]);
        let too_long = FormFields { length_value: "40".into(), length_unit: Some(LengthUnit::M), ..filled() };
        assert!(problems(&too_long)[0].starts_with("Length: "));
        assert_eq!(
            problems(&FormFields { count: "0".into(), ..filled() }),
            ["How many: a whole number from 1 to 10000"]
        );
        assert_eq!(
            problems(&FormFields { accuracy_m: "-3".into(), ..filled() }),
            ["Accuracy (metres): a number of metres above 0"]
        );
    }

    #[test]
    fn an_egg_case_has_a_count_and_no_length() {
        let egg_case = FormFields { life_stage: Some(LifeStage::EggCase), ..filled() };
        assert_eq!(
            problems(&egg_case),
            ["Length: an egg case has no body length: leave it empty and write the case's size in the notes"]
        );
        let counted = FormFields { length_value: String::new(), count: "12".into(), ..egg_case };
        assert_eq!(submission(&counted).count.get(), 12);
    }

    #[test]
    fn a_servers_refusal_is_put_beside_the_control_it_names() {
        let cases = [
            (Some("observed_at"), Some(Control::When)),
            (Some("position.latitude"), Some(Control::Latitude)),
            (Some("position.longitude"), Some(Control::Longitude)),
            (Some("position.accuracy_m"), Some(Control::Accuracy)),
            (Some("length.value"), Some(Control::Length)),
            (Some("key_choice.taxon_rank"), Some(Control::Species)),
            (Some("setting"), Some(Control::HowFound)),
            (Some("photo_exif[0].latitude"), Some(Control::Photos)),
            (Some("client_id"), None),
            (None, None),
        ];
        for (field, control) in cases {
            assert_eq!(Problem::from_server(field, "x").control, control, "{field:?}");
        }
        let future = Problem::from_server(Some("observed_at"), "the time 2030-01-01 is in the future");
        assert_eq!(future.sentence(), "When: the time 2030-01-01 is in the future", "no field codes in the words");
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
    fn a_record_kept_on_the_phone_fills_the_form_again_as_it_was() {
        let sub = submission(&FormFields { notes: "tail missing".into(), ..filled() });
        let again = FormFields::from_submission(&sub, &LONDON);
        assert_eq!(again.when, "2025-06-01T14:10");
        assert_eq!(again.when_source, WhenSource::Typed, "an edit keeps the record's time");
        assert_eq!(again.to_submission(Uuid::nil(), &LONDON, saved_at()), Ok(sub));
    }

    fn photo(taken: &str, lat: Option<f64>) -> PhotoExif {
        PhotoExif {
            taken_at: Some(DateTime::parse_from_rfc3339(taken).unwrap()),
            latitude: lat,
            longitude: lat.map(|_| -4.0769),
            horizontal_error_m: lat.map(|_| 6.0),
            ..PhotoExif::default()
        }
    }

    #[test]
    fn an_earlier_photo_gives_the_record_its_time_and_place_and_one_tap_takes_them_back() {
        // Written up at 14:10 on the phone; the photo was taken at 09:30 on the beach.
        let mut form = filled();
        form.note_device_fix(52.4153, -4.0829, 9.0);
        assert!(form.offer_photo(&photo("2025-06-01T09:30:00+01:00", Some(52.43009)), 1, "blob:1", &LONDON));
        assert_eq!((form.when.as_str(), form.when_source), ("2025-06-01T09:30", WhenSource::Photo { number: 1 }));
        assert_eq!((form.latitude.as_str(), form.position_source), ("52.430090", Some(PositionSource::Photo)));
        assert_eq!(
            form.time_note(&LONDON).as_deref(),
            Some(
                "Time and place taken from photo 1: it was taken 2025-06-01 09:30, 4 h 40 min before this phone's time. \
                 Keep it if that is when you saw the animal."
            )
        );
        assert_eq!(submission(&form).observed_at.to_rfc3339(), "2025-06-01T09:30:00+01:00");
        // A fix arriving later does not overwrite the photo's place.
        assert!(!form.note_device_fix(52.4160, -4.0830, 5.0));
        form.keep_device_time_and_place();
        assert_eq!((form.when.as_str(), form.when_source), ("2025-06-01T14:10", WhenSource::Device));
        assert_eq!(
            (form.latitude.as_str(), form.accuracy_m.as_str(), form.position_source),
            ("52.416000", "5", Some(PositionSource::Device))
        );
        assert_eq!(form.time_note(&LONDON), None);
    }

    #[test]
    fn a_photo_taken_just_now_or_later_or_a_typed_time_leaves_the_record_as_it_is() {
        let mut form = filled();
        assert!(!form.offer_photo(&photo("2025-06-01T14:09:00+01:00", None), 1, "blob:1", &LONDON), "a minute ago");
        assert_eq!(form.when, "2025-06-01T14:10");
        let mut typed = FormFields { when_source: WhenSource::Typed, ..filled() };
        typed.offer_photo(&photo("2025-06-01T09:30:00+01:00", None), 1, "blob:1", &LONDON);
        assert_eq!(typed.when, "2025-06-01T14:10", "a time the observer chose stays");
        // No time on the form at all: the photo's is taken.
        let mut blank = FormFields { when: String::new(), ..filled() };
        assert!(blank.offer_photo(&photo("2025-06-01T14:20:00+01:00", None), 2, "blob:2", &LONDON));
        assert_eq!(blank.when, "2025-06-01T14:20");
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
    fn the_phone_says_its_own_time_and_fix() {
        let mut form = filled();
        assert_eq!(form.device_says(&LONDON), "this phone says: 2025-06-01 14:10 (UTC+01:00) · no position");
        form.note_device_fix(52.4153, -4.0829, 9.0);
        assert_eq!(
            form.device_says(&LONDON),
            "this phone says: 2025-06-01 14:10 (UTC+01:00) · 52.415300, -4.082900 within 9 m"
        );
    }
}
