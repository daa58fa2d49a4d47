//! Engine subcommands of the binary: headless scoring and the benchmark.

use std::io::Write;
use std::path::PathBuf;

use anyhow::Context;
use clap::{Args, ValueEnum};

use crate::engine::{self, study};

#[derive(Debug, Clone, Copy, PartialEq, Eq, ValueEnum)]
pub enum OutputFormat {
    Json,
    Csv,
}

/// `shaftline score STUDY.json [--format json|csv] [--out FILE]`
#[derive(Debug, Args)]
pub struct ScoreArgs {
    /// The study file (shaftline-study/1).
    pub study: PathBuf,
    /// Output format.
    #[arg(long, value_enum, default_value = "json")]
    pub format: OutputFormat,
    /// Write the results here instead of standard output.
    #[arg(long)]
    pub out: Option<PathBuf>,
}

/// `shaftline bench [--runs N] [--designs N]`
#[derive(Debug, Args)]
pub struct BenchArgs {
    /// Repetitions of each timed measurement (the median is printed).
    #[arg(long, default_value_t = 30)]
    pub runs: usize,
    /// Geometry-mode axial designs scored in parallel for the throughput figure.
    #[arg(long, default_value_t = 20_000)]
    pub designs: usize,
    /// Designs of the A1 sweep (R_o × λ grid, rounded to a square).
    #[arg(long, default_value_t = 100_000)]
    pub sweep_designs: usize,
    /// Concurrent clients of the loopback load run.
    #[arg(long, default_value_t = 100)]
    pub load_clients: usize,
    /// Requests of the loopback load run (0 skips it).
    #[arg(long, default_value_t = 2000)]
    pub load_requests: usize,
}

/// Reads and validates a study file; bad input prints `error: <json path>: <message>`
/// and exits 2.
pub fn load_study(path: &std::path::Path) -> anyhow::Result<study::Study> {
    let text =
        std::fs::read_to_string(path).with_context(|| format!("reading {}", path.display()))?;
    match study::parse_study_str(&text) {
        Ok(s) => Ok(s),
        Err(e) => {
            eprintln!("error: {}: {}", e.path, e.message);
            std::process::exit(2);
        }
    }
}

/// Scores a study file. Bad input prints `error: <json path>: <message>` and exits 2.
pub fn run_score(args: &ScoreArgs) -> anyhow::Result<()> {
    let study = load_study(&args.study)?;
    let results = engine::score_study(&study);
    let mut buf: Vec<u8> = Vec::new();
    match args.format {
        OutputFormat::Json => {
            serde_json::to_writer_pretty(&mut buf, &results)?;
            buf.push(b'\n');
        }
        OutputFormat::Csv => crate::export::write_summary_csv(&results, &mut buf)?,
    }
    match &args.out {
        Some(path) => {
            std::fs::write(path, &buf).with_context(|| format!("writing {}", path.display()))?
        }
        None => std::io::stdout().lock().write_all(&buf)?,
    }
    Ok(())
}

/// Prints the engine benchmark figures, then the server load figures.
pub async fn run_bench(args: &BenchArgs) -> anyhow::Result<()> {
    let (runs, designs, sweep) = (
        args.runs.max(1),
        args.designs.max(1),
        args.sweep_designs.max(4),
    );
    tokio::task::spawn_blocking(move || crate::bench::run(runs, designs, sweep)).await?;
    if args.load_requests > 0 {
        let clients = args.load_clients.max(1);
        let report = crate::loadtest::run_fresh(clients, args.load_requests).await?;
        println!(
            "server on loopback, {clients} clients: {}",
            report.summary()
        );
    }
    Ok(())
}
