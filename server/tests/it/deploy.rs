//! An installation as an operator makes it: the one binary started from an empty folder
//! with only a configuration file, the file's keys against the settings, its origins
//! and refusals (`wrackline config check`), the example file in `deploy/`, the service
//! unit, and the demo's sign-ins made with passwords drawn at first start.

use std::collections::BTreeSet;
use std::path::{Path, PathBuf};
use std::process::Command;

use reqwest::multipart::{Form, Part};
use wrackline_server::settings::file::{ConfigFile, KEYS, Origin};

use crate::helpers::{plain_jpeg, sign_in, submission};
use crate::process::{self, binary, said};

fn workspace() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR")).parent().unwrap().to_owned()
}

/// `wrackline` with none of the operator's environment variables, so only what a test
/// gives it counts.
fn wrackline() -> Command {
    let mut command = Command::new(binary());
    for (name, _) in std::env::vars_os() {
        if name.to_string_lossy().starts_with("WRACKLINE_") {
            command.env_remove(name);
        }
    }
    command
}

#[tokio::test]
async fn the_binary_serves_the_app_and_the_api_from_an_empty_folder_with_only_a_config_file() {
    assert!(
        wrackline_server::handlers::app_files::is_built(),
        "this test needs the app built into the binary: run `cargo xtask build`, then the tests (`cargo xtask test` does both)"
    );
    let folder = tempfile::tempdir().unwrap();
    std::fs::write(
        folder.path().join("wrackline.toml"),
        "data_dir = \"data\"\nbind = \"127.0.0.1:0\"\npublic_url = \"https://records.example.org\"\n\
         trusted_proxies = [\"127.0.0.1\"]\n\n[dataset]\ntitle = \"Test coast strandings\"\n",
    )
    .unwrap();
    let mut command = wrackline();
    command.current_dir(folder.path()).args(["--config", "wrackline.toml", "serve"]);
    let (server, _) = process::start_command(command);
    let client = reqwest::Client::new();

    // The app's page from the binary itself, brotli to a browser that accepts it (the
    // bytes the build compressed: decompressed here with the brotli crate).
    let plain = client.get(format!("{}/", server.base)).header("accept-encoding", "identity").send().await.unwrap();
    assert_eq!(plain.status(), 200, "{}", server.log());
    let page = plain.bytes().await.unwrap();
    assert!(String::from_utf8_lossy(&page).contains("<html"), "the app's index.html");
    let packed = client.get(format!("{}/", server.base)).header("accept-encoding", "br, gzip").send().await.unwrap();
    assert_eq!(packed.headers()["content-encoding"], "br");
    assert!(packed.headers()["vary"].to_str().unwrap().contains("accept-encoding"));
    let packed = packed.bytes().await.unwrap();
    let mut unpacked = Vec::new();
    brotli::BrotliDecompress(&mut &packed[..], &mut unpacked).expect("a brotli stream (RFC 7932)");
    assert_eq!(unpacked, page, "the brotli copy is the page itself");
    let deep = client.get(format!("{}/some/deep/link", server.base)).send().await.unwrap();
    assert_eq!((deep.status().as_u16(), deep.bytes().await.unwrap()), (200, page.clone()));

    assert_eq!(client.get(format!("{}/healthz", server.base)).send().await.unwrap().status(), 200);
    assert!(folder.path().join("data/wrackline.sqlite3").exists(), "the data live where the file says");

    // A reviewer added by the command line with the same file, a record with a photo,
    // and the export's photo link under the configured public address, not the Host.
    let added = wrackline()
        .current_dir(folder.path())
        .args(["--config", "wrackline.toml", "user", "add", "--username", "deploy-reviewer", "--role", "reviewer"])
        .env("WRACKLINE_PASSWORD", "deploy-reviewer-pass")
        .output()
        .unwrap();
    assert!(added.status.success(), "{}", said(&added));
    let id = "5e0c7a52-2f4d-4c1b-9a8e-3d2c1b0a9f8e";
    let form = Form::new()
        .text("record", submission(id).to_string())
        .part("photo", Part::bytes(plain_jpeg(3)).file_name("p0.jpg"));
    let sent = client.post(format!("{}/api/observations", server.base)).multipart(form).send().await.unwrap();
    assert!(sent.status().is_success(), "{}", sent.text().await.unwrap());
    let reviewer = sign_in(&client, &server.base, "deploy-reviewer", "deploy-reviewer-pass").await.unwrap();
    let export = reviewer
        .sign(client.get(format!("{}/api/export?format=csv&audience=full&state=any", server.base)))
        .send()
        .await
        .unwrap()
        .text()
        .await
        .unwrap();
    assert!(export.contains("https://records.example.org/photos/"), "{export}");
    assert!(!export.contains("127.0.0.1"), "{export}");
    // The dataset's title from the file reaches the published metadata.
    let eml = client.get(format!("{}/dataset/eml.xml", server.base)).send().await.unwrap().text().await.unwrap();
    assert!(eml.contains("<title>Test coast strandings</title>"), "{eml}");
    server.stop();
}

