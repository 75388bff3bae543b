//! Every word the app shows, in the person's language: the message catalogues in
//! `app/locales/<language>/app.ftl` (Fluent syntax; the phone's screens' own words in
//! `phone.ftl` and the desk's in `desk.ftl`, each compiled into its own bundle only) are
//! compiled in, one is chosen at
//! start — the one kept on this device by the page's language switch, else the first of
//! the browser's languages that the app speaks, else English — and [`t`] / [`t_args`]
//! look a message up by its id. Numbers and dates shown to people are formatted for the
//! chosen language with the browser's `Intl` ([`number`], [`date_time`]); values sent to
//! the server never pass through here.
//!
//! Message ids are always string literals at the call, so the catalogue test can see
//! every id the code uses (see the tests below). Errors the server words stay in English.

use std::cell::OnceCell;

use fluent_bundle::{FluentArgs, FluentBundle, FluentResource, FluentValue};
use unic_langid::LanguageIdentifier;

use crate::data::local;

/// The languages the app speaks: code, the language's own name, its catalogue.
pub const LANGUAGES: [(&str, &str, &str); 2] = [
    ("en", "English", include_str!("../../locales/en/app.ftl")),
    ("cy", "Cymraeg", include_str!("../../locales/cy/app.ftl")),
];

/// The desk's own words per language (code, catalogue), added to the language's
/// catalogue in the desk's bundle only, so the phone never downloads them.
#[cfg(any(feature = "desk", test))]
const DESK_CATALOGUES: [(&str, &str); 2] =
    [("en", include_str!("../../locales/en/desk.ftl")), ("cy", include_str!("../../locales/cy/desk.ftl"))];

/// The phone's screens' own words per language (code, catalogue), added to the
/// language's catalogue in the phone's bundle only, so the desk never downloads them.
#[cfg(any(not(feature = "desk"), test))]
const PHONE_CATALOGUES: [(&str, &str); 2] =
    [("en", include_str!("../../locales/en/phone.ftl")), ("cy", include_str!("../../locales/cy/phone.ftl"))];

/// Where the language chosen with the switch is kept on this device.
const CHOSEN_KEY: &str = "wrackline.language";

thread_local! {
    static CATALOGUE: OnceCell<FluentBundle<FluentResource>> = const { OnceCell::new() };
}

/// The language in use: the one chosen on this device, else the browser's first that the
/// app speaks, else English.
pub fn language() -> &'static str {
    if !cfg!(target_arch = "wasm32") {
        // Native unit tests have no browser to ask; they read the English words.
        return "en";
    }
    let kept = local::get(CHOSEN_KEY);
    let wanted = kept.into_iter().chain(browser_languages());
    pick_language(wanted)
}

/// The first of `wanted` (BCP 47 tags, best first) that the app speaks; English if none.
fn pick_language(wanted: impl IntoIterator<Item = String>) -> &'static str {
    wanted
        .into_iter()
        .find_map(|tag| {
            let primary = tag.split(['-', '_']).next().unwrap_or_default().to_ascii_lowercase();
            LANGUAGES.iter().find(|(code, _, _)| *code == primary).map(|(code, _, _)| *code)
        })
        .unwrap_or("en")
}

/// `navigator.languages`, best first (empty outside a browser).
fn browser_languages() -> Vec<String> {
    let Some(window) = web_sys::window() else { return Vec::new() };
    window.navigator().languages().iter().filter_map(|tag| tag.as_string()).collect()
}

/// Keeps `code` as this device's language and reloads the page in it (the words are
/// read once at start; what is typed into the record form is kept as a draft).
pub fn choose_language(code: &str) {
    local::set(CHOSEN_KEY, code);
    if let Some(window) = web_sys::window() {
        let _ = window.location().reload();
    }
}

/// Tells the page which language its words are in (`<html lang>`), for screen readers.
pub fn mark_page_language() {
    let root = web_sys::window().and_then(|w| w.document()).and_then(|d| d.document_element());
    if let Some(root) = root {
        let _ = root.set_attribute("lang", language());
    }
}

/// The catalogue of `code` (English when the app does not speak it).
fn catalogue_for(code: &str) -> FluentBundle<FluentResource> {
    let (code, _, source) = LANGUAGES.iter().find(|(c, _, _)| *c == code).unwrap_or(&LANGUAGES[0]);
    let id: LanguageIdentifier = code.parse().expect("the app's language codes are valid tags");
    let mut bundle = FluentBundle::new(vec![id]);
    // Bidirectional isolation marks would end up in every text field and test; the
    // languages here are all written left to right.
    bundle.set_use_isolating(false);
    let resource = FluentResource::try_new((*source).to_owned()).unwrap_or_else(|(resource, _)| resource);
    bundle.add_resource_overriding(resource);
    // Native unit tests read both bundles' words, whichever bundle they are built for.
    #[cfg(any(feature = "desk", test))]
    add_words(&mut bundle, &DESK_CATALOGUES, code);
    #[cfg(any(not(feature = "desk"), test))]
    add_words(&mut bundle, &PHONE_CATALOGUES, code);
    bundle
}

