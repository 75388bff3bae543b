//! The guided species key in the app: one question at a time (the one the engine
//! expects to tell most), pictures of each answer, "not sure" always allowed, the
//! candidates updating as the observer answers, and one tap to pick a species — or to
//! stop at any genus, family, order or superorder of the leading candidates, each shown
//! with its summed probability. It runs on the phone with no network: the checklist is
//! built in and refreshed from the server (`/api/checklist`) whenever one answers, and
//! kept for offline use; confirmed records near the record come from [`crate::nearby`].
//! Answers the current checklist does not know (it changed under the observer) are set
//! aside with a note rather than stopping the key.

use std::collections::BTreeSet;
use std::sync::Arc;

use leptos::prelude::*;
use shared_types::{KeyChoice, LengthUnit, Text};
use species_key::{
    Answer, AnswerError, Answers, Candidate, Checklist, Context, Key, Measurement, TaxonRank, TaxonSupport,
};
use wasm_bindgen::prelude::*;

use crate::device;
use crate::form::FormFields;
use crate::nearby;
use crate::pictures::picture;

const STORED_CHECKLIST: &str = "wrackline.checklist";
const BUILT_IN_CHECKLIST: &str = include_str!("../../demo-records/checklist.json");
/// Below this probability for the best species, the best-supported higher taxon is
/// marked as the suggested stop.
const SURE_ENOUGH: f64 = 0.8;
/// How many leading candidates are listed, and whose higher taxa are offered.
const SHOWN_CANDIDATES: usize = 5;
/// Higher taxa offered per rank, at most.
const TAXA_PER_RANK: usize = 3;
/// Below this summed probability a higher taxon is offered only when it is the best at its rank.
const MIN_OFFERED_SUPPORT: f64 = 0.01;

fn storage() -> Option<web_sys::Storage> {
    web_sys::window()?.local_storage().ok().flatten()
}

/// The key over the last checklist the server sent, or the built-in one.
pub fn initial_key() -> Arc<Key> {
    let stored = storage()
        .and_then(|s| s.get_item(STORED_CHECKLIST).ok().flatten())
        .and_then(|text| Checklist::from_json(&text).ok());
    // The built-in checklist is checked by the species-key and server tests.
    let checklist =
        stored.unwrap_or_else(|| Checklist::from_json(BUILT_IN_CHECKLIST).expect("built-in checklist is valid"));
    Arc::new(Key::new(&checklist))
}

/// Fetches the server's checklist and keeps it for offline use; quietly keeps the
/// current one when there is no answer or it does not check out.
pub fn refresh_from_server(key: RwSignal<Arc<Key>>) {
    leptos::task::spawn_local(async move {
        let Ok(text) = device::fetch_text("/api/checklist").await else { return };
        let Ok(checklist) = Checklist::from_json(&text) else { return };
        if let Some(storage) = storage() {
            let _ = storage.set_item(STORED_CHECKLIST, &text);
        }
        key.set(Arc::new(Key::new(&checklist)));
    });
}

fn number(text: &str) -> Option<f64> {
    text.trim().replace(',', ".").parse::<f64>().ok()
}

/// The record's position as typed or filled in, if both parts read as numbers.
fn position_of(fields: &FormFields) -> Option<(f64, f64)> {
    number(&fields.latitude).zip(number(&fields.longitude))
}

/// What the record already tells the key: its area, the confirmed records near it and
/// its length.
fn context_for(key: &Key, fields: &FormFields, nearby_confirmed: Option<nearby::Counts>) -> Context {
    let area_code =
        position_of(fields).and_then(|(lat, lon)| key.checklist().area_at(lat, lon)).map(|area| area.code.clone());
    let measurement = number(&fields.length_value).filter(|v| *v > 0.0).map(|value| Measurement {
        kind: fields.length_kind.unwrap_or(shared_types::LengthKind::Total).key_kind(),
        cm: value * fields.length_unit.unwrap_or(LengthUnit::Cm).cm_per_unit(),
        estimated: fields.length_method == Some(shared_types::MeasureMethod::Estimated),
    });
    Context { area_code, nearby_confirmed, measurement }
}

fn answers_as_map(answers: &Answers) -> std::collections::BTreeMap<String, String> {
    answers
        .iter()
        .map(|(character, answer)| {
            let value = match answer {
                Answer::NotSure => "notSure".to_owned(),
                Answer::State(state) => state.clone(),
            };
            (character.to_owned(), value)
        })
        .collect()
}

fn rank_code(rank: TaxonRank) -> &'static str {
    match rank {
        TaxonRank::Species => "species",
        TaxonRank::Genus => "genus",
        TaxonRank::Family => "family",
        TaxonRank::Order => "order",
        TaxonRank::Superorder => "superorder",
    }
}

