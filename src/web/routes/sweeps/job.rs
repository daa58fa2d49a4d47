//! One sweep job: its page (progress while it runs; the family scatter, the Pareto
//! front's table and promote once it stops), its progress as server-sent events,
//! cancel, and every row as CSV.

use std::convert::Infallible;
use std::sync::Arc;
use std::time::Duration;

use askama::Template;
use axum::extract::{Path, State};
use axum::http::header;
use axum::response::sse::{Event, KeepAlive, Sse};
use axum::response::{IntoResponse, Redirect, Response};
use futures_util::stream::{self, Stream};
use serde_json::json;

use super::job_url;
use crate::engine::ENGINE_VERSION;
use crate::plots::family::{self, Design};
use crate::storage::studies;
use crate::web::AppState;
use crate::web::auth::{Editor, Viewer};
use crate::web::error::AppError;
use crate::web::html::{HtmlTemplate, Nav};
use crate::web::sweeps::{JobState, SweepJob, SweepRow, front};

/// How often the progress stream looks at the job.
const TICK: Duration = Duration::from_millis(200);

pub fn find(state: &AppState, id: &str) -> Result<Arc<SweepJob>, AppError> {
    state.sweeps.get(id).ok_or_else(|| {
        AppError::NotFound(
            "no such sweep (sweeps are kept in memory until the server restarts)".into(),
        )
    })
}

/// One row of the front's table.
pub struct FrontRow {
    pub design: usize,
    pub values: Vec<String>,
    pub mass: String,
    pub energy: String,
    pub binding: String,
}

#[derive(Template)]
#[template(path = "sweep/job.html")]
struct JobPage {
    nav: Nav,
    job: String,
    study_id: i64,
    study_name: String,
    revision: i64,
    cid: i64,
    base: String,
    fields: Vec<&'static str>,
    total: usize,
    done: usize,
    percent: usize,
    state: &'static str,
    running: bool,
    emitted: usize,
    feasible: usize,
    drawn: usize,
    plot: String,
    front: Vec<FrontRow>,
    engine_version: &'static str,
}

fn percent(done: usize, total: usize) -> usize {
    (done * 100).checked_div(total).unwrap_or(100)
}

fn design(r: &SweepRow) -> Design {
    Design {
        mass_kg: r.propulsion_mass_kg,
        energy_kwh: r.mission_energy_kwh,
        feasible: r.feasible,
    }
}

fn front_rows(job: &SweepJob, rows: &[SweepRow], idx: &[usize]) -> Vec<FrontRow> {
    let axes = job.spec.sweep.axes.len();
    idx.iter()
        .map(|&i| {
            let r = &rows[i];
            FrontRow {
                design: i + 1,
                values: r.values[..axes].iter().map(|v| format!("{v:.4}")).collect(),
                mass: format!("{:.2}", r.propulsion_mass_kg),
                energy: format!("{:.3}", r.mission_energy_kwh),
                binding: job.binding(r),
            }
        })
        .collect()
}

/// Results part of the page: counts, the scatter and the front (empty while running).
fn fill_results(page: &mut JobPage, job: &SweepJob) {
    let rows = job.rows();
    let idx = front(&rows);
    let designs: Vec<Design> = rows.iter().map(design).collect();
    let front_designs: Vec<Design> = idx.iter().map(|&i| designs[i]).collect();
    page.emitted = rows.len();
    page.feasible = rows.iter().filter(|r| r.feasible).count();
    page.drawn = family::thinned(&designs).count();
    page.plot = family::plot(&designs, &front_designs)
        .unwrap_or_else(|e| format!("<p class=\"notice\">{e}</p>"));
    page.front = front_rows(job, &rows, &idx);
}

