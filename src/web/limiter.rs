//! Slows password guessing: after too many failed sign-ins for one username within a
//! window, further attempts are refused until the window has passed.

use std::collections::HashMap;
use std::sync::Mutex;
use std::time::{Duration, Instant};

/// Failures allowed per username within one window.
pub const MAX_FAILURES: u32 = 10;
/// Length of the window.
pub const WINDOW: Duration = Duration::from_secs(300);

#[derive(Default)]
pub struct LoginLimiter {
    failures: Mutex<HashMap<String, (u32, Instant)>>,
}

impl LoginLimiter {
    /// Whether `username` may try to sign in now.
    pub fn allowed(&self, username: &str) -> bool {
        let map = self.failures.lock().unwrap_or_else(|e| e.into_inner());
        match map.get(username) {
            Some((n, since)) => *n < MAX_FAILURES || since.elapsed() > WINDOW,
            None => true,
        }
    }

    pub fn record_failure(&self, username: &str) {
        let mut map = self.failures.lock().unwrap_or_else(|e| e.into_inner());
        let entry = map
            .entry(username.to_string())
            .or_insert((0, Instant::now()));
        if entry.1.elapsed() > WINDOW {
            *entry = (0, Instant::now());
        }
        entry.0 += 1;
    }

    pub fn record_success(&self, username: &str) {
        let mut map = self.failures.lock().unwrap_or_else(|e| e.into_inner());
        map.remove(username);
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_username_is_locked_after_the_allowed_failures_and_freed_by_success() {
        let l = LoginLimiter::default();
        for _ in 0..MAX_FAILURES {
            assert!(l.allowed("ana"));
            l.record_failure("ana");
        }
        assert!(!l.allowed("ana"));
        assert!(l.allowed("ben"), "other usernames are unaffected");
        l.record_success("ana");
        assert!(l.allowed("ana"));
    }
}
