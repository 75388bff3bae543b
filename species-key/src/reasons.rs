//! Plain-words reasons for a species' place in the ranking: which answers fit or
//! contradict it, what its range and nearby records say, and how the measured size
//! compares with its known maximum (including how the length was converted).

use crate::answers::Context;
use crate::checklist::{Character, Checklist, Taxon};
use crate::key::{Effect, Given, Reason, allowed_states};
use crate::length::{ComparableLength, ConversionMethod, comparable_cm, comparable_length};
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
    let label = &character.states[state].label;
    if !taxon.characters.contains_key(&character.name) {
        return reason(
            Effect::Neutral,
            format!("answered \"{label}\", but the checklist has nothing on this for this species"),
        );
    }
    let allowed = allowed_states(taxon, character);
    if allowed & (1 << state) != 0 {
        reason(Effect::Supports, label.clone())
    } else {
        reason(
            Effect::Against,
            format!("answered \"{label}\", but this species has {}", allowed_labels(character, allowed)),
        )
    }
}

fn allowed_labels(character: &Character, allowed: StateSet) -> String {
    character
        .states
        .iter()
        .enumerate()
        .filter(|(i, _)| allowed & (1 << i) != 0)
        .map(|(_, s)| s.label.as_str())
        .collect::<Vec<_>>()
        .join(" or ")
}

fn area_reason(checklist: &Checklist, taxon: &Taxon, context: &Context) -> Option<Reason> {
    let code = context.area_code.as_deref()?;
    let Some(area) = checklist.areas().iter().find(|a| a.code == code) else {
        return Some(reason(
            Effect::Neutral,
            format!("area code {code} is not in this checklist, so range was not used"),
        ));
    };
    Some(if taxon.presence.iter().any(|c| c == code) {
        reason(Effect::Supports, format!("known from {}", area.name))
    } else {
        reason(Effect::Against, format!("not known from {} in this checklist", area.name))
    })
}

fn nearby_reason(taxon: &Taxon, context: &Context) -> Option<Reason> {
    let counts = context.nearby_confirmed.as_ref()?;
    Some(match counts.get(&taxon.scientific_name).copied().unwrap_or(0) {
        0 => reason(Effect::Neutral, "no confirmed records nearby".to_owned()),
        1 => reason(Effect::Supports, "1 confirmed record nearby".to_owned()),
        n => reason(Effect::Supports, format!("{n} confirmed records nearby")),
    })
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
        return Some(reason(
            Effect::Neutral,
            format!(
                "a {} cannot be compared with this species' maximum {}, so size was not used",
                measurement.kind.words(),
                max.measure.words()
            ),
        ));
    };
    let how_measured = if measurement.estimated { "estimated" } else { "measured" };
    let described = describe_length(how_measured, measurement.kind.words(), measurement.cm, &length);
    Some(if length.cm > max.cm {
        reason(Effect::Against, format!("{described} is over this species' known maximum of {:.0} cm", max.cm))
    } else if length.cm < NEWBORN_SHARE * max.cm {
        reason(
            Effect::Against,
            format!("{described} is smaller than a newborn of this species, which grows to {:.0} cm", max.cm),
        )
    } else {
        reason(Effect::Supports, format!("{described} is within this species' known maximum of {:.0} cm", max.cm))
    })
}

fn describe_length(how_measured: &str, kind: &str, cm: f64, length: &ComparableLength) -> String {
    match &length.method {
        ConversionMethod::AsMeasured => format!("{how_measured} {cm:.0} cm"),
        ConversionMethod::SpeciesEquation { equation, source } => {
            format!("{how_measured} {kind} {cm:.0} cm (about {:.0} cm total length by {equation}; {source})", length.cm)
        }
        ConversionMethod::CommonPractice { equation } => format!(
            "{how_measured} {kind} {cm:.0} cm (about {:.0} cm total length by the generic ratio {equation}, \
             common practice: the checklist has no published equation for this species)",
            length.cm
        ),
    }
}

fn reason(effect: Effect, text: String) -> Reason {
    Reason { effect, text }
}
