//! Engine subcommands over families and uncertainty: `sweep` and `robustness`, with a
//! progress line on stderr while they run.

use std::io::Write;
use std::path::PathBuf;
use std::sync::atomic::{AtomicBool, AtomicUsize, Ordering};
use std::time::Duration;

use anyhow::Context;
use clap::Args;
use rand::{RngExt, SeedableRng, rngs::StdRng};

use crate::cli_engine::{OutputFormat, load_study};
use crate::engine::results::{CandidateResult, METRICS};
use crate::engine::{robust, sweep};

/// `shaftline sweep STUDY.json --candidate NAME --vary FIELD=FROM:TO:COUNT …`
#[derive(Debug, Args)]
pub struct SweepArgs {
    pub study: PathBuf,
    /// The sizing candidate to vary (its exact name).
    #[arg(long)]
    pub candidate: String,
    /// FIELD=FROM:TO:COUNT (or cooling=CLASS,CLASS,…); one to three.
    #[arg(long, required = true)]
    pub vary: Vec<String>,
    #[arg(long, value_enum, default_value = "csv")]
    pub format: OutputFormat,
}

/// `shaftline robustness STUDY.json --samples N --seed S`
#[derive(Debug, Args)]
pub struct RobustnessArgs {
    pub study: PathBuf,
    #[arg(long, default_value_t = 1000)]
    pub samples: usize,
    #[arg(long, default_value_t = 1)]
    pub seed: u64,
    #[arg(long, value_enum, default_value = "csv")]
    pub format: OutputFormat,
}

fn fail(path: &str, message: &str) -> ! {
    eprintln!("error: {path}: {message}");
    std::process::exit(2);
}

/// Prints `label: N %` on stderr about five times a second until `stop` is set.
fn progress(label: &'static str, done: &AtomicUsize, total: usize, stop: &AtomicBool) {
    let mut last = usize::MAX;
    while !stop.load(Ordering::Relaxed) {
        let pct = 100 * done.load(Ordering::Relaxed) / total.max(1);
        if pct != last {
            eprint!(
                "\r{label}: {pct:>3} % ({} of {total})",
                done.load(Ordering::Relaxed)
            );
            last = pct;
        }
        std::thread::sleep(Duration::from_millis(200));
    }
    eprintln!("\r{label}: 100 % ({total} of {total})");
}

fn metric_cell(r: &CandidateResult, name: &str) -> String {
    match name {
        "mass_closure_converged" => r.mass_closure_converged.to_string(),
        "rank" => String::new(),
        _ => r.metric(name).map(|v| v.to_string()).unwrap_or_default(),
    }
}

/// Where sweep rows go: CSV, or a JSON array of row objects.
enum Rows<W: Write> {
    Csv(Box<csv::Writer<W>>),
    Json(W, bool),
}

pub fn run_sweep(args: &SweepArgs) -> anyhow::Result<()> {
    let study = load_study(&args.study)?;
    let axes: Vec<sweep::Axis> = args
        .vary
        .iter()
        .map(|v| sweep::parse_axis(v).unwrap_or_else(|e| fail(&e.path, &e.message)))
        .collect();
    let sw = sweep::Sweep::new(&study, &args.candidate, axes)
        .unwrap_or_else(|e| fail(&e.path, &e.message));
    let names: Vec<&str> = sw.axes.iter().map(|a| a.field.name()).collect();
    let metrics: Vec<&str> = METRICS
        .iter()
        .map(|(n, _)| *n)
        .filter(|n| !matches!(*n, "rank" | "trade_score"))
        .collect();
    let out = std::io::BufWriter::new(std::io::stdout().lock());
    let mut rows = match args.format {
        OutputFormat::Csv => {
            let mut w = csv::Writer::from_writer(out);
            let mut header = vec!["design"];
            header.extend(&names);
            header.extend(["feasible", "binding_constraint"]);
            header.extend(&metrics);
            w.write_record(&header)?;
            Rows::Csv(Box::new(w))
        }
        OutputFormat::Json => Rows::Json(out, true),
    };
    let (done, cancel, stop) = (
        AtomicUsize::new(0),
        AtomicBool::new(false),
        AtomicBool::new(false),
    );
    let mut io_error: Option<anyhow::Error> = None;
    std::thread::scope(|s| {
        s.spawn(|| progress("sweep", &done, sw.len(), &stop));
        sweep::run(&study, &sw, &done, &cancel, |i, values, r| {
            if let Err(e) = write_row(&mut rows, i, values, r, &names, &metrics) {
                io_error.get_or_insert(e);
                cancel.store(true, Ordering::Relaxed);
            }
        });
        stop.store(true, Ordering::Relaxed);
    });
    if let Some(e) = io_error {
        return Err(e);
    }
    match rows {
        Rows::Csv(mut w) => w.flush()?,
        Rows::Json(mut w, first) => {
            writeln!(w, "{}]", if first { "[" } else { "\n" })?;
            w.flush()?;
        }
    }
    Ok(())
}

fn write_row<W: Write>(
    rows: &mut Rows<W>,
    i: usize,
    values: &[f64],
    r: &CandidateResult,
    names: &[&str],
    metrics: &[&str],
) -> anyhow::Result<()> {
    match rows {
        Rows::Csv(w) => {
            let mut row = vec![(i + 1).to_string()];
            row.extend(values.iter().map(|v| v.to_string()));
            row.push(r.feasible.to_string());
            row.push(r.binding_constraint.clone().unwrap_or_default());
            row.extend(metrics.iter().map(|m| metric_cell(r, m)));
            w.write_record(&row)?;
        }
        Rows::Json(w, first) => {
            let mut obj = serde_json::Map::new();
            obj.insert("design".into(), (i + 1).into());
            for (n, v) in names.iter().zip(values) {
                obj.insert(n.to_string(), serde_json::json!(v));
            }
            obj.insert("feasible".into(), r.feasible.into());
            obj.insert(
                "binding_constraint".into(),
                serde_json::json!(r.binding_constraint),
            );
            for m in metrics {
                obj.insert(m.to_string(), serde_json::json!(r.metric(m)));
            }
            write!(
                w,
                "{}{}",
                if *first { "[\n" } else { ",\n" },
                serde_json::Value::Object(obj)
            )?;
            *first = false;
        }
    }
    Ok(())
}

pub fn run_robustness(args: &RobustnessArgs) -> anyhow::Result<()> {
    if args.samples == 0 || args.samples > 100_000 {
        fail(
            "samples",
            &format!(
                "must be a whole number from 1 to 100000 (got {})",
                args.samples
            ),
        );
    }
    let study = load_study(&args.study)?;
    let mut rng = StdRng::seed_from_u64(args.seed);
    let mut uniform = || rng.random::<f64>();
    let r = robust::run(
        &study,
        &robust::Uncertainty::default(),
        args.samples,
        &mut uniform,
    );
    let stdout = std::io::stdout();
    let mut out = stdout.lock();
    match args.format {
        OutputFormat::Json => {
            serde_json::to_writer_pretty(&mut out, &r).context("writing the results")?;
            writeln!(out)?;
        }
        OutputFormat::Csv => crate::export::write_robustness_csv(&r, args.seed, &mut out)?,
    }
    Ok(())
}
