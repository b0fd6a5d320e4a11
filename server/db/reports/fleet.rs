//! The fleet at a glance: machines out of service (why, since when, which record put them
//! there) and counts by site and status.

use super::FleetFilter;
use crate::db::Db;
use serde::Serialize;

/// One machine out of service.
#[derive(Clone, Debug, PartialEq, Serialize, sqlx::FromRow)]
pub struct OutOfService {
    pub machine_id: i64,
    pub unit_number: String,
    pub site_id: Option<i64>,
    pub site_name: Option<String>,
    pub machine_kind: String,
    pub reason: Option<String>,
    /// `YYYY-MM-DD` as stored with the status.
    pub since: Option<String>,
    /// The failed inspection that put it there, if an inspection did.
    pub inspection_id: Option<i64>,
    pub inspection_kind: Option<String>,
    pub inspection_on: Option<String>,
    pub inspector: Option<String>,
    pub inspection_result: Option<String>,
    pub deficiencies: Option<String>,
    /// The registry change (audit row) that set the status: id, time and who.
    pub change_id: Option<i64>,
    pub change_at: Option<String>,
    pub change_by: Option<String>,
    /// The latest status change of the machine (`db::status`): the record kind and id that set
    /// it (a drift test, decay test or inspection) and when.
    pub status_record_kind: Option<String>,
    pub status_record_id: Option<i64>,
    pub status_change_at: Option<String>,
}

impl OutOfService {
    /// Which record put the machine out of service: `inspection`, `registry_change`, or
    /// `unknown` when neither is on file.
    pub fn record_type(&self) -> &'static str {
        let by_test = self.status_record_id.is_some()
            && matches!(
                self.status_record_kind.as_deref(),
                Some("drift_test" | "decay_test")
            );
        if by_test {
            match self.status_record_kind.as_deref() {
                Some("drift_test") => "drift_test",
                _ => "decay_test",
            }
        } else if self.inspection_id.is_some() {
            "inspection"
        } else if self.change_id.is_some() {
            "registry_change"
        } else {
            "unknown"
        }
    }

    /// The record's id (test, inspection or audit row id).
    pub fn record_id(&self) -> Option<i64> {
        match self.record_type() {
            "drift_test" | "decay_test" => self.status_record_id,
            _ => self.inspection_id.or(self.change_id),
        }
    }
}

/// Every machine out of service in the filter (its `status` is implied), longest out first.
/// The registry change is the latest audit row of the machine whose "after" snapshot has the
/// status `out_of_service` and whose "before" does not (the JSON is matched as text, which is
/// portable SQL; the snapshots are written by `db::write::snapshot`, compact JSON).
pub async fn out_of_service(
    db: &Db,
    filter: &FleetFilter,
) -> Result<Vec<OutOfService>, sqlx::Error> {
    sqlx::query_as::<_, OutOfService>(
        "SELECT m.id AS machine_id, m.unit_number, m.site_id, s.name AS site_name,
            m.kind AS machine_kind, m.out_of_service_reason AS reason,
            m.out_of_service_since AS since,
            i.id AS inspection_id, i.kind AS inspection_kind, i.performed_on AS inspection_on,
            i.inspector, i.result AS inspection_result, i.deficiencies,
            a.id AS change_id, a.at AS change_at, a.actor AS change_by,
            sc.record_kind AS status_record_kind, sc.record_id AS status_record_id,
            sc.at AS status_change_at
         FROM machines m
         LEFT JOIN status_changes sc ON sc.id = (SELECT MAX(x.id) FROM status_changes x
            WHERE x.machine_id = m.id AND x.machine_status = 'out_of_service')
         LEFT JOIN sites s ON s.id = m.site_id
         LEFT JOIN inspections i ON i.id = m.out_of_service_inspection_id
         LEFT JOIN (
            SELECT entity_id, MAX(id) AS id FROM audit_log
            WHERE entity = 'machine'
              AND after_json LIKE '%\"status\":\"out_of_service\"%'
              AND (before_json IS NULL
                   OR before_json NOT LIKE '%\"status\":\"out_of_service\"%')
            GROUP BY entity_id
         ) ch ON ch.entity_id = m.id
         LEFT JOIN audit_log a ON a.id = ch.id
         WHERE m.archived_at IS NULL AND m.status = 'out_of_service'
           AND (? IS NULL OR m.site_id = ?)
           AND (? IS NULL OR m.kind = ?)
         ORDER BY COALESCE(m.out_of_service_since, '9999-12-31'), m.unit_number",
    )
    .bind(filter.site_id)
    .bind(filter.site_id)
    .bind(&filter.machine_kind)
    .bind(&filter.machine_kind)
    .fetch_all(db)
    .await
}

