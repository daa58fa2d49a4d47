//! A small JSON object reader that tracks the path of every field it reads, checks ranges,
//! and rejects fields it was never asked for. Used only at the input boundary.

use super::error::InputError;
use serde_json::{Map, Value};
use std::collections::BTreeSet;

/// An allowed numeric range, printed in error messages.
#[derive(Debug, Clone, Copy)]
pub enum Range {
    /// lo < x ≤ hi
    OpenClosed(f64, f64),
    /// lo ≤ x ≤ hi
    Closed(f64, f64),
    /// lo < x < hi
    Open(f64, f64),
    /// lo ≤ x < hi
    ClosedOpen(f64, f64),
}

impl Range {
    pub fn contains(self, x: f64) -> bool {
        match self {
            Range::OpenClosed(lo, hi) => x > lo && x <= hi,
            Range::Closed(lo, hi) => x >= lo && x <= hi,
            Range::Open(lo, hi) => x > lo && x < hi,
            Range::ClosedOpen(lo, hi) => x >= lo && x < hi,
        }
    }

    pub fn describe(self) -> String {
        match self {
            Range::OpenClosed(lo, hi) => format!("must be > {} and ≤ {}", fmt_num(lo), fmt_num(hi)),
            Range::Closed(lo, hi) => format!("must be from {} to {}", fmt_num(lo), fmt_num(hi)),
            Range::Open(lo, hi) => format!("must be > {} and < {}", fmt_num(lo), fmt_num(hi)),
            Range::ClosedOpen(lo, hi) => format!("must be ≥ {} and < {}", fmt_num(lo), fmt_num(hi)),
        }
    }
}

/// Formats a number compactly for messages (no trailing zeros).
pub fn fmt_num(x: f64) -> String {
    if x == x.trunc() && x.abs() < 1e15 {
        format!("{}", x as i64)
    } else {
        format!("{x}")
    }
}

/// Joins a path and a field name.
pub fn join(path: &str, field: &str) -> String {
    if path.is_empty() {
        field.to_string()
    } else {
        format!("{path}.{field}")
    }
}

/// Reads one JSON object; call [`Obj::finish`] to reject unknown fields.
pub struct Obj<'a> {
    map: &'a Map<String, Value>,
    path: String,
    seen: BTreeSet<&'static str>,
}

impl<'a> Obj<'a> {
    pub fn new(value: &'a Value, path: &str) -> Result<Self, InputError> {
        match value {
            Value::Object(map) => Ok(Obj {
                map,
                path: path.to_string(),
                seen: BTreeSet::new(),
            }),
            other => Err(InputError::new(
                display_path(path),
                format!("must be an object (got {})", kind_of(other)),
            )),
        }
    }

    pub fn path(&self) -> &str {
        &self.path
    }

    pub fn field_path(&self, field: &str) -> String {
        join(&self.path, field)
    }

