//! Importing datasheet candidates from CSV: the template download, the paste-in form,
//! and the all-or-nothing import (every row validated by the engine, then the whole
//! study, then all rows stored in one transaction against the study's revision).

use crate::web::routes::Routes;
use askama::Template;
use axum::extract::{Form, Path, State};
use axum::response::{IntoResponse, Redirect, Response};
use axum::routing::get;
use serde::Deserialize;
use serde_json::Value;

use super::exports::download;
use crate::export::{RowError, read_datasheet_candidates, write_candidate_template};
use crate::storage::StorageError;
use crate::storage::studies::{self, Item};
use crate::web::AppState;
use crate::web::auth::{CurrentUser, Editor, Viewer};
use crate::web::error::AppError;
use crate::web::html::{HtmlTemplate, Nav};
use crate::web::validate::validate_doc;

pub fn router() -> Routes {
    Routes::new()
        .route("/candidate-template.csv", get(template_csv))
        .route(
            "/studies/{id}/candidates/import",
            get(show_import).post(import_candidates),
        )
}

#[derive(Template)]
#[template(path = "study/import.html")]
struct ImportPage {
    nav: Nav,
    study_id: i64,
    study_name: String,
    revision: i64,
    text: String,
    errors: Vec<RowError>,
    general_error: Option<String>,
}

async fn template_csv(Viewer(_): Viewer) -> Result<Response, AppError> {
    let mut body = Vec::new();
    write_candidate_template(&mut body).map_err(|e| AppError::Internal(e.to_string()))?;
    let media = "text/csv; charset=utf-8";
    Ok(download(media, "candidate-template.csv".into(), body))
}

async fn page(
    state: &AppState,
    user: &CurrentUser,
    id: i64,
    text: String,
    errors: Vec<RowError>,
    general_error: Option<String>,
) -> Result<Response, AppError> {
    let study = studies::get_study(&state.db, id).await?;
    Ok(HtmlTemplate(ImportPage {
        nav: Nav::of(user),
        study_id: id,
        study_name: study.name,
        revision: study.revision,
        text,
        errors,
        general_error,
    })
    .into_response())
}

async fn show_import(
    State(state): State<AppState>,
    Editor(user): Editor,
    Path(id): Path<i64>,
) -> Result<Response, AppError> {
    page(&state, &user, id, String::new(), Vec::new(), None).await
}

#[derive(Deserialize)]
struct ImportForm {
    revision: i64,
    candidates_csv: String,
}

/// Checks the new candidates together with the stored study (names unique across it,
/// cross-row rules); the message of the first problem otherwise.
async fn check_with_study(
    state: &AppState,
    id: i64,
    rows: &[Value],
) -> Result<Option<String>, AppError> {
    let (_, mut doc) = studies::load_doc(&state.db, id).await?;
    let first_new = doc.candidates.len();
    doc.candidates.extend(rows.iter().cloned());
    Ok(validate_doc(&doc).err().map(|e| {
        let line = e
            .path
            .strip_prefix("candidates[")
            .and_then(|r| r.split(']').next())
            .and_then(|i| i.parse::<usize>().ok())
            .filter(|i| *i >= first_new)
            .map(|i| format!("line {}: ", i - first_new + 2))
            .unwrap_or_default();
        format!("Nothing was imported. {line}{e}")
    }))
}

/// The import form re-shown with its errors answers 422.
fn unprocessable(mut resp: Response) -> Response {
    *resp.status_mut() = axum::http::StatusCode::UNPROCESSABLE_ENTITY;
    resp
}

async fn import_candidates(
    State(state): State<AppState>,
    Editor(user): Editor,
    Path(id): Path<i64>,
    Form(f): Form<ImportForm>,
) -> Result<Response, AppError> {
    let rows = match read_datasheet_candidates(&f.candidates_csv) {
        Ok(rows) => rows,
        Err(errors) => {
            let msg = "Nothing was imported: every refused row is listed below.".to_string();
            let resp = page(&state, &user, id, f.candidates_csv, errors, Some(msg)).await?;
            return Ok(unprocessable(resp));
        }
    };
    if let Some(msg) = check_with_study(&state, id, &rows).await? {
        let resp = page(&state, &user, id, f.candidates_csv, Vec::new(), Some(msg)).await?;
        return Ok(unprocessable(resp));
    }
    match studies::append_items(
        &state.db,
        Item::Candidate,
        id,
        f.revision,
        &rows,
        &user.username,
    )
    .await
    {
        Ok(_) => Ok(Redirect::to(&format!("/studies/{id}")).into_response()),
        Err(e @ StorageError::Conflict { .. }) => {
            let msg = format!("Nothing was imported: {e}");
            let mut resp = page(&state, &user, id, f.candidates_csv, Vec::new(), Some(msg)).await?;
            *resp.status_mut() = axum::http::StatusCode::CONFLICT;
            Ok(resp)
        }
        Err(e) => Err(e.into()),
    }
}
