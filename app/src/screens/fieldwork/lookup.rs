//! `#samples`: finding an animal from a sample's id — typed, or pasted from a barcode
//! scanner (which types the code and Enter) — with the record, its photos, every sample
//! of the same animal and where each is stored, the carcass report and the trail.

use leptos::prelude::*;
use shared_types::SampleLookup;

use crate::data::{api, checklist, readable};
use crate::screens::fieldwork::samples::sample_line;

mod words {
    pub const HEADING: &str = "Find an animal by a sample";
    pub const HINT: &str = "Type the sample's id, or scan its barcode into the box.";
    pub const CODE: &str = "Sample id or barcode";
    pub const FIND: &str = "Find";
    pub const THE_SAMPLE: &str = "This sample";
    pub const THE_ANIMAL: &str = "The animal";
    pub const ALL_SAMPLES: &str = "Every sample of this animal";
    pub const CARCASS: &str = "Carcass";
    pub const TRAIL: &str = "Changes";
    pub const NO_PLACE: &str = "no position given";
}

fn animal_lines(found: &SampleLookup) -> Vec<String> {
    let sub = &found.record.submission;
    let guess = sub.species_guess.as_ref().map(|g| g.as_str().to_owned()).unwrap_or_else(|| "unnamed".into());
    let named = checklist::common_name(&guess).map_or(guess.clone(), |common| format!("{common} ({guess})"));
    let place = sub
        .position
        .map_or(words::NO_PLACE.to_owned(), |p| format!("{:.5}, {:.5}", p.latitude.get(), p.longitude.get()));
    let mut lines = vec![
        format!("{named} · {} · {}", sub.condition.label(), found.record.review_state.label()),
        format!("seen {} at {place}", readable::time(&sub.observed_at)),
        format!("record {}", sub.client_id),
    ];
    lines.extend(sub.notes.as_ref().map(|n| format!("notes: {}", n.as_str())));
    lines
}

fn result_view(found: SampleLookup) -> impl IntoView {
    let photos = found.record.photos.iter().enumerate().map(|(i, p)| view! {
        <a href=format!("/photos/{}", p.sha256) target="_blank"><img class="urgent-photo" src=format!("/photos/{}/thumb", p.sha256) alt=format!("photo {} of the animal", i + 1) /></a>
    }).collect_view();
    let animal = animal_lines(&found).into_iter().map(|l| view! { <li>{l}</li> }).collect_view();
    let this_code = found.sample.code.clone();
    let all = found
        .samples_of_the_animal
        .iter()
        .map(|s| {
            let class = if s.code == this_code { "sample this-sample" } else { "sample" };
            view! { <li class=class data-code=s.code.clone()>{sample_line(s)}</li> }
        })
        .collect_view();
    let carcass = found.carcass.as_ref().map(|c| {
        view! { <p class="lookup-carcass">{format!("{}: {} (recorded by {} on {})", words::CARCASS, c.report.fate.label(), c.recorded_by, c.recorded_at.format("%Y-%m-%d"))}</p> }
    });
    let trail = found
        .events
        .iter()
        .map(|e| view! { <li>{format!("{} · {} · {}", e.at.format("%Y-%m-%d %H:%M UTC"), e.by, e.detail)}</li> })
        .collect_view();
    view! {
        <article id="lookup-result" data-record=found.record.submission.client_id.to_string()>
            <h3>{words::THE_SAMPLE}</h3>
            <p id="lookup-sample">{sample_line(&found.sample)}</p>
            <h3>{words::THE_ANIMAL}</h3>
            <ul id="lookup-animal" class="plain">{animal}</ul>
            <div class="photos">{photos}</div>
            <h3>{words::ALL_SAMPLES}</h3>
            <ul id="lookup-samples" class="plain">{all}</ul>
            {carcass}
            <h4>{words::TRAIL}</h4>
            <ol id="lookup-trail" class="events">{trail}</ol>
        </article>
    }
}

#[component]
pub fn SampleLookupScreen() -> impl IntoView {
    let code = RwSignal::new(String::new());
    let found = RwSignal::new(None::<SampleLookup>);
    let problem = RwSignal::new(String::new());
    let find = move |ev: leptos::ev::SubmitEvent| {
        ev.prevent_default();
        let wanted = code.get_untracked().trim().to_owned();
        leptos::task::spawn_local(async move {
            match api::fieldwork::sample_lookup(&wanted).await {
                Ok(answer) => {
                    problem.set(String::new());
                    found.set(Some(answer));
                }
                Err(err) => {
                    found.set(None);
                    problem.set(err.to_string());
                }
            }
        });
    };
    view! {
        <section id="sample-lookup" class="card review">
            <h2>{words::HEADING}</h2>
            <p class="hint">{words::HINT}</p>
            <form id="lookup-form" class="row" on:submit=find>
                <label>{words::CODE}<input id="lookup-code" autocomplete="off" prop:value=move || code.get() on:input=move |ev| code.set(event_target_value(&ev)) /></label>
                <button id="lookup-find" type="submit" class="primary">{words::FIND}</button>
            </form>
            <p id="lookup-problem" class="problems field-problem" role="alert" data-field="code">{move || problem.get()}</p>
            {move || found.get().map(result_view)}
        </section>
    }
}
