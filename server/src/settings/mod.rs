//! The operator's settings for a running server, in one place: each with its flag, its
//! environment variable and its default, documented where it is declared. Handlers reach
//! them as `state.settings`; stages receive the values they need as arguments. The
//! configuration file ([`file`]) sets the same settings by key; flags and environment
//! variables override it, and it overrides the defaults.

pub mod file;

use std::net::IpAddr;

/// Everything an operator may set for `wrackline serve` (and `demo`).
#[derive(Debug, Clone, clap::Args)]
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
    /// Refuse submissions (507, with Retry-After) when less than this many MiB are free
    /// on the data disk, so the database always has room to finish what it began
    /// (default 256).
    #[arg(long, env = "WRACKLINE_MIN_FREE_MB", default_value_t = Settings::DEFAULT.min_free_mb)]
    pub min_free_mb: u64,
    /// Uploads (records and replies with their photos) received at once; more wait for
    /// a turn (default 16).
    #[arg(long, env = "WRACKLINE_MAX_UPLOADS", default_value_t = Settings::DEFAULT.max_uploads)]
    pub max_uploads: usize,
    /// Seconds an upload waits for a turn before it is answered 503 with Retry-After
    /// (default 10).
    #[arg(long, env = "WRACKLINE_UPLOAD_WAIT", default_value_t = Settings::DEFAULT.upload_wait_s)]
    pub upload_wait_s: u64,
    /// Submissions one phone may send at once before its pace applies (default 300: a
    /// weekend's records sent when the phone finds signal).
    #[arg(long, env = "WRACKLINE_DEVICE_BURST", default_value_t = Settings::DEFAULT.device_burst)]
    pub device_burst: u32,
    /// Submissions per minute one phone may keep sending after its burst (default 60).
    #[arg(long, env = "WRACKLINE_DEVICE_PER_MINUTE", default_value_t = Settings::DEFAULT.device_per_minute)]
    pub device_per_minute: u32,
    /// Submissions one client address may send at once (default 1000: a group behind
    /// one router).
    #[arg(long, env = "WRACKLINE_ADDRESS_BURST", default_value_t = Settings::DEFAULT.address_burst)]
    pub address_burst: u32,
    /// Submissions per minute one client address may keep sending (default 600).
    #[arg(long, env = "WRACKLINE_ADDRESS_PER_MINUTE", default_value_t = Settings::DEFAULT.address_per_minute)]
    pub address_per_minute: u32,
    /// Seconds a client has to send a request's headers, and the longest a kept-alive
    /// connection may sit idle (default 10).
    #[arg(long, env = "WRACKLINE_HEADER_TIMEOUT", default_value_t = Settings::DEFAULT.header_timeout_s)]
    pub header_timeout_s: u64,
    /// Seconds a request body may pause between two pieces (default 30).
    #[arg(long, env = "WRACKLINE_BODY_IDLE_TIMEOUT", default_value_t = Settings::DEFAULT.body_idle_timeout_s)]
    pub body_idle_timeout_s: u64,
    /// Seconds a whole request body may take: a 300 MB upload at 400 kB/s (default 900).
    #[arg(long, env = "WRACKLINE_BODY_DEADLINE", default_value_t = Settings::DEFAULT.body_deadline_s)]
    pub body_deadline_s: u64,
    /// Connections open at once; more are closed as they come (default 512). Keep it
    /// well below the process's open-file limit (`ulimit -n`).
    #[arg(long, env = "WRACKLINE_MAX_CONNECTIONS", default_value_t = Settings::DEFAULT.max_connections)]
    pub max_connections: usize,
    #[command(flatten)]
    pub responders: Responders,
    #[command(flatten)]
    pub dataset: Dataset,
}

impl Settings {
    /// Every setting at its default, as `wrackline serve` starts with no flags.
    pub const DEFAULT: Settings = Settings {
        licence: Licence::CcBy,
        responders_phone: None,
        public_url: None,
        trusted_proxies: Vec::new(),
        min_free_mb: 256,
        max_uploads: 16,
        upload_wait_s: 10,
        device_burst: 300,
        device_per_minute: 60,
        address_burst: 1000,
        address_per_minute: 600,
        header_timeout_s: 10,
        body_idle_timeout_s: 30,
        body_deadline_s: 900,
        max_connections: 512,
        responders: Responders::NONE,
        dataset: Dataset::NONE,
    };

    /// The free space the server keeps on the data disk, in bytes.
    pub fn min_free_bytes(&self) -> u64 {
        self.min_free_mb.saturating_mul(1024 * 1024)
    }
}

