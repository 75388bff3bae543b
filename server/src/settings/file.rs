//! The configuration file (TOML): the same settings as the flags and environment
//! variables, by key, so an installation keeps them in one place. Each key names one
//! setting's argument ([`KEYS`]); the file's values are checked by the very parsers the
//! flags use, by adding them as flags for every setting that no flag or environment
//! variable set (so a flag overrides the environment, which overrides the file, which
//! overrides the default). An unknown key, a table where a value belongs, or a value a
//! setting refuses stops the command with the file, the line and the key.
//! `deploy/wrackline.toml` lists every key with its default.

use std::ffi::OsString;
use std::path::{Path, PathBuf};

use clap::parser::ValueSource;
use toml::de::{DeTable, DeValue};

/// One key of the file: the table it sits in (none for the top level), its name there,
/// and the id of the command-line argument it sets.
#[derive(Debug, PartialEq, Eq)]
pub struct ConfigKey {
    pub table: Option<&'static str>,
    pub key: &'static str,
    pub arg: &'static str,
}

impl ConfigKey {
    /// `table.key`, or `key` at the top level.
    pub fn name(&self) -> String {
        match self.table {
            Some(table) => format!("{table}.{}", self.key),
            None => self.key.to_owned(),
        }
    }
}

const fn top(key: &'static str, arg: &'static str) -> ConfigKey {
    ConfigKey { table: None, key, arg }
}

const fn within(table: &'static str, key: &'static str, arg: &'static str) -> ConfigKey {
    ConfigKey { table: Some(table), key, arg }
}

/// Every key the file may hold, in the order `wrackline config check` prints them.
pub const KEYS: &[ConfigKey] = &[
    top("data_dir", "data_dir"),
    top("bind", "bind"),
    top("public_url", "public_url"),
    top("trusted_proxies", "trusted_proxies"),
    top("licence", "licence"),
    top("checklist", "checklist"),
    top("app_dir", "app_dir"),
    within("limits", "min_free_mb", "min_free_mb"),
    within("limits", "max_uploads", "max_uploads"),
    within("limits", "upload_wait_s", "upload_wait_s"),
    within("limits", "device_burst", "device_burst"),
    within("limits", "device_per_minute", "device_per_minute"),
    within("limits", "address_burst", "address_burst"),
    within("limits", "address_per_minute", "address_per_minute"),
    within("limits", "header_timeout_s", "header_timeout_s"),
    within("limits", "body_idle_timeout_s", "body_idle_timeout_s"),
    within("limits", "body_deadline_s", "body_deadline_s"),
    within("limits", "max_connections", "max_connections"),
    within("responders", "phone", "responders_phone"),
    within("responders", "webhook", "webhook"),
    within("responders", "webhook_secret", "webhook_secret"),
    within("responders", "email", "email_to"),
    within("responders", "smtp_server", "smtp_server"),
    within("responders", "smtp_security", "smtp_security"),
    within("responders", "smtp_from", "smtp_from"),
    within("responders", "smtp_username", "smtp_username"),
    within("responders", "smtp_password", "smtp_password"),
    within("responders", "first_retry_ms", "first_retry_ms"),
    within("dataset", "title", "title"),
    within("dataset", "publisher", "publisher"),
    within("dataset", "contact_name", "contact_name"),
    within("dataset", "contact_email", "contact_email"),
    within("dataset", "coverage", "coverage"),
    within("dataset", "bounds", "bounds"),
];

/// The environment variable that names the configuration file.
pub const CONFIG_VARIABLE: &str = "WRACKLINE_CONFIG";

/// One value the file sets: its key, the line it is on, and its value(s) as text.
#[derive(Debug)]
pub struct FileValue {
    pub key: &'static ConfigKey,
    pub line: usize,
    pub values: Vec<String>,
}

/// A configuration file, read and checked against [`KEYS`].
#[derive(Debug)]
pub struct ConfigFile {
    pub path: PathBuf,
    pub values: Vec<FileValue>,
}

impl ConfigFile {
    /// Reads and checks the file at `path`.
    pub fn read(path: &Path) -> Result<Self, String> {
        let text = std::fs::read_to_string(path)
            .map_err(|err| format!("reading the configuration file {}: {err}", path.display()))?;
        Self::parse(path, &text)
    }

