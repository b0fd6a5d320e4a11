//! Look-ups the fleet import matches rows by: sites by name, machines by unit number.

use super::Db;

/// Every site's (name, id), archived ones included (an archived site is refused on use).
pub async fn site_ids(db: &Db) -> Result<Vec<(String, i64)>, sqlx::Error> {
    sqlx::query_as("SELECT name, id FROM sites")
        .fetch_all(db)
        .await
}

/// Every machine's (unit number, id).
pub async fn machine_ids(db: &Db) -> Result<Vec<(String, i64)>, sqlx::Error> {
    sqlx::query_as("SELECT unit_number, id FROM machines")
        .fetch_all(db)
        .await
}
