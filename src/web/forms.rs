//! Generic form fields for study-format objects: a field list describes where each
//! form value lives in the JSON object; values go JSON -> form for editing and
//! form -> JSON for validation by the engine. Fields the form does not cover are
//! kept from the stored object, so an edit never drops data.

use std::collections::HashMap;

use serde_json::{Map, Value};

/// How a field is entered.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Kind {
    Number,
    Integer,
    Text,
    LongText,
    /// One of the listed values; an empty choice means "absent, use the default".
    Choice(&'static [&'static str]),
    Check,
    /// Lines of `speed_rpm, torque_nm, efficiency` (datasheet efficiency points).
    Points,
}

/// One form field and its place in the JSON object (dotted path).
#[derive(Debug, Clone, Copy)]
pub struct Field {
    pub name: &'static str,
    pub path: &'static str,
    pub label: &'static str,
    pub unit: &'static str,
    pub kind: Kind,
    /// Pre-filled on a new form ("" = blank).
    pub default: &'static str,
    /// Typical range or the default that applies when left blank.
    pub hint: &'static str,
    pub required: bool,
}

/// Form values by field name.
pub type Values = HashMap<String, String>;
/// Error messages by field name.
pub type Errors = HashMap<String, String>;

/// A field ready for the template.
#[derive(Debug, Clone)]
pub struct FieldView {
    pub name: &'static str,
    pub label: &'static str,
    pub unit: &'static str,
    pub hint: &'static str,
    pub required: bool,
    pub tag: &'static str,
    pub value: String,
    pub options: Vec<(String, bool)>,
    pub error: Option<String>,
}

fn get_path<'a>(v: &'a Value, path: &str) -> Option<&'a Value> {
    path.split('.').try_fold(v, |cur, key| cur.get(key))
}

fn remove_path(v: &mut Value, path: &str) {
    let (head, last) = match path.rsplit_once('.') {
        Some((h, l)) => (Some(h), l),
        None => (None, path),
    };
    let parent = match head {
        Some(h) => h.split('.').try_fold(&mut *v, |cur, k| cur.get_mut(k)),
        None => Some(v),
    };
    if let Some(Value::Object(m)) = parent {
        m.remove(last);
    }
}

fn set_path(v: &mut Value, path: &str, value: Value) {
    let mut cur = v;
    let mut keys = path.split('.').peekable();
    while let Some(k) = keys.next() {
        if !cur.is_object() {
            *cur = Value::Object(Map::new());
        }
        let Value::Object(m) = cur else { return };
        if keys.peek().is_none() {
            m.insert(k.to_string(), value);
            return;
        }
        cur = m
            .entry(k.to_string())
            .or_insert_with(|| Value::Object(Map::new()));
    }
}

fn points_text(v: &Value) -> String {
    let Some(rows) = v.as_array() else {
        return String::new();
    };
    let cell = |r: &Value, k: &str| r.get(k).map(Value::to_string).unwrap_or_default();
    rows.iter()
        .map(|r| {
            format!(
                "{}, {}, {}",
                cell(r, "speed_rpm"),
                cell(r, "torque_nm"),
                cell(r, "efficiency")
            )
        })
        .collect::<Vec<_>>()
        .join("\n")
}

fn value_text(f: &Field, v: &Value) -> String {
    match (f.kind, v) {
        (Kind::Points, _) => points_text(v),
        (Kind::Check, Value::Bool(b)) => {
            if *b {
                "on".into()
            } else {
                String::new()
            }
        }
        (_, Value::String(s)) => s.clone(),
        (_, Value::Null) => String::new(),
        (_, other) => other.to_string(),
    }
}

/// Form values of a stored object.
pub fn values_from_json(fields: &[Field], obj: &Value) -> Values {
    fields
        .iter()
        .filter_map(|f| get_path(obj, f.path).map(|v| (f.name.to_string(), value_text(f, v))))
        .collect()
}

/// Form values of a new form: every field's default.
pub fn defaults(fields: &[Field]) -> Values {
    fields
        .iter()
        .filter(|f| !f.default.is_empty())
        .map(|f| (f.name.to_string(), f.default.to_string()))
        .collect()
}

fn parse_number(f: &Field, raw: &str) -> Result<Value, String> {
    let n: f64 = raw
        .parse()
        .map_err(|_| format!("{}: must be a number (got '{raw}')", f.path))?;
    if !n.is_finite() {
        return Err(format!("{}: must be a finite number (got '{raw}')", f.path));
    }
    if f.kind == Kind::Integer {
        if n.fract() != 0.0 || n.abs() > 1e15 {
            return Err(format!("{}: must be a whole number (got '{raw}')", f.path));
        }
        return Ok(Value::from(n as i64));
    }
    Ok(Value::from(n))
}

