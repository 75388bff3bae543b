//! Other reports that may be the same animal, beside the one under review, and the
//! reviewer's decision on each pair: same animal (merge), different animals, or undo
//! a merge.

use leptos::prelude::*;
use shared_types::ReviewDetail;

use crate::data::words::{self, t, t_args};
use crate::data::{api, labels, photos, readable};

/// Other reports that may be the same animal, beside this one: photos, distance, time
/// gap, lengths and the reasons; and the decision — same animal (merge), different
/// animals, or undo a merge.
#[component]
pub fn DuplicatesOf(detail: ReviewDetail, reloads: RwSignal<u32>, problem: RwSignal<String>) -> impl IntoView {
    let reload = move || reloads.update(|n| *n = n.wrapping_add(1));
    if detail.duplicates.is_empty() {
        return view! { <p class="hint">{t("duplicates-none")}</p> }.into_any();
    }
    let this_id = detail.record.submission.client_id.to_string();
    let length_of = |r: &shared_types::RecordView| {
        r.submission
            .length
            .map(|l| {
                let cm = words::number(l.value.centimetres(), 0);
                t_args("duplicates-length", &[("cm", cm.into()), ("kind", labels::length_kind(l.kind).into())])
            })
            .unwrap_or_else(|| t("duplicates-no-length"))
    };
    let here_length = length_of(&detail.record);
    let items = detail.duplicates.into_iter().map(|dup| {
        let other_id = dup.other.submission.client_id.to_string();
        let photos = dup.other.photos.iter().map(|p| view! { <img class="review-photo small" src=photos::served(&p.sha256) alt=t("duplicates-photo") /> }).collect_view();
        let decide = {
            let (this_id, other_id) = (this_id.clone(), other_id.clone());
            move |same: bool| {
                let (this_id, other_id) = (this_id.clone(), other_id.clone());
                leptos::task::spawn_local(async move {
                    match api::decide_pair(&this_id, &other_id, same).await {
                        Ok(()) => reload(),
                        Err(err) => problem.set(err.to_string()),
                    }
                });
            }
        };
        let undo = dup.merge_id.map(|merge| {
            move |_| {
                leptos::task::spawn_local(async move {
                    match api::undo_merge(merge).await {
                        Ok(()) => reload(),
                        Err(err) => problem.set(err.to_string()),
                    }
                });
            }
        });
        let same = decide.clone();
        let apart = decide;
        let undecided = dup.decision.is_none();
        view! {
            <li class="duplicate" data-other=other_id>
                <p><b>{t_args("duplicates-score", &[("score", words::number(dup.score, 2).into())])}</b>{t_args("duplicates-apart", &[
                    ("distance", dup.distance_m.map(|d| t_args("duplicates-metres-apart", &[("metres", words::number(d, 0).into())])).unwrap_or_else(|| t("duplicates-distance-unknown")).into()),
                    ("hours", words::number(dup.gap_hours, 1).into()), ("here", here_length.clone().into()), ("there", length_of(&dup.other).into())])}</p>
                <p>{t_args("duplicates-other", &[
                    ("what", dup.other.submission.species_guess.as_ref().map(|g| g.as_str().to_owned()).unwrap_or_else(|| t("urgent-unnamed")).into()),
                    ("at", readable::minute(&dup.other.submission.observed_at).into()), ("state", labels::review_state(dup.other.review_state).into())])}</p>
                <div class="photos">{photos}</div>
                <ul class="reasons">{dup.reasons.iter().map(|r| view! { <li>{r.clone()}</li> }).collect_view()}</ul>
                {dup.decision.clone().map(|d| view! { <p class="decision">{t_args("duplicates-decided", &[("decision", d.into())])}</p> })}
                {undecided.then(|| view! {
                    <div class="actions">
                        <button type="button" class="same-animal" on:click=move |_| same(true)>{t("duplicates-same")}</button>
                        <button type="button" class="different-animals" on:click=move |_| apart(false)>{t("duplicates-different")}</button>
                    </div>
                })}
                {undo.map(|undo| view! { <button type="button" class="undo-merge small" on:click=undo>{t("duplicates-undo")}</button> })}
            </li>
        }
    }).collect_view();
    view! {
        <h4>{t("duplicates-heading")}</h4>
        <ul class="duplicates">{items}</ul>
    }
    .into_any()
}