/// Adds one bundle's own words in `code` (from `catalogues`) to `bundle`.
fn add_words(bundle: &mut FluentBundle<FluentResource>, catalogues: &[(&str, &str)], code: &str) {
    if let Some((_, source)) = catalogues.iter().find(|(c, _)| *c == code) {
        let resource = FluentResource::try_new((*source).to_owned()).unwrap_or_else(|(resource, _)| resource);
        bundle.add_resource_overriding(resource);
    }
}

/// The message `id` in the language in use, with `args` put in its placeholders.
fn format(id: &str, args: Option<&FluentArgs>) -> String {
    CATALOGUE.with(|cell| {
        let bundle = cell.get_or_init(|| catalogue_for(language()));
        let Some(pattern) = bundle.get_message(id).and_then(|m| m.value()) else {
            // The catalogue test keeps this from happening; show the id rather than nothing.
            return id.to_owned();
        };
        let mut errors = Vec::new();
        bundle.format_pattern(pattern, args, &mut errors).into_owned()
    })
}

/// The message `id` in the language in use.
pub fn t(id: &str) -> String {
    format(id, None)
}

/// The message `id` in the language in use, its placeholders filled from `args`
/// (name, value). Numbers passed as [`Arg::Count`] choose plural forms; any number
/// shown to people is formatted first with [`number`] and passed as text.
pub fn t_args(id: &str, args: &[(&str, Arg)]) -> String {
    let mut fluent_args = FluentArgs::new();
    for (name, value) in args {
        let value = match value {
            Arg::Text(text) => FluentValue::from(text.clone()),
            Arg::Count(count) => FluentValue::from(*count),
        };
        fluent_args.set(*name, value);
    }
    format(id, Some(&fluent_args))
}

/// A value for a message's placeholder.
#[derive(Debug, Clone)]
pub enum Arg {
    /// Shown as it is (already formatted for the language).
    Text(String),
    /// A count: chooses the plural form and is shown as a whole number.
    Count(i64),
}

impl From<&str> for Arg {
    fn from(text: &str) -> Self {
        Arg::Text(text.to_owned())
    }
}

impl From<String> for Arg {
    fn from(text: String) -> Self {
        Arg::Text(text)
    }
}

impl From<usize> for Arg {
    fn from(count: usize) -> Self {
        Arg::Count(i64::try_from(count).unwrap_or(i64::MAX))
    }
}

impl From<i64> for Arg {
    fn from(count: i64) -> Self {
        Arg::Count(count)
    }
}

impl From<u32> for Arg {
    fn from(count: u32) -> Self {
        Arg::Count(i64::from(count))
    }
}

/// `value` with `decimals` digits after the point, written as the language writes
/// numbers (the browser's `Intl.NumberFormat`; plain digits outside a browser).
pub fn number(value: f64, decimals: u8) -> String {
    if !cfg!(target_arch = "wasm32") {
        return format!("{value:.*}", usize::from(decimals));
    }
    let options = js_sys::Object::new();
    let digits = wasm_bindgen::JsValue::from(f64::from(decimals));
    let _ = js_sys::Reflect::set(&options, &"minimumFractionDigits".into(), &digits);
    let _ = js_sys::Reflect::set(&options, &"maximumFractionDigits".into(), &digits);
    let locales = js_sys::Array::of1(&language().into());
    let formatter = js_sys::Intl::NumberFormat::new(&locales, &options);
    formatter.format().call1(&formatter, &value.into()).ok().and_then(|s| s.as_string()).unwrap_or_default()
}

/// A day (given as a moment, milliseconds since 1970) as the language writes a date, in
/// the phone's time zone (ISO form outside a browser).
pub fn date(epoch_ms: f64) -> String {
    if !cfg!(target_arch = "wasm32") {
        return chrono::DateTime::from_timestamp_millis(epoch_ms as i64)
            .map(|t| t.format("%Y-%m-%d").to_string())
            .unwrap_or_default();
    }
    intl_date(epoch_ms, &[("dateStyle", "medium")])
}

/// A moment (milliseconds since 1970) as the language writes a date and time, in the
/// phone's time zone (the browser's `Intl.DateTimeFormat`; ISO form outside a browser).
pub fn date_time(epoch_ms: f64) -> String {
    if !cfg!(target_arch = "wasm32") {
        return chrono::DateTime::from_timestamp_millis(epoch_ms as i64)
            .map(|t| t.format("%Y-%m-%d %H:%M").to_string())
            .unwrap_or_default();
    }
    intl_date(epoch_ms, &[("dateStyle", "medium"), ("timeStyle", "short")])
}

/// `Intl.DateTimeFormat` in the language in use, with `options` (name, value).
fn intl_date(epoch_ms: f64, options: &[(&str, &str)]) -> String {
    let settings = js_sys::Object::new();
    for (name, value) in options {
        let _ = js_sys::Reflect::set(&settings, &(*name).into(), &(*value).into());
    }
    let options = settings;
    let locales = js_sys::Array::of1(&language().into());
    let formatter = js_sys::Intl::DateTimeFormat::new(&locales, &options);
    let date = js_sys::Date::new(&epoch_ms.into());
    formatter.format().call1(&formatter, &date).ok().and_then(|s| s.as_string()).unwrap_or_default()
}

#[cfg(test)]
mod tests;
