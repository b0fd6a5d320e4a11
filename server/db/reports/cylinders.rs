//! The cylinders' due items: the drift test, from the last hold test in force (one query for
//! the whole fleet).

use super::{DueItem, DueKind, DueQuery, Scope, day_of};
use crate::calc::due::{self, Baseline, Interval};
use crate::db::Db;
use sqlx::{QueryBuilder, Sqlite};

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
    last_drift_at: Option<String>,
    last_decay_at: Option<String>,
}

impl CylinderRow {
    /// The later of the last drift test and the last decay test (RFC 3339 text).
    fn last_tested_at(&self) -> Option<&str> {
        match (self.last_drift_at.as_deref(), self.last_decay_at.as_deref()) {
            (Some(a), Some(b)) => Some(a.max(b)),
            (a, b) => a.or(b),
        }
    }
}

/// One query: every cylinder in the filter with its last drift and last pressure-decay test
/// in force on or before `as_of` (both are the cylinder's hold test; a decay test serves a
/// cylinder tested blocked at end of stroke). Each is an index walk of its own per cylinder
/// (`(cylinder_id, tested_at)`), stopping at the first test in force. For a due list
/// (`listed_only`) the cylinders that cannot be due by its last day are left out in SQL (see
/// [`cutoffs`]); `calc::due` still decides every one returned.
pub(super) async fn cylinder_rows(
    db: &Db,
    query: &DueQuery,
    scope: Scope,
) -> Result<Vec<CylinderRow>, sqlx::Error> {
    // `tested_at` is RFC 3339: before the next day's date string means on or before `as_of`
    // in the offset it was written with (the same day as its first ten characters), and it
    // keeps the index usable, which `substr(tested_at, 1, 10) <= as_of` does not.
    let before = due::add_days(query.as_of, 1)
        .unwrap_or(query.as_of)
        .to_string();
    let horizon = due::add_days(query.as_of, query.window.days).filter(|_| scope.listed_only);
    let listed_by = match horizon {
        Some(horizon) => cutoffs(db, query, horizon).await?,
        None => None,
    };
    let mut sql = QueryBuilder::<Sqlite>::new(if listed_by.is_some() {
        "SELECT x.* FROM ("
    } else {
        ""
    });
    sql.push(
        "SELECT c.id, c.machine_id, m.unit_number, m.site_id, s.name AS site_name,
            m.kind AS machine_kind, m.status AS machine_status, c.function, c.created_at,
            c.drift_test_interval_days, ",
    );
    for (table, name, then) in [
        ("drift_tests", "last_drift_at", ", "),
        ("decay_tests", "last_decay_at", " "),
    ] {
        sql.push(format!(
            "(SELECT d.tested_at FROM {table} d WHERE d.cylinder_id = c.id AND d.tested_at < "
        ));
        sql.push_bind(before.clone());
        sql.push(format!(
            " AND NOT EXISTS (SELECT 1 FROM {table} a WHERE a.amends_id = d.id)
            ORDER BY d.tested_at DESC LIMIT 1) AS {name}{then}"
        ));
    }
    sql.push(
        "FROM cylinders c
         JOIN machines m ON m.id = c.machine_id
         LEFT JOIN sites s ON s.id = m.site_id
         WHERE c.archived_at IS NULL AND m.archived_at IS NULL
           AND c.drift_test_interval_days IS NOT NULL",
    );
    if let Some(id) = scope.machine_id {
        sql.push(" AND c.machine_id = ").push_bind(id);
    }
    if let Some(id) = scope.cylinder_id {
        sql.push(" AND c.id = ").push_bind(id);
    }
    super::push_filter(&mut sql, &query.filter);
    match listed_by {
        None => sql.push(" ORDER BY m.unit_number, c.id"),
        Some(cutoffs) => {
            sql.push(") x WHERE ");
            for (n, (days, cutoff)) in cutoffs.iter().enumerate() {
                if n > 0 {
                    sql.push(" OR ");
                }
                sql.push("(x.drift_test_interval_days = ").push_bind(*days);
                sql.push(" AND (x.last_drift_at IS NULL OR x.last_drift_at < ")
                    .push_bind(cutoff.clone());
                sql.push(") AND (x.last_decay_at IS NULL OR x.last_decay_at < ")
                    .push_bind(cutoff.clone());
                sql.push("))");
            }
            sql.push(" ORDER BY x.unit_number, x.id")
        }
    };
    sql.build_query_as::<CylinderRow>().fetch_all(db).await
}

/// At most this many distinct intervals are spelt out in SQL; with more, every cylinder is
/// read and decided in Rust.
const MAX_INTERVALS: usize = 16;

/// For a due list ending on `horizon`: each drift-test interval in use under the filter, with
/// the time before which a cylinder's last hold test must fall for it to be due by then
/// (`last day + interval <= horizon`, so before the day after `horizon - interval`, as RFC
/// 3339 text compares). Cylinders never tested are always kept (due from registration).
/// `None`: too many intervals to spell out, or a date off the calendar.
async fn cutoffs(
    db: &Db,
    query: &DueQuery,
    horizon: time::Date,
) -> Result<Option<Vec<(i64, String)>>, sqlx::Error> {
    let mut sql = QueryBuilder::<Sqlite>::new(
        "SELECT DISTINCT c.drift_test_interval_days FROM cylinders c
         JOIN machines m ON m.id = c.machine_id
         WHERE c.archived_at IS NULL AND m.archived_at IS NULL
           AND c.drift_test_interval_days IS NOT NULL",
    );
    super::push_filter(&mut sql, &query.filter);
    let days: Vec<i64> = sql.build_query_scalar().fetch_all(db).await?;
    if days.is_empty() || days.len() > MAX_INTERVALS {
        return Ok(None);
    }
    Ok(days
        .into_iter()
        .map(|d| {
            let cutoff = due::add_days(horizon, 1_i64.checked_sub(d)?)?;
            Some((d, cutoff.to_string()))
        })
        .collect())
}

pub(super) fn cylinder_item(row: &CylinderRow, query: &DueQuery) -> Option<DueItem> {
    let registered = day_of(&row.created_at)?;
    let last = row.last_tested_at().and_then(day_of);
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
