//! Downloads of a study: `summary.csv`, `segments.csv`, `oei_segments.csv` (written by
//! `crate::export` from the engine's results) and `study.json` (the study file).

use crate::web::routes::Routes;
use axum::extract::{Path, State};
use axum::http::header;
use axum::response::{IntoResponse, Response};
use axum::routing::get;

use super::common::{load_study, scored_study};
use crate::engine::results::StudyResults;
use crate::export;
use crate::web::AppState;
use crate::web::auth::Viewer;
use crate::web::error::AppError;

pub fn router() -> Routes {
    Routes::new()
        .route("/studies/{id}/summary.csv", get(summary_csv))
        .route("/studies/{id}/segments.csv", get(segments_csv))
        .route("/studies/{id}/oei_segments.csv", get(oei_segments_csv))
        .route("/studies/{id}/study.json", get(study_json))
        .route("/studies/{id}/export", get(study_json))
}

/// A download response: its media type and a file name the browser saves it under.
pub fn download(media: &str, filename: String, body: Vec<u8>) -> Response {
    let disposition = format!("attachment; filename=\"{filename}\"");
    (
        [
            (header::CONTENT_TYPE, media.to_string()),
            (header::CONTENT_DISPOSITION, disposition),
        ],
        body,
    )
        .into_response()
}

async fn csv_of(
    state: &AppState,
    id: i64,
    name: &str,
    write: impl FnOnce(&StudyResults, &mut Vec<u8>) -> csv::Result<()>,
) -> Result<Response, AppError> {
    let (_, scored) = scored_study(state, id).await?;
    let mut body = Vec::new();
    write(&scored.results, &mut body).map_err(|e| AppError::Internal(e.to_string()))?;
    let media = "text/csv; charset=utf-8";
    Ok(download(media, format!("study-{id}-{name}.csv"), body))
}

async fn summary_csv(
    State(state): State<AppState>,
    Viewer(_): Viewer,
    Path(id): Path<i64>,
) -> Result<Response, AppError> {
    csv_of(&state, id, "summary", |r, out| {
        export::write_summary_csv(r, out)
    })
    .await
}

async fn segments_csv(
    State(state): State<AppState>,
    Viewer(_): Viewer,
    Path(id): Path<i64>,
) -> Result<Response, AppError> {
    csv_of(&state, id, "segments", |r, out| {
        export::write_segments_csv(r, false, out)
    })
    .await
}

async fn oei_segments_csv(
    State(state): State<AppState>,
    Viewer(_): Viewer,
    Path(id): Path<i64>,
) -> Result<Response, AppError> {
    csv_of(&state, id, "oei_segments", |r, out| {
        export::write_segments_csv(r, true, out)
    })
    .await
}

/// The study file; a study still being built is exported as it stands.
async fn study_json(
    State(state): State<AppState>,
    Viewer(_): Viewer,
    Path(id): Path<i64>,
) -> Result<Response, AppError> {
    let loaded = load_study(&state, id).await?;
    let body = match &loaded.study {
        Some(study) => serde_json::to_vec_pretty(study),
        None => serde_json::to_vec_pretty(&loaded.doc.to_file_json()),
    }
    .map_err(|e| AppError::Internal(e.to_string()))?;
    Ok(download(
        "application/json",
        format!("study-{id}.json"),
        body,
    ))
}
