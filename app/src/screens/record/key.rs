//! The guided species key's panel under the species field: one question at a time
//! (the one the engine expects to tell most), pictures of each answer, "not sure"
//! always allowed, the candidates updating as the observer answers, and one tap to pick
//! a species — or to stop at any genus, family or order of the leading candidates, each
//! shown with its common name and summed probability, the suggested one marked in words.
//! The first question is the body shape (shark, ray or skate, chimaera…). It runs on the phone with no
//! network (the checklist and confirmed records nearby are cached by
//! `data::checklist` and `data::nearby`). Answers the current checklist does not know
//! (it changed under the observer) are set aside with a note rather than stopping the key.

use std::sync::Arc;

use leptos::prelude::*;
use species_key::{Answer, Answers, Key, TaxonRank};

use crate::data::form_fields::FormFields;
use crate::data::key::{
    SHOWN_CANDIDATES, context_for, display_name, group_label, higher_taxa, key_choice, next_question, position_of,
    rank_code, set_aside_text, suggested_stop,
};
use crate::data::key_reasons::reason_words;
use crate::data::words::{t, t_args};
use crate::data::{checklist, nearby};
use crate::screens::record::pictures::picture;

/// Keeps `counts` to the confirmed records near the record's area: the cached answer at
/// once, then the server's when it comes.
fn follow_nearby(fields: RwSignal<FormFields>, counts: RwSignal<Option<nearby::Counts>>) {
    let asked = StoredValue::new(None::<(String, String)>);
    Effect::new(move |_| {
        let area = fields.with(position_of).and_then(|(lat, lon)| nearby::area_of(lat, lon));
        if area == asked.get_value() {
            return;
        }
        asked.set_value(area.clone());
        counts.set(area.as_ref().and_then(nearby::cached));
        if let Some(area) = area {
            nearby::refresh(area, counts);
        }
    });
}

