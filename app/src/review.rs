//! The reviewers' screens (`#review`): sign in, the queue in the order that matters
//! with why — filtered by state, species or higher taxon, area, dates and flag, a page
//! at a time — and a record with everything needed to decide: photos (tap to open large
//! and zoom), the device's and the photos' own time and place (the file's EXIF, or the
//! phone's reading of the original when the upload copy carries none), each photo's
//! gap and distance from the record with its flags, all fields, the guided key's answers
//! and its suggestions replayed on the server, flags, identification history, messages
//! and audit trail — and the actions: confirm (at any rank, possibly changing the
//! species), ask the observer for details, or mark not confirmable. Admins also get the
//! people screen (`#people`). Needs a connection: review happens at a desk, and the
//! server decides.

use leptos::prelude::*;
use shared_types::codes::code;
use shared_types::{
    KeyReplay, PersonEvent, PhotoExif, PhotoFlag, PhotoView, QueueFlag, QueueItem, ReviewDetail, Role, SessionInfo,
    distance_words, hours_words,
};

use crate::device;

const CSRF_KEY: &str = "wrackline.csrf";

fn session_storage() -> Option<web_sys::Storage> {
    web_sys::window()?.session_storage().ok().flatten()
}

fn csrf() -> String {
    session_storage().and_then(|s| s.get_item(CSRF_KEY).ok().flatten()).unwrap_or_default()
}

/// A JSON call as the signed-in reviewer; the body of a 2xx, or the server's message.
async fn call(method: &str, url: &str, body: Option<String>) -> Result<String, String> {
    let token = csrf();
    let answer = device::send_json(method, url, body.as_deref(), &[("x-csrf-token", &token)]).await?;
    if (200..300).contains(&answer.status) {
        return Ok(answer.body);
    }
    let message = serde_json::from_str::<serde_json::Value>(&answer.body)
        .ok()
        .and_then(|v| v.get("error").and_then(|e| e.as_str()).map(str::to_owned))
        .unwrap_or_else(|| format!("the server answered {}", answer.status));
    Err(message)
}

/// Who is signed in, when a reviewer or admin is.
async fn signed_in_role() -> Option<Role> {
    let body = call("GET", "/api/session", None).await.ok()?;
    let value: serde_json::Value = serde_json::from_str(&body).ok()?;
    serde_json::from_value::<Role>(value.get("role")?.clone()).ok().filter(|r| *r != Role::Observer)
}

#[component]
pub fn ReviewScreen() -> impl IntoView {
    let role = RwSignal::new(None::<Role>);
    let checked = RwSignal::new(false);
    leptos::task::spawn_local(async move {
        role.set(signed_in_role().await);
        checked.set(true);
    });
    view! {
        <section class="card review">
            <h2>"Review"</h2>
            <p class="hint">"Decisions are kept with who made them and when. Figures and identifications are inputs to assessments, not listings."</p>
            {move || match (checked.get(), role.get()) {
                (false, _) => view! { <p class="hint">"checking your sign-in…"</p> }.into_any(),
                (true, None) => view! { <SignIn role=role /> }.into_any(),
                (true, Some(r)) => view! { <Queue role=r signed_out=move || role.set(None) /> }.into_any(),
            }}
        </section>
    }
}

#[component]
fn SignIn(role: RwSignal<Option<Role>>) -> impl IntoView {
    let username = RwSignal::new(String::new());
    let password = RwSignal::new(String::new());
    let problem = RwSignal::new(String::new());
    let submit = move |ev: leptos::ev::SubmitEvent| {
        ev.prevent_default();
        let body =
            serde_json::json!({"username": username.get_untracked(), "password": password.get_untracked()}).to_string();
        leptos::task::spawn_local(async move {
            match call("POST", "/api/session", Some(body))
                .await
                .and_then(|b| serde_json::from_str::<SessionInfo>(&b).map_err(|e| e.to_string()))
            {
                Ok(info) => {
                    if let Some(s) = session_storage() {
                        let _ = s.set_item(CSRF_KEY, &info.csrf_token);
                    }
                    password.set(String::new());
                    role.set(Some(info.role));
                }
                Err(err) => problem.set(err),
            }
        });
    };
    view! {
        <form id="sign-in" on:submit=submit>
            <label>"Username" <input id="username" autocomplete="username" prop:value=move || username.get() on:input=move |ev| username.set(event_target_value(&ev)) /></label>
            <label>"Password" <input id="password" type="password" autocomplete="current-password" prop:value=move || password.get() on:input=move |ev| password.set(event_target_value(&ev)) /></label>
            <button type="submit" class="primary">"Sign in"</button>
            <p class="problems" role="alert">{move || problem.get()}</p>
        </form>
    }
}

