//! Test procedures as machine makers write them: what load and posture to hold, where to
//! measure, the oil temperature window, the duration and the limit (optionally a limit that
//! depends on oil temperature). Kept for one cylinder or shared by the machines of one kind.
//! Edited in place with an audit row per change; archived, never deleted.

use super::write::{WriteError, archived_at_after, change_action};
use super::{Db, audit, cylinders};
use serde::Serialize;
use sqlx::SqliteConnection;

/// `drift` (position drift of a held load) or `decay` (pressure decay at end of stroke).
pub const KINDS: [&str; 2] = ["drift", "decay"];

/// One row of a temperature-dependent limit: from `oil_temperature_from_k` up to the next row.
#[derive(Clone, Debug, PartialEq, Serialize, sqlx::FromRow)]
pub struct LimitRow {
    pub oil_temperature_from_k: f64,
    pub limit_distance_m: Option<f64>,
    pub limit_pressure_drop_pa: Option<f64>,
    pub limit_period_s: f64,
}

/// A stored procedure with its limit table (sorted by temperature).
#[derive(Clone, Debug, PartialEq, Serialize, sqlx::FromRow)]
pub struct Procedure {
    pub id: i64,
    pub kind: String,
    pub name: String,
    pub cylinder_id: Option<i64>,
    pub machine_kind: Option<String>,
    pub hold_load: Option<String>,
    pub posture: Option<String>,
    pub measure_at: Option<String>,
    pub oil_temperature_min_k: Option<f64>,
    pub oil_temperature_max_k: Option<f64>,
    pub duration_s: f64,
    pub limit_distance_m: Option<f64>,
    pub limit_pressure_drop_pa: Option<f64>,
    pub limit_period_s: Option<f64>,
    pub oil_expansion_per_k: Option<f64>,
    pub notes: Option<String>,
    pub created_at: String,
    pub created_by: String,
    pub updated_at: String,
    pub archived_at: Option<String>,
    #[sqlx(skip)]
    pub limits: Vec<LimitRow>,
}

/// The fields a client writes, SI.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct ProcedureFields {
    pub kind: String,
    pub name: String,
    pub cylinder_id: Option<i64>,
    pub machine_kind: Option<String>,
    pub hold_load: Option<String>,
    pub posture: Option<String>,
    pub measure_at: Option<String>,
    pub oil_temperature_min_k: Option<f64>,
    pub oil_temperature_max_k: Option<f64>,
    pub duration_s: f64,
    pub limit_distance_m: Option<f64>,
    pub limit_pressure_drop_pa: Option<f64>,
    pub limit_period_s: Option<f64>,
    pub oil_expansion_per_k: Option<f64>,
    pub notes: Option<String>,
    pub limits: Vec<LimitRow>,
}

/// The limit a test is judged by: an amount (distance m, or pressure drop Pa) per period, s.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct Allowed {
    pub amount: f64,
    pub per: f64,
    /// True when it came from the temperature table.
    pub from_table: bool,
}

impl Procedure {
    pub fn fields(&self) -> ProcedureFields {
        ProcedureFields {
            kind: self.kind.clone(),
            name: self.name.clone(),
            cylinder_id: self.cylinder_id,
            machine_kind: self.machine_kind.clone(),
            hold_load: self.hold_load.clone(),
            posture: self.posture.clone(),
            measure_at: self.measure_at.clone(),
            oil_temperature_min_k: self.oil_temperature_min_k,
            oil_temperature_max_k: self.oil_temperature_max_k,
            duration_s: self.duration_s,
            limit_distance_m: self.limit_distance_m,
            limit_pressure_drop_pa: self.limit_pressure_drop_pa,
            limit_period_s: self.limit_period_s,
            oil_expansion_per_k: self.oil_expansion_per_k,
            notes: self.notes.clone(),
            limits: self.limits.clone(),
        }
    }

    /// The limit at oil temperature `oil_k`: the table row whose band holds it (below the
    /// first row, the first row), else the procedure's fixed limit; `None` without either.
    pub fn allowed_at(&self, oil_k: f64) -> Option<Allowed> {
        let amount = |distance: Option<f64>, drop: Option<f64>| {
            if self.kind == "decay" { drop } else { distance }
        };
        let rows: Vec<&LimitRow> = self
            .limits
            .iter()
            .filter(|r| amount(r.limit_distance_m, r.limit_pressure_drop_pa).is_some())
            .collect();
        let row = rows
            .iter()
            .rev()
            .find(|r| r.oil_temperature_from_k <= oil_k)
            .or_else(|| rows.first());
        if let Some(row) = row
            && let Some(a) = amount(row.limit_distance_m, row.limit_pressure_drop_pa)
        {
            return Some(Allowed {
                amount: a,
                per: row.limit_period_s,
                from_table: true,
            });
        }
        let a = amount(self.limit_distance_m, self.limit_pressure_drop_pa)?;
        Some(Allowed {
            amount: a,
            per: self.limit_period_s.unwrap_or(self.duration_s),
            from_table: false,
        })
    }
}

