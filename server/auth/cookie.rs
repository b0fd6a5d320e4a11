//! The session cookie: its name, its attributes, and reading it back from a request.

use axum::http::HeaderMap;
use axum::http::header::{AUTHORIZATION, COOKIE};
use std::sync::OnceLock;
use std::sync::atomic::{AtomicBool, Ordering};

/// Name of the session cookie.
pub const NAME: &str = "loadhold_session";

static SECURE_FLAG: AtomicBool = AtomicBool::new(false);

/// Marks cookies `Secure` from now on (the server is reached over TLS, e.g. behind a proxy).
/// `LOADHOLD_SECURE_COOKIES=1` in the environment does the same.
pub fn set_secure(on: bool) {
    SECURE_FLAG.store(on, Ordering::Relaxed);
}

/// True when cookies must carry `Secure`.
pub fn secure() -> bool {
    static FROM_ENV: OnceLock<bool> = OnceLock::new();
    SECURE_FLAG.load(Ordering::Relaxed)
        || *FROM_ENV.get_or_init(|| {
            std::env::var("LOADHOLD_SECURE_COOKIES").is_ok_and(|v| {
                matches!(
                    v.trim().to_ascii_lowercase().as_str(),
                    "1" | "true" | "yes" | "on"
                )
            })
        })
}

/// The `Set-Cookie` value that starts a session: HttpOnly, SameSite=Lax, whole site, lasting
/// `max_age_s`, and Secure when asked.
pub fn session(token: &str, max_age_s: i64, secure: bool) -> String {
    let secure = if secure { "; Secure" } else { "" };
    format!("{NAME}={token}; Path=/; HttpOnly; SameSite=Lax; Max-Age={max_age_s}{secure}")
}

/// The `Set-Cookie` value that removes the session cookie.
pub fn cleared(secure: bool) -> String {
    session("", 0, secure)
}

/// The session token from the request's cookies, if any.
pub fn token(headers: &HeaderMap) -> Option<String> {
    headers
        .get_all(COOKIE)
        .iter()
        .filter_map(|v| v.to_str().ok())
        .flat_map(|v| v.split(';'))
        .filter_map(|pair| pair.trim().split_once('='))
        .find(|(name, value)| *name == NAME && !value.is_empty())
        .map(|(_, value)| value.to_string())
}

/// The token of an `Authorization: Bearer ...` header, if any.
pub fn bearer(headers: &HeaderMap) -> Option<String> {
    let value = headers.get(AUTHORIZATION)?.to_str().ok()?;
    let (scheme, token) = value.trim().split_once(' ')?;
    scheme
        .eq_ignore_ascii_case("bearer")
        .then(|| token.trim().to_string())
        .filter(|t| !t.is_empty())
}
