//! wrackline's server and command line, as a library so that the binary, the tests
//! and the benchmarks all run the same code.
//!
//! Layers, top to bottom: [`cli`] (the `wrackline` command) → [`router`] (every
//! route, in one place) → [`handlers`] (the only code that knows HTTP) → [`intake`],
//! [`export`], [`demo`] (the work, with no HTTP in it) → [`store`] (the only code that
//! runs SQL).

pub mod assess;
pub mod auth;
pub mod cli;
pub mod commands;
pub mod demo;
pub mod duplicates;
pub mod effort;
pub mod error;
pub mod export;
pub mod flags;
pub mod handlers;
pub mod intake;
pub mod review;
pub mod router;
pub mod store;

use std::path::PathBuf;

pub use router::app;

/// What every handler may reach.
#[derive(Clone)]
pub struct AppState {
    pub store: store::Store,
    pub photos: intake::photos::PhotoFiles,
    /// Where the built app (index.html, wasm, service worker) lives, if it is served.
    pub app_dir: Option<PathBuf>,
    /// The species checklist the key, the flags, review and the exports use, indexed by
    /// every scientific and common name.
    pub taxa: std::sync::Arc<assess::taxa::TaxonIndex>,
    /// Failed sign-ins by username and client address, for the rate limit.
    pub logins: auth::LoginLimiter,
    /// Positions of stored records, for finding duplicates. A `std` mutex held only
    /// for a query plus an insert, never across an `.await`, so that two arrivals of one
    /// animal always see each other.
    pub duplicates: std::sync::Arc<std::sync::Mutex<duplicates::Index>>,
    /// Turns for decoding photos (one per core), so parallel uploads cannot take all
    /// the memory; see `intake::gate`.
    pub decode_gate: intake::gate::DecodeGate,
}

/// The demo checklist, built in; `--checklist FILE` replaces it.
pub const DEMO_CHECKLIST: &str = include_str!("../../demo-records/checklist.json");

/// Reads a checklist file, or the built-in demo checklist when `path` is `None`.
pub fn load_checklist(path: Option<&std::path::Path>) -> anyhow::Result<species_key::Checklist> {
    use anyhow::Context as _;
    let text = match path {
        Some(path) => {
            std::fs::read_to_string(path).with_context(|| format!("reading the checklist {}", path.display()))?
        }
        None => DEMO_CHECKLIST.to_owned(),
    };
    let origin = path.map_or("the built-in demo checklist".to_owned(), |p| p.display().to_string());
    species_key::Checklist::from_json(&text).with_context(|| format!("checking {origin}"))
}

impl AppState {
    /// The checklist in use.
    pub fn checklist(&self) -> &species_key::Checklist {
        self.taxa.checklist()
    }

    /// Opens (and migrates) the database in `data_dir` and the photo folder beside it.
    pub fn open(
        data_dir: &std::path::Path,
        app_dir: Option<PathBuf>,
        checklist: species_key::Checklist,
    ) -> anyhow::Result<Self> {
        use anyhow::Context as _;
        std::fs::create_dir_all(data_dir)
            .with_context(|| format!("creating the data directory {}", data_dir.display()))?;
        let store = store::Store::open(&data_dir.join("wrackline.sqlite3"))?;
        let photos = intake::photos::PhotoFiles::open(&data_dir.join("photos"))?;
        let taxa = std::sync::Arc::new(assess::taxa::TaxonIndex::new(checklist));
        let duplicates = std::sync::Arc::new(std::sync::Mutex::new(duplicate_index(&store, &taxa)?));
        let decode_gate = intake::gate::DecodeGate::sized_to_cores();
        Ok(Self { store, photos, app_dir, taxa, logins: auth::LoginLimiter::default(), duplicates, decode_gate })
    }
}

/// The index of every stored record's places, merged records too (an undo brings them
/// back), with the search for duplicates run for any record stored without one (it
/// failed after the record was stored).
fn duplicate_index(store: &store::Store, taxa: &assess::taxa::TaxonIndex) -> anyhow::Result<duplicates::Index> {
    let raws = store.run_here(|conn| store::duplicates::all_records(conn))?;
    let points = raws.iter().flat_map(duplicates::raw_index_points);
    let index = std::sync::Mutex::new(duplicates::Index::build(points));
    let now = chrono::Utc::now();
    for id in store.run_here(|conn| store::duplicates::unsearched(conn))? {
        // A search that fails again is tried again at the next start or resend; the server
        // still starts.
        if let Err(err) = store.run_here(|conn| intake::search_duplicates(conn, &index, taxa, id, now)) {
            tracing::warn!(observation = id, error = %err, "search for duplicates failed at start-up");
        }
    }
    Ok(index.into_inner().unwrap_or_else(|p| p.into_inner()))
}

/// Serves the app on an already bound listener until Ctrl-C, so tests can bind
/// port 0 and read the port back.
pub async fn serve(listener: tokio::net::TcpListener, state: AppState) -> anyhow::Result<()> {
    // With each connection's address, for the sign-in rate limit.
    let router = app(state).into_make_service_with_connect_info::<std::net::SocketAddr>();
    axum::serve(listener, router)
        .with_graceful_shutdown(async {
            let _ = tokio::signal::ctrl_c().await;
        })
        .await?;
    Ok(())
}
