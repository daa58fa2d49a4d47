//! Create, edit, reorder and delete the rows of a study: mission segments and motor
//! candidates. Each save is validated with the whole study by the engine first;
//! on any error the form comes back with the input kept and nothing is stored.

use askama::Template;
use axum::Router;
use axum::extract::{Form, Path, Query, State};
use axum::response::{IntoResponse, Redirect, Response};
use axum::routing::{get, post};
use serde::Deserialize;
use serde_json::{Value, json};

use super::common::{form_revision, form_values, place_error};
use crate::storage::StorageError;
use crate::storage::studies::{self, Item, MoveDirection};
use crate::web::AppState;
use crate::web::auth::{CurrentUser, Editor};
use crate::web::error::AppError;
use crate::web::fields::{SEGMENT, candidate_fields};
use crate::web::forms::{self, Errors, Field, FieldView, Values};
use crate::web::html::{HtmlTemplate, Nav};
use crate::web::validate::validate_doc;

pub fn router() -> Router<AppState> {
    Router::new()
        .route("/studies/{id}/segments/new", get(new_segment))
        .route("/studies/{id}/segments", post(create_segment))
        .route("/studies/{id}/segments/{row}/edit", get(edit_segment))
        .route("/studies/{id}/segments/{row}", post(update_segment))
        .route("/studies/{id}/segments/{row}/move", post(move_segment))
        .route("/studies/{id}/segments/{row}/delete", post(delete_segment))
        .route("/studies/{id}/candidates/new", get(new_candidate))
        .route("/studies/{id}/candidates", post(create_candidate))
        .route("/studies/{id}/candidates/{row}/edit", get(edit_candidate))
        .route(
            "/studies/{id}/candidates/{row}",
            post(update_candidate).get(super::candidate::show_candidate),
        )
        .route("/studies/{id}/candidates/{row}/move", post(move_candidate))
        .route(
            "/studies/{id}/candidates/{row}/delete",
            post(delete_candidate),
        )
}

#[derive(Template)]
#[template(path = "study/item_form.html")]
struct ItemFormPage {
    nav: Nav,
    study_id: i64,
    study_name: String,
    title: String,
    action: String,
    revision: Option<i64>,
    kind: String,
    fields: Vec<FieldView>,
    general_error: Option<String>,
}

/// What a form is about: which list, which fields, and the row when editing.
struct Target {
    item: Item,
    study_id: i64,
    row: Option<(i64, i64)>,
    fields: &'static [Field],
    kind: String,
    title: String,
}

impl Target {
    fn action(&self) -> String {
        let list = if self.item == Item::Segment {
            "segments"
        } else {
            "candidates"
        };
        match self.row {
            Some((id, _)) => format!("/studies/{}/{list}/{id}", self.study_id),
            None => format!("/studies/{}/{list}", self.study_id),
        }
    }
}

async fn form_page(
    state: &AppState,
    user: &CurrentUser,
    t: &Target,
    values: &Values,
    errors: &Errors,
    general: Option<String>,
) -> Result<Response, AppError> {
    let study = studies::get_study(&state.db, t.study_id).await?;
    let page = ItemFormPage {
        nav: Nav::of(user),
        study_id: t.study_id,
        study_name: study.name,
        title: t.title.clone(),
        action: t.action(),
        revision: t.row.map(|(_, rev)| rev),
        kind: t.kind.clone(),
        fields: forms::views(t.fields, values, errors),
        general_error: general,
    };
    Ok(HtmlTemplate(page).into_response())
}

