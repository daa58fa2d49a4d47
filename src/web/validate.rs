//! Checks a whole study before anything is stored. A complete study (at least one
//! segment and one candidate) goes through the engine's `parse_study`, which also
//! checks cross-row rules; a study still being built has each part checked alone.

use std::collections::HashSet;

use serde_json::Value;

use crate::engine::error::InputError;
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
    if doc.name.trim().is_empty() {
        return Err(err("name".into(), "must not be empty"));
    }
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
