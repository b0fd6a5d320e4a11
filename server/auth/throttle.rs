//! Login throttling (no HTTP here). Failures count per account and address pair and per
//! address, within a window. Each failure makes the next try from there wait a little longer
//! (the delay grows, up to a few seconds), so guessing is slow; only the pair itself locks:
//! an attacker at one address can lock an account out of that address, never out of the
//! owner's own device. An admin's unlock (page or `loadhold user unlock NAME`) or a new
//! password clears an account's locks.

use super::clock;
use crate::db::Db;
use sqlx::SqliteConnection;
use time::Duration;

/// How far back failures count.
pub const WINDOW: Duration = Duration::minutes(15);
/// Failures for one account from one address (since the last success or unlock) that lock
/// that account at that address.
pub const PER_PAIR: i64 = 5;
/// Failures for one account from one address after which each try waits.
const PAIR_SLOW_AFTER: i64 = 2;
/// Failures from one address (any names) after which each try from there waits: a shop's
/// tablets may share one address, so this slows and never locks.
pub const PER_ADDRESS_SLOW: i64 = 10;
/// The first wait, doubled with each further failure.
const FIRST_DELAY_MS: i64 = 250;
/// The longest wait before a password is checked.
pub const MAX_DELAY: std::time::Duration = std::time::Duration::from_secs(5);

/// Which limit a login ran into.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Blocked {
    /// This account from this address: locked until the window moves on or an admin unlocks.
    Account,
    /// Kept for callers that match on it; addresses are only slowed.
    Address,
}

/// Recent failures for a login from one address.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq)]
pub struct Standing {
    /// For this account from this address, since its last success there or its last unlock.
    pub pair: i64,
    /// From this address, any account.
    pub address: i64,
}

impl Standing {
    pub fn locked(&self) -> bool {
        self.pair >= PER_PAIR
    }

    /// How long the next try waits before its password is checked.
    pub fn delay(&self) -> std::time::Duration {
        let grow = |n: i64, after: i64| -> i64 {
            if n < after {
                0
            } else {
                FIRST_DELAY_MS << (n - after).min(8)
            }
        };
        let ms = grow(self.pair, PAIR_SLOW_AFTER).max(grow(self.address, PER_ADDRESS_SLOW));
        std::time::Duration::from_millis(ms as u64).min(MAX_DELAY)
    }
}

/// The failures that count for a login of `username` from `address`.
pub async fn standing(db: &Db, username: &str, address: &str) -> Result<Standing, sqlx::Error> {
    let since = clock::from_now(-WINDOW);
    let pair: i64 = sqlx::query_scalar(
        "SELECT COUNT(*) FROM login_attempts
         WHERE username = ? AND address = ? AND succeeded = 0 AND at >= ?
           AND id > COALESCE((SELECT MAX(id) FROM login_attempts
               WHERE username = ? AND address = ? AND succeeded = 1), 0)
           AND id > COALESCE((SELECT MAX(after_attempt_id) FROM login_unlocks
               WHERE username = ?), 0)",
    )
    .bind(username)
    .bind(address)
    .bind(&since)
    .bind(username)
    .bind(address)
    .bind(username)
    .fetch_one(db)
    .await?;
    let address: i64 = sqlx::query_scalar(
        "SELECT COUNT(*) FROM login_attempts WHERE address = ? AND succeeded = 0 AND at >= ?",
    )
    .bind(address)
    .bind(&since)
    .fetch_one(db)
    .await?;
    Ok(Standing { pair, address })
}

/// `Some` when a login for `username` from `address` must be refused without checking the
/// password.
pub async fn check(db: &Db, username: &str, address: &str) -> Result<Option<Blocked>, sqlx::Error> {
    let standing = standing(db, username, address).await?;
    Ok(standing.locked().then_some(Blocked::Account))
}

/// Records one login attempt inside the caller's transaction; returns its id.
pub async fn record(
    conn: &mut SqliteConnection,
    username: &str,
    address: &str,
    succeeded: bool,
) -> Result<i64, sqlx::Error> {
    sqlx::query_scalar(
        "INSERT INTO login_attempts (at, username, address, succeeded) VALUES (?, ?, ?, ?)
         RETURNING id",
    )
    .bind(clock::now())
    .bind(username)
    .bind(address)
    .bind(i64::from(succeeded))
    .fetch_one(conn)
    .await
}

/// Clears the locks of `username` (every failure so far stops counting), inside the caller's
/// transaction; returns the unlock's id.
pub async fn unlock(
    conn: &mut SqliteConnection,
    username: &str,
    actor: &str,
) -> Result<i64, sqlx::Error> {
    sqlx::query_scalar(
        "INSERT INTO login_unlocks (at, username, after_attempt_id, actor)
         VALUES (?, ?, (SELECT COALESCE(MAX(id), 0) FROM login_attempts), ?) RETURNING id",
    )
    .bind(clock::now())
    .bind(username)
    .bind(actor)
    .fetch_one(conn)
    .await
}

/// The addresses from which `username` is locked now, for the admin page.
pub async fn locked_addresses(db: &Db, username: &str) -> Result<Vec<String>, sqlx::Error> {
    sqlx::query_scalar(
        "SELECT a.address FROM login_attempts a
         WHERE a.username = ? AND a.succeeded = 0 AND a.at >= ?
           AND a.id > COALESCE((SELECT MAX(s.id) FROM login_attempts s
               WHERE s.username = a.username AND s.address = a.address AND s.succeeded = 1), 0)
           AND a.id > COALESCE((SELECT MAX(u.after_attempt_id) FROM login_unlocks u
               WHERE u.username = a.username), 0)
         GROUP BY a.address HAVING COUNT(*) >= ? ORDER BY a.address",
    )
    .bind(username)
    .bind(clock::from_now(-WINDOW))
    .bind(PER_PAIR)
    .fetch_all(db)
    .await
}
