//! Reading the audit log for admins (no HTTP here): newest first, filtered, a page at a time.

use crate::db::Db;
use crate::db::audit::Entry;

/// Which audit rows to show. Empty strings and `None` mean "any".
#[derive(Clone, Debug, Default)]
pub struct Filter {
    pub entity: String,
    pub entity_id: Option<i64>,
    /// Part of the actor's name.
    pub actor: String,
    /// Only rows older than this id (the next page).
    pub before_id: Option<i64>,
}

/// Rows per page.
pub const PAGE: i64 = 100;

/// One page of audit rows, newest first, and the id to pass as `before_id` for the next page.
pub async fn list(db: &Db, filter: &Filter) -> Result<(Vec<Entry>, Option<i64>), sqlx::Error> {
    let entity = Some(filter.entity.trim()).filter(|e| !e.is_empty());
    let actor = Some(filter.actor.trim())
        .filter(|a| !a.is_empty())
        .map(|a| format!("%{}%", a.to_lowercase()));
    let mut rows = sqlx::query_as::<_, Entry>(
        "SELECT id, at, actor, action, entity, entity_id, before_json, after_json
         FROM audit_log
         WHERE (? IS NULL OR entity = ?)
           AND (? IS NULL OR entity_id = ?)
           AND (? IS NULL OR LOWER(actor) LIKE ?)
           AND (? IS NULL OR id < ?)
         ORDER BY id DESC LIMIT ?",
    )
    .bind(entity)
    .bind(entity)
    .bind(filter.entity_id)
    .bind(filter.entity_id)
    .bind(&actor)
    .bind(&actor)
    .bind(filter.before_id)
    .bind(filter.before_id)
    .bind(PAGE + 1)
    .fetch_all(db)
    .await?;
    let next = if rows.len() as i64 > PAGE {
        rows.truncate(PAGE as usize);
        rows.last().map(|r| r.id)
    } else {
        None
    };
    Ok((rows, next))
}

/// The kinds of record that appear in the log, for the filter's choices.
pub async fn entities(db: &Db) -> Result<Vec<String>, sqlx::Error> {
    sqlx::query_scalar("SELECT DISTINCT entity FROM audit_log ORDER BY entity")
        .fetch_all(db)
        .await
}
