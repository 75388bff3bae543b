//! The record form: photos, time, position, what and how big, condition and setting.
//! Its fields are plain text while typed; [`FormFields::to_submission`] turns them
//! into a checked [`Submission`] with the same checks the server runs, or into a
//! list of problems to show.

use chrono::{FixedOffset, NaiveDateTime, TimeZone};
use leptos::prelude::*;
pub use shared_types::codes::{code, from_code};
use shared_types::{
    AccuracyM, Condition, Count, HumanSign, KeyChoice, Latitude, Length, LengthKind, LengthUnit, LengthValue,
    LifeStage, Longitude, MeasureMethod, Position, PositionSource, Setting, Sex, Submission, SubmissionProblem, Text,
};
use uuid::Uuid;

use crate::device;
use crate::identity;
use crate::key::{self, KeyPanel};
use crate::outbox::{self, Entry, SyncState};
use crate::photos::{self, PickedPhoto};
use crate::sync::{self, Outbox};
use crate::walks::WalkState;

/// What the observer has typed so far, as text.
#[derive(Debug, Clone, Default)]
pub struct FormFields {
    pub when: String,
    pub latitude: String,
    pub longitude: String,
    pub accuracy_m: String,
    pub position_source: Option<PositionSource>,
    /// The preview URL of the photo whose GPS filled the position, while
    /// `position_source` is `Photo`: removing that photo clears the position.
    pub position_photo: Option<String>,
    pub species_guess: String,
    pub length_value: String,
    pub length_kind: Option<LengthKind>,
    pub length_unit: Option<LengthUnit>,
    pub length_method: Option<MeasureMethod>,
    pub sex: Option<Sex>,
    /// `None`: not said (the observer could not tell, or did not choose).
    pub life_stage: Option<LifeStage>,
    pub count: String,
    pub condition: Option<Condition>,
    pub setting: Option<Setting>,
    pub human_signs: Vec<HumanSign>,
    pub notes: String,
    pub observer_name: String,
    /// The guided key's pick, kept only while the species field still shows it.
    pub key_choice: Option<KeyChoice>,
}

fn optional_text(label: &str, text: &str, problems: &mut Vec<String>) -> Option<Text> {
    match Text::parse(text) {
        Ok(t) if t.as_str().is_empty() => None,
        Ok(t) => Some(t),
        Err(err) => {
            problems.push(format!("{label}: {err}"));
            None
        }
    }
}

/// The browser's UTC offset at a given local time (daylight saving differs by date).
pub fn offset_at(local: &NaiveDateTime) -> FixedOffset {
    let text = local.format("%Y-%m-%dT%H:%M:%S").to_string();
    let minutes_behind = js_sys::Date::new(&text.into()).get_timezone_offset();
    FixedOffset::west_opt((minutes_behind * 60.0) as i32).unwrap_or(FixedOffset::east_opt(0).expect("zero offset"))
}

impl FormFields {
    /// A fresh form: now, one animal, nothing else assumed.
    pub fn fresh(observer_name: String) -> Self {
        Self { when: local_now_for_input(), count: "1".into(), observer_name, ..Self::default() }
    }

    /// Checks everything and builds the submission, or lists every problem at once.
    pub fn to_submission(&self, client_id: Uuid) -> Result<Submission, Vec<String>> {
        let mut problems = Vec::new();
        let observed_at = NaiveDateTime::parse_from_str(&self.when, "%Y-%m-%dT%H:%M")
            .ok()
            .and_then(|local| offset_at(&local).from_local_datetime(&local).single());
        if observed_at.is_none() {
            problems.push("date and time: choose when the animal was seen".into());
        }
        let position = self.position(&mut problems);
        let length = self.length(&mut problems);
        let count = self
            .count
            .trim()
            .parse::<u32>()
            .map_err(|_| "count: a whole number".to_string())
            .and_then(|n| Count::parse(n).map_err(|e| format!("count: {e}")));
        let count = count.map_err(|p| problems.push(p)).ok();
        let condition = self.condition.or_else(|| {
            problems.push("condition: choose how the animal was found".into());
            None
        });
        let setting = self.setting.or_else(|| {
            problems.push("where: choose how it came to be seen".into());
            None
        });
        let species_guess = optional_text("species", &self.species_guess, &mut problems);
        let notes = optional_text("notes", &self.notes, &mut problems);
        let observer_name = optional_text("your name", &self.observer_name, &mut problems);
        if self.life_stage == Some(LifeStage::EggCase) && length.is_some() {
            problems.push(SubmissionProblem::LengthOfEggCase.to_string());
        }
        if !problems.is_empty() {
            return Err(problems);
        }
        Ok(Submission {
            client_id,
            observed_at: observed_at.expect("checked above"),
            position,
            species_guess,
            length,
            sex: self.sex.unwrap_or(Sex::Unknown),
            count: count.expect("checked above"),
            condition: condition.expect("checked above"),
            setting: setting.expect("checked above"),
            human_signs: self.human_signs.clone(),
            notes,
            observer_name,
            key_choice: self.key_choice.clone(),
            walk_client_id: None,
            photo_exif: Vec::new(),
            life_stage: self.life_stage,
        })
    }

