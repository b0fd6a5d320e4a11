//! Cylinders: geometry, which way the held load acts, load and ratings, tube and rod data
//! for the strength checks, and the drift-test interval.

use super::cylinder_valves::{self, ValveFields};
use super::page::{Page, Window, contains_pattern};
use super::write::{WriteError, archived_at_after, change_action};
use super::{Db, audit, machines};
use serde::Serialize;
use sqlx::SqliteConnection;

/// A stored cylinder with its machine's unit number, relief setting and site units, and the
/// count of hoses on it (archived ones not counted).
#[derive(Clone, Debug, PartialEq, Serialize, sqlx::FromRow)]
pub struct Cylinder {
    pub id: i64,
    pub machine_id: i64,
    pub unit_number: String,
    pub machine_relief_pressure_pa: Option<f64>,
    pub site_units: Option<String>,
    pub function: Option<String>,
    pub bore_m: f64,
    pub rod_m: f64,
    pub stroke_m: f64,
    /// `retract` (load pushes the rod in) or `extend` (load pulls it out).
    pub load_direction: String,
    pub max_load_n: Option<f64>,
    /// Lowest load held, N (none recorded: 0 N).
    pub min_load_n: Option<f64>,
    pub holding_pressure_pa: Option<f64>,
    pub rated_pressure_pa: Option<f64>,
    pub tube_outside_diameter_m: Option<f64>,
    pub tube_yield_pa: Option<f64>,
    pub end_condition: Option<String>,
    /// Rod free length at full extension for buckling, m (none: twice the stroke, assumed).
    pub buckling_length_m: Option<f64>,
    pub rod_yield_pa: Option<f64>,
    pub serial: Option<String>,
    pub notes: Option<String>,
    pub drift_test_interval_days: Option<i64>,
    pub created_at: String,
    pub updated_at: String,
    pub archived_at: Option<String>,
    pub hose_count: i64,
    /// The load-holding valve and valve centre (migration 0007).
    #[sqlx(flatten)]
    #[serde(flatten)]
    pub valves: ValveFields,
    /// The site's trapped-oil warming, K (`None`: the default).
    pub site_trapped_oil_warming_k: Option<f64>,
}

/// The fields a client writes, SI.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct CylinderFields {
    pub machine_id: i64,
    pub function: Option<String>,
    pub bore_m: f64,
    pub rod_m: f64,
    pub stroke_m: f64,
    pub load_direction: String,
    pub max_load_n: Option<f64>,
    /// Lowest load held, N (none recorded: 0 N).
    pub min_load_n: Option<f64>,
    pub holding_pressure_pa: Option<f64>,
    pub rated_pressure_pa: Option<f64>,
    pub tube_outside_diameter_m: Option<f64>,
    pub tube_yield_pa: Option<f64>,
    pub end_condition: Option<String>,
    /// Rod free length at full extension for buckling, m (none: twice the stroke, assumed).
    pub buckling_length_m: Option<f64>,
    pub rod_yield_pa: Option<f64>,
    pub serial: Option<String>,
    pub notes: Option<String>,
    pub drift_test_interval_days: Option<i64>,
    pub valves: ValveFields,
}

impl Cylinder {
    pub fn fields(&self) -> CylinderFields {
        CylinderFields {
            machine_id: self.machine_id,
            function: self.function.clone(),
            bore_m: self.bore_m,
            rod_m: self.rod_m,
            stroke_m: self.stroke_m,
            load_direction: self.load_direction.clone(),
            max_load_n: self.max_load_n,
            min_load_n: self.min_load_n,
            holding_pressure_pa: self.holding_pressure_pa,
            rated_pressure_pa: self.rated_pressure_pa,
            tube_outside_diameter_m: self.tube_outside_diameter_m,
            tube_yield_pa: self.tube_yield_pa,
            end_condition: self.end_condition.clone(),
            buckling_length_m: self.buckling_length_m,
            rod_yield_pa: self.rod_yield_pa,
            serial: self.serial.clone(),
            notes: self.notes.clone(),
            drift_test_interval_days: self.drift_test_interval_days,
            valves: self.valves.clone(),
        }
    }
}

/// The filters of the cylinder list; `None` means "any".
#[derive(Clone, Debug, Default, PartialEq)]
pub struct CylinderFilter {
    pub machine_id: Option<i64>,
    pub site_id: Option<i64>,
    /// Text found in the function, serial or the machine's unit number.
    pub q: Option<String>,
    /// Also list archived cylinders and cylinders of archived machines.
    pub include_archived: bool,
}