/// Runs `wrackline config check` in `folder` with `args` and `env`.
fn config_check(folder: &Path, args: &[&str], env: &[(&str, &str)]) -> std::process::Output {
    let mut command = wrackline();
    command.current_dir(folder).args(["--config", "wrackline.toml", "config", "check"]).args(args);
    for (name, value) in env {
        command.env(name, value);
    }
    command.output().unwrap()
}

/// The line `config check` printed for `key`.
fn line_for<'a>(printed: &'a str, key: &str) -> &'a str {
    printed.lines().find(|l| l.split_whitespace().next() == Some(key)).unwrap_or_else(|| panic!("{key} in:\n{printed}"))
}

#[test]
fn config_check_says_where_each_value_came_from_a_flag_over_the_environment_over_the_file() {
    let folder = tempfile::tempdir().unwrap();
    std::fs::write(
        folder.path().join("wrackline.toml"),
        "licence = \"cc0\"\n[limits]\nmax_uploads = 4\nmax_connections = 100\ndevice_burst = 7\n\
         [responders]\nwebhook = \"https://alerts.example.org/in\"\nwebhook_secret = \"s3cret-in-the-file\"\n",
    )
    .unwrap();
    let output = config_check(
        folder.path(),
        &["--max-connections", "50"],
        &[("WRACKLINE_MAX_UPLOADS", "5"), ("WRACKLINE_MAX_CONNECTIONS", "60")],
    );
    assert!(output.status.success(), "{}", said(&output));
    let printed = String::from_utf8(output.stdout).unwrap();
    assert!(line_for(&printed, "licence").ends_with("= cc0  (file)"), "{printed}");
    assert!(line_for(&printed, "limits.device_burst").ends_with("= 7  (file)"), "{printed}");
    assert!(line_for(&printed, "limits.max_uploads").ends_with("= 5  (env)"), "{printed}");
    assert!(line_for(&printed, "limits.max_connections").ends_with("= 50  (flag)"), "{printed}");
    assert!(line_for(&printed, "limits.min_free_mb").ends_with("= 256  (default)"), "{printed}");
    assert!(line_for(&printed, "public_url").ends_with("= (not set)  (default)"), "{printed}");
    // A secret is said to be set, never shown.
    assert!(line_for(&printed, "responders.webhook_secret").ends_with("= (set, not shown)  (file)"), "{printed}");
    assert!(!printed.contains("s3cret-in-the-file"), "{printed}");
    // Every key is printed.
    for key in KEYS {
        line_for(&printed, &key.name());
    }
}

#[test]
fn config_check_refuses_a_bad_value_an_unknown_key_and_a_half_set_channel_naming_the_key() {
    let folder = tempfile::tempdir().unwrap();
    let refused = |text: &str, named: &[&str]| {
        std::fs::write(folder.path().join("wrackline.toml"), text).unwrap();
        let output = config_check(folder.path(), &[], &[]);
        assert!(!output.status.success(), "{text} was accepted: {}", said(&output));
        let message = said(&output);
        for part in named {
            assert!(message.contains(part), "{text}: the message names {part}: {message}");
        }
    };
    refused(
        "bind = \"127.0.0.1:8080\"\n\n[limits]\nmax_uploads = \"many\"\n",
        &["line 4", "`limits.max_uploads`", "many"],
    );
    refused("licence = \"all rights reserved\"\n", &["line 1", "`licence`", "cc-by"]);
    refused("public_url = \"records.example.org\"\n", &["`public_url`", "http"]);
    refused("[dataset]\nbounds = \"53,-4,52,-3\"\n", &["line 2", "`dataset.bounds`", "south"]);
    refused("[limits]\nmax_upload = 3\n", &["line 2", "unknown key `limits.max_upload`"]);
    refused("[responders]\nwebhook = \"https://alerts.example.org/in\"\n", &["responders.webhook_secret"]);
    // A file that is not there is named.
    std::fs::remove_file(folder.path().join("wrackline.toml")).unwrap();
    let output = config_check(folder.path(), &[], &[]);
    assert!(!output.status.success() && said(&output).contains("wrackline.toml"), "{}", said(&output));
}

