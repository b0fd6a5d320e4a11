//! Inspections of a machine (periodic or frequent). Append-only: a correction is a new row
//! that amends the old. A `fail` puts the machine out of service in the same transaction and
//! names itself as the cause; a `pass_with_deficiencies` restricts it. No inspection puts a
//! machine back: a manager returns it after a passing one (`db::service_return`).

use super::records::{self, Record, Stored, Table};
use super::write::WriteError;
use super::{Db, machines, status, status_apply};
use serde::Serialize;
use sqlx::SqliteConnection;

pub const KINDS: [&str; 2] = ["periodic", "frequent"];
pub const RESULTS: [&str; 3] = ["pass", "pass_with_deficiencies", "fail"];

/// A stored inspection, with the id of the record that amends it (if any).
#[derive(Clone, Debug, PartialEq, Serialize, sqlx::FromRow)]
pub struct Inspection {
    pub id: i64,
    pub machine_id: i64,
    pub kind: String,
    pub performed_on: String,
    pub hour_meter_h: Option<f64>,
    pub inspector: String,
    pub result: String,
    pub items_json: String,
    pub deficiencies: Option<String>,
    pub corrective_action: Option<String>,
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
    /// The reading is of a new (replaced) hour meter, so it may be below the last one.
    pub hour_meter_replaced: bool,
}

impl Inspection {
    pub fn in_force(&self) -> bool {
        self.amended_by_id.is_none()
    }
}

/// An inspection to store.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct NewInspection {
    pub machine_id: i64,
    pub kind: String,
    pub performed_on: String,
    pub hour_meter_h: Option<f64>,
    pub inspector: String,
    pub result: String,
    /// A JSON array of `{"item", "outcome", "leakage_class", "note"}`.
    pub items_json: String,
    pub deficiencies: Option<String>,
    pub corrective_action: Option<String>,
    pub client_token: Option<String>,
    pub amends_id: Option<i64>,
    /// The decision and its JSON (`calc::decision`), decided when the record was read.
    pub decision: String,
    pub decision_json: String,
    /// The signing account, set by the API from the logged-in user.
    pub signed_by_user_id: Option<i64>,
    /// The hour meter was replaced: the reading restarts the machine's meter.
    pub hour_meter_replaced: bool,
}

impl Record for Inspection {
    fn parent_id(&self) -> i64 {
        self.machine_id
    }

    fn amended_by_id(&self) -> Option<i64> {
        self.amended_by_id
    }
}

macro_rules! select_inspection {
    () => {
        "SELECT i.id, i.machine_id, i.kind, i.performed_on, i.hour_meter_h, i.inspector,
            i.result, i.items_json, i.deficiencies, i.corrective_action, i.client_token,
            i.amends_id, i.created_at, i.created_by, i.decision, i.decision_json, i.signed_by_user_id,
            i.hour_meter_replaced,
            (SELECT MIN(a.id) FROM inspections a WHERE a.amends_id = i.id) AS amended_by_id
         FROM inspections i "
    };
}

const TABLE: Table = Table {
    by_id: concat!(select_inspection!(), "WHERE i.id = ?"),
    by_token: concat!(select_inspection!(), "WHERE i.client_token = ?"),
    noun: "inspection",
    entity: "inspection",
    parent: "machine",
    token_clash: "this client token was already used for another machine's inspection",
};

pub async fn get(conn: &mut SqliteConnection, id: i64) -> Result<Option<Inspection>, sqlx::Error> {
    records::get(conn, &TABLE, id).await
}

pub async fn find(db: &Db, id: i64) -> Result<Option<Inspection>, sqlx::Error> {
    records::find(db, &TABLE, id).await
}

pub async fn by_token(
    conn: &mut SqliteConnection,
    token: &str,
) -> Result<Option<Inspection>, sqlx::Error> {
    records::by_token(conn, &TABLE, token).await
}

/// Every inspection of a machine, amended ones included, newest first (at most 1000).
pub async fn of_machine(db: &Db, machine_id: i64) -> Result<Vec<Inspection>, sqlx::Error> {
    let sql = concat!(
        select_inspection!(),
        "WHERE i.machine_id = ? ORDER BY i.performed_on DESC, i.id DESC LIMIT 1000"
    );
    records::of_parent(db, sql, machine_id).await
}

/// The inspection that put the machine out of service, if that is why it is out.
pub async fn out_of_service_cause(db: &Db, machine_id: i64) -> Result<Option<i64>, sqlx::Error> {
    let mut conn = db.acquire().await?;
    cause(&mut conn, machine_id).await
}

