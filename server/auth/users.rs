//! User accounts in storage (no HTTP here). Every change is written with an audit row in the
//! same transaction. Users are never deleted, only disabled.

use super::password::{self, PasswordError};
use super::{Actor, Role, throttle};
use crate::db::write::{WriteError, is_unique_violation, snapshot};
use crate::db::{Db, audit, now_rfc3339};
use serde::Serialize;
use sqlx::SqliteConnection;

/// A stored user, without the password hash (this is what the audit log keeps).
#[derive(Clone, Debug, PartialEq, Serialize, sqlx::FromRow)]
pub struct User {
    pub id: i64,
    pub username: String,
    pub display_name: String,
    /// `technician`, `manager` or `admin`.
    pub role: String,
    pub created_at: String,
    pub updated_at: String,
    pub disabled_at: Option<String>,
}

impl User {
    pub fn role(&self) -> Role {
        Role::parse(&self.role).unwrap_or(Role::Technician)
    }

    /// The actor this user acts as.
    pub fn actor(&self) -> Actor {
        Actor {
            user_id: Some(self.id),
            name: self.display_name.clone(),
            role: self.role(),
        }
    }
}

/// A user name as stored: trimmed, lower case, 2 to 40 of `a-z 0-9 . _ -`.
pub fn normalize_username(text: &str) -> Result<String, WriteError> {
    let name = text.trim().to_ascii_lowercase();
    let ok_chars = name
        .bytes()
        .all(|b| b.is_ascii_lowercase() || b.is_ascii_digit() || b"._-".contains(&b));
    if name.len() < 2 || name.len() > 40 || !ok_chars {
        return Err(WriteError::invalid(
            "username",
            "use 2 to 40 letters, digits, dots, dashes or underscores",
        ));
    }
    Ok(name)
}

fn password_error(error: PasswordError) -> WriteError {
    match error {
        PasswordError::Hash(cause) => WriteError::Db(sqlx::Error::Protocol(cause)),
        other => WriteError::invalid("password", other.to_string()),
    }
}

/// Checks and hashes a password for `username`.
pub fn hash_for(username: &str, password: &str) -> Result<String, WriteError> {
    password::check(username, password).map_err(password_error)?;
    password::hash(password).map_err(password_error)
}

async fn get(conn: &mut SqliteConnection, id: i64) -> Result<Option<User>, sqlx::Error> {
    sqlx::query_as::<_, User>(
        "SELECT id, username, display_name, role, created_at, updated_at, disabled_at
         FROM users WHERE id = ?",
    )
    .bind(id)
    .fetch_optional(conn)
    .await
}

/// One user by id.
pub async fn find(db: &Db, id: i64) -> Result<Option<User>, sqlx::Error> {
    let mut conn = db.acquire().await?;
    get(&mut conn, id).await
}

/// Every user, by user name.
pub async fn list(db: &Db) -> Result<Vec<User>, sqlx::Error> {
    sqlx::query_as::<_, User>(
        "SELECT id, username, display_name, role, created_at, updated_at, disabled_at
         FROM users ORDER BY username",
    )
    .fetch_all(db)
    .await
}

/// The user with this user name and their password hash, if the account is enabled.
pub async fn credentials(db: &Db, username: &str) -> Result<Option<(User, String)>, sqlx::Error> {
    #[derive(sqlx::FromRow)]
    struct Row {
        #[sqlx(flatten)]
        user: User,
        password_hash: String,
    }
    let row = sqlx::query_as::<_, Row>(
        "SELECT id, username, display_name, role, created_at, updated_at, disabled_at,
            password_hash
         FROM users WHERE username = ? AND disabled_at IS NULL",
    )
    .bind(username)
    .fetch_optional(db)
    .await?;
    Ok(row.map(|r| (r.user, r.password_hash)))
}

/// Creates a user whose password is already hashed (see `hash_for`).
pub async fn create_hashed(
    db: &Db,
    actor: &Actor,
    username: &str,
    display_name: &str,
    role: Role,
    password_hash: &str,
) -> Result<User, WriteError> {
    let username = normalize_username(username)?;
    let display_name = match display_name.trim() {
        "" => username.clone(),
        name if name.chars().count() > 80 => {
            return Err(WriteError::invalid(
                "display_name",
                "use at most 80 characters",
            ));
        }
        name => name.to_string(),
    };
    let at = now_rfc3339();
    let (_write, mut tx) = crate::db::begin_write(db).await?;
    let id: i64 = sqlx::query_scalar(
        "INSERT INTO users (username, display_name, role, password_hash, created_at, updated_at)
         VALUES (?, ?, ?, ?, ?, ?) RETURNING id",
    )
    .bind(&username)
    .bind(&display_name)
    .bind(role.as_str())
    .bind(password_hash)
    .bind(&at)
    .bind(&at)
    .fetch_one(&mut *tx)
    .await
    .map_err(|e| {
        if is_unique_violation(&e) {
            WriteError::conflict("username", format!("the user name \"{username}\" is taken"))
        } else {
            e.into()
        }
    })?;
    let user = get(&mut tx, id)
        .await?
        .ok_or(WriteError::NotFound("user"))?;
    let after = snapshot(&user);
    audit::record(
        &mut tx,
        &actor.name,
        "create",
        "user",
        id,
        None,
        Some(&after),
    )
    .await?;
    tx.commit().await?;
    Ok(user)
}

/// Creates a user: checks the user name and password rules, hashes the password.
pub async fn create(
    db: &Db,
    actor: &Actor,
    username: &str,
    display_name: &str,
    role: Role,
    password: &str,
) -> Result<User, WriteError> {
    let normalized = normalize_username(username)?;
    let hash = hash_for(&normalized, password)?;
    create_hashed(db, actor, &normalized, display_name, role, &hash).await
}

