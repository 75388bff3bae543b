//! The record form: photos, time, position, what and how big, condition and setting.
//! Saving puts the record (and its photos) in the outbox first, or keeps it as a
//! draft; sending happens afterwards, whatever the signal. The fields and their checks
//! are `data::form_fields`; this file only lays them out.

use leptos::prelude::*;
use shared_types::codes::{code, from_code};
use shared_types::{
    Condition, HumanSign, LengthKind, LengthUnit, LifeStage, MeasureMethod, PositionSource, Setting, Sex, Submission,
};
use uuid::Uuid;

use crate::data::form_fields::{Control, FormFields, Problem, WhenSource};
use crate::data::outbox::{self, Entry, Outbox, SyncState};
use crate::data::photos::PickedPhoto;
use crate::data::time::{self, BrowserZone};
use crate::data::words::{self, t, t_args};
use crate::data::{checklist, device, identity, key, labels, page, sync, walk_track};
use crate::screens::record::key::KeyPanel;
use crate::screens::record::live::LivePanel;
use crate::screens::record::photos::PhotoPicker;

/// Fills the position from this phone, telling the observer how it went.
fn locate(fields: RwSignal<FormFields>, note: RwSignal<String>) {
    note.set(t("form-finding-position"));
    leptos::task::spawn_local(async move {
        match device::current_position().await {
            Ok(fix) => {
                fields.update(|f| f.set_device_position(fix.latitude, fix.longitude, fix.accuracy));
                note.set(t_args(
                    "form-position-from-phone",
                    &[("fix", page::fix_words(fix.accuracy, fix.at, js_sys::Date::now()).into())],
                ));
            }
            Err(err) => note.set(t_args("form-no-position", &[("problem", err.into())])),
        }
    });
}

/// The form's first fix, at opening: used unless a photo's place or a typed one is there.
fn first_fix(fields: RwSignal<FormFields>, note: RwSignal<String>) {
    note.set(t("form-finding-position"));
    leptos::task::spawn_local(async move {
        match device::current_position().await {
            Ok(fix) => {
                let mut form = fields.get_untracked();
                if form.note_device_fix(fix.latitude, fix.longitude, fix.accuracy) {
                    let fix = page::fix_words(fix.accuracy, fix.at, js_sys::Date::now());
                    note.set(t_args("form-position-from-phone", &[("fix", fix.into())]));
                } else {
                    note.set(String::new());
                }
                fields.set(form);
            }
            Err(err) => note.set(t_args("form-no-position", &[("problem", err.into())])),
        }
    });
}

/// A fix younger than this, from the walk's position watch, is fresh enough for a find.
const FRESH_FIX_SECONDS: f64 = 30.0;

/// On a walk the walker moves on between finds: a fix taken at saving (the walk's watch's
/// latest if it is fresh, else one asked for now) replaces the one from when the form
/// opened, unless the place is a photo's or typed. The words say how good and how old it
/// is, or why there is none.
async fn fresh_fix_on_walk(fields: RwSignal<FormFields>) -> Option<String> {
    let from_device = fields.with_untracked(|f| matches!(f.position_source, None | Some(PositionSource::Device)));
    if !from_device {
        return None;
    }
    let now = js_sys::Date::now();
    let watched = walk_track::latest_fix()
        .filter(|fix| now - fix.at <= FRESH_FIX_SECONDS * 1000.0)
        .map(|fix| (fix.latitude, fix.longitude, fix.accuracy, fix.at));
    let fix = match watched {
        Some(fix) => Ok(fix),
        None => device::fresh_position().await.map(|fix| (fix.latitude, fix.longitude, fix.accuracy, fix.at)),
    };
    Some(match fix {
        Ok((latitude, longitude, accuracy, at)) => {
            fields.update(|f| {
                f.note_device_fix(latitude, longitude, accuracy);
            });
            t_args("form-position-at-saving", &[("fix", page::fix_words(accuracy, at, js_sys::Date::now()).into())])
        }
        Err(err) => t_args("form-no-position-at-saving", &[("problem", err.into())]),
    })
}

