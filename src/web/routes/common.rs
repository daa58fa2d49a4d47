//! Helpers shared by the study, segment and candidate handlers: form values, mapping
//! engine errors to form fields, and loading a study for a page.

use serde_json::Value;

use crate::engine::error::InputError;
use crate::engine::study::Study;
use crate::storage::studies::{self, StudyDoc, StudyRow};
use crate::web::AppState;
use crate::web::error::AppError;
use crate::web::forms::{Errors, Field, Values, field_for_path};
use crate::web::scoring::Scored;
use crate::web::validate::validate_doc;

/// Hidden fields forms carry that are not part of the JSON object. Their names must
/// not collide with a field path: a segment has a `kind` of its own.
const CONTROL_FIELDS: [&str; 4] = ["csrf_token", "revision", "candidate_kind", "direction"];

/// Form pairs into values by field name (the last of repeated names wins).
pub fn form_values(pairs: Vec<(String, String)>) -> Values {
    pairs
        .into_iter()
        .filter(|(k, _)| !CONTROL_FIELDS.contains(&k.as_str()))
        .collect()
}

/// The `revision` control field as a number.
pub fn form_revision(pairs: &[(String, String)]) -> Result<i64, AppError> {
    pairs
        .iter()
        .find(|(k, _)| k == "revision")
        .and_then(|(_, v)| v.trim().parse().ok())
        .ok_or_else(|| AppError::BadRequest("revision: missing or not a whole number".into()))
}

/// Places an engine error beside its field when its path lies inside `prefix` (e.g.
/// `segments[2]`, or "" for the study root); otherwise returns it as a general message.
pub fn place_error(e: &InputError, prefix: &str, fields: &[Field]) -> (Errors, Option<String>) {
    let rel = if prefix.is_empty() {
        Some(e.path.as_str())
    } else {
        e.path
            .strip_prefix(prefix)
            .and_then(|r| r.strip_prefix('.').or(r.is_empty().then_some("")))
    };
    let mut errors = Errors::new();
    match rel.and_then(|r| field_for_path(fields, r)) {
        Some(name) => {
            errors.insert(name.to_string(), e.to_string());
            (errors, None)
        }
        None => (errors, Some(e.to_string())),
    }
}

/// A stored study with its reassembled document and, when valid and complete, the
/// engine's `Study`; `problem` says why there is none.
pub struct LoadedStudy {
    pub row: StudyRow,
    pub doc: StudyDoc,
    pub study: Option<Study>,
    pub problem: Option<String>,
}

pub async fn load_study(state: &AppState, id: i64) -> Result<LoadedStudy, AppError> {
    let (row, doc) = studies::load_doc(&state.db, id).await?;
    let (study, problem) = match validate_doc(&doc) {
        Ok(Some(s)) => (Some(s), None),
        Ok(None) => (
            None,
            Some("Add at least one mission segment and one candidate to see results.".into()),
        ),
        Err(e) => (None, Some(format!("This study does not validate: {e}"))),
    };
    Ok(LoadedStudy {
        row,
        doc,
        study,
        problem,
    })
}

/// Display text of a JSON number rounded to `decimals`, or "–".
pub fn num(v: Option<&Value>, decimals: usize) -> String {
    match v.and_then(Value::as_f64) {
        Some(x) => format!("{x:.decimals$}"),
        None => "–".into(),
    }
}

/// Display text of any JSON value for tables.
pub fn text(v: &Value) -> String {
    match v {
        Value::String(s) => s.clone(),
        Value::Null => "–".into(),
        Value::Number(n) => match n.as_f64() {
            Some(x) if x.fract() != 0.0 => format!("{}", (x * 1e6).round() / 1e6),
            _ => n.to_string(),
        },
        Value::Bool(b) => {
            if *b {
                "yes".into()
            } else {
                "no".into()
            }
        }
        other => other.to_string(),
    }
}

/// A stored study with its results, for the pages that need results to show anything
/// (exports, compare, trade); a study that cannot be scored yet is a 409 naming why.
pub async fn scored_study(
    state: &AppState,
    id: i64,
) -> Result<(LoadedStudy, std::sync::Arc<Scored>), AppError> {
    let loaded = load_study(state, id).await?;
    let Some(study) = &loaded.study else {
        let why = loaded.problem.clone().unwrap_or_default();
        return Err(AppError::Conflict(format!("No results yet. {why}")));
    };
    let scored = state.results.results(study).await?;
    Ok((loaded, scored))
}
