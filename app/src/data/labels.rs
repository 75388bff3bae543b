//! The shared vocabulary's values (lengths, conditions, settings, review states…) in the
//! person's language. `shared-types` keeps the English labels the server writes into
//! exports; the app shows these instead, one catalogue message per value.

#[cfg(feature = "desk")]
use shared_types::ResponseOutcome;
use shared_types::{Condition, HumanSign, LengthKind, LifeStage, Setting};

use crate::data::words::t;

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
