//! The form's photos: "Add photo" (each picked photo read and prepared by
//! `data::photos`), the thumbnails with what each photo says and a way to remove it,
//! and beside them what this phone says. A photo taken earlier than the record's time
//! gives the record its time and place (`FormFields::offer_photo`); its GPS fills an
//! empty position; the position goes with the photo when it is removed.

use leptos::prelude::*;
use shared_types::PositionSource;

use crate::data::form_fields::FormFields;
use crate::data::photos::{self, PickedPhoto};
use crate::data::time::BrowserZone;

/// Lets photo `number` give the record its time and place (or fill an empty position)
/// and says so beside the position.
fn offer_photo(fields: RwSignal<FormFields>, note: RwSignal<String>, photo: &PickedPhoto, number: usize) {
    let mut form = fields.get_untracked();
    let had_position = !form.latitude.trim().is_empty();
    if form.offer_photo(&photo.exif, number, &photo.preview_url, &BrowserZone) {
        let placed = form.position_source == Some(PositionSource::Photo)
            && form.position_photo.as_deref() == Some(photo.preview_url.as_str());
        fields.set(form);
        if placed {
            let which = if number == 1 { "the first photo's".to_owned() } else { format!("photo {number}'s") };
            let why = if had_position { "" } else { " (this phone gave no position)" };
            note.set(format!("from {which} GPS{why}"));
        }
    }
}

fn prefill_from_photo(fields: RwSignal<FormFields>, note: RwSignal<String>, first: &PickedPhoto) {
    offer_photo(fields, note, first, 1);
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
    let mut cleared = fields.get_untracked();
    if cleared.forget_photo_position(&removed.preview_url) {
        fields.set(cleared);
        note.set("the position came from the removed photo and was cleared; use my position or type it".into());
        if let Some(first) = photos.with_untracked(|p| p.first().cloned()) {
            prefill_from_photo(fields, note, &first);
        }
    }
    let _ = web_sys::Url::revoke_object_url(&removed.preview_url);
}

/// The photos fieldset of the record form.
#[component]
pub fn PhotoPicker(
    photos: RwSignal<Vec<PickedPhoto>, LocalStorage>,
    fields: RwSignal<FormFields>,
    photo_note: RwSignal<String>,
    position_note: RwSignal<String>,
) -> impl IntoView {
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
                    Ok(picked)
                        if photos.with_untracked(|p| {
                            photos::already_added(
                                p.iter().map(|q| q.upload_sha256.as_deref()),
                                picked.upload_sha256.as_deref(),
                            )
                        }) =>
                    {
                        refused.push(format!("“{}”: this photo is already added.", picked.name));
                        let _ = web_sys::Url::revoke_object_url(&picked.preview_url);
                    }
                    Ok(picked) => {
                        photos.update(|p| p.push(picked.clone()));
                        offer_photo(fields, position_note, &picked, photos.with_untracked(|p| p.len()));
                    }
                    Err(problem) => refused.push(problem),
                }
            }
            photo_note.set(refused.join(" "));
        });
    };

    view! {
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
                <Show when=move || photos.with(|p| !p.is_empty())>
                    <p id="device-says" class="hint">{move || fields.with(|f| f.device_says(&BrowserZone))}</p>
                </Show>
                <p id="photo-note" class="problems" role="alert">{move || photo_note.get()}</p>
            </fieldset>
    }
}
