//! Handlers of the mission segment rows: new and edit forms, save, move, delete.

use axum::extract::{Form, Path, State};
use axum::response::Response;
use serde_json::json;

use super::{MoveForm, Target, delete_row, form_page, move_row, submit};
use crate::storage::studies::{self, Item};
use crate::web::AppState;
use crate::web::auth::Editor;
use crate::web::error::AppError;
use crate::web::fields::SEGMENT;
use crate::web::forms::{self, Errors};
use crate::web::routes::common::{form_revision, form_values};

fn segment_target(study_id: i64, row: Option<(i64, i64)>) -> Target {
    let title = if row.is_some() {
        "Edit mission segment"
    } else {
        "New mission segment"
    };
    Target {
        item: Item::Segment,
        study_id,
        row,
        fields: SEGMENT,
        kind: String::new(),
        title: title.into(),
    }
}

pub(super) async fn new_segment(
    State(state): State<AppState>,
    Editor(user): Editor,
    Path(id): Path<i64>,
) -> Result<Response, AppError> {
    let t = segment_target(id, None);
    form_page(
        &state,
        &user,
        &t,
        &forms::defaults(SEGMENT),
        &Errors::new(),
        None,
    )
    .await
}

pub(super) async fn create_segment(
    State(state): State<AppState>,
    Editor(user): Editor,
    Path(id): Path<i64>,
    Form(pairs): Form<Vec<(String, String)>>,
) -> Result<Response, AppError> {
    studies::get_study(&state.db, id).await?;
    submit(
        &state,
        &user,
        segment_target(id, None),
        json!({}),
        form_values(pairs),
    )
    .await
}

pub(super) async fn edit_segment(
    State(state): State<AppState>,
    Editor(user): Editor,
    Path((id, row)): Path<(i64, i64)>,
) -> Result<Response, AppError> {
    let stored = studies::get_item(&state.db, Item::Segment, id, row).await?;
    let t = segment_target(id, Some((row, stored.revision)));
    form_page(
        &state,
        &user,
        &t,
        &forms::values_from_json(SEGMENT, &stored.json()?),
        &Errors::new(),
        None,
    )
    .await
}

pub(super) async fn update_segment(
    State(state): State<AppState>,
    Editor(user): Editor,
    Path((id, row)): Path<(i64, i64)>,
    Form(pairs): Form<Vec<(String, String)>>,
) -> Result<Response, AppError> {
    let revision = form_revision(&pairs)?;
    let stored = studies::get_item(&state.db, Item::Segment, id, row).await?;
    submit(
        &state,
        &user,
        segment_target(id, Some((row, revision))),
        stored.json()?,
        form_values(pairs),
    )
    .await
}

pub(super) async fn move_segment(
    State(state): State<AppState>,
    Editor(user): Editor,
    Path((id, row)): Path<(i64, i64)>,
    Form(f): Form<MoveForm>,
) -> Result<Response, AppError> {
    move_row(&state, &user, Item::Segment, id, row, &f).await
}

pub(super) async fn delete_segment(
    State(state): State<AppState>,
    Editor(user): Editor,
    Path((id, row)): Path<(i64, i64)>,
    Form(pairs): Form<Vec<(String, String)>>,
) -> Result<Response, AppError> {
    delete_row(&state, &user, Item::Segment, id, row, &pairs).await
}
