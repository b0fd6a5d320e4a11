//! The manager's reports: what is due across the fleet, what is out of service, what is
//! unsafe, how old the hoses are. Set-based: each list is a fixed number of queries over the
//! whole fleet (no query per machine), then pure calculations from `calc::due`.
//!
//! Records in force are those no other row amends (`amends_id`), made on or before the
//! report's `as_of` date; archived machines, cylinders and hoses are left out.

use super::Db;
use crate::calc::due::{self, Baseline, Due, Interval, Reading, Window};
use serde::Serialize;
use time::Date;

pub mod fleet;
pub mod hazards;
pub mod hoses;

/// The four kinds of due item.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum DueKind {
    PeriodicInspection,
    FrequentInspection,
    DriftTest,
    HoseReplacement,
}

impl DueKind {
    pub const ALL: [DueKind; 4] = [
        DueKind::PeriodicInspection,
        DueKind::FrequentInspection,
        DueKind::DriftTest,
        DueKind::HoseReplacement,
    ];

    pub fn as_str(self) -> &'static str {
        match self {
            DueKind::PeriodicInspection => "periodic_inspection",
            DueKind::FrequentInspection => "frequent_inspection",
            DueKind::DriftTest => "drift_test",
            DueKind::HoseReplacement => "hose_replacement",
        }
    }

    /// The kind in words, for pages.
    pub fn words(self) -> &'static str {
        match self {
            DueKind::PeriodicInspection => "Periodic inspection",
            DueKind::FrequentInspection => "Frequent inspection",
            DueKind::DriftTest => "Drift test",
            DueKind::HoseReplacement => "Hose replacement",
        }
    }
}

/// Which machines a report covers; `None` means any. Archived machines are always left out.
#[derive(Clone, Debug, Default, PartialEq)]
pub struct FleetFilter {
    pub site_id: Option<i64>,
    /// The machine's kind (`machines.kind`).
    pub machine_kind: Option<String>,
    /// `in_service` or `out_of_service`.
    pub status: Option<String>,
}

/// A due report's question: as of which day, how far ahead, over which machines.
#[derive(Clone, Debug, PartialEq)]
pub struct DueQuery {
    pub as_of: Date,
    pub window: Window,
    pub filter: FleetFilter,
}

impl DueQuery {
    /// The default look-ahead of the due list, days.
    pub const DEFAULT_WITHIN_DAYS: i64 = 30;

    pub fn new(as_of: Date) -> Self {
        DueQuery {
            as_of,
            window: Window {
                days: Self::DEFAULT_WITHIN_DAYS,
                hours: None,
            },
            filter: FleetFilter::default(),
        }
    }
}

/// One due item: what, on which machine (and cylinder or hose), and when.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct DueItem {
    pub kind: DueKind,
    pub machine_id: i64,
    pub unit_number: String,
    pub site_id: Option<i64>,
    pub site_name: Option<String>,
    pub machine_kind: String,
    pub machine_status: String,
    pub cylinder_id: Option<i64>,
    pub hose_id: Option<i64>,
    /// The cylinder's function or the hose's place, for people.
    pub detail: Option<String>,
    /// The last record of this kind in force (`YYYY-MM-DD`), `None` when never done.
    pub last_done_on: Option<String>,
    /// The day the interval counts from: `last_done_on`, or the registration date.
    pub counted_from: String,
    pub interval_days: Option<i64>,
    pub interval_hours: Option<f64>,
    /// The machine's current hour-meter reading, h, when known.
    pub hour_meter: Option<f64>,
    /// For a hose: `replace_by` or `age_limit`.
    pub reason: Option<&'static str>,
    pub due: Due,
}

/// The first ten characters of a stored date or RFC 3339 timestamp as a date.
pub fn day_of(text: &str) -> Option<Date> {
    due::parse_day(text)
}

/// Every due item of the fleet under `query`, listed or not, in fleet order (unit number).
pub async fn all_due(db: &Db, query: &DueQuery) -> Result<Vec<DueItem>, sqlx::Error> {
    collect(db, query, Scope::default()).await
}

/// The due list: items overdue or due within the window, furthest overdue first.
pub async fn due_list(db: &Db, query: &DueQuery) -> Result<Vec<DueItem>, sqlx::Error> {
    let mut items: Vec<DueItem> = all_due(db, query)
        .await?
        .into_iter()
        .filter(|i| i.due.is_listed())
        .collect();
    sort(&mut items);
    Ok(items)
}

