//! The `wrackline` command line. Scripts and later work rely on these names:
//! `serve`, `demo`, `export`, `import`, `range`, `trend`, `backup`, `restore`, `check`,
//! `config check`, each taking `--data-dir` and `--config` (the configuration file,
//! [`crate::settings::file`]: flags and environment variables override it).

use std::net::SocketAddr;
use std::path::PathBuf;

use anyhow::Context as _;
use clap::{CommandFactory as _, FromArgMatches as _, Parser, Subcommand, ValueEnum};

use crate::state::AppState;
use crate::{commands, demo};

#[derive(Debug, Parser)]
#[command(
    name = "wrackline",
    version,
    about = "Records of sharks and rays found stranded or landed: capture, review, export."
)]
pub struct Cli {
    /// Where the database and photos live.
    #[arg(long, global = true, env = "WRACKLINE_DATA_DIR", default_value_os_t = default_data_dir())]
    pub data_dir: PathBuf,
    /// A configuration file (TOML) with any of the settings; flags and environment
    /// variables override it (see deploy/wrackline.toml for every key).
    #[arg(long, global = true, env = crate::settings::file::CONFIG_VARIABLE)]
    pub config: Option<PathBuf>,
    #[command(subcommand)]
    pub command: Command,
}

#[derive(Debug, Subcommand)]
pub enum Command {
    /// Serve the app and the API.
    Serve(ServeArgs),
    /// Load the demo records into the data directory if it holds none, then serve.
    Demo(ServeArgs),
    /// Write all records to a file or to standard output.
    Export(commands::export::ExportArgs),
    /// Bring in records kept elsewhere: a CSV file or a Darwin Core Archive, every row
    /// checked as a phone's record is, into the review queue. Run it while the server is
    /// stopped (or restart the server after it).
    Import(commands::import::ImportArgs),
    /// Range figures (records, sites, EOO, AOO) per taxon and period.
    Range(commands::range::RangeArgs),
    /// The effort-corrected yearly trend over the assessment window.
    Trend(commands::trend::TrendArgs),
    /// Survey effort: kilometres and hours walked per stretch per month or year.
    Effort(EffortArgs),
    /// People with a sign-in (reviewers, admins and responders).
    #[command(subcommand)]
    User(UserCommand),
    /// Copy the database and every photo into a new folder, while the server runs.
    Backup(commands::backup::BackupArgs),
    /// Check a backup, then copy it into an empty data directory.
    Restore(commands::backup::RestoreArgs),
    /// Check the database's integrity and that every photo it names is present and
    /// matches its SHA-256 (a data directory or a backup).
    Check,
    /// Samples taken from animals.
    #[command(subcommand)]
    Sample(commands::sample::SampleCommand),
    /// The configuration file and the settings it gives.
    #[command(subcommand)]
    Config(ConfigCommand),
}

#[derive(Debug, Subcommand)]
pub enum ConfigCommand {
    /// Print every setting `serve` would use, with where it came from (default, file,
    /// env, flag), and check them; a bad value stops it with the key named.
    Check(ServeArgs),
}

#[derive(Debug, Subcommand)]
pub enum UserCommand {
    /// Add a reviewer, admin or responder. The password is read from WRACKLINE_PASSWORD, or else
    /// from the first line of standard input.
    Add {
        #[arg(long)]
        username: String,
        #[arg(long, value_enum)]
        role: StaffRole,
        #[arg(long)]
        display_name: Option<String>,
    },
    /// List people with a sign-in.
    List,
}

#[derive(Debug, Clone, Copy, ValueEnum)]
pub enum StaffRole {
    Reviewer,
    Admin,
    Responder,
}

#[derive(Debug, clap::Args)]
pub struct EffortArgs {
    #[arg(long, value_enum, default_value = "year")]
    pub by: crate::assess::effort::Period,
    /// Print JSON for scripts instead of a table.
    #[arg(long)]
    pub json: bool,
}