    /// Checks `text` (the file at `path`, named in messages).
    pub fn parse(path: &Path, text: &str) -> Result<Self, String> {
        let at = |offset: usize| format!("{}, line {}", path.display(), line_of(text, offset));
        let root = DeTable::parse(text).map_err(|err| {
            let place = err.span().map_or_else(|| path.display().to_string(), |span| at(span.start));
            format!("{place}: not valid TOML: {}", err.message())
        })?;
        let mut values = Vec::new();
        for (name, value) in root.get_ref() {
            let name_at = name.span().start;
            match value.get_ref() {
                DeValue::Table(table) if is_table_name(name.get_ref()) => {
                    for (inner, value) in table {
                        let key = find(Some(name.get_ref()), inner.get_ref()).ok_or_else(|| {
                            format!(
                                "{}: unknown key `{}.{}`{}",
                                at(inner.span().start),
                                name.get_ref(),
                                inner.get_ref(),
                                known(Some(name.get_ref()))
                            )
                        })?;
                        values.push(file_value(key, value, path, text)?);
                    }
                }
                _ => {
                    let key = find(None, name.get_ref())
                        .ok_or_else(|| format!("{}: unknown key `{}`{}", at(name_at), name.get_ref(), known(None)))?;
                    values.push(file_value(key, value, path, text)?);
                }
            }
        }
        // The parser's tables are sorted by key: put the values back in the file's order.
        values.sort_by_key(|value| value.line);
        Ok(Self { path: path.to_owned(), values })
    }
}

fn is_table_name(name: &str) -> bool {
    KEYS.iter().any(|k| k.table == Some(name))
}

fn find(table: Option<&str>, key: &str) -> Option<&'static ConfigKey> {
    KEYS.iter().find(|k| k.table == table && k.key == key)
}

/// The keys a table (or the top level) may hold, for a message.
fn known(table: Option<&str>) -> String {
    let mut names: Vec<&str> = KEYS.iter().filter(|k| k.table == table).map(|k| k.key).collect();
    if table.is_none() {
        names.extend(["[limits]", "[responders]", "[dataset]"]);
    }
    format!(" (known here: {})", names.join(", "))
}

fn file_value(
    key: &'static ConfigKey,
    value: &toml::Spanned<DeValue<'_>>,
    path: &Path,
    text: &str,
) -> Result<FileValue, String> {
    let line = line_of(text, value.span().start);
    let place = format!("{}, line {line}", path.display());
    let scalar = |value: &DeValue<'_>| -> Result<String, String> {
        match value {
            DeValue::String(text) => Ok(text.to_string()),
            DeValue::Integer(number) if number.radix() == 10 => Ok(number.as_str().to_owned()),
            DeValue::Float(number) => Ok(number.as_str().to_owned()),
            DeValue::Boolean(yes) => Ok(yes.to_string()),
            other => Err(format!("{place}: `{}` must be a string or a number, not {}", key.name(), other.type_str())),
        }
    };
    let values = match value.get_ref() {
        DeValue::Array(items) => items.iter().map(|item| scalar(item.get_ref())).collect::<Result<_, _>>()?,
        single => vec![scalar(single)?],
    };
    Ok(FileValue { key, line, values })
}

fn line_of(text: &str, offset: usize) -> usize {
    text.get(..offset).map_or(0, |before| before.matches('\n').count()) + 1
}

/// Where a setting's value came from.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Origin {
    Default,
    File,
    Env,
    Flag,
}

impl Origin {
    pub fn word(self) -> &'static str {
        match self {
            Self::Default => "default",
            Self::File => "file",
            Self::Env => "env",
            Self::Flag => "flag",
        }
    }
}

/// One setting as the command will use it, for `wrackline config check`.
#[derive(Debug, Clone)]
pub struct Resolved {
    pub key: &'static ConfigKey,
    /// The value as text (`None`: not set); secrets are hidden.
    pub value: Option<String>,
    pub origin: Origin,
}

