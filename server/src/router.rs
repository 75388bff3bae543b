//! Every route the server answers, in one place: the [`ROUTES`] table names each
//! route's method, path, who may use it and its handler, and [`app`] builds the router
//! from that table alone, so the table cannot leave a route out. Every answer carries
//! the security headers, and every state-changing request passes the origin check
//! ([`crate::handlers::guard`]).

use axum::Router;
use axum::extract::DefaultBodyLimit;
use axum::http::{HeaderValue, header};
use axum::routing::{MethodFilter, MethodRouter, any, on};
use tower::Layer as _;
use tower_http::services::{ServeDir, ServeFile};
use tower_http::set_header::{SetResponseHeader, SetResponseHeaderLayer};
use tower_http::timeout::{RequestBodyDeadlineLayer, RequestBodyTimeoutLayer};

use crate::error::ApiError;
use crate::handlers::{
    assess, checklist, dataset, export, fieldwork, guard, health, mine, observations, people, photos, review, session,
    site, walks,
};
use crate::intake::photos::{MAX_PHOTO_BYTES, MAX_PHOTOS_PER_RECORD};
use crate::state::AppState;

/// Who may use a route. Handlers enforce it with the extractors in
/// `handlers::access` (and, for the owner-scoped kinds, by comparing the caller with
/// the record's or walk's observer); this table says it in one place, and the
/// access-matrix test calls every route as every kind of caller from it.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Access {
    /// Anyone.
    Public,
    /// A phone with its device identity; what it reads or changes is its own.
    Device,
    /// Only the phone that sent the record or walk the request names (a new walk
    /// becomes the sender's); another phone is refused (403), and so is staff.
    OwnDevice,
    /// The phone that sent the record the path names, or a signed-in reviewer or admin.
    OwnDeviceOrReviewer,
    /// A signed-in reviewer or admin.
    Reviewer,
    /// A signed-in responder, reviewer or admin.
    Responder,
    /// A signed-in admin.
    Admin,
}

/// The HTTP methods the routes use.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Verb {
    Get,
    Post,
    Put,
    Delete,
}

impl Verb {
    pub fn as_str(self) -> &'static str {
        match self {
            Self::Get => "GET",
            Self::Post => "POST",
            Self::Put => "PUT",
            Self::Delete => "DELETE",
        }
    }

    fn filter(self) -> MethodFilter {
        match self {
            Self::Get => MethodFilter::GET,
            Self::Post => MethodFilter::POST,
            Self::Put => MethodFilter::PUT,
            Self::Delete => MethodFilter::DELETE,
        }
    }
}

/// Makes a route's handler for the method the table gives it.
type MakeHandler = fn(MethodFilter) -> MethodRouter<AppState>;

/// One route: method, path (axum syntax), who may use it, and its handler.
#[derive(Clone, Copy)]
pub struct RouteSpec {
    pub verb: Verb,
    pub path: &'static str,
    pub access: Access,
    handler: MakeHandler,
}

impl RouteSpec {
    pub fn method(&self) -> &'static str {
        self.verb.as_str()
    }
}

impl std::fmt::Debug for RouteSpec {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        write!(f, "{} {} ({:?})", self.verb.as_str(), self.path, self.access)
    }
}

const fn route(verb: Verb, path: &'static str, access: Access, handler: MakeHandler) -> RouteSpec {
    RouteSpec { verb, path, access, handler }
}

/// The largest request a record or a reply with photos may be.
const UPLOAD_LIMIT: usize = MAX_PHOTO_BYTES * MAX_PHOTOS_PER_RECORD + 1024 * 1024;
/// The largest survey walk: 20,000 track points at about 150 bytes each.
const WALK_LIMIT: usize = 4 * 1024 * 1024;
/// The largest body of any other route: sign-ins, names, review decisions.
const JSON_LIMIT: usize = 64 * 1024;

use Access::{Admin, Device, OwnDevice, OwnDeviceOrReviewer, Public, Responder, Reviewer};
use Verb::{Delete, Get, Post, Put};

