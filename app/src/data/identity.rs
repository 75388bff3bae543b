//! The phone's identity: a random token the server hands out on first sync
//! (`POST /api/devices`), kept in localStorage and sent as `Authorization: Bearer`
//! with everything the phone sends, so the observer sees the review of their own
//! records and nobody else's, and nobody else can put records on their walks. No
//! password is needed to start recording.
//!
//! Before the first sync the observer is asked, once and optionally, for a name and a
//! contact ("About you"), and whether their name may be published with their records in
//! open data (default no: exports then carry an anonymous label instead). The contact is
//! only for reviewers with a question about a record: the server never publishes or
//! exports it. Given later, or changed, it is sent with the next sync
//! (`PUT /api/my/profile`).

use shared_types::{DeviceRequest, Text};

use crate::data::api::{self, ApiError};
use crate::data::local;
use crate::data::words::{t, t_args};

const TOKEN_KEY: &str = "wrackline.device-token";
const OBSERVER_NAME_KEY: &str = "wrackline.observer-name";
const CONTACT_KEY: &str = "wrackline.observer-contact";
/// `yes` once the observer agreed to be named in open data; absent otherwise.
const NAME_PUBLIC_KEY: &str = "wrackline.name-public";
/// `unsent` (answered, not yet on the server), `sent`, or `skipped`; absent: not asked yet.
const PROFILE_KEY: &str = "wrackline.about-you";

pub fn observer_name() -> String {
    local::get(OBSERVER_NAME_KEY).unwrap_or_default()
}

pub fn remember_observer_name(name: &str) {
    local::set(OBSERVER_NAME_KEY, name);
}

/// The contact the observer gave, if any.
pub fn contact() -> String {
    local::get(CONTACT_KEY).unwrap_or_default()
}

/// Whether the observer agreed to have their name published with open data.
pub fn name_public() -> bool {
    local::get(NAME_PUBLIC_KEY).as_deref() == Some("yes")
}

/// Whether "About you" has been answered or skipped.
pub fn profile_answered() -> bool {
    local::get(PROFILE_KEY).is_some()
}

/// Keeps the name, contact and naming choice given in "About you", to send with the next sync.
pub fn keep_profile(name: &str, contact: &str, name_public: bool) {
    remember_observer_name(name.trim());
    local::set(CONTACT_KEY, contact.trim());
    local::set(NAME_PUBLIC_KEY, if name_public { "yes" } else { "no" });
    local::set(PROFILE_KEY, "unsent");
}

/// "About you" was skipped: it is not asked again.
pub fn skip_profile() {
    local::set(PROFILE_KEY, "skipped");
}

/// What "About you" says once saved: what was kept and who sees it.
pub fn saved_words(name: &str, contact: &str, name_public: bool) -> String {
    let named = match name.trim() {
        "" => t("about-saved-no-name"),
        name => t_args("about-saved-as", &[("name", name.into())]),
    };
    let reach = if contact.trim().is_empty() { t("about-saved-no-contact") } else { t("about-saved-contact") };
    let open_data = match (name.trim().is_empty(), name_public) {
        (false, true) => t("about-saved-named-in-open-data"),
        (false, false) => t("about-saved-anonymous-in-open-data"),
        (true, _) => String::new(),
    };
    t_args("about-saved", &[("named", named.into()), ("reach", reach.into()), ("open_data", open_data.into())])
}

/// The closed card's one line: "Sam · contact given".
pub fn summary_words(name: &str, contact: &str) -> String {
    let name = if name.trim().is_empty() { t("about-no-name") } else { name.trim().to_owned() };
    let contact = if contact.trim().is_empty() { t("about-no-contact") } else { t("about-contact-given") };
    format!("{name} · {contact}")
}

/// What the observer chose to give, as the server takes it: blank answers left out.
pub fn profile_request(name: &str, contact: &str, name_public: bool) -> DeviceRequest {
    let text = |value: &str| Text::parse(value.trim()).ok().filter(|t| !t.as_str().is_empty());
    DeviceRequest { display_name: text(name), contact: text(contact), name_public }
}

fn profile() -> DeviceRequest {
    profile_request(&observer_name(), &contact(), name_public())
}

/// Whether this phone has its identity already.
pub fn has_token() -> bool {
    local::get(TOKEN_KEY).is_some()
}

/// The identity, asking the server for one if this phone has none yet (with the name
/// and contact the observer gave, if any). The error is the sentence to show.
pub async fn ensure_token() -> Result<String, String> {
    if let Some(token) = local::get(TOKEN_KEY) {
        return Ok(token);
    }
    let identity = api::new_identity(&profile()).await.map_err(|err| match err {
        ApiError::NoAnswer(_) => err.to_string(),
        _ => t_args("identity-not-given", &[("error", err.to_string().into())]),
    })?;
    local::try_set(TOKEN_KEY, &identity.token).map_err(|err| {
        let why = match err {
            local::NotKept::NoStorage => t("identity-no-storage"),
            local::NotKept::Refused => t("identity-storage-refused"),
        };
        t_args("identity-not-kept", &[("error", why.into())])
    })?;
    if local::get(PROFILE_KEY).as_deref() == Some("unsent") {
        local::set(PROFILE_KEY, "sent");
    }
    Ok(identity.token)
}

/// Sends a name and contact given (or changed) since the identity was made; the
/// problem, if it should be tried again.
pub async fn send_profile_if_changed(token: &str) -> Option<String> {
    if local::get(PROFILE_KEY).as_deref() != Some("unsent") {
        return None;
    }
    match api::send_profile(token, &profile()).await {
        Err(err) if err.is_temporary() => Some(err.to_string()),
        // Sent, or refused (a name too long?): keep it on the phone and stop asking the server.
        Ok(()) | Err(_) => {
            local::set(PROFILE_KEY, "sent");
            None
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn saving_says_what_was_kept_and_who_sees_it() {
        assert_eq!(
            saved_words(" Sam ", "sam@example.org", false),
            "Saved: your records go as Sam; reviewers can reach you about your finds; your contact is never \
             published; open data show an anonymous label instead of your name. It goes with the next sync."
        );
        assert!(saved_words("Sam", "", true).ends_with("; open data name you. It goes with the next sync."));
        assert_eq!(
            saved_words("", "", true),
            "Saved: your records go without a name; no contact given, so reviewers cannot ask you about a find. \
             It goes with the next sync."
        );
        assert_eq!(summary_words("Sam", ""), "Sam · no contact");
        assert_eq!(summary_words(" ", "x"), "no name given · contact given");
    }

    #[test]
    fn blank_answers_are_left_out_of_the_profile() {
        let given = profile_request("  Sam Jones ", " sam@example.org ", true);
        assert_eq!(given.display_name.as_ref().map(Text::as_str), Some("Sam Jones"));
        assert_eq!(given.contact.as_ref().map(Text::as_str), Some("sam@example.org"));
        assert!(given.name_public);
        let nothing = profile_request("   ", "", false);
        assert_eq!((nothing.display_name, nothing.contact, nothing.name_public), (None, None, false));
        // The server reads a blank profile as no profile (`POST /api/devices`), and no consent as no.
        assert_eq!(
            serde_json::to_string(&profile_request("", "", false)).unwrap(),
            r#"{"display_name":null,"contact":null,"name_public":false}"#
        );
    }
}
