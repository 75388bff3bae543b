//! Survey walks on the phone: start one (optionally on a named stretch, saying
//! whether every find will be reported), follow the position while the app is open,
//! end it, and keep it in IndexedDB until the server has it — or enter a past walk by
//! hand. Records made while a walk is going on are linked to it.
//!
//! Sampling on the phone: at most one fix every [`SAMPLE_EVERY_S`] seconds, and fixes
//! worse than ±[`shared_types::MAX_FIX_ACCURACY_M`] m are not kept. The length shown is
//! worked out with the same filter the server uses (`shared_types::track_length`).

use chrono::{DateTime, FixedOffset, NaiveDateTime, TimeZone};
use leptos::prelude::*;
use serde::{Deserialize, Serialize};
use shared_types::{AccuracyM, Latitude, Longitude, Text, TrackPoint, WalkReceipt, WalkSubmission, track_length};
use uuid::Uuid;

use crate::device;
use crate::sync::{self, Outbox};

/// The shortest time between two kept fixes, in seconds.
pub const SAMPLE_EVERY_S: i64 = 10;

/// Where a walk is on its way to the server.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(tag = "state", rename_all = "snake_case")]
pub enum WalkState {
    /// Going on now.
    Walking,
    Waiting,
    Sent,
    Received {
        receipt: WalkReceipt,
    },
    Refused {
        reason: String,
    },
}

impl WalkState {
    pub fn label(&self) -> String {
        match self {
            Self::Walking => "walking now".into(),
            Self::Waiting => "waiting to send".into(),
            Self::Sent => "sent, awaiting the server".into(),
            Self::Received { .. } => "received by the server".into(),
            Self::Refused { reason } => format!("refused by the server: {reason}"),
        }
    }

    pub fn wants_sending(&self) -> bool {
        matches!(self, Self::Waiting | Self::Sent)
    }
}

/// One walk on the phone.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct WalkEntry {
    pub client_id: Uuid,
    pub started_at: DateTime<FixedOffset>,
    pub ended_at: Option<DateTime<FixedOffset>>,
    pub stretch: Option<Text>,
    pub all_finds_reported: bool,
    pub track: Vec<TrackPoint>,
    pub typed_distance_m: Option<f64>,
    pub observer_name: Option<Text>,
    pub state: WalkState,
    #[serde(default)]
    pub last_error: Option<String>,
}

impl WalkEntry {
    /// What is sent once the walk has ended.
    pub fn submission(&self) -> Option<WalkSubmission> {
        Some(WalkSubmission {
            client_id: self.client_id,
            started_at: self.started_at,
            ended_at: self.ended_at?,
            stretch: self.stretch.clone(),
            all_finds_reported: self.all_finds_reported,
            track: self.track.clone(),
            typed_distance_m: self.typed_distance_m,
            observer_name: self.observer_name.clone(),
        })
    }

    /// Kilometres so far: typed, or from the track with the server's filter.
    pub fn kilometres(&self) -> f64 {
        self.typed_distance_m.unwrap_or_else(|| track_length(&self.track).length_m) / 1000.0
    }

    pub fn title(&self) -> String {
        let stretch = self.stretch.as_ref().map(|s| s.as_str().to_owned()).unwrap_or_else(|| "walk".into());
        format!("{stretch}, {}", self.started_at.format("%Y-%m-%d %H:%M"))
    }
}

pub async fn save(entry: &WalkEntry) -> Result<(), String> {
    let json = serde_json::to_string(entry).map_err(|err| err.to_string())?;
    device::save_walk(&entry.client_id.to_string(), &json).await
}

/// Every walk, newest first.
pub async fn load_all() -> Result<Vec<WalkEntry>, String> {
    let mut walks = device::list_walks()
        .await?
        .iter()
        .map(|json| {
            serde_json::from_str::<WalkEntry>(json).map_err(|err| format!("a stored walk could not be read: {err}"))
        })
        .collect::<Result<Vec<_>, _>>()?;
    walks.sort_by_key(|w| std::cmp::Reverse(w.started_at));
    Ok(walks)
}

fn now_with_offset() -> DateTime<FixedOffset> {
    let now = js_sys::Date::new_0();
    let offset = FixedOffset::west_opt((now.get_timezone_offset() * 60.0) as i32)
        .unwrap_or(FixedOffset::east_opt(0).expect("zero offset"));
    let utc = chrono::DateTime::from_timestamp_millis(now.get_time() as i64).unwrap_or_default();
    utc.with_timezone(&offset)
}