async fn cause(conn: &mut SqliteConnection, machine_id: i64) -> Result<Option<i64>, sqlx::Error> {
    sqlx::query_scalar::<_, Option<i64>>(
        "SELECT out_of_service_inspection_id FROM machines
         WHERE id = ? AND status = 'out_of_service'",
    )
    .bind(machine_id)
    .fetch_optional(conn)
    .await
    .map(Option::flatten)
}

/// Applies a stored inspection to its machine's status through its decision
/// (`db::status`): a fail takes the machine out of service (and names itself as the cause), a
/// pass with deficiencies restricts it, and a pass changes nothing (only a manager's approval
/// returns a machine). The hour meter moves forward when the inspection read more than the
/// machine's last reading.
async fn apply_to_machine(
    conn: &mut SqliteConnection,
    actor: &str,
    stored: &Inspection,
) -> Result<(), WriteError> {
    let machine = machines::get(conn, stored.machine_id)
        .await?
        .ok_or(WriteError::NotFound("machine"))?;
    let who = status::Who {
        name: actor,
        user_id: stored.signed_by_user_id,
    };
    let record = status_apply::Stored {
        kind: "inspection",
        id: stored.id,
        machine_id: Some(stored.machine_id),
        cylinder_id: None,
        decision: stored.decision.as_deref(),
        decision_json: stored.decision_json.as_deref(),
        on: &stored.performed_on,
        performed_by: &stored.inspector,
    };
    let changed = status_apply::apply_stored(conn, who, record).await?;
    if changed.is_some() && stored.decision.as_deref() == Some("remove_from_service") {
        set_cause(conn, stored.machine_id, Some(stored.id)).await?;
    }
    if let Some(hours) = stored.hour_meter_h {
        let newer = (stored.hour_meter_replaced || machine.hour_meter_h.is_none_or(|h| hours > h))
            && machine
                .hour_meter_read_on
                .as_deref()
                .is_none_or(|d| stored.performed_on.as_str() >= d);
        if newer {
            let current = machines::get(conn, stored.machine_id)
                .await?
                .ok_or(WriteError::NotFound("machine"))?;
            let mut fields = current.fields();
            fields.hour_meter_h = Some(hours);
            fields.hour_meter_read_on = Some(stored.performed_on.clone());
            machines::update(conn, actor, stored.machine_id, &fields, None).await?;
        }
    }
    Ok(())
}

async fn set_cause(
    conn: &mut SqliteConnection,
    machine_id: i64,
    inspection_id: Option<i64>,
) -> Result<(), sqlx::Error> {
    sqlx::query("UPDATE machines SET out_of_service_inspection_id = ? WHERE id = ?")
        .bind(inspection_id)
        .bind(machine_id)
        .execute(conn)
        .await?;
    Ok(())
}

/// Stores an inspection with its audit row and applies it to the machine's status, inside the
/// caller's transaction. A client token already stored returns that record and writes nothing.
pub async fn insert(
    conn: &mut SqliteConnection,
    actor: &str,
    i: &NewInspection,
) -> Result<Stored<Inspection>, WriteError> {
    let token = i.client_token.as_deref();
    if let Some(found) = records::repeat_of(conn, &TABLE, token, i.machine_id, i).await? {
        return Ok(found);
    }
    machines::check_usable(conn, "machine_id", i.machine_id).await?;
    let before = records::amended::<Inspection>(conn, &TABLE, i.machine_id, i.amends_id).await?;
    let inserted = sqlx::query_scalar::<_, i64>(
        "INSERT INTO inspections (machine_id, kind, performed_on, hour_meter_h, inspector,
            result, items_json, deficiencies, corrective_action, client_token, amends_id,
            created_at, created_by, decision, decision_json,
            signed_by_user_id, hour_meter_replaced)
         VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?) RETURNING id",
    )
    .bind(i.machine_id)
    .bind(&i.kind)
    .bind(&i.performed_on)
    .bind(i.hour_meter_h)
    .bind(&i.inspector)
    .bind(&i.result)
    .bind(&i.items_json)
    .bind(&i.deficiencies)
    .bind(&i.corrective_action)
    .bind(&i.client_token)
    .bind(i.amends_id)
    .bind(super::now_rfc3339())
    .bind(actor)
    .bind(&i.decision)
    .bind(&i.decision_json)
    .bind(i.signed_by_user_id)
    .bind(i.hour_meter_replaced)
    .fetch_one(&mut *conn)
    .await;
    let stored = records::finish(
        conn,
        &TABLE,
        actor,
        inserted,
        (token, i.machine_id, i),
        before.as_ref(),
    )
    .await?;
    if let Stored::Created(record) = &stored {
        apply_to_machine(conn, actor, record).await?;
    }
    Ok(stored)
}
