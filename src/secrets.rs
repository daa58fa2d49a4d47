//! Passwords and random tokens: Argon2id hashing, verification, token generation and
//! the digest under which tokens are stored. No storage and no I/O here.

use argon2::Argon2;
use argon2::password_hash::{PasswordHasher, PasswordVerifier};
use rand::RngExt;
use sha2::{Digest, Sha256};

/// Characters of every generated token: URL-, header- and shell-safe.
const TOKEN_ALPHABET: &[u8] = b"ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789_-";

/// Shortest password accepted for an account.
pub const MIN_PASSWORD_LEN: usize = 8;

/// A random token of `len` characters from `A-Z a-z 0-9 _ -` (6 bits each).
pub fn random_token(len: usize) -> String {
    let mut rng = rand::rng();
    (0..len)
        .map(|_| TOKEN_ALPHABET[rng.random_range(0..TOKEN_ALPHABET.len())] as char)
        .collect()
}

/// The stored form of a session or API token: hex SHA-256.
pub fn token_digest(token: &str) -> String {
    hex::encode(Sha256::digest(token.as_bytes()))
}

/// Argon2id PHC string of `password` with a fresh random salt. Slow on purpose:
/// call it off the async reactor.
pub fn hash_password(password: &str) -> Result<String, String> {
    Argon2::default()
        .hash_password(password.as_bytes())
        .map(|h| h.to_string())
        .map_err(|e| format!("password hashing failed: {e}"))
}

/// Whether `password` matches the stored PHC string.
pub fn verify_password(password: &str, phc: &str) -> bool {
    Argon2::default()
        .verify_password(password.as_bytes(), phc)
        .is_ok()
}

/// Checks a new password against the account rules.
pub fn check_new_password(password: &str) -> Result<(), String> {
    if password.chars().count() < MIN_PASSWORD_LEN {
        return Err(format!(
            "password: must be at least {MIN_PASSWORD_LEN} characters (got {})",
            password.chars().count()
        ));
    }
    Ok(())
}

/// Checks a username: 1 to 64 characters from `A-Z a-z 0-9 . _ -`.
pub fn check_username(name: &str) -> Result<(), String> {
    let ok_chars = name
        .chars()
        .all(|c| c.is_ascii_alphanumeric() || matches!(c, '.' | '_' | '-'));
    if name.is_empty() || name.len() > 64 || !ok_chars {
        return Err(format!(
            "username: must be 1 to 64 characters from A-Z a-z 0-9 . _ - (got '{name}')"
        ));
    }
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn tokens_use_only_the_safe_alphabet_and_differ() {
        let a = random_token(43);
        let b = random_token(43);
        assert_eq!(a.len(), 43);
        assert!(a.bytes().all(|c| TOKEN_ALPHABET.contains(&c)), "{a}");
        assert_ne!(a, b);
    }

    #[test]
    fn a_hash_verifies_only_its_own_password() {
        let phc = hash_password("correct horse").unwrap();
        assert!(phc.starts_with("$argon2id$"), "{phc}");
        assert!(verify_password("correct horse", &phc));
        assert!(!verify_password("wrong horse", &phc));
    }

    #[test]
    fn short_passwords_and_odd_usernames_are_refused() {
        assert!(
            check_new_password("short")
                .unwrap_err()
                .contains("at least 8")
        );
        assert!(check_new_password("long enough").is_ok());
        assert!(check_username("a b").is_err());
        assert!(check_username("").is_err());
        assert!(check_username("ana.lee-2").is_ok());
    }
}
