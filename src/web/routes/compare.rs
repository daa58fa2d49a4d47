//! The compare page: 2–6 candidates side by side, every result metric in a row with its
//! unit, the best value marked (by the metric's direction, among feasible candidates)
//! and each value's difference from a chosen baseline candidate.

use crate::web::routes::Routes;
use askama::Template;
use axum::extract::{Path, RawQuery, State};
use axum::response::{IntoResponse, Response};
use axum::routing::get;

use super::common::scored_study;
use crate::engine::ENGINE_VERSION;
use crate::engine::objectives::{Direction, direction};
use crate::engine::results::{CandidateResult, METRICS};
use crate::storage::studies::{self, Item};
use crate::web::AppState;
use crate::web::auth::Viewer;
use crate::web::error::AppError;
use crate::web::html::{HtmlTemplate, Nav};
use crate::web::plots::{Figure, compare_figure};

pub fn router() -> Routes {
    Routes::new().route("/studies/{id}/compare", get(show_compare))
}

/// One candidate of the study, for the selection form and the column heads.
pub struct Choice {
    pub id: i64,
    pub name: String,
    pub chosen: bool,
    pub base: bool,
}

/// One cell of the metric table.
pub struct Cell {
    pub text: String,
    pub delta: String,
    pub best: bool,
}

pub struct MetricRow {
    pub name: &'static str,
    pub unit: &'static str,
    pub cells: Vec<Cell>,
}

#[derive(Template)]
#[template(path = "study/compare.html")]
struct ComparePage {
    nav: Nav,
    id: i64,
    name: String,
    choices: Vec<Choice>,
    columns: Vec<(String, bool)>,
    rows: Vec<MetricRow>,
    problem: Option<String>,
    figures: Vec<Figure>,
    engine_version: &'static str,
}

/// Display text of a metric value: precision by magnitude.
pub fn fmt_value(x: f64) -> String {
    let a = x.abs();
    let decimals = if a >= 100.0 {
        1
    } else if a >= 1.0 {
        3
    } else {
        4
    };
    format!("{x:.decimals$}")
}

/// A difference with its sign.
fn signed(d: f64) -> String {
    if d >= 0.0 {
        format!("+{}", fmt_value(d))
    } else {
        fmt_value(d)
    }
}

fn yes_no(x: f64) -> String {
    if x > 0.5 { "yes".into() } else { "no".into() }
}

/// The value of a metric as the compare table shows it (`None` for null).
fn value(c: &CandidateResult, name: &str) -> Option<f64> {
    match name {
        "rank" => c.rank.map(|r| r as f64),
        "mass_closure_converged" => Some(if c.mass_closure_converged { 1.0 } else { 0.0 }),
        _ => c.metric(name),
    }
}

/// Index of the best value among feasible candidates, by the metric's direction.
fn best_of(cands: &[&CandidateResult], name: &str) -> Option<usize> {
    let dir = direction(name)?;
    let better = |a: f64, b: f64| match dir {
        Direction::Minimise => a < b,
        Direction::Maximise => a > b,
    };
    let mut best: Option<(usize, f64)> = None;
    for (i, c) in cands.iter().enumerate().filter(|(_, c)| c.feasible) {
        if let Some(v) = value(c, name)
            && best.is_none_or(|(_, b)| better(v, b))
        {
            best = Some((i, v));
        }
    }
    best.map(|(i, _)| i)
}

fn metric_rows(cands: &[&CandidateResult], base: usize) -> Vec<MetricRow> {
    METRICS
        .iter()
        .map(|(name, unit)| {
            let best = best_of(cands, name);
            let base_v = value(cands[base], name);
            let cells = cands
                .iter()
                .enumerate()
                .map(|(i, c)| {
                    let v = value(c, name);
                    let delta = match (v, base_v) {
                        (Some(v), Some(b)) if i != base => signed(v - b),
                        _ => String::new(),
                    };
                    let text = match (*name, v) {
                        ("mass_closure_converged", Some(x)) => yes_no(x),
                        (_, Some(x)) => fmt_value(x),
                        (_, None) => "–".into(),
                    };
                    Cell {
                        text,
                        delta,
                        best: best == Some(i),
                    }
                })
                .collect();
            MetricRow { name, unit, cells }
        })
        .collect()
}

/// The chosen candidate ids (`c`, in order, without repeats) and the baseline (`base`).
fn parse_query(raw: Option<&str>) -> Result<(Vec<i64>, Option<i64>), AppError> {
    let pairs: Vec<(String, String)> = serde_urlencoded::from_str(raw.unwrap_or(""))
        .map_err(|e| AppError::BadRequest(format!("query: {e}")))?;
    let id = |k: &str, v: &str| {
        v.parse::<i64>()
            .map_err(|_| AppError::BadRequest(format!("{k}: must be a candidate id (got '{v}')")))
    };
    let mut chosen = Vec::new();
    let mut base = None;
    for (k, v) in &pairs {
        match k.as_str() {
            "c" => {
                let c = id(k, v)?;
                if !chosen.contains(&c) {
                    chosen.push(c);
                }
            }
            "base" if !v.is_empty() => base = Some(id(k, v)?),
            _ => {}
        }
    }
    Ok((chosen, base))
}

async fn show_compare(
    State(state): State<AppState>,
    Viewer(user): Viewer,
    Path(id): Path<i64>,
    RawQuery(raw): RawQuery,
) -> Result<Response, AppError> {
    let (chosen, base) = parse_query(raw.as_deref())?;
    let (loaded, scored) = scored_study(&state, id).await?;
    let items = studies::list_items(&state.db, Item::Candidate, id).await?;
    let mut indices = Vec::new();
    for c in &chosen {
        let Some(i) = items.iter().position(|r| r.id == *c) else {
            return Err(AppError::NotFound(format!(
                "c: no candidate {c} in this study"
            )));
        };
        indices.push(i);
    }
    let base_id = base
        .filter(|b| chosen.contains(b))
        .or(chosen.first().copied());
    let problem = (!(2..=6).contains(&indices.len())).then(|| {
        format!(
            "Choose 2 to 6 candidates to compare ({} chosen).",
            indices.len()
        )
    });
    let cands: Vec<&CandidateResult> = indices
        .iter()
        .map(|i| &scored.results.candidates[*i])
        .collect();
    let base_pos = chosen.iter().position(|c| Some(*c) == base_id).unwrap_or(0);
    let choices = items
        .iter()
        .zip(&scored.results.candidates)
        .map(|(r, c)| Choice {
            id: r.id,
            name: c.name.clone(),
            chosen: chosen.contains(&r.id),
            base: Some(r.id) == base_id,
        })
        .collect();
    let figures = match (&loaded.study, &problem) {
        (Some(study), None) => vec![compare_figure(study, indices.clone()).await?],
        _ => Vec::new(),
    };
    let page = ComparePage {
        nav: Nav::of(&user),
        id,
        name: loaded.row.name.clone(),
        choices,
        columns: cands
            .iter()
            .enumerate()
            .map(|(i, c)| (c.name.clone(), i == base_pos))
            .collect(),
        rows: if problem.is_none() {
            metric_rows(&cands, base_pos)
        } else {
            Vec::new()
        },
        problem,
        figures,
        engine_version: ENGINE_VERSION,
    };
    Ok(HtmlTemplate(page).into_response())
}
