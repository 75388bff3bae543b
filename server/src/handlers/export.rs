//! `GET /api/export?format=csv|dwca|geojson|samples`: the same exports the command line
//! writes, streamed to the client as they are made (`samples`: the sample register, one
//! CSV row per sample, [`crate::export::samples`]).
//!
//! Anyone gets the public form ([`crate::protect`]: only confirmed records of taxa that
//! are not sensitive at full precision); `audience=full` (positions as recorded) is for a
//! signed-in reviewer or admin only, as `wrackline export --full` is on the server
//! itself. The archive states the licence `WRACKLINE_LICENCE` names; photo links point
//! under the configured public address, never under the request's `Host`.
//!
//! The export runs on a read-only connection of its own ([`crate::store::Store::read`]):
//! it blocks while the client reads slowly, and must not hold up submissions meanwhile.
//!
//! Filters: `taxon` (a checklist name), `from` and `to` (YYYY-MM-DD, days), `bbox`
//! (`SOUTH,WEST,NORTH,EAST`; WEST > EAST crosses the antimeridian), `state` (review-state
//! codes separated by commas, or `any`; default `confirmed`, as for the figures, for the
//! public and full exports alike). Area and days are tested on what is published.

use std::io::Write;

use axum::body::{Body, Bytes};
use axum::extract::{Query, State};
use axum::http::header;
use axum::response::{IntoResponse, Response};
use chrono::NaiveDate;
use serde::Deserialize;
use tokio::sync::mpsc;

use crate::assess::{DEFAULT_STATE, parse_states};
use crate::error::ApiError;
use crate::export::filters::{Days, parse_bbox};
use crate::export::{self, Audience, ExportRequest, Format};
use crate::handlers::access::Caller;
use crate::state::AppState;
use crate::taxa::TaxonIndex;

#[derive(Deserialize)]
pub struct ExportQuery {
    format: String,
    taxon: Option<String>,
    from: Option<String>,
    to: Option<String>,
    bbox: Option<String>,
    state: Option<String>,
    /// `full` for positions as recorded (signed-in reviewers and admins only);
    /// anything else, or nothing, is the public form.
    audience: Option<String>,
}

/// `GET /api/export`: public for anyone; `audience=full` only for a signed-in reviewer
/// or admin (sensitive species as recorded).
pub async fn export(
    State(state): State<AppState>,
    caller: Caller,
    Query(query): Query<ExportQuery>,
) -> Result<Response, ApiError> {
    let base_url = state.settings.public_url.as_ref().map(|u| u.origin().to_owned()).unwrap_or_default();
    let audience = if query.audience.as_deref() == Some("full") { Audience::Full } else { Audience::Public };
    let mut request = read_request(&query, audience, base_url, &state.taxa)?;
    request.licence = state.settings.licence;
    request.dataset = state.settings.dataset.clone();
    if audience == Audience::Full {
        let staff = caller
            .person
            .as_ref()
            .is_some_and(|p| matches!(p.role, shared_types::Role::Reviewer | shared_types::Role::Admin));
        if !staff {
            return Err(ApiError::Forbidden(
                "full exports are for signed-in reviewers and admins; the public export generalises sensitive species"
                    .into(),
            ));
        }
    }
    let (media_type, file_name) = request.format.media_type_and_file();
    let (sender, receiver) = mpsc::channel::<Result<Bytes, std::io::Error>>(8);
    let store = state.store.clone();
    let taxa = state.taxa.clone();
    tokio::spawn(async move {
        let failed = sender.clone();
        let outcome = store
            .read(move |conn| {
                let mut out = ChannelWriter { sender, buffer: Vec::with_capacity(CHUNK) };
                let result = export::write_export(conn, &taxa, &request, &mut out, &mut || {}).and_then(|summary| {
                    out.flush()?;
                    Ok(summary)
                });
                Ok(result)
            })
            .await;
        let problem = match outcome {
            Ok(Ok(_)) => return,
            Ok(Err(err)) => err.to_string(),
            Err(err) => err.to_string(),
        };
        tracing::error!(error = %problem, "export stopped part way");
        let _ = failed.send(Err(std::io::Error::other("the export stopped part way"))).await;
    });
    let stream = futures_util::stream::unfold(receiver, |mut receiver| async move {
        receiver.recv().await.map(|chunk| (chunk, receiver))
    });
    Ok((
        [
            (header::CONTENT_TYPE, media_type.to_owned()),
            (header::CONTENT_DISPOSITION, format!("attachment; filename=\"{file_name}\"")),
        ],
        Body::from_stream(stream),
    )
        .into_response())
}

fn read_request(
    query: &ExportQuery,
    audience: Audience,
    base_url: String,
    taxa: &TaxonIndex,
) -> Result<ExportRequest, ApiError> {
    let bad = |message: String| ApiError::BadRequest(message);
    let format = Format::parse(&query.format).ok_or_else(|| {
        bad(format!("unknown export format `{}`; available: csv, dwca, geojson, samples", query.format))
    })?;
    let taxon = query
        .taxon
        .as_deref()
        .map(|name| taxa.filter(name).ok_or_else(|| bad(format!("`{name}` is not a taxon on the checklist"))))
        .transpose()?;
    let day = |text: &Option<String>, what: &str| {
        text.as_deref()
            .map(|t| t.parse::<NaiveDate>().map_err(|_| bad(format!("{what} `{t}` is not a date (YYYY-MM-DD)"))))
            .transpose()
    };
    let days = Days { from: day(&query.from, "from")?, to: day(&query.to, "to")? };
    let bbox = query.bbox.as_deref().map(parse_bbox).transpose().map_err(|m| bad(format!("bbox: {m}")))?;
    let states: Vec<String> = query.state.as_deref().unwrap_or(DEFAULT_STATE).split(',').map(str::to_owned).collect();
    let states = parse_states(&states).map_err(bad)?;
    Ok(ExportRequest {
        format,
        audience,
        states,
        days,
        bbox,
        taxon,
        base_url,
        licence: export::Licence::default(),
        dataset: crate::settings::Dataset::NONE,
    })
}

const CHUNK: usize = 64 * 1024;

/// Hands the export to the response body in chunks; blocks (on the blocking pool) when
/// the client reads slower than the export is written, so memory stays bounded.
struct ChannelWriter {
    sender: mpsc::Sender<Result<Bytes, std::io::Error>>,
    buffer: Vec<u8>,
}

impl ChannelWriter {
    fn send(&mut self) -> std::io::Result<()> {
        if self.buffer.is_empty() {
            return Ok(());
        }
        let chunk = Bytes::from(std::mem::replace(&mut self.buffer, Vec::with_capacity(CHUNK)));
        self.sender
            .blocking_send(Ok(chunk))
            .map_err(|_| std::io::Error::new(std::io::ErrorKind::BrokenPipe, "the client stopped reading"))
    }
}

impl Write for ChannelWriter {
    fn write(&mut self, bytes: &[u8]) -> std::io::Result<usize> {
        self.buffer.extend_from_slice(bytes);
        if self.buffer.len() >= CHUNK {
            self.send()?;
        }
        Ok(bytes.len())
    }

    fn flush(&mut self) -> std::io::Result<()> {
        self.send()
    }
}