/// How many machines of a site stand in a status.
#[derive(Clone, Debug, PartialEq, Serialize, sqlx::FromRow)]
pub struct StatusCount {
    pub site_id: Option<i64>,
    pub site_name: Option<String>,
    pub status: String,
    pub machines: i64,
}

/// Machines (not archived) counted by site and status, sites by name, machines with no site
/// last.
pub async fn counts(db: &Db, filter: &FleetFilter) -> Result<Vec<StatusCount>, sqlx::Error> {
    sqlx::query_as::<_, StatusCount>(
        "SELECT m.site_id, s.name AS site_name, m.status, COUNT(*) AS machines
         FROM machines m
         LEFT JOIN sites s ON s.id = m.site_id
         WHERE m.archived_at IS NULL
           AND (? IS NULL OR m.site_id = ?)
           AND (? IS NULL OR m.kind = ?)
           AND (? IS NULL OR m.status = ?)
         GROUP BY m.site_id, s.name, m.status
         ORDER BY CASE WHEN s.name IS NULL THEN 1 ELSE 0 END, s.name, m.status",
    )
    .bind(filter.site_id)
    .bind(filter.site_id)
    .bind(&filter.machine_kind)
    .bind(&filter.machine_kind)
    .bind(&filter.status)
    .bind(&filter.status)
    .fetch_all(db)
    .await
}

/// One machine restricted by a record: in service, with the restrictions to keep.
#[derive(Clone, Debug, PartialEq, Serialize, sqlx::FromRow)]
pub struct Restricted {
    pub machine_id: i64,
    pub unit_number: String,
    pub site_id: Option<i64>,
    pub site_name: Option<String>,
    pub machine_kind: String,
    /// The latest status change: why, when, which record, and the restrictions (JSON list).
    pub reason: String,
    pub since: String,
    pub record_kind: String,
    pub record_id: Option<i64>,
    pub restrictions_json: String,
}

impl Restricted {
    pub fn restrictions(&self) -> Vec<String> {
        serde_json::from_str(&self.restrictions_json).unwrap_or_default()
    }
}

/// Every machine in service whose latest status change restricts it, in the filter, longest
/// restricted first.
pub async fn restricted(db: &Db, filter: &FleetFilter) -> Result<Vec<Restricted>, sqlx::Error> {
    sqlx::query_as::<_, Restricted>(
        "SELECT m.id AS machine_id, m.unit_number, m.site_id, s.name AS site_name,
            m.kind AS machine_kind, sc.reason, sc.at AS since, sc.record_kind, sc.record_id,
            sc.restrictions_json
         FROM machines m
         LEFT JOIN sites s ON s.id = m.site_id
         JOIN status_changes sc ON sc.id = (SELECT MAX(x.id) FROM status_changes x
            WHERE x.machine_id = m.id)
         WHERE m.archived_at IS NULL AND m.status = 'in_service'
           AND sc.machine_status = 'restricted'
           AND (? IS NULL OR m.site_id = ?)
           AND (? IS NULL OR m.kind = ?)
         ORDER BY sc.at, m.unit_number",
    )
    .bind(filter.site_id)
    .bind(filter.site_id)
    .bind(&filter.machine_kind)
    .bind(&filter.machine_kind)
    .fetch_all(db)
    .await
}