/// Queue items asked for at a time ("Load more" asks for the next page).
const PAGE: usize = 50;

/// The queue's filters, as the server reads them (`GET /api/review/queue`).
#[derive(Debug, Clone, Default, PartialEq)]
struct Filters {
    state: String,
    taxon: String,
    area: String,
    from: String,
    to: String,
    flag: String,
}

impl Filters {
    /// The query string for one page, empty values left out.
    fn query(&self, offset: usize) -> String {
        let pairs = [
            ("state", &self.state),
            ("taxon", &self.taxon),
            ("area", &self.area),
            ("from", &self.from),
            ("to", &self.to),
            ("flag", &self.flag),
        ];
        let mut parts: Vec<String> = pairs
            .iter()
            .filter(|(_, value)| !value.trim().is_empty())
            .map(|(name, value)| format!("{name}={}", String::from(js_sys::encode_uri_component(value.trim()))))
            .collect();
        // One more than a page tells whether there is more.
        parts.push(format!("limit={}", PAGE + 1));
        parts.push(format!("offset={offset}"));
        parts.join("&")
    }
}

/// Names the taxon filter offers: every species (scientific and common names) and every
/// genus, family, order and superorder of the checklist the app carries.
fn taxon_names() -> Vec<String> {
    let key = crate::key::initial_key();
    let mut names = std::collections::BTreeSet::new();
    for taxon in key.checklist().taxa() {
        names.insert(taxon.scientific_name.clone());
        names.extend(taxon.common_names.iter().cloned());
        for higher in [&taxon.genus, &taxon.family, &taxon.order, &taxon.superorder] {
            names.insert(higher.clone());
        }
    }
    names.into_iter().collect()
}

/// The checklist's areas: (code, name).
fn areas() -> Vec<(String, String)> {
    crate::key::initial_key().checklist().areas().iter().map(|a| (a.code.clone(), a.name.clone())).collect()
}

