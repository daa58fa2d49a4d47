//! Design sweeps of a sizing candidate: the form that chooses one to three fields to vary
//! (editors start, everyone sees the candidate's sweeps), and the start handler that
//! checks the grid with the engine and hands it to the background job registry.

mod job;
mod promote;

use crate::web::routes::Routes;
use askama::Template;
use axum::extract::{Form, Path, State};
use axum::http::StatusCode;
use axum::response::{IntoResponse, Redirect, Response};
use axum::routing::{get, post};

use super::common::load_study;
use crate::engine::ENGINE_VERSION;
use crate::engine::error::InputError;
use crate::engine::study::{Cooling, Study};
use crate::engine::sweep::{self, Axis, Field, Sweep};
use crate::storage::studies::{self, Item};
use crate::web::AppState;
use crate::web::auth::{CurrentUser, Editor, Viewer};
use crate::web::error::AppError;
use crate::web::html::{HtmlTemplate, Nav};
use crate::web::sweeps::{JobSpec, SweepJob};

pub fn router() -> Routes {
    Routes::new()
        .route(
            "/studies/{id}/candidates/{cid}/sweep",
            get(show_form).post(start_sweep),
        )
        .route("/sweeps/{job}", get(job::show_job))
        .route("/sweeps/{job}/events", get(job::job_events))
        .route("/sweeps/{job}/cancel", post(job::cancel_job))
        .route("/sweeps/{job}/rows.csv", get(job::rows_csv))
        .route("/sweeps/{job}/promote", post(promote::promote_design))
}

/// One row of the form: field, from, to, count (as typed).
#[derive(Clone, Default)]
pub struct AxisInput {
    pub field: String,
    pub from: String,
    pub to: String,
    pub count: String,
}

/// A past or running sweep listed on the form page.
pub struct JobLink {
    pub id: String,
    pub fields: String,
    pub total: usize,
    pub state: &'static str,
}

#[derive(Template)]
#[template(path = "sweep/form.html")]
struct FormPage {
    nav: Nav,
    study_id: i64,
    study_name: String,
    cid: i64,
    name: String,
    fields: Vec<&'static str>,
    coolings: Vec<&'static str>,
    axes: Vec<AxisInput>,
    error: Option<String>,
    jobs: Vec<JobLink>,
    engine_version: &'static str,
}

/// The study, the candidate's name and its engine index, for a sizing candidate row.
struct Target {
    study_name: String,
    revision: i64,
    study: Study,
    name: String,
}

async fn target(state: &AppState, id: i64, cid: i64) -> Result<Target, AppError> {
    let stored = studies::get_item(&state.db, Item::Candidate, id, cid).await?;
    let loaded = load_study(state, id).await?;
    let Some(study) = loaded.study else {
        let why = loaded.problem.unwrap_or_default();
        return Err(AppError::Conflict(format!("No sweep yet. {why}")));
    };
    let name = stored
        .json()?
        .get("name")
        .and_then(|v| v.as_str())
        .unwrap_or("")
        .to_string();
    Ok(Target {
        study_name: loaded.row.name,
        revision: loaded.row.revision,
        study,
        name,
    })
}

fn form_page(
    state: &AppState,
    user: &CurrentUser,
    (id, cid): (i64, i64),
    t: &Target,
    axes: Vec<AxisInput>,
    error: Option<String>,
) -> FormPage {
    let jobs = state
        .sweeps
        .of_candidate(id, cid)
        .iter()
        .map(|j| JobLink {
            id: j.id.clone(),
            fields: j.fields().join(" × "),
            total: j.total,
            state: j.state().as_str(),
        })
        .collect();
    FormPage {
        nav: Nav::of(user),
        study_id: id,
        study_name: t.study_name.clone(),
        cid,
        name: t.name.clone(),
        fields: Field::NAMES.to_vec(),
        coolings: Cooling::NAMES.to_vec(),
        axes,
        error,
        jobs,
        engine_version: ENGINE_VERSION,
    }
}

async fn show_form(
    State(state): State<AppState>,
    Viewer(user): Viewer,
    Path((id, cid)): Path<(i64, i64)>,
) -> Result<Response, AppError> {
    let t = target(&state, id, cid).await?;
    let axes = vec![AxisInput::default(); 3];
    Ok(HtmlTemplate(form_page(&state, &user, (id, cid), &t, axes, None)).into_response())
}

/// The form's rows `vary1`/`from1`/`to1`/`count1` … `vary3`… (blank rows skipped).
fn axis_inputs(pairs: &[(String, String)]) -> Vec<AxisInput> {
    let get = |k: String| {
        pairs
            .iter()
            .find(|(n, _)| *n == k)
            .map(|(_, v)| v.trim().to_string())
            .unwrap_or_default()
    };
    (1..=3)
        .map(|i| AxisInput {
            field: get(format!("vary{i}")),
            from: get(format!("from{i}")),
            to: get(format!("to{i}")),
            count: get(format!("count{i}")),
        })
        .collect()
}

/// The engine's axis of one form row. Cooling takes the classes from `from` to `to`
/// in their listed order; every other field is `FROM:TO:COUNT`.
fn parse_input(a: &AxisInput) -> Result<Axis, InputError> {
    if a.field != Field::Cooling.name() {
        return sweep::parse_axis(&format!("{}={}:{}:{}", a.field, a.from, a.to, a.count));
    }
    let at = |s: &str| Cooling::NAMES.iter().position(|n| *n == s);
    match (at(&a.from), at(&a.to)) {
        (Some(lo), Some(hi)) if lo <= hi => {
            sweep::parse_axis(&format!("cooling={}", Cooling::NAMES[lo..=hi].join(",")))
        }
        _ => Err(InputError::new(
            "vary.cooling",
            format!(
                "from and to must be cooling classes in this order: {} (got '{}' to '{}')",
                Cooling::NAMES.join(", "),
                a.from,
                a.to
            ),
        )),
    }
}

/// The validated sweep of the form, or the message naming the bad field.
fn sweep_of(study: &Study, name: &str, inputs: &[AxisInput]) -> Result<Sweep, String> {
    let axes = inputs
        .iter()
        .filter(|a| !a.field.is_empty())
        .map(parse_input)
        .collect::<Result<Vec<_>, _>>()
        .map_err(|e| e.to_string())?;
    Sweep::new(study, name, axes).map_err(|e| e.to_string())
}

async fn start_sweep(
    State(state): State<AppState>,
    Editor(user): Editor,
    Path((id, cid)): Path<(i64, i64)>,
    Form(pairs): Form<Vec<(String, String)>>,
) -> Result<Response, AppError> {
    let t = target(&state, id, cid).await?;
    let inputs = axis_inputs(&pairs);
    let started = sweep_of(&t.study, &t.name, &inputs).and_then(|sweep| {
        state.sweeps.start(JobSpec {
            study_id: id,
            candidate_row: cid,
            study_revision: t.revision,
            started_by: user.username.clone(),
            study: t.study.clone(),
            sweep,
        })
    });
    match started {
        Ok(job) => Ok(Redirect::to(&job_url(&job)).into_response()),
        Err(msg) => {
            let msg = format!("Nothing was started. {msg}");
            let page = form_page(&state, &user, (id, cid), &t, inputs, Some(msg));
            Ok((StatusCode::BAD_REQUEST, HtmlTemplate(page)).into_response())
        }
    }
}

pub fn job_url(job: &SweepJob) -> String {
    format!("/sweeps/{}", job.id)
}
