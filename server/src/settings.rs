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
