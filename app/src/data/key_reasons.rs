//! The guided key's reasons in the person's language: the key gives each reason as data
//! ([`Said`]) with English words beside it; this words the data again from the
//! catalogues. State labels come already in the person's language (the checklist's
//! translations); area names and equations' sources are the checklist's own.

use species_key::{Converted, LengthKind, Reason, Said, SizeSaid};

use crate::data::words::{self, Arg, t, t_args};

/// The reason as the person reads it.
pub fn reason_words(reason: &Reason) -> String {
    match &reason.said {
        Said::Fits { answer } => answer.clone(),
        Said::NotDescribed { answer } => t_args("key-reason-not-described", &[("answer", answer.as_str().into())]),
        Said::Contradicts { answer, species_has } => {
            let or = format!(" {} ", t("key-reason-or"));
            let has = species_has.join(&or);
            t_args("key-reason-contradicts", &[("answer", answer.as_str().into()), ("has", has.into())])
        }
        Said::UnknownArea { code } => t_args("key-reason-unknown-area", &[("code", code.as_str().into())]),
        Said::KnownFrom { area } => t_args("key-reason-known-from", &[("area", area.as_str().into())]),
        Said::NotKnownFrom { area } => t_args("key-reason-not-known-from", &[("area", area.as_str().into())]),
        Said::ConfirmedNearby { count } => t_args("key-reason-nearby", &[("count", Arg::from(*count))]),
        Said::SizeNotComparable { measured, maximum } => t_args(
            "key-reason-size-not-comparable",
            &[("measured", length_words(*measured).into()), ("maximum", length_words(*maximum).into())],
        ),
        Said::WithinMaximum { size, max_cm } => t_args("key-reason-within", &size_and_maximum(size, *max_cm)),
        Said::OverMaximum { size, max_cm } => t_args("key-reason-over", &size_and_maximum(size, *max_cm)),
        Said::UnderNewborn { size, max_cm } => t_args("key-reason-newborn", &size_and_maximum(size, *max_cm)),
    }
}

/// The placeholders of the size messages: the record's length and the species' maximum.
fn size_and_maximum(size: &SizeSaid, max_cm: f64) -> [(&'static str, Arg); 2] {
    [("size", size_words(size).into()), ("max", words::number(max_cm, 0).into())]
}

/// The record's length as a size reason states it.
fn size_words(size: &SizeSaid) -> String {
    let how = if size.estimated { "estimated" } else { "measured" };
    let cm = words::number(size.cm, 0);
    let Some(Converted { total_cm, equation, source }) = &size.converted else {
        return t_args("key-size", &[("how", how.into()), ("cm", cm.into())]);
    };
    let args = |extra: Option<&String>| {
        let mut args: Vec<(&str, Arg)> = vec![
            ("how", how.into()),
            ("kind", length_words(size.kind).into()),
            ("cm", cm.clone().into()),
            ("total", words::number(*total_cm, 0).into()),
            ("equation", equation.as_str().into()),
        ];
        args.extend(extra.map(|source| ("source", Arg::from(source.as_str()))));
        args
    };
    match source {
        Some(source) => t_args("key-size-by-equation", &args(Some(source))),
        None => t_args("key-size-by-generic-ratio", &args(None)),
    }
}

/// What a length measures, in the person's language.
fn length_words(kind: LengthKind) -> String {
    match kind {
        LengthKind::TotalLength => t("length-total"),
        LengthKind::ForkLength => t("length-fork"),
        LengthKind::PrecaudalLength => t("length-precaudal"),
        LengthKind::DiscWidth => t("length-disc-width"),
        LengthKind::DiscLength => t("length-disc-length"),
    }
}

#[cfg(test)]
mod tests {
    use species_key::{Checklist, Context, Effect, Key, Measurement};

    use super::*;

    fn key() -> Key {
        let checklist =
            Checklist::from_json(include_str!("../../../demo-records/checklist.json")).expect("demo checklist");
        Key::new(&checklist)
    }

    /// Every reason the key gives in English reads the same from the catalogue's English:
    /// the catalogue carries each of the key's sentences, and none is lost on the way.
    #[test]
    fn the_catalogue_words_every_reason_as_the_key_does_in_english() {
        let key = key();
        let mut answers = species_key::Answers::new();
        answers.set("bodyForm", species_key::Answer::State("rayLike".into()));
        answers.set("gillSlits", species_key::Answer::State("five".into()));
        let mut seen = std::collections::BTreeSet::new();
        let contexts = [
            Context { area_code: Some("cardigan-bay".into()), ..Context::default() },
            Context { area_code: Some("nowhere-known".into()), ..Context::default() },
            Context {
                nearby_confirmed: Some([("Raja clavata".to_owned(), 3), ("Raja brachyura".to_owned(), 1)].into()),
                measurement: Some(Measurement { kind: LengthKind::DiscWidth, cm: 60.0, estimated: true }),
                ..Context::default()
            },
            Context {
                measurement: Some(Measurement { kind: LengthKind::ForkLength, cm: 400.0, estimated: false }),
                ..Context::default()
            },
            Context {
                measurement: Some(Measurement { kind: LengthKind::TotalLength, cm: 3.0, estimated: false }),
                ..Context::default()
            },
        ];
        for context in contexts {
            for candidate in key.rank(&answers, &context).expect("a ranking") {
                for reason in &candidate.reasons {
                    assert_eq!(reason_words(reason), reason.text, "{:?}", reason.said);
                    seen.insert(format!("{:?}", reason.said).split([' ', '{']).next().unwrap_or_default().to_owned());
                }
            }
        }
        assert!(seen.len() >= 9, "the contexts above reach most kinds of reason: {seen:?}");
        let against = Reason {
            effect: Effect::Against,
            text: String::new(),
            said: Said::Contradicts { answer: "a".into(), species_has: vec!["b".into(), "c".into()] },
        };
        assert_eq!(reason_words(&against), "answered \"a\", but this species has b or c");
    }
}
