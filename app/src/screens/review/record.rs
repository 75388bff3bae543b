//! One record as a reviewer sees it: photos (a tap opens one large), the device's and
//! the photos' own time and place (the file's EXIF, or the phone's reading of the
//! original when the upload copy carries none), each photo's gap and distance from the
//! record with its flags, all fields, the guided key's answers and its suggestions
//! replayed on the server, how the current name reads against the checklist and what the
//! public sees of the place because of it, flags, possible duplicates, identification
//! history, messages and audit trail, and who sent it with how to reach them; what the
//! people who go out added (responses, samples, carcass) — and the decisions. The heading names the current identification; a refused decision is said
//! right under the buttons.

use leptos::prelude::*;
use shared_types::{KeyReplay, MeasureMethod, PhotoExif, PhotoFlag, PhotoView, QueueFlag, ReviewDetail};

use crate::data::words::{self, t, t_args};
use crate::data::{api, checklist, key, labels, photos, readable};
use crate::screens::fieldwork::on_record::RecordFieldwork;
use crate::screens::review::duplicates::DuplicatesOf;
use crate::screens::review::zoom::PhotoZoom;

fn says_something(exif: &PhotoExif) -> bool {
    exif.taken_at.is_some() || exif.taken_local.is_some() || (exif.latitude.is_some() && exif.longitude.is_some())
}

/// One row of the when/where table.
fn time_and_place(
    class: &str,
    label: String,
    when: Option<String>,
    lat: Option<f64>,
    lon: Option<f64>,
    extra: Option<String>,
) -> impl IntoView + use<> {
    let place = match (lat, lon) {
        (Some(lat), Some(lon)) => format!("{lat:.5}, {lon:.5}"),
        _ => "—".into(),
    };
    view! { <tr class=class.to_owned()><th>{label}</th><td>{when.unwrap_or_else(|| "—".into())}</td><td>{place}</td><td>{extra.unwrap_or_default()}</td></tr> }
}

/// A photo's EXIF as a row: the instant (and whose offset made it), place and error.
fn exif_row(class: &str, label: String, exif: &PhotoExif) -> impl IntoView + use<> {
    let when = exif
        .taken_at
        .map(|t| readable::time(&t))
        .or_else(|| exif.taken_local.clone().map(|local| t_args("record-no-offset", &[("time", local.into())])));
    let offset = exif.offset_source.is_some().then(|| readable::offset_words(exif));
    let error = exif.horizontal_error_m.map(|e| t_args("record-within", &[("metres", words::number(e, 0).into())]));
    let extra = [offset, error].into_iter().flatten().collect::<Vec<_>>().join(" · ");
    time_and_place(class, label, when, exif.latitude, exif.longitude, Some(extra))
}

/// Rows for each photo: the file's own EXIF, the phone's reading of the original
/// (upload copies carry none), or a row saying there is neither.
fn photo_rows(photos: &[PhotoView]) -> impl IntoView + use<> {
    photos
        .iter()
        .enumerate()
        .map(|(i, photo)| {
            let n = i + 1;
            let own = says_something(&photo.exif).then(|| {
                exif_row("exif-file", t_args("record-photo-file-exif", &[("number", n.into())]), &photo.exif).into_any()
            });
            let phone = photo.phone_exif.as_ref().filter(|p| says_something(p)).map(|p| {
                exif_row("exif-phone", t_args("record-photo-phone-exif", &[("number", n.into())]), p).into_any()
            });
            let neither = (own.is_none() && phone.is_none()).then(|| {
                time_and_place(
                    "exif-none",
                    t_args("record-photo", &[("number", n.into())]),
                    Some(t("record-no-exif-time")),
                    None,
                    None,
                    Some(t("record-no-exif-place")),
                )
                .into_any()
            });
            view! { {own}{phone}{neither} }
        })
        .collect_view()
}

