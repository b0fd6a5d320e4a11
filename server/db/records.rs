//! The mechanics shared by the append-only shop records (drift tests, pressure-decay tests,
//! inspections): a correction is a new row that amends the latest one of the same parent, a
//! repeated client token finds the stored row instead of storing twice, and every new row gets
//! an audit row. Each table keeps its own SQL; this module holds the logic around it.

use super::write::{WriteError, is_unique_violation, snapshot};
use super::{Db, audit};
use serde::Serialize;
use sqlx::SqliteConnection;
use sqlx::sqlite::SqliteRow;

/// Whether a write stored a new row or found the one a repeated client token had stored.
#[derive(Clone, Debug, PartialEq)]
pub enum Stored<T> {
    Created(T),
    Existing(T),
}

impl<T> Stored<T> {
    pub fn record(&self) -> &T {
        match self {
            Stored::Created(r) | Stored::Existing(r) => r,
        }
    }

    pub fn into_record(self) -> T {
        match self {
            Stored::Created(r) | Stored::Existing(r) => r,
        }
    }

    pub fn is_new(&self) -> bool {
        matches!(self, Stored::Created(_))
    }
}

/// What the shared logic needs to know of a stored row.
pub trait Record: for<'r> sqlx::FromRow<'r, SqliteRow> + Serialize + Send + Unpin {
    /// The id of the machine or cylinder the record belongs to.
    fn parent_id(&self) -> i64;
    /// The later record that corrects this one, if any.
    fn amended_by_id(&self) -> Option<i64>;
}

/// One append-only table: its look-up SQL and the words its messages use.
pub struct Table {
    /// `SELECT … WHERE <row>.id = ?`.
    pub by_id: &'static str,
    /// `SELECT … WHERE <row>.client_token = ?`.
    pub by_token: &'static str,
    /// The record in messages and `NotFound` (`drift test`).
    pub noun: &'static str,
    /// The record in the audit log (`drift_test`).
    pub entity: &'static str,
    /// What the record belongs to, in messages (`cylinder`).
    pub parent: &'static str,
    /// The conflict message for a client token already used under another parent.
    pub token_clash: &'static str,
}

/// One row by id.
pub async fn get<R: Record>(
    conn: &mut SqliteConnection,
    table: &Table,
    id: i64,
) -> Result<Option<R>, sqlx::Error> {
    sqlx::query_as::<_, R>(table.by_id)
        .bind(id)
        .fetch_optional(conn)
        .await
}

/// One row by id, from the pool.
pub async fn find<R: Record>(db: &Db, table: &Table, id: i64) -> Result<Option<R>, sqlx::Error> {
    let mut conn = db.acquire().await?;
    get(&mut conn, table, id).await
}

/// The rows `sql` selects for one parent (its one `?`), in the order it gives.
pub async fn of_parent<R: Record>(
    db: &Db,
    sql: &'static str,
    parent_id: i64,
) -> Result<Vec<R>, sqlx::Error> {
    sqlx::query_as::<_, R>(sql)
        .bind(parent_id)
        .fetch_all(db)
        .await
}

/// The row stored under a client token, if any.
pub async fn by_token<R: Record>(
    conn: &mut SqliteConnection,
    table: &Table,
    token: &str,
) -> Result<Option<R>, sqlx::Error> {
    sqlx::query_as::<_, R>(table.by_token)
        .bind(token)
        .fetch_optional(conn)
        .await
}

/// The stored row for a repeated client token: `Some(Existing)` when it belongs to the same
/// parent and `new` carries the same values, a conflict when it belongs to another parent or
/// differs, `None` when the token is new (or absent).
pub async fn repeat_of<R: Record>(
    conn: &mut SqliteConnection,
    table: &Table,
    token: Option<&str>,
    parent_id: i64,
    new: &impl Serialize,
) -> Result<Option<Stored<R>>, WriteError> {
    let Some(token) = token else {
        return Ok(None);
    };
    match by_token::<R>(conn, table, token).await? {
        None => Ok(None),
        Some(found) if found.parent_id() == parent_id => {
            same_content(table, &found, new)?;
            Ok(Some(Stored::Existing(found)))
        }
        Some(_) => Err(WriteError::conflict("client_token", table.token_clash)),
    }
}

