//! One typed client for every server route the app calls, so each route's method, path,
//! caller and answer type are written down once, and every answer is read the same way:
//! a 2xx body is the result; any other status is an [`ApiError`] carrying the server's
//! `{"error", "field"}` body, decoded here and nowhere else with [`ErrorBody`]; no
//! answer at all is [`ApiError::NoAnswer`]. Whether trying again may help is decided
//! here too ([`ApiError::is_temporary`]), for the sync loop and the screens alike.
//!
//! Who calls travels as [`Caller`]: anyone, the phone (its identity as a bearer token)
//! or the signed-in reviewer (the session cookie goes by itself; the CSRF token the
//! sign-in returned is sent back in `X-CSRF-Token`). A tab that lacks the token (a second
//! tab, a restarted browser) gets it from `GET /api/session`, and a change refused for
//! a missing token is sent once more with it ([`is_csrf_refusal`]).

use std::collections::BTreeMap;
use std::fmt;

use serde::de::DeserializeOwned;
use serde::{Deserialize, Serialize};
use shared_types::{
    DeviceIdentity, DeviceRequest, ErrorBody, LoginRequest, MyRecord, PairDecision, PersonEvent, QueueItem, Receipt,
    Reply, ReviewDetail, Role, SessionInfo, Submission, WalkLink, WalkReceipt, WalkSubmission,
};

pub mod fieldwork;

use crate::data::device::{self, Answer};
use crate::data::local;
use crate::data::words::{t, t_args};

/// Why a call did not give what was asked for. Its `Display` is the sentence to show.
#[derive(Debug, Clone, PartialEq)]
pub enum ApiError {
    /// No answer arrived (no connection, or the browser gave up); the browser's words.
    NoAnswer(String),
    /// The server answered with a status other than 2xx, with its error body when it
    /// sent one (a proxy's page or an empty body is not one).
    Status { status: u16, body: Option<ErrorBody> },
    /// A 2xx answer whose body is not what the route returns.
    Unreadable(String),
    /// The request itself could not be written as JSON.
    Unsendable(String),
}

impl ApiError {
    /// Whether the same request may succeed later: no answer, an unreadable answer (a
    /// captive portal's page), a timeout (408), too many requests (429) or a server
    /// fault (5xx). Any other status refuses the request for a reason that stays.
    pub fn is_temporary(&self) -> bool {
        match self {
            Self::NoAnswer(_) | Self::Unreadable(_) => true,
            Self::Status { status, .. } => matches!(status, 408 | 429 | 500..=599),
            Self::Unsendable(_) => false,
        }
    }
}

impl ApiError {
    /// The request field the server named as the problem, if it named one
    /// (`position.latitude`): for the form to show the words beside that control.
    pub fn field(&self) -> Option<&str> {
        match self {
            Self::Status { body: Some(ErrorBody { field, .. }), .. } => field.as_deref(),
            _ => None,
        }
    }
}

/// A status the server sent without words of its own (a proxy's page, an empty body), in
/// plain words (RFC 9110 §15 for what each means).
fn status_words(status: u16) -> String {
    match status {
        401 => t("api-not-signed-in"),
        403 => t("api-not-allowed"),
        404 => t("api-not-known"),
        408 | 504 => t("api-too-slow"),
        409 => t("api-other-version"),
        413 => t("api-too-large"),
        415 => t("api-wrong-kind-of-file"),
        429 => t("api-busy"),
        502 | 503 => t("api-unreachable"),
        500..=599 => t("api-server-problem"),
        _ => t("api-not-accepted"),
    }
}

/// The sentence to show: the server's own words when it sent some (without the field
/// path, which the form turns into the control's label), else plain words.
impl fmt::Display for ApiError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            Self::NoAnswer(_) => f.write_str(&t("api-no-connection")),
            Self::Status { body: Some(ErrorBody { error, .. }), .. } => f.write_str(error),
            Self::Status { status, body: None } => f.write_str(&t_args(
                "api-status",
                &[("words", status_words(*status).into()), ("status", status.to_string().into())],
            )),
            Self::Unreadable(_) => f.write_str(&t("api-unreadable")),
            Self::Unsendable(why) => f.write_str(&t_args("api-unsendable", &[("why", why.as_str().into())])),
        }
    }
}

