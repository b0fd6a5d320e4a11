//! API bearer tokens in storage (no HTTP here): shown once when made, kept as their SHA-256,
//! revocable. A token acts with its own role, for an owner account: it stops when the owner is
//! disabled or holds a lower role than the token, and at its expiry if it has one. Tokens are
//! revoked, never deleted.

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
    /// The account the token acts for.
    pub owner_id: Option<i64>,
    /// The owner's user name.
    pub owner: Option<String>,
    /// When the token stops working (RFC 3339 UTC); `None`: no expiry.
    pub expires_at: Option<String>,
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

macro_rules! select_token {
    () => {
        "SELECT t.id, t.name, t.token_prefix, t.role, t.created_by, t.created_at,
            t.last_used_at, t.revoked_at, t.owner_id, o.username AS owner, t.expires_at
         FROM api_tokens t LEFT JOIN users o ON o.id = t.owner_id "
    };
}

const SELECT_ONE: &str = concat!(select_token!(), "WHERE t.id = ?");

/// The service account that owns tokens made on the command line without `--owner`: it holds
/// the admin role and cannot log in (its password hash matches no password). Disabling it
/// stops every such token.
pub const CLI_OWNER: &str = "cli-tokens";

async fn get(conn: &mut SqliteConnection, id: i64) -> Result<Option<ApiToken>, sqlx::Error> {
    sqlx::query_as::<_, ApiToken>(SELECT_ONE)
        .bind(id)
        .fetch_optional(conn)
        .await
}

/// Every token, newest first.
pub async fn list(db: &Db) -> Result<Vec<ApiToken>, sqlx::Error> {
    sqlx::query_as::<_, ApiToken>(concat!(select_token!(), "ORDER BY t.id DESC"))
        .fetch_all(db)
        .await
}

/// Makes a token named `name` with `role`, owned by the acting user (the command line's
/// service account [`CLI_OWNER`] when no user acts); see [`create_owned`].
pub async fn create(
    db: &Db,
    actor: &Actor,
    name: &str,
    role: Role,
) -> Result<(ApiToken, String), WriteError> {
    let owner = match actor.user_id {
        Some(id) => id,
        None => cli_owner(db).await?,
    };
    create_owned(db, actor, name, role, owner, None).await
}

/// The id of the [`CLI_OWNER`] account, made on first use.
pub async fn cli_owner(db: &Db) -> Result<i64, WriteError> {
    if let Some(user) = super::users::by_username(db, CLI_OWNER).await? {
        return Ok(user.id);
    }
    let user = super::users::create_hashed(
        db,
        &Actor::system(),
        CLI_OWNER,
        "command-line tokens",
        Role::Admin,
        "!no-login",
    )
    .await?;
    Ok(user.id)
}

/// Makes a token named `name` with `role` for the account `owner` (whose role must be at
/// least `role`), working until `expires_at` (RFC 3339) if given; returns the stored record
/// and the token itself, which is not kept and must be shown to the person once.
pub async fn create_owned(
    db: &Db,
    actor: &Actor,
    name: &str,
    role: Role,
    owner: i64,
    expires_at: Option<&str>,
) -> Result<(ApiToken, String), WriteError> {
    let name = name.trim();
    if name.is_empty() || name.chars().count() > 80 {
        return Err(WriteError::invalid(
            "name",
            "give the token a name of 1 to 80 characters",
        ));
    }
    let owner_user = super::users::find(db, owner)
        .await?
        .ok_or_else(|| WriteError::invalid("owner", "there is no such user"))?;
    if owner_user.disabled_at.is_some() {
        return Err(WriteError::invalid(
            "owner",
            format!(
                "{} is disabled; a token needs an enabled owner",
                owner_user.username
            ),
        ));
    }
    if role > owner_user.role() {
        return Err(WriteError::invalid(
            "role",
            format!(
                "a token's role cannot be above its owner's: {} is a {}",
                owner_user.username, owner_user.role
            ),
        ));
    }
    if let Some(at) = expires_at
        && clock::older_than(at, Duration::ZERO)
    {
        return Err(WriteError::invalid(
            "expires",
            "the expiry must be in the future",
        ));
    }
    let random =
        secret::random_hex(32).map_err(|e| WriteError::Db(sqlx::Error::Protocol(e.to_string())))?;
    let token = format!("{PREFIX}{random}");
    let (_write, mut tx) = crate::db::begin_write(db).await?;
    let id: i64 = sqlx::query_scalar(
        "INSERT INTO api_tokens (name, token_hash, token_prefix, role, created_by, created_at,
            owner_id, expires_at)
         VALUES (?, ?, ?, ?, ?, ?, ?, ?) RETURNING id",
    )
    .bind(name)
    .bind(secret::token_hash(&token))
    .bind(&token[..PREFIX.len() + 8])
    .bind(role.as_str())
    .bind(actor.user_id)
    .bind(clock::now())
    .bind(owner)
    .bind(expires_at)
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

/// The live token with this value, if any: not revoked, not expired, its owner enabled and
/// holding at least the token's role. Its first use each day writes an audit row `use`.
pub async fn lookup(db: &Db, token: &str) -> Result<Option<ApiToken>, sqlx::Error> {
    if !token.starts_with(PREFIX) {
        return Ok(None);
    }
    let now = clock::now();
    let found = sqlx::query_as::<_, ApiToken>(concat!(
        select_token!(),
        "WHERE t.token_hash = ? AND t.revoked_at IS NULL
           AND (t.expires_at IS NULL OR t.expires_at > ?)
           AND (t.owner_id IS NULL OR (o.disabled_at IS NULL AND
               (CASE o.role WHEN 'admin' THEN 3 WHEN 'manager' THEN 2 ELSE 1 END) >=
               (CASE t.role WHEN 'admin' THEN 3 WHEN 'manager' THEN 2 ELSE 1 END)))"
    ))
    .bind(secret::token_hash(token))
    .bind(&now)
    .fetch_optional(db)
    .await?;
    if let Some(found) = &found {
        let stale = match &found.last_used_at {
            Some(at) => clock::older_than(at, TOUCH_EVERY),
            None => true,
        };
        // best effort: a database that cannot take writes still serves reads
        if stale
            && let Err(error) = sqlx::query("UPDATE api_tokens SET last_used_at = ? WHERE id = ?")
                .bind(&now)
                .bind(found.id)
                .execute(db)
                .await
        {
            tracing::warn!(%error, "could not note the token's last use");
            return Ok(Some(found.clone()));
        }
        let first_today = found
            .last_used_at
            .as_deref()
            .is_none_or(|at| at.get(..10) != now.get(..10));
        if first_today {
            let detail = serde_json::json!({"token": found.name, "owner": found.owner});
            let actor = found.actor().name;
            let noted = super::events::note(db, &actor, "use", ("api_token", found.id), &detail);
            if let Err(error) = noted.await {
                tracing::warn!(%error, "could not audit the token's first use today");
            }
        }
    }
    Ok(found)
}