/// Number of enabled admins other than `except`.
async fn other_admins(conn: &mut SqliteConnection, except: i64) -> Result<i64, sqlx::Error> {
    sqlx::query_scalar(
        "SELECT COUNT(*) FROM users WHERE role = 'admin' AND disabled_at IS NULL AND id <> ?
           AND username <> 'cli-tokens'",
    )
    .bind(except)
    .fetch_one(conn)
    .await
}

/// What an admin can change on a user.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Change {
    Role(Role),
    Disable,
    Enable,
}

/// Applies one change to a user, with its audit row. Refuses to leave no enabled admin.
/// Disabling a user ends their sessions.
pub async fn change(db: &Db, actor: &Actor, id: i64, change: Change) -> Result<User, WriteError> {
    let at = now_rfc3339();
    let (_write, mut tx) = crate::db::begin_write(db).await?;
    let before = get(&mut tx, id)
        .await?
        .ok_or(WriteError::NotFound("user"))?;
    let loses_admin = before.role() == Role::Admin
        && before.disabled_at.is_none()
        && matches!(
            change,
            Change::Disable | Change::Role(Role::Technician | Role::Manager)
        );
    if loses_admin && other_admins(&mut tx, id).await? == 0 {
        let field = if change == Change::Disable {
            "user"
        } else {
            "role"
        };
        return Err(WriteError::invalid(
            field,
            "this is the last enabled admin; make another admin first",
        ));
    }
    let unchanged = match change {
        Change::Role(role) => before.role() == role,
        Change::Disable => before.disabled_at.is_some(),
        Change::Enable => before.disabled_at.is_none(),
    };
    if unchanged {
        return Ok(before);
    }
    let (action, query) = match change {
        Change::Role(role) => (
            "update",
            sqlx::query("UPDATE users SET role = ?, updated_at = ? WHERE id = ?")
                .bind(role.as_str())
                .bind(&at),
        ),
        Change::Disable => (
            "disable",
            sqlx::query("UPDATE users SET disabled_at = ?, updated_at = ? WHERE id = ?")
                .bind(&at)
                .bind(&at),
        ),
        Change::Enable => (
            "enable",
            sqlx::query("UPDATE users SET disabled_at = NULL, updated_at = ? WHERE id = ?")
                .bind(&at),
        ),
    };
    let query = query.bind(id);
    query.execute(&mut *tx).await?;
    if change == Change::Disable {
        sqlx::query("DELETE FROM sessions WHERE user_id = ?")
            .bind(id)
            .execute(&mut *tx)
            .await?;
    }
    let after = get(&mut tx, id)
        .await?
        .ok_or(WriteError::NotFound("user"))?;
    let (b, a) = (snapshot(&before), snapshot(&after));
    audit::record(&mut tx, &actor.name, action, "user", id, Some(&b), Some(&a)).await?;
    tx.commit().await?;
    Ok(after)
}

/// Sets a new password for a user (checked and hashed), with an audit row that shows the
/// change of `updated_at` but never the hash.
pub async fn set_password(
    db: &Db,
    actor: &Actor,
    id: i64,
    password: &str,
) -> Result<User, WriteError> {
    let before = find(db, id).await?.ok_or(WriteError::NotFound("user"))?;
    let hash = hash_for(&before.username, password)?;
    let at = now_rfc3339();
    let (_write, mut tx) = crate::db::begin_write(db).await?;
    sqlx::query("UPDATE users SET password_hash = ?, updated_at = ? WHERE id = ?")
        .bind(&hash)
        .bind(&at)
        .bind(id)
        .execute(&mut *tx)
        .await?;
    sqlx::query("DELETE FROM sessions WHERE user_id = ?")
        .bind(id)
        .execute(&mut *tx)
        .await?;
    // a new password ends any lock that failed logins put on the account
    throttle::unlock(&mut tx, &before.username, &actor.name).await?;
    let after = get(&mut tx, id)
        .await?
        .ok_or(WriteError::NotFound("user"))?;
    let (b, a) = (snapshot(&before), snapshot(&after));
    audit::record(
        &mut tx,
        &actor.name,
        "set_password",
        "user",
        id,
        Some(&b),
        Some(&a),
    )
    .await?;
    tx.commit().await?;
    Ok(after)
}

/// Clears the login locks of a user (every failed login so far stops counting), with an audit
/// row `unlock` that names the addresses it was locked from.
pub async fn unlock(db: &Db, actor: &Actor, id: i64) -> Result<User, WriteError> {
    let user = find(db, id).await?.ok_or(WriteError::NotFound("user"))?;
    let addresses = throttle::locked_addresses(db, &user.username).await?;
    let (_write, mut tx) = crate::db::begin_write(db).await?;
    throttle::unlock(&mut tx, &user.username, &actor.name).await?;
    let detail = serde_json::json!({"username": user.username, "locked_from": addresses});
    audit::record(
        &mut tx,
        &actor.name,
        "unlock",
        "user",
        id,
        None,
        Some(&detail),
    )
    .await?;
    tx.commit().await?;
    Ok(user)
}

/// One user by user name (as stored: lower case).
pub async fn by_username(db: &Db, username: &str) -> Result<Option<User>, sqlx::Error> {
    sqlx::query_as::<_, User>(
        "SELECT id, username, display_name, role, created_at, updated_at, disabled_at
         FROM users WHERE username = ?",
    )
    .bind(username.trim().to_ascii_lowercase())
    .fetch_optional(db)
    .await
}
