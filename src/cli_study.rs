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
use crate::engine::results::{CandidateResult, METRICS, MetricReader, metric_reader};
use crate::engine::{robust, sweep};
use crate::export::number::push_f64;

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

/// Prints `label: N %` on stderr about five times a second until `stop` is set (the
/// setter unparks this thread, so the process does not wait out a last interval).
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
        std::thread::park_timeout(Duration::from_millis(200));
    }
    eprintln!("\r{label}: 100 % ({total} of {total})");
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
    let columns: Vec<Column> = metrics
        .iter()
        .map(|m| match *m {
            "mass_closure_converged" => Column::Converged,
            _ => metric_reader(m).map_or(Column::Empty, Column::Metric),
        })
        .collect();
    let mut out = std::io::BufWriter::with_capacity(1 << 20, std::io::stdout().lock());
    let csv = matches!(args.format, OutputFormat::Csv);
    if csv {
        let mut header = vec!["design"];
        header.extend(&names);
        header.extend(["feasible", "binding_constraint"]);
        header.extend(&metrics);
        out.write_all(&csv_line(header.iter().map(|h| h.as_bytes())))?;
    }
    let (done, cancel, stop) = (
        AtomicUsize::new(0),
        AtomicBool::new(false),
        AtomicBool::new(false),
    );
    let mut io_error: Option<anyhow::Error> = None;
    let mut first = true;
    std::thread::scope(|s| {
        let bar = s.spawn(|| progress("sweep", &done, sw.len(), &stop));
        // Rows are formatted on the worker threads, a group of designs into one buffer;
        // this thread only writes them out. JSON rows after the first start with ",\n".
        sweep::run_mapped(
            &study,
            &sw,
            sweep::CHUNK,
            &done,
            &cancel,
            |lines: &mut Lines, i, values, r| match csv {
                true => csv_row(lines, i, values, &r, &columns),
                false => {
                    if i > 0 {
                        lines.text.extend_from_slice(b",\n");
                    }
                    let row = json_row(i, values, &r, &names, &metrics);
                    lines.text.extend_from_slice(row.as_bytes());
                }
            },
            |_, lines| {
                let res = if csv || !first {
                    out.write_all(&lines.text)
                } else {
                    out.write_all(b"[\n")
                        .and_then(|_| out.write_all(&lines.text))
                };
                first = false;
                if let Err(e) = res {
                    io_error.get_or_insert(e.into());
                    cancel.store(true, Ordering::Relaxed);
                }
            },
        );
        stop.store(true, Ordering::Relaxed);
        bar.thread().unpark();
    });
    if let Some(e) = io_error {
        return Err(e);
    }
    if !csv {
        out.write_all(if first { b"[]\n" } else { b"\n]\n" })?;
    }
    out.flush()?;
    Ok(())
}

/// One CSV line (RFC 4180 quoting where a field needs it, as the `csv` crate writes it).
fn csv_line<'a>(fields: impl Iterator<Item = &'a [u8]>) -> Vec<u8> {
    let mut w = csv::WriterBuilder::new()
        .buffer_capacity(1024)
        .from_writer(Vec::with_capacity(1024));
    // Writing to memory cannot fail.
    w.write_record(fields).expect("in-memory CSV");
    w.into_inner().expect("in-memory CSV")
}

/// What a metric column of a sweep row shows.
#[derive(Clone, Copy)]
enum Column {
    Metric(MetricReader),
    Converged,
    Empty,
}

/// The output lines of a group of designs, and where each number column's last text
/// lies in them: neighbouring designs share many values (the slow axis, the base speed,
/// the envelope length), and a value with the same bits as the one above it is copied
/// rather than written anew.
#[derive(Default)]
struct Lines {
    text: Vec<u8>,
    /// Per column: the bits of its last value and that value's text range in `text`.
    last: Vec<(u64, usize, usize)>,
}

impl Lines {
    /// Appends `v` as the number of column `col`.
    fn number(&mut self, col: usize, v: f64) {
        let bits = v.to_bits();
        let (last_bits, from, to) = self.last[col];
        let at = self.text.len();
        if last_bits == bits && to > from {
            self.text.extend_from_within(from..to);
        } else {
            push_f64(&mut self.text, v);
        }
        self.last[col] = (bits, at, self.text.len());
    }
}

/// A sweep row as one CSV line, appended to `lines`: the design number, the varied values,
/// the verdict, the binding check and the metrics. Numbers print in their shortest
/// round-trip form ([`push_f64`]); an absent metric is an empty field. Only the binding
/// check is text (it holds commas) and is quoted as [`csv_line`] would quote it.
fn csv_row(lines: &mut Lines, i: usize, values: &[f64], r: &CandidateResult, columns: &[Column]) {
    use std::io::Write as _;
    if lines.text.is_empty() {
        lines.text.reserve(32 * 1024);
        lines.last = vec![(0, 0, 0); values.len() + columns.len()];
    }
    let _ = write!(lines.text, "{}", i + 1);
    for (k, &v) in values.iter().enumerate() {
        lines.text.push(b',');
        lines.number(k, v);
    }
    let text = &mut lines.text;
    text.extend_from_slice(if r.feasible { b",true," } else { b",false," });
    let binding = r.binding_constraint.as_deref().unwrap_or("");
    if binding.contains([',', '"', '\r', '\n']) {
        text.push(b'"');
        text.extend_from_slice(binding.replace('"', "\"\"").as_bytes());
        text.push(b'"');
    } else {
        text.extend_from_slice(binding.as_bytes());
    }
    for (k, c) in columns.iter().enumerate() {
        lines.text.push(b',');
        match c {
            Column::Converged => lines
                .text
                .extend_from_slice(match r.mass_closure_converged {
                    true => b"true",
                    false => b"false",
                }),
            Column::Metric(read) => {
                if let Some(v) = read(r) {
                    lines.number(values.len() + k, v);
                }
            }
            Column::Empty => {}
        }
    }
    lines.text.push(b'\n');
}

fn json_row(
    i: usize,
    values: &[f64],
    r: &CandidateResult,
    names: &[&str],
    metrics: &[&str],
) -> String {
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
    serde_json::Value::Object(obj).to_string()
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
