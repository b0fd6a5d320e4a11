//! Machines: a unit number, what kind it is, where it lives, its status, hour meter, relief
//! setting and inspection intervals.

use super::page::{Page, Window, contains_pattern};
use super::write::{WriteError, archived_at_after, change_action, unique_as};
use super::{Db, audit, sites};
use serde::Serialize;
use sqlx::SqliteConnection;

/// A stored machine with its site's name and units and the count of its cylinders and hoses
/// (archived ones not counted).
#[derive(Clone, Debug, PartialEq, Serialize, sqlx::FromRow)]
pub struct Machine {
    pub id: i64,
    pub unit_number: String,
    pub site_id: Option<i64>,
    pub site_name: Option<String>,
    pub site_units: Option<String>,
    pub kind: String,
    pub description: Option<String>,
    pub serial: Option<String>,
    pub status: String,
    pub out_of_service_reason: Option<String>,
    pub out_of_service_since: Option<String>,
    pub relief_pressure_pa: Option<f64>,
    pub hour_meter_h: Option<f64>,
    pub hour_meter_read_on: Option<String>,
    pub periodic_interval_days: Option<i64>,
    pub periodic_interval_hours: Option<f64>,
    pub frequent_interval_days: Option<i64>,
    pub created_at: String,
    pub updated_at: String,
    pub archived_at: Option<String>,
    pub cylinder_count: i64,
    pub hose_count: i64,
}

/// The fields a client writes, SI.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct MachineFields {
    pub unit_number: String,
    pub site_id: Option<i64>,
    pub kind: String,
    pub description: Option<String>,
    pub serial: Option<String>,
    /// `in_service` or `out_of_service`.
    pub status: String,
    pub out_of_service_reason: Option<String>,
    pub out_of_service_since: Option<String>,
    pub relief_pressure_pa: Option<f64>,
    pub hour_meter_h: Option<f64>,
    pub hour_meter_read_on: Option<String>,
    pub periodic_interval_days: Option<i64>,
    pub periodic_interval_hours: Option<f64>,
    pub frequent_interval_days: Option<i64>,
}

impl Default for MachineFields {
    fn default() -> Self {
        MachineFields {
            unit_number: String::new(),
            site_id: None,
            kind: String::new(),
            description: None,
            serial: None,
            status: "in_service".into(),
            out_of_service_reason: None,
            out_of_service_since: None,
            relief_pressure_pa: None,
            hour_meter_h: None,
            hour_meter_read_on: None,
            periodic_interval_days: None,
            periodic_interval_hours: None,
            frequent_interval_days: None,
        }
    }
}

impl Machine {
    pub fn fields(&self) -> MachineFields {
        MachineFields {
            unit_number: self.unit_number.clone(),
            site_id: self.site_id,
            kind: self.kind.clone(),
            description: self.description.clone(),
            serial: self.serial.clone(),
            status: self.status.clone(),
            out_of_service_reason: self.out_of_service_reason.clone(),
            out_of_service_since: self.out_of_service_since.clone(),
            relief_pressure_pa: self.relief_pressure_pa,
            hour_meter_h: self.hour_meter_h,
            hour_meter_read_on: self.hour_meter_read_on.clone(),
            periodic_interval_days: self.periodic_interval_days,
            periodic_interval_hours: self.periodic_interval_hours,
            frequent_interval_days: self.frequent_interval_days,
        }
    }
}

/// The filters of the fleet list; `None` means "any".
#[derive(Clone, Debug, Default, PartialEq)]
pub struct MachineFilter {
    pub site_id: Option<i64>,
    pub status: Option<String>,
    pub kind: Option<String>,
    /// Text found in the unit number, description or serial (case-insensitive).
    pub q: Option<String>,
    pub include_archived: bool,
}

macro_rules! select_machine {
    () => {
        "SELECT m.id, m.unit_number, m.site_id, s.name AS site_name, s.units AS site_units,
            m.kind, m.description, m.serial, m.status, m.out_of_service_reason,
            m.out_of_service_since, m.relief_pressure_pa, m.hour_meter_h, m.hour_meter_read_on,
            m.periodic_interval_days, m.periodic_interval_hours, m.frequent_interval_days,
            m.created_at, m.updated_at, m.archived_at,
            (SELECT COUNT(*) FROM cylinders c WHERE c.machine_id = m.id AND c.archived_at IS NULL)
                AS cylinder_count,
            (SELECT COUNT(*) FROM hoses h WHERE h.machine_id = m.id AND h.archived_at IS NULL)
                AS hose_count
         FROM machines m LEFT JOIN sites s ON s.id = m.site_id "
    };
}

