//! Every route the server answers, in one place.

use axum::Router;
use axum::extract::DefaultBodyLimit;
use axum::http::{HeaderValue, header};
use axum::routing::{get, post};
use tower_http::services::{ServeDir, ServeFile};
use tower::Layer as _;
use tower_http::set_header::{SetResponseHeader, SetResponseHeaderLayer};

use crate::AppState;
use crate::error::ApiError;
use crate::handlers::{export, health, observations, photos};
use crate::intake::photos::{MAX_PHOTO_BYTES, MAX_PHOTOS_PER_RECORD};

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
        .route("/api/export", get(export::export))
        .route("/api/photos/{sha256}/similar", get(photos::similar))
        .route("/api/{*rest}", get(api_not_found).post(api_not_found))
        .route("/photos/{sha256}", get(photos::display))
        .route("/photos/{sha256}/thumb", get(photos::thumb))
        // Reviewers only (the original carries GPS): see handlers/photos.rs.
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
