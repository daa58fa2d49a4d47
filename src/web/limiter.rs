//! Slows password guessing: after too many failed sign-ins for one username, or from
//! one client address, within a window, further attempts from there are refused until
//! the window has passed. Counts live in memory only (a restart forgets them).

use std::collections::HashMap;
use std::net::IpAddr;
use std::sync::Mutex;
use std::time::{Duration, Instant};

/// Failures allowed per username within one window.
pub const MAX_FAILURES: u32 = 10;
/// Failures allowed per client address within one window (several people may share
/// one address behind a proxy, so this is looser than the per-account limit).
pub const MAX_ADDRESS_FAILURES: u32 = 30;
/// Length of the window.
pub const WINDOW: Duration = Duration::from_secs(300);

/// Why a sign-in attempt is refused before the password is checked.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Refusal {
    Account,
    Address,
}

impl Refusal {
    pub fn message(self) -> &'static str {
        match self {
            Refusal::Account => {
                "Too many failed sign-ins for this username; wait five minutes and try again."
            }
            Refusal::Address => {
                "Too many failed sign-ins from this computer's address; wait five minutes and try again."
            }
        }
    }
}

struct Counts<K>(Mutex<HashMap<K, (u32, Instant)>>);

impl<K> Default for Counts<K> {
    fn default() -> Self {
        Counts(Mutex::new(HashMap::new()))
    }
}

impl<K: std::hash::Hash + Eq + Clone> Counts<K> {
    fn below(&self, key: &K, max: u32) -> bool {
        let map = self.0.lock().unwrap_or_else(|e| e.into_inner());
        match map.get(key) {
            Some((n, since)) => *n < max || since.elapsed() > WINDOW,
            None => true,
        }
    }

    fn bump(&self, key: &K) {
        let mut map = self.0.lock().unwrap_or_else(|e| e.into_inner());
        let entry = map.entry(key.clone()).or_insert((0, Instant::now()));
        if entry.1.elapsed() > WINDOW {
            *entry = (0, Instant::now());
        }
        entry.0 += 1;
    }

    fn clear(&self, key: &K) {
        self.0.lock().unwrap_or_else(|e| e.into_inner()).remove(key);
    }
}

#[derive(Default)]
pub struct LoginLimiter {
    accounts: Counts<String>,
    addresses: Counts<IpAddr>,
}

impl LoginLimiter {
    /// Whether `username` may try to sign in now (no address known).
    pub fn allowed(&self, username: &str) -> bool {
        self.check(username, None).is_ok()
    }

    /// Whether `username` may try to sign in now from `addr`.
    pub fn check(&self, username: &str, addr: Option<IpAddr>) -> Result<(), Refusal> {
        if addr.is_some_and(|a| !self.addresses.below(&a, MAX_ADDRESS_FAILURES)) {
            return Err(Refusal::Address);
        }
        if !self.accounts.below(&username.to_string(), MAX_FAILURES) {
            return Err(Refusal::Account);
        }
        Ok(())
    }

    pub fn record_failure(&self, username: &str) {
        self.record_failure_from(username, None);
    }

    pub fn record_failure_from(&self, username: &str, addr: Option<IpAddr>) {
        self.accounts.bump(&username.to_string());
        if let Some(a) = addr {
            self.addresses.bump(&a);
        }
    }

    /// A success clears the account's count; the address keeps its count, so one
    /// known password does not reset guessing at every other account.
    pub fn record_success(&self, username: &str) {
        self.accounts.clear(&username.to_string());
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

    #[test]
    fn an_address_is_locked_after_failures_across_many_usernames() {
        let l = LoginLimiter::default();
        let here: IpAddr = "127.0.0.9".parse().unwrap();
        let there: IpAddr = "127.0.0.10".parse().unwrap();
        for i in 0..MAX_ADDRESS_FAILURES {
            assert_eq!(l.check(&format!("user{i}"), Some(here)), Ok(()));
            l.record_failure_from(&format!("user{i}"), Some(here));
        }
        assert_eq!(l.check("fresh", Some(here)), Err(Refusal::Address));
        assert_eq!(
            l.check("fresh", Some(there)),
            Ok(()),
            "other addresses are unaffected"
        );
    }
}