#[component]
fn Queue(role: Role, signed_out: impl Fn() + Copy + 'static) -> impl IntoView {
    let items = RwSignal::new(Vec::<QueueItem>::new());
    let more = RwSignal::new(false);
    let open = RwSignal::new(None::<String>);
    let filters = RwSignal::new(Filters::default());
    let problem = RwSignal::new(String::new());
    // Only the newest request's answer is shown (filters may change while one is out).
    let asked_last = StoredValue::new(0u32);
    let fetch = move |append: bool| {
        let asked = filters.get_untracked();
        let offset = if append { items.with_untracked(|i| i.len()) } else { 0 };
        let this = asked_last.get_value().wrapping_add(1);
        asked_last.set_value(this);
        leptos::task::spawn_local(async move {
            let url = format!("/api/review/queue?{}", asked.query(offset));
            let answer = call("GET", &url, None).await;
            if asked_last.get_value() != this {
                return;
            }
            match answer.and_then(|b| serde_json::from_str::<Vec<QueueItem>>(&b).map_err(|e| e.to_string())) {
                Ok(mut page) => {
                    more.set(page.len() > PAGE);
                    page.truncate(PAGE);
                    problem.set(String::new());
                    if append { items.update(|i| i.extend(page)) } else { items.set(page) }
                }
                Err(err) => problem.set(err),
            }
        });
    };
    fetch(false);
    let sign_out = move |_| {
        leptos::task::spawn_local(async move {
            let _ = call("DELETE", "/api/session", None).await;
            signed_out();
        });
    };
    // Each filter control writes its field; selects and dates apply at once.
    let set = move |field: fn(&mut Filters) -> &mut String, value: String, apply: bool| {
        filters.update(|f| *field(f) = value);
        if apply {
            fetch(false);
        }
    };
    let clear = move |_| {
        filters.set(Filters::default());
        fetch(false);
    };
    view! {
        <div class="row spread">
            {(role == Role::Admin).then(|| view! { <a href="#people">"People"</a> })}
            <button type="button" class="small" on:click=sign_out>"Sign out"</button>
        </div>
        <form id="queue-filters" class="filters" on:submit=move |ev: leptos::ev::SubmitEvent| { ev.prevent_default(); fetch(false); }>
            <label>"Show" <select id="queue-state" prop:value=move || filters.with(|f| f.state.clone()) on:change=move |ev| set(|f| &mut f.state, event_target_value(&ev), true)>
                <option value="">"to review"</option>
                <option value="awaiting_review">"awaiting review"</option>
                <option value="details_requested">"details requested"</option>
                <option value="confirmed">"confirmed"</option>
                <option value="not_confirmable">"not confirmable"</option>
                <option value="merged">"merged"</option>
                <option value="any">"all"</option>
            </select></label>
            <label>"Species or group" <input id="queue-taxon" list="taxon-names" placeholder="e.g. Rajidae, tope"
                prop:value=move || filters.with(|f| f.taxon.clone()) on:input=move |ev| set(|f| &mut f.taxon, event_target_value(&ev), false) on:change=move |_| fetch(false) /></label>
            <datalist id="taxon-names">{taxon_names().into_iter().map(|n| view! { <option value=n></option> }).collect_view()}</datalist>
            <label>"Area" <select id="queue-area" prop:value=move || filters.with(|f| f.area.clone()) on:change=move |ev| set(|f| &mut f.area, event_target_value(&ev), true)>
                <option value="">"anywhere"</option>
                {areas().into_iter().map(|(code, name)| view! { <option value=code>{name}</option> }).collect_view()}
            </select></label>
            <label>"From" <input id="queue-from" type="date" prop:value=move || filters.with(|f| f.from.clone()) on:change=move |ev| set(|f| &mut f.from, event_target_value(&ev), true) /></label>
            <label>"To" <input id="queue-to" type="date" prop:value=move || filters.with(|f| f.to.clone()) on:change=move |ev| set(|f| &mut f.to, event_target_value(&ev), true) /></label>
            <label>"Flag" <select id="queue-flag" prop:value=move || filters.with(|f| f.flag.clone()) on:change=move |ev| set(|f| &mut f.flag, event_target_value(&ev), true)>
                <option value="">"any or none"</option>
                {QueueFlag::ALL.iter().map(|flag| view! { <option value=code(flag)>{flag.label()}</option> }).collect_view()}
            </select></label>
            <div class="actions">
                <button id="queue-apply" type="submit" class="small">"Filter"</button>
                <button id="queue-clear" type="button" class="small" on:click=clear>"Clear"</button>
            </div>
        </form>
        <p class="problems">{move || problem.get()}</p>
        {move || match open.get() {
            Some(id) => view! { <RecordReview client_id=id back=move || { open.set(None); fetch(false); } /> }.into_any(),
            None => view! {
                <p id="queue-count" class="hint">{move || format!("{} record(s){}", items.with(|i| i.len()), if more.get() { ", more below" } else { "" })}</p>
                <ol id="queue">
                    {move || items.get().into_iter().map(|item| {
                        let id = item.record.submission.client_id.to_string();
                        let what = item.current_taxon.clone().or_else(|| item.record.submission.species_guess.as_ref().map(|g| g.as_str().to_owned())).unwrap_or_else(|| "unnamed".into());
                        let when = item.record.submission.observed_at.format("%Y-%m-%d").to_string();
                        let open_id = id.clone();
                        view! {
                            <li class="queue-item" data-client-id=id>
                                <button type="button" class="link" on:click=move |_| open.set(Some(open_id.clone()))>{format!("{what} · {when} · {}", item.record.review_state.label())}</button>
                                <ul class="reasons">{item.priority_reasons.iter().map(|r| view! { <li>{r.clone()}</li> }).collect_view()}</ul>
                            </li>
                        }
                    }).collect_view()}
                </ol>
                <Show when=move || more.get()>
                    <button id="queue-more" type="button" on:click=move |_| fetch(true)>"Load more"</button>
                </Show>
            }.into_any(),
        }}
    }
}

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
        .map(|t| crate::readable::time(&t))
        .or_else(|| exif.taken_local.clone().map(|t| format!("{t} (no offset)")));
    let offset = exif.offset_source.is_some().then(|| crate::readable::offset_words(exif).to_owned());
    let error = exif.horizontal_error_m.map(|e| format!("±{e:.0} m"));
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
            let own = says_something(&photo.exif)
                .then(|| exif_row("exif-file", format!("photo {n} (the file's EXIF)"), &photo.exif).into_any());
            let phone = photo.phone_exif.as_ref().filter(|p| says_something(p)).map(|p| {
                exif_row("exif-phone", format!("photo {n} (the phone's reading of the original)"), p).into_any()
            });
            let neither = (own.is_none() && phone.is_none()).then(|| {
                time_and_place(
                    "exif-none",
                    format!("photo {n}"),
                    Some("no EXIF time".into()),
                    None,
                    None,
                    Some("no EXIF place".into()),
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
            let reading = crate::readable::readings_words(check);
            let gap = check.seconds_before_record.map(|s| {
                if s >= 0.0 {
                    format!("taken {} before the record", hours_words(s))
                } else {
                    format!("taken {} after the record", hours_words(-s))
                }
            });
            let far = check.metres_from_record.map(|m| format!("{} from the record's place", distance_words(m)));
            let facts = [gap, far].into_iter().flatten().collect::<Vec<_>>().join(", ");
            let flags = check.flags.iter().map(|flag| match flag {
                PhotoFlag::TakenLongBeforeRecord => QueueFlag::TakenLongBeforeRecord.label(),
                PhotoFlag::TakenFarFromRecord => QueueFlag::TakenFarFromRecord.label(),
            });
            let flags = flags.map(|label| view! { <span class="flag">{label}</span> }).collect_view();
            view! { <li class="photo-check">{format!("photo {} ({reading}): {facts} ", i + 1)}{flags}</li> }
        })
        .collect_view()
}

