//! Minutes (Markdown and CSV) of a review, and the diff page: this review's snapshot
//! against another review of the same study or against the live study.

use askama::Template;
use axum::extract::{Path, Query, State};
use axum::http::header;
use axum::response::{IntoResponse, Response};
use serde::Deserialize;

use super::{Loaded, ReviewError, load};
use crate::storage::reviews;
use crate::web::AppState;
use crate::web::auth::Viewer;
use crate::web::error::AppError;
use crate::web::html::{HtmlTemplate, Nav};
use crate::web::routes::common::load_study;
use crate::web::snapshot::diff::{SnapshotDiff, diff};
use crate::web::snapshot::minutes::Minutes;
use crate::web::snapshot::{Snapshot, show};

async fn minutes_of<T>(
    state: &AppState,
    id: i64,
    make: impl FnOnce(&Minutes) -> T,
) -> Result<T, AppError> {
    let Loaded { row, snap } = load(&state.db, id).await?;
    let participants = reviews::list_participants(&state.db, id).await?;
    let decisions = reviews::list_decisions(&state.db, id).await?;
    let comments = reviews::list_comments(&state.db, id).await?;
    let minutes = Minutes {
        review: &row,
        participants: &participants,
        snapshot: &snap,
        decisions: &decisions,
        comments: &comments,
    };
    Ok(make(&minutes))
}

fn attachment(kind: &'static str, name: String, body: Vec<u8>) -> Response {
    let disposition = format!("attachment; filename=\"{name}\"");
    (
        [
            (header::CONTENT_TYPE, kind.to_string()),
            (header::CONTENT_DISPOSITION, disposition),
        ],
        body,
    )
        .into_response()
}

pub async fn minutes_md(
    State(state): State<AppState>,
    Viewer(_): Viewer,
    Path(id): Path<i64>,
) -> Result<Response, AppError> {
    let text = minutes_of(&state, id, |m: &Minutes| m.markdown()).await?;
    let name = format!("review-{id}-minutes.md");
    Ok(attachment(
        "text/markdown; charset=utf-8",
        name,
        text.into_bytes(),
    ))
}

pub async fn minutes_csv(
    State(state): State<AppState>,
    Viewer(_): Viewer,
    Path(id): Path<i64>,
) -> Result<Response, AppError> {
    let bytes = minutes_of(&state, id, |m: &Minutes| m.csv())
        .await?
        .map_err(|e| AppError::Internal(format!("minutes csv: {e}")))?;
    let name = format!("review-{id}-minutes.csv");
    Ok(attachment("text/csv; charset=utf-8", name, bytes))
}

#[derive(Deserialize)]
pub struct Against {
    pub against: Option<String>,
}

/// The snapshot `against` names ("live" or a review id of the same study), its label.
async fn other_side(
    state: &AppState,
    this: &Loaded,
    against: &str,
) -> Result<(String, Snapshot), ReviewError> {
    if against == "live" {
        let live = load_study(state, this.row.study_id)
            .await
            .map_err(|e| ReviewError::Internal(e.to_string()))?;
        let Some(study) = live.study else {
            let why = live.problem.unwrap_or_default();
            return Err(ReviewError::field(
                "against",
                format!("the live study cannot be scored: {why}"),
            ));
        };
        let results = state
            .results
            .results(&study)
            .await
            .map_err(|e| ReviewError::Internal(e.to_string()))?;
        let study =
            serde_json::to_value(&study).map_err(|e| ReviewError::Internal(e.to_string()))?;
        let label = format!("the live study (revision {})", live.row.revision);
        return Ok((
            label,
            Snapshot {
                study,
                results: results.json.clone(),
            },
        ));
    }
    let bad = || {
        ReviewError::field(
            "against",
            format!(
                "must be 'live' or the id of another review of the same study (got '{against}')"
            ),
        )
    };
    let other_id: i64 = against.parse().map_err(|_| bad())?;
    let other = load(&state.db, other_id).await.map_err(|_| bad())?;
    if other.row.study_id != this.row.study_id || other.row.id == this.row.id {
        return Err(bad());
    }
    Ok((format!("review “{}”", other.row.title), other.snap))
}

/// This review's snapshot against `against`, with a label of the other side.
pub async fn diff_of(
    state: &AppState,
    id: i64,
    against: Option<&str>,
) -> Result<(Loaded, String, SnapshotDiff), ReviewError> {
    let this = load(&state.db, id).await?;
    let against = against.unwrap_or("live").trim();
    let (label, other) = other_side(state, &this, against).await?;
    let d = diff(&this.snap, &other);
    Ok((this, label, d))
}

#[derive(Template)]
#[template(path = "review/diff.html")]
struct DiffPage {
    nav: Nav,
    id: i64,
    title: String,
    against: String,
    inputs: Vec<(String, String, String)>,
    added: Vec<String>,
    removed: Vec<String>,
    results: Vec<(String, String, String, String, String)>,
    engine_version: String,
}

fn cell(v: &serde_json::Value) -> String {
    match v {
        serde_json::Value::Object(_) | serde_json::Value::Array(_) => v.to_string(),
        other => show(Some(other)),
    }
}

pub async fn diff_page(
    State(state): State<AppState>,
    Viewer(user): Viewer,
    Path(id): Path<i64>,
    Query(q): Query<Against>,
) -> Result<Response, AppError> {
    let (this, against, d) = diff_of(&state, id, q.against.as_deref()).await?;
    let page = DiffPage {
        nav: Nav::of(&user),
        id,
        title: this.row.title.clone(),
        against,
        inputs: d
            .inputs
            .iter()
            .map(|c| (c.path.clone(), cell(&c.old), cell(&c.new)))
            .collect(),
        added: d.added,
        removed: d.removed,
        results: d
            .results
            .iter()
            .map(|r| {
                let delta = r
                    .delta
                    .map(|x| format!("{x:+.4}"))
                    .unwrap_or_else(|| "–".into());
                (
                    r.candidate.clone(),
                    r.metric.clone(),
                    cell(&r.old),
                    cell(&r.new),
                    delta,
                )
            })
            .collect(),
        engine_version: this.row.engine_version,
    };
    Ok(HtmlTemplate(page).into_response())
}