    fn position(&self, problems: &mut Vec<String>) -> Option<Position> {
        if self.latitude.trim().is_empty() && self.longitude.trim().is_empty() {
            return None;
        }
        let number = |label: &str, text: &str, problems: &mut Vec<String>| match text.trim().parse::<f64>() {
            Ok(n) => Some(n),
            Err(_) => {
                problems.push(format!("{label}: a number in decimal degrees, e.g. 52.4153"));
                None
            }
        };
        let latitude = number("latitude", &self.latitude, problems)
            .and_then(|n| Latitude::parse(n).map_err(|e| problems.push(e.to_string())).ok());
        let longitude = number("longitude", &self.longitude, problems)
            .and_then(|n| Longitude::parse(n).map_err(|e| problems.push(e.to_string())).ok());
        let accuracy_m = match self.accuracy_m.trim() {
            "" => None,
            text => text.parse::<f64>().ok().and_then(|n| AccuracyM::parse(n).ok()).or_else(|| {
                problems.push("accuracy: a positive number of metres".into());
                None
            }),
        };
        Some(Position {
            latitude: latitude?,
            longitude: longitude?,
            accuracy_m,
            source: self.position_source.unwrap_or(PositionSource::Typed),
        })
    }

    fn length(&self, problems: &mut Vec<String>) -> Option<Length> {
        let text = self.length_value.trim().replace(',', ".");
        if text.is_empty() {
            return None;
        }
        let unit = self.length_unit.unwrap_or(LengthUnit::Cm);
        let value = match text
            .parse::<f64>()
            .map_err(|_| "a number".to_string())
            .and_then(|v| LengthValue::parse(v, unit).map_err(|e| e.to_string()))
        {
            Ok(value) => value,
            Err(err) => {
                problems.push(format!("length: {err}"));
                return None;
            }
        };
        Some(Length {
            kind: self.length_kind.unwrap_or(LengthKind::Total),
            value,
            method: self.length_method.unwrap_or(MeasureMethod::Measured),
        })
    }
}

/// Now, as a `datetime-local` input wants it.
fn local_now_for_input() -> String {
    let now = js_sys::Date::new_0();
    format!(
        "{:04}-{:02}-{:02}T{:02}:{:02}",
        now.get_full_year(),
        now.get_month() + 1,
        now.get_date(),
        now.get_hours(),
        now.get_minutes()
    )
}

/// "UTC+01:00" for the offset the form will use.
fn offset_label(when: &str) -> String {
    NaiveDateTime::parse_from_str(when, "%Y-%m-%dT%H:%M")
        .map(|local| format!("UTC{}", offset_at(&local)))
        .unwrap_or_default()
}

/// Above this share of the browser's storage quota the observer is warned to send.
const STORAGE_WARN_SHARE: f64 = 0.8;
/// Above this share a new record is not saved (the browser would refuse part-way); the
/// form is kept and the observer is told what to do.
const STORAGE_FULL_SHARE: f64 = 0.97;

/// Whether `new_bytes` more fit; `Err` is the sentence to show. `Ok(Some)` is a warning.
async fn storage_room(new_bytes: f64) -> Result<Option<String>, String> {
    let Some(estimate) = device::storage_estimate().await.filter(|e| e.quota > 0.0) else {
        return Ok(None);
    };
    let after = estimate.usage + new_bytes;
    let megabytes = |b: f64| b / 1e6;
    if after > STORAGE_FULL_SHARE * estimate.quota {
        return Err(format!(
            "Not saved: this phone's storage for wrackline is full ({:.0} of {:.0} MB with this record). \
             Send waiting records or free space on the phone, then save again. Your form is kept as it is.",
            megabytes(after),
            megabytes(estimate.quota)
        ));
    }
    Ok((after > STORAGE_WARN_SHARE * estimate.quota).then(|| {
        format!(
            " Warning: this phone's storage for wrackline is nearly full ({:.0} of {:.0} MB). Send waiting records soon.",
            megabytes(after),
            megabytes(estimate.quota)
        )
    }))
}