impl Default for Settings {
    fn default() -> Self {
        Self::DEFAULT
    }
}

/// How the local stranding responders hear of a live animal the moment its record is
/// stored (`crate::notify`). Either channel, both or neither may be set.
#[derive(Debug, Clone, clap::Args)]
pub struct Responders {
    /// An address that receives a signed JSON POST for each live animal (none by default).
    #[arg(long = "responders-webhook", env = "WRACKLINE_RESPONDERS_WEBHOOK")]
    pub webhook: Option<String>,
    /// The shared secret the webhook's body is signed with (HMAC-SHA256); needed with
    /// `--responders-webhook`.
    #[arg(long = "responders-webhook-secret", env = "WRACKLINE_RESPONDERS_WEBHOOK_SECRET", hide_env_values = true)]
    pub webhook_secret: Option<String>,
    /// Email addresses, separated by commas, that receive a message for each live animal
    /// (none by default); sent through `--smtp-server`.
    #[arg(long = "responders-email", env = "WRACKLINE_RESPONDERS_EMAIL", value_delimiter = ',')]
    pub email_to: Vec<String>,
    /// The SMTP server, HOST:PORT, that sends the emails.
    #[arg(long = "smtp-server", env = "WRACKLINE_SMTP_SERVER")]
    pub smtp_server: Option<String>,
    /// How to talk to the SMTP server: starttls (default), tls, or none (only for a
    /// relay on this machine).
    #[arg(long = "smtp-security", env = "WRACKLINE_SMTP_SECURITY", value_enum, default_value_t = SmtpSecurity::Starttls)]
    pub smtp_security: SmtpSecurity,
    /// The sender of the emails (default: wrackline@ the SMTP server's host).
    #[arg(long = "smtp-from", env = "WRACKLINE_SMTP_FROM")]
    pub smtp_from: Option<String>,
    /// The SMTP sign-in, when the server needs one.
    #[arg(long = "smtp-username", env = "WRACKLINE_SMTP_USERNAME")]
    pub smtp_username: Option<String>,
    #[arg(long = "smtp-password", env = "WRACKLINE_SMTP_PASSWORD", hide_env_values = true)]
    pub smtp_password: Option<String>,
    /// The wait before the first retry of an undelivered notification, in milliseconds
    /// (default 15 000); each later wait doubles, up to 15 minutes.
    #[arg(long = "notify-first-retry-ms", env = "WRACKLINE_NOTIFY_FIRST_RETRY_MS", default_value_t = 15_000)]
    pub first_retry_ms: u64,
}

/// What the published archive's metadata (EML) says about the dataset and who holds it.
/// Each is optional; the archive says what is set and falls back to the words noted.
#[derive(Debug, Clone, Default, clap::Args)]
pub struct Dataset {
    /// The dataset's title (default "wrackline records of stranded and landed elasmobranchs").
    #[arg(long = "dataset-title", env = "WRACKLINE_DATASET_TITLE", value_parser = dataset_text)]
    pub title: Option<String>,
    /// Who publishes it: the network's or organisation's name (default "wrackline recording network").
    #[arg(long = "dataset-publisher", env = "WRACKLINE_DATASET_PUBLISHER", value_parser = dataset_text)]
    pub publisher: Option<String>,
    /// The person to contact about the data (default: none, the publisher is the contact).
    #[arg(long = "dataset-contact-name", env = "WRACKLINE_DATASET_CONTACT_NAME", value_parser = dataset_text)]
    pub contact_name: Option<String>,
    /// The contact's email address (default none).
    #[arg(long = "dataset-contact-email", env = "WRACKLINE_DATASET_CONTACT_EMAIL", value_parser = email_address)]
    pub contact_email: Option<String>,
    /// The area the records come from, in words, e.g. "Coasts of Cardigan Bay, Wales"
    /// (default none).
    #[arg(long = "dataset-coverage", env = "WRACKLINE_DATASET_COVERAGE", value_parser = dataset_text)]
    pub coverage: Option<String>,
    /// The area's bounds in decimal degrees, SOUTH,WEST,NORTH,EAST (default none; the
    /// archive states a geographic coverage only when they are set).
    #[arg(long = "dataset-bounds", env = "WRACKLINE_DATASET_BOUNDS", value_parser = Bounds::parse, allow_hyphen_values = true)]
    pub bounds: Option<Bounds>,
}

impl Dataset {
    /// Nothing set: the default.
    pub const NONE: Dataset =
        Dataset { title: None, publisher: None, contact_name: None, contact_email: None, coverage: None, bounds: None };

    /// The title the archive states.
    pub fn title(&self) -> &str {
        self.title.as_deref().unwrap_or("wrackline records of stranded and landed elasmobranchs")
    }