/// Furthest overdue first ([`due::most_overdue_first`]), then by unit number and kind.
pub fn sort(items: &mut [DueItem]) {
    items.sort_by(|a, b| {
        due::most_overdue_first(&a.due, &b.due)
            .then_with(|| a.unit_number.cmp(&b.unit_number))
            .then_with(|| (a.kind as u8).cmp(&(b.kind as u8)))
            .then_with(|| a.cylinder_id.cmp(&b.cylinder_id))
            .then_with(|| a.hose_id.cmp(&b.hose_id))
    });
}

/// Everything due on one machine (its inspections, its cylinders' tests, its hoses) as of
/// `as_of`, with the default 30-day window, most overdue first; every scheduled item is
/// listed, due or not.
pub async fn due_for_machine(db: &Db, id: i64, as_of: Date) -> Result<Vec<DueItem>, sqlx::Error> {
    let scope = Scope {
        machine_id: Some(id),
        cylinder_id: None,
    };
    let mut items = collect(db, &DueQuery::new(as_of), scope).await?;
    sort(&mut items);
    Ok(items)
}

/// What is due on one cylinder: its drift test and the hoses on its ports.
pub async fn due_for_cylinder(db: &Db, id: i64, as_of: Date) -> Result<Vec<DueItem>, sqlx::Error> {
    let scope = Scope {
        machine_id: None,
        cylinder_id: Some(id),
    };
    let mut items = collect(db, &DueQuery::new(as_of), scope).await?;
    sort(&mut items);
    Ok(items)
}

/// Narrows the fleet queries to one machine or one cylinder.
#[derive(Clone, Copy, Debug, Default)]
struct Scope {
    machine_id: Option<i64>,
    cylinder_id: Option<i64>,
}

async fn collect(db: &Db, query: &DueQuery, scope: Scope) -> Result<Vec<DueItem>, sqlx::Error> {
    let mut items = Vec::new();
    if scope.cylinder_id.is_none() {
        for row in machine_rows(db, query, scope.machine_id).await? {
            items.extend(machine_items(&row, query));
        }
    }
    for row in cylinder_rows(db, query, scope).await? {
        if let Some(item) = cylinder_item(&row, query) {
            items.push(item);
        }
    }
    let settings = hoses::settings(db).await?;
    let hose_scope = hoses::HoseScope {
        machine_id: scope.machine_id,
        cylinder_id: scope.cylinder_id,
    };
    for row in hoses::hose_rows(db, &query.filter, hose_scope).await? {
        if let Some(item) = hoses::due_item(&row, query, settings.hose_age_limit_years) {
            items.push(item);
        }
    }
    Ok(items)
}

/// A machine with its last inspection of each kind and its latest meter reading.
#[derive(Clone, Debug, sqlx::FromRow)]
struct MachineRow {
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
async fn machine_rows(
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

fn machine_items(row: &MachineRow, query: &DueQuery) -> Vec<DueItem> {
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
        let since = Baseline {
            on: last.unwrap_or(registered),
            hour_meter: last.and(last_hours),
        };
        let Some(due) = due::next_due(interval, since, reading, query.as_of, query.window) else {
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
            counted_from: since.on.to_string(),
            interval_days: interval.days,
            interval_hours: interval.hours,
            hour_meter: reading.map(|r| r.hours),
            reason: None,
            due,
        });
    }
    items
}

/// A cylinder with its machine and the day of its last hold test in force.
#[derive(Clone, Debug, sqlx::FromRow)]
struct CylinderRow {
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
async fn cylinder_rows(
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

fn cylinder_item(row: &CylinderRow, query: &DueQuery) -> Option<DueItem> {
    let registered = day_of(&row.created_at)?;
    let last = row.last_tested_at.as_deref().and_then(day_of);
    let interval = Interval {
        days: row.drift_test_interval_days,
        hours: None,
    };
    let since = Baseline {
        on: last.unwrap_or(registered),
        hour_meter: None,
    };
    let due = due::next_due(interval, since, None, query.as_of, query.window)?;
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
        counted_from: since.on.to_string(),
        interval_days: interval.days,
        interval_hours: None,
        hour_meter: None,
        reason: None,
        due,
    })
}
