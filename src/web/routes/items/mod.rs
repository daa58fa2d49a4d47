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

/// Why a save was refused: the field errors, a general message, and whether the row
/// was changed by someone else since the form was loaded (a stale revision).
type Refusal = (Errors, Option<String>, bool);

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
        return Ok(Err((errors, general, false)));
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
            Ok(Err((Errors::new(), Some(e.to_string()), true)))
        }
        Err(e) => Err(e.into()),
    }
}

pub(super) async fn submit(
    state: &AppState,
    user: &CurrentUser,
    t: Target,
    base: Value,
    values: Values,
) -> Result<Response, AppError> {
    let outcome = match forms::build_json(t.fields, &values, Some(&base)) {
        Ok(body) => save(state, user, &t, body).await?,
        Err(errors) => Err((errors, None, false)),
    };
    match outcome {
        Ok(()) => Ok(Redirect::to(&format!("/studies/{}", t.study_id)).into_response()),
        Err((errors, general, stale)) => {
            let general =
                general.or_else(|| Some("Nothing was saved: see the marked fields.".into()));
            let mut page = form_page(state, user, &t, &values, &errors, general).await?;
            // A stale revision answers 409; a form re-shown with its errors 422.
            *page.status_mut() = if stale {
                axum::http::StatusCode::CONFLICT
            } else {
                axum::http::StatusCode::UNPROCESSABLE_ENTITY
            };
            Ok(page)
        }
    }
}

#[derive(Deserialize)]
pub(super) struct MoveForm {
    pub(super) direction: String,
}

pub(super) async fn move_row(
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