/// The record form's state that saving reads and clears (each a cheap signal handle).
#[derive(Clone, Copy)]
struct FormSignals {
    fields: RwSignal<FormFields>,
    photos: RwSignal<Vec<PickedPhoto>, LocalStorage>,
    client_id: RwSignal<Uuid>,
    problems: RwSignal<Vec<Problem>>,
    saved_note: RwSignal<String>,
    key_open: RwSignal<bool>,
    photo_note: RwSignal<String>,
    position_note: RwSignal<String>,
}

/// Saves the form as a record on this phone (`state`: to send, or a draft), then clears
/// it for the next find; on a walk, with a fresh position first. Nothing is cleared when
/// saving fails.
async fn save_form(state: SyncState, outbox: Outbox, form: FormSignals) {
    let FormSignals { fields, photos, client_id, problems, saved_note, key_open, photo_note, position_note } = form;
    let walk = outbox.walk_going_on();
    let fix_words = match walk {
        Some(_) => fresh_fix_on_walk(fields).await,
        None => None,
    };
    let name = identity::observer_name();
    let built = fields.with_untracked(|f| {
        FormFields { observer_name: name, ..f.clone() }.to_submission(
            client_id.get_untracked(),
            &BrowserZone,
            chrono::Utc::now(),
        )
    });
    let submission = match built {
        // A record made while a walk goes on belongs to it.
        Ok(s) => Submission { walk_client_id: walk.map(|w| w.client_id), ..s },
        Err(list) => {
            problems.set(list);
            saved_note.set(t("form-not-saved-yet"));
            return;
        }
    };
    problems.set(Vec::new());
    let picked = photos.get_untracked();
    let mut submission = submission;
    submission.photo_exif = picked.iter().map(|p| p.exif.clone()).collect();
    let blobs: Vec<web_sys::Blob> = picked.iter().map(|p| p.upload.clone()).collect();
    let new_bytes: f64 = blobs.iter().map(|b| b.size()).sum();
    let warning = match outbox::storage_room(new_bytes).await {
        Ok(warning) => warning.unwrap_or_default(),
        Err(full) => {
            saved_note.set(full);
            return;
        }
    };
    let waiting = state == SyncState::Waiting;
    let urgent = submission.is_urgent();
    let entry = Entry::new(submission, state, blobs.len());
    match outbox::save(&entry, Some(&blobs)).await {
        Ok(()) => {
            let saved = if waiting && urgent {
                t("form-saved-live")
            } else if waiting {
                t("form-saved")
            } else {
                t("form-saved-draft")
            };
            let fix_words = fix_words.map(|w| format!(" {w}")).unwrap_or_default();
            saved_note.set(format!("{saved}{fix_words}{warning}"));
            fields.set(FormFields::fresh(time::now_for_input(), identity::observer_name()));
            key_open.set(false);
            photos.set(Vec::new());
            photo_note.set(String::new());
            client_id.set(Uuid::new_v4());
            outbox.editing.set(None);
            first_fix(fields, position_note);
            outbox.reload().await;
            if waiting {
                sync::request(outbox);
            }
        }
        // Nothing is cleared: the observer can free space and save again.
        Err(err) => saved_note.set(t_args("form-not-saved", &[("problem", err.into())])),
    }
}

/// The words about one control, shown right under it.
fn beside(problems: RwSignal<Vec<Problem>>, control: Control) -> impl IntoView {
    move || {
        {
            problems.with(|list| {
                list.iter()
                    .filter(|p| p.control == Some(control))
                    .map(|p| p.words.clone())
                    .collect::<Vec<_>>()
                    .join("; ")
            })
        }
        .into_view()
    }
}

fn problem_line(problems: RwSignal<Vec<Problem>>, control: Control) -> impl IntoView {
    view! {
        <p class="field-problem" data-control=control.code() role="alert">{beside(problems, control)}</p>
    }
}

