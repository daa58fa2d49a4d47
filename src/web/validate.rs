//! Checks a whole study before anything is stored. A complete study (at least one
//! segment and one candidate) goes through the engine's `parse_study`, which also
//! checks cross-row rules; a study still being built has each part checked alone.

use std::collections::HashSet;

use serde_json::Value;

use crate::engine::error::InputError;
use crate::engine::reader::Obj;
use crate::engine::study::{self, Study};
use crate::storage::studies::StudyDoc;

fn err(path: String, message: impl Into<String>) -> InputError {
    InputError {
        path,
        message: message.into(),
    }
}

/// Whether the study has the rows it needs to be scored.
pub fn is_complete(doc: &StudyDoc) -> bool {
    !doc.segments.is_empty() && !doc.candidates.is_empty()
}

/// The validated study when complete, `None` when valid but still incomplete.
pub fn validate_doc(doc: &StudyDoc) -> Result<Option<Study>, InputError> {
    if is_complete(doc) {
        return study::parse_study(&doc.to_file_json()).map(Some);
    }
    check_header_text(doc)?;
    study::parse_aircraft(&doc.aircraft, "aircraft")?;
    if let Some(inst) = &doc.installation {
        check_installation(inst)?;
    }
    check_rows(&doc.segments, "segments", |v, p| {
        study::parse_segment(v, p).map(drop)
    })?;
    check_rows(&doc.candidates, "candidates", |v, p| {
        study::parse_candidate(v, p).map(drop)
    })?;
    Ok(None)
}

/// The study file's limits on the name and the notes (as for a complete study).
const MAX_NAME: usize = 200;
const MAX_NOTES: usize = 20_000;

/// The name and notes of a study still being built, by the engine's reader: the same
/// rules (non-empty, no control characters, bounded length) as for a complete study.
fn check_header_text(doc: &StudyDoc) -> Result<(), InputError> {
    let header = serde_json::json!({ "name": doc.name, "notes": doc.notes });
    let mut o = Obj::new(&header, "")?;
    o.req_name("name", MAX_NAME)?;
    o.opt_str("notes", MAX_NOTES)?;
    Ok(())
}

fn check_rows(
    rows: &[Value],
    list: &str,
    parse: impl Fn(&Value, &str) -> Result<(), InputError>,
) -> Result<(), InputError> {
    let mut seen = HashSet::new();
    for (i, row) in rows.iter().enumerate() {
        let path = format!("{list}[{i}]");
        parse(row, &path)?;
        let name = row.get("name").and_then(Value::as_str).unwrap_or("");
        if !seen.insert(name.to_string()) {
            return Err(err(
                format!("{path}.name"),
                format!("must be unique in the study ('{name}' is used twice)"),
            ));
        }
    }
    Ok(())
}

/// The installation envelope of a study still being built (the engine checks it again
/// with the whole study once it is complete).
fn check_installation(inst: &Value) -> Result<(), InputError> {
    let Some(obj) = inst.as_object() else {
        return Err(err("installation".into(), "must be an object"));
    };
    for (k, v) in obj {
        if k != "max_diameter_m" && k != "max_length_m" {
            return Err(err(format!("installation.{k}"), "unknown field"));
        }
        match v.as_f64() {
            Some(x) if x > 0.0 && x.is_finite() => {}
            _ => {
                return Err(err(
                    format!("installation.{k}"),
                    format!("must be > 0 (got {v})"),
                ));
            }
        }
    }
    Ok(())
}
