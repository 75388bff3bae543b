//! The dataset as published for harvesting: the public Darwin Core Archive of confirmed
//! records (the protected form, [`crate::protect`]) and its EML, at one stable address.
//!
//! The archive is built once and kept (one version only, so memory holds at most one
//! archive) until the store reports a write ([`crate::store::Store::changes`]); a
//! request that finds no write since is answered from the kept copy, so conditional
//! requests never rebuild it. After a write the next request builds it again; if the
//! records come out the same (the package version, a hash of the data files, is
//! unchanged), the entity tag and the time it was last modified stay as they were, so a
//! harvester sees a new version only when the published data, the licence or the
//! dataset's description changed. The time each version was first built is kept in the
//! store, so a restart changes neither. Only one build runs at a time.

use std::io::Read as _;
use std::sync::Arc;
use std::time::SystemTime;

use sha2::{Digest as _, Sha256};

use super::{Audience, ExportError, ExportRequest, Format, write_export};
use crate::export::filters::Days;
use crate::settings::Settings;
use crate::store::{Store, deployment};
use crate::taxa::TaxonIndex;

/// One published version.
#[derive(Debug)]
pub struct Published {
    /// The store's count of writes when it was read.
    changes: u64,
    /// The EML `packageId`: `<dataset UUID>/<version>`.
    pub package_id: String,
    /// The entity tag (quoted): the package version and a hash of the settings the
    /// metadata states.
    pub etag: String,
    /// When this version was first built (whole seconds), kept in the store across
    /// restarts.
    pub modified: SystemTime,
    pub archive: Vec<u8>,
    pub eml: Vec<u8>,
}

/// The kept version, shared by every request.
#[derive(Clone, Default)]
pub struct PublishedCache {
    slot: Arc<tokio::sync::Mutex<Option<Arc<Published>>>>,
}

impl PublishedCache {
    /// The current published version: the kept one when nothing was written since it
    /// was built, else a new build.
    pub async fn current(
        &self,
        store: &Store,
        taxa: &Arc<TaxonIndex>,
        settings: &Settings,
    ) -> Result<Arc<Published>, ExportError> {
        let mut slot = self.slot.lock().await;
        let changes = store.changes();
        if let Some(kept) = slot.as_ref().filter(|kept| kept.changes == changes) {
            return Ok(kept.clone());
        }
        let request = published_request(settings);
        let settings_tag = settings_fingerprint(&request);
        let taxa = taxa.clone();
        let (archive, summary) = store
            .read(move |conn| {
                let mut archive = Vec::new();
                Ok(write_export(conn, &taxa, &request, &mut archive, &mut || {}).map(|summary| (archive, summary)))
            })
            .await??;
        let package_id = summary.package_id.unwrap_or_default();
        let version = package_id.rsplit('/').next().unwrap_or_default();
        let etag = format!("\"{version}-{settings_tag}\"");
        let (modified, changes) = match slot.as_ref() {
            Some(kept) if kept.etag == etag => (kept.modified, changes),
            _ => first_published(store, &etag, changes).await?,
        };
        let eml = eml_of(&archive)?;
        let published = Arc::new(Published { changes, package_id, etag, modified, archive, eml });
        *slot = Some(published.clone());
        Ok(published)
    }
}

/// What is published: the public archive of confirmed records, links under the public
/// address, with the operator's licence and dataset description.
fn published_request(settings: &Settings) -> ExportRequest {
    ExportRequest {
        format: Format::Dwca,
        audience: Audience::Public,
        states: Some(vec![shared_types::ReviewState::Confirmed]),
        days: Days::default(),
        bbox: None,
        taxon: None,
        base_url: settings.public_url.as_ref().map(|u| u.origin().to_owned()).unwrap_or_default(),
        licence: settings.licence,
        dataset: settings.dataset.clone(),
    }
}

/// 8 hex digits that change when the metadata's settings do.
fn settings_fingerprint(request: &ExportRequest) -> String {
    let described = format!("{:?}\n{:?}\n{}", request.licence, request.dataset, request.base_url);
    Sha256::digest(described.as_bytes()).iter().take(4).map(|b| format!("{b:02x}")).collect()
}