macro_rules! select_cylinder {
    () => {
        "SELECT c.id, c.machine_id, m.unit_number, m.relief_pressure_pa AS machine_relief_pressure_pa,
            s.units AS site_units, c.function, c.bore_m, c.rod_m, c.stroke_m, c.load_direction,
            c.max_load_n, c.holding_pressure_pa, c.rated_pressure_pa, c.tube_outside_diameter_m,
            c.tube_yield_pa, c.end_condition, c.serial, c.notes, c.drift_test_interval_days,
            c.min_load_n, c.buckling_length_m, c.rod_yield_pa, c.created_at, c.updated_at, c.archived_at,
            c.holding_valve,
            c.holding_valve_setting_pa, c.holding_valve_pilot_ratio, c.holding_valve_pilot,
            c.cap_port_centre, c.rod_port_centre,
            s.trapped_oil_warming_k AS site_trapped_oil_warming_k,
            (SELECT COUNT(*) FROM hoses h WHERE h.cylinder_id = c.id AND h.archived_at IS NULL)
                AS hose_count
         FROM cylinders c JOIN machines m ON m.id = c.machine_id
         LEFT JOIN sites s ON s.id = m.site_id "
    };
}

/// One cylinder by id.
pub async fn get(conn: &mut SqliteConnection, id: i64) -> Result<Option<Cylinder>, sqlx::Error> {
    sqlx::query_as::<_, Cylinder>(concat!(select_cylinder!(), "WHERE c.id = ?"))
        .bind(id)
        .fetch_optional(conn)
        .await
}

/// One cylinder by id, from the pool.
pub async fn find(db: &Db, id: i64) -> Result<Option<Cylinder>, sqlx::Error> {
    let mut conn = db.acquire().await?;
    get(&mut conn, id).await
}

/// Cylinders, filtered, one page at a time (by id), in one query. Without
/// `include_archived`, archived cylinders and those of archived machines are left out.
pub async fn list(
    db: &Db,
    filter: &CylinderFilter,
    window: Window,
) -> Result<Page<Cylinder>, sqlx::Error> {
    let pattern = filter.q.as_deref().map(contains_pattern);
    let rows = sqlx::query_as::<_, Cylinder>(concat!(
        select_cylinder!(),
        "WHERE c.id > ?
           AND (? IS NULL OR c.machine_id = ?)
           AND (? IS NULL OR m.site_id = ?)
           AND (? IS NULL OR LOWER(COALESCE(c.function, '')) LIKE ? ESCAPE '\\'
                OR LOWER(COALESCE(c.serial, '')) LIKE ? ESCAPE '\\'
                OR LOWER(m.unit_number) LIKE ? ESCAPE '\\')
           AND (? = 1 OR (c.archived_at IS NULL AND m.archived_at IS NULL))
         ORDER BY c.id LIMIT ?"
    ))
    .bind(window.after_id)
    .bind(filter.machine_id)
    .bind(filter.machine_id)
    .bind(filter.site_id)
    .bind(filter.site_id)
    .bind(&pattern)
    .bind(&pattern)
    .bind(&pattern)
    .bind(&pattern)
    .bind(i64::from(filter.include_archived))
    .bind(window.fetch())
    .fetch_all(db)
    .await?;
    Ok(Page::from_rows(rows, window, |c| c.id))
}

/// The cylinders of one machine that are not archived, by id (for the machine page).
pub async fn of_machine(db: &Db, machine_id: i64) -> Result<Vec<Cylinder>, sqlx::Error> {
    sqlx::query_as::<_, Cylinder>(concat!(
        select_cylinder!(),
        "WHERE c.machine_id = ? AND c.archived_at IS NULL ORDER BY c.id"
    ))
    .bind(machine_id)
    .fetch_all(db)
    .await
}

/// Registers a cylinder on a machine that exists and is not archived (`machine_id`).
/// `rod < bore` is the caller's check; the schema refuses it too.
pub async fn insert(
    conn: &mut SqliteConnection,
    actor: &str,
    at: &str,
    f: &CylinderFields,
) -> Result<Cylinder, WriteError> {
    machines::check_usable(conn, "machine_id", f.machine_id).await?;
    let id: i64 = sqlx::query_scalar(
        "INSERT INTO cylinders (machine_id, function, bore_m, rod_m, stroke_m, load_direction,
            max_load_n, holding_pressure_pa, rated_pressure_pa, tube_outside_diameter_m,
            tube_yield_pa, end_condition, serial, notes, drift_test_interval_days,
            min_load_n, buckling_length_m, rod_yield_pa, created_at, updated_at)
         VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?) RETURNING id",
    )
    .bind(f.machine_id)
    .bind(&f.function)
    .bind(f.bore_m)
    .bind(f.rod_m)
    .bind(f.stroke_m)
    .bind(&f.load_direction)
    .bind(f.max_load_n)
    .bind(f.holding_pressure_pa)
    .bind(f.rated_pressure_pa)
    .bind(f.tube_outside_diameter_m)
    .bind(f.tube_yield_pa)
    .bind(&f.end_condition)
    .bind(&f.serial)
    .bind(&f.notes)
    .bind(f.drift_test_interval_days)
    .bind(f.min_load_n)
    .bind(f.buckling_length_m)
    .bind(f.rod_yield_pa)
    .bind(at)
    .bind(at)
    .fetch_one(&mut *conn)
    .await?;
    cylinder_valves::write(conn, id, &f.valves).await?;
    let cylinder = get(conn, id)
        .await?
        .ok_or(WriteError::NotFound("cylinder"))?;
    audit::created(conn, actor, "cylinder", id, &cylinder).await?;
    Ok(cylinder)
}