/// What an answer means: the body of a 2xx, else why not.
pub fn body_of(answer: Result<Answer, String>) -> Result<String, ApiError> {
    match answer {
        Err(why) => Err(ApiError::NoAnswer(why)),
        Ok(Answer { status: 200..=299, body }) => Ok(body),
        Ok(Answer { status, body }) => Err(ApiError::Status { status, body: ErrorBody::parse(&body) }),
    }
}

/// A 2xx body read as the route's answer type.
pub fn read<T: DeserializeOwned>(body: &str) -> Result<T, ApiError> {
    serde_json::from_str(body).map_err(|err| ApiError::Unreadable(err.to_string()))
}

fn to_json(value: &impl Serialize) -> Result<String, ApiError> {
    serde_json::to_string(value).map_err(|err| ApiError::Unsendable(err.to_string()))
}

/// `text` as one part of a URL query, encoded as JavaScript's `encodeURIComponent`
/// does (ECMA-262): each UTF-8 byte as `%XX`, except `A–Z a–z 0–9 - _ . ! ~ * ' ( )`.
pub fn query_part(text: &str) -> String {
    let mut out = String::with_capacity(text.len());
    for byte in text.bytes() {
        if byte.is_ascii_alphanumeric() || b"-_.!~*'()".contains(&byte) {
            out.push(char::from(byte));
        } else {
            out.push_str(&format!("%{byte:02X}"));
        }
    }
    out
}

const CSRF_KEY: &str = "wrackline.csrf";

/// Who makes a call.
#[derive(Debug, Clone, Copy)]
pub enum Caller<'a> {
    Anyone,
    /// The phone, with its identity token.
    Phone(&'a str),
    /// The signed-in reviewer or admin of this tab.
    Reviewer,
}

impl Caller<'_> {
    fn headers(self) -> Vec<(&'static str, String)> {
        match self {
            Self::Anyone => Vec::new(),
            Self::Phone(token) => vec![("authorization", format!("Bearer {token}"))],
            Self::Reviewer => vec![("x-csrf-token", local::session_get(CSRF_KEY).unwrap_or_default())],
        }
    }
}

/// Whether an answer is the server refusing a signed-in change for a missing or stale
/// CSRF token (`handlers::access` on the server), which the session can put right.
pub fn is_csrf_refusal(answer: &Result<String, ApiError>) -> bool {
    matches!(answer, Err(ApiError::Status { status: 403, body: Some(body) }) if body.error.contains("X-CSRF-Token"))
}

async fn send(method: &str, url: &str, json: Option<&str>, caller: Caller<'_>) -> Result<String, ApiError> {
    let headers = caller.headers();
    let pairs: Vec<(&str, &str)> = headers.iter().map(|(name, value)| (*name, value.as_str())).collect();
    body_of(device::send_json(method, url, json, &pairs).await)
}

/// Sends a request with an optional JSON body; the body of a 2xx answer. A reviewer's
/// change refused for its CSRF token is sent once more after the token is fetched again.
async fn call(method: &str, url: &str, json: Option<String>, caller: Caller<'_>) -> Result<String, ApiError> {
    let first = send(method, url, json.as_deref(), caller).await;
    if matches!(caller, Caller::Reviewer) && method != "GET" && is_csrf_refusal(&first) && session().await.is_ok() {
        return send(method, url, json.as_deref(), caller).await;
    }
    first
}

/// Sends JSON (as the form part `part`) with photos; the body of a 2xx answer.
async fn call_with_photos(
    url: &str,
    part: &str,
    json: &str,
    photos: &[web_sys::Blob],
    caller: Caller<'_>,
) -> Result<String, ApiError> {
    let headers = caller.headers();
    let pairs: Vec<(&str, &str)> = headers.iter().map(|(name, value)| (*name, value.as_str())).collect();
    body_of(device::send_form(url, part, json, photos, &pairs).await)
}

async fn get<T: DeserializeOwned>(url: &str, caller: Caller<'_>) -> Result<T, ApiError> {
    read(&call("GET", url, None, caller).await?)
}

