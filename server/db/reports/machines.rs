//! The machines' due items: periodic and frequent inspections, from the last inspection of
//! each kind in force (one query for the whole fleet) and the current hour-meter reading.

use super::{DueItem, DueKind, DueQuery, day_of};
use crate::calc::due::{self, Baseline, Interval, Reading};
use crate::db::Db;
use sqlx::{QueryBuilder, Sqlite};
use time::Date;

/// A machine with its last inspection of each kind and its latest meter reading.
#[derive(Clone, Debug, sqlx::FromRow)]
pub(super) struct MachineRow {
    id: i64,
    unit_number: String,
    site_id: Option<i64>,
    site_name: Option<String>,
    kind: String,
    status: String,
    created_at: String,
    updated_at: String,
    hour_meter_h: Option<f64>,
    hour_meter_read_on: Option<String>,
    periodic_interval_days: Option<i64>,
    periodic_interval_hours: Option<f64>,
    frequent_interval_days: Option<i64>,
    periodic_on: Option<String>,
    periodic_hours: Option<f64>,
    frequent_on: Option<String>,
    frequent_hours: Option<f64>,
    reading_on: Option<String>,
    reading_hours: Option<f64>,
}

/// Pushes the id of the machine's last inspection in force on or before `as_of`, of `kind`
/// or (with `None`) of any kind that read the hour meter: latest day, then the highest meter
/// reading that day. One index walk per machine (`inspections (machine_id, kind,
/// performed_on)` or `(machine_id, performed_on)`), stopping at the first row in force.
fn push_last(sql: &mut QueryBuilder<Sqlite>, kind: Option<&'static str>, as_of: &str) {
    sql.push("(SELECT i.id FROM inspections i WHERE i.machine_id = m.id");
    match kind {
        Some(kind) => sql.push(" AND i.kind = ").push_bind(kind),
        None => sql.push(" AND i.hour_meter_h IS NOT NULL"),
    };
    sql.push(" AND i.performed_on <= ")
        .push_bind(as_of.to_string());
    sql.push(
        " AND NOT EXISTS (SELECT 1 FROM inspections a WHERE a.amends_id = i.id)
        ORDER BY i.performed_on DESC, i.hour_meter_h IS NULL, i.hour_meter_h DESC LIMIT 1)",
    );
}

/// One query: every machine in the filter with, per kind, its last inspection in force on or
/// before `as_of` (the highest meter reading on that day), and its latest inspection reading.
/// Each machine's last records are index look-ups of their own (correlated subqueries), so the
/// cost follows the machines listed, not every inspection ever made (tests/bench/ANALYSIS.md).
pub(super) async fn machine_rows(
    db: &Db,
    query: &DueQuery,
    machine_id: Option<i64>,
) -> Result<Vec<MachineRow>, sqlx::Error> {
    let as_of = query.as_of.to_string();
    let mut sql = QueryBuilder::<Sqlite>::new(
        "SELECT x.id, x.unit_number, x.site_id, s.name AS site_name, x.kind, x.status,
            x.created_at, x.updated_at, x.hour_meter_h, x.hour_meter_read_on,
            x.periodic_interval_days, x.periodic_interval_hours, x.frequent_interval_days,
            p.performed_on AS periodic_on, p.hour_meter_h AS periodic_hours,
            fr.performed_on AS frequent_on, fr.hour_meter_h AS frequent_hours,
            r.performed_on AS reading_on, r.hour_meter_h AS reading_hours
         FROM (SELECT m.id, m.unit_number, m.site_id, m.kind, m.status, m.created_at,
                m.updated_at, m.hour_meter_h, m.hour_meter_read_on, m.periodic_interval_days,
                m.periodic_interval_hours, m.frequent_interval_days, ",
    );
    push_last(&mut sql, Some("periodic"), &as_of);
    sql.push(" AS periodic_id, ");
    push_last(&mut sql, Some("frequent"), &as_of);
    sql.push(" AS frequent_id, ");
    push_last(&mut sql, None, &as_of);
    sql.push(" AS reading_id FROM machines m WHERE m.archived_at IS NULL");
    if let Some(id) = machine_id {
        sql.push(" AND m.id = ").push_bind(id);
    }
    super::push_filter(&mut sql, &query.filter);
    sql.push(
        ") x
         LEFT JOIN sites s ON s.id = x.site_id
         LEFT JOIN inspections p ON p.id = x.periodic_id
         LEFT JOIN inspections fr ON fr.id = x.frequent_id
         LEFT JOIN inspections r ON r.id = x.reading_id
         ORDER BY x.unit_number, x.id",
    );
    sql.build_query_as::<MachineRow>().fetch_all(db).await
}

/// The current reading: the later-dated of the machine's own reading (its date, else the day
/// the machine was last edited) and its latest inspection's; the higher one on a tie. A
/// machine reading dated after `as_of` is not yet known on that day.
fn current_reading(row: &MachineRow, as_of: Date) -> Option<Reading> {
    let own = row.hour_meter_h.and_then(|hours| {
        let on = row
            .hour_meter_read_on
            .as_deref()
            .and_then(day_of)
            .or_else(|| day_of(&row.updated_at))?;
        (on <= as_of).then_some(Reading { hours, on })
    });
    let inspected = row
        .reading_hours
        .zip(row.reading_on.as_deref().and_then(day_of))
        .map(|(hours, on)| Reading { hours, on });
    match (own, inspected) {
        (Some(a), Some(b)) => Some(if (b.on, b.hours) > (a.on, a.hours) {
            b
        } else {
            a
        }),
        (a, b) => a.or(b),
    }
}

pub(super) fn machine_items(row: &MachineRow, query: &DueQuery) -> Vec<DueItem> {
    let Some(registered) = day_of(&row.created_at) else {
        return Vec::new();
    };
    let reading = current_reading(row, query.as_of);
    let kinds = [
        (
            DueKind::PeriodicInspection,
            Interval {
                days: row.periodic_interval_days,
                hours: row.periodic_interval_hours,
            },
            &row.periodic_on,
            row.periodic_hours,
        ),
        (
            DueKind::FrequentInspection,
            Interval {
                days: row.frequent_interval_days,
                hours: None,
            },
            &row.frequent_on,
            row.frequent_hours,
        ),
    ];
    let mut items = Vec::new();
    for (kind, interval, last_on, last_hours) in kinds {
        let last = last_on.as_deref().and_then(day_of);
        let due = match last {
            Some(on) => {
                let since = Baseline {
                    on,
                    hour_meter: last_hours,
                };
                due::next_due(interval, since, reading, query.as_of, query.window)
            }
            None => due::first_due(interval, registered, query.as_of, query.window),
        };
        let Some(due) = due else {
            continue;
        };
        items.push(DueItem {
            kind,
            machine_id: row.id,
            unit_number: row.unit_number.clone(),
            site_id: row.site_id,
            site_name: row.site_name.clone(),
            machine_kind: row.kind.clone(),
            machine_status: row.status.clone(),
            cylinder_id: None,
            hose_id: None,
            detail: None,
            last_done_on: last.map(|d| d.to_string()),
            counted_from: last.unwrap_or(registered).to_string(),
            interval_days: interval.days,
            interval_hours: interval.hours,
            hour_meter: reading.map(|r| r.hours),
            reason: None,
            due,
        });
    }
    items
}