/// Says in words why an answer was set aside.
fn set_aside_text(key: &Key, error: &AnswerError) -> String {
    match error {
        AnswerError::UnknownCharacter(character) => {
            format!("your answer about {character} (the checklist no longer asks it)")
        }
        AnswerError::UnknownState { character, state } => {
            let question = key
                .checklist()
                .characters()
                .iter()
                .find(|c| &c.name == character)
                .map_or(character.as_str(), |c| c.question.as_str());
            format!("your answer \"{state}\" to \"{question}\" (no longer one of its answers)")
        }
    }
}

/// The genera, families, orders and superorders of the leading candidates, each with
/// its summed probability over all candidates, most probable first within a rank.
fn higher_taxa(key: &Key, ranking: &[Candidate]) -> Vec<TaxonSupport> {
    let leading: Vec<_> =
        ranking.iter().take(SHOWN_CANDIDATES).filter_map(|c| key.checklist().taxon(&c.scientific_name)).collect();
    [TaxonRank::Genus, TaxonRank::Family, TaxonRank::Order, TaxonRank::Superorder]
        .into_iter()
        .flat_map(|rank| {
            let wanted: BTreeSet<&str> = leading.iter().map(|t| t.name_at(rank)).collect();
            key.support_at(rank, ranking)
                .into_iter()
                .filter(move |s| wanted.contains(s.scientific_name.as_str()))
                .take(TAXA_PER_RANK)
                .enumerate()
                // The best at each rank always; others only with some support.
                .filter(|(i, s)| *i == 0 || s.probability >= MIN_OFFERED_SUPPORT)
                .map(|(_, s)| s)
        })
        .collect()
}