    /// The raw value of a field; JSON null counts as absent.
    pub fn get(&mut self, field: &'static str) -> Option<&'a Value> {
        self.seen.insert(field);
        match self.map.get(field) {
            None | Some(Value::Null) => None,
            Some(v) => Some(v),
        }
    }

    pub fn has(&mut self, field: &'static str) -> bool {
        self.get(field).is_some()
    }

    pub fn req(&mut self, field: &'static str) -> Result<&'a Value, InputError> {
        let path = self.field_path(field);
        self.get(field)
            .ok_or_else(|| InputError::new(path, "is required but missing"))
    }

    pub fn opt_f64(
        &mut self,
        field: &'static str,
        range: Range,
    ) -> Result<Option<f64>, InputError> {
        let path = self.field_path(field);
        match self.get(field) {
            None => Ok(None),
            Some(v) => number(v, &path, range).map(Some),
        }
    }

    pub fn req_f64(&mut self, field: &'static str, range: Range) -> Result<f64, InputError> {
        let path = self.field_path(field);
        let v = self.req(field)?;
        number(v, &path, range)
    }

    pub fn opt_u32(
        &mut self,
        field: &'static str,
        lo: u32,
        hi: u32,
    ) -> Result<Option<u32>, InputError> {
        let path = self.field_path(field);
        match self.get(field) {
            None => Ok(None),
            Some(v) => integer(v, &path, lo, hi).map(Some),
        }
    }

    pub fn req_u32(&mut self, field: &'static str, lo: u32, hi: u32) -> Result<u32, InputError> {
        let path = self.field_path(field);
        let v = self.req(field)?;
        integer(v, &path, lo, hi)
    }

    pub fn opt_bool(&mut self, field: &'static str) -> Result<Option<bool>, InputError> {
        let path = self.field_path(field);
        match self.get(field) {
            None => Ok(None),
            Some(Value::Bool(b)) => Ok(Some(*b)),
            Some(other) => Err(InputError::new(
                path,
                format!("must be true or false (got {})", kind_of(other)),
            )),
        }
    }

    pub fn opt_str(
        &mut self,
        field: &'static str,
        max_len: usize,
    ) -> Result<Option<String>, InputError> {
        let path = self.field_path(field);
        match self.get(field) {
            None => Ok(None),
            Some(v) => string(v, &path, max_len).map(Some),
        }
    }

    pub fn req_str(&mut self, field: &'static str, max_len: usize) -> Result<String, InputError> {
        let path = self.field_path(field);
        let v = self.req(field)?;
        string(v, &path, max_len)
    }

    /// A required non-empty name (trimmed), at most `max_len` characters.
    pub fn req_name(&mut self, field: &'static str, max_len: usize) -> Result<String, InputError> {
        let path = self.field_path(field);
        let s = self.req_str(field, max_len)?;
        let t = s.trim();
        if t.is_empty() {
            return Err(InputError::new(path, "must not be empty"));
        }
        if t.chars().any(|c| c.is_control()) {
            return Err(InputError::new(path, "must not contain control characters"));
        }
        Ok(t.to_string())
    }

    /// A string that must be one of `allowed`.
    pub fn opt_enum(
        &mut self,
        field: &'static str,
        allowed: &[&str],
    ) -> Result<Option<String>, InputError> {
        let path = self.field_path(field);
        match self.get(field) {
            None => Ok(None),
            Some(v) => one_of(v, &path, allowed).map(Some),
        }
    }

    pub fn req_enum(
        &mut self,
        field: &'static str,
        allowed: &[&str],
    ) -> Result<String, InputError> {
        let path = self.field_path(field);
        let v = self.req(field)?;
        one_of(v, &path, allowed)
    }

    pub fn opt_array(&mut self, field: &'static str) -> Result<Option<&'a Vec<Value>>, InputError> {
        let path = self.field_path(field);
        match self.get(field) {
            None => Ok(None),
            Some(Value::Array(a)) => Ok(Some(a)),
            Some(other) => Err(InputError::new(
                path,
                format!("must be a list (got {})", kind_of(other)),
            )),
        }
    }

    /// Rejects a field that is present although it does not apply (e.g. to another mode).
    pub fn forbid(&mut self, field: &'static str, why: &str) -> Result<(), InputError> {
        if self.has(field) {
            return Err(InputError::new(
                self.field_path(field),
                format!("is not used {why}"),
            ));
        }
        Ok(())
    }

    /// Rejects every field that was not read.
    pub fn finish(self) -> Result<(), InputError> {
        for key in self.map.keys() {
            if !self.seen.contains(key.as_str()) {
                return Err(InputError::new(
                    join(&self.path, key),
                    "unknown field (check the spelling against the study format)",
                ));
            }
        }
        Ok(())
    }
}

fn display_path(path: &str) -> String {
    if path.is_empty() {
        "$".to_string()
    } else {
        path.to_string()
    }
}

pub fn kind_of(v: &Value) -> &'static str {
    match v {
        Value::Null => "null",
        Value::Bool(_) => "a boolean",
        Value::Number(_) => "a number",
        Value::String(_) => "a string",
        Value::Array(_) => "a list",
        Value::Object(_) => "an object",
    }
}

fn number(v: &Value, path: &str, range: Range) -> Result<f64, InputError> {
    let x = match v {
        Value::Number(n) => n.as_f64(),
        _ => None,
    };
    let x = x.ok_or_else(|| {
        InputError::new(
            path,
            format!(
                "must be a finite number (got {}); {}",
                kind_of(v),
                range.describe()
            ),
        )
    })?;
    if !x.is_finite() {
        return Err(InputError::new(
            path,
            format!("must be finite; {}", range.describe()),
        ));
    }
    if !range.contains(x) {
        return Err(InputError::new(
            path,
            format!("{} (got {})", range.describe(), fmt_num(x)),
        ));
    }
    Ok(x)
}

fn integer(v: &Value, path: &str, lo: u32, hi: u32) -> Result<u32, InputError> {
    let describe = format!("must be a whole number from {lo} to {hi}");
    let x = match v {
        Value::Number(n) => n.as_f64(),
        _ => None,
    }
    .ok_or_else(|| InputError::new(path, format!("{describe} (got {})", kind_of(v))))?;
    if x.fract() != 0.0 || x < lo as f64 || x > hi as f64 {
        return Err(InputError::new(
            path,
            format!("{describe} (got {})", fmt_num(x)),
        ));
    }
    Ok(x as u32)
}

fn string(v: &Value, path: &str, max_len: usize) -> Result<String, InputError> {
    match v {
        Value::String(s) if s.chars().count() <= max_len => Ok(s.clone()),
        Value::String(_) => Err(InputError::new(
            path,
            format!("must be at most {max_len} characters long"),
        )),
        other => Err(InputError::new(
            path,
            format!("must be a string (got {})", kind_of(other)),
        )),
    }
}

fn one_of(v: &Value, path: &str, allowed: &[&str]) -> Result<String, InputError> {
    let list = allowed.join(", ");
    match v {
        Value::String(s) if allowed.contains(&s.as_str()) => Ok(s.clone()),
        Value::String(s) => Err(InputError::new(
            path,
            format!("must be one of {list} (got \"{}\")", truncate(s, 40)),
        )),
        other => Err(InputError::new(
            path,
            format!("must be one of {list} (got {})", kind_of(other)),
        )),
    }
}

fn truncate(s: &str, n: usize) -> String {
    if s.chars().count() <= n {
        s.to_string()
    } else {
        format!("{}…", s.chars().take(n).collect::<String>())
    }
}
