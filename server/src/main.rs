//! The `wrackline` binary: parses the command line and hands over to the library.

fn main() -> anyhow::Result<()> {
    tracing_subscriber::fmt()
        .with_env_filter(
            tracing_subscriber::EnvFilter::try_from_default_env()
                .unwrap_or_else(|_| "wrackline_server=info,tower_http=warn".into()),
        )
        .with_writer(std::io::stderr)
        .init();
    let invocation = wrackline_server::cli::parse(std::env::args_os().collect()).unwrap_or_else(|err| err.exit());
    wrackline_server::cli::run(invocation)
}
