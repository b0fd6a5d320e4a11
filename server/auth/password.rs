//! Passwords: Argon2id hashes in PHC string form, the rules a new password must meet (length,
//! not among the 10,000 most common, no control characters), and generated passwords.

use super::secret;
use argon2::password_hash::phc::PasswordHash;
use argon2::{Algorithm, Argon2, Params, PasswordHasher, PasswordVerifier, Version};
use std::sync::OnceLock;

/// Fewest characters a password may have.
pub const MIN_LEN: usize = 12;
/// Passwords ranked this high or higher in the list of common passwords are refused.
pub const COMMON_RANK: usize = 10_000;
/// Most characters a password may have (hashing cost stays bounded).
pub const MAX_LEN: usize = 200;

/// Letters and digits that cannot be mistaken for one another when read aloud or copied.
const ALPHABET: &[u8] = b"abcdefghjkmnpqrstuvwxyz23456789";

/// Why a password cannot be used or hashed.
#[derive(Debug, thiserror::Error)]
pub enum PasswordError {
    #[error("a password needs at least {MIN_LEN} characters")]
    TooShort,
    #[error("a password may have at most {MAX_LEN} characters")]
    TooLong,
    #[error("a password must differ from the user name")]
    SameAsUsername,
    #[error("this password is among the 10,000 most common ones; choose another")]
    Common,
    #[error("a password may not contain control characters (such as a NUL, a tab or a line break)")]
    ControlCharacter,
    #[error("a password needs more than one distinct character")]
    OneCharacter,
    #[error("hashing failed: {0}")]
    Hash(String),
}

fn hasher() -> Argon2<'static> {
    // Argon2id, version 0x13, the crate's default costs (19 MiB, 2 passes, 1 lane).
    Argon2::new(Algorithm::Argon2id, Version::V0x13, Params::default())
}

/// Checks the password rules: length, and not the user name itself.
pub fn check(username: &str, password: &str) -> Result<(), PasswordError> {
    let len = password.chars().count();
    if len < MIN_LEN {
        return Err(PasswordError::TooShort);
    }
    if len > MAX_LEN {
        return Err(PasswordError::TooLong);
    }
    if password.eq_ignore_ascii_case(username) {
        return Err(PasswordError::SameAsUsername);
    }
    if password.chars().any(char::is_control) {
        return Err(PasswordError::ControlCharacter);
    }
    let mut chars = password.chars();
    let first = chars.next();
    if chars.all(|c| Some(c) == first) {
        return Err(PasswordError::OneCharacter);
    }
    if is_common(password) {
        return Err(PasswordError::Common);
    }
    Ok(())
}

/// True when the password (any letter case) is among the [`COMMON_RANK`] most common ones of
/// the list the zxcvbn crate ships (its `passwords` frequency list, ranked by how often each
/// appeared in leaked password sets), or is as easy to guess. zxcvbn estimates the guesses an
/// attacker needs from that list and other patterns; a list entry of rank r needs at most r
/// guesses (its own dictionary match), so "at most 10,000 guesses" covers the first 10,000.
pub fn is_common(password: &str) -> bool {
    zxcvbn::zxcvbn(&password.to_lowercase(), &[]).guesses() <= COMMON_RANK as u64
}

/// Hashes a password with Argon2id and a fresh random salt; returns the PHC string.
pub fn hash(password: &str) -> Result<String, PasswordError> {
    hasher()
        .hash_password(password.as_bytes())
        .map(|h| h.to_string())
        .map_err(|e| PasswordError::Hash(e.to_string()))
}

/// True when `password` matches the stored PHC string. A malformed stored hash never matches.
pub fn verify(password: &str, stored: &str) -> bool {
    match PasswordHash::new(stored) {
        Ok(parsed) => hasher()
            .verify_password(password.as_bytes(), &parsed)
            .is_ok(),
        Err(_) => false,
    }
}

/// Spends the same work as `verify` against a hash that matches nothing, so that a login for
/// an unknown user name takes as long as one with a wrong password.
pub fn verify_nobody(password: &str) {
    static DECOY: OnceLock<String> = OnceLock::new();
    let decoy = DECOY.get_or_init(|| {
        let random = secret::random_hex(16).unwrap_or_else(|_| "decoy-password-x".into());
        hash(&random).unwrap_or_default()
    });
    let _ = verify(password, decoy);
}

/// A new random password such as `k7qm-x3tf-9hwd-p2ne` (about 79 bits), to print once.
pub fn generate() -> Result<String, secret::RandomError> {
    let raw = secret::random_from(ALPHABET, 16)?;
    let groups: Vec<&str> = (0..4).map(|i| &raw[i * 4..i * 4 + 4]).collect();
    Ok(groups.join("-"))
}
