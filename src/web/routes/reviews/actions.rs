//! Form posts of a review: start, present a screen, hand over, comment, decide, close.
//! Each checks who may do it and that the review is open, stores in one transaction,
//! then tells every follower over the live channel.

use axum::extract::{Form, Path, State};
use axum::response::{IntoResponse, Redirect, Response};
use serde_json::json;

use super::{
    Loaded, ReviewError, checked_text, load, may_lead, start, view_event, view_exists, view_url,
};
use crate::storage::accounts;
use crate::storage::reviews;
use crate::web::AppState;
use crate::web::auth::{CurrentUser, Editor, Viewer};
use crate::web::error::AppError;

type Pairs = Vec<(String, String)>;

fn field<'a>(pairs: &'a Pairs, name: &str) -> &'a str {
    pairs
        .iter()
        .find(|(k, _)| k == name)
        .map(|(_, v)| v.as_str())
        .unwrap_or("")
}

/// Where a form sends its user back to: the screen it was posted from.
fn back(loaded: &Loaded, pairs: &Pairs) -> Response {
    let view = field(pairs, "back");
    let view = if view_exists(&loaded.snap, view) {
        view
    } else {
        ""
    };
    Redirect::to(&view_url(loaded.row.id, view)).into_response()
}

/// The review, provided it is still open.
async fn open_review(state: &AppState, id: i64) -> Result<Loaded, AppError> {
    let loaded = load(&state.db, id).await?;
    if !loaded.row.is_open() {
        return Err(AppError::Conflict(
            "This review is closed and read-only; nothing was saved.".into(),
        ));
    }
    Ok(loaded)
}

fn lead_only(user: &CurrentUser, loaded: &Loaded, what: &str) -> Result<(), AppError> {
    if may_lead(user, &loaded.row) {
        return Ok(());
    }
    Err(AppError::Forbidden(format!(
        "Only the presenter ({}) or an editor may {what}.",
        loaded.row.presenter
    )))
}

pub async fn start_review(
    State(state): State<AppState>,
    Editor(user): Editor,
    Path(study_id): Path<i64>,
    Form(pairs): Form<Pairs>,
) -> Result<Response, AppError> {
    let names: Vec<String> = field(&pairs, "participants")
        .split([',', ' ', '\n', '\t'])
        .map(str::to_string)
        .collect();
    let id = start(&state, study_id, field(&pairs, "title"), &names, &user).await?;
    Ok(Redirect::to(&format!("/reviews/{id}")).into_response())
}

pub async fn present(
    State(state): State<AppState>,
    Viewer(user): Viewer,
    Path(id): Path<i64>,
    Form(pairs): Form<Pairs>,
) -> Result<Response, AppError> {
    let loaded = open_review(&state, id).await?;
    if user.username != loaded.row.presenter {
        return Err(AppError::Forbidden(format!(
            "Only the presenter ({}) chooses what is on screen.",
            loaded.row.presenter
        )));
    }
    let view = field(&pairs, "view");
    if !view_exists(&loaded.snap, view) {
        return Err(
            ReviewError::field("view", format!("no screen '{view}' in this review")).into(),
        );
    }
    reviews::set_view(&state.db, id, view).await?;
    state
        .reviews
        .publish(id, "view", view_event(&loaded.row, view));
    Ok(Redirect::to(&view_url(id, view)).into_response())
}

pub async fn hand_over(
    State(state): State<AppState>,
    Viewer(user): Viewer,
    Path(id): Path<i64>,
    Form(pairs): Form<Pairs>,
) -> Result<Response, AppError> {
    let loaded = open_review(&state, id).await?;
    lead_only(&user, &loaded, "hand over the presentation")?;
    let to = field(&pairs, "presenter").trim();
    if accounts::find_user(&state.db, to).await?.is_none() {
        return Err(ReviewError::field("presenter", format!("no account named '{to}'")).into());
    }
    reviews::set_presenter(&state.db, id, to).await?;
    let data = json!({ "presenter": to, "view": loaded.row.current_view });
    state.reviews.publish(id, "presenter", data);
    Ok(back(&loaded, &pairs))
}

/// The `candidate` field: "" for the whole review, else a candidate of the snapshot.
fn candidate_field(
    loaded: &Loaded,
    pairs: &Pairs,
    required: bool,
) -> Result<Option<String>, ReviewError> {
    let name = field(pairs, "candidate").trim();
    if name.is_empty() && !required {
        return Ok(None);
    }
    if loaded.snap.candidate_names().iter().any(|n| n == name) {
        return Ok(Some(name.to_string()));
    }
    Err(ReviewError::field(
        "candidate",
        format!("must be a candidate of this review's snapshot (got '{name}')"),
    ))
}

pub async fn add_comment(
    State(state): State<AppState>,
    Viewer(user): Viewer,
    Path(id): Path<i64>,
    Form(pairs): Form<Pairs>,
) -> Result<Response, AppError> {
    let loaded = open_review(&state, id).await?;
    let candidate = candidate_field(&loaded, &pairs, false)?;
    let body = checked_text("body", field(&pairs, "body"), 2000)?;
    let row =
        reviews::insert_comment(&state.db, id, candidate.as_deref(), &body, &user.username).await?;
    let data = json!({ "who": row.created_by, "when": row.created_at,
                       "candidate": row.candidate, "body": row.body });
    state.reviews.publish(id, "comment", data);
    Ok(back(&loaded, &pairs))
}

const OUTCOMES: [&str; 3] = ["carry_forward", "hold", "drop"];

pub async fn decide(
    State(state): State<AppState>,
    Viewer(user): Viewer,
    Path(id): Path<i64>,
    Form(pairs): Form<Pairs>,
) -> Result<Response, AppError> {
    let loaded = open_review(&state, id).await?;
    lead_only(&user, &loaded, "record decisions")?;
    let candidate = candidate_field(&loaded, &pairs, true)?.unwrap_or_default();
    let outcome = field(&pairs, "outcome");
    if !OUTCOMES.contains(&outcome) {
        let msg = format!("must be carry_forward, hold or drop (got '{outcome}')");
        return Err(ReviewError::field("outcome", msg).into());
    }
    let rationale = checked_text("rationale", field(&pairs, "rationale"), 2000)?;
    let row = reviews::insert_decision(
        &state.db,
        id,
        &candidate,
        outcome,
        &rationale,
        &user.username,
    )
    .await?;
    let data = json!({ "candidate": row.candidate, "outcome": row.outcome,
                       "rationale": row.rationale, "who": row.decided_by, "when": row.decided_at });
    state.reviews.publish(id, "decision", data);
    Ok(back(&loaded, &pairs))
}

pub async fn close(
    State(state): State<AppState>,
    Viewer(user): Viewer,
    Path(id): Path<i64>,
) -> Result<Response, AppError> {
    let loaded = open_review(&state, id).await?;
    lead_only(&user, &loaded, "close the review")?;
    reviews::close_review(&state.db, id, &user.username).await?;
    state
        .reviews
        .publish(id, "closed", json!({ "by": user.username }));
    Ok(Redirect::to(&view_url(id, "")).into_response())
}
