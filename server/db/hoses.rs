//! Hose assemblies: where each one is fitted (a cylinder port or a named circuit), what its
//! layline says, its maximum working pressure, and its dates.

use super::page::{Page, Window, contains_pattern};
use super::write::{WriteError, archived_at_after, change_action};
use super::{Db, audit, cylinders, machines};
use serde::Serialize;
use sqlx::SqliteConnection;

/// A stored hose assembly with its machine's unit number, site units and cylinder function.
#[derive(Clone, Debug, PartialEq, Serialize, sqlx::FromRow)]
pub struct Hose {
    pub id: i64,
    pub machine_id: i64,
    pub unit_number: String,
    pub site_units: Option<String>,
    pub cylinder_id: Option<i64>,
    pub cylinder_function: Option<String>,
    /// `cap` or `rod`; `None` for a hose on a circuit.
    pub port: Option<String>,
    pub circuit: Option<String>,
    pub spec: Option<String>,
    pub size: Option<String>,
    pub inside_diameter_m: Option<f64>,
    pub length_m: Option<f64>,
    pub working_pressure_pa: Option<f64>,
    /// Manufacture quarter, `YYYY-Qn`.
    pub made_in: Option<String>,
    pub installed_on: Option<String>,
    pub replace_by: Option<String>,
    pub created_at: String,
    pub updated_at: String,
    pub archived_at: Option<String>,
}

/// The fields a client writes, SI.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct HoseFields {
    pub machine_id: i64,
    pub cylinder_id: Option<i64>,
    pub port: Option<String>,
    pub circuit: Option<String>,
    pub spec: Option<String>,
    pub size: Option<String>,
    pub inside_diameter_m: Option<f64>,
    pub length_m: Option<f64>,
    pub working_pressure_pa: Option<f64>,
    pub made_in: Option<String>,
    pub installed_on: Option<String>,
    pub replace_by: Option<String>,
}

impl Hose {
    pub fn fields(&self) -> HoseFields {
        HoseFields {
            machine_id: self.machine_id,
            cylinder_id: self.cylinder_id,
            port: self.port.clone(),
            circuit: self.circuit.clone(),
            spec: self.spec.clone(),
            size: self.size.clone(),
            inside_diameter_m: self.inside_diameter_m,
            length_m: self.length_m,
            working_pressure_pa: self.working_pressure_pa,
            made_in: self.made_in.clone(),
            installed_on: self.installed_on.clone(),
            replace_by: self.replace_by.clone(),
        }
    }

    /// Where the hose is fitted, for tables: `cap port`, `rod port` or the circuit's name.
    pub fn place(&self) -> String {
        crate::calc::installed::place(self.port.as_deref(), self.circuit.as_deref())
    }
}

/// The filters of the hose list; `None` means "any".
#[derive(Clone, Debug, Default, PartialEq)]
pub struct HoseFilter {
    pub machine_id: Option<i64>,
    pub cylinder_id: Option<i64>,
    pub site_id: Option<i64>,
    /// Text found in the spec, size, circuit or the machine's unit number.
    pub q: Option<String>,
    /// Also list archived hoses and hoses of archived machines or cylinders.
    pub include_archived: bool,
}

macro_rules! select_hose {
    () => {
        "SELECT h.id, h.machine_id, m.unit_number, s.units AS site_units, h.cylinder_id,
            c.function AS cylinder_function, h.port, h.circuit, h.spec, h.size,
            h.inside_diameter_m, h.length_m, h.working_pressure_pa, h.made_in, h.installed_on,
            h.replace_by, h.created_at, h.updated_at, h.archived_at
         FROM hoses h JOIN machines m ON m.id = h.machine_id
         LEFT JOIN cylinders c ON c.id = h.cylinder_id
         LEFT JOIN sites s ON s.id = m.site_id "
    };
}

/// One hose by id.
pub async fn get(conn: &mut SqliteConnection, id: i64) -> Result<Option<Hose>, sqlx::Error> {
    sqlx::query_as::<_, Hose>(concat!(select_hose!(), "WHERE h.id = ?"))
        .bind(id)
        .fetch_optional(conn)
        .await
}

/// One hose by id, from the pool.
pub async fn find(db: &Db, id: i64) -> Result<Option<Hose>, sqlx::Error> {
    let mut conn = db.acquire().await?;
    get(&mut conn, id).await
}

/// Hoses, filtered, one page at a time (by id), in one query. Without `include_archived`,
/// archived hoses and those of archived machines or cylinders are left out.
pub async fn list(db: &Db, filter: &HoseFilter, window: Window) -> Result<Page<Hose>, sqlx::Error> {
    let pattern = filter.q.as_deref().map(contains_pattern);
    let rows = sqlx::query_as::<_, Hose>(concat!(
        select_hose!(),
        "WHERE h.id > ?
           AND (? IS NULL OR h.machine_id = ?)
           AND (? IS NULL OR h.cylinder_id = ?)
           AND (? IS NULL OR m.site_id = ?)
           AND (? IS NULL OR LOWER(COALESCE(h.spec, '')) LIKE ? ESCAPE '\\'
                OR LOWER(COALESCE(h.size, '')) LIKE ? ESCAPE '\\'
                OR LOWER(COALESCE(h.circuit, '')) LIKE ? ESCAPE '\\'
                OR LOWER(m.unit_number) LIKE ? ESCAPE '\\')
           AND (? = 1 OR (h.archived_at IS NULL AND m.archived_at IS NULL
                          AND c.archived_at IS NULL))
         ORDER BY h.id LIMIT ?"
    ))
    .bind(window.after_id)
    .bind(filter.machine_id)
    .bind(filter.machine_id)
    .bind(filter.cylinder_id)
    .bind(filter.cylinder_id)
    .bind(filter.site_id)
    .bind(filter.site_id)
    .bind(&pattern)
    .bind(&pattern)
    .bind(&pattern)
    .bind(&pattern)
    .bind(&pattern)
    .bind(i64::from(filter.include_archived))
    .bind(window.fetch())
    .fetch_all(db)
    .await?;
    Ok(Page::from_rows(rows, window, |h| h.id))
}