macro_rules! select_procedure {
    () => {
        "SELECT id, kind, name, cylinder_id, machine_kind, hold_load, posture, measure_at,
            oil_temperature_min_k, oil_temperature_max_k, duration_s, limit_distance_m,
            limit_pressure_drop_pa, limit_period_s, oil_expansion_per_k, notes, created_at,
            created_by, updated_at, archived_at
         FROM test_procedures "
    };
}

async fn load_limits(conn: &mut SqliteConnection, p: &mut Procedure) -> Result<(), sqlx::Error> {
    p.limits = sqlx::query_as::<_, LimitRow>(
        "SELECT oil_temperature_from_k, limit_distance_m, limit_pressure_drop_pa, limit_period_s
         FROM test_procedure_limits WHERE procedure_id = ? AND archived_at IS NULL
         ORDER BY oil_temperature_from_k",
    )
    .bind(p.id)
    .fetch_all(conn)
    .await?;
    Ok(())
}

/// One procedure by id, with its limit table.
pub async fn get(conn: &mut SqliteConnection, id: i64) -> Result<Option<Procedure>, sqlx::Error> {
    let found = sqlx::query_as::<_, Procedure>(concat!(select_procedure!(), "WHERE id = ?"))
        .bind(id)
        .fetch_optional(&mut *conn)
        .await?;
    match found {
        Some(mut p) => {
            load_limits(conn, &mut p).await?;
            Ok(Some(p))
        }
        None => Ok(None),
    }
}

pub async fn find(db: &Db, id: i64) -> Result<Option<Procedure>, sqlx::Error> {
    let mut conn = db.acquire().await?;
    get(&mut conn, id).await
}

/// The filters of the procedure list; `None` means any.
#[derive(Clone, Debug, Default)]
pub struct ProcedureFilter {
    pub kind: Option<String>,
    pub cylinder_id: Option<i64>,
    pub machine_kind: Option<String>,
    pub include_archived: bool,
}

/// Procedures by id, filtered (at most 500).
pub async fn list(db: &Db, f: &ProcedureFilter) -> Result<Vec<Procedure>, sqlx::Error> {
    let mut conn = db.acquire().await?;
    let mut rows = sqlx::query_as::<_, Procedure>(concat!(
        select_procedure!(),
        "WHERE (? IS NULL OR kind = ?) AND (? IS NULL OR cylinder_id = ?)
           AND (? IS NULL OR machine_kind = ?) AND (? OR archived_at IS NULL)
         ORDER BY id LIMIT 500"
    ))
    .bind(&f.kind)
    .bind(&f.kind)
    .bind(f.cylinder_id)
    .bind(f.cylinder_id)
    .bind(&f.machine_kind)
    .bind(&f.machine_kind)
    .bind(f.include_archived)
    .fetch_all(&mut *conn)
    .await?;
    for p in &mut rows {
        load_limits(&mut conn, p).await?;
    }
    Ok(rows)
}

/// The procedures that apply to a cylinder for tests of `kind`: its own first, then those
/// shared by its machine's kind; archived ones left out.
pub async fn for_cylinder(
    db: &Db,
    cylinder_id: i64,
    machine_kind: &str,
    kind: &str,
) -> Result<Vec<Procedure>, sqlx::Error> {
    let mut conn = db.acquire().await?;
    let mut rows = sqlx::query_as::<_, Procedure>(concat!(
        select_procedure!(),
        "WHERE kind = ? AND archived_at IS NULL AND (cylinder_id = ? OR machine_kind = ?)
         ORDER BY CASE WHEN cylinder_id IS NULL THEN 1 ELSE 0 END, id"
    ))
    .bind(kind)
    .bind(cylinder_id)
    .bind(machine_kind)
    .fetch_all(&mut *conn)
    .await?;
    for p in &mut rows {
        load_limits(&mut conn, p).await?;
    }
    Ok(rows)
}

async fn check_target(conn: &mut SqliteConnection, f: &ProcedureFields) -> Result<(), WriteError> {
    let Some(id) = f.cylinder_id else {
        return Ok(());
    };
    let message = match cylinders::get(conn, id).await? {
        None => format!("there is no cylinder {id}"),
        Some(c) if c.archived_at.is_some() => format!("cylinder {id} is archived"),
        Some(_) => return Ok(()),
    };
    Err(WriteError::invalid("cylinder_id", message))
}

