//! The reviewers' screens (`#review`): sign in, the queue in the order that matters
//! with why, a record with everything needed to decide — photos, the device's and the
//! photos' own time and place, all fields, the key's answers, flags, identification
//! history, messages and audit trail — and the actions: confirm (at any rank, possibly
//! changing the species), ask the observer for details, or mark not confirmable.
//! Admins also get the people screen (`#people`). Needs a connection: review happens
//! at a desk, and the server decides.

use leptos::prelude::*;
use shared_types::{QueueItem, ReviewDetail, Role, SessionInfo};

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
        let body = serde_json::json!({"username": username.get_untracked(), "password": password.get_untracked()}).to_string();
        leptos::task::spawn_local(async move {
            match call("POST", "/api/session", Some(body)).await.and_then(|b| serde_json::from_str::<SessionInfo>(&b).map_err(|e| e.to_string())) {
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

#[component]
fn Queue(role: Role, signed_out: impl Fn() + Copy + 'static) -> impl IntoView {
    let items = RwSignal::new(Vec::<QueueItem>::new());
    let open = RwSignal::new(None::<String>);
    let state_filter = RwSignal::new(String::new());
    let problem = RwSignal::new(String::new());
    let reload = move || {
        let state = state_filter.get_untracked();
        leptos::task::spawn_local(async move {
            let url = if state.is_empty() { "/api/review/queue".to_owned() } else { format!("/api/review/queue?state={state}") };
            match call("GET", &url, None).await.and_then(|b| serde_json::from_str::<Vec<QueueItem>>(&b).map_err(|e| e.to_string())) {
                Ok(list) => items.set(list),
                Err(err) => problem.set(err),
            }
        });
    };
    reload();
    let sign_out = move |_| {
        leptos::task::spawn_local(async move {
            let _ = call("DELETE", "/api/session", None).await;
            signed_out();
        });
    };
    view! {
        <div class="row spread">
            <label>"Show" <select id="queue-state" on:change=move |ev| { state_filter.set(event_target_value(&ev)); reload(); }>
                <option value="">"to review"</option>
                <option value="confirmed">"confirmed"</option>
                <option value="not_confirmable">"not confirmable"</option>
                <option value="any">"all"</option>
            </select></label>
            {(role == Role::Admin).then(|| view! { <a href="#people">"People"</a> })}
            <button type="button" class="small" on:click=sign_out>"Sign out"</button>
        </div>
        <p class="problems">{move || problem.get()}</p>
        {move || match open.get() {
            Some(id) => view! { <RecordReview client_id=id back=move || { open.set(None); reload(); } /> }.into_any(),
            None => view! {
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
            }.into_any(),
        }}
    }
}

fn time_and_place(label: &str, when: Option<String>, lat: Option<f64>, lon: Option<f64>, extra: Option<String>) -> impl IntoView + use<> {
    let place = match (lat, lon) {
        (Some(lat), Some(lon)) => format!("{lat:.5}, {lon:.5}"),
        _ => "—".into(),
    };
    view! { <tr><th>{label.to_owned()}</th><td>{when.unwrap_or_else(|| "—".into())}</td><td>{place}</td><td>{extra.unwrap_or_default()}</td></tr> }
}

#[component]
fn RecordReview(client_id: String, back: impl Fn() + Copy + 'static) -> impl IntoView {
    let detail = RwSignal::new(None::<ReviewDetail>);
    let problem = RwSignal::new(String::new());
    // Bumping `reloads` fetches the record again (after every decision).
    let reloads = RwSignal::new(0u32);
    let id = client_id.clone();
    Effect::new(move |_| {
        reloads.track();
        let id = id.clone();
        leptos::task::spawn_local(async move {
            match call("GET", &format!("/api/review/records/{id}"), None).await.and_then(|b| serde_json::from_str::<ReviewDetail>(&b).map_err(|e| e.to_string())) {
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
            act(serde_json::json!({"action": "confirm", "scientific_name": species.get_untracked(), "taxon_rank": rank.get_untracked(),
                "remark": if remark_text.is_empty() { serde_json::Value::Null } else { remark_text.into() }}))
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
        {move || detail.get().map(|d| {
            let sub = d.record.submission.clone();
            if species.get_untracked().is_empty() {
                if let Some(current) = d.identifications.iter().find(|i| i.current) {
                    species.set(current.taxon_name.clone());
                }
            }
            let position = sub.position;
            let photos = d.record.photos.iter().map(|p| {
                // The display copy on the page; a tap opens the original, full size.
                let url = format!("/photos/{}", p.sha256);
                let link = format!("/photos/{}/original", p.sha256);
                view! { <a href=link target="_blank"><img class="review-photo" src=url alt="photo of the record" /></a> }
            }).collect_view();
            let exif_rows = d.record.photos.iter().enumerate().map(|(i, p)| {
                let (when, lat, lon, source) = crate::readable::photo_facts(p);
                time_and_place(&format!("photo {}", i + 1), when, lat, lon, source)
            }).collect_view();
            let key_answers = sub.key_choice.as_ref().map(|k| view! {
                <p>{format!("Guided key: {} ({}, {:.0}%) from answers: {}", k.scientific_name.as_str(), k.taxon_rank, k.probability * 100.0,
                    k.answers.iter().map(|(c, s)| format!("{c} = {s}")).collect::<Vec<_>>().join(", "))}</p>
            });
            view! {
                <article id="record-review" data-state=d.record.review_state.code()>
                    <h3>{format!("{} · {}", sub.species_guess.as_ref().map(|g| g.as_str().to_owned()).unwrap_or_else(|| "unnamed".into()), d.record.review_state.label())}</h3>
                    <div class="photos">{photos}</div>
                    <img class="place-map" src=format!("/api/review/records/{}/map.svg", sub.client_id) alt="map of where the record and its photos were made" />
                    <table class="when-where">
                        <tr><th></th><th>"when"</th><th>"where"</th><th></th></tr>
                        {time_and_place("device", Some(crate::readable::time(&sub.observed_at)), position.map(|p| p.latitude.get()), position.map(|p| p.longitude.get()),
                            position.and_then(|p| p.accuracy_m).map(|a| format!("±{:.0} m", a.get())))}
                        {exif_rows}
                    </table>
                    <ul class="fields">
                        <li>{format!("count {} · {} · {} · sex {}", sub.count.get(), sub.condition.label(), sub.setting.label(), sub.sex.dwc())}</li>
                        {sub.length.map(|l| view! { <li>{format!("{:.1} cm {} ({:?})", l.value.centimetres(), l.kind.label(), l.method).to_lowercase()}</li> })}
                        {(!sub.human_signs.is_empty()).then(|| view! { <li>{format!("signs: {}", sub.human_signs.iter().map(|s| s.label()).collect::<Vec<_>>().join(", "))}</li> })}
                        {sub.notes.as_ref().map(|n| view! { <li>{format!("notes: {}", n.as_str())}</li> })}
                        {sub.observer_name.as_ref().map(|n| view! { <li>{format!("observer: {}", n.as_str())}</li> })}
                    </ul>
                    {key_answers}
                    <h4>"Flags and priority"</h4>
                    <ul class="flags">{d.priority_reasons.iter().map(|r| view! { <li>{r.clone()}</li> }).collect_view()}</ul>
                    <DuplicatesOf detail=d.clone() reloads=reloads problem=problem />
                    <h4>"Identifications"</h4>
                    <ol class="identifications">{d.identifications.iter().map(|i| view! {
                        <li class=if i.current { "current" } else { "superseded" }>{format!("{} ({}) by {} on {} [{}]{}", i.taxon_name, i.taxon_rank.clone().unwrap_or_else(|| "rank not given".into()),
                            i.identified_by.clone().unwrap_or_else(|| "unknown".into()), i.identified_at.format("%Y-%m-%d"), i.basis, i.remarks.as_ref().map(|r| format!(": {r}")).unwrap_or_default())}</li>
                    }).collect_view()}</ol>
                    <h4>"Messages"</h4>
                    <ul class="messages">{d.messages.iter().map(|m| view! { <li>{format!("{}: {}", m.author.clone().unwrap_or_else(|| m.author_role.code().into()), m.body)}</li> }).collect_view()}</ul>
                    <h4>"History"</h4>
                    <ol class="events">{d.events.iter().map(|e| view! { <li>{format!("{} {} → {} by {} {}", e.at.format("%Y-%m-%d %H:%M"), e.from_state.label(), e.to_state.label(), e.by.clone().unwrap_or_default(), e.detail.clone().unwrap_or_default())}</li> }).collect_view()}</ol>
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

/// `#people`: the admin's screen to add reviewers and admins and turn sign-ins off.
#[component]
pub fn PeopleScreen() -> impl IntoView {
    let people = RwSignal::new(Vec::<StaffPerson>::new());
    let problem = RwSignal::new(String::new());
    let form = RwSignal::new((String::new(), String::new(), String::new(), "reviewer".to_owned()));
    let reload = move || {
        leptos::task::spawn_local(async move {
            match call("GET", "/api/people", None).await.and_then(|b| serde_json::from_str::<Vec<StaffPerson>>(&b).map_err(|e| e.to_string())) {
                Ok(list) => people.set(list),
                Err(err) => problem.set(format!("{err} (sign in as an admin under Review first)")),
            }
        });
    };
    reload();
    let add = move |_| {
        let (username, display_name, password, role) = form.get_untracked();
        let body = serde_json::json!({"username": username, "display_name": display_name, "password": password, "role": role}).to_string();
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
    let toggle = move |username: String, disabled: bool| {
        let body = serde_json::json!({ "disabled": disabled }).to_string();
        leptos::task::spawn_local(async move {
            match call("PUT", &format!("/api/people/{username}/disabled"), Some(body)).await {
                Ok(_) => reload(),
                Err(err) => problem.set(err),
            }
        });
    };
    view! {
        <section class="card people">
            <h2>"People"</h2>
            <p class="hint">"Observers need no sign-in: their phone gets its own identity. Contacts never leave the server."</p>
            <p class="problems" role="alert">{move || problem.get()}</p>
            <ul id="people-list">
                {move || people.get().into_iter().map(|p| {
                    let name = p.username.clone().unwrap_or_default();
                    let turn_to = !p.disabled;
                    view! {
                        <li>{format!("{name} · {} · {}{}", p.role.code(), p.display_name.clone().unwrap_or_default(), if p.disabled { " · turned off" } else { "" })}" "
                            <button type="button" class="small" on:click=move |_| toggle(name.clone(), turn_to)>{if p.disabled { "Turn on" } else { "Turn off" }}</button>
                        </li>
                    }
                }).collect_view()}
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
    let length_of = |r: &shared_types::RecordView| r.submission.length.map(|l| format!("{:.0} cm {}", l.value.centimetres(), l.kind.label())).unwrap_or_else(|| "no length".into());
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
    }.into_any()
}