/// A state-changing call whose answer the app does not need.
async fn act(method: &str, url: &str, body: Option<serde_json::Value>, caller: Caller<'_>) -> Result<(), ApiError> {
    call(method, url, body.map(|b| b.to_string()), caller).await.map(|_| ())
}

// The observer's phone.

/// `POST /api/devices`: a new identity for this phone, with the name and contact given.
pub async fn new_identity(profile: &DeviceRequest) -> Result<DeviceIdentity, ApiError> {
    read(&call("POST", "/api/devices", Some(to_json(profile)?), Caller::Anyone).await?)
}

/// `PUT /api/my/profile`: a name and contact given or changed after the identity was made.
pub async fn send_profile(token: &str, profile: &DeviceRequest) -> Result<(), ApiError> {
    call("PUT", "/api/my/profile", Some(to_json(profile)?), Caller::Phone(token)).await.map(|_| ())
}

/// `POST /api/observations`: a record with its photos; the server's receipt.
pub async fn send_record(token: &str, record: &Submission, photos: &[web_sys::Blob]) -> Result<Receipt, ApiError> {
    read(&call_with_photos("/api/observations", "record", &to_json(record)?, photos, Caller::Phone(token)).await?)
}

/// `PUT /api/observations/{id}/walk`: puts a record the server has on one of this phone's walks.
pub async fn link_to_walk(token: &str, record: &str, walk: uuid::Uuid) -> Result<(), ApiError> {
    let url = format!("/api/observations/{record}/walk");
    let body = to_json(&WalkLink { walk_client_id: walk })?;
    call("PUT", &url, Some(body), Caller::Phone(token)).await.map(|_| ())
}

/// `POST /api/walks`: an ended walk; the server's receipt.
pub async fn send_walk(token: &str, walk: &WalkSubmission) -> Result<WalkReceipt, ApiError> {
    read(&call("POST", "/api/walks", Some(to_json(walk)?), Caller::Phone(token)).await?)
}

/// `GET /api/my/records`: this phone's records as the server describes them.
pub async fn my_records(token: &str) -> Result<Vec<MyRecord>, ApiError> {
    get("/api/my/records", Caller::Phone(token)).await
}

/// `POST /api/my/records/{id}/replies`: an answer to the reviewers, with its photos.
pub async fn send_reply(
    token: &str,
    record: uuid::Uuid,
    reply: &Reply,
    photos: &[web_sys::Blob],
) -> Result<(), ApiError> {
    let url = format!("/api/my/records/{record}/replies");
    call_with_photos(&url, "reply", &to_json(reply)?, photos, Caller::Phone(token)).await.map(|_| ())
}

/// `GET /api/checklist`: the checklist as JSON text (kept as it came, for flight mode).
pub async fn checklist_text() -> Result<String, ApiError> {
    call("GET", "/api/checklist", None, Caller::Anyone).await
}

/// The part of `GET /api/checklist/nearby` the key uses: confirmed records per
/// scientific name near a place.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct NearbyCounts {
    pub counts: BTreeMap<String, u32>,
}

/// `GET /api/checklist/nearby`: confirmed records per species near `lat`, `lon` (given
/// as text, as the cache names the place).
pub async fn nearby(lat: &str, lon: &str) -> Result<NearbyCounts, ApiError> {
    get(&format!("/api/checklist/nearby?lat={lat}&lon={lon}"), Caller::Anyone).await
}

/// `GET /api/site`: what the operator set for every phone to show.
#[derive(Debug, Clone, Default, PartialEq, Serialize, Deserialize)]
pub struct SiteInfo {
    /// Who to call about a live or stranded animal here, as the operator wrote it.
    #[serde(default)]
    pub responders_phone: Option<String>,
}

pub async fn site() -> Result<SiteInfo, ApiError> {
    get("/api/site", Caller::Anyone).await
}

// Figures, for anyone.

/// `GET /api/range?…`: range figures per taxon and period.
pub async fn range(query: &str) -> Result<serde_json::Value, ApiError> {
    get(&format!("/api/range?{query}"), Caller::Anyone).await
}

/// `GET /api/trend?…`: the trend and its tests.
pub async fn trend(query: &str) -> Result<serde_json::Value, ApiError> {
    get(&format!("/api/trend?{query}"), Caller::Anyone).await
}

