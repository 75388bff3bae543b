//! `#samples`: finding an animal from a sample's id — typed, or pasted from a barcode
//! scanner (which types the code and Enter) — with the record, its photos, every sample
//! of the same animal and where each is stored, the carcass report and the trail.

use leptos::prelude::*;
use shared_types::SampleLookup;

use crate::data::words::{t, t_args};
use crate::data::{api, checklist, labels, photos, readable};
use crate::screens::fieldwork::samples::sample_line;

fn animal_lines(found: &SampleLookup) -> Vec<String> {
    let sub = &found.record.submission;
    let guess = sub.species_guess.as_ref().map(|g| g.as_str().to_owned()).unwrap_or_else(|| t("urgent-unnamed"));
    let named = checklist::common_name(&guess).map_or(guess.clone(), |common| format!("{common} ({guess})"));
    let place = sub
        .position
        .map_or_else(|| t("urgent-no-place"), |p| format!("{:.5}, {:.5}", p.latitude.get(), p.longitude.get()));
    let mut lines = vec![
        format!("{named} · {} · {}", labels::condition(sub.condition), labels::review_state(found.record.review_state)),
        t_args("lookup-seen", &[("at", readable::time(&sub.observed_at).into()), ("place", place.into())]),
        t_args("lookup-record", &[("id", sub.client_id.to_string().into())]),
    ];
    lines.extend(sub.notes.as_ref().map(|n| t_args("carcass-shown-notes", &[("value", n.as_str().into())])));
    lines
}

fn result_view(found: SampleLookup) -> impl IntoView {
    let photos = found.record.photos.iter().enumerate().map(|(i, p)| view! {
        <a href=photos::served(&p.sha256) target="_blank"><img class="urgent-photo" src=photos::served_thumb(&p.sha256) alt=t_args("urgent-photo", &[("number", (i + 1).into())]) /></a>
    }).collect_view();
    let animal = animal_lines(&found).into_iter().map(|l| view! { <li>{l}</li> }).collect_view();
    let this_code = found.sample.code.clone();
    let all = found
        .samples_of_the_animal
        .iter()
        .map(|s| {
            let this_one = s.code == this_code;
            view! { <li class="sample" class:this-sample=this_one data-code=s.code.clone()>{sample_line(s)}</li> }
        })
        .collect_view();
    let carcass = found.carcass.as_ref().map(|c| {
        view! { <p class="lookup-carcass">{t_args("lookup-carcass", &[("fate", labels::carcass_fate(c.report.fate).into()), ("who", c.recorded_by.clone().into()), ("day", readable::day(&c.recorded_at).into())])}</p> }
    });
    let trail = found
        .events
        .iter()
        .map(|e| view! { <li>{format!("{} · {} · {}", readable::utc_minute(&e.at), e.by, e.detail)}</li> })
        .collect_view();
    view! {
        <article id="lookup-result" data-record=found.record.submission.client_id.to_string()>
            <h3>{t("lookup-the-sample")}</h3>
            <p id="lookup-sample">{sample_line(&found.sample)}</p>
            <h3>{t("lookup-the-animal")}</h3>
            <ul id="lookup-animal" class="plain">{animal}</ul>
            <div class="photos">{photos}</div>
            <h3>{t("lookup-all-samples")}</h3>
            <ul id="lookup-samples" class="plain">{all}</ul>
            {carcass}
            <h4>{t("lookup-trail")}</h4>
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
            <h2>{t("lookup-heading")}</h2>
            <p class="hint">{t("lookup-hint")}</p>
            <form id="lookup-form" class="row" on:submit=find>
                <label>{t("lookup-code")}<input id="lookup-code" autocomplete="off" prop:value=move || code.get() on:input=move |ev| code.set(event_target_value(&ev)) /></label>
                <button id="lookup-find" type="submit" class="primary">{t("lookup-find")}</button>
            </form>
            <p id="lookup-problem" class="problems field-problem" role="alert" data-field="code">{move || problem.get()}</p>
            {move || found.get().map(result_view)}
        </section>
    }
}
