//! Design sweeps (issue: families of designs): vary one to three inputs of a sizing
//! candidate over a full grid and score every design with the same engine, in parallel,
//! streamed out in grid order in bounded chunks. Pure: progress and cancellation are
//! atomics the caller owns.

use super::error::InputError;
use super::evaluate::{StudyContext, evaluate_lean_group};
use super::reader::fmt_num;
use super::results::CandidateResult;
use super::study::{Candidate, Cooling, SizingCommon, SizingMode, Source, Study};
use rayon::prelude::*;
use std::sync::atomic::{AtomicBool, AtomicUsize, Ordering};

/// The most designs one sweep may hold.
pub const MAX_DESIGNS: usize = 100_000;
/// Designs scored together before their rows are handed out in order.
pub const CHUNK: usize = 8192;
/// Designs handed to one worker at a time (a multiple of the lockstep group).
const GROUP: usize = 32;

/// An input a sweep may vary.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Field {
    OuterRadius,
    BoreDiameter,
    InnerOuterRatio,
    AspectRatio,
    PolePairs,
    ElectricLoading,
    CurrentDensity,
    Cooling,
}

impl Field {
    pub const NAMES: [&'static str; 8] = [
        "outer_radius_m",
        "bore_diameter_m",
        "inner_outer_ratio",
        "aspect_ratio",
        "pole_pairs",
        "electric_loading_a_per_m",
        "current_density_a_per_mm2",
        "cooling",
    ];
    const ALL: [Field; 8] = [
        Field::OuterRadius,
        Field::BoreDiameter,
        Field::InnerOuterRatio,
        Field::AspectRatio,
        Field::PolePairs,
        Field::ElectricLoading,
        Field::CurrentDensity,
        Field::Cooling,
    ];
    pub fn name(self) -> &'static str {
        Self::NAMES[self as usize]
    }
    /// Allowed range of the field's values (cooling: class index 0–3).
    fn range(self) -> (f64, f64) {
        match self {
            Field::OuterRadius => (0.01, 5.0),
            Field::BoreDiameter => (0.01, 5.0),
            Field::InnerOuterRatio => (0.05, 0.95),
            Field::AspectRatio => (0.05, 10.0),
            Field::PolePairs => (1.0, 100.0),
            Field::ElectricLoading => (1000.0, 500_000.0),
            Field::CurrentDensity => (0.5, 60.0),
            Field::Cooling => (0.0, 3.0),
        }
    }
}

/// One varied input and its values.
#[derive(Debug, Clone, PartialEq)]
pub struct Axis {
    pub field: Field,
    pub values: Vec<f64>,
}