#[derive(Debug, clap::Args)]
pub struct ServeArgs {
    /// Address and port to listen on (port 0 picks a free one).
    #[arg(long, default_value = "127.0.0.1:8080")]
    pub bind: SocketAddr,
    /// A folder with a built app to serve instead of the one built into this binary
    /// (for development: `target/app-dist`, made by `cargo xtask build`).
    #[arg(long, env = "WRACKLINE_APP_DIR")]
    pub app_dir: Option<PathBuf>,
    /// The species checklist (JSON, see species-key/README.md); the demo checklist if not given.
    #[arg(long)]
    pub checklist: Option<PathBuf>,
    #[command(flatten)]
    pub settings: crate::settings::Settings,
}

fn default_data_dir() -> PathBuf {
    dirs::data_dir().unwrap_or_else(|| PathBuf::from(".")).join("wrackline")
}

/// The command line as `wrackline` was started, with the configuration file's values
/// for what no flag or environment variable set, and every setting's origin.
pub struct Invocation {
    pub cli: Cli,
    pub settings: Vec<crate::settings::file::Resolved>,
}

/// Reads the command line (`argv`, the program's name first) and the configuration file
/// it names. A mistake in either is a clap error, which prints itself and exits.
pub fn parse(argv: Vec<std::ffi::OsString>) -> Result<Invocation, clap::Error> {
    let command = Cli::command();
    let first = command.clone().try_get_matches_from(&argv)?;
    let file = match first.get_one::<PathBuf>("config") {
        Some(path) => Some(
            crate::settings::file::ConfigFile::read(path)
                .map_err(|problem| command.clone().error(clap::error::ErrorKind::Io, problem))?,
        ),
        None => None,
    };
    let (matches, settings) = crate::settings::file::apply(&command, argv, file.as_ref())?;
    Ok(Invocation { cli: Cli::from_arg_matches(&matches)?, settings })
}

/// Runs one command to the end.
pub fn run(invocation: Invocation) -> anyhow::Result<()> {
    let Invocation { cli, settings } = invocation;
    match cli.command {
        Command::Config(ConfigCommand::Check(args)) => {
            let start = commands::config::Start {
                data_dir: &cli.data_dir,
                bind: args.bind,
                app_dir: args.app_dir.as_deref(),
                checklist: args.checklist.as_deref(),
            };
            commands::config::check(&start, &args.settings, &settings)
        }
        Command::Serve(args) => serve(&cli.data_dir, args, false),
        Command::Demo(args) => serve(&cli.data_dir, args, true),
        Command::Export(args) => commands::export::run(&cli.data_dir, args),
        Command::Import(args) => commands::import::run(&cli.data_dir, args),
        Command::Range(args) => commands::range::run(&cli.data_dir, args),
        Command::Trend(args) => commands::trend::run(&cli.data_dir, args),
        Command::Effort(args) => print_effort(&cli.data_dir, &args),
        Command::User(command) => user(&cli.data_dir, command),
        Command::Backup(args) => commands::backup::backup(&cli.data_dir, &args),
        Command::Restore(args) => commands::backup::restore(&cli.data_dir, &args),
        Command::Check => commands::backup::check(&cli.data_dir),
        Command::Sample(command) => commands::sample::run(&cli.data_dir, command),
    }
}

