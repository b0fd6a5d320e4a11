//! Random secrets, their stored hashes, and comparisons that take the same time whatever the
//! input. No I/O beyond the operating system's random source.

use sha2::{Digest, Sha256};

/// Why a secret could not be made.
#[derive(Debug, thiserror::Error)]
#[error("the system random source failed: {0}")]
pub struct RandomError(String);

/// `n` random bytes from the operating system, as lower-case hex (`2n` characters).
pub fn random_hex(n: usize) -> Result<String, RandomError> {
    let mut bytes = vec![0u8; n];
    getrandom::fill(&mut bytes).map_err(|e| RandomError(e.to_string()))?;
    Ok(hex(&bytes))
}

/// Random text of `len` characters drawn from `alphabet` (rejection sampling: no bias).
pub fn random_from(alphabet: &[u8], len: usize) -> Result<String, RandomError> {
    let limit = 256 - (256 % alphabet.len());
    let mut out = String::with_capacity(len);
    let mut buf = [0u8; 64];
    while out.len() < len {
        getrandom::fill(&mut buf).map_err(|e| RandomError(e.to_string()))?;
        for &b in &buf {
            if (b as usize) < limit && out.len() < len {
                out.push(alphabet[b as usize % alphabet.len()] as char);
            }
        }
    }
    Ok(out)
}

/// The hex SHA-256 of a token: what the database keeps instead of the token itself.
pub fn token_hash(token: &str) -> String {
    hex(&Sha256::digest(token.as_bytes()))
}

/// Compares two strings in time that depends only on their lengths.
pub fn constant_time_eq(a: &str, b: &str) -> bool {
    let (a, b) = (a.as_bytes(), b.as_bytes());
    if a.len() != b.len() {
        return false;
    }
    a.iter().zip(b).fold(0u8, |acc, (x, y)| acc | (x ^ y)) == 0
}

fn hex(bytes: &[u8]) -> String {
    const DIGITS: &[u8; 16] = b"0123456789abcdef";
    let mut out = String::with_capacity(bytes.len() * 2);
    for &b in bytes {
        out.push(DIGITS[(b >> 4) as usize] as char);
        out.push(DIGITS[(b & 0x0f) as usize] as char);
    }
    out
}
