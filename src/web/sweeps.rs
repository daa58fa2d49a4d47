//! Background design sweeps: a registry of jobs keyed by a random id, each running the
//! engine's sweep off the reactor (`spawn_blocking`, rayon inside) with its progress and
//! cancel flag as atomics. Rows are kept compactly (varied values, feasibility, the two
//! trade metrics, an interned binding constraint), never a full result per design.

use std::collections::HashMap;
use std::sync::atomic::{AtomicBool, AtomicUsize, Ordering};
use std::sync::{Arc, Mutex, MutexGuard};

use crate::engine::results::CandidateResult;
use crate::engine::study::{Candidate, Study};
use crate::engine::sweep::{self, Sweep};

/// Jobs kept in memory; past this the oldest finished job is forgotten.
pub const MAX_JOBS: usize = 16;
/// Sweeps allowed to run at once (they share the machine's cores).
pub const MAX_RUNNING: usize = 2;

/// One design of a sweep, as the pages need it.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct SweepRow {
    /// The varied values in axis order (unused slots are 0).
    pub values: [f64; 3],
    pub feasible: bool,
    pub propulsion_mass_kg: f64,
    pub mission_energy_kwh: f64,
    /// Index into the job's binding-constraint names (0: none).
    binding: u16,
}

#[derive(Default)]
struct Rows {
    rows: Vec<SweepRow>,
    /// Distinct binding constraints; entry 0 is "" (none).
    bindings: Vec<String>,
}

impl Rows {
    fn intern(&mut self, name: Option<&str>) -> u16 {
        let name = name.unwrap_or("");
        if self.bindings.is_empty() {
            self.bindings.push(String::new());
        }
        match self.bindings.iter().position(|b| b == name) {
            Some(i) => i as u16,
            None if self.bindings.len() < u16::MAX as usize => {
                self.bindings.push(name.to_string());
                (self.bindings.len() - 1) as u16
            }
            None => 0,
        }
    }
}

/// Where a job stands.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum JobState {
    Running,
    Finished,
    Cancelled,
}

impl JobState {
    pub fn as_str(self) -> &'static str {
        match self {
            JobState::Running => "running",
            JobState::Finished => "finished",
            JobState::Cancelled => "cancelled",
        }
    }
}

/// What a job was started on.
pub struct JobSpec {
    pub study_id: i64,
    pub candidate_row: i64,
    pub study_revision: i64,
    pub started_by: String,
    pub study: Study,
    pub sweep: Sweep,
}

/// One sweep: its inputs, progress and rows (in grid order: row `i` is design `i`).
pub struct SweepJob {
    pub id: String,
    pub spec: JobSpec,
    pub total: usize,
    pub done: AtomicUsize,
    cancel: AtomicBool,
    finished: AtomicBool,
    seq: u64,
    rows: Mutex<Rows>,
}

impl SweepJob {
    pub fn base(&self) -> &Candidate {
        &self.spec.study.candidates[self.spec.sweep.candidate_index]
    }

    /// Names of the varied fields in axis order.
    pub fn fields(&self) -> Vec<&'static str> {
        self.spec
            .sweep
            .axes
            .iter()
            .map(|a| a.field.name())
            .collect()
    }

    pub fn state(&self) -> JobState {
        match (
            self.finished.load(Ordering::Acquire),
            self.cancel.load(Ordering::Acquire),
        ) {
            (false, _) => JobState::Running,
            (true, false) => JobState::Finished,
            (true, true) => JobState::Cancelled,
        }
    }

    /// Asks the running sweep to stop after the designs in flight.
    pub fn request_cancel(&self) {
        self.cancel.store(true, Ordering::Release);
    }

    /// Designs scored so far (all of them once finished).
    pub fn progress(&self) -> usize {
        self.done.load(Ordering::Relaxed).min(self.total)
    }

    fn lock(&self) -> MutexGuard<'_, Rows> {
        self.rows.lock().unwrap_or_else(|e| e.into_inner())
    }

    /// A copy of the rows emitted so far.
    pub fn rows(&self) -> Vec<SweepRow> {
        self.lock().rows.clone()
    }

    pub fn binding(&self, row: &SweepRow) -> String {
        self.lock()
            .bindings
            .get(row.binding as usize)
            .cloned()
            .unwrap_or_default()
    }

    fn push(&self, values: &[f64], r: &CandidateResult) {
        let mut rows = self.lock();
        let binding = rows.intern(r.binding_constraint.as_deref());
        let mut v = [0.0; 3];
        for (slot, x) in v.iter_mut().zip(values) {
            *slot = *x;
        }
        rows.rows.push(SweepRow {
            values: v,
            feasible: r.feasible,
            propulsion_mass_kg: r.propulsion_mass_kg,
            mission_energy_kwh: r.mission_energy_kwh,
            binding,
        });
    }

    fn run(&self) {
        let s = &self.spec;
        sweep::run(&s.study, &s.sweep, &self.done, &self.cancel, |_, v, r| {
            self.push(v, r)
        });
        self.finished.store(true, Ordering::Release);
    }
}

