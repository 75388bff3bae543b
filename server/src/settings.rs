//! The operator's settings for a running server, in one place: each with its flag, its
//! environment variable and its default, documented where it is declared. Handlers reach
//! them as `state.settings`; stages receive the values they need as arguments.

use std::net::IpAddr;

/// Everything an operator may set for `wrackline serve` (and `demo`).
#[derive(Debug, Clone, Default, clap::Args)]
pub struct Settings {
    /// The licence public archives are published under: cc0, cc-by or cc-by-nc
    /// (default cc-by, CC BY 4.0).
    #[arg(long, value_enum, env = LICENCE_VARIABLE, default_value_t = Licence::CcBy)]
    pub licence: Licence,
    /// Who to call about a live or stranded animal here, shown on every phone with the
    /// safety cautions: a number and who answers it, as the operator writes it, e.g.
    /// "0800 000 000 (stranding line, day and night)". At most 200 characters. Default:
    /// none, and the cautions tell walkers to call the local stranding responders or
    /// the coastguard.
    #[arg(long, env = "WRACKLINE_RESPONDERS_PHONE", value_parser = responders_phone)]
    pub responders_phone: Option<String>,
    /// The address people reach the server at, e.g. https://records.example.org: links
    /// in exports point under it, and a browser's `Origin` must be it for any request
    /// that changes something (default: http:// and the address the server listens on).
    /// Never taken from a request's `Host` header.
    #[arg(long, env = PUBLIC_URL_VARIABLE, value_parser = PublicUrl::parse)]
    pub public_url: Option<PublicUrl>,
    /// Reverse proxies whose `X-Forwarded-For` (and `X-Forwarded-Proto`) is believed, by
    /// address; repeat the flag, or separate them with commas in the variable (default
    /// none: each connection's own address counts, whatever headers it sends).
    #[arg(long = "trusted-proxy", env = TRUSTED_PROXIES_VARIABLE, value_delimiter = ',')]
    pub trusted_proxies: Vec<IpAddr>,
}

/// The longest responders' line the phones show.
pub const RESPONDERS_PHONE_MAX_CHARS: usize = 200;

/// Checks the responders' line at start, so a mistyped setting stops the server with a
/// clear message instead of reaching every phone.
fn responders_phone(text: &str) -> Result<String, String> {
    let text = text.trim();
    if text.is_empty() {
        return Err("the responders' number is empty; leave the setting out to show none".into());
    }
    if text.chars().count() > RESPONDERS_PHONE_MAX_CHARS {
        return Err(format!("the responders' number is longer than {RESPONDERS_PHONE_MAX_CHARS} characters"));
    }
    Ok(text.to_owned())
}

/// The environment variable that sets the licence for the server and the command line.
pub const LICENCE_VARIABLE: &str = "WRACKLINE_LICENCE";
/// The environment variable that sets the public address for the server and the command line.
pub const PUBLIC_URL_VARIABLE: &str = "WRACKLINE_PUBLIC_URL";
/// The environment variable that lists trusted reverse proxies.
pub const TRUSTED_PROXIES_VARIABLE: &str = "WRACKLINE_TRUSTED_PROXIES";

/// The scheme, host and port people reach the server at, checked once at start.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct PublicUrl {
    /// `scheme://host[:port]`, lowercase, with no path and no trailing slash.
    origin: String,
}

impl PublicUrl {
    /// Reads `http://host[:port]` or `https://host[:port]` (a trailing `/` is allowed;
    /// a path, query, user name or space is not).
    pub fn parse(text: &str) -> Result<Self, String> {
        let trimmed = text.trim().trim_end_matches('/');
        let lower = trimmed.to_ascii_lowercase();
        let rest = lower.strip_prefix("https://").or_else(|| lower.strip_prefix("http://")).ok_or_else(|| {
            format!("`{text}` is not an address starting with http:// or https:// (e.g. https://records.example.org)")
        })?;
        if rest.is_empty() || rest.contains(['/', '?', '#', '@', ' ', '\\']) {
            return Err(format!(
                "`{text}` must be a scheme, a host and perhaps a port, with no path (e.g. https://records.example.org)"
            ));
        }
        Ok(Self { origin: lower })
    }

    /// The address the server listens on, for when none was set.
    pub fn listening_on(address: std::net::SocketAddr) -> Self {
        Self { origin: format!("http://{address}") }
    }

    /// `scheme://host[:port]`: what a browser sends as `Origin`, and where links point.
    pub fn origin(&self) -> &str {
        &self.origin
    }

    /// Whether people reach the server over HTTPS.
    pub fn is_https(&self) -> bool {
        self.origin.starts_with("https://")
    }
}

/// The licence an archive is published under: one of the three GBIF accepts for
/// occurrence data (GBIF data licensing policy, from memory). The operator chooses with
/// `WRACKLINE_LICENCE` (`cc0`, `cc-by`, `cc-by-nc`; default `cc-by`), or `--licence` on
/// `wrackline export`.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, clap::ValueEnum)]
pub enum Licence {
    #[value(name = "cc0")]
    Cc0,
    #[default]
    #[value(name = "cc-by")]
    CcBy,
    #[value(name = "cc-by-nc")]
    CcByNc,
}

impl Licence {
    /// The legal code's address.
    pub fn url(self) -> &'static str {
        match self {
            Self::Cc0 => "http://creativecommons.org/publicdomain/zero/1.0/legalcode",
            Self::CcBy => "http://creativecommons.org/licenses/by/4.0/legalcode",
            Self::CcByNc => "http://creativecommons.org/licenses/by-nc/4.0/legalcode",
        }
    }

    /// Its name in words.
    pub fn title(self) -> &'static str {
        match self {
            Self::Cc0 => "Public Domain (CC0 1.0)",
            Self::CcBy => "Creative Commons Attribution (CC-BY) 4.0 License",
            Self::CcByNc => "Creative Commons Attribution Non Commercial (CC-BY-NC) 4.0 License",
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_public_url_is_a_scheme_a_host_and_perhaps_a_port() {
        assert_eq!(PublicUrl::parse("https://Records.Example.org/").unwrap().origin(), "https://records.example.org");
        assert_eq!(PublicUrl::parse("http://127.0.0.1:8080").unwrap().origin(), "http://127.0.0.1:8080");
        assert!(PublicUrl::parse("https://records.example.org").unwrap().is_https());
        for bad in ["records.example.org", "ftp://x", "https://", "https://x/app", "https://x?y", "https://u@x"] {
            assert!(PublicUrl::parse(bad).is_err(), "{bad}");
        }
    }
}