fn parse_points(f: &Field, raw: &str) -> Result<Value, String> {
    let mut rows = Vec::new();
    for (i, line) in raw
        .lines()
        .map(str::trim)
        .filter(|l| !l.is_empty())
        .enumerate()
    {
        let nums: Result<Vec<f64>, _> = line
            .split(|c: char| c == ',' || c.is_whitespace())
            .filter(|s| !s.is_empty())
            .map(str::parse::<f64>)
            .collect();
        match nums {
            Ok(n) if n.len() == 3 && n.iter().all(|x| x.is_finite()) => {
                rows.push(serde_json::json!({
                    "speed_rpm": n[0], "torque_nm": n[1], "efficiency": n[2]
                }))
            }
            _ => {
                return Err(format!(
                    "{}[{i}]: line {} must be three numbers: speed_rpm, torque_nm, efficiency (got '{line}')",
                    f.path,
                    i + 1
                ));
            }
        }
    }
    Ok(Value::Array(rows))
}

fn parse_field(f: &Field, raw: &str) -> Result<Option<Value>, String> {
    let raw = raw.trim();
    if f.kind == Kind::Check {
        return Ok((!raw.is_empty()).then_some(Value::Bool(true)));
    }
    if raw.is_empty() {
        return Ok(None);
    }
    Ok(Some(match f.kind {
        Kind::Number | Kind::Integer => parse_number(f, raw)?,
        Kind::Points => parse_points(f, raw)?,
        Kind::Choice(opts) if !opts.contains(&raw) => {
            return Err(format!(
                "{}: must be one of {} (got '{raw}')",
                f.path,
                opts.join(", ")
            ));
        }
        _ => Value::from(raw.to_string()),
    }))
}

/// Builds the JSON object from form values on top of `base` (the stored object, or an
/// empty one): covered paths are replaced, uncovered ones kept. Errors name the field.
pub fn build_json(
    fields: &[Field],
    values: &Values,
    base: Option<&Value>,
) -> Result<Value, Errors> {
    let mut obj = base.cloned().unwrap_or_else(|| Value::Object(Map::new()));
    let mut errors = Errors::new();
    for f in fields {
        remove_path(&mut obj, f.path);
        let raw = values.get(f.name).map(String::as_str).unwrap_or("");
        match parse_field(f, raw) {
            Ok(Some(v)) => set_path(&mut obj, f.path, v),
            Ok(None) => {}
            Err(m) => {
                errors.insert(f.name.to_string(), m);
            }
        }
    }
    prune_empty(&mut obj);
    if errors.is_empty() {
        Ok(obj)
    } else {
        Err(errors)
    }
}

/// Drops nested objects left empty when all their fields were blank.
fn prune_empty(v: &mut Value) {
    if let Value::Object(m) = v {
        for child in m.values_mut() {
            prune_empty(child);
        }
        m.retain(|_, c| !matches!(c, Value::Object(o) if o.is_empty()));
    }
}

/// The field an engine error path (relative to the object) belongs to: the field with
/// the longest path that the error path starts with.
pub fn field_for_path(fields: &[Field], rel_path: &str) -> Option<&'static str> {
    fields
        .iter()
        .filter(|f| {
            rel_path == f.path
                || rel_path.starts_with(&format!("{}.", f.path))
                || rel_path.starts_with(&format!("{}[", f.path))
        })
        .max_by_key(|f| f.path.len())
        .map(|f| f.name)
}

/// Template views of the fields with their current values and errors.
pub fn views(fields: &[Field], values: &Values, errors: &Errors) -> Vec<FieldView> {
    fields.iter().map(|f| view(f, values, errors)).collect()
}

fn view(f: &Field, values: &Values, errors: &Errors) -> FieldView {
    let value = values.get(f.name).cloned().unwrap_or_default();
    let (tag, options) = match f.kind {
        Kind::Choice(opts) => {
            let mut o: Vec<(String, bool)> = Vec::new();
            if !f.required {
                o.push((String::new(), value.is_empty()));
            }
            o.extend(opts.iter().map(|x| (x.to_string(), *x == value)));
            ("select", o)
        }
        Kind::Check => ("check", Vec::new()),
        Kind::LongText | Kind::Points => ("textarea", Vec::new()),
        Kind::Text => ("text", Vec::new()),
        Kind::Number | Kind::Integer => ("number", Vec::new()),
    };
    FieldView {
        name: f.name,
        label: f.label,
        unit: f.unit,
        hint: f.hint,
        required: f.required,
        tag,
        value,
        options,
        error: errors.get(f.name).cloned(),
    }
}
