//! The review JSON API: start a review of a study, read a review (snapshot, comments,
//! decisions, status; never the live study), and the diff as JSON.

use axum::Json;
use axum::body::Bytes;
use axum::extract::{Path, Query, State};
use axum::http::{StatusCode, header};
use axum::response::{IntoResponse, Response};
use serde::Deserialize;
use serde_json::{Value, json};

use super::exports::{Against, diff_of};
use super::{load, start};
use crate::storage::reviews;
use crate::web::AppState;
use crate::web::auth::{ApiEditor, ApiViewer};
use crate::web::error::ApiError;

fn numeric_id(raw: &str, what: &str) -> Result<i64, ApiError> {
    raw.parse().map_err(|_| {
        ApiError::new(
            StatusCode::NOT_FOUND,
            "id",
            format!("no {what} with id '{raw}'"),
        )
    })
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct NewReviewBody {
    title: Option<String>,
    #[serde(default)]
    participants: Vec<String>,
}

fn parse_body(body: &Bytes) -> Result<NewReviewBody, ApiError> {
    let parsed: NewReviewBody = serde_json::from_slice(body).map_err(|e| {
        ApiError::new(
            StatusCode::UNPROCESSABLE_ENTITY,
            "",
            format!("body must be {{\"title\": text, \"participants\": [usernames]}}: {e}"),
        )
    })?;
    if parsed.title.is_none() {
        return Err(ApiError::new(
            StatusCode::UNPROCESSABLE_ENTITY,
            "title",
            "is required (1–200 characters)",
        ));
    }
    Ok(parsed)
}

pub async fn create_review(
    State(state): State<AppState>,
    ApiEditor(user): ApiEditor,
    Path(raw): Path<String>,
    body: Bytes,
) -> Result<Response, ApiError> {
    let study_id = numeric_id(&raw, "study")?;
    let body = parse_body(&body)?;
    let title = body.title.unwrap_or_default();
    let id = start(&state, study_id, &title, &body.participants, &user).await?;
    let location = (header::LOCATION, format!("/api/reviews/{id}"));
    Ok((
        StatusCode::CREATED,
        [location],
        Json(json!({ "id": id.to_string() })),
    )
        .into_response())
}

pub async fn get_review(
    State(state): State<AppState>,
    ApiViewer(_): ApiViewer,
    Path(raw): Path<String>,
) -> Result<Response, ApiError> {
    let id = numeric_id(&raw, "review")?;
    let loaded = load(&state.db, id).await?;
    let comments = reviews::list_comments(&state.db, id).await?;
    let decisions = reviews::list_decisions(&state.db, id).await?;
    let r = &loaded.row;
    let body = json!({
        "id": r.id.to_string(),
        "study_id": r.study_id.to_string(),
        "title": r.title,
        "status": r.status,
        "created_by": r.created_by,
        "created_at": r.created_at,
        "closed_by": r.closed_by,
        "closed_at": r.closed_at,
        "study_revision": r.study_revision,
        "engine_version": r.engine_version,
        "study": loaded.snap.study,
        "results": loaded.snap.results,
        "comments": comments.iter().map(|c| json!({
            "id": c.id.to_string(), "candidate": c.candidate, "body": c.body,
            "by": c.created_by, "at": c.created_at })).collect::<Vec<Value>>(),
        "decisions": decisions.iter().map(|d| json!({
            "id": d.id.to_string(), "candidate": d.candidate, "outcome": d.outcome,
            "rationale": d.rationale, "by": d.decided_by, "at": d.decided_at })).collect::<Vec<Value>>(),
    });
    Ok(Json(body).into_response())
}

pub async fn get_diff(
    State(state): State<AppState>,
    ApiViewer(_): ApiViewer,
    Path(raw): Path<String>,
    Query(q): Query<Against>,
) -> Result<Response, ApiError> {
    let id = numeric_id(&raw, "review")?;
    let against = q.against.clone().unwrap_or_else(|| "live".into());
    let (_, label, d) = diff_of(&state, id, Some(&against))
        .await
        .map_err(ApiError::from)?;
    let body = json!({
        "review": id.to_string(),
        "against": against,
        "against_label": label,
        "inputs": d.inputs,
        "candidates": { "added": d.added, "removed": d.removed },
        "results": d.results,
    });
    Ok(Json(body).into_response())
}
