//! The routes for the people who go out: the urgent list, the response log, samples,
//! carcass reports and the sample lookup. Written beside the other routes' client (the
//! parent module) and read the same way.

use shared_types::{CarcassReport, ResponseReport, SampleInput, SampleLookup, UrgentItem};

use super::{ApiError, Caller, act, get, query_part};

fn body(value: &impl serde::Serialize) -> Result<serde_json::Value, ApiError> {
    serde_json::to_value(value).map_err(|err| ApiError::Unsendable(err.to_string()))
}

/// `GET /api/urgent`: live animals, those still waiting for a response first.
pub async fn urgent() -> Result<Vec<UrgentItem>, ApiError> {
    get("/api/urgent", Caller::Reviewer).await
}

/// `POST /api/review/records/{id}/responses`: who went, when, and what happened.
pub async fn log_response(id: &str, report: &ResponseReport) -> Result<(), ApiError> {
    act("POST", &format!("/api/review/records/{id}/responses"), Some(body(report)?), Caller::Reviewer).await
}

/// `POST /api/review/records/{id}/samples`: a sample taken from the record's animal.
pub async fn add_sample(id: &str, sample: &SampleInput) -> Result<(), ApiError> {
    act("POST", &format!("/api/review/records/{id}/samples"), Some(body(sample)?), Caller::Reviewer).await
}

/// `PUT /api/samples/{code}`: corrects the sample now known as `code`.
pub async fn change_sample(code: &str, sample: &SampleInput) -> Result<(), ApiError> {
    act("PUT", &format!("/api/samples/{}", query_part(code)), Some(body(sample)?), Caller::Reviewer).await
}

/// `PUT /api/review/records/{id}/carcass`: the carcass's fate and what was found.
pub async fn set_carcass(id: &str, report: &CarcassReport) -> Result<(), ApiError> {
    act("PUT", &format!("/api/review/records/{id}/carcass"), Some(body(report)?), Caller::Reviewer).await
}

/// `GET /api/samples/{code}`: the sample, its animal and the animal's other samples.
pub async fn sample_lookup(code: &str) -> Result<SampleLookup, ApiError> {
    get(&format!("/api/samples/{}", query_part(code)), Caller::Reviewer).await
}
