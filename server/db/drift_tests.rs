//! Drift tests: the readings as SI columns and as sent to the engineering core, the analysis
//! as computed and by which calculation version. Append-only: a correction is a new row that
//! amends the old; a repeated client token finds the stored row instead of storing twice.

use super::write::{WriteError, is_unique_violation, snapshot};
use super::{Db, audit, cylinders};
use serde::Serialize;
use sqlx::SqliteConnection;

/// A stored drift test, with the id of the record that amends it (if any).
#[derive(Clone, Debug, PartialEq, Serialize, sqlx::FromRow)]
pub struct DriftTest {
    pub id: i64,
    pub cylinder_id: i64,
    pub procedure_id: Option<i64>,
    pub tested_at: String,
    pub technician: String,
    pub duration_s: f64,
    pub drift_m: Option<f64>,
    pub start_position_m: Option<f64>,
    pub end_position_m: Option<f64>,
    pub oil_temperature_start_k: f64,
    pub oil_temperature_end_k: f64,
    pub ambient_temperature_k: Option<f64>,
    pub cap_pressure_start_pa: Option<f64>,
    pub cap_pressure_end_pa: Option<f64>,
    pub rod_pressure_start_pa: Option<f64>,
    pub rod_pressure_end_pa: Option<f64>,
    pub load_n: Option<f64>,
    pub load_direction: String,
    pub limit_distance_m: Option<f64>,
    pub limit_period_s: Option<f64>,
    pub readings_json: String,
    pub analysis_json: String,
    pub calc_version: String,
    pub verdict: String,
    pub diagnosis: String,
    pub scaled_drift_m: f64,
    pub leak_drift_m: f64,
    pub scaled_leak_drift_m: f64,
    pub scaled_period_s: f64,
    pub flags: String,
    pub notes: Option<String>,
    pub client_token: Option<String>,
    pub amends_id: Option<i64>,
    pub created_at: String,
    pub created_by: String,
    /// The later record that corrects this one, if any.
    pub amended_by_id: Option<i64>,
}

impl DriftTest {
    /// The flags as words.
    pub fn flag_list(&self) -> Vec<String> {
        serde_json::from_str(&self.flags).unwrap_or_default()
    }

    /// True when no later record corrects this one.
    pub fn in_force(&self) -> bool {
        self.amended_by_id.is_none()
    }
}

/// A drift test to store (everything but id and creation).
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct NewDriftTest {
    pub cylinder_id: i64,
    pub procedure_id: Option<i64>,
    pub tested_at: String,
    pub technician: String,
    pub duration_s: f64,
    pub drift_m: Option<f64>,
    pub start_position_m: Option<f64>,
    pub end_position_m: Option<f64>,
    pub oil_temperature_start_k: f64,
    pub oil_temperature_end_k: f64,
    pub ambient_temperature_k: Option<f64>,
    pub cap_pressure_start_pa: Option<f64>,
    pub cap_pressure_end_pa: Option<f64>,
    pub rod_pressure_start_pa: Option<f64>,
    pub rod_pressure_end_pa: Option<f64>,
    pub load_n: Option<f64>,
    pub load_direction: String,
    pub limit_distance_m: Option<f64>,
    pub limit_period_s: Option<f64>,
    pub readings_json: String,
    pub analysis_json: String,
    pub calc_version: String,
    pub verdict: String,
    pub diagnosis: String,
    pub scaled_drift_m: f64,
    pub leak_drift_m: f64,
    pub scaled_leak_drift_m: f64,
    pub scaled_period_s: f64,
    pub flags: Vec<String>,
    pub notes: Option<String>,
    pub client_token: Option<String>,
    pub amends_id: Option<i64>,
}

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

