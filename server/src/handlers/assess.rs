//! `GET /api/range` and `GET /api/trend`: the command line's range and trend figures on
//! the stored records, as JSON for the app and for scripts; `GET /api/range/map.svg` and
//! `GET /api/trend/chart.svg` draw them, for the app to show.
//!
//! Every figure is made from the records as the caller may see them
//! ([`crate::assess::input::read_store`]): for anyone but a signed-in reviewer or admin,
//! at their published positions and under their resolved names, exactly what the
//! public export shows.
//!
//! Query: `taxon` (a checklist name), `state` (review-state codes separated by commas, or
//! `any`; default `confirmed`), for range `period` (e.g. `2015-2019`, repeatable as
//! `period=2015-2019,2020-2024`), `grid_centre` (`LAT,LON` of the first AOO grid; default the
//! documented rule), `cluster_km` (default 10) and `outlier_km` (default 500), for trend
//! `generation_length` (years; default the checklist's for the taxon).
//!
//! Range figures resample the records (200 times), so their cost grows with the records
//! stored for a taxon; the server's request time limit bounds it.

use axum::Json;
use axum::extract::{Query, State};
use axum::http::header;
use axum::response::{IntoResponse, Response};
use serde::Deserialize;

use crate::assess::chart;
use crate::assess::dates::Period;
use crate::assess::input::read_store;
use crate::assess::map::taxon_map;
use crate::assess::range::{
    GridBasis, RangeOptions, RangeReport, choose_grid, parse_centre, parse_distance_km, range_report,
};
use crate::assess::trend::{EffortUnit, TrendReport, generation_length, rate_words, stored_trend_input, trend_report};
use crate::assess::{DEFAULT_STATE, describe_states, parse_states};
use crate::error::ApiError;
use crate::handlers::access::Caller;
use crate::protect::{Audience, Publisher};
use crate::state::AppState;
use crate::taxa::TaxonFilter;

#[derive(Deserialize)]
pub struct FigureQuery {
    taxon: Option<String>,
    state: Option<String>,
    period: Option<String>,
    /// `LAT,LON`: the first AOO grid's centre (default: the documented rule, see `assess::range::choose_grid`).
    grid_centre: Option<String>,
    /// The location guide's linking distance, km (default 10).
    cluster_km: Option<String>,
    /// The distance beyond which a record is listed as an outlier, km (default 500).
    outlier_km: Option<String>,
    generation_length: Option<f64>,
    /// `km` (default) or `hours`: the walking effort encounter rates are per.
    effort: Option<EffortUnit>,
}

fn taxon_of(state: &AppState, query: &FigureQuery) -> Result<Option<TaxonFilter>, ApiError> {
    query
        .taxon
        .as_deref()
        .map(|name| {
            state
                .taxa
                .filter(name)
                .ok_or_else(|| ApiError::BadRequest(format!("`{name}` is not a taxon on the checklist")))
        })
        .transpose()
}

/// The stored records in the states asked for, as `audience` may see them, and words
/// saying which records they are.
async fn stored_records(
    state: &AppState,
    query: &FigureQuery,
    audience: Audience,
) -> Result<(Vec<crate::assess::input::PointRecord>, String), ApiError> {
    let values: Vec<String> = query.state.as_deref().unwrap_or(DEFAULT_STATE).split(',').map(str::to_owned).collect();
    let states = parse_states(&values).map_err(ApiError::BadRequest)?;
    let mut used = describe_states(&states);
    if audience == Audience::Public {
        used.push_str(
            ", at their public positions (sensitive, unresolved and unconfirmed records generalised, Chapman 2020)",
        );
    }
    let taxa = state.taxa.clone();
    let records = state
        .store
        .read(move |conn| {
            let publisher = Publisher::load(conn, &taxa, audience)?;
            read_store(conn, states, &publisher)
        })
        .await?;
    Ok((records, used))
}

/// `GET /api/range`: figures from the records as the caller may see them.
pub async fn range(
    State(state): State<AppState>,
    caller: Caller,
    Query(query): Query<FigureQuery>,
) -> Result<Json<RangeReport>, ApiError> {
    Ok(Json(range_of(&state, &query, caller.audience()).await?))
}

