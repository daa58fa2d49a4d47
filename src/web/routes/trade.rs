//! The trade page: a Pareto plot for two metrics chosen in a GET form (default the
//! study's first two objectives), the trade matrix with the weights an editor can save
//! on the study, and the ranking table.

use crate::web::routes::Routes;
use askama::Template;
use axum::extract::{Form, Path, Query, State};
use axum::response::{IntoResponse, Redirect, Response};
use axum::routing::{get, post};
use serde::Deserialize;
use serde_json::{Map, Value, json};

use super::common::{form_revision, load_study, scored_study};
use super::compare::fmt_value;
use crate::engine::objectives::{Direction, direction};
use crate::engine::results::{CandidateResult, METRICS};
use crate::engine::study::parse_scoring;
use crate::engine::{ENGINE_VERSION, study_objectives};
use crate::plots::pareto::{self, Axes, Point};
use crate::storage::scoring::update_study_scoring;
use crate::web::AppState;
use crate::web::auth::{Editor, Viewer};
use crate::web::error::AppError;
use crate::web::html::{HtmlTemplate, Nav};

pub fn router() -> Routes {
    Routes::new()
        .route("/studies/{id}/trade", get(show_trade))
        .route("/studies/{id}/trade/weights", post(save_weights))
}

/// Metrics that can go on an axis: every scalar result metric but the flags.
fn axis_metrics() -> Vec<(&'static str, &'static str)> {
    METRICS
        .iter()
        .copied()
        .filter(|(n, _)| !matches!(*n, "mass_closure_converged" | "rank"))
        .collect()
}

fn axis_title(name: &str) -> String {
    match METRICS.iter().find(|(n, _)| *n == name) {
        Some((_, u)) if !u.is_empty() => format!("{name} [{u}]"),
        _ => name.to_string(),
    }
}

#[derive(Deserialize)]
struct Pair {
    x: Option<String>,
    y: Option<String>,
}

pub struct MatrixRow {
    pub number: usize,
    pub name: String,
    pub cells: Vec<String>,
}

pub struct RankRow {
    pub rank: String,
    pub number: usize,
    pub name: String,
    pub score: String,
    pub feasible: bool,
    pub binding: String,
}

#[derive(Template)]
#[template(path = "study/trade.html")]
struct TradePage {
    nav: Nav,
    id: i64,
    name: String,
    revision: i64,
    metrics: Vec<(&'static str, &'static str)>,
    x: String,
    y: String,
    no_front: Option<String>,
    not_plotted: Vec<String>,
    plot: String,
    objectives: Vec<(String, String)>,
    matrix: Vec<MatrixRow>,
    ranking: Vec<RankRow>,
    engine_version: &'static str,
}

fn chosen(q: Option<String>, default: &str, field: &str) -> Result<String, AppError> {
    let v = q
        .filter(|s| !s.is_empty())
        .unwrap_or_else(|| default.into());
    if axis_metrics().iter().any(|(n, _)| *n == v) {
        Ok(v)
    } else {
        Err(AppError::BadRequest(format!(
            "{field}: must be one of the result metrics, such as propulsion_mass_kg (got '{v}')"
        )))
    }
}

fn points(cands: &[CandidateResult], x: &str, y: &str) -> (Vec<Point>, Vec<String>) {
    let mut pts = Vec::new();
    let mut missing = Vec::new();
    for (i, c) in cands.iter().enumerate() {
        match (c.metric(x), c.metric(y)) {
            (Some(vx), Some(vy)) => pts.push(Point {
                number: i + 1,
                name: c.name.clone(),
                x: vx,
                y: vy,
                feasible: c.feasible,
            }),
            _ => missing.push(format!("{}. {}", i + 1, c.name)),
        }
    }
    (pts, missing)
}

/// Normalised 0..1 values of one objective (1 best) among the feasible candidates with a
/// value, as the trade score uses them; `None` for the others.
pub fn normalised(cands: &[CandidateResult], objective: &str) -> Vec<Option<f64>> {
    let sign = match direction(objective) {
        Some(Direction::Maximise) => 1.0,
        _ => -1.0,
    };
    let vals: Vec<Option<f64>> = cands
        .iter()
        .map(|c| {
            c.feasible
                .then(|| c.metric(objective))
                .flatten()
                .map(|v| sign * v)
        })
        .collect();
    let lo = vals.iter().flatten().copied().fold(f64::INFINITY, f64::min);
    let hi = vals
        .iter()
        .flatten()
        .copied()
        .fold(f64::NEG_INFINITY, f64::max);
    vals.iter()
        .map(|v| v.map(|v| if hi > lo { (v - lo) / (hi - lo) } else { 1.0 }))
        .collect()
}

fn matrix(cands: &[CandidateResult], objectives: &[String]) -> Vec<MatrixRow> {
    let cols: Vec<Vec<Option<f64>>> = objectives.iter().map(|o| normalised(cands, o)).collect();
    cands
        .iter()
        .enumerate()
        .map(|(i, c)| MatrixRow {
            number: i + 1,
            name: c.name.clone(),
            cells: cols
                .iter()
                .map(|col| col[i].map_or_else(|| "–".into(), |v| format!("{v:.3}")))
                .collect(),
        })
        .collect()
}

