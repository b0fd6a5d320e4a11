//! Pressure-decay tests: a cylinder blocked at end of stroke, one end pressurised, its
//! pressure read at start and end with the oil temperatures. Stored like drift tests: readings
//! as SI columns and as sent to the engineering core, the analysis as computed. Append-only.

use super::records::{self, Record, Stored, Table};
use super::write::WriteError;
use super::{Db, cylinders, status, status_apply};
use serde::Serialize;
use sqlx::SqliteConnection;

#[derive(Clone, Debug, PartialEq, Serialize, sqlx::FromRow)]
pub struct DecayTest {
    pub id: i64,
    pub cylinder_id: i64,
    pub procedure_id: Option<i64>,
    pub tested_at: String,
    pub technician: String,
    pub pressurised_end: String,
    pub duration_s: f64,
    pub pressure_start_pa: f64,
    pub pressure_end_pa: f64,
    pub other_pressure_start_pa: Option<f64>,
    pub other_pressure_end_pa: Option<f64>,
    pub oil_temperature_start_k: f64,
    pub oil_temperature_end_k: f64,
    pub ambient_temperature_k: Option<f64>,
    pub limit_pressure_drop_pa: Option<f64>,
    pub limit_period_s: Option<f64>,
    pub readings_json: String,
    pub analysis_json: String,
    pub calc_version: String,
    pub verdict: String,
    pub diagnosis: String,
    pub pressure_change_pa: f64,
    pub thermal_pressure_change_pa: f64,
    pub scaled_drop_pa: f64,
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
    pub amended_by_id: Option<i64>,
}

impl DecayTest {
    pub fn flag_list(&self) -> Vec<String> {
        serde_json::from_str(&self.flags).unwrap_or_default()
    }

    pub fn in_force(&self) -> bool {
        self.amended_by_id.is_none()
    }
}

#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct NewDecayTest {
    pub cylinder_id: i64,
    pub procedure_id: Option<i64>,
    pub tested_at: String,
    pub technician: String,
    pub pressurised_end: String,
    pub duration_s: f64,
    pub pressure_start_pa: f64,
    pub pressure_end_pa: f64,
    pub other_pressure_start_pa: Option<f64>,
    pub other_pressure_end_pa: Option<f64>,
    pub oil_temperature_start_k: f64,
    pub oil_temperature_end_k: f64,
    pub ambient_temperature_k: Option<f64>,
    pub limit_pressure_drop_pa: Option<f64>,
    pub limit_period_s: Option<f64>,
    pub readings_json: String,
    pub analysis_json: String,
    pub calc_version: String,
    pub verdict: String,
    pub diagnosis: String,
    pub pressure_change_pa: f64,
    pub thermal_pressure_change_pa: f64,
    pub scaled_drop_pa: f64,
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

impl Record for DecayTest {
    fn parent_id(&self) -> i64 {
        self.cylinder_id
    }

    fn amended_by_id(&self) -> Option<i64> {
        self.amended_by_id
    }
}

macro_rules! select_decay_test {
    () => {
        "SELECT t.id, t.cylinder_id, t.procedure_id, t.tested_at, t.technician,
            t.pressurised_end, t.duration_s, t.pressure_start_pa, t.pressure_end_pa,
            t.other_pressure_start_pa, t.other_pressure_end_pa, t.oil_temperature_start_k,
            t.oil_temperature_end_k, t.ambient_temperature_k, t.limit_pressure_drop_pa,
            t.limit_period_s, t.readings_json, t.analysis_json, t.calc_version, t.verdict,
            t.diagnosis, t.pressure_change_pa, t.thermal_pressure_change_pa, t.scaled_drop_pa,
            t.scaled_period_s, t.flags, t.notes, t.client_token, t.amends_id, t.created_at,
            t.created_by, t.decision, t.decision_json, t.signed_by_user_id,
            (SELECT MIN(a.id) FROM decay_tests a WHERE a.amends_id = t.id) AS amended_by_id
         FROM decay_tests t "
    };
}