/// Fields a repeat may differ in: filled by the server (the time when none was sent) or
/// worked out from the readings by the engineering core of the day.
const DERIVED: &[&str] = &[
    "client_token",
    "tested_at",
    "readings_json",
    "analysis_json",
    "calc_version",
    "verdict",
    "diagnosis",
    "flags",
    "leak_drift_m",
    "pressure_change_pa",
    "thermal_pressure_change_pa",
];

/// Refuses a repeated client token whose record differs from the one stored under it (a
/// retry carries the same body; a different body is another record and needs its own token).
fn same_content<R: Record>(
    table: &Table,
    stored: &R,
    new: &impl Serialize,
) -> Result<(), WriteError> {
    let (stored, new) = (snapshot(stored), snapshot(new));
    let (Some(old), Some(sent)) = (stored.as_object(), new.as_object()) else {
        return Ok(());
    };
    let differ: Vec<&str> = sent
        .iter()
        .filter(|(k, _)| !DERIVED.contains(&k.as_str()) && !k.starts_with("scaled_"))
        .filter(|(k, v)| old.get(k.as_str()).is_some_and(|o| o != *v))
        .map(|(k, _)| k.as_str())
        .collect();
    if differ.is_empty() {
        return Ok(());
    }
    Err(WriteError::conflict(
        "client_token",
        format!(
            "this client token already stored {} {} with other values ({}); a new record needs \
             a new client token",
            table.noun,
            stored["id"],
            differ.join(", ")
        ),
    ))
}

/// The record `amends` corrects, checked: it exists, belongs to the same parent and no other
/// record amends it yet (a correction of a correction amends the latest one, so the chain
/// stays a line). `None` when nothing is amended.
pub async fn amended<R: Record>(
    conn: &mut SqliteConnection,
    table: &Table,
    parent_id: i64,
    amends: Option<i64>,
) -> Result<Option<R>, WriteError> {
    let Some(amends) = amends else {
        return Ok(None);
    };
    let (noun, parent) = (table.noun, table.parent);
    let old = get::<R>(conn, table, amends)
        .await?
        .ok_or_else(|| WriteError::invalid("amends", format!("there is no {noun} {amends}")))?;
    if old.parent_id() != parent_id {
        return Err(WriteError::invalid(
            "amends",
            format!("{noun} {amends} belongs to another {parent}"),
        ));
    }
    if let Some(later) = old.amended_by_id() {
        return Err(WriteError::conflict(
            "amends",
            format!("{noun} {amends} is already amended by {later}; amend that one instead"),
        ));
    }
    Ok(Some(old))
}

/// Finishes an insert (`inserted` is its `RETURNING id`): a UNIQUE violation on a client token
/// that another request stored between the look-up and the insert finds that row; otherwise
/// the new row is read back and audited (`amend` when it corrects `before`, else `create`).
pub async fn finish<R: Record>(
    conn: &mut SqliteConnection,
    table: &Table,
    actor: &str,
    inserted: Result<i64, sqlx::Error>,
    (token, parent_id, new): (Option<&str>, i64, &impl Serialize),
    before: Option<&R>,
) -> Result<Stored<R>, WriteError> {
    let id = match inserted {
        Ok(id) => id,
        Err(e) if is_unique_violation(&e) => {
            return match repeat_of(conn, table, token, parent_id, new).await? {
                Some(found) => Ok(found),
                None => Err(e.into()),
            };
        }
        Err(e) => return Err(e.into()),
    };
    let stored = get::<R>(conn, table, id)
        .await?
        .ok_or(WriteError::NotFound(table.noun))?;
    let action = if before.is_some() { "amend" } else { "create" };
    audit::record(
        conn,
        actor,
        action,
        table.entity,
        id,
        before.map(snapshot).as_ref(),
        Some(&snapshot(&stored)),
    )
    .await?;
    Ok(Stored::Created(stored))
}