/// Fills the position from the first photo's EXIF GPS when the form has none (the
/// device gave no fix); says so beside the position.
fn prefill_from_photo(fields: RwSignal<FormFields>, note: RwSignal<String>, first: &PickedPhoto) {
    let (Some(lat), Some(lon)) = (first.exif.latitude, first.exif.longitude) else { return };
    let empty = fields.with_untracked(|f| f.latitude.trim().is_empty() && f.longitude.trim().is_empty());
    if !empty {
        return;
    }
    fields.update(|f| {
        f.latitude = format!("{lat:.6}");
        f.longitude = format!("{lon:.6}");
        f.accuracy_m =
            first.exif.horizontal_error_m.filter(|e| *e >= 1.0).map(|e| format!("{e:.0}")).unwrap_or_default();
        f.position_source = Some(PositionSource::Photo);
        f.position_photo = Some(first.preview_url.clone());
    });
    note.set("from the first photo's GPS (this device gave no position)".into());
}

/// Takes a photo off the form. A position its GPS filled goes with it (and the next
/// first photo's GPS, if any, fills it again); a position from the device or typed
/// by the observer stays.
fn remove_photo(
    photos: RwSignal<Vec<PickedPhoto>, LocalStorage>,
    fields: RwSignal<FormFields>,
    note: RwSignal<String>,
    index: usize,
) {
    let Some(removed) = photos.try_update(|p| (index < p.len()).then(|| p.remove(index))).flatten() else { return };
    let filled_by_it = fields.with_untracked(|f| {
        f.position_source == Some(PositionSource::Photo)
            && f.position_photo.as_deref() == Some(removed.preview_url.as_str())
    });
    if filled_by_it {
        fields.update(|f| {
            f.latitude.clear();
            f.longitude.clear();
            f.accuracy_m.clear();
            f.position_source = None;
            f.position_photo = None;
        });
        note.set("the position came from the removed photo and was cleared; use my position or type it".into());
        if let Some(first) = photos.with_untracked(|p| p.first().cloned()) {
            prefill_from_photo(fields, note, &first);
        }
    }
    let _ = web_sys::Url::revoke_object_url(&removed.preview_url);
}

/// True when `picked` is a photo already on the form: the same upload copy, as the
/// same photo picked twice makes (the server would keep it once).
fn already_added(photos: &[PickedPhoto], picked: &PickedPhoto) -> bool {
    picked.upload_sha256.is_some() && photos.iter().any(|p| p.upload_sha256 == picked.upload_sha256)
}

/// "this device says: 2025-06-01 14:10 (UTC+01:00) · 52.41530, -4.08290 ±9 m": the
/// record's time and the device's own fix, to set beside what each photo says.
fn device_says(fields: &FormFields) -> String {
    let place = match (fields.latitude.trim(), fields.longitude.trim(), fields.position_source) {
        (lat, lon, Some(PositionSource::Device)) if !lat.is_empty() && !lon.is_empty() => {
            format!("{lat}, {lon} ±{} m", fields.accuracy_m)
        }
        _ => "no position".to_owned(),
    };
    format!("this device says: {} ({}) · {place}", fields.when.replace('T', " "), offset_label(&fields.when))
}

/// Fills the position from the device, telling the observer how it went.
fn locate(fields: RwSignal<FormFields>, note: RwSignal<String>) {
    note.set("finding your position…".into());
    leptos::task::spawn_local(async move {
        match device::current_position().await {
            Ok(fix) => {
                fields.update(|f| {
                    f.latitude = format!("{:.6}", fix.latitude);
                    f.longitude = format!("{:.6}", fix.longitude);
                    f.accuracy_m = format!("{:.0}", fix.accuracy.max(1.0));
                    f.position_source = Some(PositionSource::Device);
                });
                note.set(format!("from this device, ±{:.0} m", fix.accuracy));
            }
            Err(err) => note.set(format!("no position from the device ({err}); type it, or try again")),
        }
    });
}

