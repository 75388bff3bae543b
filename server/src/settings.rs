//! The operator's settings for a running server, in one place: each with its flag, its
//! environment variable and its default, documented where it is declared. Handlers reach
//! them as `state.settings`; stages receive the values they need as arguments.

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
    #[command(flatten)]
    pub responders: Responders,
}

/// How the local stranding responders hear of a live animal the moment its record is
/// stored (`crate::notify`). Either channel, both or neither may be set.
#[derive(Debug, Clone, Default, clap::Args)]
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

/// How the SMTP connection is protected.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, clap::ValueEnum)]
pub enum SmtpSecurity {
    #[default]
    Starttls,
    Tls,
    None,
}

impl Responders {
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
            return Some("--responders-webhook needs --responders-webhook-secret to sign its messages".into());
        }
        if !self.email_to.is_empty() && self.smtp_server.is_none() {
            return Some("--responders-email needs --smtp-server HOST:PORT to send through".into());
        }
        None
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