/// The guided key as the observer used it, replayed on the server.
fn key_section(choice: Option<shared_types::KeyChoice>, replay: Option<KeyReplay>) -> impl IntoView + use<> {
    let choice = choice?;
    let picked = format!(
        "The observer picked {} ({}, {:.0}% when picked).",
        choice.scientific_name.as_str(),
        choice.taxon_rank,
        choice.probability * 100.0
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
            let reasons = s.reasons.into_iter().map(|r| view! { <li class=format!("reason {}", r.effect)>{r.text}</li> }).collect_view();
            view! { <li class="key-suggestion"><b>{name}</b>{format!(" · {:.0}%", s.probability * 100.0)}<ul class="reasons">{reasons}</ul></li> }
        })
        .collect_view();
    Some(view! {
        <section class="key-replay">
            <h4>"Guided key"</h4>
            <p>{picked}</p>
            <table class="key-answers">{answers}</table>
            {replay.problem.map(|p| view! { <p class="problems">{p}</p> })}
            <p class="hint">"What the key suggests for these answers now, most likely first:"</p>
            <ol class="key-suggestions">{suggestions}</ol>
        </section>
    })
}

/// A photo opened large over the page: the display copy, zoomed with the buttons or
/// the mouse wheel on a desk and with two fingers on a phone, dragged to look around;
/// reviewers also get the original (with its EXIF) in a new tab.
#[component]
fn PhotoZoom(photo: RwSignal<Option<String>>) -> impl IntoView {
    const MIN: f64 = 1.0;
    const MAX: f64 = 8.0;
    let scale = RwSignal::new(1.0_f64);
    let shift = RwSignal::new((0.0_f64, 0.0_f64));
    // Pointers down on the picture: id → last position.
    let pointers = StoredValue::new(std::collections::BTreeMap::<i32, (f64, f64)>::new());
    let zoom_by = move |factor: f64| {
        scale.update(|s| *s = (*s * factor).clamp(MIN, MAX));
        if scale.get_untracked() <= MIN {
            shift.set((0.0, 0.0));
        }
    };
    let reset = move || {
        scale.set(1.0);
        shift.set((0.0, 0.0));
        pointers.update_value(|p| p.clear());
    };
    let close = move || {
        reset();
        photo.set(None);
    };
    let spread = |p: &std::collections::BTreeMap<i32, (f64, f64)>| {
        let mut points = p.values();
        match (points.next(), points.next()) {
            (Some(a), Some(b)) => Some(((a.0 - b.0).powi(2) + (a.1 - b.1).powi(2)).sqrt()),
            _ => None,
        }
    };
    let down = move |ev: web_sys::PointerEvent| {
        ev.prevent_default();
        if let Some(target) = ev.target().and_then(|t| wasm_bindgen::JsCast::dyn_into::<web_sys::Element>(t).ok()) {
            let _ = target.set_pointer_capture(ev.pointer_id());
        }
        pointers.update_value(|p| {
            p.insert(ev.pointer_id(), (f64::from(ev.client_x()), f64::from(ev.client_y())));
        });
    };
    let moved = move |ev: web_sys::PointerEvent| {
        let id = ev.pointer_id();
        let now = (f64::from(ev.client_x()), f64::from(ev.client_y()));
        let Some((before_spread, before, count)) =
            pointers.with_value(|p| p.get(&id).map(|last| (spread(p), *last, p.len())))
        else {
            return;
        };
        pointers.update_value(|p| {
            p.insert(id, now);
        });
        if count >= 2 {
            // Two fingers: zoom by how much further apart they are now.
            let after = pointers.with_value(spread);
            if let (Some(b), Some(a)) = (before_spread, after)
                && b > 0.0
            {
                zoom_by(a / b);
            }
        } else if scale.get_untracked() > MIN {
            shift.update(|s| *s = (s.0 + now.0 - before.0, s.1 + now.1 - before.1));
        }
    };
    let up = move |ev: web_sys::PointerEvent| {
        pointers.update_value(|p| {
            p.remove(&ev.pointer_id());
        });
    };
    let wheel = move |ev: web_sys::WheelEvent| {
        ev.prevent_default();
        zoom_by(if ev.delta_y() < 0.0 { 1.25 } else { 0.8 });
    };
    view! {
        {move || photo.get().map(|sha| view! {
            <div id="photo-zoom" class="photo-zoom" role="dialog" aria-label="photo, zoomable">
                <div class="zoom-bar">
                    <button id="zoom-out" type="button" class="small" on:click=move |_| zoom_by(0.8)>"−"</button>
                    <span id="zoom-level">{move || format!("{:.0}%", scale.get() * 100.0)}</span>
                    <button id="zoom-in" type="button" class="small" on:click=move |_| zoom_by(1.25)>"+"</button>
                    <button id="zoom-fit" type="button" class="small" on:click=move |_| reset()>"Fit"</button>
                    <a id="zoom-original" href=format!("/photos/{sha}/original") target="_blank" rel="noopener">"Original (with EXIF)"</a>
                    <button id="zoom-close" type="button" class="small" on:click=move |_| close()>"Close"</button>
                </div>
                <div class="zoom-stage" on:wheel=wheel on:pointerdown=down on:pointermove=moved on:pointerup=up on:pointercancel=up>
                    <img id="zoom-image" src=format!("/photos/{sha}") alt="the photo, large" draggable="false"
                        style=move || { let (x, y) = shift.get(); format!("transform: translate({x:.0}px, {y:.0}px) scale({:.3})", scale.get()) } />
                </div>
            </div>
        })}
    }
}