/// The hoses of one machine that are not archived, by id (for the machine and cylinder pages).
pub async fn of_machine(db: &Db, machine_id: i64) -> Result<Vec<Hose>, sqlx::Error> {
    sqlx::query_as::<_, Hose>(concat!(
        select_hose!(),
        "WHERE h.machine_id = ? AND h.archived_at IS NULL ORDER BY h.id"
    ))
    .bind(machine_id)
    .fetch_all(db)
    .await
}

/// Checks the machine and, if given, that the cylinder exists, is not archived and is on
/// that machine.
async fn check_place(
    conn: &mut SqliteConnection,
    f: &HoseFields,
    before: Option<&Hose>,
) -> Result<(), WriteError> {
    if before.is_none_or(|b| b.machine_id != f.machine_id) {
        machines::check_usable(conn, "machine_id", f.machine_id).await?;
    }
    if let Some(cylinder_id) = f.cylinder_id {
        let cylinder = cylinders::get(conn, cylinder_id).await?.ok_or_else(|| {
            WriteError::invalid("cylinder_id", format!("there is no cylinder {cylinder_id}"))
        })?;
        if cylinder.machine_id != f.machine_id {
            return Err(WriteError::invalid(
                "cylinder_id",
                format!(
                    "cylinder {cylinder_id} is on machine {}, not on machine {}",
                    cylinder.machine_id, f.machine_id
                ),
            ));
        }
        let moved = before.is_none_or(|b| b.cylinder_id != f.cylinder_id);
        if moved && cylinder.archived_at.is_some() {
            return Err(WriteError::invalid(
                "cylinder_id",
                format!("cylinder {cylinder_id} is archived"),
            ));
        }
    }
    Ok(())
}

/// Registers a hose assembly.
pub async fn insert(
    conn: &mut SqliteConnection,
    actor: &str,
    at: &str,
    f: &HoseFields,
) -> Result<Hose, WriteError> {
    check_place(conn, f, None).await?;
    let id: i64 = sqlx::query_scalar(
        "INSERT INTO hoses (machine_id, cylinder_id, port, circuit, spec, size,
            inside_diameter_m, length_m, working_pressure_pa, made_in, installed_on, replace_by,
            created_at, updated_at)
         VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?) RETURNING id",
    )
    .bind(f.machine_id)
    .bind(f.cylinder_id)
    .bind(&f.port)
    .bind(&f.circuit)
    .bind(&f.spec)
    .bind(&f.size)
    .bind(f.inside_diameter_m)
    .bind(f.length_m)
    .bind(f.working_pressure_pa)
    .bind(&f.made_in)
    .bind(&f.installed_on)
    .bind(&f.replace_by)
    .bind(at)
    .bind(at)
    .fetch_one(&mut *conn)
    .await?;
    let hose = get(conn, id).await?.ok_or(WriteError::NotFound("hose"))?;
    audit::created(conn, actor, "hose", id, &hose).await?;
    Ok(hose)
}

/// Changes a hose assembly and, when `archived` is given, archives or restores it.
pub async fn update(
    conn: &mut SqliteConnection,
    actor: &str,
    id: i64,
    f: &HoseFields,
    archived: Option<bool>,
) -> Result<Hose, WriteError> {
    let before = get(conn, id).await?.ok_or(WriteError::NotFound("hose"))?;
    check_place(conn, f, Some(&before)).await?;
    let archived_at = archived_at_after(&before.archived_at, archived, super::now_rfc3339);
    if before.fields() == *f && archived_at == before.archived_at {
        return Ok(before);
    }
    sqlx::query(
        "UPDATE hoses SET machine_id = ?, cylinder_id = ?, port = ?, circuit = ?, spec = ?,
            size = ?, inside_diameter_m = ?, length_m = ?, working_pressure_pa = ?, made_in = ?,
            installed_on = ?, replace_by = ?, archived_at = ?, updated_at = ?
         WHERE id = ?",
    )
    .bind(f.machine_id)
    .bind(f.cylinder_id)
    .bind(&f.port)
    .bind(&f.circuit)
    .bind(&f.spec)
    .bind(&f.size)
    .bind(f.inside_diameter_m)
    .bind(f.length_m)
    .bind(f.working_pressure_pa)
    .bind(&f.made_in)
    .bind(&f.installed_on)
    .bind(&f.replace_by)
    .bind(&archived_at)
    .bind(super::now_rfc3339())
    .bind(id)
    .execute(&mut *conn)
    .await?;
    let after = get(conn, id).await?.ok_or(WriteError::NotFound("hose"))?;
    let action = change_action(&before.archived_at, &after.archived_at);
    audit::changed(conn, actor, action, "hose", id, &before, &after).await?;
    Ok(after)
}

/// Archives a hose assembly (it leaves the lists; nothing is deleted).
pub async fn archive(
    conn: &mut SqliteConnection,
    actor: &str,
    id: i64,
) -> Result<Hose, WriteError> {
    let before = get(conn, id).await?.ok_or(WriteError::NotFound("hose"))?;
    update(conn, actor, id, &before.fields(), Some(true)).await
}
