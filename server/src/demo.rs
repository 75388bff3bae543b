//! The demo records: an invented recording network on the Cardigan Bay coast, built
//! into the binary so `wrackline demo` works from any folder. They go through the same
//! intake as a phone's submissions, and part of them are then decided by the demo
//! reviewer through the same review rules as the desk's, so the demo's public exports and
//! figures are not empty. See `demo-records/README.md`.

use chrono::Utc;
use serde::Deserialize;

use crate::intake::received::ReceivedPhoto;
use crate::intake::{self, Upload};
use crate::state::AppState;
use crate::store::{observations, review as review_store};

const RECORDS_JSON: &str = include_str!("../../demo-records/records.json");
const WALKS_JSON: &str = include_str!("../../demo-records/walks.json");
const REVIEWS_JSON: &str = include_str!("../../demo-records/reviews.json");

/// The demo photos, by the file names `records.json` uses.
const PHOTOS: &[(&str, &[u8])] = &[
    ("catshark.jpg", include_bytes!("../../demo-records/photos/catshark.jpg")),
    ("ray.jpg", include_bytes!("../../demo-records/photos/ray.jpg")),
    ("spurdog.jpg", include_bytes!("../../demo-records/photos/spurdog.jpg")),
    ("tope.jpg", include_bytes!("../../demo-records/photos/tope.jpg")),
    ("stingray.jpg", include_bytes!("../../demo-records/photos/stingray.jpg")),
];

#[derive(Deserialize)]
struct DemoRecord {
    submission: serde_json::Value,
    #[serde(default)]
    photos: Vec<String>,
}

/// One of the demo reviewer's decisions, as the desk would send it.
#[derive(Deserialize)]
struct DemoReview {
    client_id: uuid::Uuid,
    decision: shared_types::ReviewAction,
}

/// What [`load_if_empty`] loaded.
pub struct Loaded {
    pub records: usize,
    /// Records the demo reviewer confirmed (public in the exports and figures).
    pub confirmed: usize,
}

/// Loads every demo record and survey walk if the database holds no observations, and
/// applies the demo reviewer's decisions (the demo sign-ins must exist:
/// [`ensure_demo_people`] first).
pub async fn load_if_empty(state: &AppState) -> anyhow::Result<Loaded> {
    if state.store.run(|conn| observations::count_observations(conn)).await? > 0 {
        return Ok(Loaded { records: 0, confirmed: 0 });
    }
    let records: Vec<DemoRecord> = serde_json::from_str(RECORDS_JSON)?;
    for (index, record) in records.iter().enumerate() {
        let photos = record
            .photos
            .iter()
            .map(|name| Ok(ReceivedPhoto::from_bytes(&state.photos, photo_bytes(name)?)?))
            .collect::<anyhow::Result<Vec<_>>>()?;
        let upload = Upload { record_json: serde_json::to_vec(&record.submission)?, photos };
        crate::arrival::receive(state, upload, None, Utc::now())
            .await
            .map_err(|err| anyhow::anyhow!("demo record {}: {err}", index + 1))?;
    }
    let walks: Vec<serde_json::Value> = serde_json::from_str(WALKS_JSON)?;
    for (index, walk) in walks.iter().enumerate() {
        intake::walks::accept_walk(&state.store, &serde_json::to_vec(walk)?, None, Utc::now())
            .await
            .map_err(|err| anyhow::anyhow!("demo walk {}: {err}", index + 1))?;
    }
    let confirmed = apply_reviews(state).await?;
    Ok(Loaded { records: records.len(), confirmed })
}

/// Applies `reviews.json` as the demo reviewer; returns how many records it confirmed.
async fn apply_reviews(state: &AppState) -> anyhow::Result<usize> {
    let reviewer = state
        .store
        .read(|conn| crate::store::people::staff_by_username(conn, DEMO_REVIEWER))
        .await?
        .ok_or_else(|| anyhow::anyhow!("the demo sign-in {DEMO_REVIEWER} is not there to review the demo records"))?
        .0
        .id;
    let reviews: Vec<DemoReview> = serde_json::from_str(REVIEWS_JSON)?;
    let mut confirmed = 0;
    for DemoReview { client_id, decision } in reviews {
        let is_confirm = matches!(decision, shared_types::ReviewAction::Confirm { .. });
        let decide = move |current| crate::review::decide(current, &decision);
        let outcome =
            state.store.run(move |conn| review_store::apply(conn, client_id, reviewer, Utc::now(), decide)).await?;
        match outcome {
            Some(Ok(_)) => confirmed += usize::from(is_confirm),
            Some(Err(refused)) => anyhow::bail!("demo review of {client_id}: {refused}"),
            None => anyhow::bail!("demo review of {client_id}: no such demo record"),
        }
    }
    Ok(confirmed)
}

fn photo_bytes(name: &str) -> anyhow::Result<&'static [u8]> {
    PHOTOS
        .iter()
        .find(|(file, _)| *file == name)
        .map(|(_, bytes)| *bytes)
        .ok_or_else(|| anyhow::anyhow!("demo photo {name} is not built in"))
}

/// The demo's sign-ins: (username, role). Made only by `wrackline demo`, never by
/// `serve`, each with a password drawn at random when it is made.
pub const DEMO_PEOPLE: &[(&str, shared_types::Role)] =
    &[(DEMO_REVIEWER, shared_types::Role::Reviewer), ("demo-admin", shared_types::Role::Admin)];

/// The demo sign-in whose decisions `reviews.json` holds.
const DEMO_REVIEWER: &str = "demo-reviewer";

/// A demo sign-in as made now, or found made before.
pub struct DemoSignIn {
    pub username: &'static str,
    pub role: &'static str,
    /// The password, only when the sign-in was made now: it is stored as an argon2 hash
    /// alone, so this is the one time it can be shown.
    pub new_password: Option<String>,
}

/// Adds the demo sign-ins that do not exist yet, each with a new random password.
pub async fn ensure_demo_people(state: &AppState) -> anyhow::Result<Vec<DemoSignIn>> {
    let mut people = Vec::new();
    for (username, role) in DEMO_PEOPLE {
        let password = random_password();
        let made = crate::people::add_staff(
            &state.store,
            None,
            username,
            *role,
            format!("Demo {}", role.code()),
            password.clone(),
        )
        .await;
        let new_password = match made {
            Ok(_) => Some(password),
            Err(crate::people::PeopleError::Taken(_)) => None,
            Err(err) => anyhow::bail!("adding the demo sign-in {username}: {err}"),
        };
        people.push(DemoSignIn { username, role: role.code(), new_password });
    }
    Ok(people)
}

/// A version 4 UUID from the system's random source (122 random bits) as 32 hex
/// digits: nothing to guess, easy to paste.
fn random_password() -> String {
    uuid::Uuid::new_v4().simple().to_string()
}