/// The key, shown under the species field.
#[component]
pub fn KeyPanel(key: RwSignal<Arc<Key>>, fields: RwSignal<FormFields>, open: RwSignal<bool>) -> impl IntoView {
    checklist::refresh_from_server(key);
    let answers = RwSignal::new(Answers::new());
    let nearby_counts = RwSignal::new(None::<nearby::Counts>);
    follow_nearby(fields, nearby_counts);
    let context = Memo::new(move |_| key.with(|k| fields.with(|f| context_for(k, f, nearby_counts.get()))));
    // Answers the current checklist knows, and those set aside.
    let usable = Memo::new(move |_| key.with(|k| answers.with(|a| k.usable_answers(a))));
    let ranking = Memo::new(move |_| key.with(|k| usable.with(|(a, _)| k.rank(a, &context.get()).unwrap_or_default())));
    let question = Memo::new(move |_| key.with(|k| usable.with(|(a, _)| next_question(k, a, &context.get()))));

    let answer = move |character: String, given: Answer| answers.update(|a| a.set(&character, given));
    let pick = move |scientific_name: String, rank: TaxonRank, label: String, probability: f64| {
        let choice = usable.with_untracked(|(a, _)| key_choice(&scientific_name, rank, probability, a));
        fields.update(|f| {
            f.species_guess = label;
            f.key_choice = choice;
        });
        open.set(false);
    };

    let question_view = move || match question.get() {
        Some(q) => {
            let character = q.character.clone();
            let states = q
                .states
                .clone()
                .into_iter()
                .map(|state| {
                    let character = character.clone();
                    let svg = picture(&character, &state.name).unwrap_or_default();
                    let name = state.name.clone();
                    view! {
                        <button type="button" class="state-choice" data-state=state.name.clone()
                            on:click=move |_| answer(character.clone(), Answer::State(name.clone()))>
                            <span class="pic" inner_html=svg></span>
                            <span>{state.label.clone()}</span>
                        </button>
                    }
                })
                .collect_view();
            let unsure = q.character.clone();
            view! {
                <div class="key-question" data-character=q.character.clone()>
                    <p class="question">{q.question.clone()}</p>
                    <div class="state-choices">
                        {states}
                        <button type="button" class="state-choice not-sure" on:click=move |_| answer(unsure.clone(), Answer::NotSure)>
                            <span>{t("key-not-sure-skip")}</span>
                        </button>
                    </div>
                </div>
            }.into_any()
        }
        None => view! { <p class="hint">{t("key-no-further-question")}</p> }.into_any(),
    };

    let candidates_view = move || {
        let list = ranking.get();
        list.into_iter().take(SHOWN_CANDIDATES).map(|candidate| {
            let label = display_name(&candidate);
            let name = candidate.scientific_name.clone();
            let reasons = candidate.reasons.iter().take(4).map(|r| {
                let supports = matches!(r.effect, species_key::Effect::Supports);
                let against = matches!(r.effect, species_key::Effect::Against);
                let neutral = matches!(r.effect, species_key::Effect::Neutral);
                view! { <li class="reason" class:supports=supports class:against=against class:neutral=neutral>{reason_words(r)}</li> }
            }).collect_view();
            let probability = candidate.probability;
            let pick_label = label.clone();
            let rank = key.with_untracked(|k| k.checklist().taxon(&name).map_or(TaxonRank::Species, |t| t.taxon_rank));
            view! {
                <li class="candidate">
                    <div class="row spread">
                        <span><b>{label}</b>" · "{format!("{:.0}%", probability * 100.0)}</span>
                        <button type="button" class="small pick" on:click=move |_| pick(name.clone(), rank, pick_label.clone(), probability)>{t("key-this-one")}</button>
                    </div>
                    <ul class="reasons">{reasons}</ul>
                </li>
            }
        }).collect_view()
    };

    let higher_rank_view = move || {
        let list = ranking.get();
        let (offered, suggested) = key.with(|k| (higher_taxa(k, &list), suggested_stop(k, &list)));
        offered.into_iter().map(|support| {
            let rank = support.taxon_rank;
            let label = key.with_untracked(|k| group_label(k, rank, &support.scientific_name));
            let is_suggested = suggested.as_ref().is_some_and(|s| s.taxon_rank == rank && s.scientific_name == support.scientific_name);
            let text = format!("{label} · {:.0}%", support.probability * 100.0);
            let (name, probability, pick_label) = (support.scientific_name.clone(), support.probability, label.clone());
            view! {
                <li><button type="button" class="higher-rank" class:suggested=is_suggested data-rank=rank_code(rank) data-taxon=support.scientific_name.clone()
                    on:click=move |_| pick(name.clone(), rank, pick_label.clone(), probability)>
                    {is_suggested.then(|| view! { <span class="suggested-word">{t("key-suggested")}</span> })}{text}</button></li>
            }
        }).collect_view()
    };

    let set_aside = move || {
        let said: Vec<String> =
            key.with(|k| usable.with(|(_, dropped)| dropped.iter().map(|e| set_aside_text(k, e)).collect()));
        (!said.is_empty()).then(|| {
            let said = said.join("; ");
            view! { <p class="hint set-aside">{t_args("key-set-aside", &[("answers", said.into())])}</p> }
        })
    };

    let cannot_separate = move || {
        let list = ranking.get();
        let top = list.first()?.scientific_name.clone();
        let others = key.with(|k| k.cannot_separate_from(&top).into_iter().map(str::to_owned).collect::<Vec<_>>());
        (!others.is_empty()).then(|| view! {
            <p class="hint">{t_args("key-cannot-separate", &[("top", top.into()), ("others", others.join(", ").into())])}</p>
        })
    };

    let answered_view = move || {
        let checklist_key = key.get();
        answers.get().iter().map(|(character, given)| {
            let found = checklist_key.checklist().characters().iter().find(|c| c.name == character);
            let question = found.map(|c| c.question.clone()).unwrap_or_else(|| character.to_owned());
            let said = match given {
                Answer::NotSure => t("form-not-sure"),
                Answer::State(state) => found
                    .and_then(|c| c.states.iter().find(|s| &s.name == state))
                    .map(|s| s.label.clone())
                    .unwrap_or_else(|| state.clone()),
            };
            let character = character.to_owned();
            view! {
                <li>{question}" — "<b>{said}</b>" "
                    <button type="button" class="small" on:click=move |_| answers.update(|a| a.clear(&character))>{t("key-change")}</button>
                </li>
            }
        }).collect_view()
    };

    view! {
        <section class="key-panel" aria-label=t("form-open-key")>
            <p class="hint">{t("key-hint")}</p>
            {set_aside}
            {question_view}
            <h3>{t("key-most-likely")}</h3>
            <ol class="candidates">{candidates_view}</ol>
            <h3>{t("key-group-heading")}</h3>
            <p class="hint">{t("key-group-hint")}</p>
            <ul class="higher-ranks">{higher_rank_view}</ul>
            {cannot_separate}
            <details class="answered">
                <summary>{move || t_args("key-your-answers", &[("count", answers.with(|a| a.iter().count()).into())])}</summary>
                <ul>{answered_view}</ul>
                <button type="button" class="small" on:click=move |_| answers.set(Answers::new())>{t("key-start-again")}</button>
            </details>
            <button type="button" on:click=move |_| open.set(false)>{t("key-close")}</button>
        </section>
    }
}
