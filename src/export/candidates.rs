//! Datasheet candidates as CSV: the template an engineer fills in (one motor a row) and
//! the reader that turns the filled-in file into study-format candidates. Every row is
//! checked by the engine's `parse_candidate`; any bad row means no candidates at all.

use std::io::Write;

use serde_json::{Map, Value, json};

use crate::engine::study::parse_candidate;

/// Columns of the template: the candidate's name, its gear ratio, then the datasheet
/// source fields of the study format (blank cells take the engine's defaults).
pub const TEMPLATE_COLUMNS: [&str; 20] = [
    "name",
    "gear_ratio",
    "topology",
    "mass_kg",
    "continuous_power_kw",
    "continuous_speed_rpm",
    "peak_power_kw",
    "peak_duration_s",
    "max_speed_rpm",
    "continuous_efficiency",
    "data_winding_temp_c",
    "insulation_class",
    "thermal_time_constant_s",
    "rated_ambient_c",
    "peak_torque_nm",
    "rotor_inertia_kg_m2",
    "envelope_diameter_m",
    "envelope_length_m",
    "torque_constant_nm_per_a",
    "hot_spot_allowance_k",
];

/// Columns whose cells are text; every other column is a number.
const TEXT_COLUMNS: [&str; 3] = ["name", "topology", "insulation_class"];

/// One refused cell or row: the line of the file (the header is line 1), the column
/// (empty when the row as a whole is wrong) and why.
#[derive(Debug, Clone, PartialEq)]
pub struct RowError {
    pub line: usize,
    pub column: String,
    pub message: String,
}

/// Writes the template: the header and one example row (an invented motor).
pub fn write_candidate_template(out: impl Write) -> csv::Result<()> {
    let mut w = super::writer(out);
    w.write_record(TEMPLATE_COLUMNS)?;
    w.write_record([
        "Example 50 kW radial (replace me)",
        "1",
        "radial",
        "20",
        "50",
        "2400",
        "100",
        "120",
        "3000",
        "0.95",
        "",
        "H",
        "600",
        "",
        "",
        "",
        "",
        "",
        "",
        "",
    ])?;
    w.flush()?;
    Ok(())
}

fn err(line: usize, column: &str, message: impl Into<String>) -> RowError {
    RowError {
        line,
        column: column.to_string(),
        message: message.into(),
    }
}

/// The candidate JSON of one row, or the cells that are not even numbers.
fn row_json(
    header: &[String],
    rec: &csv::StringRecord,
    line: usize,
) -> Result<Value, Vec<RowError>> {
    let mut source = Map::new();
    source.insert("kind".into(), json!("datasheet"));
    let mut cand = Map::new();
    let mut errors = Vec::new();
    for (col, raw) in header.iter().zip(rec.iter()) {
        let raw = raw.trim();
        if raw.is_empty() {
            continue;
        }
        let value = if TEXT_COLUMNS.contains(&col.as_str()) {
            json!(raw)
        } else {
            match raw.parse::<f64>() {
                Ok(x) if x.is_finite() => json!(x),
                _ => {
                    errors.push(err(line, col, format!("must be a number (got '{raw}')")));
                    continue;
                }
            }
        };
        match col.as_str() {
            "name" => cand.insert("name".into(), value),
            "gear_ratio" => cand.insert("drive".into(), json!({ "gear_ratio": value })),
            _ => source.insert(col.clone(), value),
        };
    }
    cand.insert("source".into(), Value::Object(source));
    if errors.is_empty() {
        Ok(Value::Object(cand))
    } else {
        Err(errors)
    }
}

/// The template column an engine error path (`source.mass_kg`, `drive.gear_ratio`, …)
/// belongs to.
fn column_of(rel_path: &str) -> String {
    let field = rel_path
        .strip_prefix("source.")
        .or_else(|| rel_path.strip_prefix("drive."))
        .unwrap_or(rel_path);
    let field = field.split(['.', '[']).next().unwrap_or("");
    if TEMPLATE_COLUMNS.contains(&field) {
        field.to_string()
    } else {
        String::new()
    }
}

fn check_header(header: &[String]) -> Result<(), Vec<RowError>> {
    let unknown: Vec<RowError> = header
        .iter()
        .filter(|h| !TEMPLATE_COLUMNS.contains(&h.as_str()))
        .map(|h| err(1, h, "unknown column; the template lists the allowed ones"))
        .collect();
    if !unknown.is_empty() {
        return Err(unknown);
    }
    if !header.iter().any(|h| h == "name") {
        return Err(vec![err(1, "name", "the header must have a name column")]);
    }
    Ok(())
}

/// Reads a filled-in template into study-format candidates, each validated by the
/// engine, with names unique within the file. All rows or, on any error, every error.
pub fn read_datasheet_candidates(text: &str) -> Result<Vec<Value>, Vec<RowError>> {
    let mut reader = csv::ReaderBuilder::new()
        .flexible(false)
        .from_reader(text.trim_start_matches('\u{feff}').as_bytes());
    let header: Vec<String> = match reader.headers() {
        Ok(h) => h.iter().map(|c| c.trim().to_string()).collect(),
        Err(e) => return Err(vec![err(1, "", format!("not readable as CSV: {e}"))]),
    };
    check_header(&header)?;
    let mut out = Vec::new();
    let mut errors = Vec::new();
    let mut names = std::collections::HashSet::new();
    for (i, rec) in reader.records().enumerate() {
        let line = i + 2;
        let rec = match rec {
            Ok(r) => r,
            Err(e) => {
                errors.push(err(line, "", format!("not readable as CSV: {e}")));
                continue;
            }
        };
        match row_json(&header, &rec, line) {
            Err(mut e) => errors.append(&mut e),
            Ok(v) => match parse_candidate(&v, "") {
                Err(e) => {
                    let rel = e.path.trim_start_matches('.');
                    errors.push(err(line, &column_of(rel), e.to_string()));
                }
                Ok(c) if !names.insert(c.name.clone()) => {
                    errors.push(err(
                        line,
                        "name",
                        format!("'{}' is used twice in the file", c.name),
                    ));
                }
                Ok(_) => out.push(v),
            },
        }
    }
    match (errors.is_empty(), out.is_empty()) {
        (true, false) => Ok(out),
        (true, true) => Err(vec![err(2, "", "the file has no candidate rows")]),
        (false, _) => Err(errors),
    }
}
