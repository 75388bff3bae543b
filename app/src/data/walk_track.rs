//! Following the position while a walk goes on: each fix from the browser's
//! `watchPosition` that is good enough and due is added to the walk's track and saved,
//! so a walk survives the page closing. Kept apart from `walks` because it works on the
//! [`Outbox`] lists, which themselves hold walks.

use leptos::prelude::*;

use crate::data::device;
use crate::data::outbox::Outbox;
use crate::data::time;
use crate::data::walks::{self, track_point};
use crate::data::words::{self, t_args};

thread_local! {
    static WATCH: std::cell::Cell<Option<i32>> = const { std::cell::Cell::new(None) };
    static LATEST: std::cell::Cell<Option<device::TimedFix>> = const { std::cell::Cell::new(None) };
}

/// The latest fix the walk's position watch reported (any accuracy), if a walk is followed.
pub fn latest_fix() -> Option<device::TimedFix> {
    WATCH.get().and(LATEST.get())
}

/// Follows the position for the walk going on, adding fixes to its track; `note` says
/// how good the position is.
pub fn follow(outbox: Outbox, note: RwSignal<String>) {
    if WATCH.get().is_some() {
        return;
    }
    let id = device::watch_position(
        move |fix| {
            LATEST.set(Some(fix));
            let Some(point) = track_point(fix, time::now().offset()) else { return };
            if fix.accuracy > shared_types::MAX_FIX_ACCURACY_M {
                note.set(t_args("walk-fix-rough", &[("metres", words::number(fix.accuracy, 0).into())]));
                return;
            }
            note.set(t_args("walk-fix-good", &[("metres", words::number(fix.accuracy, 0).into())]));
            let Some(mut walk) = outbox.walk_going_on() else { return };
            if walk.fix_is_due(point.at) {
                walk.track.push(point);
                leptos::task::spawn_local(async move {
                    if walks::save(&walk).await.is_ok() {
                        outbox.reload().await;
                    }
                });
            }
        },
        move |err| note.set(t_args("walk-no-fix", &[("problem", err.into())])),
    );
    WATCH.set(Some(id));
}

/// Stops following the position (the walk has ended).
pub fn stop_following() {
    if let Some(id) = WATCH.take() {
        device::stop_watching(id);
    }
    LATEST.set(None);
}
