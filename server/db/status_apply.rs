//! A shop record's decision applied to the status it stands for (`db::status`): inside the
//! record's own transaction, a `restricted` or `remove_from_service` decision makes the
//! cylinder (if any) and its machine at least that severe; a removal takes the machine out of
//! service in the registry too. `fit_for_service` changes nothing: only a manager's approval
//! returns a machine (`db::service_return`).

use super::machines;
use super::status::{
    OUT_OF_SERVICE, StatusChange, Who, cylinder_status, insert, machine_status, set_machine,
    status_of, worse,
};
use super::write::WriteError;
use crate::calc::decision::Decision;
use sqlx::SqliteConnection;

/// A stored record's decision, as the status needs it.
#[derive(Clone, Debug)]
pub struct RecordDecision {
    /// `drift_test`, `decay_test` or `inspection`.
    pub kind: &'static str,
    pub id: i64,
    pub machine_id: i64,
    pub cylinder_id: Option<i64>,
    pub decision: Decision,
    /// Why, in one line (the record and its most severe reason).
    pub reason: String,
    pub restrictions: Vec<String>,
    /// The record's date, `YYYY-MM-DD` (the out-of-service date).
    pub on: String,
}

/// Applies a stored record's decision inside its transaction: `fit_for_service` changes
/// nothing (only a manager's approval returns a machine); `restricted` and
/// `remove_from_service` make the cylinder (if any) and the machine at least that severe, and
/// a removal puts the machine out of service in the registry. Returns the change written.
pub async fn apply(
    conn: &mut SqliteConnection,
    who: Who<'_>,
    r: &RecordDecision,
) -> Result<Option<StatusChange>, WriteError> {
    if r.decision == Decision::FitForService {
        return Ok(None);
    }
    let wanted = status_of(r.decision);
    let machine_now = machine_status(conn, r.machine_id).await?;
    let machine_after = worse(&machine_now, wanted).to_string();
    let cylinder_after = match r.cylinder_id {
        Some(id) => Some((
            id,
            worse(&cylinder_status(conn, id).await?, wanted).to_string(),
        )),
        None => None,
    };
    let change = insert(
        conn,
        who,
        r.machine_id,
        cylinder_after.as_ref().map(|(id, s)| (*id, s.as_str())),
        &machine_after,
        Some(r.decision),
        &r.reason,
        &r.restrictions,
        (r.kind, Some(r.id)),
        None,
    )
    .await?;
    let registry_out = machines::get(conn, r.machine_id)
        .await?
        .is_some_and(|m| m.status == OUT_OF_SERVICE);
    if machine_after == OUT_OF_SERVICE && !registry_out {
        set_machine(conn, who.name, r.machine_id, Some((&r.reason, &r.on))).await?;
    }
    Ok(Some(change))
}

/// What a stored record says about status, read from its decision columns.
pub struct Stored<'a> {
    /// `drift_test`, `decay_test` or `inspection`.
    pub kind: &'static str,
    pub id: i64,
    /// The machine (for an inspection) or the cylinder (for a test) the record is about.
    pub machine_id: Option<i64>,
    pub cylinder_id: Option<i64>,
    pub decision: Option<&'a str>,
    pub decision_json: Option<&'a str>,
    /// The record's date or time (its first ten characters are the date).
    pub on: &'a str,
    /// Who the record names as having done the work.
    pub performed_by: &'a str,
}

/// Applies a newly stored record's decision to the status ([`apply`]); a record without a
/// decision changes nothing.
pub async fn apply_stored(
    conn: &mut SqliteConnection,
    who: Who<'_>,
    r: Stored<'_>,
) -> Result<Option<StatusChange>, WriteError> {
    let Some(decision) = r.decision.and_then(Decision::parse) else {
        return Ok(None);
    };
    let machine_id = match (r.machine_id, r.cylinder_id) {
        (Some(m), _) => m,
        (None, Some(c)) => {
            sqlx::query_scalar("SELECT machine_id FROM cylinders WHERE id = ?")
                .bind(c)
                .fetch_one(&mut *conn)
                .await?
        }
        (None, None) => return Ok(None),
    };
    let json: serde_json::Value = r
        .decision_json
        .and_then(|t| serde_json::from_str(t).ok())
        .unwrap_or_default();
    let list = |key: &str| super::status::texts(&json, key);
    let first = list("reasons").into_iter().next().unwrap_or_default();
    let on = r.on.get(..10).unwrap_or(r.on);
    let reason = format!(
        "{} #{} on {on} by {} ({}): {first}",
        r.kind.replace('_', " "),
        r.id,
        r.performed_by,
        decision.words().to_lowercase()
    );
    let record = RecordDecision {
        kind: r.kind,
        id: r.id,
        machine_id,
        cylinder_id: r.cylinder_id,
        decision,
        reason,
        restrictions: list("restrictions"),
        on: on.to_string(),
    };
    apply(conn, who, &record).await
}
