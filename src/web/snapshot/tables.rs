//! Tables of a snapshot: the candidate table, the side-by-side comparison with the best
//! value marked, one candidate's numbers, and one segment across all candidates.

use serde_json::Value;

use super::{KEY_METRICS, Snapshot, name_of, show};
use crate::engine::results::METRICS;

/// One row of the candidate table: the candidate's index, name and key numbers.
pub struct CandidateRow {
    pub index: usize,
    pub name: String,
    pub feasible: Option<bool>,
    pub cells: Vec<String>,
}

/// Column headers of `candidate_rows` after the name and verdict.
pub fn candidate_headers() -> Vec<&'static str> {
    KEY_METRICS[1..].iter().map(|(_, label)| *label).collect()
}

pub fn candidate_rows(snap: &Snapshot) -> Vec<CandidateRow> {
    snap.candidates()
        .iter()
        .enumerate()
        .map(|(index, c)| CandidateRow {
            index,
            name: name_of(c),
            feasible: c.get("feasible").and_then(Value::as_bool),
            cells: KEY_METRICS[1..]
                .iter()
                .map(|(k, _)| show(c.get(*k)))
                .collect(),
        })
        .collect()
}

/// Whether a lower (`Some(true)`) or higher (`Some(false)`) value of a metric is better.
fn lower_is_better(metric: &str) -> Option<bool> {
    let lower = metric.ends_with("_mass_kg")
        || (metric.ends_with("_energy_kwh") && metric != "energy_margin_kwh")
        || metric.ends_with("_temp_c")
        || metric == "rotor_inertia_kg_m2"
        || metric == "rank";
    let higher = metric.contains("efficiency")
        || metric.contains("margin")
        || metric.contains("specific_power")
        || metric == "torque_density_nm_per_kg"
        || metric == "trade_score";
    match (lower, higher) {
        (true, _) => Some(true),
        (false, true) => Some(false),
        _ => None,
    }
}

/// A metric across candidates; `best` marks the best value's columns (feasible only).
pub struct CompareRow {
    pub metric: &'static str,
    pub unit: &'static str,
    pub cells: Vec<String>,
    pub best: Vec<bool>,
}

pub fn compare_rows(snap: &Snapshot) -> Vec<CompareRow> {
    let cands = snap.candidates();
    let mut rows = vec![CompareRow {
        metric: "feasible",
        unit: "",
        cells: cands.iter().map(|c| show(c.get("feasible"))).collect(),
        best: vec![false; cands.len()],
    }];
    for (metric, unit) in METRICS {
        let values: Vec<Option<f64>> = cands
            .iter()
            .map(|c| c.get(metric).and_then(Value::as_f64))
            .collect();
        rows.push(CompareRow {
            metric,
            unit,
            cells: cands.iter().map(|c| show(c.get(metric))).collect(),
            best: best_marks(cands, &values, lower_is_better(metric)),
        });
    }
    rows
}

fn best_marks(cands: &[Value], values: &[Option<f64>], lower: Option<bool>) -> Vec<bool> {
    let Some(lower) = lower else {
        return vec![false; values.len()];
    };
    let feasible = |i: usize| cands[i].get("feasible").and_then(Value::as_bool) == Some(true);
    let pick = values
        .iter()
        .enumerate()
        .filter_map(|(i, v)| v.filter(|_| feasible(i)))
        .fold(None, |acc: Option<f64>, x| match acc {
            None => Some(x),
            Some(a) if (lower && x < a) || (!lower && x > a) => Some(x),
            keep => keep,
        });
    values
        .iter()
        .enumerate()
        .map(|(i, v)| feasible(i) && pick.is_some() && *v == pick)
        .collect()
}

/// One candidate at the snapshot: every scalar metric, its violations and assumptions.
pub struct CandidateDetail {
    pub name: String,
    pub feasible: Option<bool>,
    pub binding: String,
    pub metrics: Vec<(String, String)>,
    pub violations: Vec<String>,
    pub inputs: String,
}

pub fn candidate_detail(snap: &Snapshot, index: usize) -> Option<CandidateDetail> {
    let c = snap.candidates().get(index)?;
    let strings = |k: &str, field: &str| -> Vec<String> {
        c.get(k)
            .and_then(Value::as_array)
            .map(|a| a.iter().map(|v| show(v.get(field).or(Some(v)))).collect())
            .unwrap_or_default()
    };
    let input = snap
        .study
        .get("candidates")
        .and_then(|a| a.get(index))
        .map(|v| serde_json::to_string_pretty(v).unwrap_or_default())
        .unwrap_or_default();
    Some(CandidateDetail {
        name: name_of(c),
        feasible: c.get("feasible").and_then(Value::as_bool),
        binding: show(c.get("binding_constraint")),
        metrics: METRICS
            .iter()
            .map(|(k, unit)| (label(k, unit), show(c.get(*k))))
            .collect(),
        violations: strings("violations", "message"),
        inputs: input,
    })
}

fn label(metric: &str, unit: &str) -> String {
    if unit.is_empty() {
        metric.to_string()
    } else {
        format!("{metric} [{unit}]")
    }
}

/// Columns of the segment view: JSON key of a segment result row.
pub const SEGMENT_COLUMNS: [&str; 9] = [
    "duration_s",
    "shaft_power_kw_per_motor",
    "motor_speed_rpm",
    "motor_torque_nm",
    "motor_efficiency",
    "electric_power_kw",
    "battery_energy_kwh",
    "peak_winding_temp_c",
    "torque_capability_nm",
];

/// One mission segment across candidates: a row per candidate (name, then the columns).
pub fn segment_rows(snap: &Snapshot, index: usize) -> Vec<(String, Vec<String>)> {
    snap.candidates()
        .iter()
        .map(|c| {
            let row = c.get("segments").and_then(|s| s.get(index));
            let cells = SEGMENT_COLUMNS
                .iter()
                .map(|k| show(row.and_then(|r| r.get(*k))))
                .collect();
            (name_of(c), cells)
        })
        .collect()
}
