//! The JSON API for programme scripts (session cookie or `Authorization: Bearer`).
//! Stable: ids are opaque strings, studies are study files, results are result files,
//! and every 4xx body is `{"error": {"path", "message"}}`.

use crate::web::routes::Routes;
use axum::Json;
use axum::body::Bytes;
use axum::extract::rejection::BytesRejection;
use axum::extract::{Path, Query, State};
use axum::http::{HeaderMap, StatusCode, header};
use axum::response::{IntoResponse, Response};
use axum::routing::get;
use serde::Deserialize;
use serde_json::{Value, json};

use crate::engine::study::{Study, parse_study};
use crate::storage::StorageError;
use crate::storage::studies::{self, StudyDoc};
use crate::web::AppState;
use crate::web::auth::{ApiEditor, ApiViewer};
use crate::web::error::ApiError;
use crate::web::validate::validate_doc;

pub fn router() -> Routes {
    Routes::new()
        .route("/api/studies", get(list_studies).post(create_study))
        .route("/api/studies/{id}", get(get_study).put(replace_study))
        .route("/api/studies/{id}/results", get(get_results))
}

fn study_id(raw: &str) -> Result<i64, ApiError> {
    raw.parse().map_err(|_| {
        ApiError::new(
            StatusCode::NOT_FOUND,
            "id",
            format!("no study with id '{raw}'"),
        )
    })
}

fn etag(revision: i64) -> (header::HeaderName, String) {
    (header::ETAG, format!("\"{revision}\""))
}

/// The raw body, or the JSON 413 when it is over the upload limit.
fn body_bytes(body: Result<Bytes, BytesRejection>) -> Result<Bytes, ApiError> {
    body.map_err(|e| {
        let status = e.status();
        if status == StatusCode::PAYLOAD_TOO_LARGE {
            let mib = crate::web::auth::MAX_FORM_BYTES / (1024 * 1024);
            let msg = format!("study upload too large: the limit is {mib} MiB");
            ApiError::new(status, "body", msg)
        } else {
            ApiError::new(status, "body", e.body_text())
        }
    })
}

/// A request body as a validated study and its storable document.
fn parse_body(body: &Bytes) -> Result<(Study, StudyDoc), ApiError> {
    let value: Value = serde_json::from_slice(body).map_err(|e| {
        ApiError::new(
            StatusCode::BAD_REQUEST,
            "body",
            format!("body is not valid JSON: {e}"),
        )
    })?;
    let study = parse_study(&value)
        .map_err(|e| ApiError::new(StatusCode::UNPROCESSABLE_ENTITY, &e.path, e.message))?;
    let canonical = serde_json::to_value(&study)
        .map_err(|e| ApiError::new(StatusCode::INTERNAL_SERVER_ERROR, "", e.to_string()))?;
    Ok((study, StudyDoc::from_file_json(&canonical)?))
}

#[derive(Deserialize)]
struct ListQuery {
    limit: Option<i64>,
}

async fn list_studies(
    State(state): State<AppState>,
    ApiViewer(_): ApiViewer,
    Query(q): Query<ListQuery>,
) -> Result<Response, ApiError> {
    if let Some(n) = q.limit.filter(|n| *n < 1) {
        return Err(ApiError::new(
            StatusCode::BAD_REQUEST,
            "limit",
            format!("must be ≥ 1 (got {n})"),
        ));
    }
    let list = studies::list_studies(&state.db, q.limit).await?;
    let body: Vec<Value> = list
        .iter()
        .map(|s| {
            json!({ "id": s.id.to_string(), "name": s.name, "revision": s.revision,
                         "updated_at": s.updated_at, "candidates": s.candidates })
        })
        .collect();
    Ok(Json(body).into_response())
}

async fn create_study(
    State(state): State<AppState>,
    ApiEditor(user): ApiEditor,
    body: Result<Bytes, BytesRejection>,
) -> Result<Response, ApiError> {
    let (_, doc) = parse_body(&body_bytes(body)?)?;
    let id = studies::insert_study(&state.db, &doc, &user.username).await?;
    let row = studies::get_study(&state.db, id).await?;
    let location = (header::LOCATION, format!("/api/studies/{id}"));
    Ok((
        StatusCode::CREATED,
        [etag(row.revision), location],
        Json(json!({ "id": id.to_string() })),
    )
        .into_response())
}

async fn get_study(
    State(state): State<AppState>,
    ApiViewer(_): ApiViewer,
    Path(raw): Path<String>,
) -> Result<Response, ApiError> {
    let (row, doc) = studies::load_doc(&state.db, study_id(&raw)?).await?;
    let body = match validate_doc(&doc) {
        Ok(Some(study)) => serde_json::to_value(&study).unwrap_or_else(|_| doc.to_file_json()),
        _ => doc.to_file_json(),
    };
    Ok(([etag(row.revision)], Json(body)).into_response())
}

fn if_match(headers: &HeaderMap) -> Result<i64, ApiError> {
    let Some(raw) = headers.get(header::IF_MATCH) else {
        return Err(ApiError::new(
            StatusCode::PRECONDITION_REQUIRED,
            "If-Match",
            "send If-Match with the ETag of the study you edited",
        ));
    };
    let text = raw
        .to_str()
        .unwrap_or("")
        .trim()
        .trim_start_matches("W/")
        .trim_matches('"');
    text.parse().map_err(|_| {
        ApiError::new(
            StatusCode::BAD_REQUEST,
            "If-Match",
            format!("must be a study ETag such as \"3\" (got '{text}')"),
        )
    })
}

async fn replace_study(
    State(state): State<AppState>,
    ApiEditor(user): ApiEditor,
    Path(raw): Path<String>,
    headers: HeaderMap,
    body: Result<Bytes, BytesRejection>,
) -> Result<Response, ApiError> {
    let id = study_id(&raw)?;
    studies::get_study(&state.db, id).await?;
    let revision = if_match(&headers)?;
    let (_, doc) = parse_body(&body_bytes(body)?)?;
    let new_rev = match studies::replace_study(&state.db, id, revision, &doc, &user.username).await
    {
        Ok(rev) => rev,
        Err(e @ StorageError::Conflict { .. }) => {
            let mut err = ApiError::from(e);
            err.current = studies::load_doc(&state.db, id)
                .await
                .ok()
                .map(|(_, doc)| doc.to_file_json());
            return Err(err);
        }
        Err(e) => return Err(e.into()),
    };
    Ok((
        [etag(new_rev)],
        Json(json!({ "id": id.to_string(), "revision": new_rev })),
    )
        .into_response())
}

async fn get_results(
    State(state): State<AppState>,
    ApiViewer(_): ApiViewer,
    Path(raw): Path<String>,
) -> Result<Response, ApiError> {
    let (row, doc) = studies::load_doc(&state.db, study_id(&raw)?).await?;
    let study = match validate_doc(&doc) {
        Ok(Some(s)) => s,
        Ok(None) => {
            let msg = "the study needs at least one segment and one candidate to be scored";
            return Err(ApiError::new(
                StatusCode::UNPROCESSABLE_ENTITY,
                "segments",
                msg,
            ));
        }
        Err(e) => {
            return Err(ApiError::new(
                StatusCode::UNPROCESSABLE_ENTITY,
                &e.path,
                e.message,
            ));
        }
    };
    let results = state
        .results
        .results(&study)
        .await
        .map_err(|e| ApiError::new(StatusCode::INTERNAL_SERVER_ERROR, "", e.to_string()))?;
    Ok(([etag(row.revision)], Json(results.json.clone())).into_response())
}