/// The command line the command runs with: `argv`, plus `file`'s value of each setting
/// the command takes that no flag or environment variable set, as flags. Returns the
/// final matches and every setting the command takes with its value and origin.
pub fn apply(
    command: &clap::Command,
    argv: Vec<OsString>,
    file: Option<&ConfigFile>,
) -> Result<(clap::ArgMatches, Vec<Resolved>), clap::Error> {
    let first = command.clone().try_get_matches_from(&argv)?;
    let mut full = argv.clone();
    let mut from_file: Vec<&'static str> = Vec::new();
    for value in file.map_or(&[][..], |f| &f.values[..]) {
        let Some((arg, origin)) = argument(command, &first, value.key.arg) else { continue };
        if matches!(origin, Some(ValueSource::CommandLine | ValueSource::EnvVariable)) {
            continue;
        }
        let long = arg.get_long().unwrap_or(value.key.arg);
        let flags: Vec<OsString> = value.values.iter().map(|v| OsString::from(format!("--{long}={v}"))).collect();
        let mut probe = argv.clone();
        probe.extend(flags.iter().cloned());
        if let Err(err) = command.clone().try_get_matches_from(&probe) {
            let path = file.map_or_else(String::new, |f| f.path.display().to_string());
            // clap's message up to its usage note: the refusal and any possible values.
            let rendered = err.render().to_string();
            let reason: Vec<&str> = rendered
                .lines()
                .take_while(|l| !l.trim().is_empty())
                .map(|l| l.trim().trim_start_matches("error: "))
                .collect();
            let reason = reason.join(" ");
            return Err(command.clone().error(
                clap::error::ErrorKind::ValueValidation,
                format!("{path}, line {}, `{}`: {reason}", value.line, value.key.name()),
            ));
        }
        full.extend(flags);
        from_file.push(value.key.arg);
    }
    let matches = command.clone().try_get_matches_from(&full)?;
    let resolved = KEYS
        .iter()
        .filter_map(|key| {
            let (arg, source) = argument(command, &matches, key.arg)?;
            let raw = leaf(&matches)
                .try_get_raw(key.arg)
                .ok()
                .flatten()
                .or_else(|| matches.try_get_raw(key.arg).ok().flatten());
            let value = raw.map(|values| {
                if arg.is_hide_env_values_set() {
                    "(set, not shown)".to_owned()
                } else {
                    values.map(|v| v.to_string_lossy().into_owned()).collect::<Vec<_>>().join(",")
                }
            });
            let origin = if from_file.contains(&key.arg) {
                Origin::File
            } else {
                match source {
                    Some(ValueSource::CommandLine) => Origin::Flag,
                    Some(ValueSource::EnvVariable) => Origin::Env,
                    _ => Origin::Default,
                }
            };
            Some(Resolved { key, value, origin })
        })
        .collect();
    Ok((matches, resolved))
}

/// The innermost subcommand's matches.
fn leaf(matches: &clap::ArgMatches) -> &clap::ArgMatches {
    let mut inner = matches;
    while let Some((_, sub)) = inner.subcommand() {
        inner = sub;
    }
    inner
}

/// The argument `id` as the command being run takes it (its innermost subcommand's, or
/// a global one of the top level), with where its value came from.
fn argument<'a>(
    command: &'a clap::Command,
    matches: &clap::ArgMatches,
    id: &str,
) -> Option<(&'a clap::Arg, Option<ValueSource>)> {
    let (mut cmd, mut inner) = (command, matches);
    while let Some((name, sub)) = inner.subcommand() {
        cmd = cmd.find_subcommand(name)?;
        inner = sub;
    }
    if let Some(arg) = cmd.get_arguments().find(|a| a.get_id() == id) {
        return Some((arg, inner.value_source(id)));
    }
    let arg = command.get_arguments().find(|a| a.get_id() == id && a.is_global_set())?;
    Some((arg, matches.value_source(id).or_else(|| inner.value_source(id))))
}

#[cfg(test)]
mod tests {
    use super::*;

    fn parsed(text: &str) -> Result<ConfigFile, String> {
        ConfigFile::parse(Path::new("wrackline.toml"), text)
    }

    #[test]
    fn an_unknown_key_is_refused_with_its_line_and_name() {
        let err = parsed("licence = \"cc0\"\n\n[limits]\nmax_uploadz = 3\n").unwrap_err();
        assert!(err.contains("line 4") && err.contains("`limits.max_uploadz`"), "{err}");
        let err = parsed("bindd = \"127.0.0.1:1\"\n").unwrap_err();
        assert!(err.contains("line 1") && err.contains("`bindd`"), "{err}");
        let err = parsed("[responders]\nphone = { number = 1 }\n").unwrap_err();
        assert!(err.contains("line 2") && err.contains("`responders.phone`"), "{err}");
        assert!(parsed("bind = [").unwrap_err().contains("not valid TOML"));
    }

    #[test]
    fn values_keep_their_lines_and_lists_stay_lists() {
        let file = parsed("# a comment\ntrusted_proxies = [\"10.0.0.1\", \"10.0.0.2\"]\n[limits]\nmin_free_mb = 512\n")
            .unwrap();
        assert_eq!(file.values[0].key.name(), "trusted_proxies");
        assert_eq!((file.values[0].line, file.values[0].values.len()), (2, 2));
        assert_eq!((file.values[1].key.name().as_str(), file.values[1].line), ("limits.min_free_mb", 4));
        assert_eq!(file.values[1].values, ["512"]);
    }
}