fn fix_to_point(fix: device::TimedFix) -> Option<TrackPoint> {
    let utc = chrono::DateTime::from_timestamp_millis(fix.at as i64)?;
    Some(TrackPoint {
        latitude: Latitude::parse(fix.latitude).ok()?,
        longitude: Longitude::parse(fix.longitude).ok()?,
        accuracy_m: AccuracyM::parse(fix.accuracy.max(0.01)).ok(),
        at: utc.with_timezone(now_with_offset().offset()),
    })
}

thread_local! {
    static WATCH: std::cell::Cell<Option<i32>> = const { std::cell::Cell::new(None) };
}

/// Follows the position for the walk going on, adding fixes to its track.
pub fn follow(outbox: Outbox, note: RwSignal<String>) {
    if WATCH.get().is_some() {
        return;
    }
    let id = device::watch_position(
        move |fix| {
            let Some(point) = fix_to_point(fix) else { return };
            if fix.accuracy > shared_types::MAX_FIX_ACCURACY_M {
                note.set(format!("position too rough (±{:.0} m), waiting for a better fix", fix.accuracy));
                return;
            }
            note.set(format!("position ±{:.0} m", fix.accuracy));
            let Some(mut walk) =
                outbox.walks.with_untracked(|w| w.iter().find(|e| e.state == WalkState::Walking).cloned())
            else {
                return;
            };
            let due = walk.track.last().is_none_or(|last| (point.at - last.at).num_seconds() >= SAMPLE_EVERY_S);
            if due {
                walk.track.push(point);
                leptos::task::spawn_local(async move {
                    if save(&walk).await.is_ok() {
                        sync::refresh(outbox).await;
                    }
                });
            }
        },
        move |err| note.set(format!("no position ({err}); the walk goes on, but its track will be short")),
    );
    WATCH.set(Some(id));
}

fn stop_following() {
    if let Some(id) = WATCH.take() {
        device::stop_watching(id);
    }
}

fn parse_local(text: &str) -> Option<DateTime<FixedOffset>> {
    let local = NaiveDateTime::parse_from_str(text, "%Y-%m-%dT%H:%M").ok()?;
    let minutes_behind = js_sys::Date::new(&local.format("%Y-%m-%dT%H:%M:%S").to_string().into()).get_timezone_offset();
    FixedOffset::west_opt((minutes_behind * 60.0) as i32)?.from_local_datetime(&local).single()
}