#[component]
fn RecordReview(client_id: String, back: impl Fn() + Copy + 'static) -> impl IntoView {
    let detail = RwSignal::new(None::<ReviewDetail>);
    let problem = RwSignal::new(String::new());
    let zoomed = RwSignal::new(None::<String>);
    // Bumping `reloads` fetches the record again (after every decision).
    let reloads = RwSignal::new(0u32);
    let id = client_id.clone();
    Effect::new(move |_| {
        reloads.track();
        let id = id.clone();
        leptos::task::spawn_local(async move {
            match call("GET", &format!("/api/review/records/{id}"), None)
                .await
                .and_then(|b| serde_json::from_str::<ReviewDetail>(&b).map_err(|e| e.to_string()))
            {
                Ok(d) => detail.set(Some(d)),
                Err(err) => problem.set(err),
            }
        });
    });
    let load = move || reloads.update(|n| *n = n.wrapping_add(1));
    let species = RwSignal::new(String::new());
    let rank = RwSignal::new("species".to_owned());
    let remark = RwSignal::new(String::new());
    let message = RwSignal::new(String::new());
    let act_id = client_id.clone();
    let act = move |action: serde_json::Value| {
        let id = act_id.clone();
        leptos::task::spawn_local(async move {
            match call("POST", &format!("/api/review/records/{id}/actions"), Some(action.to_string())).await {
                Ok(_) => {
                    problem.set(String::new());
                    message.set(String::new());
                    load();
                }
                Err(err) => problem.set(err),
            }
        });
    };
    let confirm = {
        let act = act.clone();
        move |_| {
            let remark_text = remark.get_untracked();
            act(
                serde_json::json!({"action": "confirm", "scientific_name": species.get_untracked(), "taxon_rank": rank.get_untracked(),
                "remark": if remark_text.is_empty() { serde_json::Value::Null } else { remark_text.into() }}),
            )
        }
    };
    let ask = {
        let act = act.clone();
        move |_| act(serde_json::json!({"action": "request_details", "message": message.get_untracked()}))
    };
    let refuse = move |_| act(serde_json::json!({"action": "not_confirmable", "reason": message.get_untracked()}));

    view! {
        <button type="button" class="small" on:click=move |_| back()>"← Back to the queue"</button>
        <p class="problems" role="alert">{move || problem.get()}</p>
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
                        <img class="review-photo" src=format!("/photos/{}", p.sha256) alt=format!("photo {} of the record: tap to open it large", i + 1) />
                    </button>
                }
            }).collect_view();
            view! {
                <article id="record-review" data-state=d.record.review_state.code()>
                    <h3>{format!("{} · {}", sub.species_guess.as_ref().map(|g| g.as_str().to_owned()).unwrap_or_else(|| "unnamed".into()), d.record.review_state.label())}</h3>
                    <div class="photos">{photos}</div>
                    <img class="place-map" src=format!("/api/review/records/{}/map.svg", sub.client_id) alt="map of where the record and its photos were made" />
                    <table class="when-where">
                        <tr><th></th><th>"when"</th><th>"where"</th><th></th></tr>
                        {time_and_place("device", "device".into(), Some(crate::readable::time(&sub.observed_at)), position.map(|p| p.latitude.get()), position.map(|p| p.longitude.get()),
                            position.and_then(|p| p.accuracy_m).map(|a| format!("±{:.0} m", a.get())))}
                        {photo_rows(&d.record.photos)}
                    </table>
                    <ul class="photo-checks">{photo_checks(&d.record.photos)}</ul>
                    <ul class="fields">
                        <li>{format!("count {} · {} · {} · sex {}", sub.count.get(), sub.condition.label(), sub.setting.label(), sub.sex.dwc())}</li>
                        {sub.length.map(|l| view! { <li>{format!("{:.1} cm {} ({:?})", l.value.centimetres(), l.kind.label(), l.method).to_lowercase()}</li> })}
                        {(!sub.human_signs.is_empty()).then(|| view! { <li>{format!("signs: {}", sub.human_signs.iter().map(|s| s.label()).collect::<Vec<_>>().join(", "))}</li> })}
                        {sub.notes.as_ref().map(|n| view! { <li>{format!("notes: {}", n.as_str())}</li> })}
                        {sub.observer_name.as_ref().map(|n| view! { <li>{format!("observer: {}", n.as_str())}</li> })}
                    </ul>
                    {key_section(sub.key_choice.clone(), d.key.clone())}
                    <h4>"Flags and priority"</h4>
                    <ul class="flags">{d.priority_reasons.iter().map(|r| view! { <li>{r.clone()}</li> }).collect_view()}</ul>
                    <DuplicatesOf detail=d.clone() reloads=reloads problem=problem />
                    <h4>"Identifications"</h4>
                    <ol class="identifications">{d.identifications.iter().map(|i| view! {
                        <li class=if i.current { "current" } else { "superseded" }>{format!("{} ({}) by {} on {} [{}]{}", i.taxon_name, i.taxon_rank.clone().unwrap_or_else(|| "rank not given".into()),
                            i.identified_by.clone().unwrap_or_else(|| "an observer who gave no name".into()), i.identified_at.format("%Y-%m-%d"), i.basis, i.remarks.as_ref().map(|r| format!(": {r}")).unwrap_or_default())}</li>
                    }).collect_view()}</ol>
                    <h4>"Messages"</h4>
                    <ul class="messages">{d.messages.iter().map(|m| view! { <li>{format!("{}: {}", m.author.clone().unwrap_or_else(|| m.author_role.code().into()), m.body)}</li> }).collect_view()}</ul>
                    <h4>"History"</h4>
                    <ol class="events">{d.events.iter().map(|e| view! { <li>{format!("{} {} → {} by {}: {}{}", e.at.format("%Y-%m-%d %H:%M"), e.from_state.label(), e.to_state.label(), e.by.clone().unwrap_or_default(),
                        e.detail.clone().unwrap_or_default(), e.reason.as_ref().map(|r| format!(" — “{r}”")).unwrap_or_default())}</li> }).collect_view()}</ol>
                </article>
            }
        })}
        <fieldset class="actions-review">
            <legend>"Decide"</legend>
            <div class="row">
                <label>"Scientific name" <input id="confirm-name" prop:value=move || species.get() on:input=move |ev| species.set(event_target_value(&ev)) /></label>
                <label>"Rank" <select id="confirm-rank" on:change=move |ev| rank.set(event_target_value(&ev))>
                    {shared_types::KEY_RANKS.iter().map(|r| view! { <option value=*r>{*r}</option> }).collect_view()}
                </select></label>
            </div>
            <label>"Remark" <input id="confirm-remark" prop:value=move || remark.get() on:input=move |ev| remark.set(event_target_value(&ev)) /></label>
            <button id="confirm" type="button" class="primary" on:click=confirm>"Confirm"</button>
            <label>"Message to the observer, or the reason" <textarea id="review-message" rows="2" prop:value=move || message.get() on:input=move |ev| message.set(event_target_value(&ev))></textarea></label>
            <div class="actions">
                <button id="ask-details" type="button" on:click=ask>"Ask the observer"</button>
                <button id="not-confirmable" type="button" on:click=refuse>"Not confirmable"</button>
            </div>
        </fieldset>
    }
}

