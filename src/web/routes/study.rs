//! The study page: aircraft form, mission segment table (with each row's computed
//! duration and power) and the candidate table with key results.

use crate::web::routes::Routes;
use askama::Template;
use axum::extract::{Form, Path, State};
use axum::http::StatusCode;
use axum::response::{IntoResponse, Redirect, Response};
use axum::routing::get;
use serde_json::Value;

use super::common::{LoadedStudy, form_revision, form_values, load_study, num, place_error};
use crate::engine::ENGINE_VERSION;
use crate::engine::mission::segment_preview;
use crate::storage::StorageError;
use crate::storage::studies::{self, StudyDoc};
use crate::web::AppState;
use crate::web::auth::{CurrentUser, Editor, Viewer};
use crate::web::error::AppError;
use crate::web::fields::{STUDY_HEADER, candidate_fields};
use crate::web::forms::{self, Errors, FieldView, Values};
use crate::web::html::{HtmlTemplate, Nav};
use crate::web::validate::validate_doc;

pub fn router() -> Routes {
    Routes::new().route("/studies/{id}", get(show_study).post(update_study))
}

pub struct SegmentLine {
    pub id: i64,
    pub revision: i64,
    pub name: String,
    pub kind: String,
    pub rule: String,
    pub duration: String,
    pub power: String,
    pub prop_rpm: String,
    pub oei: bool,
}

pub struct CandidateLine {
    pub id: i64,
    pub revision: i64,
    pub name: String,
    pub kind: String,
    pub feasible: &'static str,
    pub binding: String,
    pub motor_mass: String,
    pub propulsion_mass: String,
    pub takeoff_mass: String,
    pub energy: String,
    pub efficiency: String,
    pub score: String,
    pub rank: String,
}

#[derive(Template)]
#[template(path = "study/show.html")]
struct StudyPage {
    nav: Nav,
    id: i64,
    name: String,
    revision: i64,
    updated_by: String,
    updated_at: String,
    problem: Option<String>,
    header_error: Option<String>,
    /// After a stale save: the study's own fields as stored now (pretty JSON).
    stored_now: Option<String>,
    fields: Vec<FieldView>,
    preview_mass: String,
    segments: Vec<SegmentLine>,
    candidates: Vec<CandidateLine>,
    moves: Vec<(&'static str, &'static str)>,
    engine_version: &'static str,
}

fn str_at<'a>(v: &'a Value, path: &[&str]) -> &'a str {
    path.iter()
        .try_fold(v, |cur, k| cur.get(*k))
        .and_then(Value::as_str)
        .unwrap_or("")
}

async fn segment_lines(
    state: &AppState,
    loaded: &LoadedStudy,
) -> Result<(Vec<SegmentLine>, String), AppError> {
    let rows = studies::list_items(&state.db, studies::Item::Segment, loaded.row.id).await?;
    let mtom = loaded
        .doc
        .aircraft
        .get("max_takeoff_mass_kg")
        .and_then(Value::as_f64);
    let preview = match (&loaded.study, mtom) {
        (Some(study), Some(m)) => segment_preview(study, m),
        _ => Vec::new(),
    };
    let mut lines = Vec::new();
    for (i, row) in rows.iter().enumerate() {
        let body = row.json()?;
        let p = preview.get(i);
        lines.push(SegmentLine {
            id: row.id,
            revision: row.revision,
            name: str_at(&body, &["name"]).to_string(),
            kind: str_at(&body, &["kind"]).to_string(),
            rule: str_at(&body, &["power", "rule"]).to_string(),
            duration: p
                .map(|p| format!("{:.0}", p.duration_s))
                .unwrap_or_else(|| "–".into()),
            power: p
                .map(|p| format!("{:.1}", p.shaft_power_kw))
                .unwrap_or_else(|| "–".into()),
            prop_rpm: num(body.get("prop_speed_rpm"), 0),
            oei: body.get("oei").and_then(Value::as_bool).unwrap_or(false),
        });
    }
    let label = mtom
        .map(|m| format!("the max takeoff mass, {m:.0} kg"))
        .unwrap_or_else(|| "–".into());
    Ok((lines, label))
}

