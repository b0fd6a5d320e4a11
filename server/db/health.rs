//! Can the database take writes? `/healthz` asks with a write that is rolled back; every
//! handler's database error is sorted here into "busy, try again" and "cannot be written" (both
//! 503, never a generic 500), from SQLite's primary result codes.

use super::Db;
use std::time::Duration;

/// Why the database cannot take a write now.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Unavailable {
    /// Another writer (another process, a backup) holds the write lock past the busy timeout.
    Busy,
    /// The file cannot be written: read-only file or mount, full disk, input/output error.
    NotWritable,
}

impl Unavailable {
    pub fn code(self) -> &'static str {
        match self {
            Unavailable::Busy => "database_busy",
            Unavailable::NotWritable => "database_not_writable",
        }
    }

    pub fn message(self) -> &'static str {
        match self {
            Unavailable::Busy => {
                "the database is busy with another writer; nothing was saved, try again in a few \
                 seconds"
            }
            Unavailable::NotWritable => {
                "the database cannot be written (read-only, full or failing disk); nothing was \
                 saved. Reading still works; tell the administrator"
            }
        }
    }

    /// Seconds a client should wait before trying again.
    pub fn retry_after_s(self) -> u32 {
        match self {
            Unavailable::Busy => 5,
            Unavailable::NotWritable => 60,
        }
    }
}

// SQLite primary result codes (sqlite.org/rescode.html).
const SQLITE_BUSY: i64 = 5;
const SQLITE_LOCKED: i64 = 6;
const SQLITE_READONLY: i64 = 8;
const SQLITE_IOERR: i64 = 10;
const SQLITE_FULL: i64 = 13;
const SQLITE_CANTOPEN: i64 = 14;

/// `Some` when `error` says the database is busy or cannot be written.
pub fn unavailable(error: &sqlx::Error) -> Option<Unavailable> {
    let code = error.as_database_error()?.code()?;
    let primary = code.parse::<i64>().ok()? & 0xff;
    match primary {
        SQLITE_BUSY | SQLITE_LOCKED => Some(Unavailable::Busy),
        SQLITE_READONLY | SQLITE_IOERR | SQLITE_FULL | SQLITE_CANTOPEN => {
            Some(Unavailable::NotWritable)
        }
        _ => None,
    }
}

/// How long the health check waits for another process's write lock (2 s).
const CHECK_BUSY: &str = "PRAGMA busy_timeout = 2000";
/// The pool's busy timeout (`db::connect`, 10 s), restored after the check.
const POOL_BUSY: &str = "PRAGMA busy_timeout = 10000";

/// Takes the write lock and writes a row, then rolls back: proves the file is writable and the
/// lock obtainable now, and leaves nothing behind.
pub async fn check_write(db: &Db) -> Result<(), sqlx::Error> {
    let _guard = super::group_commit::writer(db)
        .lock
        .clone()
        .lock_owned()
        .await;
    let mut conn = db.acquire().await?;
    sqlx::query(CHECK_BUSY).execute(&mut *conn).await?;
    let attempt = async {
        sqlx::query("BEGIN IMMEDIATE").execute(&mut *conn).await?;
        let wrote = sqlx::query("UPDATE report_settings SET updated_at = updated_at WHERE id = 1")
            .execute(&mut *conn)
            .await;
        let rolled = sqlx::query("ROLLBACK").execute(&mut *conn).await;
        wrote.and(rolled).map(|_| ())
    };
    let result = tokio::time::timeout(Duration::from_secs(5), attempt)
        .await
        .unwrap_or(Err(sqlx::Error::PoolTimedOut));
    let _ = sqlx::query(POOL_BUSY).execute(&mut *conn).await;
    if result.is_err() {
        // the connection may hold a half-open transaction: do not lend it out again
        conn.detach();
    }
    result
}
