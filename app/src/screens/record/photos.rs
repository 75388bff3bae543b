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
use crate::data::words::{t, t_args};

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
            let which = if number == 1 {
                t("photos-gps-first")
            } else {
                t_args("photos-gps-numbered", &[("number", number.into())])
            };
            let why = if had_position { String::new() } else { t("photos-gps-no-device") };
            note.set(format!("{which}{why}"));
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
        note.set(t("photos-position-cleared"));
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
                photo_note.set(t_args("photos-preparing", &[("name", file.name().into())]));
                match photos::pick(file).await {
                    Ok(picked)
                        if photos.with_untracked(|p| {
                            photos::already_added(
                                p.iter().map(|q| q.upload_sha256.as_deref()),
                                picked.upload_sha256.as_deref(),
                            )
                        }) =>
                    {
                        refused.push(t_args("photos-already-added", &[("name", picked.name.clone().into())]));
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
                <legend>{t("photos-legend")}</legend>
                <label class="button photo-button">
                    {t("photos-add")}
                    <input id="photo-input" type="file" accept="image/*" capture="environment" multiple on:change=add_photos />
                </label>
                <ul class="thumbs">
                    {move || photos.get().into_iter().enumerate().map(|(index, photo)| {
                        view! {
                            <li class="photo">
                                <img src=photo.preview_url.clone() alt=t_args("photos-alt", &[("number", (index + 1).into()), ("name", photo.name.clone().into())]) />
                                <span class="photo-says hint">{photos::photo_says(&photo.exif)}</span>
                                <button type="button" class="small remove-photo" on:click=move |_| remove_photo(photos, fields, position_note, index)>{t("photos-remove")}</button>
                            </li>
                        }
                    }).collect_view()}
                </ul>
                <p class="hint">{move || t_args("photos-count", &[("count", photos.with(|p| p.len()).into())])}</p>
                <Show when=move || photos.with(|p| !p.is_empty())>
                    <p id="device-says" class="hint">{move || fields.with(|f| f.device_says(&BrowserZone))}</p>
                </Show>
                <p id="photo-note" class="problems" role="alert">{move || photo_note.get()}</p>
            </fieldset>
    }
}
