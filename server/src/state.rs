//! What every handler may reach: the store, the photo folder, the checklist, the
//! duplicate index and its retries, the sign-in and submission limits, and the turns
//! for uploads and for decoding photos, opened together at start-up. Opening also
//! sweeps the photo folder of what a crash or a failed request left behind.

use crate::settings::Settings;
use crate::{duplicates, intake, people, store, taxa};

use std::path::PathBuf;

/// What every handler may reach.
#[derive(Clone)]
pub struct AppState {
    pub store: store::Store,
    pub photos: intake::photos::PhotoFiles,
    /// A folder with a built app (index.html, wasm, service worker) to serve instead of
    /// the one built into the binary (`--app-dir`, for development).
    pub app_dir: Option<PathBuf>,
    /// The species checklist the key, the flags, review and the exports use, indexed by
    /// every scientific and common name.
    pub taxa: std::sync::Arc<taxa::TaxonIndex>,
    /// Failed sign-ins by username and client address, for the rate limit.
    pub logins: people::auth::LoginLimiter,
    /// Positions of stored records, for finding duplicates. A `std` mutex held only
    /// for a query plus an insert, never across an `.await`, so that two arrivals of one
    /// animal always see each other.
    pub duplicates: std::sync::Arc<std::sync::Mutex<duplicates::Index>>,
    /// Turns for decoding photos (one per core), so parallel uploads cannot take all
    /// the memory; see `intake::gate`.
    pub decode_gate: intake::gate::DecodeGate,
    /// Searches for duplicates that failed after their record was stored, tried again.
    pub retries: duplicates::later::Retries,
    /// Turns for receiving uploads (`settings.max_uploads`).
    pub uploads: std::sync::Arc<tokio::sync::Semaphore>,
    /// Submissions per phone and per client address (`settings`).
    pub device_pace: intake::rate::RateLimiter<i64>,
    pub address_pace: intake::rate::RateLimiter<std::net::IpAddr>,
    /// The operator's settings.
    pub settings: Settings,
    /// Wakes the responders' notification task when a notification is made.
    pub notify_wake: std::sync::Arc<tokio::sync::Notify>,
    /// The published dataset, kept until the next write (`export::published`).
    pub published: crate::export::published::PublishedCache,
}

impl AppState {
    /// The checklist in use.
    pub fn checklist(&self) -> &species_key::Checklist {
        self.taxa.checklist()
    }

    /// Starts the tasks that run beside the requests: the responders' notifications.
    /// `Err` names a setting that stops them from working.
    pub fn start_background_work(&self) -> anyhow::Result<()> {
        crate::notify::worker::start(self.store.clone(), self.settings.responders.clone(), self.notify_wake.clone())
            .map_err(|problem| anyhow::anyhow!("responders' notifications: {problem}"))
    }

    /// The parts of the server intake works with.
    pub fn intake(&self) -> intake::Intake {
        intake::Intake {
            store: self.store.clone(),
            photos: self.photos.clone(),
            decode_gate: self.decode_gate.clone(),
            taxa: self.taxa.clone(),
            min_free_bytes: self.settings.min_free_bytes(),
        }
    }

    /// Opens (and migrates) the database in `data_dir` and the photo folder beside it,
    /// with the default settings.
    pub fn open(
        data_dir: &std::path::Path,
        app_dir: Option<PathBuf>,
        checklist: species_key::Checklist,
    ) -> anyhow::Result<Self> {
        Self::open_with(data_dir, app_dir, checklist, Settings::default())
    }

    /// Opens (and migrates) the database in `data_dir` and the photo folder beside it,
    /// sweeps the photo folder, builds the duplicate index, and sets the limits from
    /// `settings`.
    pub fn open_with(
        data_dir: &std::path::Path,
        app_dir: Option<PathBuf>,
        checklist: species_key::Checklist,
        settings: Settings,
    ) -> anyhow::Result<Self> {
        use anyhow::Context as _;
        std::fs::create_dir_all(data_dir)
            .with_context(|| format!("creating the data directory {}", data_dir.display()))?;
        let store = store::Store::open(&data_dir.join("wrackline.sqlite3"))?;
        let photos = intake::photos::PhotoFiles::open(&data_dir.join("photos"))?;
        sweep_photos(&store, &photos)?;
        let taxa = std::sync::Arc::new(taxa::TaxonIndex::new(checklist));
        let duplicates = duplicates::search::build_index(&store, &taxa)?;
        let retries = duplicates::later::Retries::new(store.clone(), duplicates.clone(), taxa.clone());
        Ok(Self {
            store,
            photos,
            app_dir,
            taxa,
            logins: people::auth::LoginLimiter::default(),
            duplicates,
            decode_gate: intake::gate::DecodeGate::sized_to_cores(),
            retries,
            uploads: std::sync::Arc::new(tokio::sync::Semaphore::new(settings.max_uploads.max(1))),
            device_pace: intake::rate::RateLimiter::new(intake::rate::Pace {
                burst: settings.device_burst,
                per_minute: settings.device_per_minute,
            }),
            address_pace: intake::rate::RateLimiter::new(intake::rate::Pace {
                burst: settings.address_burst,
                per_minute: settings.address_per_minute,
            }),
            settings,
            notify_wake: std::sync::Arc::default(),
            published: crate::export::published::PublishedCache::default(),
        })
    }
}

/// Removes leftover temporary files and photo files no stored photo names (a crash
/// between writing a file and committing its row leaves one), and says so in the log.
fn sweep_photos(store: &store::Store, photos: &intake::photos::PhotoFiles) -> anyhow::Result<()> {
    let swept = photos.sweep(|prefix| {
        let prefix = prefix.to_owned();
        Ok(store.read_here(move |conn| store::observations::photo_hashes_starting(conn, &prefix))?)
    })?;
    if swept != intake::photos::Swept::default() {
        tracing::info!(
            temporary = swept.temporary,
            unreferenced = swept.unreferenced,
            "start-up: removed leftover temporary files and photo files no record names"
        );
    }
    Ok(())
}
