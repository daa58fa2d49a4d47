//! What changed between two snapshots: inputs by JSON path (rows of `segments` and
//! `candidates` matched by name), candidates added and removed, and result metrics per
//! candidate with their deltas. Unchanged fields are not listed.

use serde::Serialize;
use serde_json::{Map, Value};

use super::{Snapshot, name_of};
use crate::engine::results::METRICS;

/// Relative difference below which two result numbers count as equal (float noise).
const SAME_REL: f64 = 1e-9;

#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct InputChange {
    pub path: String,
    pub old: Value,
    pub new: Value,
}

#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct ResultChange {
    pub candidate: String,
    pub metric: String,
    pub old: Value,
    pub new: Value,
    /// `new - old` for numbers; null when either side is not a number.
    pub delta: Option<f64>,
}

#[derive(Debug, Clone, PartialEq, Serialize, Default)]
pub struct SnapshotDiff {
    pub inputs: Vec<InputChange>,
    pub added: Vec<String>,
    pub removed: Vec<String>,
    pub results: Vec<ResultChange>,
}

/// Differences from `old` to `new`.
pub fn diff(old: &Snapshot, new: &Snapshot) -> SnapshotDiff {
    let mut d = SnapshotDiff::default();
    walk("", &old.study, &new.study, &mut d.inputs);
    let old_names = old.candidate_names();
    let new_names = new.candidate_names();
    d.added = new_names
        .iter()
        .filter(|n| !old_names.contains(n))
        .cloned()
        .collect();
    d.removed = old_names
        .iter()
        .filter(|n| !new_names.contains(n))
        .cloned()
        .collect();
    for c in old.candidates() {
        let name = name_of(c);
        if let Some(n) = new.candidates().iter().find(|n| name_of(n) == name) {
            result_changes(&name, c, n, &mut d.results);
        }
    }
    d
}

fn join(prefix: &str, key: &str) -> String {
    if prefix.is_empty() {
        key.to_string()
    } else {
        format!("{prefix}.{key}")
    }
}

fn walk(path: &str, a: &Value, b: &Value, out: &mut Vec<InputChange>) {
    match (a, b) {
        (Value::Object(x), Value::Object(y)) => walk_objects(path, x, y, out),
        (Value::Array(x), Value::Array(y)) if path == "segments" || path == "candidates" => {
            walk_named(path, x, y, out)
        }
        (Value::Array(x), Value::Array(y)) if x.len() == y.len() => {
            for (i, (p, q)) in x.iter().zip(y).enumerate() {
                walk(&format!("{path}[{i}]"), p, q, out);
            }
        }
        _ if a != b => out.push(InputChange {
            path: path.to_string(),
            old: a.clone(),
            new: b.clone(),
        }),
        _ => {}
    }
}

fn walk_objects(
    path: &str,
    x: &Map<String, Value>,
    y: &Map<String, Value>,
    out: &mut Vec<InputChange>,
) {
    let mut keys: Vec<&String> = x.keys().chain(y.keys()).collect();
    keys.sort();
    keys.dedup();
    for k in keys {
        let (p, q) = (
            x.get(k).unwrap_or(&Value::Null),
            y.get(k).unwrap_or(&Value::Null),
        );
        walk(&join(path, k), p, q, out);
    }
}

/// Rows matched by name; a row only on one side is listed whole at `list["name"]`
/// (except candidates, which the diff lists as added or removed).
fn walk_named(list: &str, x: &[Value], y: &[Value], out: &mut Vec<InputChange>) {
    let path_of = |name: &str| format!("{list}[{}]", Value::from(name));
    for a in x {
        let name = name_of(a);
        match y.iter().find(|b| name_of(b) == name) {
            Some(b) => walk(&path_of(&name), a, b, out),
            None if list == "segments" => out.push(InputChange {
                path: path_of(&name),
                old: a.clone(),
                new: Value::Null,
            }),
            None => {}
        }
    }
    if list == "segments" {
        for b in y
            .iter()
            .filter(|b| !x.iter().any(|a| name_of(a) == name_of(b)))
        {
            out.push(InputChange {
                path: path_of(&name_of(b)),
                old: Value::Null,
                new: b.clone(),
            });
        }
    }
}

fn same_number(a: f64, b: f64) -> bool {
    (a - b).abs() <= SAME_REL * a.abs().max(b.abs()).max(1.0)
}

fn result_changes(name: &str, a: &Value, b: &Value, out: &mut Vec<ResultChange>) {
    let keys = ["feasible", "binding_constraint", "pareto_optimal"]
        .into_iter()
        .chain(METRICS.iter().map(|(k, _)| *k));
    for metric in keys {
        let (p, q) = (
            a.get(metric).unwrap_or(&Value::Null),
            b.get(metric).unwrap_or(&Value::Null),
        );
        let delta = match (p.as_f64(), q.as_f64()) {
            (Some(x), Some(y)) if same_number(x, y) => continue,
            (Some(x), Some(y)) => Some(y - x),
            _ if p == q => continue,
            _ => None,
        };
        out.push(ResultChange {
            candidate: name.to_string(),
            metric: metric.to_string(),
            old: p.clone(),
            new: q.clone(),
            delta,
        });
    }
}
