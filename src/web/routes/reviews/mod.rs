//! Design reviews: start a review from a study (freezing its study file, results and the
//! engine version), pages rendered from the snapshot only, presenter-follow over
//! server-sent events, comments, decisions, closing, minutes and diffs.

mod actions;
mod api;
mod events;
mod exports;
mod pages;

use crate::web::routes::Routes;
use axum::http::header;
use axum::response::IntoResponse;
use axum::routing::{get, post};
use serde_json::Value;

use super::common::load_study;
use crate::engine::ENGINE_VERSION;
use crate::storage::accounts::{self, Role};
use crate::storage::reviews::{self, NewReview, ReviewRow};
use crate::storage::{Db, StorageError};
use crate::web::AppState;
use crate::web::auth::CurrentUser;
use crate::web::error::{ApiError, AppError};
use crate::web::snapshot::Snapshot;

const REVIEW_JS: &str = include_str!("../../../../static/review.js");

/// Most participants named when a review starts.
const MAX_PARTICIPANTS: usize = 50;

pub fn router() -> Routes {
    Routes::new()
        .route(
            "/studies/{id}/reviews",
            get(pages::list_reviews).post(actions::start_review),
        )
        .route("/reviews/{id}", get(pages::overview))
        .route("/reviews/{id}/compare", get(pages::compare))
        .route("/reviews/{id}/trade", get(pages::trade))
        .route("/reviews/{id}/candidates/{n}", get(pages::candidate))
        .route("/reviews/{id}/segments/{n}", get(pages::segment))
        .route("/reviews/{id}/view", post(actions::present))
        .route("/reviews/{id}/presenter", post(actions::hand_over))
        .route("/reviews/{id}/comments", post(actions::add_comment))
        .route("/reviews/{id}/decisions", post(actions::decide))
        .route("/reviews/{id}/close", post(actions::close))
        .route("/reviews/{id}/events", get(events::review_events))
        .route("/reviews/{id}/minutes.csv", get(exports::minutes_csv))
        .route("/reviews/{id}/minutes.md", get(exports::minutes_md))
        .route("/reviews/{id}/diff", get(exports::diff_page))
        .route("/api/studies/{id}/reviews", post(api::create_review))
        .route("/api/reviews/{id}", get(api::get_review))
        .route("/api/reviews/{id}/diff", get(api::get_diff))
        .route("/static/review.js", get(script))
}

async fn script() -> impl IntoResponse {
    (
        [(header::CONTENT_TYPE, "text/javascript; charset=utf-8")],
        REVIEW_JS,
    )
}

/// Why a review action was refused: a named field with what is allowed, or storage.
#[derive(Debug)]
pub enum ReviewError {
    Field { path: String, message: String },
    Forbidden(String),
    Storage(StorageError),
    Internal(String),
}

impl ReviewError {
    pub fn field(path: &str, message: impl Into<String>) -> Self {
        ReviewError::Field {
            path: path.to_string(),
            message: message.into(),
        }
    }
}

impl From<StorageError> for ReviewError {
    fn from(e: StorageError) -> Self {
        ReviewError::Storage(e)
    }
}

impl From<ReviewError> for AppError {
    fn from(e: ReviewError) -> Self {
        match e {
            ReviewError::Field { path, message } => {
                AppError::BadRequest(format!("{path}: {message}"))
            }
            ReviewError::Forbidden(m) => AppError::Forbidden(m),
            ReviewError::Storage(s) => s.into(),
            ReviewError::Internal(m) => AppError::Internal(m),
        }
    }
}

impl From<ReviewError> for ApiError {
    fn from(e: ReviewError) -> Self {
        use axum::http::StatusCode;
        match e {
            ReviewError::Field { path, message } => {
                ApiError::new(StatusCode::UNPROCESSABLE_ENTITY, &path, message)
            }
            ReviewError::Forbidden(m) => ApiError::new(StatusCode::FORBIDDEN, "authorization", m),
            ReviewError::Storage(s) => s.into(),
            ReviewError::Internal(m) => {
                tracing::error!(cause = %m, "review request failed");
                ApiError::new(StatusCode::INTERNAL_SERVER_ERROR, "", "internal error")
            }
        }
    }
}