/// The form. Saving puts the record (and its photos) in the outbox first; sending
/// happens afterwards, whatever the signal.
#[component]
pub fn RecordForm(outbox: Outbox) -> impl IntoView {
    let fields = RwSignal::new(FormFields::fresh(identity::observer_name()));
    let photos = RwSignal::new_local(Vec::<PickedPhoto>::new());
    let photo_note = RwSignal::new(String::new());
    let client_id = RwSignal::new(Uuid::new_v4());
    let problems = RwSignal::new(Vec::<String>::new());
    let position_note = RwSignal::new(String::new());
    let saved_note = RwSignal::new(String::new());
    let species_key = RwSignal::new(key::initial_key());
    let key_open = RwSignal::new(false);
    key::refresh_from_server(species_key);
    locate(fields, position_note);

    let save = move |state: SyncState| {
        let submission = match fields.with(|f| f.to_submission(client_id.get())) {
            // A record made while a walk goes on belongs to it.
            Ok(s) => Submission {
                walk_client_id: outbox
                    .walks
                    .with_untracked(|w| w.iter().find(|e| e.state == WalkState::Walking).map(|e| e.client_id)),
                ..s
            },
            Err(list) => {
                problems.set(list);
                return;
            }
        };
        problems.set(Vec::new());
        let picked = photos.get();
        leptos::task::spawn_local(async move {
            let mut submission = submission;
            submission.photo_exif = picked.iter().map(|p| p.exif.clone()).collect();
            let blobs: Vec<web_sys::Blob> = picked.iter().map(|p| p.upload.clone()).collect();
            let new_bytes: f64 = blobs.iter().map(|b| b.size()).sum();
            let warning = match storage_room(new_bytes).await {
                Ok(warning) => warning.unwrap_or_default(),
                Err(full) => {
                    saved_note.set(full);
                    return;
                }
            };
            let waiting = state == SyncState::Waiting;
            let entry = Entry {
                submission,
                sync: state,
                photo_count: blobs.len(),
                last_error: None,
                walk_link_pending: None,
                walk_linked: None,
            };
            match outbox::save(&entry, Some(&blobs)).await {
                Ok(()) => {
                    identity::remember_observer_name(&fields.with_untracked(|f| f.observer_name.clone()));
                    let saved = if waiting {
                        "Saved on this phone; it will be sent when there is a connection."
                    } else {
                        "Saved as a draft on this phone."
                    };
                    saved_note.set(format!("{saved}{warning}"));
                    fields.set(FormFields::fresh(identity::observer_name()));
                    key_open.set(false);
                    photos.set(Vec::new());
                    photo_note.set(String::new());
                    client_id.set(Uuid::new_v4());
                    locate(fields, position_note);
                    sync::refresh(outbox).await;
                    if waiting {
                        sync::request(outbox);
                    }
                }
                // Nothing is cleared: the observer can free space and save again.
                Err(err) => saved_note.set(format!("Could not save on this phone: {err}. Your form is kept as it is.")),
            }
        });
    };

    let add_photos = move |ev: leptos::ev::Event| {
        let input: web_sys::HtmlInputElement = event_target(&ev);
        let added: Vec<web_sys::File> =
            input.files().map(|list| (0..list.length()).filter_map(|i| list.item(i)).collect()).unwrap_or_default();
        input.set_value("");
        leptos::task::spawn_local(async move {
            let mut refused = Vec::new();
            for file in added {
                photo_note.set(format!("preparing “{}”…", file.name()));
                match photos::pick(file).await {
                    Ok(picked) if photos.with_untracked(|p| already_added(p, &picked)) => {
                        refused.push(format!("“{}”: this photo is already added.", picked.name));
                        let _ = web_sys::Url::revoke_object_url(&picked.preview_url);
                    }
                    Ok(picked) => photos.update(|p| p.push(picked)),
                    Err(problem) => refused.push(problem),
                }
            }
            photo_note.set(refused.join(" "));
            if let Some(first) = photos.with_untracked(|p| p.first().cloned()) {
                prefill_from_photo(fields, position_note, &first);
            }
        });
    };

    view! {
        <form class="record-form" on:submit=move |ev| { ev.prevent_default(); save(SyncState::Waiting); }>
            <h2>"New record"</h2>
            <fieldset>
                <legend>"Photos"</legend>
                <label class="button photo-button">
                    "Add photo"
                    <input id="photo-input" type="file" accept="image/*" capture="environment" multiple on:change=add_photos />
                </label>
                <ul class="thumbs">
                    {move || photos.get().into_iter().enumerate().map(|(index, photo)| {
                        view! {
                            <li class="photo">
                                <img src=photo.preview_url.clone() alt=format!("photo {}: {}", index + 1, photo.name) />
                                <span class="photo-says hint">{photos::photo_says(&photo.exif)}</span>
                                <button type="button" class="small remove-photo" on:click=move |_| remove_photo(photos, fields, position_note, index)>"remove"</button>
                            </li>
                        }
                    }).collect_view()}
                </ul>
                <p class="hint">{move || format!("{} photo(s)", photos.with(|p| p.len()))}</p>
                <p id="device-says" class="hint">{move || fields.with(device_says)}</p>
                <p id="photo-note" class="problems" role="alert">{move || photo_note.get()}</p>
            </fieldset>

            <fieldset>
                <legend>"When"</legend>
                <input id="when" type="datetime-local" prop:value=move || fields.with(|f| f.when.clone())
                    on:input=move |ev| fields.update(|f| f.when = event_target_value(&ev)) />
                <span class="hint">{move || fields.with(|f| offset_label(&f.when))}</span>
            </fieldset>

            <fieldset>
                <legend>"Where"</legend>
                <div class="row">
                    <label>"Latitude" <input id="latitude" inputmode="decimal" prop:value=move || fields.with(|f| f.latitude.clone())
                        on:input=move |ev| fields.update(|f| { f.latitude = event_target_value(&ev); f.position_source = Some(PositionSource::Typed); }) /></label>
                    <label>"Longitude" <input id="longitude" inputmode="decimal" prop:value=move || fields.with(|f| f.longitude.clone())
                        on:input=move |ev| fields.update(|f| { f.longitude = event_target_value(&ev); f.position_source = Some(PositionSource::Typed); }) /></label>
                    <label>"± metres" <input id="accuracy" inputmode="decimal" prop:value=move || fields.with(|f| f.accuracy_m.clone())
                        on:input=move |ev| fields.update(|f| f.accuracy_m = event_target_value(&ev)) /></label>
                </div>
                <button type="button" class="small" on:click=move |_| locate(fields, position_note)>"Use my position"</button>
                <span id="position-note" class="hint">{move || position_note.get()}</span>
            </fieldset>

            <fieldset>
                <legend>"What"</legend>
                <label>"Species (your best guess)"
                    <input id="species" placeholder="e.g. small-spotted catshark" prop:value=move || fields.with(|f| f.species_guess.clone())
                        on:input=move |ev| fields.update(|f| { f.species_guess = event_target_value(&ev); f.key_choice = None; }) /></label>
                {move || fields.with(|f| f.key_choice.as_ref().map(|c| view! {
                    <p id="key-choice" class="hint">{format!("Picked with the key: {} ({}, {:.0}%)", c.scientific_name.as_str(), c.taxon_rank, c.probability * 100.0)}</p>
                }))}
                <button id="open-key" type="button" class="small" on:click=move |_| key_open.update(|o| *o = !*o)>
                    {move || if key_open.get() { "Hide the key" } else { "Help me identify" }}
                </button>
                <Show when=move || key_open.get()>
                    <KeyPanel key=species_key fields=fields open=key_open />
                </Show>
                <div class="row">
                    <label>"Length" <input id="length" inputmode="decimal" prop:value=move || fields.with(|f| f.length_value.clone())
                        on:input=move |ev| fields.update(|f| f.length_value = event_target_value(&ev)) /></label>
                    <label>"Unit" <select id="length-unit" prop:value=move || fields.with(|f| code(&f.length_unit.unwrap_or(LengthUnit::Cm))) on:change=move |ev| fields.update(|f| f.length_unit = from_code(&event_target_value(&ev)))>
                        {LengthUnit::ALL.into_iter().map(|u| view! { <option value=code(&u)>{u.code()}</option> }).collect_view()}
                    </select></label>
                </div>
                <div class="row">
                    <label>"Which length" <select id="length-kind" prop:value=move || fields.with(|f| code(&f.length_kind.unwrap_or(LengthKind::Total))) on:change=move |ev| fields.update(|f| f.length_kind = from_code(&event_target_value(&ev)))>
                        {LengthKind::ALL.into_iter().map(|k| view! { <option value=code(&k)>{k.label()}</option> }).collect_view()}
                    </select></label>
                    <label>"How" <select id="length-method" prop:value=move || fields.with(|f| code(&f.length_method.unwrap_or(MeasureMethod::Measured))) on:change=move |ev| fields.update(|f| f.length_method = from_code(&event_target_value(&ev)))>
                        <option value="measured">"measured"</option>
                        <option value="estimated">"estimated"</option>
                    </select></label>
                </div>
                <div class="row">
                    <label>"Sex" <select id="sex" prop:value=move || fields.with(|f| code(&f.sex.unwrap_or(Sex::Unknown))) on:change=move |ev| fields.update(|f| f.sex = from_code(&event_target_value(&ev)))>
                        <option value="unknown">"not known"</option>
                        <option value="male">"male (claspers seen)"</option>
                        <option value="female">"female (no claspers)"</option>
                    </select></label>
                    <label>"How many" <input id="count" type="number" min="1" prop:value=move || fields.with(|f| f.count.clone())
                        on:input=move |ev| fields.update(|f| f.count = event_target_value(&ev)) /></label>
                    <label>"Life stage" <select id="life-stage" prop:value=move || fields.with(|f| f.life_stage.map(|s| code(&s)).unwrap_or_default()) on:change=move |ev| fields.update(|f| f.life_stage = from_code(&event_target_value(&ev)))>
                        <option value="">"not sure"</option>
                        {LifeStage::ALL.into_iter().map(|s| view! { <option value=code(&s)>{s.label()}</option> }).collect_view()}
                    </select></label>
                </div>
                <Show when=move || fields.with(|f| f.life_stage == Some(LifeStage::EggCase))>
                    <p id="egg-case-hint" class="hint">"Egg cases: count them in “How many”; no length needed (write a case's size in the notes)."</p>
                </Show>
            </fieldset>

            <fieldset>
                <legend>"State and setting"</legend>
                <label>"Condition" <select id="condition" prop:value=move || fields.with(|f| f.condition.map(|c| code(&c)).unwrap_or_default()) on:change=move |ev| fields.update(|f| f.condition = from_code(&event_target_value(&ev)))>
                    <option value="">"choose…"</option>
                    {Condition::ALL.into_iter().map(|c| view! { <option value=code(&c)>{c.label()}</option> }).collect_view()}
                </select></label>
                <label>"How it was seen" <select id="setting" prop:value=move || fields.with(|f| f.setting.map(|s| code(&s)).unwrap_or_default()) on:change=move |ev| fields.update(|f| f.setting = from_code(&event_target_value(&ev)))>
                    <option value="">"choose…"</option>
                    {Setting::ALL.into_iter().map(|s| view! { <option value=code(&s)>{s.label()}</option> }).collect_view()}
                </select></label>
                <div class="checks">
                    <span>"Signs of fishing or people:"</span>
                    {HumanSign::ALL.into_iter().map(|sign| view! {
                        <label class="check"><input type="checkbox" prop:checked=move || fields.with(|f| f.human_signs.contains(&sign))
                            on:change=move |ev| {
                                let on = event_target_checked(&ev);
                                fields.update(|f| { f.human_signs.retain(|s| *s != sign); if on { f.human_signs.push(sign); } });
                            } />{sign.label()}</label>
                    }).collect_view()}
                </div>
                <label>"Notes" <textarea id="notes" rows="3" prop:value=move || fields.with(|f| f.notes.clone())
                    on:input=move |ev| fields.update(|f| f.notes = event_target_value(&ev))></textarea></label>
                <label>"Your name (shown with your records)" <input id="observer-name" prop:value=move || fields.with(|f| f.observer_name.clone())
                    on:input=move |ev| fields.update(|f| f.observer_name = event_target_value(&ev)) /></label>
            </fieldset>

            <ul class="problems" role="alert">
                {move || problems.get().into_iter().map(|p| view! { <li>{p}</li> }).collect_view()}
            </ul>
            <div class="actions">
                <button id="save-send" type="submit" class="primary">"Save and send"</button>
                <button id="save-draft" type="button" on:click=move |_| save(SyncState::Draft)>"Keep as draft"</button>
            </div>
            <p id="saved-note" class="hint" role="status">{move || saved_note.get()}</p>
        </form>
    }
}