/// A person with a sign-in, as the admin screen lists them.
#[derive(Debug, Clone, PartialEq, serde::Deserialize)]
struct StaffPerson {
    username: Option<String>,
    role: Role,
    display_name: Option<String>,
    disabled: bool,
}

/// One person on the people screen: role, a new password, on or off.
#[component]
fn PersonRow(
    person: StaffPerson,
    reload: impl Fn() + Copy + Send + Sync + 'static,
    problem: RwSignal<String>,
    note: RwSignal<String>,
) -> impl IntoView {
    let name = person.username.clone().unwrap_or_default();
    let new_password = RwSignal::new(String::new());
    let put = move |path: String, body: serde_json::Value, done: String| {
        leptos::task::spawn_local(async move {
            match call("PUT", &path, Some(body.to_string())).await {
                Ok(_) => {
                    problem.set(String::new());
                    note.set(done);
                    reload();
                }
                Err(err) => problem.set(err),
            }
        });
    };
    let (role_name, password_name, toggle_name) = (name.clone(), name.clone(), name.clone());
    let change_role = move |ev: leptos::ev::Event| {
        let role = event_target_value(&ev);
        put(
            format!("/api/people/{role_name}/role"),
            serde_json::json!({ "role": role }),
            format!("{role_name} is now {role}."),
        );
    };
    let reset = move |_| {
        let password = new_password.get_untracked();
        new_password.set(String::new());
        put(
            format!("/api/people/{password_name}/password"),
            serde_json::json!({ "password": password }),
            format!("{password_name} has a new password; their sign-ins ended."),
        );
    };
    let turn_to = !person.disabled;
    let toggle = move |_| {
        let words = if turn_to { "turned off" } else { "turned on" };
        put(
            format!("/api/people/{toggle_name}/disabled"),
            serde_json::json!({ "disabled": turn_to }),
            format!("{toggle_name}'s sign-in is {words}."),
        );
    };
    view! {
        <li class="person" data-username=name.clone()>
            <span class="who">{format!("{name} · {} · {}{}", person.role.code(), person.display_name.clone().unwrap_or_default(), if person.disabled { " · turned off" } else { "" })}</span>
            <label>"Role" <select class="person-role" on:change=change_role>
                <option value="reviewer" selected=person.role == Role::Reviewer>"reviewer"</option>
                <option value="admin" selected=person.role == Role::Admin>"admin"</option>
            </select></label>
            <label>"New password" <input class="person-password" type="password" autocomplete="new-password" prop:value=move || new_password.get() on:input=move |ev| new_password.set(event_target_value(&ev)) /></label>
            <button type="button" class="small person-reset" on:click=reset>"Set password"</button>
            <button type="button" class="small person-toggle" on:click=toggle>{if person.disabled { "Turn on" } else { "Turn off" }}</button>
        </li>
    }
}