/// Every route, with its access and handler. [`app`] adds nothing else but the JSON 404
/// for unknown `/api/` paths and the app's own files.
pub const ROUTES: &[RouteSpec] = &[
    route(Get, "/healthz", Public, |m| on(m, health::healthz)),
    route(Post, "/api/observations", Public, |m| {
        on(m, observations::submit).layer(DefaultBodyLimit::max(UPLOAD_LIMIT))
    }),
    route(Get, "/api/observations", Reviewer, |m| on(m, observations::list)),
    route(Get, "/api/observations/{client_id}", Reviewer, |m| on(m, observations::get)),
    route(Put, "/api/observations/{client_id}/walk", OwnDeviceOrReviewer, |m| on(m, walks::link)),
    route(Post, "/api/walks", OwnDevice, |m| on(m, walks::submit).layer(DefaultBodyLimit::max(WALK_LIMIT))),
    route(Get, "/api/walks", Reviewer, |m| on(m, walks::list)),
    route(Get, "/api/effort", Public, |m| on(m, walks::effort)),
    route(Get, "/api/export", Public, |m| on(m, export::export)),
    route(Get, "/dataset/archive.zip", Public, |m| on(m, dataset::archive)),
    route(Get, "/dataset/eml.xml", Public, |m| on(m, dataset::eml)),
    route(Get, "/api/checklist", Public, |m| on(m, checklist::get)),
    route(Get, "/api/checklist/nearby", Public, |m| on(m, checklist::nearby)),
    route(Get, "/api/site", Public, |m| on(m, site::get)),
    route(Get, "/api/range", Public, |m| on(m, assess::range)),
    route(Get, "/api/range/map.svg", Public, |m| on(m, assess::range_map)),
    route(Get, "/api/trend", Public, |m| on(m, assess::trend)),
    route(Get, "/api/trend/chart.svg", Public, |m| on(m, assess::trend_chart)),
    route(Post, "/api/session", Public, |m| on(m, session::login)),
    route(Get, "/api/session", Public, |m| on(m, session::who)),
    route(Delete, "/api/session", Public, |m| on(m, session::logout)),
    route(Post, "/api/devices", Public, |m| on(m, session::new_device)),
    route(Get, "/api/my/records", Device, |m| on(m, mine::records)),
    route(Put, "/api/my/profile", Device, |m| on(m, mine::set_profile)),
    route(Post, "/api/my/records/{client_id}/replies", OwnDevice, |m| {
        on(m, mine::reply).layer(DefaultBodyLimit::max(UPLOAD_LIMIT))
    }),
    route(Get, "/api/review/queue", Reviewer, |m| on(m, review::queue)),
    route(Get, "/api/review/records/{client_id}", Reviewer, |m| on(m, review::detail)),
    route(Post, "/api/review/records/{client_id}/actions", Reviewer, |m| on(m, review::act)),
    route(Get, "/api/review/records/{client_id}/map.svg", Reviewer, |m| on(m, review::place_map)),
    route(Post, "/api/review/records/{client_id}/duplicates/{other_client_id}", Reviewer, |m| {
        on(m, review::decide_pair)
    }),
    route(Post, "/api/review/merges/{merge_id}/undo", Reviewer, |m| on(m, review::undo_merge)),
    route(Get, "/api/urgent", Responder, |m| on(m, fieldwork::urgent)),
    route(Post, "/api/review/records/{client_id}/responses", Responder, |m| on(m, fieldwork::log_response)),
    route(Post, "/api/review/records/{client_id}/samples", Reviewer, |m| on(m, fieldwork::add_sample)),
    route(Put, "/api/review/records/{client_id}/carcass", Reviewer, |m| on(m, fieldwork::set_carcass)),
    route(Get, "/api/samples", Reviewer, |m| on(m, fieldwork::register)),
    route(Get, "/api/samples/{code}", Reviewer, |m| on(m, fieldwork::lookup)),
    route(Put, "/api/samples/{code}", Reviewer, |m| on(m, fieldwork::change_sample)),
    route(Get, "/api/people", Admin, |m| on(m, people::list)),
    route(Post, "/api/people", Admin, |m| on(m, people::add)),
    route(Put, "/api/people/{username}/disabled", Admin, |m| on(m, people::set_disabled)),
    route(Put, "/api/people/{username}/role", Admin, |m| on(m, people::set_role)),
    route(Put, "/api/people/{username}/password", Admin, |m| on(m, people::reset_password)),
    route(Get, "/api/people/events", Admin, |m| on(m, people::events)),
    route(Get, "/api/photos/{sha256}/similar", Reviewer, |m| on(m, photos::similar)),
    route(Get, "/photos/{sha256}", Public, |m| on(m, photos::display)),
    route(Get, "/photos/{sha256}/thumb", Public, |m| on(m, photos::thumb)),
    // Reviewers only: the original carries the photo's GPS and other EXIF.
    route(Get, "/photos/{sha256}/original", Reviewer, |m| on(m, photos::original)),
];