/// Changes a cylinder and, when `archived` is given, archives or restores it. A move to
/// another machine is refused while hoses that are not archived are fitted to it.
pub async fn update(
    conn: &mut SqliteConnection,
    actor: &str,
    id: i64,
    f: &CylinderFields,
    archived: Option<bool>,
) -> Result<Cylinder, WriteError> {
    let before = get(conn, id)
        .await?
        .ok_or(WriteError::NotFound("cylinder"))?;
    if f.machine_id != before.machine_id {
        machines::check_usable(conn, "machine_id", f.machine_id).await?;
        if before.hose_count > 0 {
            return Err(WriteError::conflict(
                "machine_id",
                "hoses are fitted to this cylinder; archive them or move them first",
            ));
        }
    }
    let archived_at = archived_at_after(&before.archived_at, archived, super::now_rfc3339);
    if before.fields() == *f && archived_at == before.archived_at {
        return Ok(before);
    }
    sqlx::query(
        "UPDATE cylinders SET machine_id = ?, function = ?, bore_m = ?, rod_m = ?, stroke_m = ?,
            load_direction = ?, max_load_n = ?, holding_pressure_pa = ?, rated_pressure_pa = ?,
            tube_outside_diameter_m = ?, tube_yield_pa = ?, end_condition = ?, serial = ?,
            notes = ?, drift_test_interval_days = ?, min_load_n = ?, buckling_length_m = ?,
            rod_yield_pa = ?, archived_at = ?, updated_at = ?
         WHERE id = ?",
    )
    .bind(f.machine_id)
    .bind(&f.function)
    .bind(f.bore_m)
    .bind(f.rod_m)
    .bind(f.stroke_m)
    .bind(&f.load_direction)
    .bind(f.max_load_n)
    .bind(f.holding_pressure_pa)
    .bind(f.rated_pressure_pa)
    .bind(f.tube_outside_diameter_m)
    .bind(f.tube_yield_pa)
    .bind(&f.end_condition)
    .bind(&f.serial)
    .bind(&f.notes)
    .bind(f.drift_test_interval_days)
    .bind(f.min_load_n)
    .bind(f.buckling_length_m)
    .bind(f.rod_yield_pa)
    .bind(&archived_at)
    .bind(super::now_rfc3339())
    .bind(id)
    .execute(&mut *conn)
    .await?;
    cylinder_valves::write(conn, id, &f.valves).await?;
    let after = get(conn, id)
        .await?
        .ok_or(WriteError::NotFound("cylinder"))?;
    let action = change_action(&before.archived_at, &after.archived_at);
    audit::changed(conn, actor, action, "cylinder", id, &before, &after).await?;
    Ok(after)
}

/// Archives a cylinder (it leaves the lists; nothing is deleted).
pub async fn archive(
    conn: &mut SqliteConnection,
    actor: &str,
    id: i64,
) -> Result<Cylinder, WriteError> {
    let before = get(conn, id)
        .await?
        .ok_or(WriteError::NotFound("cylinder"))?;
    update(conn, actor, id, &before.fields(), Some(true)).await
}

/// Refuses a test on a cylinder that does not exist or is archived.
pub async fn check_testable(conn: &mut SqliteConnection, id: i64) -> Result<(), WriteError> {
    match get(conn, id).await? {
        None => Err(WriteError::NotFound("cylinder")),
        Some(c) if c.archived_at.is_some() => Err(WriteError::conflict(
            "cylinder",
            "this cylinder is archived; restore it before recording tests",
        )),
        // a cylinder of an archived machine is out of the fleet like the machine itself
        Some(c) => match machines::get(conn, c.machine_id).await? {
            Some(m) if m.archived_at.is_some() => Err(WriteError::conflict(
                "cylinder",
                format!(
                    "machine {} is archived; restore it before recording tests on its cylinders",
                    m.unit_number
                ),
            )),
            _ => Ok(()),
        },
    }
}