/// Parses `FIELD=FROM:TO:COUNT` (cooling: `cooling=natural_air,direct_oil,…`).
pub fn parse_axis(spec: &str) -> Result<Axis, InputError> {
    let (name, rest) = spec.split_once('=').ok_or_else(|| {
        InputError::new(
            "vary",
            format!("\"{spec}\" must look like FIELD=FROM:TO:COUNT"),
        )
    })?;
    let field = Field::ALL
        .iter()
        .copied()
        .find(|f| f.name() == name)
        .ok_or_else(|| {
            InputError::new(
                "vary",
                format!(
                    "\"{name}\" is not a sweep field; use one of {}",
                    Field::NAMES.join(", ")
                ),
            )
        })?;
    let path = format!("vary.{name}");
    if field == Field::Cooling {
        let values = rest
            .split(',')
            .map(|c| {
                Cooling::NAMES
                    .iter()
                    .position(|n| *n == c)
                    .map(|i| i as f64)
            })
            .collect::<Option<Vec<f64>>>()
            .ok_or_else(|| {
                InputError::new(
                    &path,
                    format!(
                        "must list cooling classes from {}",
                        Cooling::NAMES.join(", ")
                    ),
                )
            })?;
        return Ok(Axis { field, values });
    }
    let parts: Vec<&str> = rest.split(':').collect();
    let bad = || {
        InputError::new(
            &path,
            "must be FROM:TO:COUNT with numbers, COUNT a whole number from 1 to 100000",
        )
    };
    if parts.len() != 3 {
        return Err(bad());
    }
    let from: f64 = parts[0].trim().parse().map_err(|_| bad())?;
    let to: f64 = parts[1].trim().parse().map_err(|_| bad())?;
    let count: usize = parts[2].trim().parse().map_err(|_| bad())?;
    let (lo, hi) = field.range();
    if !(from.is_finite() && to.is_finite())
        || from < lo
        || to > hi
        || from > to
        || count == 0
        || count > MAX_DESIGNS
    {
        return Err(InputError::new(
            &path,
            format!(
                "FROM and TO must lie from {} to {} with FROM ≤ TO, COUNT from 1 to {MAX_DESIGNS} (got {rest})",
                fmt_num(lo),
                fmt_num(hi)
            ),
        ));
    }
    let values = (0..count)
        .map(|i| {
            if count == 1 {
                from
            } else {
                from + (to - from) * i as f64 / (count - 1) as f64
            }
        })
        .map(|v| {
            if field == Field::PolePairs {
                v.round()
            } else {
                v
            }
        })
        .collect();
    Ok(Axis { field, values })
}

/// A validated sweep of one candidate.
#[derive(Debug, Clone)]
pub struct Sweep {
    pub candidate_index: usize,
    pub axes: Vec<Axis>,
}

impl Sweep {
    pub fn new(study: &Study, candidate: &str, axes: Vec<Axis>) -> Result<Sweep, InputError> {
        let idx = study
            .candidates
            .iter()
            .position(|c| c.name == candidate)
            .ok_or_else(|| {
                InputError::new(
                    "candidate",
                    format!("no candidate named \"{candidate}\" in the study"),
                )
            })?;
        if !matches!(
            study.candidates[idx].source,
            Source::RadialSizing(_) | Source::AxialSizing(_)
        ) {
            return Err(InputError::new(
                "candidate",
                "sweeps need a radial_sizing or axial_sizing candidate",
            ));
        }
        if axes.is_empty() || axes.len() > 3 {
            return Err(InputError::new(
                "vary",
                format!("vary one to three fields (got {})", axes.len()),
            ));
        }
        for (i, a) in axes.iter().enumerate() {
            if axes[..i].iter().any(|b| b.field == a.field) {
                return Err(InputError::new(
                    format!("vary.{}", a.field.name()),
                    "is varied twice",
                ));
            }
        }
        let sweep = Sweep {
            candidate_index: idx,
            axes,
        };
        let n = sweep.len();
        if n > MAX_DESIGNS {
            return Err(InputError::new(
                "vary",
                format!("the grid holds {n} designs; at most {MAX_DESIGNS}"),
            ));
        }
        let base = &study.candidates[idx];
        for axis in &sweep.axes {
            check_applies(base, axis.field)?;
        }
        Ok(sweep)
    }

    /// Number of designs in the grid.
    pub fn len(&self) -> usize {
        self.axes.iter().map(|a| a.values.len()).product()
    }

    pub fn is_empty(&self) -> bool {
        self.len() == 0
    }

    /// The varied values of design `i` (grid order: the first axis varies slowest).
    pub fn values(&self, i: usize) -> Vec<f64> {
        let (values, n) = self.values_fixed(i);
        values[..n].to_vec()
    }

    /// [`Sweep::values`] without allocating: the values in the first `n` places.
    fn values_fixed(&self, mut i: usize) -> ([f64; 3], usize) {
        let mut out = [0.0; 3];
        for (k, a) in self.axes.iter().enumerate().rev() {
            out[k] = a.values[i % a.values.len()];
            i /= a.values.len();
        }
        (out, self.axes.len())
    }