fn ranking(cands: &[CandidateResult]) -> Vec<RankRow> {
    let mut order: Vec<usize> = (0..cands.len()).collect();
    order.sort_by_key(|&i| cands[i].rank.unwrap_or(usize::MAX));
    order
        .into_iter()
        .map(|i| {
            let c = &cands[i];
            RankRow {
                rank: c.rank.map_or_else(|| "–".into(), |r| r.to_string()),
                number: i + 1,
                name: c.name.clone(),
                score: c.trade_score.map_or_else(|| "–".into(), fmt_value),
                feasible: c.feasible,
                binding: c.binding_constraint.clone().unwrap_or_default(),
            }
        })
        .collect()
}

fn weights_of(scoring: Option<&Value>, objectives: &[String]) -> Vec<(String, String)> {
    objectives
        .iter()
        .map(|o| {
            let w = scoring
                .and_then(|s| s.pointer(&format!("/weights/{o}")))
                .and_then(Value::as_f64)
                .unwrap_or(1.0);
            (o.clone(), format!("{w}"))
        })
        .collect()
}

async fn show_trade(
    State(state): State<AppState>,
    Viewer(user): Viewer,
    Path(id): Path<i64>,
    Query(q): Query<Pair>,
) -> Result<Response, AppError> {
    let (loaded, scored) = scored_study(&state, id).await?;
    let Some(study) = &loaded.study else {
        return Err(AppError::Conflict("No results yet.".into()));
    };
    let objectives = study_objectives(study);
    let x = chosen(q.x, &objectives[0], "x")?;
    let y = chosen(q.y, &objectives[1], "y")?;
    let cands = &scored.results.candidates;
    let (pts, not_plotted) = points(cands, &x, &y);
    let dirs = direction(&x).zip(direction(&y));
    let no_front = match (direction(&x), direction(&y)) {
        (Some(_), Some(_)) => None,
        (None, _) => Some(x.clone()),
        (_, None) => Some(y.clone()),
    };
    let classes = pareto::classify(&pts, dirs);
    let (tx, ty) = (axis_title(&x), axis_title(&y));
    let plot = pareto::plot(&pts, &classes, &Axes { x: &tx, y: &ty })
        .unwrap_or_else(|e| format!("<p class=\"notice\">{e}</p>"));
    let page = TradePage {
        nav: Nav::of(&user),
        id,
        name: loaded.row.name.clone(),
        revision: loaded.row.revision,
        metrics: axis_metrics(),
        x,
        y,
        no_front,
        not_plotted,
        plot,
        objectives: weights_of(loaded.doc.scoring.as_ref(), &objectives),
        matrix: matrix(cands, &objectives),
        ranking: ranking(cands),
        engine_version: ENGINE_VERSION,
    };
    Ok(HtmlTemplate(page).into_response())
}

/// The scoring with the weights of the form (`weight.<objective>` fields), checked by the
/// engine; an error names the field and the allowed range.
fn scoring_from_form(
    pairs: &[(String, String)],
    current: Option<&Value>,
    objectives: &[String],
) -> Result<Value, AppError> {
    let mut weights = Map::new();
    for o in objectives {
        let field = format!("weight.{o}");
        let raw = pairs
            .iter()
            .find(|(k, _)| *k == field)
            .map(|(_, v)| v.trim());
        let Some(w) = raw.and_then(|v| v.parse::<f64>().ok()) else {
            return Err(AppError::BadRequest(format!(
                "Nothing was saved. scoring.weights.{o}: must be a number from 0 to 1000000 (got '{}')",
                raw.unwrap_or("")
            )));
        };
        weights.insert(o.clone(), json!(w));
    }
    let mut scoring = current.cloned().unwrap_or_else(|| json!({}));
    scoring["weights"] = Value::Object(weights);
    parse_scoring(&scoring, "scoring")
        .map_err(|e| AppError::BadRequest(format!("Nothing was saved. {e}")))?;
    Ok(scoring)
}

async fn save_weights(
    State(state): State<AppState>,
    Editor(user): Editor,
    Path(id): Path<i64>,
    Form(pairs): Form<Vec<(String, String)>>,
) -> Result<Response, AppError> {
    let revision = form_revision(&pairs)?;
    let loaded = load_study(&state, id).await?;
    let Some(study) = &loaded.study else {
        return Err(AppError::Conflict(
            "Nothing was saved: the study cannot be scored yet.".into(),
        ));
    };
    let scoring = scoring_from_form(
        &pairs,
        loaded.doc.scoring.as_ref(),
        &study_objectives(study),
    )?;
    update_study_scoring(&state.db, id, revision, &scoring, &user.username).await?;
    Ok(Redirect::to(&format!("/studies/{id}/trade")).into_response())
}
