//! Plain-words reasons for a species' place in the ranking: which answers fit or
//! contradict it, what its range and nearby records say, and how the measured size
//! compares with its known maximum (including how the length was converted). Each is
//! kept as data ([`Said`]) and worded in English from it; a screen in another language
//! words the same data itself.

use crate::answers::Context;
use crate::checklist::{Character, Checklist, Taxon};
use crate::key::{Effect, Given, Reason, allowed_states};
use serde::Serialize;

use crate::length::{ComparableLength, ConversionMethod, LengthKind, comparable_cm, comparable_length};
use crate::likelihood::{NEWBORN_SHARE, StateSet, size_likelihood};

/// All reasons for one species, answers first, then area, nearby records and size.
pub(crate) fn for_species(checklist: &Checklist, species: usize, given: &[Given], context: &Context) -> Vec<Reason> {
    let taxon = &checklist.taxa()[species];
    let mut reasons: Vec<Reason> = checklist
        .characters()
        .iter()
        .zip(given)
        .filter_map(|(character, answer)| match answer {
            Given::State(state) => Some(answer_reason(taxon, character, *state)),
            Given::Unanswered | Given::NotSure => None,
        })
        .collect();
    reasons.extend(area_reason(checklist, taxon, context));
    reasons.extend(nearby_reason(taxon, context));
    reasons.extend(size_reason(taxon, context));
    reasons
}

fn answer_reason(taxon: &Taxon, character: &Character, state: usize) -> Reason {
    let answer = character.states[state].label.clone();
    if !taxon.characters.contains_key(&character.name) {
        return reason(Effect::Neutral, Said::NotDescribed { answer });
    }
    let allowed = allowed_states(taxon, character);
    if allowed & (1 << state) != 0 {
        reason(Effect::Supports, Said::Fits { answer })
    } else {
        reason(Effect::Against, Said::Contradicts { answer, species_has: allowed_labels(character, allowed) })
    }
}

fn allowed_labels(character: &Character, allowed: StateSet) -> Vec<String> {
    character.states.iter().enumerate().filter(|(i, _)| allowed & (1 << i) != 0).map(|(_, s)| s.label.clone()).collect()
}

fn area_reason(checklist: &Checklist, taxon: &Taxon, context: &Context) -> Option<Reason> {
    let code = context.area_code.as_deref()?;
    let Some(area) = checklist.areas().iter().find(|a| a.code == code) else {
        return Some(reason(Effect::Neutral, Said::UnknownArea { code: code.to_owned() }));
    };
    let area_name = area.name.clone();
    Some(if taxon.presence.iter().any(|c| c == code) {
        reason(Effect::Supports, Said::KnownFrom { area: area_name })
    } else {
        reason(Effect::Against, Said::NotKnownFrom { area: area_name })
    })
}

fn nearby_reason(taxon: &Taxon, context: &Context) -> Option<Reason> {
    let counts = context.nearby_confirmed.as_ref()?;
    let count = counts.get(&taxon.scientific_name).copied().unwrap_or(0);
    let effect = if count == 0 { Effect::Neutral } else { Effect::Supports };
    Some(reason(effect, Said::ConfirmedNearby { count }))
}

/// The weight the record's measurement gives a species: 1 when there is none or it
/// cannot be compared with the species' maximum.
pub(crate) fn size_weight(taxon: &Taxon, context: &Context) -> f64 {
    context.measurement.as_ref().map_or(1.0, |measurement| {
        comparable_cm(measurement, taxon)
            .map_or(1.0, |cm| size_likelihood(cm / taxon.max_length.cm, measurement.estimated))
    })
}

fn size_reason(taxon: &Taxon, context: &Context) -> Option<Reason> {
    let measurement = context.measurement.as_ref()?;
    let max = &taxon.max_length;
    let Some(length) = comparable_length(measurement, taxon) else {
        let said = Said::SizeNotComparable { measured: measurement.kind, maximum: max.measure };
        return Some(reason(Effect::Neutral, said));
    };
    let size = SizeSaid {
        estimated: measurement.estimated,
        kind: measurement.kind,
        cm: measurement.cm,
        converted: converted(&length),
    };
    let max_cm = max.cm;
    Some(if length.cm > max.cm {
        reason(Effect::Against, Said::OverMaximum { size, max_cm })
    } else if length.cm < NEWBORN_SHARE * max.cm {
        reason(Effect::Against, Said::UnderNewborn { size, max_cm })
    } else {
        reason(Effect::Supports, Said::WithinMaximum { size, max_cm })
    })
}