/// `GET /api/range/map.svg`: the map of one taxon (give `taxon` when the records hold
/// several), drawn from the records as the caller may see them.
pub async fn range_map(
    State(state): State<AppState>,
    caller: Caller,
    Query(query): Query<FigureQuery>,
) -> Result<Response, ApiError> {
    let report = range_of(&state, &query, caller.audience()).await?;
    let taxon = match report.taxa.as_slice() {
        [one] => one,
        [] => return Err(ApiError::NotFound(format!("no records to map ({})", report.records_used))),
        _ => return Err(ApiError::BadRequest("the records hold several taxa; choose one with `taxon`".into())),
    };
    Ok(svg(taxon_map(taxon)))
}

/// `GET /api/trend/chart.svg`: the trend chart.
pub async fn trend_chart(
    State(state): State<AppState>,
    caller: Caller,
    Query(query): Query<FigureQuery>,
) -> Result<Response, ApiError> {
    let report = trend_of(&state, &query, caller.audience()).await?;
    let title = query.taxon.clone().unwrap_or_else(|| "Yearly trend".into());
    let rate = rate_words(&report, query.effort.unwrap_or_default());
    Ok(svg(chart::trend_chart(&title, rate, &report.years, &report.trend)))
}

fn svg(document: String) -> Response {
    ([(header::CONTENT_TYPE, "image/svg+xml")], document).into_response()
}

async fn range_of(state: &AppState, query: &FigureQuery, audience: Audience) -> Result<RangeReport, ApiError> {
    let taxon = taxon_of(state, query)?;
    let periods = query
        .period
        .as_deref()
        .map(|p| {
            p.split(',')
                .map(|one| Period::parse_years(one).map_err(ApiError::BadRequest))
                .collect::<Result<Vec<_>, _>>()
        })
        .transpose()?
        .unwrap_or_default();
    let (records, records_used) = stored_records(state, query, audience).await?;
    let given = query
        .grid_centre
        .as_deref()
        .map(parse_centre)
        .transpose()
        .map_err(|message| ApiError::InvalidField { field: "grid_centre".into(), message })?;
    let (first_grid, grid_choice) = choose_grid(given, GridBasis::Stored(state.checklist()))
        .map_err(|err| ApiError::BadRequest(err.to_string()))?;
    let distance = |field: &str, value: &Option<String>, default: f64| {
        value
            .as_deref()
            .map(parse_distance_km)
            .transpose()
            .map(|km| km.unwrap_or(default))
            .map_err(|message| ApiError::InvalidField { field: field.into(), message })
    };
    let options = RangeOptions {
        taxon,
        periods,
        first_grid,
        grid_choice,
        records_used,
        cluster_km: distance("cluster_km", &query.cluster_km, analysis::range::DEFAULT_CLUSTER_KM)?,
        outlier_km: distance("outlier_km", &query.outlier_km, analysis::range::DEFAULT_OUTLIER_KM)?,
        resamples: analysis::range::DEFAULT_RESAMPLES,
    };
    let taxa = state.taxa.clone();
    tokio::task::spawn_blocking(move || range_report(&records, &taxa, &options))
        .await
        .map_err(|err| ApiError::Internal(anyhow::anyhow!("range figures stopped: {err}")))
}

pub async fn trend(
    State(state): State<AppState>,
    caller: Caller,
    Query(query): Query<FigureQuery>,
) -> Result<Json<TrendReport>, ApiError> {
    Ok(Json(trend_of(&state, &query, caller.audience()).await?))
}

async fn trend_of(state: &AppState, query: &FigureQuery, audience: Audience) -> Result<TrendReport, ApiError> {
    let taxon = taxon_of(state, query)?;
    let names = &*state.taxa;
    let generation = generation_length(query.generation_length, taxon.as_ref(), names)
        .map_err(|err| ApiError::BadRequest(err.to_string()))?;
    let (records, records_used) = stored_records(state, query, audience).await?;
    let walks = state.store.read(crate::store::walks::list_walks).await?;
    let unit = query.effort.unwrap_or_default();
    let (years, counts, notes) = stored_trend_input(&records, &walks, taxon.as_ref(), names, unit);
    trend_report(years, counts, generation, records_used, notes).map_err(|err| ApiError::BadRequest(err.to_string()))
}