/// Opens a record the server did not accept in the form, with its photos and the
/// server's words beside the control they are about.
fn open_for_edit(
    id: String,
    fields: RwSignal<FormFields>,
    photos: RwSignal<Vec<PickedPhoto>, LocalStorage>,
    client_id: RwSignal<Uuid>,
    problems: RwSignal<Vec<Problem>>,
    saved_note: RwSignal<String>,
) {
    leptos::task::spawn_local(async move {
        let Ok(Some(entry)) = outbox::find(&id).await else { return };
        let blobs = device::photos_of(&id).await.unwrap_or_default();
        let picked = blobs
            .into_iter()
            .enumerate()
            .map(|(i, blob)| PickedPhoto {
                name: t_args("form-photo-name", &[("number", (i + 1).into())]),
                preview_url: web_sys::Url::create_object_url_with_blob(&blob).unwrap_or_default(),
                upload: blob,
                upload_sha256: None,
                exif: entry.submission.photo_exif.get(i).cloned().unwrap_or_default(),
            })
            .collect();
        fields.set(FormFields::from_submission(&entry.submission, &BrowserZone));
        photos.set(picked);
        client_id.set(entry.submission.client_id);
        if let SyncState::Refused { reason, field } = &entry.sync {
            problems.set(vec![Problem::from_server(field.as_deref(), reason)]);
        }
        saved_note.set(t("form-editing-refused"));
        if let Some(form) =
            web_sys::window().and_then(|w| w.document()).and_then(|d| d.get_element_by_id("record-form"))
        {
            form.scroll_into_view();
        }
    });
}