/// When version `etag` was first built, kept in the store so that it survives restarts
/// (now, for a version never built before), and the store's count of writes to keep
/// with it: keeping the time is itself a write, which must not make the next request
/// build again, but any other write in between must.
async fn first_published(store: &Store, etag: &str, read_at: u64) -> Result<(SystemTime, u64), ExportError> {
    let tag = etag.to_owned();
    if let Some(at) = store.read(move |conn| deployment::version_published_at(conn, &tag)).await? {
        return Ok((parse_time(&at), read_at));
    }
    let now = whole_seconds(SystemTime::now());
    let at = chrono::DateTime::<chrono::Utc>::from(now).to_rfc3339_opts(chrono::SecondsFormat::Secs, true);
    let tag = etag.to_owned();
    let kept = store.run(move |conn| deployment::keep_version_published_at(conn, &tag, &at)).await?;
    let changes = store.changes();
    Ok((parse_time(&kept), if changes == read_at + 1 { changes } else { read_at }))
}

/// A kept RFC 3339 time; the start of 1970 if it cannot be read, which only makes
/// conditional requests by date miss (the entity tag still matches).
fn parse_time(at: &str) -> SystemTime {
    chrono::DateTime::parse_from_rfc3339(at).map_or(SystemTime::UNIX_EPOCH, SystemTime::from)
}

fn whole_seconds(time: SystemTime) -> SystemTime {
    let seconds = time.duration_since(SystemTime::UNIX_EPOCH).map_or(0, |d| d.as_secs());
    SystemTime::UNIX_EPOCH + std::time::Duration::from_secs(seconds)
}

/// `eml.xml` read back from the archive.
fn eml_of(archive: &[u8]) -> Result<Vec<u8>, ExportError> {
    let mut zip = zip::ZipArchive::new(std::io::Cursor::new(archive))?;
    let mut eml = Vec::new();
    zip.by_name("eml.xml")?.read_to_end(&mut eml)?;
    Ok(eml)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// A write that changes nothing published: a new sign-in.
    async fn unpublished_write(store: &Store) {
        let username = format!("person-{}", uuid::Uuid::new_v4().simple());
        let role = shared_types::Role::Reviewer;
        crate::people::add_staff(store, None, &username, role, "Someone".into(), "a long password".into())
            .await
            .unwrap();
    }

    #[tokio::test]
    async fn the_kept_version_is_served_until_a_write_and_keeps_its_identity_when_the_data_did_not_change() {
        let dir = tempfile::tempdir().unwrap();
        let store = Store::open(&dir.path().join("wrackline.sqlite3")).unwrap();
        let taxa = Arc::new(TaxonIndex::new(crate::taxa::load_checklist(None).unwrap()));
        let settings = Settings::default();
        let cache = PublishedCache::default();
        let first = cache.current(&store, &taxa, &settings).await.unwrap();
        let again = cache.current(&store, &taxa, &settings).await.unwrap();
        assert!(Arc::ptr_eq(&first, &again), "nothing written: the kept archive, not a new build");
        // A lookup on the writer's connection (as a photo's download does) writes nothing:
        // a stranger's requests must not make the next harvest build it all again.
        store.run(|conn| crate::store::observations::count_observations(conn)).await.unwrap();
        let after_a_read = cache.current(&store, &taxa, &settings).await.unwrap();
        assert!(Arc::ptr_eq(&first, &after_a_read), "a read on the writer: still the kept archive");
        // A write that changes nothing published: built again, the same identity.
        tokio::time::sleep(std::time::Duration::from_millis(1100)).await;
        unpublished_write(&store).await;
        let rebuilt = cache.current(&store, &taxa, &settings).await.unwrap();
        assert!(!Arc::ptr_eq(&first, &rebuilt), "a write: built again");
        assert_eq!((&rebuilt.etag, rebuilt.modified), (&first.etag, first.modified));
        assert_eq!(rebuilt.package_id, first.package_id);
        // Another licence is another version, though the records are the same.
        let other = Settings { licence: crate::settings::Licence::Cc0, ..Settings::default() };
        unpublished_write(&store).await;
        let relicensed = cache.current(&store, &taxa, &other).await.unwrap();
        assert_ne!(relicensed.etag, first.etag);
        assert_eq!(relicensed.package_id, first.package_id, "the data files are the same");
    }
}
