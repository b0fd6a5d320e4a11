//! Checking a user name and password (no HTTP here): throttle first, then the password, then a
//! new session. Every attempt is recorded.

use super::password;
use super::sessions::{self, NewSession, SessionError};
use super::throttle::{self, Blocked};
use super::users::{self, User};
use crate::db::Db;

/// Why a login was refused.
#[derive(Debug, thiserror::Error)]
pub enum LoginError {
    /// Too many recent failures for this account or from this address.
    #[error("too many failed logins")]
    Throttled(Blocked),
    /// Unknown user, disabled user or wrong password: the caller is not told which.
    #[error("wrong user name or password")]
    Refused,
    #[error(transparent)]
    Session(#[from] SessionError),
}

impl From<sqlx::Error> for LoginError {
    fn from(error: sqlx::Error) -> Self {
        LoginError::Session(SessionError::Db(error))
    }
}

/// Tries a login for `username` from `address`; on success returns the user and a new session.
pub async fn attempt(
    db: &Db,
    username: &str,
    password: &str,
    address: &str,
) -> Result<(User, NewSession), LoginError> {
    let username = username.trim().to_ascii_lowercase();
    if let Some(blocked) = throttle::check(db, &username, address).await? {
        return Err(LoginError::Throttled(blocked));
    }
    let found = users::credentials(db, &username).await?;
    let user = match found {
        Some((user, hash)) => verify(password, hash).await.then_some(user),
        None => {
            let password = password.to_string();
            let _ = tokio::task::spawn_blocking(move || password::verify_nobody(&password)).await;
            None
        }
    };
    throttle::record(db, &username, address, user.is_some()).await?;
    let user = user.ok_or(LoginError::Refused)?;
    let session = sessions::create(db, user.id).await?;
    Ok((user, session))
}

/// Runs the Argon2 check off the async threads (it takes tens of milliseconds on purpose).
async fn verify(password: &str, hash: String) -> bool {
    let password = password.to_string();
    tokio::task::spawn_blocking(move || password::verify(&password, &hash))
        .await
        .unwrap_or(false)
}