/// The whole HTTP surface: [`ROUTES`], then unknown `/api/` paths as a JSON 404 and any
/// other path as the app's files: those built into the binary
/// ([`crate::handlers::app_files`]), or the folder `--app-dir` names; an unknown path
/// gets the app's `index.html` (status 200), so the app's own links work on reload. Every body is limited in size (by route, [`JSON_LIMIT`] unless the
/// route says more), may pause at most `settings.body_idle_timeout_s` between pieces
/// and must arrive whole within `settings.body_deadline_s`.
pub fn app(state: AppState) -> Router {
    let body_idle = std::time::Duration::from_secs(state.settings.body_idle_timeout_s);
    let body_deadline = std::time::Duration::from_secs(state.settings.body_deadline_s);
    let mut api = Router::new();
    for spec in ROUTES {
        api = api.route(spec.path, (spec.handler)(spec.verb.filter()));
    }
    let api = api.route("/api/{*rest}", any(api_not_found));
    let router = match &state.app_dir {
        Some(dir) => api.fallback_service(app_files(dir)),
        None => api.fallback_service(axum::routing::get(crate::handlers::app_files::embedded)),
    };
    router
        .layer(axum::middleware::from_fn_with_state(state.clone(), guard::same_origin_only))
        .with_state(state)
        .layer(DefaultBodyLimit::max(JSON_LIMIT))
        .layer(RequestBodyTimeoutLayer::new(body_idle))
        .layer(RequestBodyDeadlineLayer::new(body_deadline))
        .layer(axum::middleware::from_fn(guard::security_headers))
        .layer(tower_http::trace::TraceLayer::new_for_http())
}

/// Static files of the built app from a folder (`--app-dir`, for development). `no-cache` makes the browser revalidate, so a new
/// service worker (and with it a new app version) is seen on the next visit. The build
/// writes a brotli (`.br`) and a gzip (`.gz`) copy beside each text and wasm file; a
/// browser that accepts one gets it (brotli first), with `Content-Encoding` and
/// `Vary: Accept-Encoding`, and any other client the file itself.
fn app_files(dir: &std::path::Path) -> SetResponseHeader<ServeDir<ServeFile>, HeaderValue> {
    let index = ServeFile::new(dir.join("index.html")).precompressed_br().precompressed_gzip();
    let files = ServeDir::new(dir).precompressed_br().precompressed_gzip().fallback(index);
    SetResponseHeaderLayer::if_not_present(header::CACHE_CONTROL, HeaderValue::from_static("no-cache")).layer(files)
}

async fn api_not_found() -> ApiError {
    ApiError::NotFound("no such API route".into())
}

/// Serves the app on an already bound listener until Ctrl-C or SIGTERM, so tests can
/// bind port 0 and read the port back.
pub async fn serve(listener: tokio::net::TcpListener, state: AppState) -> anyhow::Result<()> {
    state.start_background_work()?;
    serve_until(listener, state, stop_signal()).await;
    Ok(())
}

/// Serves the app on `listener` (with each connection's address, for the rate limits)
/// until `stop` completes; the connection limits and timeouts come from the settings.
/// With no public address set, it is `http://` and the address listened on.
pub async fn serve_until(
    listener: tokio::net::TcpListener,
    mut state: AppState,
    stop: impl std::future::Future<Output = ()>,
) {
    if state.settings.public_url.is_none() {
        state.settings.public_url = listener.local_addr().ok().map(crate::settings::PublicUrl::listening_on);
    }
    let limits = crate::handlers::connections::ConnectionLimits {
        max_connections: state.settings.max_connections,
        header_timeout: std::time::Duration::from_secs(state.settings.header_timeout_s),
    };
    crate::handlers::connections::serve_connections(listener, app(state), limits, stop).await;
}

/// Ctrl-C, or SIGTERM (what service managers send).
async fn stop_signal() {
    let mut terminate = tokio::signal::unix::signal(tokio::signal::unix::SignalKind::terminate()).ok();
    tokio::select! {
        _ = tokio::signal::ctrl_c() => {}
        Some(()) = async { terminate.as_mut()?.recv().await } => {}
    }
}
