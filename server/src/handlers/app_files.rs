//! The app's files built into the binary (`server/build.rs` lists them), served as the
//! app folder is with `--app-dir`: a browser that accepts brotli or gzip gets the copy
//! the build made (brotli first) with `Content-Encoding`; every answer says it varies
//! with `Accept-Encoding` and carries `Cache-Control: no-cache` and an `ETag`, so a new
//! service worker is seen on the next visit and an unchanged file costs a 304. A path
//! that names no file gets `index.html` (the app's own links work on reload); a folder
//! gets its own `index.html` when it has one. A binary built before the app was built
//! answers every such path with a page that says so.

use std::collections::HashMap;
use std::sync::LazyLock;

use axum::body::Body;
use axum::http::{HeaderMap, HeaderValue, Method, StatusCode, Uri, header};
use axum::response::{IntoResponse, Response};
use sha2::{Digest as _, Sha256};

mod built {
    include!(concat!(env!("OUT_DIR"), "/app_files.rs"));
}

/// One file as it may be sent: its bytes and its entity tag.
struct Variant {
    bytes: &'static [u8],
    etag: HeaderValue,
}

/// The built files by path, each with its tag (made once, at the first request).
static FILES: LazyLock<HashMap<&'static str, Variant>> = LazyLock::new(|| index(built::FILES));

