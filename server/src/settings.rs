//! The operator's settings for a running server, in one place: each with its flag, its
//! environment variable and its default, documented where it is declared. Handlers reach
//! them as `state.settings`; stages receive the values they need as arguments.

/// Everything an operator may set for `wrackline serve` (and `demo`).
#[derive(Debug, Clone, clap::Args)]
pub struct Settings {
    /// The licence public archives are published under: cc0, cc-by or cc-by-nc
    /// (default cc-by, CC BY 4.0).
    #[arg(long, value_enum, env = LICENCE_VARIABLE, default_value_t = Licence::CcBy)]
    pub licence: Licence,
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
}

impl Settings {
    /// Every setting at its default, as `wrackline serve` starts with no flags.
    pub const DEFAULT: Settings = Settings {
        licence: Licence::CcBy,
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
