//! API bearer tokens in storage (no HTTP here): shown once when made, kept as their SHA-256,
//! revocable. A token acts with its own role. Tokens are revoked, never deleted.

use super::{Actor, Role, clock, secret};
use crate::db::write::{WriteError, snapshot};
use crate::db::{Db, audit};
use serde::Serialize;
use sqlx::SqliteConnection;
use time::Duration;

/// Every token starts with this, so a leaked one is easy to recognise in logs and code.
pub const PREFIX: &str = "lh_";
/// `last_used_at` is written at most this often, so reads stay reads.
const TOUCH_EVERY: Duration = Duration::minutes(1);

/// A stored token, without its hash.
#[derive(Clone, Debug, PartialEq, Serialize, sqlx::FromRow)]
pub struct ApiToken {
    pub id: i64,
    pub name: String,
    /// The token's first characters, for recognising it in lists.
    pub token_prefix: String,
    pub role: String,
    pub created_by: Option<i64>,
    pub created_at: String,
    pub last_used_at: Option<String>,
    pub revoked_at: Option<String>,
}

impl ApiToken {
    pub fn role(&self) -> Role {
        Role::parse(&self.role).unwrap_or(Role::Technician)
    }

    /// The actor a request with this token acts as; the audit log shows `token NAME`.
    pub fn actor(&self) -> Actor {
        Actor {
            user_id: None,
            name: format!("token {}", self.name),
            role: self.role(),
        }
    }
}

const SELECT_ONE: &str = "SELECT id, name, token_prefix, role, created_by, created_at,
    last_used_at, revoked_at FROM api_tokens WHERE id = ?";

async fn get(conn: &mut SqliteConnection, id: i64) -> Result<Option<ApiToken>, sqlx::Error> {
    sqlx::query_as::<_, ApiToken>(SELECT_ONE)
        .bind(id)
        .fetch_optional(conn)
        .await
}

/// Every token, newest first.
pub async fn list(db: &Db) -> Result<Vec<ApiToken>, sqlx::Error> {
    sqlx::query_as::<_, ApiToken>(
        "SELECT id, name, token_prefix, role, created_by, created_at, last_used_at, revoked_at
         FROM api_tokens ORDER BY id DESC",
    )
    .fetch_all(db)
    .await
}

/// Makes a token named `name` with `role`; returns the stored record and the token itself,
/// which is not kept and must be shown to the person once.
pub async fn create(
    db: &Db,
    actor: &Actor,
    name: &str,
    role: Role,
) -> Result<(ApiToken, String), WriteError> {
    let name = name.trim();
    if name.is_empty() || name.chars().count() > 80 {
        return Err(WriteError::invalid(
            "name",
            "give the token a name of 1 to 80 characters",
        ));
    }
    let random =
        secret::random_hex(32).map_err(|e| WriteError::Db(sqlx::Error::Protocol(e.to_string())))?;
    let token = format!("{PREFIX}{random}");
    let (_write, mut tx) = crate::db::begin_write(db).await?;
    let id: i64 = sqlx::query_scalar(
        "INSERT INTO api_tokens (name, token_hash, token_prefix, role, created_by, created_at)
         VALUES (?, ?, ?, ?, ?, ?) RETURNING id",
    )
    .bind(name)
    .bind(secret::token_hash(&token))
    .bind(&token[..PREFIX.len() + 8])
    .bind(role.as_str())
    .bind(actor.user_id)
    .bind(clock::now())
    .fetch_one(&mut *tx)
    .await?;
    let stored = get(&mut tx, id)
        .await?
        .ok_or(WriteError::NotFound("token"))?;
    let after = snapshot(&stored);
    audit::record(
        &mut tx,
        &actor.name,
        "create",
        "api_token",
        id,
        None,
        Some(&after),
    )
    .await?;
    tx.commit().await?;
    Ok((stored, token))
}

/// Revokes a token: from now on it is refused. Revoking twice changes nothing.
pub async fn revoke(db: &Db, actor: &Actor, id: i64) -> Result<ApiToken, WriteError> {
    let (_write, mut tx) = crate::db::begin_write(db).await?;
    let before = get(&mut tx, id)
        .await?
        .ok_or(WriteError::NotFound("token"))?;
    if before.revoked_at.is_some() {
        return Ok(before);
    }
    sqlx::query("UPDATE api_tokens SET revoked_at = ? WHERE id = ?")
        .bind(clock::now())
        .bind(id)
        .execute(&mut *tx)
        .await?;
    let after = get(&mut tx, id)
        .await?
        .ok_or(WriteError::NotFound("token"))?;
    let (b, a) = (snapshot(&before), snapshot(&after));
    audit::record(
        &mut tx,
        &actor.name,
        "revoke",
        "api_token",
        id,
        Some(&b),
        Some(&a),
    )
    .await?;
    tx.commit().await?;
    Ok(after)
}

/// The live (not revoked) token with this value, if any.
pub async fn lookup(db: &Db, token: &str) -> Result<Option<ApiToken>, sqlx::Error> {
    if !token.starts_with(PREFIX) {
        return Ok(None);
    }
    let found = sqlx::query_as::<_, ApiToken>(
        "SELECT id, name, token_prefix, role, created_by, created_at, last_used_at, revoked_at
         FROM api_tokens WHERE token_hash = ? AND revoked_at IS NULL",
    )
    .bind(secret::token_hash(token))
    .fetch_optional(db)
    .await?;
    if let Some(found) = &found {
        let stale = match &found.last_used_at {
            Some(at) => clock::older_than(at, TOUCH_EVERY),
            None => true,
        };
        if stale {
            sqlx::query("UPDATE api_tokens SET last_used_at = ? WHERE id = ?")
                .bind(clock::now())
                .bind(found.id)
                .execute(db)
                .await?;
        }
    }
    Ok(found)
}
