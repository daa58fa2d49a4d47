//! A study's change history from the audit trail: the page and its CSV download.
//! Read-only: nothing here writes to the trail.

use askama::Template;
use axum::extract::{Path, State};
use axum::response::{IntoResponse, Response};
use axum::routing::get;

use super::exports::download;
use crate::storage::audit::{self, AuditRow};
use crate::storage::studies;
use crate::web::AppState;
use crate::web::auth::Viewer;
use crate::web::error::AppError;
use crate::web::html::{HtmlTemplate, Nav};
use crate::web::routes::Routes;

pub fn router() -> Routes {
    Routes::new()
        .route("/studies/{id}/history", get(show_history))
        .route("/studies/{id}/history.csv", get(history_csv))
}

#[derive(Template)]
#[template(path = "history/study.html")]
struct HistoryPage {
    nav: Nav,
    study_id: i64,
    study_name: String,
    rows: Vec<AuditRow>,
}

async fn show_history(
    State(state): State<AppState>,
    Viewer(user): Viewer,
    Path(id): Path<i64>,
) -> Result<Response, AppError> {
    let study = studies::get_study(&state.db, id).await?;
    let page = HistoryPage {
        nav: Nav::of(&user),
        study_id: id,
        study_name: study.name,
        rows: audit::study_history(&state.db, id).await?,
    };
    Ok(HtmlTemplate(page).into_response())
}

/// The columns of `history.csv`, one row per recorded change.
pub const HISTORY_COLUMNS: [&str; 7] = [
    "at_utc",
    "actor",
    "entity_kind",
    "entity_id",
    "action",
    "before_json",
    "after_json",
];

fn write_history(rows: &[AuditRow]) -> csv::Result<Vec<u8>> {
    let mut w = csv::Writer::from_writer(Vec::new());
    w.write_record(HISTORY_COLUMNS)?;
    for r in rows {
        w.write_record([
            r.at.as_str(),
            &r.actor,
            &r.entity_kind,
            &r.entity_id.to_string(),
            &r.action,
            r.before.as_deref().unwrap_or(""),
            r.after.as_deref().unwrap_or(""),
        ])?;
    }
    w.into_inner().map_err(|e| e.into_error().into())
}

async fn history_csv(
    State(state): State<AppState>,
    Viewer(_): Viewer,
    Path(id): Path<i64>,
) -> Result<Response, AppError> {
    studies::get_study(&state.db, id).await?;
    let rows = audit::study_history(&state.db, id).await?;
    let body = write_history(&rows).map_err(|e| AppError::Internal(e.to_string()))?;
    let media = "text/csv; charset=utf-8";
    Ok(download(media, format!("study-{id}-history.csv"), body))
}
