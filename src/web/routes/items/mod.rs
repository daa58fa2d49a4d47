//! Create, edit, reorder and delete the rows of a study: mission segments and motor
//! candidates. Each save is validated with the whole study by the engine first;
//! on any error the form comes back with the input kept and nothing is stored.
//! This file holds the form machinery both kinds of row share; `segments` and
//! `candidates` hold the handlers.

mod candidates;
mod segments;

use crate::web::routes::Routes;
use askama::Template;
use axum::response::{IntoResponse, Redirect, Response};
use axum::routing::{get, post};
use serde::Deserialize;
use serde_json::Value;

use super::common::{form_revision, place_error};
use crate::storage::StorageError;
use crate::storage::studies::{self, Item, MoveDirection};
use crate::web::AppState;
use crate::web::auth::CurrentUser;
use crate::web::error::AppError;
use crate::web::forms::{self, Errors, Field, FieldView, Values};
use crate::web::html::{HtmlTemplate, Nav};
use crate::web::validate::validate_doc;

pub fn router() -> Routes {
    Routes::new()
        .route("/studies/{id}/segments/new", get(segments::new_segment))
        .route("/studies/{id}/segments", post(segments::create_segment))
        .route(
            "/studies/{id}/segments/{row}/edit",
            get(segments::edit_segment),
        )
        .route(
            "/studies/{id}/segments/{row}",
            post(segments::update_segment),
        )
        .route(
            "/studies/{id}/segments/{row}/move",
            post(segments::move_segment),
        )
        .route(
            "/studies/{id}/segments/{row}/delete",
            post(segments::delete_segment),
        )
        .route(
            "/studies/{id}/candidates/new",
            get(candidates::new_candidate),
        )
        .route(
            "/studies/{id}/candidates",
            post(candidates::create_candidate),
        )
        .route(
            "/studies/{id}/candidates/{row}/edit",
            get(candidates::edit_candidate),
        )
        .route(
            "/studies/{id}/candidates/{row}",
            post(candidates::update_candidate).get(super::candidate::show_candidate),
        )
        .route(
            "/studies/{id}/candidates/{row}/move",
            post(candidates::move_candidate),
        )
        .route(
            "/studies/{id}/candidates/{row}/delete",
            post(candidates::delete_candidate),
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
    /// After a stale save: the row as stored now (pretty JSON), beside the user's input.
    stored_now: Option<String>,
}

/// What a form is about: which list, which fields, and the row when editing.
pub(super) struct Target {
    pub(super) item: Item,
    pub(super) study_id: i64,
    pub(super) row: Option<(i64, i64)>,
    pub(super) fields: &'static [Field],
    pub(super) kind: String,
    pub(super) title: String,
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

pub(super) async fn form_page(
    state: &AppState,
    user: &CurrentUser,
    t: &Target,
    values: &Values,
    errors: &Errors,
    general: Option<String>,
) -> Result<Response, AppError> {
    form_page_with(state, user, t, values, errors, general, None).await
}

async fn form_page_with(
    state: &AppState,
    user: &CurrentUser,
    t: &Target,
    values: &Values,
    errors: &Errors,
    general: Option<String>,
    stored_now: Option<String>,
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
        stored_now,
    };
    Ok(HtmlTemplate(page).into_response())
}

/// A row changed by someone else since the form was loaded: its stored body now and
/// its current revision.
struct Stale {
    body: Value,
    revision: i64,
}

/// Why a save was refused: the field errors, a general message, and the row as
/// stored now when the form's revision was stale.
type Refusal = (Errors, Option<String>, Option<Stale>);

/// Validates the new body with the whole study, then stores it.
async fn save(
    state: &AppState,
    user: &CurrentUser,
    t: &Target,
    body: Value,
) -> Result<Result<(), Refusal>, AppError> {
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
        let (errors, general) = place_error(&e, &format!("{name}[{index}]"), t.fields);
        return Ok(Err((errors, general, None)));
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
        Err(e @ StorageError::Conflict { .. }) => {
            let (id, _) = t.row.ok_or(StorageError::NotFound { what: "row" })?;
            let now = studies::get_item(&state.db, t.item, t.study_id, id).await?;
            let stale = Stale {
                body: now.json()?,
                revision: now.revision,
            };
            let msg = format!(
                "Nothing was saved: this row was {e}. Your input is kept below beside the \
                 row as stored now (revision {}); saving again replaces the stored row.",
                now.revision
            );
            Ok(Err((Errors::new(), Some(msg), Some(stale))))
        }
        Err(e) => Err(e.into()),
    }
}

pub(super) async fn submit(
    state: &AppState,
    user: &CurrentUser,
    mut t: Target,
    base: Value,
    values: Values,
) -> Result<Response, AppError> {
    let outcome = match forms::build_json(t.fields, &values, Some(&base)) {
        Ok(body) => save(state, user, &t, body).await?,
        Err(errors) => Err((errors, None, None)),
    };
    match outcome {
        Ok(()) => Ok(Redirect::to(&format!("/studies/{}", t.study_id)).into_response()),
        Err((errors, general, stale)) => {
            let general =
                general.or_else(|| Some("Nothing was saved: see the marked fields.".into()));
            // A stale revision answers 409 with the stored row, and the form now carries
            // the current revision: saving again is a decision made on what is stored.
            let status = if stale.is_some() {
                axum::http::StatusCode::CONFLICT
            } else {
                axum::http::StatusCode::UNPROCESSABLE_ENTITY
            };
            let stored_now = match stale {
                Some(Stale { body, revision }) => {
                    t.row = t.row.map(|(id, _)| (id, revision));
                    Some(
                        serde_json::to_string_pretty(&body)
                            .map_err(|e| AppError::Internal(e.to_string()))?,
                    )
                }
                None => None,
            };
            let mut page =
                form_page_with(state, user, &t, &values, &errors, general, stored_now).await?;
            *page.status_mut() = status;
            Ok(page)
        }
    }
}

#[derive(Deserialize)]
pub(super) struct MoveForm {
    pub(super) direction: String,
    /// The row's revision on the page the move was made from.
    pub(super) revision: i64,
}

pub(super) async fn move_row(
    state: &AppState,
    user: &CurrentUser,
    item: Item,
    id: i64,
    row: i64,
    f: &MoveForm,
) -> Result<Response, AppError> {
    let dir = match f.direction.as_str() {
        "up" => MoveDirection::Up,
        "down" => MoveDirection::Down,
        other => {
            return Err(AppError::BadRequest(format!(
                "direction: must be up or down (got '{other}')"
            )));
        }
    };
    match studies::move_item(&state.db, item, id, row, f.revision, dir, &user.username).await {
        Ok(()) => {}
        Err(e @ StorageError::Conflict { .. }) => {
            let rows = studies::list_items(&state.db, item, id).await?;
            let (place, now) = rows
                .iter()
                .enumerate()
                .find(|(_, r)| r.id == row)
                .ok_or(StorageError::NotFound { what: "row" })?;
            return Err(AppError::Conflict(format!(
                "Nothing was moved: this row was {e}. It is now number {} of {}, at \
                 revision {}.",
                place + 1,
                rows.len(),
                now.revision
            )));
        }
        Err(e) => return Err(e.into()),
    }
    Ok(Redirect::to(&format!("/studies/{id}")).into_response())
}

pub(super) async fn delete_row(
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
