//! Service status driven by records: a shop record whose decision restricts or removes a
//! cylinder changes the cylinder's and its machine's status in the record's own transaction,
//! and only a manager's approval after a passing retest (signed by another account) returns
//! them. Every change is a row of `status_changes` (append-only) with an audit row.

use super::write::WriteError;
use super::{audit, machines};
use crate::calc::decision::Decision;
use serde::Serialize;
use sqlx::SqliteConnection;

pub const IN_SERVICE: &str = "in_service";
pub const RESTRICTED: &str = "restricted";
pub const OUT_OF_SERVICE: &str = "out_of_service";

/// The status a decision calls for.
pub fn status_of(decision: Decision) -> &'static str {
    match decision {
        Decision::FitForService => IN_SERVICE,
        Decision::Restricted => RESTRICTED,
        Decision::RemoveFromService => OUT_OF_SERVICE,
    }
}

fn rank(status: &str) -> u8 {
    match status {
        OUT_OF_SERVICE => 2,
        RESTRICTED => 1,
        _ => 0,
    }
}

/// The more severe of two statuses.
pub fn worse<'a>(a: &'a str, b: &'a str) -> &'a str {
    if rank(b) > rank(a) { b } else { a }
}

/// A status in words, for pages.
pub fn words(status: &str) -> &'static str {
    match status {
        OUT_OF_SERVICE => "Out of service",
        RESTRICTED => "Restricted",
        _ => "In service",
    }
}

/// One row of the status history.
#[derive(Clone, Debug, PartialEq, Serialize, sqlx::FromRow)]
pub struct StatusChange {
    pub id: i64,
    pub at: String,
    pub actor: String,
    pub actor_user_id: Option<i64>,
    pub machine_id: i64,
    pub cylinder_id: Option<i64>,
    pub machine_status: String,
    pub cylinder_status: Option<String>,
    pub decision: Option<String>,
    pub reason: String,
    pub restrictions_json: String,
    pub record_kind: String,
    pub record_id: Option<i64>,
    pub note: Option<String>,
}

impl StatusChange {
    pub fn restrictions(&self) -> Vec<String> {
        serde_json::from_str(&self.restrictions_json).unwrap_or_default()
    }
}

macro_rules! select_change {
    () => {
        "SELECT id, at, actor, actor_user_id, machine_id, cylinder_id, machine_status,
            cylinder_status, decision, reason, restrictions_json, record_kind, record_id, note
         FROM status_changes "
    };
}

/// Who acts: display name and account.
#[derive(Clone, Copy, Debug)]
pub struct Who<'a> {
    pub name: &'a str,
    pub user_id: Option<i64>,
}

/// The machine's current status: `out_of_service` when the registry says so, else its latest
/// status change's (`in_service` when it has none).
pub async fn machine_status(
    conn: &mut SqliteConnection,
    machine_id: i64,
) -> Result<String, sqlx::Error> {
    let registry: Option<String> = sqlx::query_scalar("SELECT status FROM machines WHERE id = ?")
        .bind(machine_id)
        .fetch_optional(&mut *conn)
        .await?;
    let latest = latest_machine(conn, machine_id).await?;
    let from_rows = latest.map_or(IN_SERVICE.to_string(), |c| c.machine_status);
    Ok(worse(registry.as_deref().unwrap_or(IN_SERVICE), &from_rows).to_string())
}

async fn latest_machine(
    conn: &mut SqliteConnection,
    machine_id: i64,
) -> Result<Option<StatusChange>, sqlx::Error> {
    sqlx::query_as::<_, StatusChange>(concat!(
        select_change!(),
        "WHERE machine_id = ? ORDER BY id DESC LIMIT 1"
    ))
    .bind(machine_id)
    .fetch_optional(conn)
    .await
}

/// The cylinder's current status: its latest status change's, `in_service` without one.
pub async fn cylinder_status(
    conn: &mut SqliteConnection,
    cylinder_id: i64,
) -> Result<String, sqlx::Error> {
    let s: Option<String> = sqlx::query_scalar(
        "SELECT cylinder_status FROM status_changes
         WHERE cylinder_id = ? AND cylinder_status IS NOT NULL ORDER BY id DESC LIMIT 1",
    )
    .bind(cylinder_id)
    .fetch_optional(conn)
    .await?;
    Ok(s.unwrap_or_else(|| IN_SERVICE.to_string()))
}

/// Whose status history: a machine's (its own rows and its cylinders') or one cylinder's.
#[derive(Clone, Copy, Debug)]
pub enum Of {
    Machine(i64),
    Cylinder(i64),
}

/// The status history of a machine or a cylinder, newest first (the latest 500).
pub async fn history(
    conn: &mut SqliteConnection,
    of: Of,
) -> Result<Vec<StatusChange>, sqlx::Error> {
    let (sql, id) = match of {
        Of::Machine(id) => (
            concat!(
                select_change!(),
                "WHERE machine_id = ? ORDER BY id DESC LIMIT 500"
            ),
            id,
        ),
        Of::Cylinder(id) => (
            concat!(
                select_change!(),
                "WHERE cylinder_id = ? ORDER BY id DESC LIMIT 500"
            ),
            id,
        ),
    };
    sqlx::query_as::<_, StatusChange>(sql)
        .bind(id)
        .fetch_all(conn)
        .await
}

