//! `summary.csv`: one row per candidate with its verdict, every scalar metric of the
//! result format in `METRICS` order, Pareto membership and the violation messages.

use std::io::Write;

use super::{as_object, field, writer};
use crate::engine::results::{METRICS, StudyResults};

/// Columns before the metrics.
const LEAD: [&str; 5] = ["name", "kind", "topology", "feasible", "binding_constraint"];
/// Columns after the metrics.
const TAIL: [&str; 2] = ["pareto_optimal", "violations"];

/// The header row of `summary.csv`.
pub fn summary_columns() -> Vec<&'static str> {
    LEAD.iter()
        .copied()
        .chain(METRICS.iter().map(|(name, _)| *name))
        .chain(TAIL)
        .collect()
}

/// Writes `summary.csv` for `results` to `out`.
pub fn write_summary_csv(results: &StudyResults, out: impl Write) -> csv::Result<()> {
    let mut w = writer(out);
    let columns = summary_columns();
    w.write_record(&columns)?;
    for c in &results.candidates {
        let obj = as_object(c)?;
        let mut row = Vec::with_capacity(columns.len());
        for key in &columns[..columns.len() - 1] {
            row.push(field(&obj, key)?);
        }
        let messages: Vec<&str> = c.violations.iter().map(|v| v.message.as_str()).collect();
        row.push(messages.join("; "));
        w.write_record(&row)?;
    }
    w.flush()?;
    Ok(())
}
