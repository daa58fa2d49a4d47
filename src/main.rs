//! The `shaftline` binary: parse the command line, start tracing, dispatch.

use clap::Parser;
use shaftline::cli::{self, Cli, Commands};

// The engine's sweeps allocate and free small result rows at a high rate on every core;
// this allocator's per-thread free lists serve that much faster than the system one.
#[global_allocator]
static ALLOCATOR: mimalloc::MiMalloc = mimalloc::MiMalloc;

#[tokio::main]
async fn main() -> anyhow::Result<()> {
    let cli = Cli::parse();
    tracing_subscriber::fmt()
        .with_env_filter(
            tracing_subscriber::EnvFilter::try_from_default_env()
                .unwrap_or_else(|_| "shaftline=info,tower_http=warn".into()),
        )
        .with_writer(std::io::stderr)
        .init();
    match cli.command {
        Commands::Serve(args) => shaftline::web::serve(args).await,
        Commands::User { db, action } => cli::run_user(&db, action).await,
        Commands::Token { db, action } => cli::run_token(&db, action).await,
        Commands::Score(args) => shaftline::cli_engine::run_score(&args),
        Commands::Bench(args) => shaftline::cli_engine::run_bench(&args).await,
        Commands::Sweep(args) => shaftline::cli_study::run_sweep(&args),
        Commands::Robustness(args) => shaftline::cli_study::run_robustness(&args),
        Commands::Backup { db, dest } => cli::run_backup(&db, &dest).await,
    }
}
