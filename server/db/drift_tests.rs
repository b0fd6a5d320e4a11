//! Drift tests: the readings as SI columns and as sent to the engineering core, the analysis
//! as computed and by which calculation version. Append-only: a correction is a new row that
//! amends the old; a repeated client token finds the stored row instead of storing twice.

use super::records::{self, Record, Stored, Table};
use super::write::WriteError;
use super::{Db, cylinders, status, status_apply};
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
    /// `fit_for_service`, `restricted` or `remove_from_service` (NULL before migration 0008).
    pub decision: Option<String>,
    /// `{"reasons", "restrictions", "rules"}` as decided when stored.
    pub decision_json: Option<String>,
    /// The account that signed the record (`created_by` is its display name).
    pub signed_by_user_id: Option<i64>,
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
    /// The decision and its JSON (`calc::decision`), decided when the record was read.
    pub decision: String,
    pub decision_json: String,
    /// The signing account, set by the API from the logged-in user.
    pub signed_by_user_id: Option<i64>,
}

impl Record for DriftTest {
    fn parent_id(&self) -> i64 {
        self.cylinder_id
    }

    fn amended_by_id(&self) -> Option<i64> {
        self.amended_by_id
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
            t.client_token, t.amends_id, t.created_at, t.created_by, t.decision, t.decision_json, t.signed_by_user_id,
            (SELECT MIN(a.id) FROM drift_tests a WHERE a.amends_id = t.id) AS amended_by_id
         FROM drift_tests t "
    };
}

const TABLE: Table = Table {
    by_id: concat!(select_drift_test!(), "WHERE t.id = ?"),
    by_token: concat!(select_drift_test!(), "WHERE t.client_token = ?"),
    noun: "drift test",
    entity: "drift_test",
    parent: "cylinder",
    token_clash: "this client token was already used for another cylinder's test",
};

/// One drift test by id.
pub async fn get(conn: &mut SqliteConnection, id: i64) -> Result<Option<DriftTest>, sqlx::Error> {
    records::get(conn, &TABLE, id).await
}

pub async fn find(db: &Db, id: i64) -> Result<Option<DriftTest>, sqlx::Error> {
    records::find(db, &TABLE, id).await
}

/// The drift test stored under a client token, if any.
pub async fn by_token(
    conn: &mut SqliteConnection,
    token: &str,
) -> Result<Option<DriftTest>, sqlx::Error> {
    records::by_token(conn, &TABLE, token).await
}

/// Every drift test of a cylinder, amended ones included, oldest test first (at most 1000, the
/// latest ones).
pub async fn of_cylinder(db: &Db, cylinder_id: i64) -> Result<Vec<DriftTest>, sqlx::Error> {
    let sql = concat!(
        select_drift_test!(),
        "WHERE t.cylinder_id = ? ORDER BY t.tested_at DESC, t.id DESC LIMIT 1000"
    );
    let mut rows: Vec<DriftTest> = records::of_parent(db, sql, cylinder_id).await?;
    rows.reverse();
    Ok(rows)
}

/// Stores a drift test with its audit row, inside the caller's transaction. A client token
/// already stored returns that record (`Stored::Existing`) and writes nothing.
pub async fn insert(
    conn: &mut SqliteConnection,
    actor: &str,
    t: &NewDriftTest,
) -> Result<Stored<DriftTest>, WriteError> {
    let token = t.client_token.as_deref();
    if let Some(found) = records::repeat_of(conn, &TABLE, token, t.cylinder_id, t).await? {
        return Ok(found);
    }
    cylinders::check_testable(conn, t.cylinder_id).await?;
    let before = records::amended::<DriftTest>(conn, &TABLE, t.cylinder_id, t.amends_id).await?;
    let flags = serde_json::to_string(&t.flags).unwrap_or_else(|_| "[]".into());
    let inserted = sqlx::query_scalar::<_, i64>(
        "INSERT INTO drift_tests (cylinder_id, procedure_id, tested_at, technician, duration_s,
            drift_m, start_position_m, end_position_m, oil_temperature_start_k,
            oil_temperature_end_k, ambient_temperature_k, cap_pressure_start_pa,
            cap_pressure_end_pa, rod_pressure_start_pa, rod_pressure_end_pa, load_n,
            load_direction, limit_distance_m, limit_period_s, readings_json, analysis_json,
            calc_version, verdict, diagnosis, scaled_drift_m, leak_drift_m, scaled_leak_drift_m,
            scaled_period_s, flags, notes, client_token, amends_id, created_at, created_by, decision, decision_json,
            signed_by_user_id)
         VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?,
            ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?) RETURNING id",
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
    .bind(&t.decision)
    .bind(&t.decision_json)
    .bind(t.signed_by_user_id)
    .fetch_one(&mut *conn)
    .await;
    let stored = records::finish(
        conn,
        &TABLE,
        actor,
        inserted,
        (token, t.cylinder_id, t),
        before.as_ref(),
    )
    .await?;
    if let Stored::Created(r) = &stored {
        let who = status::Who {
            name: actor,
            user_id: r.signed_by_user_id,
        };
        let record = status_apply::Stored {
            kind: "drift_test",
            id: r.id,
            machine_id: None,
            cylinder_id: Some(r.cylinder_id),
            decision: r.decision.as_deref(),
            decision_json: r.decision_json.as_deref(),
            on: &r.tested_at,
            performed_by: &r.technician,
        };
        status_apply::apply_stored(conn, who, record).await?;
    }
    Ok(stored)
}
