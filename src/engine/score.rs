//! Scoring a whole study: every candidate (in parallel), then the study-level Pareto
//! front, trade score and rank.

use super::evaluate::{StudyContext, evaluate};
use super::objectives::DEFAULT_OBJECTIVES;
use super::results::{RESULTS_FORMAT, StudyResults};
use super::study::Study;
use super::{ENGINE_VERSION, pareto};
use rayon::prelude::*;

/// The study's objectives (default propulsion mass and mission energy).
pub fn objectives(study: &Study) -> Vec<String> {
    study
        .scoring
        .as_ref()
        .and_then(|s| s.objectives.clone())
        .unwrap_or_else(|| DEFAULT_OBJECTIVES.iter().map(|s| s.to_string()).collect())
}

/// Scores every candidate of a validated study.
pub fn score_study(study: &Study) -> StudyResults {
    let ctx = StudyContext::new(study);
    let mut candidates: Vec<_> = study
        .candidates
        .par_iter()
        .map(|c| evaluate(&ctx, c))
        .collect();
    let objectives = objectives(study);
    let weights = study.scoring.as_ref().and_then(|s| s.weights.as_ref());
    pareto::score(&mut candidates, &objectives, weights);
    StudyResults {
        format: RESULTS_FORMAT.to_string(),
        study: study.name.clone(),
        engine_version: ENGINE_VERSION.to_string(),
        objectives,
        candidates,
    }
}