async fn write_limits(
    conn: &mut SqliteConnection,
    id: i64,
    rows: &[LimitRow],
    at: &str,
) -> Result<(), sqlx::Error> {
    for r in rows {
        sqlx::query(
            "INSERT INTO test_procedure_limits (procedure_id, oil_temperature_from_k,
                limit_distance_m, limit_pressure_drop_pa, limit_period_s, created_at)
             VALUES (?, ?, ?, ?, ?, ?)",
        )
        .bind(id)
        .bind(r.oil_temperature_from_k)
        .bind(r.limit_distance_m)
        .bind(r.limit_pressure_drop_pa)
        .bind(r.limit_period_s)
        .bind(at)
        .execute(&mut *conn)
        .await?;
    }
    Ok(())
}

/// Stores a new procedure and its limit table, with an audit row.
pub async fn insert(
    conn: &mut SqliteConnection,
    actor: &str,
    f: &ProcedureFields,
) -> Result<Procedure, WriteError> {
    check_target(conn, f).await?;
    let at = super::now_rfc3339();
    let id: i64 = sqlx::query_scalar(
        "INSERT INTO test_procedures (kind, name, cylinder_id, machine_kind, hold_load, posture,
            measure_at, oil_temperature_min_k, oil_temperature_max_k, duration_s,
            limit_distance_m, limit_pressure_drop_pa, limit_period_s, oil_expansion_per_k, notes,
            created_at, created_by, updated_at)
         VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?) RETURNING id",
    )
    .bind(&f.kind)
    .bind(&f.name)
    .bind(f.cylinder_id)
    .bind(&f.machine_kind)
    .bind(&f.hold_load)
    .bind(&f.posture)
    .bind(&f.measure_at)
    .bind(f.oil_temperature_min_k)
    .bind(f.oil_temperature_max_k)
    .bind(f.duration_s)
    .bind(f.limit_distance_m)
    .bind(f.limit_pressure_drop_pa)
    .bind(f.limit_period_s)
    .bind(f.oil_expansion_per_k)
    .bind(&f.notes)
    .bind(&at)
    .bind(actor)
    .bind(&at)
    .fetch_one(&mut *conn)
    .await?;
    write_limits(conn, id, &f.limits, &at).await?;
    let p = get(conn, id)
        .await?
        .ok_or(WriteError::NotFound("procedure"))?;
    audit::created(conn, actor, "test_procedure", id, &p).await?;
    Ok(p)
}

/// Changes a procedure in place (the audit row keeps the version before) and, when
/// `archived` is given, archives or restores it. A changed limit table archives the old rows
/// and stores the new ones.
pub async fn update(
    conn: &mut SqliteConnection,
    actor: &str,
    id: i64,
    f: &ProcedureFields,
    archived: Option<bool>,
) -> Result<Procedure, WriteError> {
    let before = get(conn, id)
        .await?
        .ok_or(WriteError::NotFound("procedure"))?;
    if f.cylinder_id != before.cylinder_id {
        check_target(conn, f).await?;
    }
    let at = super::now_rfc3339();
    let archived_at = archived_at_after(&before.archived_at, archived, || at.clone());
    if before.fields() == *f && archived_at == before.archived_at {
        return Ok(before);
    }
    sqlx::query(
        "UPDATE test_procedures SET kind = ?, name = ?, cylinder_id = ?, machine_kind = ?,
            hold_load = ?, posture = ?, measure_at = ?, oil_temperature_min_k = ?,
            oil_temperature_max_k = ?, duration_s = ?, limit_distance_m = ?,
            limit_pressure_drop_pa = ?, limit_period_s = ?, oil_expansion_per_k = ?, notes = ?,
            archived_at = ?, updated_at = ?
         WHERE id = ?",
    )
    .bind(&f.kind)
    .bind(&f.name)
    .bind(f.cylinder_id)
    .bind(&f.machine_kind)
    .bind(&f.hold_load)
    .bind(&f.posture)
    .bind(&f.measure_at)
    .bind(f.oil_temperature_min_k)
    .bind(f.oil_temperature_max_k)
    .bind(f.duration_s)
    .bind(f.limit_distance_m)
    .bind(f.limit_pressure_drop_pa)
    .bind(f.limit_period_s)
    .bind(f.oil_expansion_per_k)
    .bind(&f.notes)
    .bind(&archived_at)
    .bind(&at)
    .bind(id)
    .execute(&mut *conn)
    .await?;
    if f.limits != before.limits {
        sqlx::query(
            "UPDATE test_procedure_limits SET archived_at = ?
             WHERE procedure_id = ? AND archived_at IS NULL",
        )
        .bind(&at)
        .bind(id)
        .execute(&mut *conn)
        .await?;
        write_limits(conn, id, &f.limits, &at).await?;
    }
    let after = get(conn, id)
        .await?
        .ok_or(WriteError::NotFound("procedure"))?;
    let action = change_action(&before.archived_at, &after.archived_at);
    audit::changed(conn, actor, action, "test_procedure", id, &before, &after).await?;
    Ok(after)
}