    /// Design `i` as a candidate of its own (a varied size puts it in geometry mode),
    /// checked like any candidate input.
    pub fn design(&self, base: &Candidate, i: usize) -> Result<Candidate, InputError> {
        let c = self.raw_design(base, i);
        super::validate::check_source(&c.source, "source")?;
        Ok(c)
    }

    /// Design `i` without the input checks: a design that cannot be built scores as
    /// infeasible with a geometry violation, so that every grid point has its row.
    pub fn raw_design(&self, base: &Candidate, i: usize) -> Candidate {
        let mut c = Candidate {
            name: String::with_capacity(base.name.len() + 8),
            drive: base.drive.clone(),
            source: base.source.clone(),
        };
        let (values, _) = self.values_fixed(i);
        for (axis, v) in self.axes.iter().zip(values) {
            apply(&mut c, axis.field, v);
        }
        use std::fmt::Write as _;
        let _ = write!(c.name, "{} #{}", base.name, i + 1);
        c
    }
}

fn check_applies(c: &Candidate, f: Field) -> Result<(), InputError> {
    let radial = matches!(c.source, Source::RadialSizing(_));
    let ok = match f {
        Field::OuterRadius | Field::InnerOuterRatio => !radial,
        Field::BoreDiameter | Field::AspectRatio => radial,
        _ => true,
    };
    if ok {
        Ok(())
    } else {
        Err(InputError::new(
            format!("vary.{}", f.name()),
            format!("does not apply to a {} candidate", c.source.kind_name()),
        ))
    }
}

fn common(c: &mut Candidate) -> &mut SizingCommon {
    match &mut c.source {
        Source::RadialSizing(r) => &mut r.common,
        Source::AxialSizing(x) => &mut x.common,
        Source::Datasheet(_) => unreachable!("sweeps are checked to be on sizing candidates"),
    }
}

fn apply(c: &mut Candidate, f: Field, v: f64) {
    match (&mut c.source, f) {
        (Source::AxialSizing(x), Field::OuterRadius) => {
            x.mode = SizingMode::Geometry;
            x.outer_radius_m = Some(v);
        }
        (Source::AxialSizing(x), Field::InnerOuterRatio) => x.inner_outer_ratio = Some(v),
        (Source::RadialSizing(r), Field::BoreDiameter) => {
            let length = r
                .active_length_m
                .unwrap_or(v * r.aspect_ratio.unwrap_or(1.0));
            let aspect = r
                .aspect_ratio
                .unwrap_or(length / r.bore_diameter_m.unwrap_or(v));
            r.mode = SizingMode::Geometry;
            r.bore_diameter_m = Some(v);
            r.active_length_m = Some(aspect * v);
            r.aspect_ratio = None;
        }
        (Source::RadialSizing(r), Field::AspectRatio) => match r.mode {
            SizingMode::Geometry => r.active_length_m = Some(v * r.bore_diameter_m.unwrap_or(0.0)),
            SizingMode::SizeToMission => r.aspect_ratio = Some(v),
        },
        (_, Field::PolePairs) => common(c).pole_pairs = v as u32,
        (_, Field::ElectricLoading) => common(c).electric_loading_a_per_m = Some(v),
        (_, Field::CurrentDensity) => common(c).current_density_a_per_mm2 = Some(v),
        (_, Field::Cooling) => common(c).cooling = Some(Cooling::ALL[v as usize]),
        _ => {}
    }
}

/// Runs the sweep, handing each design's row to `emit` in grid order. Stops early when
/// `cancel` is set; `done` counts scored designs. Returns the number of designs emitted.
pub fn run(
    study: &Study,
    sweep: &Sweep,
    done: &AtomicUsize,
    cancel: &AtomicBool,
    emit: impl FnMut(usize, &[f64], &CandidateResult),
) -> usize {
    run_in_chunks(study, sweep, CHUNK, done, cancel, emit)
}

