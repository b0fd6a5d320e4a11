//! Audit rows for what happens to accounts outside registry writes: logins, failed logins
//! (with the address), logouts, a token's first use each day. Each is its own small write
//! transaction (no HTTP here).

use crate::db::{Db, audit};
use serde_json::Value;

/// One audit row, written and committed on its own.
pub async fn note(
    db: &Db,
    actor: &str,
    action: &str,
    (entity, entity_id): (&str, i64),
    detail: &Value,
) -> Result<(), sqlx::Error> {
    let (_write, mut tx) = crate::db::begin_write(db).await?;
    audit::record(
        &mut tx,
        actor,
        action,
        entity,
        entity_id,
        None,
        Some(detail),
    )
    .await?;
    tx.commit().await
}