fn serve(data_dir: &std::path::Path, args: ServeArgs, with_demo: bool) -> anyhow::Result<()> {
    commands::config::check_app(args.app_dir.as_deref())?;
    if args.app_dir.is_none() && !crate::handlers::app_files::is_built() {
        eprintln!(
            "note: this binary was built before the app (run `cargo xtask build`, then build the server again); serving the API and a page that says so"
        );
    }
    let checklist = crate::taxa::load_checklist(args.checklist.as_deref())?;
    let mut state = AppState::open_with(data_dir, args.app_dir, checklist, args.settings)?;
    let runtime = tokio::runtime::Runtime::new().context("starting the async runtime")?;
    runtime.block_on(async move {
        if with_demo {
            let people = demo::ensure_demo_people(&state).await?;
            let loaded = demo::load_if_empty(&state).await?;
            println!(
                "demo: {} demo records loaded into {}, {} of them confirmed by the demo reviewer",
                loaded.records,
                data_dir.display(),
                loaded.confirmed
            );
            for person in people {
                let (username, role) = (person.username, person.role);
                match person.new_password {
                    Some(password) => println!("demo sign-in ({role}): username {username}, password {password}"),
                    None => println!(
                        "demo sign-in ({role}): username {username}, with the password printed when it was made \
                         (start on a new --data-dir for new ones)"
                    ),
                }
            }
        }
        let listener =
            tokio::net::TcpListener::bind(args.bind).await.with_context(|| format!("binding {}", args.bind))?;
        let address = listener.local_addr()?;
        println!("wrackline listening on http://{address}");
        println!("data directory: {}", data_dir.display());
        let listening = crate::settings::PublicUrl::listening_on(address);
        let public = state.settings.public_url.get_or_insert_with(|| listening.clone()).clone();
        println!("public address: {} (links point under it; browsers must come from it)", public.origin());
        if address.ip().is_unspecified() && public == listening {
            eprintln!(
                "note: listening on every interface; set --public-url to the address people use, or browsers' changes will be refused"
            );
        }
        crate::router::serve(listener, state).await
    })
}

fn print_effort(data_dir: &std::path::Path, args: &EffortArgs) -> anyhow::Result<()> {
    let state = AppState::open(data_dir, None, crate::taxa::load_checklist(None)?)?;
    let walks = state.store.run_here(|conn| crate::store::walks::list_walks(conn))?;
    // The operator's own command: every stretch named.
    let rows = crate::assess::effort::summarise(&walks, args.by, &|_| false);
    if args.json {
        println!("{}", serde_json::to_string_pretty(&rows)?);
        return Ok(());
    }
    println!(
        "{:<28} {:<8} {:>6} {:>10} {:>9} {:>8} {:>8}",
        "stretch", "period", "walks", "all finds", "km", "hours", "records"
    );
    for row in &rows {
        println!(
            "{:<28} {:<8} {:>6} {:>10} {:>9.2} {:>8.2} {:>8}",
            row.stretch, row.period, row.walks, row.all_finds_walks, row.kilometres, row.hours, row.records
        );
    }
    if rows.is_empty() {
        println!("(no survey walks yet)");
    }
    Ok(())
}

fn user(data_dir: &std::path::Path, command: UserCommand) -> anyhow::Result<()> {
    let state = AppState::open(data_dir, None, crate::taxa::load_checklist(None)?)?;
    let runtime = tokio::runtime::Runtime::new().context("starting the async runtime")?;
    match command {
        UserCommand::Add { username, role, display_name } => {
            let password = match std::env::var("WRACKLINE_PASSWORD") {
                Ok(password) => password,
                Err(_) => {
                    let mut line = String::new();
                    std::io::stdin().read_line(&mut line).context("reading the password from standard input")?;
                    line.trim_end_matches(['\r', '\n']).to_owned()
                }
            };
            let role = match role {
                StaffRole::Reviewer => shared_types::Role::Reviewer,
                StaffRole::Admin => shared_types::Role::Admin,
                StaffRole::Responder => shared_types::Role::Responder,
            };
            let display = display_name.unwrap_or_else(|| username.clone());
            runtime
                .block_on(crate::people::add_staff(&state.store, None, &username, role, display, password))
                .map_err(|err| anyhow::anyhow!("{err}"))?;
            println!("added {username} ({})", role.code());
        }
        UserCommand::List => {
            for person in state.store.run_here(|conn| crate::store::people::list_staff(conn))? {
                let off = if person.disabled { " (turned off)" } else { "" };
                println!(
                    "{} {} {}{off}",
                    person.username.unwrap_or_default(),
                    person.role.code(),
                    person.display_name.unwrap_or_default()
                );
            }
        }
    }
    Ok(())
}
