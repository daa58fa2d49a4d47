//! Sizing candidates: geometry mode scores the given size; size-to-mission finds the
//! smallest scale at which the checks that size eases pass (engine.md §9).

use super::assume::Assumptions;
use super::checks::{self, Outcome};
use super::evaluate::{Evaluator, Run, Scalable};
use super::motor::MotorModel;
use super::report;
use super::results::CandidateResult;
use super::study::Candidate;

const GROWTH: f64 = 1.25;
const REL_TOL: f64 = 1e-6;
const MAX_BRACKET_STEPS: usize = 80;

/// One scale tried.
struct Trial {
    scale: f64,
    built: Option<(MotorModel, Run)>,
    /// Failed first-group outcome with the worst relative margin, if any.
    worst_eased: Option<Outcome>,
    diverged: bool,
}

impl Trial {
    fn passes(&self) -> bool {
        self.built.is_some() && self.worst_eased.is_none()
    }
}

fn trial(ev: &Evaluator, sc: &Scalable, scale: f64) -> Trial {
    match sc.build(scale) {
        Err(msg) => Trial {
            scale,
            built: None,
            worst_eased: Some(checks::geometry_outcome(msg)),
            diverged: false,
        },
        Ok(model) => {
            let run = ev.run(&model);
            let worst = run
                .outcomes
                .iter()
                .filter(|o| checks::eased_by_size(o.name()) && o.failed())
                .min_by(|a, b| a.relative_margin().total_cmp(&b.relative_margin()))
                .cloned();
            let diverged = !run.closure.converged;
            Trial {
                scale,
                built: Some((model, run)),
                worst_eased: worst,
                diverged,
            }
        }
    }
}

/// Scores a sizing candidate: at its fixed scale (geometry mode) or sized to the mission.
pub fn evaluate_sized(
    ev: &Evaluator,
    cand: &Candidate,
    sc: &Scalable,
    fixed: Option<f64>,
    mut a: Assumptions,
) -> (CandidateResult, Option<MotorModel>) {
    let ctx = ev.ctx;
    if let Some(scale) = fixed {
        return match sc.build(scale) {
            Ok(model) => {
                let run = ev.run(&model);
                let r = report::assemble(ctx, cand, &model, &run, None, a);
                (r, Some(model))
            }
            Err(msg) => (report::unbuildable(ctx, cand, msg, a), None),
        };
    }
    let guess = sc.scale_for_torque(first_guess_torque(ev, sc));
    let (lo, hi) = bracket(ev, sc, guess);
    let Some(mut hi) = hi else {
        a.note("no scale passed the torque and temperature checks before the mass closure diverged: figures at the largest scale tried");
        return finish(ev, cand, lo, None, a);
    };
    let mut lo = lo;
    while hi.scale - lo.scale > REL_TOL * hi.scale {
        let t = trial(ev, sc, 0.5 * (lo.scale + hi.scale));
        if t.passes() { hi = t } else { lo = t }
    }
    for factor in [1.05, 1.25] {
        let t = trial(ev, sc, factor * hi.scale);
        if !t.passes() {
            a.note_with(|| format!(
                "non-monotone: the torque/temperature checks fail again at {factor} × the sized scale ({})",
                t.worst_eased.as_ref().map(|o| o.label(&ctx.grid)).unwrap_or_default()
            ));
        }
    }
    let label = lo.worst_eased.as_ref().map(|o| o.label(&ctx.grid));
    finish(ev, cand, hi, label, a)
}

fn finish(
    ev: &Evaluator,
    cand: &Candidate,
    t: Trial,
    binding: Option<String>,
    a: Assumptions,
) -> (CandidateResult, Option<MotorModel>) {
    match t.built {
        Some((model, run)) => {
            let r = report::assemble(ev.ctx, cand, &model, &run, binding, a);
            (r, Some(model))
        }
        None => (
            report::unbuildable(
                ev.ctx,
                cand,
                t.worst_eased
                    .and_then(|o| o.message)
                    .unwrap_or_else(|| "the motor cannot be built".into()),
                a,
            ),
            None,
        ),
    }
}

/// (failing trial below, passing trial above); `None` above when growth stopped at a
/// diverging mass closure.
fn bracket(ev: &Evaluator, sc: &Scalable, guess: f64) -> (Trial, Option<Trial>) {
    let first = trial(ev, sc, guess);
    if first.passes() {
        let mut hi = first;
        for _ in 0..MAX_BRACKET_STEPS {
            let t = trial(ev, sc, hi.scale / GROWTH);
            if !t.passes() {
                return (t, Some(hi));
            }
            hi = t;
        }
        let lo = trial(ev, sc, hi.scale / GROWTH);
        return (lo, Some(hi));
    }
    let mut lo = first;
    for _ in 0..MAX_BRACKET_STEPS {
        if lo.diverged {
            return (lo, None);
        }
        let t = trial(ev, sc, lo.scale * GROWTH);
        if t.passes() {
            return (lo, Some(t));
        }
        lo = t;
    }
    (lo, None)
}

/// max(highest nominal torque, highest OEI torque / k_ol) at the maximum takeoff mass,
/// without losses: the closed-form first guess of §9.
fn first_guess_torque(ev: &Evaluator, sc: &Scalable) -> f64 {
    let grid = &ev.ctx.grid;
    let m = ev.aircraft.mtom_kg;
    let n = grid.motor_count as f64;
    let mut nominal: f64 = 0.0;
    let mut oei: f64 = 0.0;
    for g in &grid.segments {
        let omega = g.prop_omega * ev.drive.gear_ratio;
        for s in &g.steps {
            nominal = nominal.max(g.power(s, m, false).0 / (n * ev.drive.gear_efficiency * omega));
            if g.oei && n >= 2.0 {
                oei =
                    oei.max(g.power(s, m, true).0 / ((n - 1.0) * ev.drive.gear_efficiency * omega));
            }
        }
    }
    nominal.max(oei / sc.params.overload_factor).max(1e-3)
}