fn display_name(candidate: &Candidate) -> String {
    match candidate.common_names.first() {
        Some(common) => format!("{common} ({})", candidate.scientific_name),
        None => candidate.scientific_name.clone(),
    }
}

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
    let answers = RwSignal::new(Answers::new());
    let nearby_counts = RwSignal::new(None::<nearby::Counts>);
    follow_nearby(fields, nearby_counts);
    let context = Memo::new(move |_| key.with(|k| fields.with(|f| context_for(k, f, nearby_counts.get()))));
    // Answers the current checklist knows, and those set aside.
    let usable = Memo::new(move |_| key.with(|k| answers.with(|a| k.usable_answers(a))));
    let ranking = Memo::new(move |_| key.with(|k| usable.with(|(a, _)| k.rank(a, &context.get()).unwrap_or_default())));
    let question =
        Memo::new(move |_| key.with(|k| usable.with(|(a, _)| k.next_question(a, &context.get()).ok().flatten())));

    let answer = move |character: String, given: Answer| answers.update(|a| a.set(&character, given));
    let pick = move |scientific_name: String, rank: TaxonRank, label: String, probability: f64| {
        let choice = Text::parse(&scientific_name).ok().map(|name| KeyChoice {
            scientific_name: name,
            taxon_rank: rank_code(rank).to_owned(),
            probability: (probability * 100.0).round() / 100.0,
            answers: usable.with_untracked(|(a, _)| answers_as_map(a)),
        });
        fields.update(|f| {
            f.species_guess = label;
            f.key_choice = choice;
        });
        open.set(false);
    };

    let question_view = move || {
        match question.get() {
        Some(q) => {
            let character = q.character.clone();
            let states = q.states.clone().into_iter().map(|state| {
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
            }).collect_view();
            let unsure = q.character.clone();
            view! {
                <div class="key-question" data-character=q.character.clone()>
                    <p class="question">{q.question.clone()}</p>
                    <div class="state-choices">
                        {states}
                        <button type="button" class="state-choice not-sure" on:click=move |_| answer(unsure.clone(), Answer::NotSure)>
                            <span>"Not sure / skip"</span>
                        </button>
                    </div>
                </div>
            }.into_any()
        }
        None => view! { <p class="hint">"No further question would tell these apart: pick from the list, or stop at a higher rank."</p> }.into_any(),
    }
    };

    let candidates_view = move || {
        let list = ranking.get();
        list.into_iter().take(SHOWN_CANDIDATES).map(|candidate| {
            let label = display_name(&candidate);
            let name = candidate.scientific_name.clone();
            let reasons = candidate.reasons.iter().take(4).map(|r| {
                let class = match r.effect {
                    species_key::Effect::Supports => "reason supports",
                    species_key::Effect::Against => "reason against",
                    species_key::Effect::Neutral => "reason neutral",
                };
                view! { <li class=class>{r.text.clone()}</li> }
            }).collect_view();
            let probability = candidate.probability;
            let pick_label = label.clone();
            let rank = key.with_untracked(|k| k.checklist().taxon(&name).map_or(TaxonRank::Species, |t| t.taxon_rank));
            view! {
                <li class="candidate">
                    <div class="row spread">
                        <span><b>{label}</b>" · "{format!("{:.0}%", probability * 100.0)}</span>
                        <button type="button" class="small pick" on:click=move |_| pick(name.clone(), rank, pick_label.clone(), probability)>"This one"</button>
                    </div>
                    <ul class="reasons">{reasons}</ul>
                </li>
            }
        }).collect_view()
    };

    let higher_rank_view = move || {
        let list = ranking.get();
        let (offered, suggested) = key.with(|k| {
            let unsure = list.first().is_some_and(|top| top.probability < SURE_ENOUGH);
            let suggested = unsure.then(|| k.best_supported_taxon(&list, SURE_ENOUGH)).flatten();
            (higher_taxa(k, &list), suggested)
        });
        offered.into_iter().map(|support| {
            let rank = support.taxon_rank;
            let label = format!("{} {}", rank_code(rank), support.scientific_name);
            let is_suggested = suggested.as_ref().is_some_and(|s| s.taxon_rank == rank && s.scientific_name == support.scientific_name);
            let class = if is_suggested { "higher-rank suggested" } else { "higher-rank" };
            let text = format!("{label} · {:.0}%", support.probability * 100.0);
            let (name, probability, pick_label) = (support.scientific_name.clone(), support.probability, label.clone());
            view! {
                <li><button type="button" class=class data-rank=rank_code(rank) data-taxon=support.scientific_name.clone()
                    on:click=move |_| pick(name.clone(), rank, pick_label.clone(), probability)>{text}</button></li>
            }
        }).collect_view()
    };

    let set_aside = move || {
        let said: Vec<String> =
            key.with(|k| usable.with(|(_, dropped)| dropped.iter().map(|e| set_aside_text(k, e)).collect()));
        (!said.is_empty()).then(|| {
            let said = said.join("; ");
            view! { <p class="hint set-aside">{format!("The checklist has changed, so these answers are set aside: {said}.")}</p> }
        })
    };

    let cannot_separate = move || {
        let list = ranking.get();
        let top = list.first()?.scientific_name.clone();
        let others = key.with(|k| k.cannot_separate_from(&top).into_iter().map(str::to_owned).collect::<Vec<_>>());
        (!others.is_empty()).then(|| view! {
            <p class="hint">{format!("These questions cannot tell {top} from {}; a reviewer will check the photos.", others.join(", "))}</p>
        })
    };

    let answered_view = move || {
        let checklist_key = key.get();
        answers.get().iter().map(|(character, given)| {
            let found = checklist_key.checklist().characters().iter().find(|c| c.name == character);
            let question = found.map(|c| c.question.clone()).unwrap_or_else(|| character.to_owned());
            let said = match given {
                Answer::NotSure => "not sure".to_owned(),
                Answer::State(state) => found
                    .and_then(|c| c.states.iter().find(|s| &s.name == state))
                    .map(|s| s.label.clone())
                    .unwrap_or_else(|| state.clone()),
            };
            let character = character.to_owned();
            view! {
                <li>{question}" — "<b>{said}</b>" "
                    <button type="button" class="small" on:click=move |_| answers.update(|a| a.clear(&character))>"change"</button>
                </li>
            }
        }).collect_view()
    };

    view! {
        <section class="key-panel" aria-label="Help me identify">
            <p class="hint">"Answer what you can see; \"not sure\" is always fine. Do not touch a ray's tail spine."</p>
            {set_aside}
            {question_view}
            <h3>"Most likely"</h3>
            <ol class="candidates">{candidates_view}</ol>
            <h3>"Or stop at a higher rank"</h3>
            <p class="hint">"Sure it is a skate, or a catshark, but not which one? Record the group you are sure of."</p>
            <ul class="higher-ranks">{higher_rank_view}</ul>
            {cannot_separate}
            <details class="answered">
                <summary>{move || format!("Your answers ({})", answers.with(|a| a.iter().count()))}</summary>
                <ul>{answered_view}</ul>
                <button type="button" class="small" on:click=move |_| answers.set(Answers::new())>"Start again"</button>
            </details>
            <button type="button" on:click=move |_| open.set(false)>"Close the key"</button>
        </section>
    }
}

/// Time in milliseconds to choose the next question over an invented checklist of
/// `species` species, for the in-browser benchmark: the median over 7 batches of the
/// mean of `rounds` calls (the browser's clock is too coarse to time one call).
#[wasm_bindgen]
pub fn bench_next_question(species: usize, rounds: usize) -> f64 {
    let checklist = species_key::synthetic::checklist(species, 15, 2026);
    let key = Key::new(&checklist);
    let answers = Answers::new().with("c0", "s1").with("c3", "s2");
    let performance = web_sys::window().and_then(|w| w.performance());
    let now = || performance.as_ref().map(|p| p.now()).unwrap_or_else(js_sys::Date::now);
    let rounds = rounds.max(1);
    let mut batches: Vec<f64> = (0..7)
        .map(|_| {
            let start = now();
            for _ in 0..rounds {
                std::hint::black_box(key.next_question(&answers, &Context::default()).ok());
            }
            (now() - start) / rounds as f64
        })
        .collect();
    batches.sort_by(f64::total_cmp);
    batches[batches.len() / 2]
}