/// The example file with every commented key line (`# key = value`) taken in.
fn example_with_every_key() -> String {
    let example = std::fs::read_to_string(workspace().join("deploy/wrackline.toml")).unwrap();
    example
        .lines()
        .map(|line| match line.strip_prefix("# ") {
            Some(rest)
                if rest
                    .split_once(" = ")
                    .is_some_and(|(key, _)| key.chars().all(|c| c.is_ascii_lowercase() || c == '_')) =>
            {
                rest.to_owned()
            }
            _ => line.to_owned(),
        })
        .collect::<Vec<_>>()
        .join("\n")
}

#[test]
fn the_example_file_lists_every_setting_with_its_default() {
    // Every setting `serve` takes (and the global data folder) has a key in the file.
    let command = <wrackline_server::cli::Cli as clap::CommandFactory>::command();
    let serve = command.find_subcommand("serve").unwrap();
    let keyed: BTreeSet<&str> = KEYS.iter().map(|k| k.arg).collect();
    for arg in serve.get_arguments().map(|a| a.get_id().as_str()).chain(["data_dir"]) {
        assert!(arg == "help" || keyed.contains(arg), "the setting `{arg}` has no key in settings::file::KEYS");
    }
    // Every key is in the example, with a value the setting takes.
    let folder = tempfile::tempdir().unwrap();
    let path = folder.path().join("every-key.toml");
    std::fs::write(&path, example_with_every_key()).unwrap();
    let file = ConfigFile::read(&path).unwrap();
    let listed: BTreeSet<String> = file.values.iter().map(|v| v.key.name()).collect();
    let all: BTreeSet<String> = KEYS.iter().map(|k| k.name()).collect();
    assert_eq!(listed, all, "deploy/wrackline.toml lists every key once");
    let with_file = wrackline_server::cli::parse(
        ["wrackline", "--config", path.to_str().unwrap(), "serve"].map(Into::into).to_vec(),
    )
    .unwrap_or_else(|err| panic!("the example's values are refused: {err}"));
    // Each value comes from the file (unless this test's own environment sets it).
    for setting in &with_file.settings {
        assert!(matches!(setting.origin, Origin::File | Origin::Env), "{}: {:?}", setting.key.name(), setting.origin);
    }
    // Where a setting has a default, the example shows it (data_dir's is per user).
    let defaults = wrackline_server::cli::parse(["wrackline", "serve"].map(Into::into).to_vec()).unwrap();
    for default in defaults.settings.iter().filter(|s| s.value.is_some() && s.key.name() != "data_dir") {
        let example = with_file.settings.iter().find(|s| s.key == default.key).unwrap();
        if default.origin == Origin::Env || example.origin == Origin::Env {
            continue;
        }
        assert_eq!(example.value, default.value, "deploy/wrackline.toml shows `{}` at its default", default.key.name());
    }
}

#[test]
fn the_service_unit_names_the_binary_and_the_config_file() {
    let unit_path = workspace().join("deploy/wrackline.service");
    let verified = Command::new("systemd-analyze").arg("verify").arg(&unit_path).output();
    match verified {
        // systemd's own reader; it also complains when the binary is not installed here,
        // which this machine need not have, so only the unit's own syntax counts.
        Ok(output) if output.status.code().is_some() => {
            let message = said(&output);
            for line in message.lines().filter(|l| !l.contains("/usr/local/bin/wrackline") && !l.trim().is_empty()) {
                assert!(!line.contains("wrackline.service"), "systemd-analyze verify: {line}");
            }
        }
        _ => {}
    }
    // Read by hand either way (systemd.unit(5): INI-like sections of key=value).
    let unit = std::fs::read_to_string(&unit_path).unwrap();
    let mut section = String::new();
    let mut seen = BTreeSet::new();
    for line in unit.lines().map(str::trim).filter(|l| !l.is_empty() && !l.starts_with('#')) {
        if let Some(name) = line.strip_prefix('[').and_then(|l| l.strip_suffix(']')) {
            section = name.to_owned();
            continue;
        }
        let (key, value) = line.split_once('=').unwrap_or_else(|| panic!("not key=value: {line}"));
        seen.insert(format!("{section}.{key}"));
        if key == "ExecStart" {
            assert!(value.contains("wrackline") && value.contains("--config") && value.contains(" serve"), "{value}");
        }
    }
    for needed in
        ["Unit.Description", "Service.ExecStart", "Service.User", "Service.StateDirectory", "Install.WantedBy"]
    {
        assert!(seen.contains(needed), "the unit sets {needed}");
    }
}

