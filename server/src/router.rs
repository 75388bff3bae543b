//! Every route the server answers, in one place.

use axum::Router;
use axum::extract::DefaultBodyLimit;
use axum::http::{HeaderValue, header};
use axum::routing::{get, post, put};
use tower_http::services::{ServeDir, ServeFile};
use tower::Layer as _;
use tower_http::set_header::{SetResponseHeader, SetResponseHeaderLayer};

use crate::AppState;
use crate::error::ApiError;
use crate::handlers::{assess, checklist, export, health, mine, observations, people, photos, review, session, walks};
use crate::intake::photos::{MAX_PHOTO_BYTES, MAX_PHOTOS_PER_RECORD};

/// Who may use a route. Handlers enforce it with the extractors in
/// `handlers::access`; this table says it in one place, and the access-matrix test
/// checks every route against every kind of caller from it.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Access {
    /// Anyone; record and walk ids made on the phone are unguessable UUIDs.
    Public,
    /// A phone with its device identity; only its own records.
    Observer,
    /// A signed-in reviewer or admin.
    Reviewer,
    /// A signed-in admin.
    Admin,
}

/// One route: method, path (as in the router) and who may use it.
#[derive(Debug, Clone, Copy)]
pub struct RouteSpec {
    pub method: &'static str,
    pub path: &'static str,
    pub access: Access,
}

const fn route(method: &'static str, path: &'static str, access: Access) -> RouteSpec {
    RouteSpec { method, path, access }
}

/// Every route below, with its access. Keep in step with [`app`] (a test reads both).
pub const ROUTES: &[RouteSpec] = &[
    route("GET", "/healthz", Access::Public),
    route("POST", "/api/observations", Access::Public),
    route("GET", "/api/observations", Access::Reviewer),
    route("GET", "/api/observations/{client_id}", Access::Reviewer),
    route("PUT", "/api/observations/{client_id}/walk", Access::Public),
    route("POST", "/api/walks", Access::Public),
    route("GET", "/api/walks", Access::Reviewer),
    route("GET", "/api/effort", Access::Public),
    route("GET", "/api/export", Access::Public),
    route("GET", "/api/checklist", Access::Public),
    route("GET", "/api/checklist/nearby", Access::Public),
    route("GET", "/api/range", Access::Public),
    route("GET", "/api/range/map.svg", Access::Public),
    route("GET", "/api/trend", Access::Public),
    route("GET", "/api/trend/chart.svg", Access::Public),
    route("POST", "/api/session", Access::Public),
    route("GET", "/api/session", Access::Public),
    route("DELETE", "/api/session", Access::Public),
    route("POST", "/api/devices", Access::Public),
    route("GET", "/api/my/records", Access::Observer),
    route("POST", "/api/my/records/{client_id}/replies", Access::Observer),
    route("GET", "/api/review/queue", Access::Reviewer),
    route("GET", "/api/review/records/{client_id}", Access::Reviewer),
    route("POST", "/api/review/records/{client_id}/actions", Access::Reviewer),
    route("GET", "/api/review/records/{client_id}/map.svg", Access::Reviewer),
    route("POST", "/api/review/records/{client_id}/duplicates/{other_client_id}", Access::Reviewer),
    route("POST", "/api/review/merges/{merge_id}/undo", Access::Reviewer),
    route("GET", "/api/people", Access::Admin),
    route("POST", "/api/people", Access::Admin),
    route("PUT", "/api/people/{username}/disabled", Access::Admin),
    route("GET", "/api/photos/{sha256}/similar", Access::Reviewer),
    route("GET", "/photos/{sha256}", Access::Public),
    route("GET", "/photos/{sha256}/thumb", Access::Public),
    route("GET", "/photos/{sha256}/original", Access::Reviewer),
];

/// The whole HTTP surface. Unknown `/api/` paths are a JSON 404; any other unknown path
/// is the app's `index.html` (status 200), so the app's own links work on reload.
pub fn app(state: AppState) -> Router {
    let upload_limit = MAX_PHOTO_BYTES * MAX_PHOTOS_PER_RECORD + 1024 * 1024;
    let api = Router::new()
        .route("/healthz", get(health::healthz))
        .route(
            "/api/observations",
            post(observations::submit).get(observations::list).layer(DefaultBodyLimit::max(upload_limit)),
        )
        .route("/api/observations/{client_id}", get(observations::get))
        .route("/api/observations/{client_id}/walk", put(walks::link))
        .route("/api/walks", post(walks::submit).get(walks::list))
        .route("/api/effort", get(walks::effort))
        .route("/api/export", get(export::export))
        .route("/api/checklist", get(checklist::get))
        .route("/api/checklist/nearby", get(checklist::nearby))
        .route("/api/session", post(session::login).get(session::who).delete(session::logout))
        .route("/api/devices", post(session::new_device))
        .route("/api/my/records", get(mine::records))
        .route("/api/my/records/{client_id}/replies", post(mine::reply).layer(DefaultBodyLimit::max(upload_limit)))
        .route("/api/review/queue", get(review::queue))
        .route("/api/review/records/{client_id}", get(review::detail))
        .route("/api/review/records/{client_id}/actions", post(review::act))
        .route("/api/review/records/{client_id}/map.svg", get(review::place_map))
        .route("/api/review/records/{client_id}/duplicates/{other_client_id}", post(review::decide_pair))
        .route("/api/review/merges/{merge_id}/undo", post(review::undo_merge))
        .route("/api/people", get(people::list).post(people::add))
        .route("/api/people/{username}/disabled", put(people::set_disabled))
        .route("/api/range", get(assess::range))
        .route("/api/range/map.svg", get(assess::range_map))
        .route("/api/trend", get(assess::trend))
        .route("/api/trend/chart.svg", get(assess::trend_chart))
        .route("/api/photos/{sha256}/similar", get(photos::similar))
        .route("/api/{*rest}", get(api_not_found).post(api_not_found).put(api_not_found).delete(api_not_found))
        .route("/photos/{sha256}", get(photos::display))
        .route("/photos/{sha256}/thumb", get(photos::thumb))
        // Reviewers only: the original carries the photo's GPS and other EXIF.
        .route("/photos/{sha256}/original", get(photos::original));
    let router = match &state.app_dir {
        Some(dir) => api.fallback_service(app_files(dir)),
        None => api,
    };
    router.with_state(state).layer(tower_http::trace::TraceLayer::new_for_http())
}

/// Static files of the built app. `no-cache` makes the browser revalidate, so a new
/// service worker (and with it a new app version) is seen on the next visit.
fn app_files(dir: &std::path::Path) -> SetResponseHeader<ServeDir<ServeFile>, HeaderValue> {
    let files = ServeDir::new(dir).fallback(ServeFile::new(dir.join("index.html")));
    SetResponseHeaderLayer::if_not_present(header::CACHE_CONTROL, HeaderValue::from_static("no-cache")).layer(files)
}

async fn api_not_found() -> ApiError {
    ApiError::NotFound("no such API route".into())
}
