//! wrackline's server and command line, as a library so that the binary, the tests
//! and the benchmarks all run the same code.
//!
//! Layers, top to bottom: [`cli`] (the `wrackline` command) → [`router`] (every
//! route, in one place) → [`handlers`] (the only code that knows HTTP) → [`intake`],
//! [`export`], [`demo`] (the work, with no HTTP in it) → [`store`] (the only code that
//! runs SQL).

pub mod assess;
pub mod cli;
pub mod commands;
pub mod demo;
pub mod error;
pub mod export;
pub mod handlers;
pub mod intake;
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
}

impl AppState {
    /// Opens (and migrates) the database in `data_dir` and the photo folder beside it.
    pub fn open(data_dir: &std::path::Path, app_dir: Option<PathBuf>) -> anyhow::Result<Self> {
        use anyhow::Context as _;
        std::fs::create_dir_all(data_dir)
            .with_context(|| format!("creating the data directory {}", data_dir.display()))?;
        let store = store::Store::open(&data_dir.join("wrackline.sqlite3"))?;
        let photos = intake::photos::PhotoFiles::open(&data_dir.join("photos"))?;
        Ok(Self { store, photos, app_dir })
    }
}

/// Serves the app on an already bound listener until Ctrl-C, so tests can bind
/// port 0 and read the port back.
pub async fn serve(listener: tokio::net::TcpListener, state: AppState) -> anyhow::Result<()> {
    let router = app(state);
    axum::serve(listener, router)
        .with_graceful_shutdown(async {
            let _ = tokio::signal::ctrl_c().await;
        })
        .await?;
    Ok(())
}