/// Validates the new body with the whole study, then stores it.
async fn save(
    state: &AppState,
    user: &CurrentUser,
    t: &Target,
    body: Value,
) -> Result<Result<(), (Errors, Option<String>)>, AppError> {
    let (_, mut doc) = studies::load_doc(&state.db, t.study_id).await?;
    let rows = studies::list_items(&state.db, t.item, t.study_id).await?;
    let (list, name) = match t.item {
        Item::Segment => (&mut doc.segments, "segments"),
        Item::Candidate => (&mut doc.candidates, "candidates"),
    };
    let index = match t.row {
        Some((id, _)) => rows
            .iter()
            .position(|r| r.id == id)
            .ok_or(StorageError::NotFound { what: "row" })?,
        None => list.len(),
    };
    if index < list.len() {
        list[index] = body.clone();
    } else {
        list.push(body.clone());
    }
    if let Err(e) = validate_doc(&doc) {
        return Ok(Err(place_error(&e, &format!("{name}[{index}]"), t.fields)));
    }
    let stored = match t.row {
        Some((id, rev)) => studies::update_item(
            &state.db,
            t.item,
            t.study_id,
            id,
            rev,
            &body,
            &user.username,
        )
        .await
        .map(drop),
        None => studies::insert_item(&state.db, t.item, t.study_id, &body, &user.username)
            .await
            .map(drop),
    };
    match stored {
        Ok(()) => Ok(Ok(())),
        Err(e @ StorageError::Conflict { .. }) => Ok(Err((Errors::new(), Some(e.to_string())))),
        Err(e) => Err(e.into()),
    }
}

async fn submit(
    state: &AppState,
    user: &CurrentUser,
    t: Target,
    base: Value,
    values: Values,
) -> Result<Response, AppError> {
    let outcome = match forms::build_json(t.fields, &values, Some(&base)) {
        Ok(body) => save(state, user, &t, body).await?,
        Err(errors) => Err((errors, None)),
    };
    match outcome {
        Ok(()) => Ok(Redirect::to(&format!("/studies/{}", t.study_id)).into_response()),
        Err((errors, general)) => {
            let general =
                general.or_else(|| Some("Nothing was saved: see the marked fields.".into()));
            form_page(state, user, &t, &values, &errors, general).await
        }
    }
}

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

async fn new_segment(
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

async fn create_segment(
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

async fn edit_segment(
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

async fn update_segment(
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
struct KindQuery {
    kind: String,
}

async fn new_candidate(
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

async fn create_candidate(
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

async fn edit_candidate(
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

async fn update_candidate(
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

#[derive(Deserialize)]
struct MoveForm {
    direction: String,
}

async fn move_row(
    state: &AppState,
    user: &CurrentUser,
    item: Item,
    id: i64,
    row: i64,
    dir: &str,
) -> Result<Response, AppError> {
    let dir = match dir {
        "up" => MoveDirection::Up,
        "down" => MoveDirection::Down,
        other => {
            return Err(AppError::BadRequest(format!(
                "direction: must be up or down (got '{other}')"
            )));
        }
    };
    studies::move_item(&state.db, item, id, row, dir, &user.username).await?;
    Ok(Redirect::to(&format!("/studies/{id}")).into_response())
}

async fn move_segment(
    State(state): State<AppState>,
    Editor(user): Editor,
    Path((id, row)): Path<(i64, i64)>,
    Form(f): Form<MoveForm>,
) -> Result<Response, AppError> {
    move_row(&state, &user, Item::Segment, id, row, &f.direction).await
}

async fn move_candidate(
    State(state): State<AppState>,
    Editor(user): Editor,
    Path((id, row)): Path<(i64, i64)>,
    Form(f): Form<MoveForm>,
) -> Result<Response, AppError> {
    move_row(&state, &user, Item::Candidate, id, row, &f.direction).await
}

async fn delete_row(
    state: &AppState,
    user: &CurrentUser,
    item: Item,
    id: i64,
    row: i64,
    pairs: &[(String, String)],
) -> Result<Response, AppError> {
    let revision = form_revision(pairs)?;
    studies::delete_item(&state.db, item, id, row, revision, &user.username).await?;
    Ok(Redirect::to(&format!("/studies/{id}")).into_response())
}

async fn delete_segment(
    State(state): State<AppState>,
    Editor(user): Editor,
    Path((id, row)): Path<(i64, i64)>,
    Form(pairs): Form<Vec<(String, String)>>,
) -> Result<Response, AppError> {
    delete_row(&state, &user, Item::Segment, id, row, &pairs).await
}

async fn delete_candidate(
    State(state): State<AppState>,
    Editor(user): Editor,
    Path((id, row)): Path<(i64, i64)>,
    Form(pairs): Form<Vec<(String, String)>>,
) -> Result<Response, AppError> {
    delete_row(&state, &user, Item::Candidate, id, row, &pairs).await
}
