//! Collects the defaults a candidate's evaluation used, for its `assumptions` list.

/// The assumptions of one candidate, in the order they were taken. A quiet collector
/// (for sweeps, whose rows carry metrics only) takes the same defaults and writes nothing.
#[derive(Debug, Default, Clone)]
pub struct Assumptions {
    pub notes: Vec<String>,
    quiet: bool,
}

impl Assumptions {
    pub fn quiet() -> Self {
        Assumptions {
            notes: Vec::new(),
            quiet: true,
        }
    }

    pub fn is_quiet(&self) -> bool {
        self.quiet
    }

    /// The value given, or the default — recording `note` when the default is taken.
    pub fn or(&mut self, given: Option<f64>, default: f64, note: impl FnOnce() -> String) -> f64 {
        match given {
            Some(v) => v,
            None => {
                if !self.quiet {
                    self.notes.push(note());
                }
                default
            }
        }
    }

    /// A note written only when it will be kept.
    pub fn note_with(&mut self, s: impl FnOnce() -> String) {
        if !self.quiet {
            self.note(s());
        }
    }

    pub fn note(&mut self, s: impl Into<String>) {
        if self.quiet {
            return;
        }
        let s = s.into();
        if !self.notes.contains(&s) {
            self.notes.push(s);
        }
    }
}