macro_rules! select_drift_test {
    () => {
        "SELECT t.id, t.cylinder_id, t.procedure_id, t.tested_at, t.technician, t.duration_s,
            t.drift_m, t.start_position_m, t.end_position_m, t.oil_temperature_start_k,
            t.oil_temperature_end_k, t.ambient_temperature_k, t.cap_pressure_start_pa,
            t.cap_pressure_end_pa, t.rod_pressure_start_pa, t.rod_pressure_end_pa, t.load_n,
            t.load_direction, t.limit_distance_m, t.limit_period_s, t.readings_json,
            t.analysis_json, t.calc_version, t.verdict, t.diagnosis, t.scaled_drift_m,
            t.leak_drift_m, t.scaled_leak_drift_m, t.scaled_period_s, t.flags, t.notes,
            t.client_token, t.amends_id, t.created_at, t.created_by,
            (SELECT MIN(a.id) FROM drift_tests a WHERE a.amends_id = t.id) AS amended_by_id
         FROM drift_tests t "
    };
}

/// One drift test by id.
pub async fn get(conn: &mut SqliteConnection, id: i64) -> Result<Option<DriftTest>, sqlx::Error> {
    sqlx::query_as::<_, DriftTest>(concat!(select_drift_test!(), "WHERE t.id = ?"))
        .bind(id)
        .fetch_optional(conn)
        .await
}

pub async fn find(db: &Db, id: i64) -> Result<Option<DriftTest>, sqlx::Error> {
    let mut conn = db.acquire().await?;
    get(&mut conn, id).await
}

/// The drift test stored under a client token, if any.
pub async fn by_token(
    conn: &mut SqliteConnection,
    token: &str,
) -> Result<Option<DriftTest>, sqlx::Error> {
    sqlx::query_as::<_, DriftTest>(concat!(select_drift_test!(), "WHERE t.client_token = ?"))
        .bind(token)
        .fetch_optional(conn)
        .await
}

/// Every drift test of a cylinder, amended ones included, oldest test first (at most 1000, the
/// latest ones).
pub async fn of_cylinder(db: &Db, cylinder_id: i64) -> Result<Vec<DriftTest>, sqlx::Error> {
    let mut rows = sqlx::query_as::<_, DriftTest>(concat!(
        select_drift_test!(),
        "WHERE t.cylinder_id = ? ORDER BY t.tested_at DESC, t.id DESC LIMIT 1000"
    ))
    .bind(cylinder_id)
    .fetch_all(db)
    .await?;
    rows.reverse();
    Ok(rows)
}

/// Checks that `amends` names a record of the same cylinder that no other record amends yet
/// (a correction of a correction amends the latest one, so the chain stays a line).
async fn check_amends(
    conn: &mut SqliteConnection,
    cylinder_id: i64,
    amends: i64,
) -> Result<DriftTest, WriteError> {
    let old = get(conn, amends)
        .await?
        .ok_or_else(|| WriteError::invalid("amends", format!("there is no drift test {amends}")))?;
    if old.cylinder_id != cylinder_id {
        return Err(WriteError::invalid(
            "amends",
            format!("drift test {amends} belongs to another cylinder"),
        ));
    }
    if let Some(later) = old.amended_by_id {
        return Err(WriteError::conflict(
            "amends",
            format!("drift test {amends} is already amended by {later}; amend that one instead"),
        ));
    }
    Ok(old)
}

/// The existing record for a repeated token: the same cylinder's, else a conflict.
fn repeated(found: DriftTest, cylinder_id: i64) -> Result<Stored<DriftTest>, WriteError> {
    if found.cylinder_id == cylinder_id {
        Ok(Stored::Existing(found))
    } else {
        Err(WriteError::conflict(
            "client_token",
            "this client token was already used for another cylinder's test",
        ))
    }
}

