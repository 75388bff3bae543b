//! The shared vocabulary's values (lengths, conditions, settings, review states…) in the
//! person's language. `shared-types` keeps the English labels the server writes into
//! exports; the app shows these instead, one catalogue message per value.

#[cfg(feature = "desk")]
use shared_types::{
    BodyCondition, CarcassFate, Preservation, PriorityReason, PrioritySaid, QueueFlag, ResponseOutcome, ReviewState,
    Role, SampleKind, Sex, StomachFill,
};
use shared_types::{Condition, HumanSign, LengthKind, LifeStage, Setting};

#[cfg(feature = "desk")]
use crate::data::readable;
use crate::data::words::t;
#[cfg(feature = "desk")]
use crate::data::words::{self, t_args};

pub fn length_kind(kind: LengthKind) -> String {
    match kind {
        LengthKind::Total => t("length-total"),
        LengthKind::Fork => t("length-fork"),
        LengthKind::Precaudal => t("length-precaudal"),
        LengthKind::DiscWidth => t("length-disc-width"),
        LengthKind::DiscLength => t("length-disc-length"),
    }
}

pub fn condition(condition: Condition) -> String {
    match condition {
        Condition::Alive => t("condition-alive"),
        Condition::FreshDead => t("condition-fresh-dead"),
        Condition::Decomposed => t("condition-decomposed"),
        Condition::RemainsOnly => t("condition-remains-only"),
    }
}

pub fn setting(setting: Setting) -> String {
    match setting {
        Setting::BeachStranding => t("setting-beach-stranding"),
        Setting::AnglerCatch => t("setting-angler-catch"),
        Setting::LandingSiteOrMarket => t("setting-landing-site"),
        Setting::FloatingAtSea => t("setting-floating"),
        Setting::DiscardedBycatch => t("setting-discarded-bycatch"),
    }
}

pub fn life_stage(stage: LifeStage) -> String {
    match stage {
        LifeStage::EggCase => t("stage-egg-case"),
        LifeStage::Embryo => t("stage-embryo"),
        LifeStage::Juvenile => t("stage-juvenile"),
        LifeStage::Adult => t("stage-adult"),
    }
}

pub fn human_sign(sign: HumanSign) -> String {
    match sign {
        HumanSign::Hook => t("sign-hook"),
        HumanSign::Line => t("sign-line"),
        HumanSign::NetMarks => t("sign-net-marks"),
        HumanSign::FinsRemoved => t("sign-fins-removed"),
        HumanSign::BoatStrike => t("sign-boat-strike"),
    }
}

/// The outcome of a response to a live animal (desk only: the words are in `desk.ftl`).
#[cfg(feature = "desk")]
pub fn response_outcome(outcome: ResponseOutcome) -> String {
    match outcome {
        ResponseOutcome::ReturnedToSea => t("outcome-returned-to-sea"),
        ResponseOutcome::Died => t("outcome-died"),
        ResponseOutcome::EuthanisedByVet => t("outcome-euthanised"),
        ResponseOutcome::NotFound => t("outcome-not-found"),
        ResponseOutcome::CarcassRemoved => t("outcome-carcass-removed"),
    }
}

/// What a sample is (desk only).
#[cfg(feature = "desk")]
pub fn sample_kind(kind: SampleKind) -> String {
    match kind {
        SampleKind::TissueForGenetics => t("sample-kind-tissue"),
        SampleKind::Vertebrae => t("sample-kind-vertebrae"),
        SampleKind::StomachContents => t("sample-kind-stomach-contents"),
        SampleKind::WholeCarcass => t("sample-kind-whole-carcass"),
        SampleKind::Other => t("sample-kind-other"),
    }
}

/// How a sample is kept (desk only).
#[cfg(feature = "desk")]
pub fn preservation(preservation: Preservation) -> String {
    match preservation {
        Preservation::Ethanol => t("preservation-ethanol"),
        Preservation::Frozen => t("preservation-frozen"),
        Preservation::Dried => t("preservation-dried"),
        Preservation::Formalin => t("preservation-formalin"),
        Preservation::Other => t("preservation-other"),
    }
}

/// What became of a carcass (desk only).
#[cfg(feature = "desk")]
pub fn carcass_fate(fate: CarcassFate) -> String {
    match fate {
        CarcassFate::LeftWhereFound => t("fate-left-where-found"),
        CarcassFate::Buried => t("fate-buried"),
        CarcassFate::RemovedForDisposal => t("fate-removed-for-disposal"),
        CarcassFate::TakenForStudy => t("fate-taken-for-study"),
        CarcassFate::WashedAway => t("fate-washed-away"),
        CarcassFate::Unknown => t("fate-unknown"),
    }
}

