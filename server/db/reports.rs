//! The manager's reports: what is due across the fleet, what is out of service, what is
//! unsafe, how old the hoses are. Set-based: each list is a fixed number of queries over the
//! whole fleet (no query per machine), then pure calculations from `calc::due`.
//!
//! Records in force are those no other row amends (`amends_id`), made on or before the
//! report's `as_of` date; archived machines, cylinders and hoses are left out.

use super::Db;
use crate::calc::due::{self, Due, Window};
use serde::Serialize;
use sqlx::{QueryBuilder, Sqlite};
use time::Date;

mod cylinders;
pub mod fleet;
pub mod hazards;
pub mod hoses;
mod machines;

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

/// Appends the filter's conditions on the machine `m` to a query whose `WHERE` is open: only
/// those that apply, so that SQLite can use an index for each (a `? IS NULL OR m.site_id = ?`
/// form would make it read every machine).
pub(crate) fn push_filter(sql: &mut QueryBuilder<Sqlite>, filter: &FleetFilter) {
    if let Some(site) = filter.site_id {
        sql.push(" AND m.site_id = ").push_bind(site);
    }
    if let Some(kind) = &filter.machine_kind {
        sql.push(" AND m.kind = ").push_bind(kind.clone());
    }
    if let Some(status) = &filter.status {
        sql.push(" AND m.status = ").push_bind(status.clone());
    }
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
    let scope = Scope {
        listed_only: true,
        ..Scope::default()
    };
    let mut items: Vec<DueItem> = collect(db, query, scope)
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
        ..Scope::default()
    };
    let mut items = collect(db, &DueQuery::new(as_of), scope).await?;
    sort(&mut items);
    Ok(items)
}

/// What is due on one cylinder: its drift test and the hoses on its ports.
pub async fn due_for_cylinder(db: &Db, id: i64, as_of: Date) -> Result<Vec<DueItem>, sqlx::Error> {
    let scope = Scope {
        cylinder_id: Some(id),
        ..Scope::default()
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
    /// Leave out, in SQL, hoses that cannot be listed (due lists only; every item is still
    /// decided by `calc::due`).
    listed_only: bool,
}

async fn collect(db: &Db, query: &DueQuery, scope: Scope) -> Result<Vec<DueItem>, sqlx::Error> {
    let mut items = Vec::new();
    if scope.cylinder_id.is_none() {
        for row in machines::machine_rows(db, query, scope.machine_id).await? {
            items.extend(machines::machine_items(&row, query));
        }
    }
    for row in cylinders::cylinder_rows(db, query, scope).await? {
        if let Some(item) = cylinders::cylinder_item(&row, query) {
            items.push(item);
        }
    }
    let settings = hoses::settings(db).await?;
    let hose_scope = hoses::HoseScope {
        machine_id: scope.machine_id,
        cylinder_id: scope.cylinder_id,
        may_be_due_by: scope
            .listed_only
            .then(|| due::add_days(query.as_of, query.window.days))
            .flatten()
            .map(|horizon| hoses::DueBound {
                horizon,
                age_limit_years: settings.hose_age_limit_years,
            }),
    };
    for row in hoses::hose_rows(db, &query.filter, hose_scope).await? {
        if let Some(item) = hoses::due_item(&row, query, settings.hose_age_limit_years) {
            items.push(item);
        }
    }
    Ok(items)
}
