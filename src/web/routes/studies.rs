//! The studies list: new study, import a study file, duplicate.

use crate::web::routes::Routes;
use askama::Template;
use axum::extract::{Form, Path, State};
use axum::http::StatusCode;
use axum::response::{IntoResponse, Redirect, Response};
use axum::routing::{get, post};
use serde::Deserialize;

use super::common::{form_values, place_error};
use crate::engine::study::parse_study_str;
use crate::storage::studies::{self, StudyDoc, StudySummary};
use crate::web::AppState;
use crate::web::auth::{Editor, Viewer};
use crate::web::error::AppError;
use crate::web::fields::STUDY_HEADER;
use crate::web::forms::{self, Errors, FieldView, Values};
use crate::web::html::{HtmlTemplate, Nav};
use crate::web::validate::validate_doc;

pub fn router() -> Routes {
    Routes::new()
        .route("/", get(list_studies))
        .route("/studies", post(create_study))
        .route("/studies/import", post(import_study))
        .route("/studies/{id}/duplicate", post(duplicate_study))
}

#[derive(Template)]
#[template(path = "study/list.html")]
struct ListPage {
    nav: Nav,
    studies: Vec<StudySummary>,
    fields: Vec<FieldView>,
    new_error: Option<String>,
    import_text: String,
    import_error: Option<String>,
}

impl ListPage {
    async fn load(state: &AppState, nav: Nav) -> Result<Self, AppError> {
        Ok(ListPage {
            nav,
            studies: studies::list_studies(&state.db, None).await?,
            fields: forms::views(STUDY_HEADER, &forms::defaults(STUDY_HEADER), &Errors::new()),
            new_error: None,
            import_text: String::new(),
            import_error: None,
        })
    }
}

async fn list_studies(
    State(state): State<AppState>,
    Viewer(user): Viewer,
) -> Result<impl IntoResponse, AppError> {
    Ok(HtmlTemplate(ListPage::load(&state, Nav::of(&user)).await?))
}

/// A study document from the header form (name, notes, aircraft, installation).
pub fn header_doc(values: &Values, base: Option<&StudyDoc>) -> Result<StudyDoc, Errors> {
    let base_json = base.map(StudyDoc::to_file_json);
    let obj = forms::build_json(STUDY_HEADER, values, base_json.as_ref())?;
    let mut doc = StudyDoc::from_file_json(&obj)
        .map_err(|e| Errors::from([("name".into(), e.to_string())]))?;
    if let Some(b) = base {
        doc.segments = b.segments.clone();
        doc.candidates = b.candidates.clone();
    }
    Ok(doc)
}

async fn create_study(
    State(state): State<AppState>,
    Editor(user): Editor,
    Form(pairs): Form<Vec<(String, String)>>,
) -> Result<Response, AppError> {
    let values = form_values(pairs);
    let checked = header_doc(&values, None).and_then(|doc| match validate_doc(&doc) {
        Ok(_) => Ok(doc),
        Err(e) => {
            let (errs, general) = place_error(&e, "", STUDY_HEADER);
            Err(if errs.is_empty() {
                Errors::from([("name".into(), general.unwrap_or_default())])
            } else {
                errs
            })
        }
    });
    match checked {
        Ok(doc) => {
            let id = studies::insert_study(&state.db, &doc, &user.username).await?;
            Ok(Redirect::to(&format!("/studies/{id}")).into_response())
        }
        Err(errors) => {
            let mut page = ListPage::load(&state, Nav::of(&user)).await?;
            page.fields = forms::views(STUDY_HEADER, &values, &errors);
            page.new_error = Some("The study was not created: see the marked fields.".into());
            Ok((StatusCode::UNPROCESSABLE_ENTITY, HtmlTemplate(page)).into_response())
        }
    }
}

#[derive(Deserialize)]
struct ImportForm {
    study_json: String,
}

/// Stores a study file given as text; errors name the JSON path.
pub async fn import_text(
    state: &AppState,
    text: &str,
    by: &str,
) -> Result<Result<i64, String>, AppError> {
    let study = match parse_study_str(text) {
        Ok(s) => s,
        Err(e) => return Ok(Err(e.to_string())),
    };
    let value = serde_json::to_value(&study).map_err(|e| AppError::Internal(e.to_string()))?;
    let doc = StudyDoc::from_file_json(&value)?;
    Ok(Ok(studies::insert_study(&state.db, &doc, by).await?))
}

async fn import_study(
    State(state): State<AppState>,
    Editor(user): Editor,
    Form(form): Form<ImportForm>,
) -> Result<Response, AppError> {
    match import_text(&state, &form.study_json, &user.username).await? {
        Ok(id) => Ok(Redirect::to(&format!("/studies/{id}")).into_response()),
        Err(message) => {
            let mut page = ListPage::load(&state, Nav::of(&user)).await?;
            page.import_text = form.study_json;
            page.import_error = Some(message);
            Ok((StatusCode::UNPROCESSABLE_ENTITY, HtmlTemplate(page)).into_response())
        }
    }
}

async fn duplicate_study(
    State(state): State<AppState>,
    Editor(user): Editor,
    Path(id): Path<i64>,
) -> Result<Response, AppError> {
    let (_, mut doc) = studies::load_doc(&state.db, id).await?;
    doc.name = format!("{} (copy)", doc.name);
    let new_id = studies::insert_study(&state.db, &doc, &user.username).await?;
    Ok(Redirect::to(&format!("/studies/{new_id}")).into_response())
}