/// How well fed the animal looked (desk only).
#[cfg(feature = "desk")]
pub fn body_condition(condition: BodyCondition) -> String {
    match condition {
        BodyCondition::Good => t("body-condition-good"),
        BodyCondition::Fair => t("body-condition-fair"),
        BodyCondition::Poor => t("body-condition-poor"),
        BodyCondition::Emaciated => t("body-condition-emaciated"),
    }
}

/// What the stomach held (desk only).
#[cfg(feature = "desk")]
pub fn stomach(fill: StomachFill) -> String {
    match fill {
        StomachFill::Empty => t("stomach-empty"),
        StomachFill::SomeFood => t("stomach-some-food"),
        StomachFill::Full => t("stomach-full"),
        StomachFill::NotExamined => t("stomach-not-examined"),
    }
}

/// Where a record is in review, as the desk names it (desk only).
#[cfg(feature = "desk")]
pub fn review_state(state: ReviewState) -> String {
    match state {
        ReviewState::AwaitingReview => t("state-awaiting-review"),
        ReviewState::DetailsRequested => t("state-details-requested"),
        ReviewState::Confirmed => t("state-confirmed"),
        ReviewState::NotConfirmable => t("state-not-confirmable"),
        ReviewState::Merged => t("state-merged"),
    }
}

/// Why a record is flagged in the review queue (desk only).
#[cfg(feature = "desk")]
pub fn queue_flag(flag: QueueFlag) -> String {
    match flag {
        QueueFlag::Oversize => t("flag-oversize"),
        QueueFlag::OutOfRange => t("flag-out-of-range"),
        QueueFlag::PossibleDuplicate => t("flag-possible-duplicate"),
        QueueFlag::TakenLongBeforeRecord => t("flag-photo-older"),
        QueueFlag::TakenFarFromRecord => t("flag-photo-far"),
    }
}

/// A person's role, as the people screen names it (desk only); a code the app does not
/// know is shown as it is.
#[cfg(feature = "desk")]
pub fn role_code(code: &str) -> String {
    match Role::from_code(code) {
        Some(Role::Observer) => t("role-observer"),
        Some(Role::Reviewer) => t("role-reviewer"),
        Some(Role::Admin) => t("role-admin"),
        Some(Role::Responder) => t("role-responder"),
        None => code.to_owned(),
    }
}

/// Why a record stands where it does in the queue, in the person's language; a flag
/// raised on arrival keeps the server's words for its reason (desk only).
#[cfg(feature = "desk")]
pub fn priority_reason(reason: &PriorityReason) -> String {
    let species_word = |holds: &bool| if *holds { t("priority-holds-species") } else { String::new() };
    match &reason.said {
        PrioritySaid::LiveAnimalNoResponse => t("priority-live-animal"),
        PrioritySaid::Protected { taxon, holds_species } => t_args(
            "priority-protected",
            &[("taxon", taxon.as_str().into()), ("holds", species_word(holds_species).into())],
        ),
        PrioritySaid::Sensitive { taxon, holds_species } => t_args(
            "priority-sensitive",
            &[("taxon", taxon.as_str().into()), ("holds", species_word(holds_species).into())],
        ),
        PrioritySaid::Arrival { .. } => reason.text.clone(),
        PrioritySaid::PossibleDuplicate => t("priority-possible-duplicate"),
        PrioritySaid::PhotoOlder { photo, seconds, limit_hours } => t_args(
            "priority-photo-older",
            &[
                ("photo", (*photo).into()),
                ("gap", seconds.map_or_else(|| t("priority-long"), readable::gap).into()),
                ("limit", (*limit_hours).into()),
            ],
        ),
        PrioritySaid::PhotoFar { photo, metres, limit_km } => t_args(
            "priority-photo-far",
            &[
                ("photo", (*photo).into()),
                ("distance", metres.map_or_else(|| t("priority-far"), readable::distance).into()),
                ("limit", words::number(*limit_km, 0).into()),
            ],
        ),
        PrioritySaid::PhotoCutShort { photo } => t_args("priority-photo-cut-short", &[("photo", (*photo).into())]),
    }
}

/// Who or what an identification rests on, as the server records it (`basis`); a code
/// the app does not know is shown as it is (desk only).
#[cfg(feature = "desk")]
pub fn identification_basis(code: &str) -> String {
    match code {
        "observer guess" => t("basis-observer-guess"),
        "observer with the guided key" => t("basis-observer-key"),
        "reviewer" => t("basis-reviewer"),
        other => other.to_owned(),
    }
}

/// The animal's sex as the desk shows it (desk only; the phone's form has its own words).
#[cfg(feature = "desk")]
pub fn sex(sex: Sex) -> String {
    match sex {
        Sex::Male => t("sex-male"),
        Sex::Female => t("sex-female"),
        Sex::Unknown => t("sex-unknown"),
    }
}