const TABLE: Table = Table {
    by_id: concat!(select_decay_test!(), "WHERE t.id = ?"),
    by_token: concat!(select_decay_test!(), "WHERE t.client_token = ?"),
    noun: "decay test",
    entity: "decay_test",
    parent: "cylinder",
    token_clash: "this client token was already used for another cylinder's test",
};

pub async fn get(conn: &mut SqliteConnection, id: i64) -> Result<Option<DecayTest>, sqlx::Error> {
    records::get(conn, &TABLE, id).await
}

pub async fn find(db: &Db, id: i64) -> Result<Option<DecayTest>, sqlx::Error> {
    records::find(db, &TABLE, id).await
}

pub async fn by_token(
    conn: &mut SqliteConnection,
    token: &str,
) -> Result<Option<DecayTest>, sqlx::Error> {
    records::by_token(conn, &TABLE, token).await
}

/// Every decay test of a cylinder, amended ones included, oldest first (the latest 1000).
pub async fn of_cylinder(db: &Db, cylinder_id: i64) -> Result<Vec<DecayTest>, sqlx::Error> {
    let sql = concat!(
        select_decay_test!(),
        "WHERE t.cylinder_id = ? ORDER BY t.tested_at DESC, t.id DESC LIMIT 1000"
    );
    let mut rows: Vec<DecayTest> = records::of_parent(db, sql, cylinder_id).await?;
    rows.reverse();
    Ok(rows)
}

/// Stores a decay test with its audit row, inside the caller's transaction; a client token
/// already stored returns that record and writes nothing.
pub async fn insert(
    conn: &mut SqliteConnection,
    actor: &str,
    t: &NewDecayTest,
) -> Result<Stored<DecayTest>, WriteError> {
    let token = t.client_token.as_deref();
    if let Some(found) = records::repeat_of(conn, &TABLE, token, t.cylinder_id, t).await? {
        return Ok(found);
    }
    cylinders::check_testable(conn, t.cylinder_id).await?;
    let before = records::amended::<DecayTest>(conn, &TABLE, t.cylinder_id, t.amends_id).await?;
    let flags = serde_json::to_string(&t.flags).unwrap_or_else(|_| "[]".into());
    let inserted = sqlx::query_scalar::<_, i64>(
        "INSERT INTO decay_tests (cylinder_id, procedure_id, tested_at, technician,
            pressurised_end, duration_s, pressure_start_pa, pressure_end_pa,
            other_pressure_start_pa, other_pressure_end_pa, oil_temperature_start_k,
            oil_temperature_end_k, ambient_temperature_k, limit_pressure_drop_pa, limit_period_s,
            readings_json, analysis_json, calc_version, verdict, diagnosis, pressure_change_pa,
            thermal_pressure_change_pa, scaled_drop_pa, scaled_period_s, flags, notes,
            client_token, amends_id, created_at, created_by, decision, decision_json,
            signed_by_user_id)
         VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?,
            ?, ?, ?, ?, ?, ?, ?) RETURNING id",
    )
    .bind(t.cylinder_id)
    .bind(t.procedure_id)
    .bind(&t.tested_at)
    .bind(&t.technician)
    .bind(&t.pressurised_end)
    .bind(t.duration_s)
    .bind(t.pressure_start_pa)
    .bind(t.pressure_end_pa)
    .bind(t.other_pressure_start_pa)
    .bind(t.other_pressure_end_pa)
    .bind(t.oil_temperature_start_k)
    .bind(t.oil_temperature_end_k)
    .bind(t.ambient_temperature_k)
    .bind(t.limit_pressure_drop_pa)
    .bind(t.limit_period_s)
    .bind(&t.readings_json)
    .bind(&t.analysis_json)
    .bind(&t.calc_version)
    .bind(&t.verdict)
    .bind(&t.diagnosis)
    .bind(t.pressure_change_pa)
    .bind(t.thermal_pressure_change_pa)
    .bind(t.scaled_drop_pa)
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
            kind: "decay_test",
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
