//! The `wrackline` command line. Scripts and later work rely on these names:
//! `serve`, `demo`, `export`, `range`, `trend`, each taking `--data-dir`.

use std::net::SocketAddr;
use std::path::PathBuf;

use anyhow::Context as _;
use clap::{Parser, Subcommand};

use crate::{AppState, commands, demo};

#[derive(Debug, Parser)]
#[command(name = "wrackline", version, about = "Records of sharks and rays found stranded or landed: capture, review, export.")]
pub struct Cli {
    /// Where the database and photos live.
    #[arg(long, global = true, env = "WRACKLINE_DATA_DIR", default_value_os_t = default_data_dir())]
    pub data_dir: PathBuf,
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
    /// Range figures (records, sites, EOO, AOO) per taxon and period.
    Range(commands::range::RangeArgs),
    /// The effort-corrected yearly trend over the assessment window.
    Trend(commands::trend::TrendArgs),
}

#[derive(Debug, clap::Args)]
pub struct ServeArgs {
    /// Address and port to listen on (port 0 picks a free one).
    #[arg(long, default_value = "127.0.0.1:8080")]
    pub bind: SocketAddr,
    /// The built app to serve (made by `cargo xtask build`).
    #[arg(long, env = "WRACKLINE_APP_DIR", default_value = "target/app-dist")]
    pub app_dir: PathBuf,
}

fn default_data_dir() -> PathBuf {
    dirs::data_dir().unwrap_or_else(|| PathBuf::from(".")).join("wrackline")
}

/// Runs one command to the end.
pub fn run(cli: Cli) -> anyhow::Result<()> {
    match cli.command {
        Command::Serve(args) => serve(&cli.data_dir, args, false),
        Command::Demo(args) => serve(&cli.data_dir, args, true),
        Command::Export(args) => commands::export::run(&cli.data_dir, args),
        Command::Range(args) => commands::range::run(&cli.data_dir, args),
        Command::Trend(args) => commands::trend::run(&cli.data_dir, args),
    }
}

fn serve(data_dir: &std::path::Path, args: ServeArgs, with_demo: bool) -> anyhow::Result<()> {
    let app_dir = args.app_dir.join("index.html").exists().then(|| args.app_dir.clone());
    if app_dir.is_none() {
        eprintln!("note: no built app at {} (run `cargo xtask build`); serving the API only", args.app_dir.display());
    }
    let state = AppState::open(data_dir, app_dir)?;
    let runtime = tokio::runtime::Runtime::new().context("starting the async runtime")?;
    runtime.block_on(async move {
        if with_demo {
            let loaded = demo::load_if_empty(&state).await?;
            println!("demo: {loaded} demo records loaded into {}", data_dir.display());
        }
        let listener = tokio::net::TcpListener::bind(args.bind).await.with_context(|| format!("binding {}", args.bind))?;
        let address = listener.local_addr()?;
        println!("wrackline listening on http://{address}");
        println!("data directory: {}", data_dir.display());
        crate::serve(listener, state).await
    })
}
