//! The robustness figures as CSV: one row per candidate.

use std::io::Write;

use crate::engine::robust::Robustness;

/// `candidate, nominal_feasible, p_feasible, p_pareto, p_best, samples, seed`.
pub fn write_robustness_csv(r: &Robustness, seed: u64, out: impl Write) -> csv::Result<()> {
    let mut w = super::writer(out);
    w.write_record([
        "candidate",
        "nominal_feasible",
        "p_feasible",
        "p_pareto",
        "p_best",
        "samples",
        "seed",
    ])?;
    for c in &r.candidates {
        w.write_record([
            c.name.clone(),
            c.nominal_feasible.to_string(),
            c.p_feasible.to_string(),
            c.p_pareto.to_string(),
            c.p_best.to_string(),
            r.samples.to_string(),
            seed.to_string(),
        ])?;
    }
    w.flush()?;
    Ok(())
}
