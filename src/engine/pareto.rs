//! Pareto front and min-max weighted trade score over the feasible candidates (§10).

use super::objectives::{self, Direction};
use super::results::CandidateResult;
use std::collections::BTreeMap;

/// Objective values of a candidate, each turned so that larger is better; `None` when the
/// candidate takes no part (infeasible, or a null objective).
fn oriented(c: &CandidateResult, objectives: &[String]) -> Option<Vec<f64>> {
    if !c.feasible {
        return None;
    }
    objectives
        .iter()
        .map(|o| {
            let v = c.metric(o)?;
            Some(match objectives::direction(o) {
                Some(Direction::Maximise) => v,
                _ => -v,
            })
        })
        .collect()
}

/// b dominates a: at least as good in every objective and better in one.
fn dominates(b: &[f64], a: &[f64]) -> bool {
    b.iter().zip(a).all(|(x, y)| x >= y) && b.iter().zip(a).any(|(x, y)| x > y)
}

/// Marks the front, computes scores and ranks in place.
pub fn score(
    cands: &mut [CandidateResult],
    objectives: &[String],
    weights: Option<&BTreeMap<String, f64>>,
) {
    let values: Vec<Option<Vec<f64>>> = cands.iter().map(|c| oriented(c, objectives)).collect();
    for (i, c) in cands.iter_mut().enumerate() {
        if c.feasible && values[i].is_none() {
            let missing: Vec<&str> = objectives
                .iter()
                .filter(|o| c.metric(o).is_none())
                .map(|s| s.as_str())
                .collect();
            c.assumptions.push(format!(
                "no trade score and not on the Pareto front: no value for {}",
                missing.join(", ")
            ));
        }
    }
    let part: Vec<usize> = (0..cands.len()).filter(|&i| values[i].is_some()).collect();
    for &i in &part {
        let vi = values[i].as_deref().unwrap_or(&[]);
        cands[i].pareto_optimal = !part
            .iter()
            .any(|&j| j != i && dominates(values[j].as_deref().unwrap_or(&[]), vi));
    }
    let total: f64 = objectives
        .iter()
        .map(|o| weights.and_then(|w| w.get(o)).copied().unwrap_or(1.0))
        .sum();
    for (k, o) in objectives.iter().enumerate() {
        let w = weights.and_then(|w| w.get(o)).copied().unwrap_or(1.0) / total;
        let col: Vec<f64> = part
            .iter()
            .map(|&i| values[i].as_ref().map_or(0.0, |v| v[k]))
            .collect();
        let lo = col.iter().copied().fold(f64::INFINITY, f64::min);
        let hi = col.iter().copied().fold(f64::NEG_INFINITY, f64::max);
        for (idx, &i) in part.iter().enumerate() {
            let norm = if hi > lo {
                (col[idx] - lo) / (hi - lo)
            } else {
                1.0
            };
            *cands[i].trade_score.get_or_insert(0.0) += w * norm;
        }
    }
    let mut order = part.clone();
    order.sort_by(|&a, &b| {
        let (sa, sb) = (
            cands[a].trade_score.unwrap_or(0.0),
            cands[b].trade_score.unwrap_or(0.0),
        );
        sb.total_cmp(&sa).then(
            cands[a]
                .mission_energy_kwh
                .total_cmp(&cands[b].mission_energy_kwh),
        )
    });
    for (r, &i) in order.iter().enumerate() {
        cands[i].rank = Some(r + 1);
    }
}
