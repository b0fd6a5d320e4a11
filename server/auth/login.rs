//! Checking a user name and password (no HTTP here): throttle first, then the password, then a
//! new session. Every attempt is recorded.

use super::password;
use super::sessions::{self, NewSession, SessionError};
use super::throttle::{self, Blocked};
use super::users::{self, User};
use crate::db::{Db, audit};
use serde_json::json;

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
/// A locked account and address pair is refused at once; otherwise the try waits as long as
/// the recent failures there ask (`throttle::Standing::delay`) before the password is checked.
/// The attempt and its audit row (`login` or `login_failed`, with the address) are written
/// together.
pub async fn attempt(
    db: &Db,
    username: &str,
    password: &str,
    address: &str,
) -> Result<(User, NewSession), LoginError> {
    let username = username.trim().to_ascii_lowercase();
    let standing = throttle::standing(db, &username, address).await?;
    if standing.locked() {
        return Err(LoginError::Throttled(Blocked::Account));
    }
    tokio::time::sleep(standing.delay()).await;
    let found = users::credentials(db, &username).await?;
    let user = match found {
        Some((user, hash)) => verify(password, hash).await.then_some(user),
        None => {
            let password = password.to_string();
            let _ = tokio::task::spawn_blocking(move || password::verify_nobody(&password)).await;
            None
        }
    };
    {
        let (_write, mut tx) = crate::db::begin_write(db).await?;
        let id = throttle::record(&mut tx, &username, address, user.is_some()).await?;
        let detail = json!({"username": username, "address": address});
        match &user {
            Some(u) => {
                audit::record(
                    &mut tx,
                    &u.display_name,
                    "login",
                    "user",
                    u.id,
                    None,
                    Some(&detail),
                )
                .await?
            }
            None => {
                audit::record(
                    &mut tx,
                    "anonymous",
                    "login_failed",
                    "login_attempt",
                    id,
                    None,
                    Some(&detail),
                )
                .await?
            }
        }
        tx.commit().await?;
    }
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
