//! A closer look at one candidate for plots: its final motor model and the step-by-step
//! trace of temperatures and operating points through the mission and the OEI runs.

use super::evaluate::{StudyContext, evaluate_full};
use super::fly::{Flight, Prepared, TracePoint};
use super::motor::MotorModel;
use super::results::CandidateResult;
use super::study::Study;

/// One candidate, scored, with what the plots need.
#[derive(Debug, Clone)]
pub struct Inspection {
    pub result: CandidateResult,
    pub model: MotorModel,
    pub gear_ratio: f64,
    /// One point per step: the nominal mission first, then each OEI run.
    pub trace: Vec<TracePoint>,
}

/// Scores candidate `candidate_index` of the study and traces its mission at the closed
/// takeoff mass (the study-level Pareto and trade score are not set here). `None` when the
/// index is out of range or the motor cannot be built.
pub fn inspect_candidate(study: &Study, candidate_index: usize) -> Option<Inspection> {
    let cand = study.candidates.get(candidate_index)?;
    let ctx = StudyContext::new(study);
    let (result, model, drive) = evaluate_full(&ctx, cand);
    let model = model?;
    let prep = Prepared::new(&model, drive, &ctx.grid);
    let mut flight = Flight::default();
    let mut trace = Vec::with_capacity(2 * ctx.grid.total_steps());
    let mass = if result.mass_closure_converged {
        result.takeoff_mass_kg
    } else {
        study.aircraft.max_takeoff_mass_kg
    };
    prep.fly(&ctx.grid, mass, &mut flight, Some(&mut trace));
    drop(prep);
    Some(Inspection {
        result,
        model,
        gear_ratio: drive.gear_ratio,
        trace,
    })
}