/// A change to a sign-in, as the people screen lists it (desk only): the server's action
/// code and its detail (`added` "as reviewer", `role_changed` "reviewer → admin",
/// `password_reset`, `turned_off`, `turned_on`) in words. An action or a detail the app
/// cannot read is shown as the server sent it.
#[cfg(feature = "desk")]
pub fn person_event(action: &str, detail: Option<&str>) -> String {
    let known = match (action, detail) {
        ("added", Some(detail)) => {
            detail.strip_prefix("as ").map(|role| t_args("people-action-added", &[("role", role_code(role).into())]))
        }
        ("role_changed", Some(detail)) => detail.split_once(" → ").map(|(from, to)| {
            t_args("people-action-role-changed", &[("from", role_code(from).into()), ("to", role_code(to).into())])
        }),
        ("password_reset", _) => Some(t("people-action-password-reset")),
        ("turned_off", None) => Some(t("people-action-turned-off")),
        ("turned_on", None) => Some(t("people-action-turned-on")),
        _ => None,
    };
    known.unwrap_or_else(|| match detail {
        Some(detail) => format!("{action} ({detail})"),
        None => action.to_owned(),
    })
}

#[cfg(test)]
#[cfg(feature = "desk")]
mod tests {
    use super::*;

    #[test]
    fn a_change_to_a_sign_in_reads_as_words_and_an_unknown_one_as_sent() {
        // The codes and details as the server's store writes them (server/src/store/people.rs).
        assert_eq!(person_event("added", Some("as reviewer")), "added as reviewer");
        assert_eq!(person_event("role_changed", Some("reviewer → admin")), "role changed (reviewer → admin)");
        assert_eq!(person_event("password_reset", Some("sessions ended")), "password reset; their sign-ins ended");
        assert_eq!(person_event("turned_off", None), "sign-in turned off");
        assert_eq!(person_event("turned_on", None), "sign-in turned on");
        assert_eq!(person_event("added", Some("as keeper")), "added as keeper", "an unknown role, as it is");
        assert_eq!(person_event("renamed", Some("ann → bea")), "renamed (ann → bea)");
        assert_eq!(person_event("role_changed", Some("odd")), "role_changed (odd)");
    }

    #[test]
    fn each_basis_the_server_writes_reads_as_words_and_an_unknown_one_as_sent() {
        // The codes as the server's store writes them into `identifications.basis`.
        let server = [
            include_str!("../../../server/src/store/observations.rs"),
            include_str!("../../../server/src/store/review.rs"),
        ]
        .concat();
        for (code, words) in [
            ("observer guess", "the observer's guess"),
            ("observer with the guided key", "the observer, with the guided key"),
            ("reviewer", "a reviewer"),
        ] {
            assert!(server.contains(&format!("'{code}')")), "the server writes the basis {code:?}");
            assert_eq!(identification_basis(code), words);
        }
        assert_eq!(identification_basis("imported"), "imported");
    }

    /// The desk's English for each priority reason is the server's English for it
    /// (`PriorityReason::from_said`), so no reason changes its words on the way.
    #[test]
    fn each_priority_reason_reads_in_the_catalogue_as_the_server_says_it() {
        let said = [
            PrioritySaid::LiveAnimalNoResponse,
            PrioritySaid::Protected { taxon: "Squatina squatina".into(), holds_species: false },
            PrioritySaid::Protected { taxon: "Squatinidae".into(), holds_species: true },
            PrioritySaid::Sensitive { taxon: "Squatina squatina".into(), holds_species: false },
            PrioritySaid::Sensitive { taxon: "Rajidae".into(), holds_species: true },
            PrioritySaid::PossibleDuplicate,
            PrioritySaid::PhotoOlder { photo: 1, seconds: Some(30.0 * 3600.0), limit_hours: 24 },
            PrioritySaid::PhotoOlder { photo: 2, seconds: Some(4.0 * 86400.0), limit_hours: 24 },
            PrioritySaid::PhotoOlder { photo: 2, seconds: None, limit_hours: 24 },
            PrioritySaid::PhotoFar { photo: 1, metres: Some(2440.0), limit_km: 1.0 },
            PrioritySaid::PhotoFar { photo: 3, metres: Some(900.0), limit_km: 1.0 },
            PrioritySaid::PhotoFar { photo: 1, metres: None, limit_km: 1.0 },
            PrioritySaid::PhotoCutShort { photo: 2 },
        ];
        for said in said {
            let reason = PriorityReason::from_said(said);
            assert_eq!(priority_reason(&reason), reason.text, "{:?}", reason.said);
        }
        let raised = PriorityReason::arrival(shared_types::FlagKind::Oversize, "the server's own words".into());
        assert_eq!(priority_reason(&raised), "the server's own words");
    }

    #[test]
    fn the_sex_is_said_in_words_even_when_unknown() {
        assert_eq!(sex(Sex::Male), "male");
        assert_eq!(sex(Sex::Female), "female");
        assert_eq!(sex(Sex::Unknown), "not known");
    }
}