/// [`run`] with rows scored and handed out `chunk` designs at a time (memory grows with
/// the chunk, not with the sweep); `cancel` is looked at before every chunk and every
/// group of designs. The next chunk is scored while one is handed out, so at most one
/// chunk more than was emitted has been scored when a cancel lands.
pub fn run_in_chunks(
    study: &Study,
    sweep: &Sweep,
    chunk: usize,
    done: &AtomicUsize,
    cancel: &AtomicBool,
    mut emit: impl FnMut(usize, &[f64], &CandidateResult),
) -> usize {
    run_mapped(
        study,
        sweep,
        chunk,
        done,
        cancel,
        |rows: &mut Vec<CandidateResult>, _, _, r| rows.push(r),
        |start, rows| {
            for (k, r) in rows.into_iter().enumerate() {
                emit(start + k, &sweep.values(start + k), &r);
            }
        },
    )
}

/// The sweep with each design's row folded by `map` into its group's `T` on the worker
/// threads beside the scoring (formatting the group's output lines into one buffer, say),
/// and `emit` called on the caller's thread with the groups in grid order, each with the
/// index of its first design. A group is up to 32 consecutive designs of a chunk.
pub fn run_mapped<T: Send + Default>(
    study: &Study,
    sweep: &Sweep,
    chunk: usize,
    done: &AtomicUsize,
    cancel: &AtomicBool,
    map: impl Fn(&mut T, usize, &[f64], CandidateResult) + Sync,
    mut emit: impl FnMut(usize, T),
) -> usize {
    let chunk = chunk.max(1);
    let ctx = StudyContext::new(study);
    let base = &study.candidates[sweep.candidate_index];
    let n = sweep.len();
    // Per group: its first design, its number of designs and its rows (none when cancelled).
    type Scored<T> = Vec<(usize, usize, Option<T>)>;
    let score = |start: usize| -> Scored<T> {
        let end = (start + chunk).min(n);
        // Groups of designs: fixed-size designs in a group are flown in lockstep.
        let starts: Vec<usize> = (start..end).step_by(GROUP).collect();
        starts
            .par_iter()
            .map(|&first| {
                let group = first..(first + GROUP).min(end);
                let len = group.len();
                if cancel.load(Ordering::Relaxed) {
                    return (first, len, None);
                }
                let designs: Vec<Candidate> =
                    group.clone().map(|i| sweep.raw_design(base, i)).collect();
                let mut rows = T::default();
                for (r, i) in evaluate_lean_group(&ctx, &designs).into_iter().zip(group) {
                    let (values, k) = sweep.values_fixed(i);
                    map(&mut rows, i, &values[..k], r);
                }
                done.fetch_add(len, Ordering::Relaxed);
                (first, len, Some(rows))
            })
            .collect()
    };
    let mut emitted = 0;
    let mut hand_out = |groups: Scored<T>| {
        for (first, len, rows) in groups {
            if let Some(rows) = rows {
                emit(first, rows);
                emitted += len;
            }
        }
    };
    // Chunk k + 1 is scored (on the worker threads, driven from a helper thread) while
    // chunk k's rows are handed out here, so the workers never wait for the output.
    let mut pending: Option<Scored<T>> = None;
    for start in (0..n).step_by(chunk) {
        if cancel.load(Ordering::Relaxed) {
            break;
        }
        let rows = std::thread::scope(|s| {
            let next = s.spawn(|| score(start));
            if let Some(groups) = pending.take() {
                hand_out(groups);
            }
            next.join()
        });
        match rows {
            Ok(rows) => pending = Some(rows),
            Err(panic) => std::panic::resume_unwind(panic),
        }
    }
    // Rows scored after a cancel are dropped: a chunk being handed out when the cancel
    // comes is finished, nothing after it is.
    if let Some(groups) = pending.take()
        && !cancel.load(Ordering::Relaxed)
    {
        hand_out(groups);
    }
    emitted
}