/// Each photo against the record: hours before it, metres from it, and its flags.
fn photo_checks(photos: &[PhotoView]) -> impl IntoView + use<> {
    photos
        .iter()
        .enumerate()
        .filter(|(_, p)| p.check.time_reading.is_some() || p.check.place_reading.is_some())
        .map(|(i, photo)| {
            let check = &photo.check;
            let reading = readable::readings_words(check);
            let gap = check.seconds_before_record.map(|s| {
                if s >= 0.0 {
                    t_args("record-taken-before", &[("gap", readable::gap(s).into())])
                } else {
                    t_args("record-taken-after", &[("gap", readable::gap(-s).into())])
                }
            });
            let far = check.metres_from_record.map(|m| t_args("record-from-place", &[("distance", readable::distance(m).into())]));
            let facts = [gap, far].into_iter().flatten().collect::<Vec<_>>().join(", ");
            let flags = check.flags.iter().map(|flag| match flag {
                PhotoFlag::TakenLongBeforeRecord => labels::queue_flag(QueueFlag::TakenLongBeforeRecord),
                PhotoFlag::TakenFarFromRecord => labels::queue_flag(QueueFlag::TakenFarFromRecord),
                PhotoFlag::CutShort => t("record-flag-cut-short"),
            });
            let flags = flags.map(|label| view! { <span class="flag">{label}</span> }).collect_view();
            view! { <li class="photo-check">{t_args("record-photo-check", &[("number", (i + 1).into()), ("reading", reading.into()), ("facts", facts.into())])}" "{flags}</li> }
        })
        .collect_view()
}

/// The guided key as the observer used it, replayed on the server.
fn key_section(choice: Option<shared_types::KeyChoice>, replay: Option<KeyReplay>) -> impl IntoView + use<> {
    let choice = choice?;
    let picked = t_args(
        "record-key-picked",
        &[
            ("name", choice.scientific_name.as_str().into()),
            ("rank", key::rank_name_of_code(&choice.taxon_rank.to_string()).into()),
            ("percent", words::number(choice.probability * 100.0, 0).into()),
        ],
    );
    let replay = replay.unwrap_or(KeyReplay { answers: Vec::new(), suggestions: Vec::new(), problem: None });
    let answers =
        replay.answers.into_iter().map(|a| view! { <tr><th>{a.question}</th><td>{a.answer}</td></tr> }).collect_view();
    let suggestions = replay
        .suggestions
        .into_iter()
        .map(|s| {
            let name = match &s.common_name {
                Some(common) => format!("{} ({common})", s.scientific_name),
                None => s.scientific_name.clone(),
            };
            let reasons = s.reasons.into_iter().map(|r| view! { <li class=key::reason_class(&r.effect)>{r.text}</li> }).collect_view();
            view! { <li class="key-suggestion"><b>{name}</b>{format!(" · {:.0}%", s.probability * 100.0)}<ul class="reasons">{reasons}</ul></li> }
        })
        .collect_view();
    Some(view! {
        <section class="key-replay">
            <h4>{t("record-key-heading")}</h4>
            <p>{picked}</p>
            <table class="key-answers">{answers}</table>
            {replay.problem.map(|p| view! { <p class="problems">{p}</p> })}
            <p class="hint">{t("record-key-now")}</p>
            <ol class="key-suggestions">{suggestions}</ol>
        </section>
    })
}

