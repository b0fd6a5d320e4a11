//! The machines' due items: periodic and frequent inspections, from the last inspection of
//! each kind in force (one query for the whole fleet) and the current hour-meter reading.

use super::{DueItem, DueKind, DueQuery, day_of};
use crate::calc::due::{self, Baseline, Interval, Reading};
use crate::db::Db;
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

/// One query: every machine in the filter with, per kind, its last inspection in force on or
/// before `as_of` (the highest meter reading on that day), and its latest inspection reading.
pub(super) async fn machine_rows(
    db: &Db,
    query: &DueQuery,
    machine_id: Option<i64>,
) -> Result<Vec<MachineRow>, sqlx::Error> {
    let f = &query.filter;
    sqlx::query_as::<_, MachineRow>(
        "WITH live AS (
            SELECT i.machine_id, i.kind, i.performed_on, i.hour_meter_h
            FROM inspections i
            WHERE i.performed_on <= ?
              AND (? IS NULL OR i.machine_id = ?)
              AND NOT EXISTS (SELECT 1 FROM inspections a WHERE a.amends_id = i.id)
         ),
         last_on AS (
            SELECT machine_id, kind, MAX(performed_on) AS performed_on
            FROM live GROUP BY machine_id, kind
         ),
         last_kind AS (
            SELECT l.machine_id, l.kind, l.performed_on, MAX(v.hour_meter_h) AS hour_meter_h
            FROM last_on l
            JOIN live v ON v.machine_id = l.machine_id AND v.kind = l.kind
                       AND v.performed_on = l.performed_on
            GROUP BY l.machine_id, l.kind, l.performed_on
         ),
         read_on AS (
            SELECT machine_id, MAX(performed_on) AS performed_on
            FROM live WHERE hour_meter_h IS NOT NULL GROUP BY machine_id
         ),
         reading AS (
            SELECT r.machine_id, r.performed_on, MAX(v.hour_meter_h) AS hour_meter_h
            FROM read_on r
            JOIN live v ON v.machine_id = r.machine_id AND v.performed_on = r.performed_on
            GROUP BY r.machine_id, r.performed_on
         )
         SELECT m.id, m.unit_number, m.site_id, s.name AS site_name, m.kind, m.status,
            m.created_at, m.updated_at, m.hour_meter_h, m.hour_meter_read_on,
            m.periodic_interval_days, m.periodic_interval_hours, m.frequent_interval_days,
            p.performed_on AS periodic_on, p.hour_meter_h AS periodic_hours,
            fr.performed_on AS frequent_on, fr.hour_meter_h AS frequent_hours,
            r.performed_on AS reading_on, r.hour_meter_h AS reading_hours
         FROM machines m
         LEFT JOIN sites s ON s.id = m.site_id
         LEFT JOIN last_kind p ON p.machine_id = m.id AND p.kind = 'periodic'
         LEFT JOIN last_kind fr ON fr.machine_id = m.id AND fr.kind = 'frequent'
         LEFT JOIN reading r ON r.machine_id = m.id
         WHERE m.archived_at IS NULL
           AND (? IS NULL OR m.id = ?)
           AND (? IS NULL OR m.site_id = ?)
           AND (? IS NULL OR m.kind = ?)
           AND (? IS NULL OR m.status = ?)
         ORDER BY m.unit_number, m.id",
    )
    .bind(query.as_of.to_string())
    .bind(machine_id)
    .bind(machine_id)
    .bind(machine_id)
    .bind(machine_id)
    .bind(f.site_id)
    .bind(f.site_id)
    .bind(&f.machine_kind)
    .bind(&f.machine_kind)
    .bind(&f.status)
    .bind(&f.status)
    .fetch_all(db)
    .await
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