/// Every job of this server process, by id.
#[derive(Default)]
pub struct SweepJobs {
    map: Mutex<HashMap<String, Arc<SweepJob>>>,
    next: AtomicUsize,
}

impl SweepJobs {
    fn lock(&self) -> MutexGuard<'_, HashMap<String, Arc<SweepJob>>> {
        self.map.lock().unwrap_or_else(|e| e.into_inner())
    }

    pub fn get(&self, id: &str) -> Option<Arc<SweepJob>> {
        self.lock().get(id).cloned()
    }

    /// Jobs of one candidate row, newest first.
    pub fn of_candidate(&self, study_id: i64, row: i64) -> Vec<Arc<SweepJob>> {
        let mut jobs: Vec<_> = self
            .lock()
            .values()
            .filter(|j| j.spec.study_id == study_id && j.spec.candidate_row == row)
            .cloned()
            .collect();
        jobs.sort_by_key(|j| std::cmp::Reverse(j.seq));
        jobs
    }

    /// Registers the job and starts it in the background; refused (with the reason)
    /// when too many sweeps are running or every kept job is still running.
    pub fn start(&self, spec: JobSpec) -> Result<Arc<SweepJob>, String> {
        let mut map = self.lock();
        let running = map
            .values()
            .filter(|j| j.state() == JobState::Running)
            .count();
        if running >= MAX_RUNNING {
            return Err(format!(
                "{running} sweeps are running already (at most {MAX_RUNNING}); wait for one to finish or cancel it"
            ));
        }
        if map.len() >= MAX_JOBS {
            let oldest = map
                .values()
                .filter(|j| j.state() != JobState::Running)
                .min_by_key(|j| j.seq)
                .map(|j| j.id.clone());
            if let Some(id) = oldest {
                map.remove(&id);
            }
        }
        let job = Arc::new(SweepJob {
            id: crate::secrets::random_token(22),
            total: spec.sweep.len(),
            spec,
            done: AtomicUsize::new(0),
            cancel: AtomicBool::new(false),
            finished: AtomicBool::new(false),
            seq: self.next.fetch_add(1, Ordering::Relaxed) as u64,
            rows: Mutex::default(),
        });
        map.insert(job.id.clone(), job.clone());
        let worker = job.clone();
        tokio::task::spawn_blocking(move || worker.run());
        Ok(job)
    }
}

/// Indices of the feasible rows on the Pareto front of (propulsion mass, mission
/// energy), both minimised, ordered by mass. Equal points are all kept.
pub fn front(rows: &[SweepRow]) -> Vec<usize> {
    let mut order: Vec<usize> = (0..rows.len())
        .filter(|&i| {
            let r = &rows[i];
            r.feasible && r.propulsion_mass_kg.is_finite() && r.mission_energy_kwh.is_finite()
        })
        .collect();
    order.sort_by(|&a, &b| {
        let (ra, rb) = (&rows[a], &rows[b]);
        ra.propulsion_mass_kg
            .total_cmp(&rb.propulsion_mass_kg)
            .then(ra.mission_energy_kwh.total_cmp(&rb.mission_energy_kwh))
    });
    let mut out: Vec<usize> = Vec::new();
    let mut best = f64::INFINITY;
    for i in order {
        let r = &rows[i];
        let same_as_last = out.last().is_some_and(|&l| {
            rows[l].propulsion_mass_kg == r.propulsion_mass_kg
                && rows[l].mission_energy_kwh == r.mission_energy_kwh
        });
        if r.mission_energy_kwh < best || same_as_last {
            best = best.min(r.mission_energy_kwh);
            out.push(i);
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    fn row(m: f64, e: f64, feasible: bool) -> SweepRow {
        SweepRow {
            values: [0.0; 3],
            feasible,
            propulsion_mass_kg: m,
            mission_energy_kwh: e,
            binding: 0,
        }
    }

    #[test]
    fn the_front_keeps_feasible_rows_no_other_feasible_row_beats_in_both() {
        let rows = [
            row(3.0, 1.0, true),  // front: least energy
            row(1.0, 5.0, true),  // front: least mass
            row(2.0, 2.0, true),  // front
            row(2.5, 2.5, true),  // beaten by 2
            row(0.5, 0.5, false), // infeasible beats all, but does not count
            row(1.0, 6.0, true),  // same mass as 1, more energy: beaten
        ];
        assert_eq!(front(&rows), vec![1, 2, 0]);
    }
}