fn index(files: &'static [(&'static str, &'static [u8])]) -> HashMap<&'static str, Variant> {
    files
        .iter()
        .map(|(path, bytes)| {
            let digest = Sha256::digest(bytes);
            let tag: String = digest.iter().take(12).map(|b| format!("{b:02x}")).collect();
            let etag = HeaderValue::from_str(&format!("\"{tag}\"")).expect("hex digits make a valid header");
            (*path, Variant { bytes, etag })
        })
        .collect()
}

/// Whether this binary holds a built app.
pub fn is_built() -> bool {
    !built::FILES.is_empty()
}

/// The fallback for every path no route takes: the embedded app's files.
pub async fn embedded(method: Method, uri: Uri, headers: HeaderMap) -> Response {
    serve(&FILES, &method, uri.path(), &headers)
}

/// The answer for `path` from `files` (see the module doc).
fn serve(files: &HashMap<&'static str, Variant>, method: &Method, path: &str, headers: &HeaderMap) -> Response {
    if method != Method::GET && method != Method::HEAD {
        return (StatusCode::METHOD_NOT_ALLOWED, [(header::ALLOW, "GET, HEAD")]).into_response();
    }
    if files.is_empty() {
        return not_built();
    }
    let name = file_for(files, path);
    let (variant, encoding) =
        match accepted_encoding(headers, |suffix| files.contains_key(format!("{name}{suffix}").as_str())) {
            Some((suffix, encoding)) => (&files[format!("{name}{suffix}").as_str()], Some(encoding)),
            None => (&files[name], None),
        };
    let mut response = if headers.get(header::IF_NONE_MATCH).is_some_and(|tags| matches_tag(tags, &variant.etag)) {
        StatusCode::NOT_MODIFIED.into_response()
    } else {
        let media_type = mime_guess::from_path(name).first_or_octet_stream().to_string();
        let mut ok = Body::from(variant.bytes).into_response();
        ok.headers_mut()
            .insert(header::CONTENT_TYPE, HeaderValue::from_str(&media_type).expect("a media type is a valid header"));
        if let Some(encoding) = encoding {
            ok.headers_mut().insert(header::CONTENT_ENCODING, HeaderValue::from_static(encoding));
        }
        ok
    };
    let answer = response.headers_mut();
    answer.insert(header::ETAG, variant.etag.clone());
    answer.insert(header::VARY, HeaderValue::from_static("accept-encoding"));
    answer.insert(header::CACHE_CONTROL, HeaderValue::from_static("no-cache"));
    response
}

/// The file a path names: the file itself, a folder's `index.html`, or the app's
/// `index.html` for any other path.
fn file_for(files: &HashMap<&'static str, Variant>, path: &str) -> &'static str {
    let trimmed = path.trim_start_matches('/');
    let folder_index = format!("{}/index.html", trimmed.trim_end_matches('/'));
    let candidates = [trimmed, folder_index.trim_start_matches('/')];
    candidates.iter().find_map(|candidate| files.get_key_value(*candidate).map(|(key, _)| *key)).unwrap_or("index.html")
}

/// The precompressed copy to send, as (file suffix, `Content-Encoding`): brotli when the
/// client accepts it and the copy exists, else gzip, else none. A coding listed with
/// `q=0` is refused (RFC 9110 §12.5.3).
fn accepted_encoding(headers: &HeaderMap, exists: impl Fn(&str) -> bool) -> Option<(&'static str, &'static str)> {
    let accepted: Vec<(String, bool)> = headers
        .get_all(header::ACCEPT_ENCODING)
        .iter()
        .filter_map(|value| value.to_str().ok())
        .flat_map(|value| value.split(','))
        .map(|item| {
            let mut parts = item.split(';');
            let coding = parts.next().unwrap_or_default().trim().to_ascii_lowercase();
            let refused =
                parts.any(|p| p.trim().strip_prefix("q=").and_then(|q| q.trim().parse::<f32>().ok()) == Some(0.0));
            (coding, !refused)
        })
        .collect();
    let accepts = |coding: &str| accepted.iter().any(|(name, yes)| *yes && (name == coding || name == "*"));
    [(".br", "br"), (".gz", "gzip")].into_iter().find(|(suffix, coding)| accepts(coding) && exists(suffix))
}

/// Whether `If-None-Match` names `etag` (or is `*`).
fn matches_tag(tags: &HeaderValue, etag: &HeaderValue) -> bool {
    let Ok(tags) = tags.to_str() else { return false };
    let own = etag.to_str().unwrap_or_default();
    tags.split(',').map(|t| t.trim().trim_start_matches("W/")).any(|t| t == "*" || t == own)
}

/// What a binary built without the app answers in its place.
fn not_built() -> Response {
    let page = "<!doctype html><html lang=\"en\"><head><meta charset=\"utf-8\"><title>wrackline: the app was not built</title></head>\
<body><h1>The app was not built into this server</h1>\
<p>This <code>wrackline</code> binary was compiled before the app was built, so it serves the API only.</p>\
<p>Build the app, then the server: <code>cargo xtask build</code> and then <code>cargo build --release -p wrackline-server</code> \
(or run <code>cargo xtask demo</code>, which does both), or start the server with <code>--app-dir</code> pointing at a built app.</p>\
</body></html>";
    (StatusCode::SERVICE_UNAVAILABLE, [(header::CONTENT_TYPE, "text/html; charset=utf-8")], page).into_response()
}

#[cfg(test)]
mod tests {
    use super::*;

    static SAMPLE: &[(&str, &[u8])] = &[
        ("index.html", b"raw page"),
        ("index.html.br", b"brotli page"),
        ("index.html.gz", b"gzip page"),
        ("app.wasm", b"raw wasm"),
        ("app.wasm.gz", b"gzip wasm"),
        ("desk/index.html", b"desk page"),
    ];

    fn get(path: &str, accept: Option<&str>) -> Response {
        let mut headers = HeaderMap::new();
        if let Some(accept) = accept {
            headers.insert(header::ACCEPT_ENCODING, HeaderValue::from_str(accept).unwrap());
        }
        serve(&index(SAMPLE), &Method::GET, path, &headers)
    }

    fn encoding(response: &Response) -> &str {
        response.headers().get(header::CONTENT_ENCODING).map_or("", |v| v.to_str().unwrap())
    }

    #[test]
    fn the_copy_sent_follows_accept_encoding_brotli_first() {
        // RFC 9110 §12.5.3: a coding with q=0 is not acceptable.
        assert_eq!(encoding(&get("/", Some("gzip, deflate, br"))), "br");
        assert_eq!(encoding(&get("/", Some("br;q=0, gzip"))), "gzip");
        assert_eq!(encoding(&get("/", Some("identity"))), "");
        assert_eq!(encoding(&get("/", None)), "");
        // No brotli copy of the wasm: gzip.
        assert_eq!(encoding(&get("/app.wasm", Some("br, gzip"))), "gzip");
        let answer = get("/records/deep/link", Some("br"));
        assert_eq!((answer.status(), encoding(&answer)), (StatusCode::OK, "br"), "a deep link gets the page");
        assert_eq!(answer.headers()[header::VARY], "accept-encoding");
        assert_eq!(answer.headers()[header::CACHE_CONTROL], "no-cache");
        assert_eq!(answer.headers()[header::CONTENT_TYPE], "text/html");
    }

    #[test]
    fn a_folder_gets_its_own_index_page_and_a_known_tag_gets_304() {
        let desk = get("/desk/", None);
        let tag = desk.headers()[header::ETAG].clone();
        assert_eq!(get("/desk", None).headers()[header::ETAG], tag);
        assert_ne!(get("/", None).headers()[header::ETAG], tag);
        let mut headers = HeaderMap::new();
        headers.insert(header::IF_NONE_MATCH, tag);
        let again = serve(&index(SAMPLE), &Method::GET, "/desk/", &headers);
        assert_eq!(again.status(), StatusCode::NOT_MODIFIED);
    }

    #[test]
    fn without_a_built_app_every_page_says_so() {
        let answer = serve(&HashMap::new(), &Method::GET, "/", &HeaderMap::new());
        assert_eq!(answer.status(), StatusCode::SERVICE_UNAVAILABLE);
        let post = serve(&index(SAMPLE), &Method::POST, "/", &HeaderMap::new());
        assert_eq!(post.status(), StatusCode::METHOD_NOT_ALLOWED);
    }
}