/// `GET /api/range/map.svg?…`: the map, as SVG text.
pub async fn range_map(query: &str) -> Result<String, ApiError> {
    call("GET", &format!("/api/range/map.svg?{query}"), None, Caller::Anyone).await
}

/// `GET /api/trend/chart.svg?…`: the chart, as SVG text.
pub async fn trend_chart(query: &str) -> Result<String, ApiError> {
    call("GET", &format!("/api/trend/chart.svg?{query}"), None, Caller::Anyone).await
}

// Reviewers and admins.

/// `GET /api/session`: who is calling, and the session's CSRF token.
#[derive(Debug, Clone, PartialEq, Deserialize)]
pub struct Session {
    #[serde(default)]
    pub signed_in: bool,
    #[serde(default)]
    pub role: Option<Role>,
    #[serde(default)]
    pub csrf_token: Option<String>,
}

impl Session {
    /// The role of a signed-in reviewer or admin (who may review and download the full form).
    pub fn staff_role(&self) -> Option<Role> {
        self.role.filter(|role| self.signed_in && *role != Role::Observer)
    }
}

/// Who this tab is signed in as; keeps the session's CSRF token for this tab's changes.
pub async fn session() -> Result<Session, ApiError> {
    // Sent as it is (never retried): `call` asks the session when a token is missing.
    let session: Session = read(&send("GET", "/api/session", None, Caller::Reviewer).await?)?;
    if let Some(token) = &session.csrf_token {
        local::session_set(CSRF_KEY, token);
    }
    Ok(session)
}

/// `POST /api/session`: signs in, keeping the CSRF token for this tab's later calls.
pub async fn sign_in(username: String, password: String) -> Result<SessionInfo, ApiError> {
    let body = to_json(&LoginRequest { username, password })?;
    let info: SessionInfo = read(&call("POST", "/api/session", Some(body), Caller::Reviewer).await?)?;
    local::session_set(CSRF_KEY, &info.csrf_token);
    Ok(info)
}

/// `DELETE /api/session`.
pub async fn sign_out() -> Result<(), ApiError> {
    act("DELETE", "/api/session", None, Caller::Reviewer).await
}

/// Queue items asked for at a time ("Load more" asks for the next page).
pub const QUEUE_PAGE: usize = 50;

/// The queue's filters, as the server reads them (`GET /api/review/queue`); blank ones
/// are left out.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct QueueFilters {
    pub state: String,
    pub taxon: String,
    pub area: String,
    pub from: String,
    pub to: String,
    pub flag: String,
}

impl QueueFilters {
    /// The query string for the page starting at `offset`, asking for one item more than
    /// a page to tell whether there is more.
    pub fn query(&self, offset: usize) -> String {
        let pairs = [
            ("state", &self.state),
            ("taxon", &self.taxon),
            ("area", &self.area),
            ("from", &self.from),
            ("to", &self.to),
            ("flag", &self.flag),
        ];
        let mut parts: Vec<String> = pairs
            .iter()
            .filter(|(_, value)| !value.trim().is_empty())
            .map(|(name, value)| format!("{name}={}", query_part(value.trim())))
            .collect();
        parts.push(format!("limit={}", QUEUE_PAGE + 1));
        parts.push(format!("offset={offset}"));
        parts.join("&")
    }
}

/// How many filters are set, so a folded filter box still says so.
pub fn filters_set(filters: &QueueFilters) -> usize {
    [&filters.state, &filters.taxon, &filters.area, &filters.from, &filters.to, &filters.flag]
        .iter()
        .filter(|v| !v.trim().is_empty())
        .count()
}

/// One page of a list, and whether there is more after it.
#[derive(Debug, Clone, PartialEq)]
pub struct Page<T> {
    pub items: Vec<T>,
    pub more: bool,
}

impl<T> Page<T> {
    /// The page from what the server sent for [`QueueFilters::query`] (a page and one more).
    pub fn from_answer(mut items: Vec<T>) -> Self {
        let more = items.len() > QUEUE_PAGE;
        items.truncate(QUEUE_PAGE);
        Self { items, more }
    }
}

/// `GET /api/review/queue`: the page of the queue starting at `offset`.
pub async fn review_queue(filters: &QueueFilters, offset: usize) -> Result<Page<QueueItem>, ApiError> {
    get(&format!("/api/review/queue?{}", filters.query(offset)), Caller::Reviewer).await.map(Page::from_answer)
}