/// One machine by id.
pub async fn get(conn: &mut SqliteConnection, id: i64) -> Result<Option<Machine>, sqlx::Error> {
    sqlx::query_as::<_, Machine>(concat!(select_machine!(), "WHERE m.id = ?"))
        .bind(id)
        .fetch_optional(conn)
        .await
}

/// One machine by id, from the pool.
pub async fn find(db: &Db, id: i64) -> Result<Option<Machine>, sqlx::Error> {
    let mut conn = db.acquire().await?;
    get(&mut conn, id).await
}

/// The fleet list, filtered, one page at a time (by id), in one query.
pub async fn list(
    db: &Db,
    filter: &MachineFilter,
    window: Window,
) -> Result<Page<Machine>, sqlx::Error> {
    let pattern = filter.q.as_deref().map(contains_pattern);
    let rows = sqlx::query_as::<_, Machine>(concat!(
        select_machine!(),
        "WHERE m.id > ?
           AND (? IS NULL OR m.site_id = ?)
           AND (? IS NULL OR m.status = ?)
           AND (? IS NULL OR m.kind = ?)
           AND (? IS NULL OR LOWER(m.unit_number) LIKE ? ESCAPE '\\'
                OR LOWER(COALESCE(m.description, '')) LIKE ? ESCAPE '\\'
                OR LOWER(COALESCE(m.serial, '')) LIKE ? ESCAPE '\\'
                OR ",
        crate::unit_key_sql!("m.unit_number"),
        " LIKE ?)
           AND (? = 1 OR m.archived_at IS NULL)
         ORDER BY m.id LIMIT ?"
    ))
    .bind(window.after_id)
    .bind(filter.site_id)
    .bind(filter.site_id)
    .bind(&filter.status)
    .bind(&filter.status)
    .bind(&filter.kind)
    .bind(&filter.kind)
    .bind(&pattern)
    .bind(&pattern)
    .bind(&pattern)
    .bind(&pattern)
    .bind(
        filter
            .q
            .as_deref()
            .and_then(super::unit_search::key_pattern),
    )
    .bind(i64::from(filter.include_archived))
    .bind(window.fetch())
    .fetch_all(db)
    .await?;
    Ok(Page::from_rows(rows, window, |m| m.id))
}

/// The machine kinds in use, for the list's filter.
pub async fn kinds(db: &Db) -> Result<Vec<String>, sqlx::Error> {
    sqlx::query_scalar("SELECT DISTINCT kind FROM machines WHERE archived_at IS NULL ORDER BY kind")
        .fetch_all(db)
        .await
}

fn duplicate(unit_number: &str) -> WriteError {
    WriteError::conflict(
        "unit_number",
        format!("unit number \"{unit_number}\" is already registered"),
    )
}

fn map_unique(unit_number: &str) -> impl FnOnce(sqlx::Error) -> WriteError + '_ {
    unique_as(move || duplicate(unit_number))
}

/// Registers a machine; `at` is the registration time (RFC 3339). Refuses an unknown or
/// archived site (`site_id`) and a unit number already in use (`unit_number`, conflict).
pub async fn insert(
    conn: &mut SqliteConnection,
    actor: &str,
    at: &str,
    f: &MachineFields,
) -> Result<Machine, WriteError> {
    if let Some(site_id) = f.site_id {
        sites::check_usable(conn, "site_id", site_id).await?;
    }
    let id: i64 = sqlx::query_scalar(
        "INSERT INTO machines (unit_number, site_id, kind, description, serial, status,
            out_of_service_reason, out_of_service_since, relief_pressure_pa, hour_meter_h,
            hour_meter_read_on, periodic_interval_days, periodic_interval_hours,
            frequent_interval_days, created_at, updated_at)
         VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?) RETURNING id",
    )
    .bind(&f.unit_number)
    .bind(f.site_id)
    .bind(&f.kind)
    .bind(&f.description)
    .bind(&f.serial)
    .bind(&f.status)
    .bind(&f.out_of_service_reason)
    .bind(&f.out_of_service_since)
    .bind(f.relief_pressure_pa)
    .bind(f.hour_meter_h)
    .bind(&f.hour_meter_read_on)
    .bind(f.periodic_interval_days)
    .bind(f.periodic_interval_hours)
    .bind(f.frequent_interval_days)
    .bind(at)
    .bind(at)
    .fetch_one(&mut *conn)
    .await
    .map_err(map_unique(&f.unit_number))?;
    let machine = get(conn, id)
        .await?
        .ok_or(WriteError::NotFound("machine"))?;
    audit::created(conn, actor, "machine", id, &machine).await?;
    Ok(machine)
}

