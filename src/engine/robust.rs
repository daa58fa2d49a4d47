//! Ranking robustness: how often each candidate stays feasible, on the Pareto front and
//! best by trade score when the key assumptions move within their ranges. Pure: the
//! caller passes the uniform random source (seeded, so runs are reproducible).

use super::error::InputError;
use super::evaluate::{StudyContext, evaluate_frozen, evaluate_full};
use super::motor::MotorModel;
use super::results::CandidateResult;
use super::score::objectives;
use super::study::{PowerRule, Study};
use super::{pareto, reader::fmt_num};
use rayon::prelude::*;
use serde::Serialize;

/// Uniform ranges, as multipliers on the study's values.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Uncertainty {
    pub battery_specific_energy: (f64, f64),
    pub cd0: (f64, f64),
    pub prop_efficiency: (f64, f64),
    /// Per candidate, drawn independently.
    pub motor_mass: (f64, f64),
    pub motor_losses: (f64, f64),
}

impl Default for Uncertainty {
    /// Preliminary-design spreads (common practice, no source): pack specific energy ±10 %,
    /// C_D0 −10/+15 %, propeller efficiency −5/+2 % (capped at 1), motor mass −5/+10 %,
    /// motor losses −10/+20 %.
    fn default() -> Self {
        Uncertainty {
            battery_specific_energy: (0.90, 1.10),
            cd0: (0.90, 1.15),
            prop_efficiency: (0.95, 1.02),
            motor_mass: (0.95, 1.10),
            motor_losses: (0.90, 1.20),
        }
    }
}

impl Uncertainty {
    pub fn check(&self) -> Result<(), InputError> {
        for (name, (lo, hi)) in [
            ("battery_specific_energy", self.battery_specific_energy),
            ("cd0", self.cd0),
            ("prop_efficiency", self.prop_efficiency),
            ("motor_mass", self.motor_mass),
            ("motor_losses", self.motor_losses),
        ] {
            if !(lo.is_finite() && hi.is_finite() && lo > 0.0 && lo <= hi && hi <= 10.0) {
                return Err(InputError::new(
                    format!("uncertainty.{name}"),
                    format!(
                        "must be multipliers with 0 < low ≤ high ≤ 10 (got {}..{})",
                        fmt_num(lo),
                        fmt_num(hi)
                    ),
                ));
            }
        }
        Ok(())
    }
}

/// One candidate's robustness figures.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct RobustRow {
    pub name: String,
    pub nominal_feasible: bool,
    pub p_feasible: f64,
    pub p_pareto: f64,
    pub p_best: f64,
}

#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Robustness {
    pub samples: usize,
    pub uncertainty: Uncertainty,
    pub candidates: Vec<RobustRow>,
}

fn draw(u: &mut dyn FnMut() -> f64, (lo, hi): (f64, f64)) -> f64 {
    lo + (hi - lo) * u()
}

fn perturbed(study: &Study, e: f64, cd0: f64, eta: f64) -> Study {
    let mut s = study.clone();
    s.aircraft.battery.specific_energy_wh_per_kg *= e;
    if let Some(c) = s.aircraft.cd0.as_mut() {
        *c *= cd0;
    }
    for seg in &mut s.segments {
        if let PowerRule::Steady {
            prop_efficiency, ..
        } = &mut seg.power
        {
            *prop_efficiency = (*prop_efficiency * eta).min(1.0);
        }
    }
    s
}

/// Runs `samples` draws. Designs are frozen at their nominal size (a sized motor is the
/// motor the team would buy); a candidate that cannot be built counts as never feasible.
pub fn run(
    study: &Study,
    unc: &Uncertainty,
    samples: usize,
    uniform: &mut dyn FnMut() -> f64,
) -> Robustness {
    let ctx = StudyContext::new(study);
    let nominal: Vec<(CandidateResult, Option<MotorModel>)> = study
        .candidates
        .par_iter()
        .map(|c| {
            let (r, m, _) = evaluate_full(&ctx, c);
            (r, m)
        })
        .collect();
    let objectives = objectives(study);
    let weights = study.scoring.as_ref().and_then(|s| s.weights.as_ref());
    let n = study.candidates.len();
    let mut counts = vec![[0usize; 3]; n];
    for _ in 0..samples {
        let s = perturbed(
            study,
            draw(uniform, unc.battery_specific_energy),
            draw(uniform, unc.cd0),
            draw(uniform, unc.prop_efficiency),
        );
        let scales: Vec<(f64, f64)> = (0..n)
            .map(|_| {
                (
                    draw(uniform, unc.motor_mass),
                    draw(uniform, unc.motor_losses),
                )
            })
            .collect();
        let sctx = StudyContext::new(&s);
        let mut results: Vec<CandidateResult> = nominal
            .par_iter()
            .zip(&s.candidates)
            .zip(&scales)
            .map(|(((r, m), cand), (fm, fl))| match m {
                Some(model) => {
                    let mut model = model.clone();
                    model.mass_kg *= fm;
                    evaluate_frozen(&sctx, cand, &model, *fl)
                }
                None => r.clone(),
            })
            .collect();
        pareto::score(&mut results, &objectives, weights);
        for (k, r) in results.iter().enumerate() {
            counts[k][0] += r.feasible as usize;
            counts[k][1] += r.pareto_optimal as usize;
            counts[k][2] += (r.rank == Some(1)) as usize;
        }
    }
    let p = |c: usize| {
        if samples == 0 {
            0.0
        } else {
            c as f64 / samples as f64
        }
    };
    Robustness {
        samples,
        uncertainty: *unc,
        candidates: nominal
            .iter()
            .zip(&counts)
            .map(|((r, _), c)| RobustRow {
                name: r.name.clone(),
                nominal_feasible: r.feasible,
                p_feasible: p(c[0]),
                p_pareto: p(c[1]),
                p_best: p(c[2]),
            })
            .collect(),
    }
}
