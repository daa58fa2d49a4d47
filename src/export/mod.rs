//! Exports of engine results as CSV over any `std::io::Write`: pure functions of the
//! results, shared by the web and the command line, and the datasheet-candidate CSV
//! that comes the other way. No database, no HTTP, no files.
//! Every CSV has exactly one header row and no comment lines; units ride in the
//! column names; quoting follows RFC 4180 (CRLF line ends); text is UTF-8 without BOM.

mod candidates;
pub mod number;
mod robustness;
mod segments;
mod summary;

pub use candidates::{
    RowError, TEMPLATE_COLUMNS, read_datasheet_candidates, write_candidate_template,
};
pub use robustness::write_robustness_csv;
pub use segments::{SEGMENT_COLUMNS, write_segments_csv};
pub use summary::{summary_columns, write_summary_csv};

use serde_json::Value;

/// A CSV writer with the project's dialect.
fn writer<W: std::io::Write>(out: W) -> csv::Writer<W> {
    csv::WriterBuilder::new()
        .terminator(csv::Terminator::CRLF)
        .from_writer(out)
}

/// The text of a result value in a cell: numbers in full precision (they parse back to
/// the same `f64`), `true`/`false`, text as is, and null as an empty cell.
fn cell(v: &Value) -> String {
    match v {
        Value::Null => String::new(),
        Value::Bool(b) => b.to_string(),
        Value::String(s) => s.clone(),
        Value::Number(n) => match (n.as_i64(), n.as_f64()) {
            (Some(i), _) => i.to_string(),
            (None, Some(x)) => x.to_string(),
            (None, None) => n.to_string(),
        },
        other => other.to_string(),
    }
}

/// A result object as JSON, so that every column is read by its result-format key.
fn as_object<T: serde::Serialize>(row: &T) -> csv::Result<serde_json::Map<String, Value>> {
    match serde_json::to_value(row) {
        Ok(Value::Object(m)) => Ok(m),
        Ok(_) => Err(std::io::Error::other("result row is not an object").into()),
        Err(e) => Err(std::io::Error::other(e).into()),
    }
}

/// The cell of `key`; a key the results do not have is a programming error, reported
/// rather than written as a silent blank.
fn field(obj: &serde_json::Map<String, Value>, key: &str) -> csv::Result<String> {
    obj.get(key)
        .map(cell)
        .ok_or_else(|| std::io::Error::other(format!("results have no field '{key}'")).into())
}
