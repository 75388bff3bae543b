//! A record's photo opened large over the page, zoomable: buttons and the mouse wheel
//! on a desk, two fingers on a phone, dragged to look around; and a link to the
//! original (with its EXIF) for reviewers.

use std::collections::BTreeMap;

use leptos::prelude::*;

use crate::data::photos;
use crate::data::words::t;

/// A photo opened large over the page: the display copy, zoomed with the buttons or
/// the mouse wheel on a desk and with two fingers on a phone, dragged to look around;
/// reviewers also get the original (with its EXIF) in a new tab.
#[component]
pub fn PhotoZoom(photo: RwSignal<Option<String>>) -> impl IntoView {
    const MIN: f64 = 1.0;
    const MAX: f64 = 8.0;
    let scale = RwSignal::new(1.0_f64);
    let shift = RwSignal::new((0.0_f64, 0.0_f64));
    // Pointers down on the picture: id → last position.
    let pointers = StoredValue::new(BTreeMap::<i32, (f64, f64)>::new());
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
    let spread = |p: &BTreeMap<i32, (f64, f64)>| {
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
            <div id="photo-zoom" class="photo-zoom" role="dialog" aria-label=t("zoom-label")>
                <div class="zoom-bar">
                    <button id="zoom-out" type="button" class="small" on:click=move |_| zoom_by(0.8)>"−"</button>
                    <span id="zoom-level">{move || format!("{:.0}%", scale.get() * 100.0)}</span>
                    <button id="zoom-in" type="button" class="small" on:click=move |_| zoom_by(1.25)>"+"</button>
                    <button id="zoom-fit" type="button" class="small" on:click=move |_| reset()>{t("zoom-fit")}</button>
                    <a id="zoom-original" href=photos::served_original(&sha) target="_blank" rel="noopener">{t("zoom-original")}</a>
                    <button id="zoom-close" type="button" class="small" on:click=move |_| close()>{t("zoom-close")}</button>
                </div>
                <div class="zoom-stage" on:wheel=wheel on:pointerdown=down on:pointermove=moved on:pointerup=up on:pointercancel=up>
                    <img id="zoom-image" src=photos::served(&sha) alt=t("zoom-image") draggable="false"
                        style:transform=move || { let (x, y) = shift.get(); format!("translate({x:.0}px, {y:.0}px) scale({:.3})", scale.get()) } />
                </div>
            </div>
        })}
    }
}
