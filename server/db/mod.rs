//! Storage: one SQLite database through sqlx. Query modules are split by aggregate; none of
//! them knows about HTTP. Quantities are stored in SI columns named with their unit.

use sqlx::SqlitePool;
use sqlx::sqlite::{SqliteConnectOptions, SqliteJournalMode, SqlitePoolOptions, SqliteSynchronous};
use std::path::Path;
use std::str::FromStr;
use std::time::Duration;

// registry
pub mod audit;
pub mod cylinder_valves;
pub mod cylinders;
pub mod health;
pub mod hoses;
pub mod import_lookup;
pub mod installed;
pub mod machines;
pub mod names;
pub mod page;
pub mod sites;
pub mod write;

// shop
pub mod decay_tests;
pub mod drift_tests;
pub mod group_commit;
pub mod inspections;
pub mod procedures;
pub mod records;
pub mod service_return;
pub mod status;
pub mod status_apply;

// reports
pub mod reports;

/// The pool type used across the storage layer.
pub type Db = SqlitePool;

/// The migrations in `migrations/`, compiled into the binary.
pub static MIGRATOR: sqlx::migrate::Migrator = sqlx::migrate!("./migrations");

/// Opens (creating if needed) the database at `path`: WAL journal, foreign keys on,
/// a busy timeout, and full fsync on commit so that an acknowledged write survives a crash.
pub async fn connect(path: &Path) -> Result<Db, sqlx::Error> {
    let options = SqliteConnectOptions::from_str(&format!("sqlite://{}", path.display()))?
        .create_if_missing(true)
        .journal_mode(SqliteJournalMode::Wal)
        .synchronous(SqliteSynchronous::Full)
        .foreign_keys(true)
        .busy_timeout(Duration::from_secs(10));
    SqlitePoolOptions::new()
        .max_connections(8)
        // sqlx pings a connection before lending it; for a local file that check is one more
        // trip to the connection's worker thread per query and can find nothing to repair
        .test_before_acquire(false)
        .min_connections(1)
        .connect_with(options)
        .await
}

/// Held while a write transaction is open. SQLite lets one writer in at a time; writers that
/// wait inside SQLite's busy handler sleep on a growing back-off (1, 2, 5, 10 ms and on) and
/// leave the lock idle between them, so the process queues its own writers here instead
/// (first come, first served) and each starts the moment the last one commits. One lock per
/// database file ([`group_commit::writer`]). Writers of other processes (the CLI, a backup)
/// still meet the busy timeout.
pub type WriteGuard = tokio::sync::OwnedMutexGuard<()>;

/// Starts a write transaction (`BEGIN IMMEDIATE`: the write lock is taken at once, so a read
/// inside it never has to be upgraded) after this process's earlier writers are done. Keep
/// the guard alive until the transaction is committed or dropped.
pub async fn begin_write(
    db: &Db,
) -> Result<(WriteGuard, sqlx::Transaction<'static, sqlx::Sqlite>), sqlx::Error> {
    let guard = group_commit::writer(db).lock.clone().lock_owned().await;
    let tx = db.begin_with("BEGIN IMMEDIATE").await?;
    Ok((guard, tx))
}

/// Opens the database and applies every pending migration.
pub async fn open(path: &Path) -> Result<Db, sqlx::Error> {
    let db = connect(path).await?;
    MIGRATOR.run(&db).await?;
    names::backfill(&db).await?;
    Ok(db)
}

/// Writes a consistent copy of the live database to `out` (SQLite `VACUUM INTO`), safe while
/// the server is writing. Refuses to overwrite an existing file.
pub async fn backup(db: &Db, out: &Path) -> Result<(), sqlx::Error> {
    if out.exists() {
        return Err(sqlx::Error::Protocol(format!(
            "{} already exists; choose a new file name",
            out.display()
        )));
    }
    sqlx::query("VACUUM INTO ?")
        .bind(out.display().to_string())
        .execute(db)
        .await?;
    Ok(())
}

/// True once the database answers a trivial query.
pub async fn ping(db: &Db) -> bool {
    sqlx::query_scalar::<_, i64>("SELECT 1")
        .fetch_one(db)
        .await
        .is_ok()
}

/// The current UTC time as RFC 3339, the form timestamps are stored in.
pub fn now_rfc3339() -> String {
    time::OffsetDateTime::now_utc()
        .replace_nanosecond(0)
        .unwrap_or_else(|_| time::OffsetDateTime::now_utc())
        .format(&time::format_description::well_known::Rfc3339)
        .unwrap_or_default()
}