/// A text field trimmed and checked to hold 1 to `max` characters.
pub fn checked_text(path: &str, raw: &str, max: usize) -> Result<String, ReviewError> {
    let t = raw.trim();
    let n = t.chars().count();
    if n == 0 || n > max {
        return Err(ReviewError::field(
            path,
            format!("must be 1–{max} characters (got {n})"),
        ));
    }
    Ok(t.to_string())
}

/// Participant usernames, each an existing account; duplicates dropped.
async fn checked_participants(db: &Db, names: &[String]) -> Result<Vec<String>, ReviewError> {
    let mut out: Vec<String> = Vec::new();
    for (i, raw) in names.iter().enumerate() {
        let name = raw.trim();
        if name.is_empty() || out.iter().any(|n| n == name) {
            continue;
        }
        if accounts::find_user(db, name).await?.is_none() {
            let msg = format!("no account named '{name}'");
            return Err(ReviewError::field(&format!("participants[{i}]"), msg));
        }
        out.push(name.to_string());
    }
    if out.len() > MAX_PARTICIPANTS {
        let msg = format!("at most {MAX_PARTICIPANTS} names (got {})", out.len());
        return Err(ReviewError::field("participants", msg));
    }
    Ok(out)
}

/// Starts a review of the study as it is now: validates, scores, freezes, stores.
pub async fn start(
    state: &AppState,
    study_id: i64,
    title: &str,
    participants: &[String],
    by: &CurrentUser,
) -> Result<i64, ReviewError> {
    let title = checked_text("title", title, 200)?;
    let loaded = load_study(state, study_id).await.map_err(|e| match e {
        AppError::NotFound(_) => ReviewError::Storage(StorageError::NotFound { what: "study" }),
        other => ReviewError::Internal(other.to_string()),
    })?;
    let Some(study) = &loaded.study else {
        let why = loaded.problem.unwrap_or_default();
        return Err(ReviewError::field(
            "study",
            format!("cannot be reviewed yet: {why}"),
        ));
    };
    let participants = checked_participants(&state.db, participants).await?;
    let results = state
        .results
        .results(study)
        .await
        .map_err(|e| ReviewError::Internal(e.to_string()))?;
    let study_json =
        serde_json::to_string(study).map_err(|e| ReviewError::Internal(e.to_string()))?;
    let new = NewReview {
        study_id,
        title: &title,
        study_revision: loaded.row.revision,
        study_json: &study_json,
        results_json: &results.json.to_string(),
        engine_version: ENGINE_VERSION,
        participants: &participants,
        by: &by.username,
    };
    Ok(reviews::insert_review(&state.db, &new).await?)
}

/// A stored review with its snapshot parsed.
pub struct Loaded {
    pub row: ReviewRow,
    pub snap: Snapshot,
}

pub async fn load(db: &Db, id: i64) -> Result<Loaded, StorageError> {
    let row = reviews::get_review(db, id).await?;
    let snap = Snapshot {
        study: serde_json::from_str(&row.study_json)?,
        results: serde_json::from_str(&row.results_json)?,
    };
    Ok(Loaded { row, snap })
}

/// Whether `view` names a screen of this snapshot.
pub fn view_exists(snap: &Snapshot, view: &str) -> bool {
    let index = |rest: &str, len: usize| rest.parse::<usize>().is_ok_and(|n| n < len);
    match view.split_once('/') {
        None => matches!(view, "" | "compare" | "trade"),
        Some(("candidates", n)) => index(n, snap.candidates().len()),
        Some(("segments", n)) => index(n, snap.segment_names().len()),
        _ => false,
    }
}

/// The presenter, or an editor, may decide and close.
pub fn may_lead(user: &CurrentUser, row: &ReviewRow) -> bool {
    user.username == row.presenter || user.role >= Role::Editor
}

/// The page of a view.
pub fn view_url(id: i64, view: &str) -> String {
    if view.is_empty() {
        format!("/reviews/{id}")
    } else {
        format!("/reviews/{id}/{view}")
    }
}

/// The live event payload of a view change.
pub fn view_event(row: &ReviewRow, view: &str) -> Value {
    serde_json::json!({ "view": view, "presenter": row.presenter,
                        "url": view_url(row.id, view) })
}