/// The form. Saving puts the record (and its photos) in the outbox first; sending
/// happens afterwards, whatever the signal.
#[component]
pub fn RecordForm(outbox: Outbox, responders: Signal<Option<String>>) -> impl IntoView {
    let fields = RwSignal::new(FormFields::fresh(time::now_for_input(), identity::observer_name()));
    let photos = RwSignal::new_local(Vec::<PickedPhoto>::new());
    let photo_note = RwSignal::new(String::new());
    let client_id = RwSignal::new(Uuid::new_v4());
    let problems = RwSignal::new(Vec::<Problem>::new());
    let position_note = RwSignal::new(String::new());
    let saved_note = RwSignal::new(String::new());
    let species_key = RwSignal::new(checklist::initial_key());
    let key_open = RwSignal::new(false);
    first_fix(fields, position_note);
    Effect::new(move |_| {
        if let Some(id) = outbox.editing.get() {
            open_for_edit(id, fields, photos, client_id, problems, saved_note);
        }
    });

    // One save at a time, the form locked while it runs: what is typed meanwhile would
    // otherwise be wiped when the save clears the form, or be saved under the same
    // record id and replace the record being saved.
    let saving = RwSignal::new(false);
    let form = FormSignals { fields, photos, client_id, problems, saved_note, key_open, photo_note, position_note };
    let save = move |state: SyncState| {
        if saving.get_untracked() {
            return;
        }
        saving.set(true);
        leptos::task::spawn_local(async move {
            save_form(state, outbox, form).await;
            saving.set(false);
        });
    };

    let time_note = move || fields.with(|f| f.time_note(&BrowserZone));
    view! {
        <form id="record-form" class="record-form" on:submit=move |ev| { ev.prevent_default(); save(SyncState::Waiting); }>
            <h2>{t("form-heading")}</h2>
            <Show when=move || fields.with(|f| f.condition != Some(Condition::Alive))>
                <button id="it-is-alive" type="button" class="alive-button"
                    on:click=move |_| fields.update(|f| f.condition = Some(Condition::Alive))>{t("form-alive")}</button>
            </Show>
            <Show when=move || fields.with(|f| f.condition == Some(Condition::Alive))>
                <LivePanel responders=responders />
            </Show>
            <fieldset id="form-lock" class="form-lock" disabled=move || saving.get()>
            <PhotoPicker photos=photos fields=fields photo_note=photo_note position_note=position_note />
            {problem_line(problems, Control::Photos)}

            <fieldset>
                <legend>{t("form-when")}</legend>
                <input id="when" type="datetime-local" aria-label=t("form-when") prop:value=move || fields.with(|f| f.when.clone())
                    on:input=move |ev| fields.update(|f| { f.when = event_target_value(&ev); f.when_source = WhenSource::Typed; }) />
                <span class="hint">{move || fields.with(|f| {
                    let zone = time::offset_label(&BrowserZone, &f.when);
                    if zone.is_empty() { String::new() } else { t_args("form-local-time", &[("zone", zone.into())]) }
                })}</span>
                {problem_line(problems, Control::When)}
                {move || time_note().map(|note| view! {
                    <div id="photo-time" class="photo-time">
                        <p id="photo-time-note">{note}</p>
                        <button id="keep-device-time" type="button" class="small"
                            on:click=move |_| fields.update(|f| f.keep_device_time_and_place())>{t("form-use-device-time")}</button>
                    </div>
                })}
            </fieldset>

            <fieldset>
                <legend>{t("form-where")}</legend>
                <div class="row">
                    <label>{t("form-latitude")}" "<input id="latitude" inputmode="decimal" prop:value=move || fields.with(|f| f.latitude.clone())
                        on:input=move |ev| fields.update(|f| { f.latitude = event_target_value(&ev); f.position_source = Some(PositionSource::Typed); }) /></label>
                    <label>{t("form-longitude")}" "<input id="longitude" inputmode="decimal" prop:value=move || fields.with(|f| f.longitude.clone())
                        on:input=move |ev| fields.update(|f| { f.longitude = event_target_value(&ev); f.position_source = Some(PositionSource::Typed); }) /></label>
                    <label>{t("form-accuracy")}" "<input id="accuracy" inputmode="decimal" prop:value=move || fields.with(|f| f.accuracy_m.clone())
                        on:input=move |ev| fields.update(|f| f.accuracy_m = event_target_value(&ev)) /></label>
                </div>
                <p class="hint">{t("form-accuracy-hint")}</p>
                {problem_line(problems, Control::Latitude)}
                {problem_line(problems, Control::Longitude)}
                {problem_line(problems, Control::Accuracy)}
                <button type="button" class="small" on:click=move |_| locate(fields, position_note)>{t("form-use-my-position")}</button>
                <span id="position-note" class="hint">{move || position_note.get()}</span>
            </fieldset>

            <fieldset>
                <legend>{t("form-what")}</legend>
                <label>{t("form-species")}
                    <input id="species" placeholder=t("form-species-example") prop:value=move || fields.with(|f| f.species_guess.clone())
                        on:input=move |ev| fields.update(|f| { f.species_guess = event_target_value(&ev); f.key_choice = None; }) /></label>
                {problem_line(problems, Control::Species)}
                {move || fields.with(|f| f.key_choice.as_ref().map(|c| view! {
                    <p id="key-choice" class="hint">{t_args("form-key-choice", &[("name", c.scientific_name.as_str().into()), ("rank", key::rank_name_of_code(&c.taxon_rank).into()), ("percent", words::number(c.probability * 100.0, 0).into())])}</p>
                }))}
                <button id="open-key" type="button" class="small" on:click=move |_| key_open.update(|o| *o = !*o)>
                    {move || if key_open.get() { t("form-hide-key") } else { t("form-open-key") }}
                </button>
                <Show when=move || key_open.get()>
                    <KeyPanel key=species_key fields=fields open=key_open />
                </Show>
                <div class="row">
                    <label>{t("form-length")}" "<input id="length" inputmode="decimal" prop:value=move || fields.with(|f| f.length_value.clone())
                        on:input=move |ev| fields.update(|f| f.length_value = event_target_value(&ev)) /></label>
                    <label>{t("form-unit")}" "<select id="length-unit" prop:value=move || fields.with(|f| code(&f.length_unit.unwrap_or(LengthUnit::Cm))) on:change=move |ev| fields.update(|f| f.length_unit = from_code(&event_target_value(&ev)))>
                        {LengthUnit::ALL.into_iter().map(|u| view! { <option value=code(&u)>{u.code()}</option> }).collect_view()}
                    </select></label>
                </div>
                {problem_line(problems, Control::Length)}
                <div class="row">
                    <label>{t("form-which-length")}" "<select id="length-kind" prop:value=move || fields.with(|f| code(&f.length_kind.unwrap_or(LengthKind::Total))) on:change=move |ev| fields.update(|f| f.length_kind = from_code(&event_target_value(&ev)))>
                        {LengthKind::ALL.into_iter().map(|k| view! { <option value=code(&k)>{labels::length_kind(k)}</option> }).collect_view()}
                    </select></label>
                    <label>{t("form-how-measured")}" "<select id="length-method" prop:value=move || fields.with(|f| code(&f.length_method.unwrap_or(MeasureMethod::Measured))) on:change=move |ev| fields.update(|f| f.length_method = from_code(&event_target_value(&ev)))>
                        <option value="measured">{t("form-measured")}</option>
                        <option value="estimated">{t("form-estimated")}</option>
                    </select></label>
                </div>
                <div class="row">
                    <label>{t("form-sex")}" "<select id="sex" prop:value=move || fields.with(|f| code(&f.sex.unwrap_or(Sex::Unknown))) on:change=move |ev| fields.update(|f| f.sex = from_code(&event_target_value(&ev)))>
                        <option value="unknown">{t("form-sex-unknown")}</option>
                        <option value="male">{t("form-sex-male")}</option>
                        <option value="female">{t("form-sex-female")}</option>
                    </select></label>
                    <label>{t("form-count")}" "<input id="count" type="number" min="1" prop:value=move || fields.with(|f| f.count.clone())
                        on:input=move |ev| fields.update(|f| f.count = event_target_value(&ev)) /></label>
                    <label>{t("form-life-stage")}" "<select id="life-stage" prop:value=move || fields.with(|f| f.life_stage.map(|s| code(&s)).unwrap_or_default()) on:change=move |ev| fields.update(|f| f.life_stage = from_code(&event_target_value(&ev)))>
                        <option value="">{t("form-not-sure")}</option>
                        {LifeStage::ALL.into_iter().map(|s| view! { <option value=code(&s)>{labels::life_stage(s)}</option> }).collect_view()}
                    </select></label>
                </div>
                <p id="claspers-hint" class="hint">{t("form-claspers-hint")}</p>
                {problem_line(problems, Control::Count)}
                <Show when=move || fields.with(|f| f.life_stage == Some(LifeStage::EggCase))>
                    <p id="egg-case-hint" class="hint">{t("form-egg-case-hint")}</p>
                </Show>
            </fieldset>

            <fieldset>
                <legend>{t("form-condition-legend")}</legend>
                <label>{t("form-condition")}" "<select id="condition" prop:value=move || fields.with(|f| f.condition.map(|c| code(&c)).unwrap_or_default()) on:change=move |ev| fields.update(|f| f.condition = from_code(&event_target_value(&ev)))>
                    <option value="">{t("form-choose")}</option>
                    {Condition::ALL.into_iter().map(|c| view! { <option value=code(&c)>{labels::condition(c)}</option> }).collect_view()}
                </select></label>
                {problem_line(problems, Control::Condition)}
                <label>{t("form-how-found")}" "<select id="setting" prop:value=move || fields.with(|f| f.setting.map(|s| code(&s)).unwrap_or_default()) on:change=move |ev| fields.update(|f| f.setting = from_code(&event_target_value(&ev)))>
                    <option value="">{t("form-choose")}</option>
                    {Setting::ALL.into_iter().map(|s| view! { <option value=code(&s)>{labels::setting(s)}</option> }).collect_view()}
                </select></label>
                {problem_line(problems, Control::HowFound)}
                <div class="checks">
                    <span>{t("form-signs")}</span>
                    {HumanSign::ALL.into_iter().map(|sign| view! {
                        <label class="check"><input type="checkbox" prop:checked=move || fields.with(|f| f.human_signs.contains(&sign))
                            on:change=move |ev| {
                                let on = event_target_checked(&ev);
                                fields.update(|f| { f.human_signs.retain(|s| *s != sign); if on { f.human_signs.push(sign); } });
                            } />{labels::human_sign(sign)}</label>
                    }).collect_view()}
                </div>
                {problem_line(problems, Control::Signs)}
                <label>{t("form-notes")}" "<textarea id="notes" rows="3" prop:value=move || fields.with(|f| f.notes.clone())
                    on:input=move |ev| fields.update(|f| f.notes = event_target_value(&ev))></textarea></label>
                {problem_line(problems, Control::Notes)}
            </fieldset>

            <ul id="form-problems" class="problems" role="alert">
                {move || problems.get().into_iter().map(|p| view! { <li>{p.sentence()}</li> }).collect_view()}
            </ul>
            <div class="actions">
                <button id="save-send" type="submit" class="primary">
                    {move || if saving.get() { t("form-saving") } else { t("form-save-send") }}
                </button>
                <button id="save-draft" type="button" on:click=move |_| save(SyncState::Draft)>{t("form-keep-draft")}</button>
            </div>
            </fieldset>
            <p id="saved-note" class="hint" role="status">{move || saved_note.get()}</p>
        </form>
    }
}