/// Start, follow and end a walk, or enter a past one.
#[component]
pub fn WalkBar(outbox: Outbox) -> impl IntoView {
    let stretch = RwSignal::new(String::new());
    let all_finds = RwSignal::new(false);
    let note = RwSignal::new(String::new());
    let typed = RwSignal::new((String::new(), String::new(), String::new()));
    let active = Memo::new(move |_| outbox.walks.with(|w| w.iter().find(|e| e.state == WalkState::Walking).cloned()));
    let tick = RwSignal::new(0u32);
    // Keep the elapsed time fresh while a walk goes on.
    let _ =
        set_interval_with_handle(move || tick.update(|t| *t = t.wrapping_add(1)), std::time::Duration::from_secs(15));

    let store_and_sync = move |entry: WalkEntry, then_send: bool| {
        leptos::task::spawn_local(async move {
            match save(&entry).await {
                Ok(()) => {
                    sync::refresh(outbox).await;
                    if then_send {
                        sync::request(outbox);
                    }
                }
                Err(err) => note.set(format!("Could not save the walk on this phone: {err}")),
            }
        });
    };
    let start = move |_| {
        let entry = WalkEntry {
            client_id: Uuid::new_v4(),
            started_at: now_with_offset(),
            ended_at: None,
            stretch: Text::parse(&stretch.get_untracked()).ok().filter(|t| !t.as_str().is_empty()),
            all_finds_reported: all_finds.get_untracked(),
            track: Vec::new(),
            typed_distance_m: None,
            observer_name: None,
            state: WalkState::Walking,
            last_error: None,
        };
        // Follow only once the walk is stored, so the first fix has a walk to join.
        leptos::task::spawn_local(async move {
            match save(&entry).await {
                Ok(()) => {
                    sync::refresh(outbox).await;
                    follow(outbox, note);
                }
                Err(err) => note.set(format!("Could not save the walk on this phone: {err}")),
            }
        });
    };
    let end = move |_| {
        let Some(mut entry) = active.get_untracked() else { return };
        stop_following();
        entry.ended_at = Some(now_with_offset());
        entry.state = WalkState::Waiting;
        store_and_sync(entry, true);
    };
    let save_typed = move |_| {
        let (from, to, km) = typed.get_untracked();
        let (Some(started_at), Some(ended_at)) = (parse_local(&from), parse_local(&to)) else {
            note.set("Give the walk's start and end.".into());
            return;
        };
        let Some(km) = km.trim().replace(',', ".").parse::<f64>().ok().filter(|k| *k >= 0.0 && *k <= 100.0) else {
            note.set("Give the distance walked in kilometres (0 to 100).".into());
            return;
        };
        if ended_at < started_at {
            note.set("The walk ends before it starts.".into());
            return;
        }
        let entry = WalkEntry {
            client_id: Uuid::new_v4(),
            started_at,
            ended_at: Some(ended_at),
            stretch: Text::parse(&stretch.get_untracked()).ok().filter(|t| !t.as_str().is_empty()),
            all_finds_reported: all_finds.get_untracked(),
            track: Vec::new(),
            typed_distance_m: Some(km * 1000.0),
            observer_name: None,
            state: WalkState::Waiting,
            last_error: None,
        };
        note.set("Walk saved on this phone.".into());
        store_and_sync(entry, true);
    };

    view! {
        <section class="card walk-bar">
            {move || match active.get() {
                Some(walk) => {
                    tick.track();
                    let minutes = (now_with_offset() - walk.started_at).num_minutes();
                    view! {
                        <div id="walk-active">
                            <p><b>{format!("Survey walk: {}", walk.title())}</b></p>
                            <p id="walk-progress">{format!("{minutes} min · {:.2} km · {} fixes kept", walk.kilometres(), walk.track.len())}</p>
                            <p class="hint">{if walk.all_finds_reported { "You are reporting every shark, ray, skate and egg case you find." } else { "Not every find will be reported on this walk." }}</p>
                            <p class="hint">"Records you make now are linked to this walk. Keep the app open to record the route."</p>
                            <button id="end-walk" type="button" class="primary" on:click=end>"End walk"</button>
                        </div>
                    }.into_any()
                }
                None => view! {
                    <details id="walk-start">
                        <summary>"Survey walk"</summary>
                        <p class="hint">"Log your walks even when you find nothing: how far and how long people looked is what makes the counts mean something."</p>
                        <label>"Stretch of coast (optional)" <input id="walk-stretch" prop:value=move || stretch.get() on:input=move |ev| stretch.set(event_target_value(&ev)) /></label>
                        <label class="check"><input id="walk-all-finds" type="checkbox" prop:checked=move || all_finds.get() on:change=move |ev| all_finds.set(event_target_checked(&ev)) />
                            "I will report every shark, ray, skate and egg case I find on this walk"</label>
                        <button id="start-walk" type="button" class="primary" on:click=start>"Start walk"</button>
                        <details>
                            <summary>"Enter a past walk by hand"</summary>
                            <div class="row">
                                <label>"Started" <input id="walk-from" type="datetime-local" on:input=move |ev| typed.update(|t| t.0 = event_target_value(&ev)) /></label>
                                <label>"Ended" <input id="walk-to" type="datetime-local" on:input=move |ev| typed.update(|t| t.1 = event_target_value(&ev)) /></label>
                                <label>"Distance (km)" <input id="walk-km" inputmode="decimal" on:input=move |ev| typed.update(|t| t.2 = event_target_value(&ev)) /></label>
                            </div>
                            <button id="save-past-walk" type="button" on:click=save_typed>"Save walk"</button>
                        </details>
                    </details>
                }.into_any(),
            }}
            <p id="walk-note" class="hint">{move || note.get()}</p>
            <ul id="walk-list">
                {move || outbox.walks.get().into_iter().filter(|w| w.state != WalkState::Walking).take(5).map(|w| view! {
                    <li class="walk-entry" data-client-id=w.client_id.to_string()>
                        {format!("{} · {:.2} km · ", w.title(), w.kilometres())}
                        <span class="state">{w.state.label()}</span>
                    </li>
                }).collect_view()}
            </ul>
        </section>
    }
}
