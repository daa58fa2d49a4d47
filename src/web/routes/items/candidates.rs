//! Handlers of the motor candidate rows (datasheet, radial and axial sizing): new and
//! edit forms for each kind, save, move, delete.

use axum::extract::{Form, Path, Query, State};
use axum::response::Response;
use serde::Deserialize;
use serde_json::{Value, json};

use super::{MoveForm, Target, delete_row, form_page, move_row, submit};
use crate::storage::studies::{self, Item};
use crate::web::AppState;
use crate::web::auth::Editor;
use crate::web::error::AppError;
use crate::web::fields::candidate_fields;
use crate::web::forms::{self, Errors};
use crate::web::routes::common::{form_revision, form_values};

fn candidate_target(
    study_id: i64,
    row: Option<(i64, i64)>,
    kind: &str,
) -> Result<Target, AppError> {
    let (title, fields) = candidate_fields(kind).ok_or_else(|| {
        AppError::BadRequest(format!(
            "kind: must be datasheet, radial_sizing or axial_sizing (got '{kind}')"
        ))
    })?;
    let verb = if row.is_some() { "Edit" } else { "New" };
    Ok(Target {
        item: Item::Candidate,
        study_id,
        row,
        fields,
        kind: kind.into(),
        title: format!("{verb} candidate: {title}"),
    })
}

#[derive(Deserialize)]
pub(super) struct KindQuery {
    kind: String,
}

pub(super) async fn new_candidate(
    State(state): State<AppState>,
    Editor(user): Editor,
    Path(id): Path<i64>,
    Query(q): Query<KindQuery>,
) -> Result<Response, AppError> {
    let t = candidate_target(id, None, &q.kind)?;
    form_page(
        &state,
        &user,
        &t,
        &forms::defaults(t.fields),
        &Errors::new(),
        None,
    )
    .await
}

pub(super) async fn create_candidate(
    State(state): State<AppState>,
    Editor(user): Editor,
    Path(id): Path<i64>,
    Form(pairs): Form<Vec<(String, String)>>,
) -> Result<Response, AppError> {
    studies::get_study(&state.db, id).await?;
    let kind = pairs
        .iter()
        .find(|(k, _)| k == "candidate_kind")
        .map(|(_, v)| v.clone())
        .unwrap_or_default();
    let t = candidate_target(id, None, &kind)?;
    submit(
        &state,
        &user,
        t,
        json!({ "source": { "kind": kind } }),
        form_values(pairs),
    )
    .await
}

fn stored_kind(body: &Value) -> String {
    body.pointer("/source/kind")
        .and_then(Value::as_str)
        .unwrap_or("")
        .to_string()
}

pub(super) async fn edit_candidate(
    State(state): State<AppState>,
    Editor(user): Editor,
    Path((id, row)): Path<(i64, i64)>,
) -> Result<Response, AppError> {
    let stored = studies::get_item(&state.db, Item::Candidate, id, row).await?;
    let body = stored.json()?;
    let t = candidate_target(id, Some((row, stored.revision)), &stored_kind(&body))?;
    form_page(
        &state,
        &user,
        &t,
        &forms::values_from_json(t.fields, &body),
        &Errors::new(),
        None,
    )
    .await
}

pub(super) async fn update_candidate(
    State(state): State<AppState>,
    Editor(user): Editor,
    Path((id, row)): Path<(i64, i64)>,
    Form(pairs): Form<Vec<(String, String)>>,
) -> Result<Response, AppError> {
    let revision = form_revision(&pairs)?;
    let body = studies::get_item(&state.db, Item::Candidate, id, row)
        .await?
        .json()?;
    let t = candidate_target(id, Some((row, revision)), &stored_kind(&body))?;
    submit(&state, &user, t, body, form_values(pairs)).await
}

pub(super) async fn move_candidate(
    State(state): State<AppState>,
    Editor(user): Editor,
    Path((id, row)): Path<(i64, i64)>,
    Form(f): Form<MoveForm>,
) -> Result<Response, AppError> {
    move_row(&state, &user, Item::Candidate, id, row, &f).await
}

pub(super) async fn delete_candidate(
    State(state): State<AppState>,
    Editor(user): Editor,
    Path((id, row)): Path<(i64, i64)>,
    Form(pairs): Form<Vec<(String, String)>>,
) -> Result<Response, AppError> {
    delete_row(&state, &user, Item::Candidate, id, row, &pairs).await
}
