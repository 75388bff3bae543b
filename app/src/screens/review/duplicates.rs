//! Other reports that may be the same animal, beside the one under review, and the
//! reviewer's decision on each pair: same animal (merge), different animals, or undo
//! a merge.

use leptos::prelude::*;
use shared_types::ReviewDetail;

use crate::data::api;

/// Other reports that may be the same animal, beside this one: photos, distance, time
/// gap, lengths and the reasons; and the decision — same animal (merge), different
/// animals, or undo a merge.
#[component]
pub fn DuplicatesOf(detail: ReviewDetail, reloads: RwSignal<u32>, problem: RwSignal<String>) -> impl IntoView {
    let reload = move || reloads.update(|n| *n = n.wrapping_add(1));
    if detail.duplicates.is_empty() {
        return view! { <p class="hint">"No other report looks like the same animal."</p> }.into_any();
    }
    let this_id = detail.record.submission.client_id.to_string();
    let length_of = |r: &shared_types::RecordView| {
        r.submission
            .length
            .map(|l| format!("{:.0} cm {}", l.value.centimetres(), l.kind.label()))
            .unwrap_or_else(|| "no length".into())
    };
    let here_length = length_of(&detail.record);
    let items = detail.duplicates.into_iter().map(|dup| {
        let other_id = dup.other.submission.client_id.to_string();
        let photos = dup.other.photos.iter().map(|p| view! { <img class="review-photo small" src=format!("/photos/{}", p.sha256) alt="photo of the other report" /> }).collect_view();
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
                <p><b>{format!("match score {:.2} of 1", dup.score)}</b>{format!(" · {} · {:.1} h apart · {} here, {} there",
                    dup.distance_m.map(|d| format!("{d:.0} m apart")).unwrap_or_else(|| "distance unknown".into()), dup.gap_hours, here_length, length_of(&dup.other))}</p>
                <p>{format!("{} on {} · {}", dup.other.submission.species_guess.as_ref().map(|g| g.as_str().to_owned()).unwrap_or_else(|| "unnamed".into()),
                    dup.other.submission.observed_at.format("%Y-%m-%d %H:%M"), dup.other.review_state.label())}</p>
                <div class="photos">{photos}</div>
                <ul class="reasons">{dup.reasons.iter().map(|r| view! { <li>{r.clone()}</li> }).collect_view()}</ul>
                {dup.decision.clone().map(|d| view! { <p class="decision">{format!("Decided: {d}")}</p> })}
                {undecided.then(|| view! {
                    <div class="actions">
                        <button type="button" class="same-animal" on:click=move |_| same(true)>"Same animal"</button>
                        <button type="button" class="different-animals" on:click=move |_| apart(false)>"Different animals"</button>
                    </div>
                })}
                {undo.map(|undo| view! { <button type="button" class="undo-merge small" on:click=undo>"Undo the merge"</button> })}
            </li>
        }
    }).collect_view();
    view! {
        <h4>"Possibly the same animal"</h4>
        <ul class="duplicates">{items}</ul>
    }
    .into_any()
}
