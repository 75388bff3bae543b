//! `wrackline config check`: every setting `serve` would start with, its value and where
//! it came from (default, file, env, flag), then the checks `serve` makes before it
//! listens. A value a setting refuses never gets this far: reading the command line and
//! the file stops with the key named ([`crate::settings::file`]).

use std::path::Path;

use anyhow::bail;

use crate::cli::ServeArgs;
use crate::settings::file::Resolved;

/// Prints every setting with its origin, then checks them together; `Err` names the
/// setting that stops the server from starting.
pub fn check(data_dir: &Path, args: &ServeArgs, settings: &[Resolved]) -> anyhow::Result<()> {
    let width = settings.iter().map(|s| s.key.name().len()).max().unwrap_or(0);
    for setting in settings {
        let value = setting.value.as_deref().unwrap_or("(not set)");
        println!("{:<width$} = {value}  ({})", setting.key.name(), setting.origin.word());
    }
    if let Some(problem) = args.settings.responders.problem() {
        bail!("{problem}");
    }
    check_app(args.app_dir.as_deref())?;
    crate::taxa::load_checklist(args.checklist.as_deref()).map_err(|err| anyhow::anyhow!("checklist: {err:#}"))?;
    if data_dir.exists() && !data_dir.is_dir() {
        bail!("data_dir: {} is not a folder", data_dir.display());
    }
    if args.bind.ip().is_unspecified() && args.settings.public_url.is_none() {
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