async fn candidate_lines(
    state: &AppState,
    loaded: &LoadedStudy,
) -> Result<Vec<CandidateLine>, AppError> {
    let rows = studies::list_items(&state.db, studies::Item::Candidate, loaded.row.id).await?;
    let results = match &loaded.study {
        Some(study) => Some(state.results.results(study).await?),
        None => None,
    };
    let mut lines = Vec::new();
    for (i, row) in rows.iter().enumerate() {
        let body = row.json()?;
        let r = results
            .as_ref()
            .and_then(|r| r.json.get("candidates"))
            .and_then(|c| c.get(i));
        let g = |k: &str, d: usize| num(r.and_then(|r| r.get(k)), d);
        let kind = str_at(&body, &["source", "kind"]);
        lines.push(CandidateLine {
            id: row.id,
            revision: row.revision,
            name: str_at(&body, &["name"]).to_string(),
            kind: candidate_fields(kind)
                .map(|(t, _)| t)
                .unwrap_or(kind)
                .to_string(),
            feasible: match r.and_then(|r| r.get("feasible")).and_then(Value::as_bool) {
                Some(true) => "yes",
                Some(false) => "no",
                None => "",
            },
            binding: r
                .and_then(|r| r.get("binding_constraint"))
                .and_then(Value::as_str)
                .unwrap_or("–")
                .to_string(),
            motor_mass: g("motor_mass_kg", 1),
            propulsion_mass: g("propulsion_mass_kg", 1),
            takeoff_mass: g("takeoff_mass_kg", 0),
            energy: g("mission_energy_kwh", 2),
            efficiency: g("mission_motor_efficiency", 3),
            score: g("trade_score", 3),
            rank: r
                .and_then(|r| r.get("rank"))
                .and_then(Value::as_u64)
                .map(|n| n.to_string())
                .unwrap_or_else(|| "–".into()),
        });
    }
    Ok(lines)
}

async fn render(
    state: &AppState,
    user: &CurrentUser,
    loaded: LoadedStudy,
    form: Option<(Values, Errors, Option<String>)>,
    stored_now: Option<String>,
) -> Result<Response, AppError> {
    let (segments, preview_mass) = segment_lines(state, &loaded).await?;
    let candidates = candidate_lines(state, &loaded).await?;
    let (values, errors, header_error) = form.unwrap_or_else(|| {
        (
            forms::values_from_json(STUDY_HEADER, &loaded.doc.to_file_json()),
            Errors::new(),
            None,
        )
    });
    let page = StudyPage {
        nav: Nav::of(user),
        id: loaded.row.id,
        name: loaded.row.name.clone(),
        revision: loaded.row.revision,
        updated_by: loaded.row.updated_by.clone(),
        updated_at: loaded.row.updated_at.clone(),
        problem: loaded.problem.clone(),
        header_error,
        stored_now,
        fields: forms::views(STUDY_HEADER, &values, &errors),
        preview_mass,
        segments,
        candidates,
        moves: vec![("up", "↑"), ("down", "↓")],
        engine_version: ENGINE_VERSION,
    };
    Ok(HtmlTemplate(page).into_response())
}

async fn show_study(
    State(state): State<AppState>,
    Viewer(user): Viewer,
    Path(id): Path<i64>,
) -> Result<Response, AppError> {
    let loaded = load_study(&state, id).await?;
    render(&state, &user, loaded, None, None).await
}

fn checked_header(values: &Values, base: &StudyDoc) -> Result<StudyDoc, (Errors, Option<String>)> {
    let doc = super::studies::header_doc(values, Some(base)).map_err(|e| (e, None))?;
    match validate_doc(&doc) {
        Ok(_) => Ok(doc),
        Err(e) => Err(place_error(&e, "", STUDY_HEADER)),
    }
}

async fn update_study(
    State(state): State<AppState>,
    Editor(user): Editor,
    Path(id): Path<i64>,
    Form(pairs): Form<Vec<(String, String)>>,
) -> Result<Response, AppError> {
    let revision = form_revision(&pairs)?;
    let values = form_values(pairs);
    let loaded = load_study(&state, id).await?;
    let (failure, status) = match checked_header(&values, &loaded.doc) {
        Ok(doc) => {
            match studies::update_study_header(&state.db, id, revision, &doc, &user.username).await
            {
                Ok(_) => return Ok(Redirect::to(&format!("/studies/{id}")).into_response()),
                Err(e @ StorageError::Conflict { .. }) => {
                    let msg = format!(
                        "Nothing was saved: this study was {e}. Your input is kept in the \
                         form beside the study as stored now; saving again replaces it."
                    );
                    ((Errors::new(), Some(msg)), StatusCode::CONFLICT)
                }
                Err(e) => return Err(e.into()),
            }
        }
        // The form re-shown with its errors beside the fields.
        Err(f) => (f, StatusCode::UNPROCESSABLE_ENTITY),
    };
    let general = failure
        .1
        .or_else(|| Some("Nothing was saved: see the marked fields.".into()));
    // On a conflict, the study is read again: the page shows (and its form carries the
    // revision of) what is stored now, not what was read before the save was tried.
    let (loaded, stored_now) = if status == StatusCode::CONFLICT {
        let loaded = load_study(&state, id).await?;
        let mut header = loaded.doc.to_file_json();
        if let Some(obj) = header.as_object_mut() {
            obj.remove("segments");
            obj.remove("candidates");
        }
        let pretty =
            serde_json::to_string_pretty(&header).map_err(|e| AppError::Internal(e.to_string()))?;
        (loaded, Some(pretty))
    } else {
        (loaded, None)
    };
    let form = Some((values, failure.0, general));
    let mut page = render(&state, &user, loaded, form, stored_now).await?;
    *page.status_mut() = status;
    Ok(page)
}