fn converted(length: &ComparableLength) -> Option<Converted> {
    match &length.method {
        ConversionMethod::AsMeasured => None,
        ConversionMethod::SpeciesEquation { equation, source } => {
            Some(Converted { total_cm: length.cm, equation: equation.clone(), source: Some(source.clone()) })
        }
        ConversionMethod::CommonPractice { equation } => {
            Some(Converted { total_cm: length.cm, equation: equation.clone(), source: None })
        }
    }
}

fn reason(effect: Effect, said: Said) -> Reason {
    Reason { effect, text: said.english(), said }
}

/// What a reason says, as data.
#[derive(Debug, Clone, PartialEq, Serialize)]
#[serde(tag = "kind", rename_all = "camelCase")]
pub enum Said {
    /// The answer (a state's label) fits the species.
    Fits { answer: String },
    /// The checklist has nothing on this character for the species.
    NotDescribed { answer: String },
    /// The answer does not fit: the species has one of `species_has` (states' labels).
    Contradicts { answer: String, species_has: Vec<String> },
    /// The record's area code is not in the checklist, so range was not used.
    UnknownArea { code: String },
    /// The species is known from the record's area (its name in the checklist).
    KnownFrom { area: String },
    /// The species is not known from the record's area.
    NotKnownFrom { area: String },
    /// Confirmed records of the species near the record.
    ConfirmedNearby { count: u32 },
    /// The length measured cannot be compared with the species' maximum.
    SizeNotComparable { measured: LengthKind, maximum: LengthKind },
    /// The length is within the species' known maximum (`max_cm`).
    WithinMaximum { size: SizeSaid, max_cm: f64 },
    /// The length is over the species' known maximum.
    OverMaximum { size: SizeSaid, max_cm: f64 },
    /// The length is smaller than a newborn of the species.
    UnderNewborn { size: SizeSaid, max_cm: f64 },
}

/// The record's length as a size reason states it.
#[derive(Debug, Clone, PartialEq, Serialize)]
#[serde(rename_all = "camelCase")]
pub struct SizeSaid {
    pub estimated: bool,
    pub kind: LengthKind,
    pub cm: f64,
    /// How it was brought to total length, when it was not one.
    pub converted: Option<Converted>,
}

/// A length brought to total length: by the species' published equation (with its
/// source), or by the generic ratio (no source: common practice).
#[derive(Debug, Clone, PartialEq, Serialize)]
#[serde(rename_all = "camelCase")]
pub struct Converted {
    pub total_cm: f64,
    pub equation: String,
    pub source: Option<String>,
}

impl Said {
    /// The reason in English.
    pub fn english(&self) -> String {
        match self {
            Said::Fits { answer } => answer.clone(),
            Said::NotDescribed { answer } => {
                format!("answered \"{answer}\", but the checklist has nothing on this for this species")
            }
            Said::Contradicts { answer, species_has } => {
                format!("answered \"{answer}\", but this species has {}", species_has.join(" or "))
            }
            Said::UnknownArea { code } => format!("area code {code} is not in this checklist, so range was not used"),
            Said::KnownFrom { area } => format!("known from {area}"),
            Said::NotKnownFrom { area } => format!("not known from {area} in this checklist"),
            Said::ConfirmedNearby { count: 0 } => "no confirmed records nearby".to_owned(),
            Said::ConfirmedNearby { count: 1 } => "1 confirmed record nearby".to_owned(),
            Said::ConfirmedNearby { count } => format!("{count} confirmed records nearby"),
            Said::SizeNotComparable { measured, maximum } => format!(
                "a {} cannot be compared with this species' maximum {}, so size was not used",
                measured.words(),
                maximum.words()
            ),
            Said::WithinMaximum { size, max_cm } => {
                format!("{} is within this species' known maximum of {max_cm:.0} cm", size.english())
            }
            Said::OverMaximum { size, max_cm } => {
                format!("{} is over this species' known maximum of {max_cm:.0} cm", size.english())
            }
            Said::UnderNewborn { size, max_cm } => {
                format!("{} is smaller than a newborn of this species, which grows to {max_cm:.0} cm", size.english())
            }
        }
    }
}

impl SizeSaid {
    /// The length in English, e.g. "measured fork length 80 cm (about 89 cm total length by …)".
    pub fn english(&self) -> String {
        let how = if self.estimated { "estimated" } else { "measured" };
        let (kind, cm) = (self.kind.words(), self.cm);
        match &self.converted {
            None => format!("{how} {cm:.0} cm"),
            Some(Converted { total_cm, equation, source: Some(source) }) => {
                format!("{how} {kind} {cm:.0} cm (about {total_cm:.0} cm total length by {equation}; {source})")
            }
            Some(Converted { total_cm, equation, source: None }) => format!(
                "{how} {kind} {cm:.0} cm (about {total_cm:.0} cm total length by the generic ratio {equation}, \
                 common practice: the checklist has no published equation for this species)"
            ),
        }
    }
}
