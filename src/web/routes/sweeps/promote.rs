//! Promote: one design of a finished sweep becomes a candidate of its study (named
//! "<base> sweep #i"), stored like any new candidate row: the whole study is validated
//! first and the write carries the study revision the page showed, so a stale page
//! changes nothing.

use axum::extract::{Form, Path, State};
use axum::response::{IntoResponse, Redirect, Response};
use serde_json::Value;

use super::job::find;
use crate::engine::study::{Candidate, Study, parse_candidate};
use crate::storage::studies::{self, Item};
use crate::web::AppState;
use crate::web::auth::Editor;
use crate::web::error::AppError;
use crate::web::routes::common::{form_revision, load_study};
use crate::web::sweeps::SweepJob;
use crate::web::validate::validate_doc;

/// The 1-based design number of the form, checked against the rows the job holds.
fn design_number(pairs: &[(String, String)], emitted: usize) -> Result<usize, AppError> {
    let raw = pairs
        .iter()
        .find(|(k, _)| k == "design")
        .map(|(_, v)| v.trim())
        .unwrap_or("");
    match raw.parse::<usize>() {
        Ok(n) if (1..=emitted).contains(&n) => Ok(n),
        _ => Err(AppError::BadRequest(format!(
            "Nothing was saved. design: must be a whole number from 1 to {emitted} (got '{raw}')"
        ))),
    }
}

/// The study without its candidate list, for "has anything but the candidates changed".
fn frame(study: &Study) -> Study {
    let mut s = study.clone();
    s.candidates.clear();
    s
}

/// The promoted results equal the sweep's row only when the study around the design is
/// still the one the sweep ran on (other candidates do not move a candidate's results).
fn check_unchanged(job: &SweepJob, now: &Study) -> Result<(), AppError> {
    let base = job.base();
    let same_base = now.candidates.iter().any(|c| c == base);
    if same_base && frame(now) == frame(&job.spec.study) {
        Ok(())
    } else {
        Err(AppError::Conflict(
            "Nothing was saved: the study or the swept candidate changed since this sweep \
             ran, so its rows no longer hold; run the sweep again."
                .into(),
        ))
    }
}

/// Design `n` as a candidate body in the study file format, checked to read back as
/// the very same candidate.
fn design_body(job: &SweepJob, n: usize) -> Result<Value, AppError> {
    let mut cand: Candidate = job
        .spec
        .sweep
        .design(job.base(), n - 1)
        .map_err(|e| AppError::BadRequest(format!("Nothing was saved. design #{n}: {e}")))?;
    cand.name = format!("{} sweep #{n}", job.base().name);
    let body = serde_json::to_value(&cand)
        .map_err(|e| AppError::Internal(format!("design not serialisable: {e}")))?;
    match parse_candidate(&body, "candidate") {
        Ok(back) if back == cand => Ok(body),
        _ => Err(AppError::Internal(format!(
            "design #{n} does not read back as the same candidate"
        ))),
    }
}

pub async fn promote_design(
    State(state): State<AppState>,
    Editor(user): Editor,
    Path(id): Path<String>,
    Form(pairs): Form<Vec<(String, String)>>,
) -> Result<Response, AppError> {
    let job = find(&state, &id)?;
    let n = design_number(&pairs, job.rows().len())?;
    let revision = form_revision(&pairs)?;
    let study_id = job.spec.study_id;
    let loaded = load_study(&state, study_id).await?;
    let Some(now) = &loaded.study else {
        return Err(AppError::Conflict(format!(
            "Nothing was saved. {}",
            loaded.problem.clone().unwrap_or_default()
        )));
    };
    check_unchanged(&job, now)?;
    let body = design_body(&job, n)?;
    let mut doc = loaded.doc.clone();
    doc.candidates.push(body.clone());
    validate_doc(&doc).map_err(|e| AppError::BadRequest(format!("Nothing was saved. {e}")))?;
    studies::append_items(
        &state.db,
        Item::Candidate,
        study_id,
        revision,
        std::slice::from_ref(&body),
        &user.username,
    )
    .await?;
    let rows = studies::list_items(&state.db, Item::Candidate, study_id).await?;
    let row = rows
        .iter()
        .rev()
        .find(|r| r.json().ok().and_then(|v| v.get("name").cloned()) == body.get("name").cloned())
        .ok_or_else(|| AppError::Internal("promoted row not found".into()))?;
    Ok(Redirect::to(&format!("/studies/{study_id}/candidates/{}", row.id)).into_response())
}
