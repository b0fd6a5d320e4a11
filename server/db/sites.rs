//! Sites (yards, depots): a name and the units their people read.

use super::page::{Page, Window};
use super::write::{WriteError, archived_at_after, change_action, unique_as};
use super::{Db, audit};
use serde::Serialize;
use sqlx::SqliteConnection;

/// A stored site, with the number of machines on it (archived machines not counted).
#[derive(Clone, Debug, PartialEq, Serialize, sqlx::FromRow)]
pub struct Site {
    pub id: i64,
    pub name: String,
    /// `us` or `metric`: the units pages and responses use for this site's records.
    pub units: String,
    pub created_at: String,
    pub updated_at: String,
    pub archived_at: Option<String>,
    pub machine_count: i64,
    /// How much trapped oil may warm on this site, K (`None`: the default; migration 0007).
    pub trapped_oil_warming_k: Option<f64>,
}

/// The fields a client writes.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct SiteFields {
    pub name: String,
    pub units: String,
    pub trapped_oil_warming_k: Option<f64>,
}

impl Site {
    pub fn fields(&self) -> SiteFields {
        SiteFields {
            name: self.name.clone(),
            units: self.units.clone(),
            trapped_oil_warming_k: self.trapped_oil_warming_k,
        }
    }
}

const SELECT_ONE: &str = "SELECT s.id, s.name, s.units, s.created_at, s.updated_at, s.archived_at,
    s.trapped_oil_warming_k,
    (SELECT COUNT(*) FROM machines m WHERE m.site_id = s.id AND m.archived_at IS NULL)
        AS machine_count
    FROM sites s WHERE s.id = ?";

/// One site by id.
pub async fn get(conn: &mut SqliteConnection, id: i64) -> Result<Option<Site>, sqlx::Error> {
    sqlx::query_as::<_, Site>(SELECT_ONE)
        .bind(id)
        .fetch_optional(conn)
        .await
}

/// One site by id, from the pool.
pub async fn find(db: &Db, id: i64) -> Result<Option<Site>, sqlx::Error> {
    let mut conn = db.acquire().await?;
    get(&mut conn, id).await
}

/// Sites by id, archived ones only when asked, one page at a time.
pub async fn list(
    db: &Db,
    include_archived: bool,
    window: Window,
) -> Result<Page<Site>, sqlx::Error> {
    let rows = sqlx::query_as::<_, Site>(
        "SELECT s.id, s.name, s.units, s.created_at, s.updated_at, s.archived_at,
            s.trapped_oil_warming_k,
            (SELECT COUNT(*) FROM machines m WHERE m.site_id = s.id AND m.archived_at IS NULL)
                AS machine_count
         FROM sites s
         WHERE s.id > ? AND (? = 1 OR s.archived_at IS NULL)
         ORDER BY s.id LIMIT ?",
    )
    .bind(window.after_id)
    .bind(i64::from(include_archived))
    .bind(window.fetch())
    .fetch_all(db)
    .await?;
    Ok(Page::from_rows(rows, window, |s| s.id))
}

fn duplicate(name: &str) -> WriteError {
    WriteError::conflict("name", format!("a site named \"{name}\" already exists"))
}

/// Registers a site; `at` is the registration time (RFC 3339).
pub async fn insert(
    conn: &mut SqliteConnection,
    actor: &str,
    at: &str,
    fields: &SiteFields,
) -> Result<Site, WriteError> {
    super::names::check_site(conn, None, &fields.name).await?;
    let id: i64 = sqlx::query_scalar(
        "INSERT INTO sites (name, units, trapped_oil_warming_k, created_at, updated_at)
         VALUES (?, ?, ?, ?, ?) RETURNING id",
    )
    .bind(&fields.name)
    .bind(&fields.units)
    .bind(fields.trapped_oil_warming_k)
    .bind(at)
    .bind(at)
    .fetch_one(&mut *conn)
    .await
    .map_err(unique_as(|| duplicate(&fields.name)))?;
    super::names::store_site_key(conn, id).await?;
    let site = get(conn, id).await?.ok_or(WriteError::NotFound("site"))?;
    audit::created(conn, actor, "site", id, &site).await?;
    Ok(site)
}

/// Changes a site's fields and, when `archived` is given, archives or restores it.
pub async fn update(
    conn: &mut SqliteConnection,
    actor: &str,
    id: i64,
    fields: &SiteFields,
    archived: Option<bool>,
) -> Result<Site, WriteError> {
    let before = get(conn, id).await?.ok_or(WriteError::NotFound("site"))?;
    let archived_at = archived_at_after(&before.archived_at, archived, super::now_rfc3339);
    if before.fields() == *fields && archived_at == before.archived_at {
        return Ok(before);
    }
    let renamed = fields.name != before.name;
    if renamed {
        super::names::check_site(conn, Some(id), &fields.name).await?;
    }
    sqlx::query(
        "UPDATE sites SET name = ?, units = ?, trapped_oil_warming_k = ?, archived_at = ?,
            updated_at = ?
         WHERE id = ?",
    )
    .bind(&fields.name)
    .bind(&fields.units)
    .bind(fields.trapped_oil_warming_k)
    .bind(&archived_at)
    .bind(super::now_rfc3339())
    .bind(id)
    .execute(&mut *conn)
    .await
    .map_err(unique_as(|| duplicate(&fields.name)))?;
    if renamed {
        super::names::store_site_key(conn, id).await?;
    }
    let after = get(conn, id).await?.ok_or(WriteError::NotFound("site"))?;
    let action = change_action(&before.archived_at, &after.archived_at);
    audit::changed(conn, actor, action, "site", id, &before, &after).await?;
    Ok(after)
}

/// Checks that `site_id` names a site that is not archived; the error names `field`.
pub async fn check_usable(
    conn: &mut SqliteConnection,
    field: &'static str,
    site_id: i64,
) -> Result<Site, WriteError> {
    match get(conn, site_id).await? {
        None => Err(WriteError::invalid(
            field,
            format!("there is no site {site_id}"),
        )),
        Some(site) if site.archived_at.is_some() => Err(WriteError::invalid(
            field,
            format!("site {site_id} is archived; restore it or choose another"),
        )),
        Some(site) => Ok(site),
    }
}

/// Every site that is not archived, by name (for pickers).
pub async fn all_active(db: &Db) -> Result<Vec<Site>, sqlx::Error> {
    sqlx::query_as::<_, Site>(
        "SELECT s.id, s.name, s.units, s.created_at, s.updated_at, s.archived_at,
            s.trapped_oil_warming_k,
            (SELECT COUNT(*) FROM machines m WHERE m.site_id = s.id AND m.archived_at IS NULL)
                AS machine_count
         FROM sites s WHERE s.archived_at IS NULL ORDER BY s.name",
    )
    .fetch_all(db)
    .await
}
