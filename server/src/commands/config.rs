//! `wrackline config check`: every setting `serve` would start with, its value and where
//! it came from (default, file, env, flag), then the checks `serve` makes before it
//! listens. A value a setting refuses never gets this far: reading the command line and
//! the file stops with the key named ([`crate::settings::file`]).

use std::net::SocketAddr;
use std::path::Path;

use anyhow::bail;

use crate::settings::Settings;
use crate::settings::file::Resolved;

/// What `serve` starts with besides its [`Settings`].
pub struct Start<'a> {
    pub data_dir: &'a Path,
    pub bind: SocketAddr,
    pub app_dir: Option<&'a Path>,
    pub checklist: Option<&'a Path>,
}

/// Prints every setting with its origin, then checks them together; `Err` names the
/// setting that stops the server from starting.
pub fn check(start: &Start<'_>, settings: &Settings, resolved: &[Resolved]) -> anyhow::Result<()> {
    let width = resolved.iter().map(|s| s.key.name().len()).max().unwrap_or(0);
    for setting in resolved {
        let value = setting.value.as_deref().unwrap_or("(not set)");
        println!("{:<width$} = {value}  ({})", setting.key.name(), setting.origin.word());
    }
    if let Some(problem) = settings.responders.problem() {
        bail!("{problem}");
    }
    check_app(start.app_dir)?;
    crate::taxa::load_checklist(start.checklist).map_err(|err| anyhow::anyhow!("checklist: {err:#}"))?;
    if start.data_dir.exists() && !start.data_dir.is_dir() {
        bail!("data_dir: {} is not a folder", start.data_dir.display());
    }
    if start.bind.ip().is_unspecified() && settings.public_url.is_none() {
        eprintln!("note: bind listens on every interface but public_url is not set; browsers' changes will be refused");
    }
    println!("the settings are usable");
    Ok(())
}

/// `app_dir`, when set, must hold a built app.
pub fn check_app(app_dir: Option<&Path>) -> anyhow::Result<()> {
    match app_dir {
        Some(dir) if !dir.join("index.html").is_file() => {
            bail!("app_dir (--app-dir): {} holds no index.html; build the app with `cargo xtask build`", dir.display())
        }
        _ => Ok(()),
    }
}