pub async fn show_job(
    State(state): State<AppState>,
    Viewer(user): Viewer,
    Path(id): Path<String>,
) -> Result<Response, AppError> {
    let job = find(&state, &id)?;
    let study = studies::get_study(&state.db, job.spec.study_id).await?;
    let st = job.state();
    let mut page = JobPage {
        nav: Nav::of(&user),
        job: job.id.clone(),
        study_id: job.spec.study_id,
        study_name: study.name,
        revision: study.revision,
        cid: job.spec.candidate_row,
        base: job.base().name.clone(),
        fields: job.fields(),
        total: job.total,
        done: job.progress(),
        percent: percent(job.progress(), job.total),
        state: st.as_str(),
        running: st == JobState::Running,
        emitted: 0,
        feasible: 0,
        drawn: 0,
        plot: String::new(),
        front: Vec::new(),
        engine_version: ENGINE_VERSION,
    };
    if !page.running {
        fill_results(&mut page, &job);
    }
    Ok(HtmlTemplate(page).into_response())
}

fn progress_event(job: &SweepJob) -> Event {
    let done = job.progress();
    let data = json!({ "done": done, "total": job.total, "percent": percent(done, job.total) });
    Event::default().event("progress").data(data.to_string())
}

/// Progress every tick while the job runs, a last progress event once it stops, then
/// `end` with how it stopped; the stream closes after that.
fn progress_stream(job: Arc<SweepJob>) -> impl Stream<Item = Result<Event, Infallible>> {
    stream::unfold((job, 0u8), |(job, step)| async move {
        match step {
            0 => Some((Ok(progress_event(&job)), (job, 1))),
            1 => {
                tokio::time::sleep(TICK).await;
                let next = if job.state() == JobState::Running {
                    1
                } else {
                    2
                };
                Some((Ok(progress_event(&job)), (job, next)))
            }
            2 => {
                let data = json!({ "state": job.state().as_str(), "url": job_url(&job) });
                let ev = Event::default().event("end").data(data.to_string());
                Some((Ok(ev), (job, 3)))
            }
            _ => None,
        }
    })
}

pub async fn job_events(
    State(state): State<AppState>,
    Viewer(_): Viewer,
    Path(id): Path<String>,
) -> Result<Response, AppError> {
    let job = find(&state, &id)?;
    let keep = KeepAlive::new().interval(Duration::from_secs(15));
    Ok(Sse::new(progress_stream(job))
        .keep_alive(keep)
        .into_response())
}

pub async fn cancel_job(
    State(state): State<AppState>,
    Editor(_): Editor,
    Path(id): Path<String>,
) -> Result<Response, AppError> {
    let job = find(&state, &id)?;
    job.request_cancel();
    Ok(Redirect::to(&job_url(&job)).into_response())
}

/// Every emitted row, in grid order: design number, the varied values, feasibility,
/// the two metrics and the binding constraint (numbers in full precision).
fn csv_text(job: &SweepJob) -> Result<String, csv::Error> {
    let mut w = csv::Writer::from_writer(Vec::new());
    let fields = job.fields();
    let mut head = vec!["design"];
    head.extend(&fields);
    head.extend([
        "feasible",
        "propulsion_mass_kg",
        "mission_energy_kwh",
        "binding_constraint",
    ]);
    w.write_record(&head)?;
    for (i, r) in job.rows().iter().enumerate() {
        let mut rec = vec![(i + 1).to_string()];
        rec.extend(r.values[..fields.len()].iter().map(|v| v.to_string()));
        rec.push(r.feasible.to_string());
        rec.push(r.propulsion_mass_kg.to_string());
        rec.push(r.mission_energy_kwh.to_string());
        rec.push(job.binding(r));
        w.write_record(&rec)?;
    }
    let bytes = w.into_inner().map_err(|e| e.into_error())?;
    Ok(String::from_utf8_lossy(&bytes).into_owned())
}

pub async fn rows_csv(
    State(state): State<AppState>,
    Viewer(_): Viewer,
    Path(id): Path<String>,
) -> Result<Response, AppError> {
    let job = find(&state, &id)?;
    if job.state() == JobState::Running {
        return Err(AppError::Conflict(
            "The sweep is still running; its rows are ready once it stops.".into(),
        ));
    }
    let text = csv_text(&job).map_err(|e| AppError::Internal(format!("sweep CSV: {e}")))?;
    let name = format!("attachment; filename=\"sweep-{}.csv\"", job.id);
    Ok((
        [
            (header::CONTENT_TYPE, "text/csv; charset=utf-8".to_string()),
            (header::CONTENT_DISPOSITION, name),
        ],
        text,
    )
        .into_response())
}