/// The list of texts under `key` of a JSON object (empty when absent).
pub fn texts(json: &serde_json::Value, key: &str) -> Vec<String> {
    json[key]
        .as_array()
        .map(|a| {
            a.iter()
                .filter_map(|v| v.as_str().map(str::to_string))
                .collect()
        })
        .unwrap_or_default()
}

/// The changes since the machine's last return to service that restrict or remove it (its
/// open causes), oldest first.
pub async fn open_causes(
    conn: &mut SqliteConnection,
    machine_id: i64,
) -> Result<Vec<StatusChange>, sqlx::Error> {
    let sql = concat!(
        select_change!(),
        "WHERE machine_id = ? AND record_kind <> 'return_to_service'
          AND decision IN ('restricted', 'remove_from_service')
          AND id > COALESCE((SELECT MAX(r.id) FROM status_changes r
                             WHERE r.machine_id = ? AND r.record_kind = 'return_to_service'), 0)
        ORDER BY id"
    );
    sqlx::query_as::<_, StatusChange>(sql)
        .bind(machine_id)
        .bind(machine_id)
        .fetch_all(conn)
        .await
}

/// Writes one status change with its audit row.
#[allow(clippy::too_many_arguments)]
pub(super) async fn insert(
    conn: &mut SqliteConnection,
    who: Who<'_>,
    machine_id: i64,
    cylinder: Option<(i64, &str)>,
    machine_status: &str,
    decision: Option<Decision>,
    reason: &str,
    restrictions: &[String],
    record: (&str, Option<i64>),
    note: Option<&str>,
) -> Result<StatusChange, WriteError> {
    let id: i64 = sqlx::query_scalar(
        "INSERT INTO status_changes (at, actor, actor_user_id, machine_id, cylinder_id,
            machine_status, cylinder_status, decision, reason, restrictions_json, record_kind,
            record_id, note)
         VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?) RETURNING id",
    )
    .bind(super::now_rfc3339())
    .bind(who.name)
    .bind(who.user_id)
    .bind(machine_id)
    .bind(cylinder.map(|c| c.0))
    .bind(machine_status)
    .bind(cylinder.map(|c| c.1))
    .bind(decision.map(Decision::as_str))
    .bind(reason)
    .bind(serde_json::to_string(restrictions).unwrap_or_else(|_| "[]".into()))
    .bind(record.0)
    .bind(record.1)
    .bind(note)
    .fetch_one(&mut *conn)
    .await?;
    let row = sqlx::query_as::<_, StatusChange>(concat!(select_change!(), "WHERE id = ?"))
        .bind(id)
        .fetch_one(&mut *conn)
        .await?;
    audit::created(conn, who.name, "status_change", id, &row).await?;
    Ok(row)
}

/// Sets the registry's status columns of a machine (out of service with reason and date, or
/// back in service) with one audit row of the machine before and after.
pub(super) async fn set_machine(
    conn: &mut SqliteConnection,
    actor: &str,
    machine_id: i64,
    out: Option<(&str, &str)>,
) -> Result<(), WriteError> {
    let before = machines::get(conn, machine_id)
        .await?
        .ok_or(WriteError::NotFound("machine"))?;
    let (status, reason, since) = match out {
        Some((reason, since)) => (OUT_OF_SERVICE, Some(reason), Some(since)),
        None => (IN_SERVICE, None, None),
    };
    sqlx::query(
        "UPDATE machines SET status = ?, out_of_service_reason = ?, out_of_service_since = ?,
            out_of_service_inspection_id =
                CASE WHEN ? = 'in_service' THEN NULL ELSE out_of_service_inspection_id END,
            updated_at = ?
         WHERE id = ?",
    )
    .bind(status)
    .bind(reason)
    .bind(since)
    .bind(status)
    .bind(super::now_rfc3339())
    .bind(machine_id)
    .execute(&mut *conn)
    .await?;
    let after = machines::get(conn, machine_id)
        .await?
        .ok_or(WriteError::NotFound("machine"))?;
    audit::changed(
        conn, actor, "update", "machine", machine_id, &before, &after,
    )
    .await?;
    Ok(())
}

/// True when the machine's latest status change took it out of service by a record (the
/// registry may then not put it back by hand).
pub async fn held_out_by_record(
    conn: &mut SqliteConnection,
    machine_id: i64,
) -> Result<bool, sqlx::Error> {
    Ok(latest_machine(conn, machine_id)
        .await?
        .is_some_and(|c| c.machine_status == OUT_OF_SERVICE))
}

/// A change that returns a machine: the rows written.
pub(super) async fn write_return(
    conn: &mut SqliteConnection,
    who: Who<'_>,
    machine_id: i64,
    cylinders: &[i64],
    reason: &str,
    retest: Option<i64>,
    note: &str,
) -> Result<Vec<StatusChange>, WriteError> {
    let mut rows = Vec::new();
    for id in cylinders {
        rows.push(
            insert(
                conn,
                who,
                machine_id,
                Some((*id, IN_SERVICE)),
                IN_SERVICE,
                None,
                reason,
                &[],
                ("return_to_service", retest),
                Some(note),
            )
            .await?,
        );
    }
    rows.push(
        insert(
            conn,
            who,
            machine_id,
            None,
            IN_SERVICE,
            None,
            reason,
            &[],
            ("return_to_service", retest),
            Some(note),
        )
        .await?,
    );
    let out = machines::get(conn, machine_id)
        .await?
        .is_some_and(|m| m.status == OUT_OF_SERVICE);
    if out {
        set_machine(conn, who.name, machine_id, None).await?;
    }
    Ok(rows)
}