/// Stores a drift test with its audit row, inside the caller's transaction. A client token
/// already stored returns that record (`Stored::Existing`) and writes nothing.
pub async fn insert(
    conn: &mut SqliteConnection,
    actor: &str,
    t: &NewDriftTest,
) -> Result<Stored<DriftTest>, WriteError> {
    if let Some(token) = &t.client_token
        && let Some(found) = by_token(conn, token).await?
    {
        return repeated(found, t.cylinder_id);
    }
    check_cylinder(conn, t.cylinder_id).await?;
    let before = match t.amends_id {
        Some(amends) => Some(check_amends(conn, t.cylinder_id, amends).await?),
        None => None,
    };
    let flags = serde_json::to_string(&t.flags).unwrap_or_else(|_| "[]".into());
    let inserted = sqlx::query_scalar::<_, i64>(
        "INSERT INTO drift_tests (cylinder_id, procedure_id, tested_at, technician, duration_s,
            drift_m, start_position_m, end_position_m, oil_temperature_start_k,
            oil_temperature_end_k, ambient_temperature_k, cap_pressure_start_pa,
            cap_pressure_end_pa, rod_pressure_start_pa, rod_pressure_end_pa, load_n,
            load_direction, limit_distance_m, limit_period_s, readings_json, analysis_json,
            calc_version, verdict, diagnosis, scaled_drift_m, leak_drift_m, scaled_leak_drift_m,
            scaled_period_s, flags, notes, client_token, amends_id, created_at, created_by)
         VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?,
            ?, ?, ?, ?, ?, ?, ?, ?) RETURNING id",
    )
    .bind(t.cylinder_id)
    .bind(t.procedure_id)
    .bind(&t.tested_at)
    .bind(&t.technician)
    .bind(t.duration_s)
    .bind(t.drift_m)
    .bind(t.start_position_m)
    .bind(t.end_position_m)
    .bind(t.oil_temperature_start_k)
    .bind(t.oil_temperature_end_k)
    .bind(t.ambient_temperature_k)
    .bind(t.cap_pressure_start_pa)
    .bind(t.cap_pressure_end_pa)
    .bind(t.rod_pressure_start_pa)
    .bind(t.rod_pressure_end_pa)
    .bind(t.load_n)
    .bind(&t.load_direction)
    .bind(t.limit_distance_m)
    .bind(t.limit_period_s)
    .bind(&t.readings_json)
    .bind(&t.analysis_json)
    .bind(&t.calc_version)
    .bind(&t.verdict)
    .bind(&t.diagnosis)
    .bind(t.scaled_drift_m)
    .bind(t.leak_drift_m)
    .bind(t.scaled_leak_drift_m)
    .bind(t.scaled_period_s)
    .bind(&flags)
    .bind(&t.notes)
    .bind(&t.client_token)
    .bind(t.amends_id)
    .bind(super::now_rfc3339())
    .bind(actor)
    .fetch_one(&mut *conn)
    .await;
    let id = match inserted {
        Ok(id) => id,
        // Another request stored the same token between our look-up and the insert.
        Err(e) if is_unique_violation(&e) => {
            if let Some(token) = &t.client_token
                && let Some(found) = by_token(conn, token).await?
            {
                return repeated(found, t.cylinder_id);
            }
            return Err(e.into());
        }
        Err(e) => return Err(e.into()),
    };
    let stored = get(conn, id)
        .await?
        .ok_or(WriteError::NotFound("drift test"))?;
    let action = if before.is_some() { "amend" } else { "create" };
    audit::record(
        conn,
        actor,
        action,
        "drift_test",
        id,
        before.as_ref().map(snapshot).as_ref(),
        Some(&snapshot(&stored)),
    )
    .await?;
    Ok(Stored::Created(stored))
}

/// Refuses a test on a cylinder that does not exist or is archived.
async fn check_cylinder(conn: &mut SqliteConnection, id: i64) -> Result<(), WriteError> {
    match cylinders::get(conn, id).await? {
        None => Err(WriteError::NotFound("cylinder")),
        Some(c) if c.archived_at.is_some() => Err(WriteError::conflict(
            "cylinder",
            "this cylinder is archived; restore it before recording tests",
        )),
        Some(_) => Ok(()),
    }
}