#[tokio::test]
async fn demo_sign_ins_get_random_passwords_shown_once_and_stored_only_as_hashes() {
    let dir = tempfile::tempdir().unwrap();
    let demo = || {
        let mut command = wrackline();
        command.arg("--data-dir").arg(dir.path()).args(["demo", "--bind", "127.0.0.1:0"]);
        process::start_command(command)
    };
    let (server, printed) = demo();
    let passwords: Vec<(String, String)> = printed
        .iter()
        .filter_map(|line| {
            let rest = line.strip_prefix("demo sign-in (")?;
            let (_, rest) = rest.split_once("): username ")?;
            let (username, password) = rest.split_once(", password ")?;
            Some((username.to_owned(), password.to_owned()))
        })
        .collect();
    assert_eq!(passwords.len(), 2, "{printed:?}");
    let client = reqwest::Client::new();
    for (username, password) in &passwords {
        assert!(password.len() >= 32 && password.chars().all(|c| c.is_ascii_hexdigit()), "{password}");
        assert!(!password.contains("pass"), "not a fixed word: {password}");
        sign_in(&client, &server.base, username, password).await.unwrap_or_else(|e| panic!("{username}: {e:?}"));
    }
    assert_ne!(passwords[0].1, passwords[1].1);
    server.stop();
    let database = std::fs::read(dir.path().join("wrackline.sqlite3")).unwrap();
    for (_, password) in &passwords {
        assert!(
            !database.windows(password.len()).any(|w| w == password.as_bytes()),
            "the password is not stored as it is"
        );
    }
    // A second start on the same folder shows no password: none is kept to show.
    let (server, printed) = demo();
    let text = printed.join("\n");
    for (_, password) in &passwords {
        assert!(!text.contains(password.as_str()), "{text}");
    }
    assert!(text.contains("printed when it was made"), "{text}");
    server.stop();
}

/// The demo's public data: the demo reviewer's decisions in `demo-records/reviews.json`
/// are applied at load, so an anonymous visitor's export has the confirmed records, each
/// with the reviewer's remark, and the records still waiting stay out of it.
#[tokio::test]
async fn the_demo_has_confirmed_records_in_its_public_export() {
    let reviews: serde_json::Value =
        serde_json::from_str(&std::fs::read_to_string(workspace().join("demo-records/reviews.json")).unwrap()).unwrap();
    let confirmed: BTreeSet<String> = reviews
        .as_array()
        .unwrap()
        .iter()
        .filter(|r| r["decision"]["action"] == "confirm")
        .map(|r| r["client_id"].as_str().unwrap().to_owned())
        .collect();
    assert!(confirmed.len() >= 10, "the demo confirms enough records to draw figures: {}", confirmed.len());
    let dir = tempfile::tempdir().unwrap();
    let mut command = wrackline();
    command.arg("--data-dir").arg(dir.path()).args(["demo", "--bind", "127.0.0.1:0"]);
    let (server, printed) = process::start_command(command);
    let said_confirmed = format!("{} of them confirmed by the demo reviewer", confirmed.len());
    assert!(printed.iter().any(|line| line.contains(&said_confirmed)), "{printed:?}");
    let csv = reqwest::get(format!("{}/api/export?format=csv", server.base)).await.unwrap().text().await.unwrap();
    let mut rows = csv.lines();
    assert!(rows.next().unwrap().starts_with("occurrenceID,"), "{csv}");
    let mut public = BTreeSet::new();
    for row in rows {
        // The reviewer's remark is in the row; the name is protected for the public.
        assert!(row.contains("Demo review: confirmed") && row.contains(",confirmed,"), "{row}");
        let id = row.split(',').next().unwrap();
        public.insert(id.trim_start_matches("urn:uuid:").to_owned());
    }
    assert_eq!(public, confirmed, "the public export holds exactly the confirmed demo records");
    server.stop();
}