/// `#people`: the admin's screen to add reviewers and admins, change their role, set a
/// new password, turn sign-ins off and on, and read the trail of those changes.
#[component]
pub fn PeopleScreen() -> impl IntoView {
    let people = RwSignal::new(Vec::<StaffPerson>::new());
    let events = RwSignal::new(Vec::<PersonEvent>::new());
    let problem = RwSignal::new(String::new());
    let note = RwSignal::new(String::new());
    let form = RwSignal::new((String::new(), String::new(), String::new(), "reviewer".to_owned()));
    let reload = move || {
        leptos::task::spawn_local(async move {
            match call("GET", "/api/people", None)
                .await
                .and_then(|b| serde_json::from_str::<Vec<StaffPerson>>(&b).map_err(|e| e.to_string()))
            {
                Ok(list) => people.set(list),
                Err(err) => problem.set(format!("{err} (sign in as an admin under Review first)")),
            }
            if let Ok(list) = call("GET", "/api/people/events", None)
                .await
                .and_then(|b| serde_json::from_str::<Vec<PersonEvent>>(&b).map_err(|e| e.to_string()))
            {
                events.set(list);
            }
        });
    };
    reload();
    let add = move |_| {
        let (username, display_name, password, role) = form.get_untracked();
        let body =
            serde_json::json!({"username": username, "display_name": display_name, "password": password, "role": role})
                .to_string();
        leptos::task::spawn_local(async move {
            match call("POST", "/api/people", Some(body)).await {
                Ok(_) => {
                    form.set((String::new(), String::new(), String::new(), "reviewer".into()));
                    problem.set(String::new());
                    reload();
                }
                Err(err) => problem.set(err),
            }
        });
    };
    view! {
        <section class="card people">
            <h2>"People"</h2>
            <p class="hint">"Observers need no sign-in: their phone gets its own identity. Contacts never leave the server."</p>
            <p class="problems" role="alert">{move || problem.get()}</p>
            <p id="people-note" class="hint">{move || note.get()}</p>
            <ul id="people-list">
                {move || people.get().into_iter().map(|p| view! { <PersonRow person=p reload=reload problem=problem note=note /> }).collect_view()}
            </ul>
            <fieldset>
                <legend>"Add a person"</legend>
                <div class="row">
                    <label>"Username" <input id="new-username" prop:value=move || form.with(|f| f.0.clone()) on:input=move |ev| form.update(|f| f.0 = event_target_value(&ev)) /></label>
                    <label>"Name shown" <input id="new-display-name" prop:value=move || form.with(|f| f.1.clone()) on:input=move |ev| form.update(|f| f.1 = event_target_value(&ev)) /></label>
                </div>
                <div class="row">
                    <label>"Password (10+ characters)" <input id="new-password" type="password" autocomplete="new-password" prop:value=move || form.with(|f| f.2.clone()) on:input=move |ev| form.update(|f| f.2 = event_target_value(&ev)) /></label>
                    <label>"Role" <select id="new-role" on:change=move |ev| form.update(|f| f.3 = event_target_value(&ev))>
                        <option value="reviewer">"reviewer"</option>
                        <option value="admin">"admin"</option>
                    </select></label>
                </div>
                <button id="add-person" type="button" class="primary" on:click=add>"Add"</button>
            </fieldset>
            <h3>"Changes to sign-ins"</h3>
            <ol id="people-events">
                {move || events.get().into_iter().map(|e| view! {
                    <li>{format!("{} · {} · {}{} · by {}", e.at.format("%Y-%m-%d %H:%M"), e.username, e.action.replace('_', " "),
                        e.detail.map(|d| format!(" ({d})")).unwrap_or_default(), e.by.unwrap_or_else(|| "the server's command line".into()))}</li>
                }).collect_view()}
            </ol>
            <a href="#review">"← Review"</a>
        </section>
    }
}

/// Other reports that may be the same animal, beside this one: photos, distance, time
/// gap, lengths and the reasons; and the decision — same animal (merge), different
/// animals, or undo a merge.
#[component]
fn DuplicatesOf(detail: ReviewDetail, reloads: RwSignal<u32>, problem: RwSignal<String>) -> impl IntoView {
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
                    let body = serde_json::json!({ "same_animal": same }).to_string();
                    match call("POST", &format!("/api/review/records/{this_id}/duplicates/{other_id}"), Some(body)).await {
                        Ok(_) => reload(),
                        Err(err) => problem.set(err),
                    }
                });
            }
        };
        let undo = dup.merge_id.map(|merge| {
            move |_| {
                leptos::task::spawn_local(async move {
                    match call("POST", &format!("/api/review/merges/{merge}/undo"), None).await {
                        Ok(_) => reload(),
                        Err(err) => problem.set(err),
                    }
                });
            }
        });
        let same = decide.clone();
        let apart = decide;
        let undecided = dup.decision.is_none();
        view! {
            <li class="duplicate" data-other=other_id>
                <p><b>{format!("score {:.2}", dup.score)}</b>{format!(" · {} · {:.1} h apart · {} here, {} there",
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
