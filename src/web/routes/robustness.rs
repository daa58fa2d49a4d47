//! Ranking robustness of a study: N seeded samples of the key assumptions (the engine's
//! default uncertainty ranges), per candidate P(feasible), P(on the Pareto front) and
//! P(best trade score), as a page with a bar chart and a table, and as CSV. The same
//! seed always gives the same figures.

use crate::web::routes::Routes;
use askama::Template;
use axum::extract::{Path, Query, State};
use axum::http::header;
use axum::response::{IntoResponse, Response};
use axum::routing::get;
use rand::rngs::StdRng;
use rand::{RngExt, SeedableRng};
use serde::Deserialize;

use super::common::scored_study;
use crate::engine::ENGINE_VERSION;
use crate::engine::robust::{self, Robustness, Uncertainty};
use crate::engine::study::Study;
use crate::plots::robustness::{self as chart, Bars};
use crate::web::AppState;
use crate::web::auth::Viewer;
use crate::web::error::AppError;
use crate::web::html::{HtmlTemplate, Nav};

/// Most samples one request may ask for.
pub const MAX_SAMPLES: usize = 5000;
const DEFAULT_SAMPLES: usize = 200;
const DEFAULT_SEED: u64 = 1;

pub fn router() -> Routes {
    Routes::new()
        .route("/studies/{id}/robustness", get(show_robustness))
        .route("/studies/{id}/robustness.csv", get(robustness_csv))
}

#[derive(Deserialize)]
struct RawQuery {
    samples: Option<String>,
    seed: Option<String>,
}

/// A query value, trimmed; blank counts as not given.
fn given(v: &Option<String>) -> Option<&str> {
    v.as_deref().map(str::trim).filter(|s| !s.is_empty())
}

/// Checked samples and seed (blank means the default).
struct Run {
    samples: usize,
    seed: u64,
}

impl TryFrom<RawQuery> for Run {
    type Error = AppError;
    fn try_from(q: RawQuery) -> Result<Self, AppError> {
        let samples = match given(&q.samples) {
            None => DEFAULT_SAMPLES,
            Some(s) => match s.parse::<usize>() {
                Ok(n) if (1..=MAX_SAMPLES).contains(&n) => n,
                _ => {
                    return Err(AppError::BadRequest(format!(
                        "samples: must be a whole number from 1 to {MAX_SAMPLES} (got '{s}')"
                    )));
                }
            },
        };
        let seed = match given(&q.seed) {
            None => DEFAULT_SEED,
            Some(s) => s.parse::<u64>().map_err(|_| {
                AppError::BadRequest(format!(
                    "seed: must be a whole number from 0 to {} (got '{s}')",
                    u64::MAX
                ))
            })?,
        };
        Ok(Run { samples, seed })
    }
}

/// Runs the engine's robustness off the reactor with a generator seeded by `run.seed`.
async fn compute(study: &Study, run: &Run) -> Result<Robustness, AppError> {
    let (study, samples, seed) = (study.clone(), run.samples, run.seed);
    tokio::task::spawn_blocking(move || {
        let mut rng = StdRng::seed_from_u64(seed);
        let mut uniform = move || rng.random::<f64>();
        robust::run(&study, &Uncertainty::default(), samples, &mut uniform)
    })
    .await
    .map_err(|e| AppError::Internal(format!("robustness task failed: {e}")))
}

async fn robustness_of(
    state: &AppState,
    id: i64,
    q: RawQuery,
) -> Result<(String, Run, Robustness), AppError> {
    let run = Run::try_from(q)?;
    let (loaded, _) = scored_study(state, id).await?;
    let Some(study) = &loaded.study else {
        return Err(AppError::Conflict("No results yet.".into()));
    };
    let result = compute(study, &run).await?;
    Ok((loaded.row.name, run, result))
}

pub struct Row {
    pub number: usize,
    pub name: String,
    pub nominal_feasible: bool,
    pub p: [String; 3],
}

#[derive(Template)]
#[template(path = "study/robustness.html")]
struct RobustnessPage {
    nav: Nav,
    id: i64,
    name: String,
    samples: usize,
    seed: u64,
    max_samples: usize,
    ranges: Vec<(&'static str, String)>,
    plot: String,
    rows: Vec<Row>,
    engine_version: &'static str,
}

fn range_text((lo, hi): (f64, f64)) -> String {
    let pct = |m: f64| format!("{:+.0} %", (m - 1.0) * 100.0);
    format!("× {lo} to × {hi} ({} to {})", pct(lo), pct(hi))
}

fn ranges(u: &Uncertainty) -> Vec<(&'static str, String)> {
    vec![
        (
            "Battery specific energy",
            range_text(u.battery_specific_energy),
        ),
        ("Zero-lift drag coefficient C_D0", range_text(u.cd0)),
        (
            "Propeller efficiency (capped at 1)",
            range_text(u.prop_efficiency),
        ),
        ("Motor mass, per candidate", range_text(u.motor_mass)),
        ("Motor losses, per candidate", range_text(u.motor_losses)),
    ]
}

fn pct(p: f64) -> String {
    format!("{:.1} %", p * 100.0)
}

async fn show_robustness(
    State(state): State<AppState>,
    Viewer(user): Viewer,
    Path(id): Path<i64>,
    Query(q): Query<RawQuery>,
) -> Result<Response, AppError> {
    let (name, run, r) = robustness_of(&state, id, q).await?;
    let bars: Vec<Bars> = r
        .candidates
        .iter()
        .map(|c| Bars {
            feasible: c.p_feasible,
            pareto: c.p_pareto,
            best: c.p_best,
        })
        .collect();
    let rows = r
        .candidates
        .iter()
        .enumerate()
        .map(|(i, c)| Row {
            number: i + 1,
            name: c.name.clone(),
            nominal_feasible: c.nominal_feasible,
            p: [pct(c.p_feasible), pct(c.p_pareto), pct(c.p_best)],
        })
        .collect();
    let page = RobustnessPage {
        nav: Nav::of(&user),
        id,
        name,
        samples: run.samples,
        seed: run.seed,
        max_samples: MAX_SAMPLES,
        ranges: ranges(&r.uncertainty),
        plot: chart::plot(&bars).unwrap_or_else(|e| format!("<p class=\"notice\">{e}</p>")),
        rows,
        engine_version: ENGINE_VERSION,
    };
    Ok(HtmlTemplate(page).into_response())
}

fn csv_text(run: &Run, r: &Robustness) -> Result<String, csv::Error> {
    let mut bytes = Vec::new();
    crate::export::write_robustness_csv(r, run.seed, &mut bytes)?;
    Ok(String::from_utf8_lossy(&bytes).into_owned())
}

async fn robustness_csv(
    State(state): State<AppState>,
    Viewer(_): Viewer,
    Path(id): Path<i64>,
    Query(q): Query<RawQuery>,
) -> Result<Response, AppError> {
    let (_, run, r) = robustness_of(&state, id, q).await?;
    let text = csv_text(&run, &r).map_err(|e| AppError::Internal(format!("CSV: {e}")))?;
    let name = format!(
        "attachment; filename=\"robustness-{id}-seed{}.csv\"",
        run.seed
    );
    Ok((
        [
            (header::CONTENT_TYPE, "text/csv; charset=utf-8".to_string()),
            (header::CONTENT_DISPOSITION, name),
        ],
        text,
    )
        .into_response())
}
