//! Input errors: every bad value is reported with its JSON path and the allowed range.

use std::fmt;

/// A rejected input: where it is (a JSON path such as `segments[2].power.tas_m_s`) and why.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct InputError {
    pub path: String,
    pub message: String,
}

impl InputError {
    pub fn new(path: impl Into<String>, message: impl Into<String>) -> Self {
        InputError {
            path: path.into(),
            message: message.into(),
        }
    }
}

impl fmt::Display for InputError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "{}: {}", self.path, self.message)
    }
}

impl std::error::Error for InputError {}