/// One record with everything needed to decide, and the decisions: confirm (at any
/// rank, possibly changing the species), ask the observer, or not confirmable.
#[component]
pub fn RecordReview(client_id: String, back: impl Fn() + Copy + 'static) -> impl IntoView {
    let detail = RwSignal::new(None::<ReviewDetail>);
    let problem = RwSignal::new(String::new());
    let load_problem = RwSignal::new(String::new());
    let pair_problem = RwSignal::new(String::new());
    let zoomed = RwSignal::new(None::<String>);
    // Bumping `reloads` fetches the record again (after every decision).
    let reloads = RwSignal::new(0u32);
    let id = client_id.clone();
    Effect::new(move |_| {
        reloads.track();
        let id = id.clone();
        leptos::task::spawn_local(async move {
            match api::review_record(&id).await {
                Ok(d) => {
                    load_problem.set(String::new());
                    detail.set(Some(d));
                }
                Err(err) => load_problem.set(err.to_string()),
            }
        });
    });
    let load = move || reloads.update(|n| *n = n.wrapping_add(1));
    let species = RwSignal::new(String::new());
    let rank = RwSignal::new(shared_types::KEY_RANKS[0].to_owned());
    let remark = RwSignal::new(String::new());
    let message = RwSignal::new(String::new());
    // Each decision: send it, then clear the message and show the record as it is now.
    let decided = move |outcome: Result<(), api::ApiError>| match outcome {
        Ok(()) => {
            problem.set(String::new());
            message.set(String::new());
            load();
        }
        Err(err) => problem.set(err.to_string()),
    };
    let confirm = {
        let id = client_id.clone();
        move |_| {
            let (id, name, taxon_rank, remark) =
                (id.clone(), species.get_untracked(), rank.get_untracked(), remark.get_untracked());
            leptos::task::spawn_local(async move { decided(api::confirm(&id, name, taxon_rank, remark).await) });
        }
    };
    let ask = {
        let id = client_id.clone();
        move |_| {
            let (id, text) = (id.clone(), message.get_untracked());
            leptos::task::spawn_local(async move { decided(api::ask_observer(&id, text).await) });
        }
    };
    let refuse = move |_| {
        let (id, reason) = (client_id.clone(), message.get_untracked());
        leptos::task::spawn_local(async move { decided(api::not_confirmable(&id, reason).await) });
    };

    view! {
        <button type="button" class="small" on:click=move |_| back()>{t("record-back")}</button>
        <p class="problems" role="alert">{move || load_problem.get()}</p>
        <PhotoZoom photo=zoomed />
        {move || detail.get().map(|d| {
            let sub = d.record.submission.clone();
            if species.get_untracked().is_empty()
                && let Some(current) = d.identifications.iter().find(|i| i.current)
            {
                species.set(current.taxon_name.clone());
            }
            let position = sub.position;
            let photos = d.record.photos.iter().enumerate().map(|(i, p)| {
                // The display copy on the page; a tap opens it large, zoomable.
                let sha = p.sha256.clone();
                view! {
                    <button type="button" class="photo-open" on:click=move |_| zoomed.set(Some(sha.clone()))>
                        <img class="review-photo" src=photos::served(&p.sha256) alt=t_args("record-photo-alt", &[("number", (i + 1).into())]) />
                    </button>
                }
            }).collect_view();
            let guess = sub.species_guess.as_ref().map(|g| g.as_str().to_owned()).unwrap_or_else(|| t("record-no-guess"));
            let current = d.identifications.iter().find(|i| i.current).map(|i| match checklist::common_name(&i.taxon_name) {
                Some(common) => format!("{common} ({})", i.taxon_name),
                None => i.taxon_name.clone(),
            });
            let observer = d.observer.clone().map(|o| {
                let name = o.display_name.unwrap_or_else(|| t("record-no-name"));
                let reach = o.contact.unwrap_or_else(|| t("urgent-no-contact"));
                t_args("record-sent-by", &[("name", name.into()), ("contact", reach.into())])
            });
            view! {
                <article id="record-review" data-state=d.record.review_state.code()>
                    <h3 id="record-heading">{format!("{} · {}", current.clone().unwrap_or_else(|| guess.clone()), labels::review_state(d.record.review_state))}</h3>
                    <p class="hint">{t_args("record-guess", &[("guess", guess.clone().into())])}</p>
                    {d.name_reading.clone().map(|n| view! {
                        <p id="name-reading" class="name-reading" class:unresolved=!n.resolved>
                            {t_args("record-name-reading", &[("typed", n.typed.into()), ("reading", n.reading.into()), ("place", n.public_place.into())])}
                        </p>
                    })}
                    {observer.map(|line| view! { <p id="observer-contact" class="observer-contact">{line}<span class="hint">{t("record-contact-use")}</span></p> })}
                    <div class="photos">{photos}</div>
                    <img class="place-map" src=api::record_map_address(&sub.client_id.to_string()) alt=t("record-map") />
                    <table class="when-where">
                        <tr><th></th><th>{t("record-when")}</th><th>{t("record-where")}</th><th></th></tr>
                        {time_and_place("device", t("record-device"), Some(readable::time(&sub.observed_at)), position.map(|p| p.latitude.get()), position.map(|p| p.longitude.get()),
                            position.and_then(|p| p.accuracy_m).map(|a| t_args("record-within", &[("metres", words::number(a.get(), 0).into())])))}
                        {photo_rows(&d.record.photos)}
                    </table>
                    <ul class="photo-checks">{photo_checks(&d.record.photos)}</ul>
                    <ul class="fields">
                        <li>{t_args("record-fields", &[("count", sub.count.get().to_string().into()), ("condition", labels::condition(sub.condition).into()), ("setting", labels::setting(sub.setting).into()), ("sex", labels::sex(sub.sex).into())])}</li>
                        {sub.length.map(|l| view! { <li>{t_args("record-length", &[("cm", words::number(l.value.centimetres(), 1).into()), ("kind", labels::length_kind(l.kind).into()), ("method", match l.method { MeasureMethod::Measured => t("form-measured"), MeasureMethod::Estimated => t("form-estimated") }.into())])}</li> })}
                        {(!sub.human_signs.is_empty()).then(|| view! { <li>{t_args("record-signs", &[("signs", sub.human_signs.iter().map(|s| labels::human_sign(*s)).collect::<Vec<_>>().join(", ").into())])}</li> })}
                        {sub.notes.as_ref().map(|n| view! { <li>{t_args("carcass-shown-notes", &[("value", n.as_str().into())])}</li> })}
                        {sub.observer_name.as_ref().map(|n| view! { <li>{t_args("record-observer", &[("name", n.as_str().into())])}</li> })}
                    </ul>
                    {key_section(sub.key_choice.clone(), d.key.clone())}
                    <h4>{t("record-flags-heading")}</h4>
                    <ul class="flags">{d.priority_reasons.iter().map(|r| view! { <li>{labels::priority_reason(r)}</li> }).collect_view()}</ul>
                    <RecordFieldwork detail=d.clone() reload=load />
                    <DuplicatesOf detail=d.clone() reloads=reloads problem=pair_problem />
                    <p id="pair-problem" class="problems" role="alert">{move || pair_problem.get()}</p>
                    <h4>{t("record-identifications")}</h4>
                    <ol class="identifications">{d.identifications.iter().map(|i| view! {
                        <li class:current=i.current class:superseded=!i.current>{t_args("record-identification", &[("name", i.taxon_name.clone().into()), ("rank", i.taxon_rank.as_deref().map_or_else(|| t("record-no-rank"), key::rank_name_of_code).into()),
                            ("who", i.identified_by.clone().unwrap_or_else(|| t("record-no-name")).into()), ("day", readable::day(&i.identified_at).into()), ("basis", labels::identification_basis(&i.basis).into()), ("remarks", i.remarks.as_ref().map(|r| format!(": {r}")).unwrap_or_default().into())])}</li>
                    }).collect_view()}</ol>
                    <h4>{t("record-messages")}</h4>
                    <ul class="messages">{d.messages.iter().map(|m| view! { <li>{format!("{}: {}", m.author.clone().unwrap_or_else(|| m.author_role.code().into()), m.body)}</li> }).collect_view()}</ul>
                    <h4>{t("record-history")}</h4>
                    <ol class="events">{d.events.iter().map(|e| view! { <li>{t_args("record-event", &[("at", readable::minute(&e.at).into()), ("from", labels::review_state(e.from_state).into()), ("to", labels::review_state(e.to_state).into()), ("who", e.by.clone().unwrap_or_default().into()),
                        ("detail", e.detail.clone().unwrap_or_default().into()), ("reason", e.reason.as_ref().map(|r| format!(" — “{r}”")).unwrap_or_default().into())])}</li> }).collect_view()}</ol>
                </article>
            }
        })}
        <fieldset class="actions-review">
            <legend>{t("record-decide")}</legend>
            <div class="row">
                <label>{t("record-scientific-name")}" "<input id="confirm-name" prop:value=move || species.get() on:input=move |ev| species.set(event_target_value(&ev)) /></label>
                <label>{t("record-rank")}" "<select id="confirm-rank" on:change=move |ev| rank.set(event_target_value(&ev))>
                    {shared_types::KEY_RANKS.iter().map(|r| view! { <option value=*r>{key::rank_name_of_code(r)}</option> }).collect_view()}
                </select></label>
            </div>
            <label>{t("record-remark")}" "<input id="confirm-remark" prop:value=move || remark.get() on:input=move |ev| remark.set(event_target_value(&ev)) /></label>
            <button id="confirm" type="button" class="primary" on:click=confirm>{t("record-confirm")}</button>
            <label>{t("record-message")}" "<textarea id="review-message" rows="2" prop:value=move || message.get() on:input=move |ev| message.set(event_target_value(&ev))></textarea></label>
            <div class="actions">
                <button id="ask-details" type="button" on:click=ask>{t("record-ask")}</button>
                <button id="not-confirmable" type="button" on:click=refuse>{t("record-not-confirmable")}</button>
            </div>
            <p class="hint">{t("record-message-hint")}</p>
            <p id="decide-problem" class="problems" role="alert">{move || problem.get()}</p>
        </fieldset>
    }
}
