//! What every response and every state-changing request goes through at the HTTP edge,
//! for browsers: security headers on every answer, and a check that a request which
//! changes something came from the app's own origin.
//!
//! - `Content-Security-Policy`: scripts, styles, images, connections and workers from
//!   the server's own origin only (images also from `data:` and `blob:` URLs, which the
//!   app makes for photos it holds); `'wasm-unsafe-eval'` so the app's WebAssembly may be
//!   compiled, and nothing else evaluated; no plugins, no `<base>`, forms post only here,
//!   and no framing (`frame-ancestors 'none'`). The browser tests run every screen under
//!   it and fail on any violation.
//! - `X-Content-Type-Options: nosniff`, `X-Frame-Options: DENY` (for browsers without
//!   `frame-ancestors`), `Referrer-Policy: no-referrer`.
//! - A `POST`, `PUT`, `PATCH` or `DELETE` whose `Origin` is not the configured public
//!   address (`Settings::public_url`) is refused (403), and so is one a browser marks
//!   `Sec-Fetch-Site: cross-site`. A request with neither header comes from a script or
//!   a phone's own fetch with no page to forge it, and passes (browsers always send
//!   `Origin` on these methods, so a forged cross-site request cannot leave it out).

use axum::extract::{Request, State};
use axum::http::{HeaderMap, HeaderName, HeaderValue, Method, header};
use axum::middleware::Next;
use axum::response::{IntoResponse, Response};

use crate::error::ApiError;
use crate::state::AppState;

/// The policy every answer carries (see the module doc).
pub const CONTENT_SECURITY_POLICY: &str = "default-src 'self'; script-src 'self' 'wasm-unsafe-eval'; \
style-src 'self'; img-src 'self' data: blob:; connect-src 'self'; font-src 'self'; manifest-src 'self'; \
worker-src 'self'; object-src 'none'; base-uri 'none'; form-action 'self'; frame-ancestors 'none'";

const SECURITY_HEADERS: [(HeaderName, &str); 4] = [
    (header::CONTENT_SECURITY_POLICY, CONTENT_SECURITY_POLICY),
    (header::X_CONTENT_TYPE_OPTIONS, "nosniff"),
    (header::X_FRAME_OPTIONS, "DENY"),
    (header::REFERRER_POLICY, "no-referrer"),
];

/// Adds the security headers to every answer that does not set its own.
pub async fn security_headers(request: Request, next: Next) -> Response {
    let mut response = next.run(request).await;
    let headers = response.headers_mut();
    for (name, value) in SECURITY_HEADERS {
        if !headers.contains_key(&name) {
            headers.insert(name, HeaderValue::from_static(value));
        }
    }
    response
}

/// Refuses a state-changing request that a browser sent from another origin.
pub async fn same_origin_only(State(state): State<AppState>, request: Request, next: Next) -> Response {
    if changes_state(request.method())
        && let Err(refusal) = check_origin(request.headers(), state.settings.public_url.as_ref().map(|u| u.origin()))
    {
        return refusal.into_response();
    }
    next.run(request).await
}

fn changes_state(method: &Method) -> bool {
    !matches!(*method, Method::GET | Method::HEAD | Method::OPTIONS)
}

/// `Ok` when `headers` show no other site behind the request: `Origin` equal to `own`
/// (the public address), or no `Origin` and no `Sec-Fetch-Site: cross-site`.
pub fn check_origin(headers: &HeaderMap, own: Option<&str>) -> Result<(), ApiError> {
    match headers.get(header::ORIGIN) {
        Some(origin) => {
            let sent = origin.to_str().unwrap_or("(not text)").trim_end_matches('/').to_ascii_lowercase();
            if own == Some(sent.as_str()) {
                Ok(())
            } else {
                Err(ApiError::Forbidden(format!(
                    "this request came from the page at {sent}, not from this server's own address ({}); it was refused",
                    own.unwrap_or("none is configured")
                )))
            }
        }
        None if headers.get("sec-fetch-site").is_some_and(|v| v.as_bytes().eq_ignore_ascii_case(b"cross-site")) => {
            Err(ApiError::Forbidden("this request came from another site; it was refused".into()))
        }
        None => Ok(()),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn with(pairs: &[(&'static str, &'static str)]) -> HeaderMap {
        let mut headers = HeaderMap::new();
        for (name, value) in pairs {
            headers.insert(*name, HeaderValue::from_static(value));
        }
        headers
    }

    #[test]
    fn only_the_servers_own_origin_may_change_anything() {
        let own = Some("https://records.example.org");
        assert!(check_origin(&with(&[("origin", "https://records.example.org")]), own).is_ok());
        assert!(check_origin(&with(&[("origin", "https://Records.Example.org/")]), own).is_ok());
        assert!(check_origin(&with(&[]), own).is_ok(), "a script, not a browser");
        assert!(check_origin(&with(&[("sec-fetch-site", "same-origin")]), own).is_ok());
        for refused in [
            with(&[("origin", "https://evil.example")]),
            with(&[("origin", "null")]),
            with(&[("origin", "http://records.example.org")]),
            with(&[("sec-fetch-site", "cross-site")]),
        ] {
            let err = check_origin(&refused, own).unwrap_err();
            assert!(matches!(err, ApiError::Forbidden(_)), "{refused:?}");
        }
        assert!(check_origin(&with(&[("origin", "http://127.0.0.1:8080")]), None).is_err(), "none configured");
    }
}
