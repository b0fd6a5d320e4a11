//! Browser sessions in storage (no HTTP here): a random token for the cookie, kept only as its
//! SHA-256; a CSRF token per session; a fixed lifetime from login.

use super::users::User;
use super::{clock, secret};
use crate::db::Db;
use time::Duration;

/// How long a login lasts: one long shift.
pub const LIFETIME: Duration = Duration::hours(12);
/// `last_seen_at` is written at most this often, so reads stay reads.
const TOUCH_EVERY: Duration = Duration::minutes(5);

/// What storage or the random source failed with.
#[derive(Debug, thiserror::Error)]
pub enum SessionError {
    #[error(transparent)]
    Db(#[from] sqlx::Error),
    #[error(transparent)]
    Random(#[from] secret::RandomError),
}

/// A session just made: the token goes in the cookie once and is never readable again.
#[derive(Clone, Debug)]
pub struct NewSession {
    pub id: i64,
    pub token: String,
    pub csrf: String,
}

/// Starts a session for a user. Expired sessions are cleared on the way.
pub async fn create(db: &Db, user_id: i64) -> Result<NewSession, SessionError> {
    let token = secret::random_hex(32)?;
    let csrf = secret::random_hex(32)?;
    let now = clock::now();
    sqlx::query("DELETE FROM sessions WHERE expires_at < ?")
        .bind(&now)
        .execute(db)
        .await?;
    let id: i64 = sqlx::query_scalar(
        "INSERT INTO sessions (token_hash, user_id, csrf_token, created_at, expires_at,
            last_seen_at)
         VALUES (?, ?, ?, ?, ?, ?) RETURNING id",
    )
    .bind(secret::token_hash(&token))
    .bind(user_id)
    .bind(&csrf)
    .bind(&now)
    .bind(clock::from_now(LIFETIME))
    .bind(&now)
    .fetch_one(db)
    .await?;
    Ok(NewSession { id, token, csrf })
}

/// A live session found from its cookie token.
#[derive(Clone, Debug)]
pub struct Found {
    pub id: i64,
    pub user: User,
    pub csrf: String,
}

/// The live session of this token: not expired, and its user not disabled.
pub async fn lookup(db: &Db, token: &str) -> Result<Option<Found>, sqlx::Error> {
    #[derive(sqlx::FromRow)]
    struct Row {
        session_id: i64,
        csrf_token: String,
        last_seen_at: String,
        #[sqlx(flatten)]
        user: User,
    }
    let row = sqlx::query_as::<_, Row>(
        "SELECT s.id AS session_id, s.csrf_token, s.last_seen_at,
            u.id, u.username, u.display_name, u.role, u.created_at, u.updated_at, u.disabled_at
         FROM sessions s JOIN users u ON u.id = s.user_id
         WHERE s.token_hash = ? AND s.expires_at > ? AND u.disabled_at IS NULL",
    )
    .bind(secret::token_hash(token))
    .bind(clock::now())
    .fetch_optional(db)
    .await?;
    let Some(row) = row else {
        return Ok(None);
    };
    if clock::older_than(&row.last_seen_at, TOUCH_EVERY) {
        // best effort: a database that cannot take writes still serves reads
        let touched = sqlx::query("UPDATE sessions SET last_seen_at = ? WHERE id = ?")
            .bind(clock::now())
            .bind(row.session_id)
            .execute(db)
            .await;
        if let Err(error) = touched {
            tracing::warn!(%error, "could not note the session's last use");
        }
    }
    Ok(Some(Found {
        id: row.session_id,
        user: row.user,
        csrf: row.csrf_token,
    }))
}

/// Ends a session (logout).
pub async fn end(db: &Db, session_id: i64) -> Result<(), sqlx::Error> {
    sqlx::query("DELETE FROM sessions WHERE id = ?")
        .bind(session_id)
        .execute(db)
        .await?;
    Ok(())
}
