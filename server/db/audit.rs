//! The audit log: every change to the registry with who made it, when, and the record before
//! and after as JSON.

use super::Db;
use super::write::snapshot;
use serde::Serialize;
use sqlx::SqliteConnection;

/// Writes one audit row inside the caller's transaction.
pub async fn record(
    conn: &mut SqliteConnection,
    actor: &str,
    action: &str,
    entity: &str,
    entity_id: i64,
    before: Option<&serde_json::Value>,
    after: Option<&serde_json::Value>,
) -> Result<(), sqlx::Error> {
    sqlx::query(
        "INSERT INTO audit_log (at, actor, action, entity, entity_id, before_json, after_json)
         VALUES (?, ?, ?, ?, ?, ?, ?)",
    )
    .bind(super::now_rfc3339())
    .bind(actor)
    .bind(action)
    .bind(entity)
    .bind(entity_id)
    .bind(before.map(|v| v.to_string()))
    .bind(after.map(|v| v.to_string()))
    .execute(conn)
    .await?;
    Ok(())
}

/// Writes the audit row of a new record (`create`, the record as stored).
pub async fn created<T: Serialize>(
    conn: &mut SqliteConnection,
    actor: &str,
    entity: &str,
    entity_id: i64,
    stored: &T,
) -> Result<(), sqlx::Error> {
    let after = snapshot(stored);
    record(conn, actor, "create", entity, entity_id, None, Some(&after)).await
}

/// Writes the audit row of a change (`action`), with the record before and after.
pub async fn changed<T: Serialize>(
    conn: &mut SqliteConnection,
    actor: &str,
    action: &str,
    entity: &str,
    entity_id: i64,
    before: &T,
    after: &T,
) -> Result<(), sqlx::Error> {
    let (before, after) = (snapshot(before), snapshot(after));
    record(
        conn,
        actor,
        action,
        entity,
        entity_id,
        Some(&before),
        Some(&after),
    )
    .await
}

/// One audit row.
#[derive(Clone, Debug, PartialEq, Serialize, sqlx::FromRow)]
pub struct Entry {
    pub id: i64,
    pub at: String,
    pub actor: String,
    pub action: String,
    pub entity: String,
    pub entity_id: i64,
    pub before_json: Option<String>,
    pub after_json: Option<String>,
}

/// The audit rows of one record, oldest first.
pub async fn for_entity(db: &Db, entity: &str, entity_id: i64) -> Result<Vec<Entry>, sqlx::Error> {
    sqlx::query_as::<_, Entry>(
        "SELECT id, at, actor, action, entity, entity_id, before_json, after_json
         FROM audit_log WHERE entity = ? AND entity_id = ? ORDER BY id",
    )
    .bind(entity)
    .bind(entity_id)
    .fetch_all(db)
    .await
}