    /// The publisher the archive names as creator and publisher.
    pub fn publisher(&self) -> &str {
        self.publisher.as_deref().unwrap_or("wrackline recording network")
    }
}

/// The longest text a dataset setting may hold.
pub const DATASET_TEXT_MAX_CHARS: usize = 500;

fn dataset_text(text: &str) -> Result<String, String> {
    let text = text.trim();
    if text.is_empty() {
        return Err("the text is empty; leave the setting out instead".into());
    }
    if text.chars().count() > DATASET_TEXT_MAX_CHARS {
        return Err(format!("the text is longer than {DATASET_TEXT_MAX_CHARS} characters"));
    }
    Ok(text.to_owned())
}

fn email_address(text: &str) -> Result<String, String> {
    let text = dataset_text(text)?;
    match text.split_once('@') {
        Some((local, domain)) if !local.is_empty() && domain.contains('.') && !text.contains(char::is_whitespace) => {
            Ok(text)
        }
        _ => Err(format!("`{text}` is not an email address (e.g. records@example.org)")),
    }
}

/// A box on the globe: south and north latitudes, west and east longitudes, in degrees.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Bounds {
    pub south: f64,
    pub west: f64,
    pub north: f64,
    pub east: f64,
}

impl Bounds {
    /// Reads `SOUTH,WEST,NORTH,EAST` (latitudes within ±90 with south ≤ north,
    /// longitudes within ±180; west greater than east crosses the antimeridian).
    pub fn parse(text: &str) -> Result<Self, String> {
        let numbers: Vec<f64> =
            text.split(',').map(|part| part.trim().parse::<f64>()).collect::<Result<_, _>>().map_err(|_| {
                format!(
                    "`{text}` is not four numbers SOUTH,WEST,NORTH,EAST in decimal degrees (e.g. 51.5,-5.5,53.0,-3.8)"
                )
            })?;
        let [south, west, north, east] = numbers[..] else {
            return Err(format!("`{text}` must be four numbers: SOUTH,WEST,NORTH,EAST"));
        };
        let latitude = |v: f64| v.is_finite() && (-90.0..=90.0).contains(&v);
        let longitude = |v: f64| v.is_finite() && (-180.0..=180.0).contains(&v);
        if !(latitude(south) && latitude(north) && longitude(west) && longitude(east)) {
            return Err(format!("`{text}`: latitudes must lie within ±90 and longitudes within ±180"));
        }
        if south > north {
            return Err(format!("`{text}`: the south bound is north of the north bound"));
        }
        Ok(Self { south, west, north, east })
    }
}

/// How the SMTP connection is protected.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, clap::ValueEnum)]
pub enum SmtpSecurity {
    #[default]
    Starttls,
    Tls,
    None,
}

impl Responders {
    /// No channel set up: the default.
    pub const NONE: Responders = Responders {
        webhook: None,
        webhook_secret: None,
        email_to: Vec::new(),
        smtp_server: None,
        smtp_security: SmtpSecurity::Starttls,
        smtp_from: None,
        smtp_username: None,
        smtp_password: None,
        first_retry_ms: 15_000,
    };

    /// The channels set up, by name (`webhook`, `email`).
    pub fn channels(&self) -> Vec<&'static str> {
        let mut channels = Vec::new();
        if self.webhook.is_some() {
            channels.push("webhook");
        }
        if !self.email_to.is_empty() {
            channels.push("email");
        }
        channels
    }

    /// What is missing for the channels set up, in words; `None` when they are complete.
    pub fn problem(&self) -> Option<String> {
        if self.webhook.is_some() && self.webhook_secret.as_deref().is_none_or(str::is_empty) {
            return Some(
                "responders.webhook (--responders-webhook) needs responders.webhook_secret \
                 (--responders-webhook-secret) to sign its messages"
                    .into(),
            );
        }
        if !self.email_to.is_empty() && self.smtp_server.is_none() {
            return Some(
                "responders.email (--responders-email) needs responders.smtp_server (--smtp-server HOST:PORT) to send through"
                    .into(),
            );
        }
        None
    }
}

impl Default for Responders {
    fn default() -> Self {
        Self::NONE
    }
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

    /// Its name as Creative Commons gives it on the legal code.
    pub fn title(self) -> &'static str {
        match self {
            Self::Cc0 => "CC0 1.0 Universal",
            Self::CcBy => "Attribution 4.0 International (CC BY 4.0)",
            Self::CcByNc => "Attribution-NonCommercial 4.0 International (CC BY-NC 4.0)",
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
