//! Login throttling (no HTTP here): too many failed logins for one account, or from one
//! address, within a window blocks further tries until the window has moved on.

use super::clock;
use crate::db::Db;
use time::Duration;

/// How far back failures count.
pub const WINDOW: Duration = Duration::minutes(15);
/// Failures for one account (since its last successful login) that block it.
pub const PER_ACCOUNT: i64 = 5;
/// Failures from one address that block it (higher: a shop's tablets may share one address).
pub const PER_ADDRESS: i64 = 20;

/// Which limit a login ran into.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Blocked {
    Account,
    Address,
}

/// `Some` when a login for `username` from `address` must be refused without checking the
/// password.
pub async fn check(db: &Db, username: &str, address: &str) -> Result<Option<Blocked>, sqlx::Error> {
    let since = clock::from_now(-WINDOW);
    let account: i64 = sqlx::query_scalar(
        "SELECT COUNT(*) FROM login_attempts
         WHERE username = ? AND succeeded = 0 AND at >= ?
           AND id > COALESCE(
               (SELECT MAX(id) FROM login_attempts WHERE username = ? AND succeeded = 1), 0)",
    )
    .bind(username)
    .bind(&since)
    .bind(username)
    .fetch_one(db)
    .await?;
    if account >= PER_ACCOUNT {
        return Ok(Some(Blocked::Account));
    }
    let address_failures: i64 = sqlx::query_scalar(
        "SELECT COUNT(*) FROM login_attempts WHERE address = ? AND succeeded = 0 AND at >= ?",
    )
    .bind(address)
    .bind(&since)
    .fetch_one(db)
    .await?;
    Ok((address_failures >= PER_ADDRESS).then_some(Blocked::Address))
}

/// Records one login attempt and whether it succeeded.
pub async fn record(
    db: &Db,
    username: &str,
    address: &str,
    succeeded: bool,
) -> Result<(), sqlx::Error> {
    sqlx::query(
        "INSERT INTO login_attempts (at, username, address, succeeded) VALUES (?, ?, ?, ?)",
    )
    .bind(clock::now())
    .bind(username)
    .bind(address)
    .bind(i64::from(succeeded))
    .execute(db)
    .await?;
    Ok(())
}
