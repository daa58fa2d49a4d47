//! Collects the defaults a candidate's evaluation used, for its `assumptions` list.

/// The assumptions of one candidate, in the order they were taken.
#[derive(Debug, Default, Clone)]
pub struct Assumptions {
    pub notes: Vec<String>,
}

impl Assumptions {
    /// The value given, or the default — recording `note` when the default is taken.
    pub fn or(&mut self, given: Option<f64>, default: f64, note: impl FnOnce() -> String) -> f64 {
        match given {
            Some(v) => v,
            None => {
                self.notes.push(note());
                default
            }
        }
    }

    pub fn note(&mut self, s: impl Into<String>) {
        let s = s.into();
        if !self.notes.contains(&s) {
            self.notes.push(s);
        }
    }
}
