//! The guided species key in the app: one question at a time (the one the engine
//! expects to tell most), pictures of each answer, "not sure" always allowed, the
//! candidates updating as the observer answers, and one tap to pick a species — or to
//! stop at a genus or family when the answers cannot settle the species. It runs on
//! the phone with no network: the checklist is built in and refreshed from the server
//! (`/api/checklist`) whenever one answers, and kept for offline use.

use std::sync::Arc;

use leptos::prelude::*;
use shared_types::{KeyChoice, LengthUnit, Text};
use species_key::{Answer, Answers, Candidate, Checklist, Context, Key, Measurement, TaxonRank};
use wasm_bindgen::prelude::*;

use crate::device;
use crate::form::FormFields;
use crate::pictures::picture;

const STORED_CHECKLIST: &str = "wrackline.checklist";
const BUILT_IN_CHECKLIST: &str = include_str!("../../demo-records/checklist.json");
/// Below this probability for the best species, the key offers a higher rank.
const SURE_ENOUGH: f64 = 0.8;

fn storage() -> Option<web_sys::Storage> {
    web_sys::window()?.local_storage().ok().flatten()
}

/// The key over the last checklist the server sent, or the built-in one.
pub fn initial_key() -> Arc<Key> {
    let stored = storage()
        .and_then(|s| s.get_item(STORED_CHECKLIST).ok().flatten())
        .and_then(|text| Checklist::from_json(&text).ok());
    // The built-in checklist is checked by the species-key and server tests.
    let checklist = stored.unwrap_or_else(|| Checklist::from_json(BUILT_IN_CHECKLIST).expect("built-in checklist is valid"));
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

/// What the record already tells the key: its area and its length.
fn context_for(key: &Key, fields: &FormFields) -> Context {
    let number = |text: &str| text.trim().replace(',', ".").parse::<f64>().ok();
    let area_code = number(&fields.latitude)
        .zip(number(&fields.longitude))
        .and_then(|(lat, lon)| key.checklist().area_at(lat, lon))
        .map(|area| area.code.clone());
    let measurement = number(&fields.length_value).filter(|v| *v > 0.0).map(|value| Measurement {
        kind: fields.length_kind.unwrap_or(shared_types::LengthKind::Total).key_kind(),
        cm: value * fields.length_unit.unwrap_or(LengthUnit::Cm).cm_per_unit(),
        estimated: fields.length_method == Some(shared_types::MeasureMethod::Estimated),
    });
    Context { area_code, nearby_confirmed: None, measurement }
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

fn display_name(candidate: &Candidate) -> String {
    match candidate.common_names.first() {
        Some(common) => format!("{common} ({})", candidate.scientific_name),
        None => candidate.scientific_name.clone(),
    }
}

/// The key, shown under the species field.
#[component]
pub fn KeyPanel(key: RwSignal<Arc<Key>>, fields: RwSignal<FormFields>, open: RwSignal<bool>) -> impl IntoView {
    let answers = RwSignal::new(Answers::new());
    let context = Memo::new(move |_| key.with(|k| fields.with(|f| context_for(k, f))));
    let ranking = Memo::new(move |_| key.with(|k| answers.with(|a| k.rank(a, &context.get()).unwrap_or_default())));
    let question = Memo::new(move |_| key.with(|k| answers.with(|a| k.next_question(a, &context.get()).ok().flatten())));

    let answer = move |character: String, given: Answer| answers.update(|a| a.set(&character, given));
    let pick = move |scientific_name: String, rank: TaxonRank, label: String, probability: f64| {
        let choice = Text::parse(&scientific_name).ok().map(|name| KeyChoice {
            scientific_name: name,
            taxon_rank: rank_code(rank).to_owned(),
            probability: (probability * 100.0).round() / 100.0,
            answers: answers.with_untracked(answers_as_map),
        });
        fields.update(|f| {
            f.species_guess = label;
            f.key_choice = choice;
        });
        open.set(false);
    };

    let question_view = move || match question.get() {
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
    };

    let candidates_view = move || {
        let list = ranking.get();
        list.into_iter().take(5).map(|candidate| {
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
            view! {
                <li class="candidate">
                    <div class="row spread">
                        <span><b>{label}</b>" · "{format!("{:.0}%", probability * 100.0)}</span>
                        <button type="button" class="small pick" on:click=move |_| pick(name.clone(), TaxonRank::Species, pick_label.clone(), probability)>"This one"</button>
                    </div>
                    <ul class="reasons">{reasons}</ul>
                </li>
            }
        }).collect_view()
    };

    let higher_rank_view = move || {
        let list = ranking.get();
        let top = list.first()?;
        if top.probability >= SURE_ENOUGH {
            return None;
        }
        let support = key.with(|k| k.best_supported_taxon(&list, SURE_ENOUGH))?;
        (support.taxon_rank != TaxonRank::Species).then(|| {
            let label = format!("{} {}", rank_code(support.taxon_rank), support.scientific_name);
            let text = format!("Not sure of the species? Record it as {label} ({:.0}%)", support.probability * 100.0);
            view! {
                <button type="button" class="higher-rank" on:click=move |_| pick(support.scientific_name.clone(), support.taxon_rank, label.clone(), support.probability)>{text}</button>
            }
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
            {question_view}
            <h3>"Most likely"</h3>
            <ol class="candidates">{candidates_view}</ol>
            {higher_rank_view}
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