/// `GET /api/review/records/{id}`: everything a reviewer needs to decide.
pub async fn review_record(id: &str) -> Result<ReviewDetail, ApiError> {
    get(&format!("/api/review/records/{id}"), Caller::Reviewer).await
}

/// `GET /api/review/records/{id}/map.svg`: where the record and its photos were made,
/// as an image address (the browser fetches it with the reviewer's cookie).
pub fn record_map_address(id: &str) -> String {
    format!("/api/review/records/{id}/map.svg")
}

/// `POST /api/review/records/{id}/actions` with one of the reviewer's decisions, as typed.
async fn review_action(id: &str, action: serde_json::Value) -> Result<(), ApiError> {
    act("POST", &format!("/api/review/records/{id}/actions"), Some(action), Caller::Reviewer).await
}

/// Confirms the record as `scientific_name` at `taxon_rank`; a blank remark is left out.
pub async fn confirm(id: &str, scientific_name: String, taxon_rank: String, remark: String) -> Result<(), ApiError> {
    let remark = if remark.is_empty() { serde_json::Value::Null } else { remark.into() };
    let action = serde_json::json!({"action": "confirm", "scientific_name": scientific_name, "taxon_rank": taxon_rank, "remark": remark});
    review_action(id, action).await
}

/// Asks the observer for more detail.
pub async fn ask_observer(id: &str, message: String) -> Result<(), ApiError> {
    review_action(id, serde_json::json!({"action": "request_details", "message": message})).await
}

/// Marks the record as one that cannot be confirmed, saying why.
pub async fn not_confirmable(id: &str, reason: String) -> Result<(), ApiError> {
    review_action(id, serde_json::json!({"action": "not_confirmable", "reason": reason})).await
}

/// `POST /api/review/records/{id}/duplicates/{other}`: the same animal (merge) or not.
pub async fn decide_pair(id: &str, other: &str, same_animal: bool) -> Result<(), ApiError> {
    let url = format!("/api/review/records/{id}/duplicates/{other}");
    call("POST", &url, Some(to_json(&PairDecision { same_animal })?), Caller::Reviewer).await.map(|_| ())
}

/// `POST /api/review/merges/{id}/undo`.
pub async fn undo_merge(merge: i64) -> Result<(), ApiError> {
    act("POST", &format!("/api/review/merges/{merge}/undo"), None, Caller::Reviewer).await
}

/// A person with a sign-in, as `GET /api/people` lists them.
#[derive(Debug, Clone, PartialEq, Deserialize)]
pub struct StaffPerson {
    pub username: Option<String>,
    pub role: Role,
    pub display_name: Option<String>,
    pub disabled: bool,
}

pub async fn people() -> Result<Vec<StaffPerson>, ApiError> {
    get("/api/people", Caller::Reviewer).await
}

pub async fn people_events() -> Result<Vec<PersonEvent>, ApiError> {
    get("/api/people/events", Caller::Reviewer).await
}

/// `POST /api/people`: a new reviewer or admin (`role` as its code).
pub async fn add_person(
    username: String,
    display_name: String,
    password: String,
    role: String,
) -> Result<(), ApiError> {
    let body =
        serde_json::json!({"username": username, "display_name": display_name, "password": password, "role": role});
    act("POST", "/api/people", Some(body), Caller::Reviewer).await
}

/// `PUT /api/people/{name}/role` (`role` as its code).
pub async fn set_role(username: &str, role: String) -> Result<(), ApiError> {
    act("PUT", &format!("/api/people/{username}/role"), Some(serde_json::json!({ "role": role })), Caller::Reviewer)
        .await
}

/// `PUT /api/people/{name}/password`: a new password; the person's sessions end.
pub async fn set_password(username: &str, password: String) -> Result<(), ApiError> {
    let body = serde_json::json!({ "password": password });
    act("PUT", &format!("/api/people/{username}/password"), Some(body), Caller::Reviewer).await
}

