//! The cylinders' due items: the drift test, from the last hold test in force (one query for
//! the whole fleet).

use super::{DueItem, DueKind, DueQuery, Scope, day_of};
use crate::calc::due::{self, Baseline, Interval};
use crate::db::Db;

/// A cylinder with its machine and the day of its last hold test in force.
#[derive(Clone, Debug, sqlx::FromRow)]
pub(super) struct CylinderRow {
    id: i64,
    machine_id: i64,
    unit_number: String,
    site_id: Option<i64>,
    site_name: Option<String>,
    machine_kind: String,
    machine_status: String,
    function: Option<String>,
    created_at: String,
    drift_test_interval_days: Option<i64>,
    last_tested_at: Option<String>,
}

/// One query: every cylinder in the filter with its last drift or pressure-decay test in force
/// on or before `as_of` (both are the cylinder's hold test; a decay test serves a cylinder
/// tested blocked at end of stroke).
pub(super) async fn cylinder_rows(
    db: &Db,
    query: &DueQuery,
    scope: Scope,
) -> Result<Vec<CylinderRow>, sqlx::Error> {
    let f = &query.filter;
    sqlx::query_as::<_, CylinderRow>(
        "WITH live AS (
            SELECT d.cylinder_id, d.tested_at FROM drift_tests d
            WHERE substr(d.tested_at, 1, 10) <= ?
              AND NOT EXISTS (SELECT 1 FROM drift_tests a WHERE a.amends_id = d.id)
            UNION ALL
            SELECT d.cylinder_id, d.tested_at FROM decay_tests d
            WHERE substr(d.tested_at, 1, 10) <= ?
              AND NOT EXISTS (SELECT 1 FROM decay_tests a WHERE a.amends_id = d.id)
         ),
         last_test AS (
            SELECT cylinder_id, MAX(tested_at) AS tested_at FROM live GROUP BY cylinder_id
         )
         SELECT c.id, c.machine_id, m.unit_number, m.site_id, s.name AS site_name,
            m.kind AS machine_kind, m.status AS machine_status, c.function, c.created_at,
            c.drift_test_interval_days, l.tested_at AS last_tested_at
         FROM cylinders c
         JOIN machines m ON m.id = c.machine_id
         LEFT JOIN sites s ON s.id = m.site_id
         LEFT JOIN last_test l ON l.cylinder_id = c.id
         WHERE c.archived_at IS NULL AND m.archived_at IS NULL
           AND c.drift_test_interval_days IS NOT NULL
           AND (? IS NULL OR c.machine_id = ?)
           AND (? IS NULL OR c.id = ?)
           AND (? IS NULL OR m.site_id = ?)
           AND (? IS NULL OR m.kind = ?)
           AND (? IS NULL OR m.status = ?)
         ORDER BY m.unit_number, c.id",
    )
    .bind(query.as_of.to_string())
    .bind(query.as_of.to_string())
    .bind(scope.machine_id)
    .bind(scope.machine_id)
    .bind(scope.cylinder_id)
    .bind(scope.cylinder_id)
    .bind(f.site_id)
    .bind(f.site_id)
    .bind(&f.machine_kind)
    .bind(&f.machine_kind)
    .bind(&f.status)
    .bind(&f.status)
    .fetch_all(db)
    .await
}

pub(super) fn cylinder_item(row: &CylinderRow, query: &DueQuery) -> Option<DueItem> {
    let registered = day_of(&row.created_at)?;
    let last = row.last_tested_at.as_deref().and_then(day_of);
    let interval = Interval {
        days: row.drift_test_interval_days,
        hours: None,
    };
    let due = match last {
        Some(on) => {
            let since = Baseline {
                on,
                hour_meter: None,
            };
            due::next_due(interval, since, None, query.as_of, query.window)?
        }
        None => due::first_due(interval, registered, query.as_of, query.window)?,
    };
    Some(DueItem {
        kind: DueKind::DriftTest,
        machine_id: row.machine_id,
        unit_number: row.unit_number.clone(),
        site_id: row.site_id,
        site_name: row.site_name.clone(),
        machine_kind: row.machine_kind.clone(),
        machine_status: row.machine_status.clone(),
        cylinder_id: Some(row.id),
        hose_id: None,
        detail: row.function.clone(),
        last_done_on: last.map(|d| d.to_string()),
        counted_from: last.unwrap_or(registered).to_string(),
        interval_days: interval.days,
        interval_hours: None,
        hour_meter: None,
        reason: None,
        due,
    })
}