/// Changes a machine's fields and, when `archived` is given, archives or restores it; one
/// audit row for the change. A site is checked only when it changes.
pub async fn update(
    conn: &mut SqliteConnection,
    actor: &str,
    id: i64,
    f: &MachineFields,
    archived: Option<bool>,
) -> Result<Machine, WriteError> {
    let before = get(conn, id)
        .await?
        .ok_or(WriteError::NotFound("machine"))?;
    if let Some(site_id) = f.site_id
        && f.site_id != before.site_id
    {
        sites::check_usable(conn, "site_id", site_id).await?;
    }
    if before.status == "out_of_service"
        && f.status == "in_service"
        && super::status::held_out_by_record(conn, id).await?
    {
        return Err(WriteError::conflict(
            "status",
            format!(
                "a shop record took this machine out of service; after a passing retest a manager returns it with POST /api/v1/machines/{id}/return-to-service"
            ),
        ));
    }
    let archived_at = archived_at_after(&before.archived_at, archived, super::now_rfc3339);
    if before.fields() == *f && archived_at == before.archived_at {
        return Ok(before);
    }
    sqlx::query(
        "UPDATE machines SET unit_number = ?, site_id = ?, kind = ?, description = ?, serial = ?,
            out_of_service_inspection_id =
                CASE WHEN status = ? THEN out_of_service_inspection_id ELSE NULL END,
            status = ?, out_of_service_reason = ?, out_of_service_since = ?,
            relief_pressure_pa = ?, hour_meter_h = ?, hour_meter_read_on = ?,
            periodic_interval_days = ?, periodic_interval_hours = ?, frequent_interval_days = ?,
            archived_at = ?, updated_at = ?
         WHERE id = ?",
    )
    .bind(&f.unit_number)
    .bind(f.site_id)
    .bind(&f.kind)
    .bind(&f.description)
    .bind(&f.serial)
    // A status set by hand no longer points at the inspection that set the old one.
    .bind(&f.status)
    .bind(&f.status)
    .bind(&f.out_of_service_reason)
    .bind(&f.out_of_service_since)
    .bind(f.relief_pressure_pa)
    .bind(f.hour_meter_h)
    .bind(&f.hour_meter_read_on)
    .bind(f.periodic_interval_days)
    .bind(f.periodic_interval_hours)
    .bind(f.frequent_interval_days)
    .bind(&archived_at)
    .bind(super::now_rfc3339())
    .bind(id)
    .execute(&mut *conn)
    .await
    .map_err(map_unique(&f.unit_number))?;
    let after = get(conn, id)
        .await?
        .ok_or(WriteError::NotFound("machine"))?;
    let action = change_action(&before.archived_at, &after.archived_at);
    audit::changed(conn, actor, action, "machine", id, &before, &after).await?;
    Ok(after)
}

/// Archives a machine (it leaves the lists; nothing is deleted). Archiving twice is a no-op.
pub async fn archive(
    conn: &mut SqliteConnection,
    actor: &str,
    id: i64,
) -> Result<Machine, WriteError> {
    let before = get(conn, id)
        .await?
        .ok_or(WriteError::NotFound("machine"))?;
    update(conn, actor, id, &before.fields(), Some(true)).await
}

/// Puts a machine out of service (with a reason and the date, `YYYY-MM-DD`) or back in
/// service (`reason` and `since` are then cleared). For other record types, such as a failed
/// inspection, inside their own transaction.
pub async fn set_status(
    conn: &mut SqliteConnection,
    actor: &str,
    id: i64,
    out_of_service: Option<(&str, &str)>,
) -> Result<Machine, WriteError> {
    let before = get(conn, id)
        .await?
        .ok_or(WriteError::NotFound("machine"))?;
    let mut fields = before.fields();
    match out_of_service {
        Some((reason, since)) => {
            fields.status = "out_of_service".into();
            fields.out_of_service_reason = Some(reason.to_string());
            fields.out_of_service_since = Some(since.to_string());
        }
        None => {
            fields.status = "in_service".into();
            fields.out_of_service_reason = None;
            fields.out_of_service_since = None;
        }
    }
    update(conn, actor, id, &fields, None).await
}

/// Checks that `machine_id` names a machine that is not archived; the error names `field`.
pub async fn check_usable(
    conn: &mut SqliteConnection,
    field: &'static str,
    machine_id: i64,
) -> Result<Machine, WriteError> {
    match get(conn, machine_id).await? {
        None => Err(WriteError::invalid(
            field,
            format!("there is no machine {machine_id}"),
        )),
        Some(machine) if machine.archived_at.is_some() => Err(WriteError::invalid(
            field,
            format!("machine {machine_id} is archived; restore it or choose another"),
        )),
        Some(machine) => Ok(machine),
    }
}
