//! What the operator set for every phone to show (`GET /api/site`) — the local
//! responders' number beside the safety cautions — kept in localStorage, so it is there
//! on the beach with no signal.

use leptos::prelude::*;

use crate::data::api::{self, SiteInfo};
use crate::data::local;

const SITE_KEY: &str = "wrackline.site";

/// What the server last said, or nothing yet.
pub fn cached() -> SiteInfo {
    local::get(SITE_KEY).and_then(|text| serde_json::from_str(&text).ok()).unwrap_or_default()
}

/// Asks the server again and keeps the answer; with no answer the kept one stays.
pub fn refresh(into: RwSignal<SiteInfo>) {
    leptos::task::spawn_local(async move {
        let Ok(info) = api::site().await else { return };
        if let Ok(text) = serde_json::to_string(&info) {
            local::set(SITE_KEY, &text);
        }
        into.set(info);
    });
}

/// The number to dial from the operator's responders' line ("0800 000 000 (stranding
/// line, day and night)" → `08000000000`): its first run of digits, spaces, dashes,
/// dots and brackets, with a leading `+` kept. `None` when it holds fewer than three
/// digits, so the words are shown without a call button rather than a wrong number.
pub fn dial_number(line: &str) -> Option<String> {
    let trimmed = line.trim_start();
    let (plus, rest) = match trimmed.strip_prefix('+') {
        Some(rest) => ("+", rest),
        None => ("", trimmed),
    };
    let run: String = rest.chars().take_while(|c| c.is_ascii_digit() || " -.()/".contains(*c)).collect();
    let digits: String = run.chars().filter(char::is_ascii_digit).collect();
    (digits.len() >= 3).then(|| format!("{plus}{digits}"))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_number_is_read_from_the_start_of_the_line() {
        assert_eq!(dial_number("0800 000 000 (stranding line, day and night)").as_deref(), Some("0800000000"));
        assert_eq!(dial_number("+44 (0)1970 123-456 responders").as_deref(), Some("+4401970123456"));
        assert_eq!(dial_number("  999, ask for the coastguard").as_deref(), Some("999"));
        assert_eq!(dial_number("Ring Gwen at the harbour"), None, "words only: no call button");
        assert_eq!(dial_number("12"), None);
    }
}