/// `PUT /api/people/{name}/disabled`: turns a sign-in off or on.
pub async fn set_disabled(username: &str, disabled: bool) -> Result<(), ApiError> {
    let body = serde_json::json!({ "disabled": disabled });
    act("PUT", &format!("/api/people/{username}/disabled"), Some(body), Caller::Reviewer).await
}

#[cfg(test)]
mod tests {
    use super::*;

    fn answer(status: u16, body: &str) -> Result<Answer, String> {
        Ok(Answer { status, body: body.to_owned() })
    }

    /// The body the server sends for an internal failure (server/src/error.rs).
    const INTERNAL: &str = r#"{"error":"the server could not finish this request; try again later"}"#;

    #[test]
    fn a_2xx_answer_is_its_body() {
        assert_eq!(body_of(answer(200, "[]")), Ok("[]".to_owned()));
        assert_eq!(body_of(answer(201, r#"{"token":"t"}"#)), Ok(r#"{"token":"t"}"#.to_owned()));
        assert_eq!(body_of(answer(204, "")), Ok(String::new()));
    }

    #[test]
    fn a_refusal_says_the_servers_words_and_names_the_field() {
        let refused =
            body_of(answer(422, r#"{"error":"must be at most 90","field":"position.latitude"}"#)).unwrap_err();
        assert_eq!(refused.to_string(), "must be at most 90", "the field goes to the form, not into the words");
        assert_eq!(refused.field(), Some("position.latitude"));
        assert!(!refused.is_temporary());
        let conflict =
            body_of(answer(409, r#"{"error":"this record was sent before with other content"}"#)).unwrap_err();
        assert_eq!(conflict.to_string(), "this record was sent before with other content");
        assert!(!conflict.is_temporary());
    }

    #[test]
    fn a_server_fault_says_only_the_servers_sentence_and_is_tried_again() {
        let fault = body_of(answer(500, INTERNAL)).unwrap_err();
        assert_eq!(fault.to_string(), "the server could not finish this request; try again later");
        assert!(fault.is_temporary());
    }

    #[test]
    fn a_proxy_page_or_empty_body_is_not_taken_for_the_servers_words() {
        let page = body_of(answer(502, "<html><body>Bad Gateway</body></html>")).unwrap_err();
        assert_eq!(page, ApiError::Status { status: 502, body: None });
        assert_eq!(page.to_string(), "the server cannot be reached just now (code 502)");
        assert!(page.is_temporary());
        let empty = body_of(answer(403, "")).unwrap_err();
        assert_eq!(empty.to_string(), "this is not allowed (code 403)");
        assert!(!empty.is_temporary());
    }

    #[test]
    fn no_answer_at_all_is_a_missing_connection_and_is_tried_again() {
        let lost = body_of(Err("Failed to fetch".to_owned())).unwrap_err();
        assert_eq!(lost, ApiError::NoAnswer("Failed to fetch".to_owned()));
        assert_eq!(lost.to_string(), "no connection to the server", "not the browser's \"Failed to fetch\"");
        assert!(lost.is_temporary());
    }

    #[test]
    fn only_timeouts_rate_limits_and_server_faults_are_worth_repeating() {
        // RFC 9110 §15.5.9: after 408 the client may repeat the request; RFC 6585 §4:
        // 429 asks the client to slow down; RFC 9110 §15.6: 5xx are the server's fault.
        // Every other 4xx refuses the request as sent (RFC 9110 §15.5).
        for status in [408, 429, 500, 502, 503, 504] {
            assert!(ApiError::Status { status, body: None }.is_temporary(), "{status}");
        }
        for status in [400, 401, 403, 404, 409, 413, 415, 422] {
            assert!(!ApiError::Status { status, body: None }.is_temporary(), "{status}");
        }
        assert!(!ApiError::Unsendable("x".into()).is_temporary());
    }

    #[test]
    fn a_2xx_body_that_is_not_the_answer_type_is_unreadable_and_tried_again() {
        let portal = read::<Receipt>("<html>Sign in to the café wifi</html>").unwrap_err();
        assert!(matches!(portal, ApiError::Unreadable(_)), "{portal:?}");
        assert_eq!(portal.to_string(), "the server's answer could not be read (a Wi-Fi sign-in page?)");
        assert!(portal.is_temporary());
        let identity: DeviceIdentity = read(r#"{"token":"abc"}"#).unwrap();
        assert_eq!(identity.token, "abc");
    }

    #[test]
    fn query_parts_are_encoded_as_encode_uri_component_does() {
        // Expected values as ECMA-262's encodeURIComponent gives them (checked in node).
        let cases = [
            ("Rajidae, tope", "Rajidae%2C%20tope"),
            ("a&b=c+d", "a%26b%3Dc%2Bd"),
            ("é", "%C3%A9"),
            ("-_.!~*'()", "-_.!~*'()"),
            ("52.1,-4.2", "52.1%2C-4.2"),
            ("50%/x?#", "50%25%2Fx%3F%23"),
            ("🦈", "%F0%9F%A6%88"),
        ];
        for (text, encoded) in cases {
            assert_eq!(query_part(text), encoded, "{text:?}");
        }
    }

    #[test]
    fn the_queue_query_leaves_out_blank_filters_and_asks_for_one_more_than_a_page() {
        assert_eq!(QueueFilters::default().query(0), "limit=51&offset=0");
        let filters = QueueFilters {
            state: "confirmed".into(),
            taxon: " Rajidae, tope ".into(),
            from: "2025-01-01".into(),
            flag: "   ".into(),
            ..QueueFilters::default()
        };
        assert_eq!(filters.query(50), "state=confirmed&taxon=Rajidae%2C%20tope&from=2025-01-01&limit=51&offset=50");
    }

    #[test]
    fn a_folded_filter_box_says_how_many_filters_are_set() {
        assert_eq!(filters_set(&QueueFilters::default()), 0);
        let two =
            QueueFilters { taxon: "Rajidae".into(), from: "2025-01-01".into(), flag: " ".into(), ..Default::default() };
        assert_eq!(filters_set(&two), 2);
    }

    #[test]
    fn a_page_and_one_more_means_there_is_more() {
        let full = Page::from_answer((0..=QUEUE_PAGE).collect::<Vec<_>>());
        assert_eq!((full.items.len(), full.more), (QUEUE_PAGE, true));
        assert_eq!(full.items.last(), Some(&(QUEUE_PAGE - 1)));
        let last = Page::from_answer((0..QUEUE_PAGE).collect::<Vec<_>>());
        assert_eq!((last.items.len(), last.more), (QUEUE_PAGE, false));
        assert!(!Page::from_answer(Vec::<u8>::new()).more);
    }

    #[test]
    fn only_a_missing_csrf_token_is_worth_sending_again_after_asking_the_session() {
        // The server's words for it (server/src/handlers/access.rs).
        let csrf = body_of(answer(403, r#"{"error":"missing or wrong X-CSRF-Token for this sign-in"}"#));
        assert!(is_csrf_refusal(&csrf));
        assert!(!is_csrf_refusal(&body_of(answer(403, r#"{"error":"not allowed: admins only"}"#))));
        assert!(!is_csrf_refusal(&body_of(answer(401, r#"{"error":"your sign-in has ended; sign in again"}"#))));
        assert!(!is_csrf_refusal(&Ok(String::new())));
        let session: Session = read(r#"{"signed_in":true,"role":"reviewer","csrf_token":"t0k"}"#).unwrap();
        assert_eq!(session.csrf_token.as_deref(), Some("t0k"));
    }

    #[test]
    fn only_a_signed_in_reviewer_or_admin_is_staff() {
        // As `GET /api/session` answers (server/src/handlers/session.rs).
        let session = |json: &str| read::<Session>(json).unwrap().staff_role();
        assert_eq!(session(r#"{"signed_in":false}"#), None);
        assert_eq!(session(r#"{"signed_in":true,"role":"reviewer","display_name":"R"}"#), Some(Role::Reviewer));
        assert_eq!(session(r#"{"signed_in":true,"role":"admin","display_name":"A"}"#), Some(Role::Admin));
        assert_eq!(session(r#"{"signed_in":true,"role":"observer","display_name":"O"}"#), None);
    }

    #[test]
    fn the_phone_sends_its_identity_as_a_bearer_token() {
        assert_eq!(Caller::Phone("abc").headers(), vec![("authorization", "Bearer abc".to_owned())]);
        assert!(Caller::Anyone.headers().is_empty());
    }
}
