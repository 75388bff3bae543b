//! `GET /api/range` and `GET /api/trend`: the command line's range and trend figures on
//! the stored records, as JSON for the app and for scripts; `GET /api/range/map.svg` and
//! `GET /api/trend/chart.svg` draw them, for the app to show.
//!
//! Query: `taxon` (a checklist name), `state` (review-state codes separated by commas, or
//! `any`; default `confirmed`), for range `period` (e.g. `2015-2019`, repeatable as
//! `period=2015-2019,2020-2024`) and `grid_centre` (`LAT,LON` of the AOO grid; default the
//! documented rule), for trend `generation_length` (years; default the checklist's for the
//! taxon).

use axum::Json;
use axum::extract::{Query, State};
use axum::http::header;
use axum::response::{IntoResponse, Response};
use serde::Deserialize;

use crate::assess::chart;
use crate::assess::dates::Period;
use crate::assess::input::read_store;
use crate::assess::map::taxon_map;
use crate::assess::range::{GridBasis, RangeOptions, RangeReport, choose_grid, parse_centre, range_report};
use crate::assess::trend::{EffortUnit, TrendReport, generation_length, rate_words, stored_trend_input, trend_report};
use crate::assess::{DEFAULT_STATE, describe_states, parse_states};
use crate::error::ApiError;
use crate::handlers::access::Caller;
use crate::state::AppState;
use crate::taxa::TaxonFilter;

#[derive(Deserialize)]
pub struct FigureQuery {
    taxon: Option<String>,
    state: Option<String>,
    period: Option<String>,
    /// `LAT,LON`: the AOO grid's centre (default: the documented rule, see `assess::range::choose_grid`).
    grid_centre: Option<String>,
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

async fn stored_records(
    state: &AppState,
    query: &FigureQuery,
) -> Result<(Vec<crate::assess::input::PointRecord>, String), ApiError> {
    let values: Vec<String> = query.state.as_deref().unwrap_or(DEFAULT_STATE).split(',').map(str::to_owned).collect();
    let states = parse_states(&values).map_err(ApiError::BadRequest)?;
    let used = describe_states(&states);
    let records = state.store.read(move |conn| read_store(conn, states)).await?;
    Ok((records, used))
}

/// Whether the caller may see where a sensitive species was: signed-in reviewers and admins.
fn sees_sensitive_places(caller: &Caller) -> bool {
    caller.person.as_ref().is_some_and(|p| matches!(p.role, shared_types::Role::Reviewer | shared_types::Role::Admin))
}

/// Whether a taxon's public locations are generalised (Chapman 2020 categories in the
/// checklist). A genus, family, order or superorder is sensitive when any of its species
/// is: its hull and map would show where that species was.
fn sensitive(state: &AppState, name: &str) -> bool {
    state.taxa.named(name).is_some_and(|taxon| taxon.sensitivity != species_key::Sensitivity::None)
}

/// `GET /api/range`: figures for everyone; for a sensitive species the hull's corners
/// (exact record positions) only for signed-in reviewers.
pub async fn range(
    State(state): State<AppState>,
    caller: Caller,
    Query(query): Query<FigureQuery>,
) -> Result<Json<RangeReport>, ApiError> {
    let mut report = range_of(&state, &query).await?;
    if !sees_sensitive_places(&caller) {
        for taxon in report.taxa.iter_mut().filter(|t| sensitive(&state, &t.taxon)) {
            for figures in taxon.periods.iter_mut().filter_map(|p| p.figures.as_mut()) {
                figures.eoo.hull.clear();
            }
        }
    }
    Ok(Json(report))
}

/// `GET /api/range/map.svg`: the map of one taxon (give `taxon` when the records hold several).
pub async fn range_map(
    State(state): State<AppState>,
    caller: Caller,
    Query(query): Query<FigureQuery>,
) -> Result<Response, ApiError> {
    let report = range_of(&state, &query).await?;
    if !sees_sensitive_places(&caller) && report.taxa.iter().any(|t| sensitive(&state, &t.taxon)) {
        return Err(ApiError::Forbidden(
            "this is a sensitive species: its map shows where records are, so it is for signed-in reviewers (Chapman 2020)".into(),
        ));
    }
    let taxon = match report.taxa.as_slice() {
        [one] => one,
        [] => return Err(ApiError::NotFound(format!("no records to map ({})", report.records_used))),
        _ => return Err(ApiError::BadRequest("the records hold several taxa; choose one with `taxon`".into())),
    };
    Ok(svg(taxon_map(taxon, &report.grid)))
}

/// `GET /api/trend/chart.svg`: the trend chart.
pub async fn trend_chart(
    State(state): State<AppState>,
    Query(query): Query<FigureQuery>,
) -> Result<Response, ApiError> {
    let report = trend_of(&state, &query).await?;
    let title = query.taxon.clone().unwrap_or_else(|| "Yearly trend".into());
    let rate = rate_words(&report, query.effort.unwrap_or_default());
    Ok(svg(chart::trend_chart(&title, rate, &report.years, &report.trend)))
}

fn svg(document: String) -> Response {
    ([(header::CONTENT_TYPE, "image/svg+xml")], document).into_response()
}

async fn range_of(state: &AppState, query: &FigureQuery) -> Result<RangeReport, ApiError> {
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
    let (records, records_used) = stored_records(state, query).await?;
    let given = query
        .grid_centre
        .as_deref()
        .map(parse_centre)
        .transpose()
        .map_err(|message| ApiError::InvalidField { field: "grid_centre".into(), message })?;
    let (grid, grid_choice) = choose_grid(given, GridBasis::Stored(state.checklist()))
        .map_err(|err| ApiError::BadRequest(err.to_string()))?;
    let options = RangeOptions { taxon, periods, grid, grid_choice, records_used };
    range_report(&records, &state.taxa, &options).map_err(|err| ApiError::BadRequest(err.to_string()))
}

pub async fn trend(
    State(state): State<AppState>,
    Query(query): Query<FigureQuery>,
) -> Result<Json<TrendReport>, ApiError> {
    Ok(Json(trend_of(&state, &query).await?))
}

async fn trend_of(state: &AppState, query: &FigureQuery) -> Result<TrendReport, ApiError> {
    let taxon = taxon_of(state, query)?;
    let names = &*state.taxa;
    let generation = generation_length(query.generation_length, taxon.as_ref(), names)
        .map_err(|err| ApiError::BadRequest(err.to_string()))?;
    let (records, records_used) = stored_records(state, query).await?;
    let walks = state.store.read(crate::store::walks::list_walks).await?;
    let unit = query.effort.unwrap_or_default();
    let (years, counts, notes) = stored_trend_input(&records, &walks, taxon.as_ref(), names, unit);
    trend_report(years, counts, generation, records_used, notes).map_err(|err| ApiError::BadRequest(err.to_string()))
}
