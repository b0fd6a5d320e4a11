//! Hose assemblies in the reports: the shop's age limit, replacement due items and the age
//! list. One query fetches every hose in the filter with its machine and cylinder.

use super::{DueItem, DueKind, DueQuery, FleetFilter, day_of};
use crate::calc::due::{self, HoseReason};
use crate::db::write::snapshot;
use crate::db::{Db, audit};
use serde::Serialize;
use sqlx::{QueryBuilder, Sqlite};
use time::Date;

/// The shop's report settings.
#[derive(Clone, Debug, Default, PartialEq, Serialize, sqlx::FromRow)]
pub struct Settings {
    /// A hose older than this many years is due for replacement; `None`: no age limit set.
    pub hose_age_limit_years: Option<i32>,
    pub updated_at: String,
    pub updated_by: String,
}

/// The shop's settings (the one row `migrations/0004_reports.sql` creates).
pub async fn settings(db: &Db) -> Result<Settings, sqlx::Error> {
    let row = sqlx::query_as::<_, Settings>(
        "SELECT hose_age_limit_years, updated_at, updated_by FROM report_settings WHERE id = 1",
    )
    .fetch_optional(db)
    .await?;
    Ok(row.unwrap_or_default())
}

/// Sets the hose age limit (years, or `None` for no limit) in one transaction with an audit row.
pub async fn set_hose_age_limit(
    db: &Db,
    actor: &str,
    years: Option<i32>,
) -> Result<Settings, sqlx::Error> {
    let (_write, mut tx) = crate::db::begin_write(db).await?;
    let before = sqlx::query_as::<_, Settings>(
        "SELECT hose_age_limit_years, updated_at, updated_by FROM report_settings WHERE id = 1",
    )
    .fetch_optional(&mut *tx)
    .await?;
    let now = crate::db::now_rfc3339();
    sqlx::query(
        "INSERT INTO report_settings (id, hose_age_limit_years, updated_at, updated_by)
         VALUES (1, ?, ?, ?)
         ON CONFLICT (id) DO UPDATE SET hose_age_limit_years = excluded.hose_age_limit_years,
            updated_at = excluded.updated_at, updated_by = excluded.updated_by",
    )
    .bind(years)
    .bind(&now)
    .bind(actor)
    .execute(&mut *tx)
    .await?;
    let after = Settings {
        hose_age_limit_years: years,
        updated_at: now,
        updated_by: actor.to_string(),
    };
    audit::record(
        &mut tx,
        actor,
        "update",
        "report_settings",
        1,
        before.as_ref().map(snapshot).as_ref(),
        Some(&snapshot(&after)),
    )
    .await?;
    tx.commit().await?;
    Ok(after)
}

/// Narrows the hose query to one machine or the hoses on one cylinder.
#[derive(Clone, Copy, Debug, Default)]
pub struct HoseScope {
    pub machine_id: Option<i64>,
    pub cylinder_id: Option<i64>,
    /// Only hoses that may be due on or before this day: a coarse, index-friendly superset
    /// that [`due_item`] then decides exactly (see [`push_may_be_due`]).
    pub may_be_due_by: Option<DueBound>,
}

/// The look-ahead of a due list: its last day and the shop's hose age limit.
#[derive(Clone, Copy, Debug)]
pub struct DueBound {
    pub horizon: Date,
    pub age_limit_years: Option<i32>,
}

/// Keeps the hoses whose replace-by day is on or before the horizon, or (with an age limit)
/// made or installed in a year that can reach the limit by then. Every hose [`due_item`]
/// lists passes: its due day is the earlier of the replace-by day and `born + limit`, `born`
/// (from `made_in`, else `installed_on`) begins with its year, and a text that is not a date
/// fails both here and in [`due::parse_made_in`] or [`day_of`] (leading spaces sort first, so
/// they pass). Text comparison, so the index on `replace_by` serves and the SQL stays portable.
fn push_may_be_due(sql: &mut QueryBuilder<Sqlite>, bound: DueBound) {
    sql.push(" AND (h.replace_by <= ")
        .push_bind(bound.horizon.to_string());
    if let Some(years) = bound.age_limit_years {
        let next_year = format!("{:04}", bound.horizon.year() - years + 1);
        sql.push(" OR h.made_in < ").push_bind(next_year.clone());
        sql.push(" OR h.installed_on < ").push_bind(next_year);
    }
    sql.push(")");
}

/// A hose with where it is fitted and its dates.
#[derive(Clone, Debug, PartialEq, sqlx::FromRow)]
pub struct HoseRow {
    pub id: i64,
    pub machine_id: i64,
    pub unit_number: String,
    pub site_id: Option<i64>,
    pub site_name: Option<String>,
    pub machine_kind: String,
    pub machine_status: String,
    pub cylinder_id: Option<i64>,
    pub cylinder_function: Option<String>,
    pub port: Option<String>,
    pub circuit: Option<String>,
    pub spec: Option<String>,
    pub size: Option<String>,
    pub working_pressure_pa: Option<f64>,
    pub made_in: Option<String>,
    pub installed_on: Option<String>,
    pub replace_by: Option<String>,
}

impl HoseRow {
    /// Where the hose is fitted, for people: `boom lift, left · cap port` or the circuit.
    pub fn place(&self) -> String {
        let port = self.port.as_ref().map(|p| format!("{p} port"));
        let parts: Vec<String> = [self.cylinder_function.clone(), port, self.circuit.clone()]
            .into_iter()
            .flatten()
            .collect();
        if parts.is_empty() {
            "—".into()
        } else {
            parts.join(" · ")
        }
    }

    /// The day its age counts from: its manufacture date, else its install date.
    pub fn born(&self) -> Option<Date> {
        self.made_in
            .as_deref()
            .and_then(due::parse_made_in)
            .or_else(|| self.installed_on.as_deref().and_then(day_of))
    }

    /// What `born` was read from: `made_in` or `installed_on`.
    pub fn born_from(&self) -> Option<&'static str> {
        if self
            .made_in
            .as_deref()
            .and_then(due::parse_made_in)
            .is_some()
        {
            Some("made_in")
        } else if self.installed_on.as_deref().and_then(day_of).is_some() {
            Some("installed_on")
        } else {
            None
        }
    }
}

/// Every hose in the filter that is not archived, on a machine (and cylinder) not archived.
pub async fn hose_rows(
    db: &Db,
    filter: &FleetFilter,
    scope: HoseScope,
) -> Result<Vec<HoseRow>, sqlx::Error> {
    let mut sql = QueryBuilder::<Sqlite>::new(
        "SELECT h.id, h.machine_id, m.unit_number, m.site_id, s.name AS site_name,
            m.kind AS machine_kind, m.status AS machine_status, h.cylinder_id,
            c.function AS cylinder_function, h.port, h.circuit, h.spec, h.size,
            h.working_pressure_pa, h.made_in, h.installed_on, h.replace_by
         FROM hoses h
         JOIN machines m ON m.id = h.machine_id
         LEFT JOIN cylinders c ON c.id = h.cylinder_id
         LEFT JOIN sites s ON s.id = m.site_id
         WHERE h.archived_at IS NULL AND m.archived_at IS NULL
           AND (c.id IS NULL OR c.archived_at IS NULL)",
    );
    if let Some(id) = scope.machine_id {
        sql.push(" AND h.machine_id = ").push_bind(id);
    }
    if let Some(id) = scope.cylinder_id {
        sql.push(" AND h.cylinder_id = ").push_bind(id);
    }
    if let Some(bound) = scope.may_be_due_by {
        push_may_be_due(&mut sql, bound);
    }
    super::push_filter(&mut sql, filter);
    sql.push(" ORDER BY m.unit_number, h.id");
    sql.build_query_as::<HoseRow>().fetch_all(db).await
}

/// The hose's replacement as a due item ([`due::hose_due`]); `None` with no replace-by date
/// and no age limit that applies.
pub fn due_item(row: &HoseRow, query: &DueQuery, age_limit_years: Option<i32>) -> Option<DueItem> {
    let replace_by = row.replace_by.as_deref().and_then(day_of);
    let born = row.born();
    let (due_on, reason) = due::hose_due(replace_by, born, age_limit_years)?;
    let counted_from = match reason {
        HoseReason::ReplaceBy => due_on,
        HoseReason::AgeLimit => born.unwrap_or(due_on),
    };
    Some(DueItem {
        kind: DueKind::HoseReplacement,
        machine_id: row.machine_id,
        unit_number: row.unit_number.clone(),
        site_id: row.site_id,
        site_name: row.site_name.clone(),
        machine_kind: row.machine_kind.clone(),
        machine_status: row.machine_status.clone(),
        cylinder_id: row.cylinder_id,
        hose_id: Some(row.id),
        detail: Some(row.place()),
        last_done_on: row.installed_on.clone(),
        counted_from: counted_from.to_string(),
        interval_days: None,
        interval_hours: None,
        hour_meter: None,
        reason: Some(reason.as_str()),
        due: due::by_date(due_on, query.as_of, query.window.days),
    })
}

/// One line of the hose age list.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct HoseAge {
    pub hose_id: i64,
    pub machine_id: i64,
    pub unit_number: String,
    pub site_id: Option<i64>,
    pub site_name: Option<String>,
    pub cylinder_id: Option<i64>,
    pub place: String,
    pub spec: Option<String>,
    pub size: Option<String>,
    pub made_in: Option<String>,
    pub installed_on: Option<String>,
    pub replace_by: Option<String>,
    /// The day the age counts from and what it was read from (`made_in`, `installed_on`).
    pub born_on: Option<Date>,
    pub born_from: Option<&'static str>,
    /// Whole days from `born_on` to `as_of`; `None` when no date is known.
    pub age_days: Option<i64>,
    /// `age_days / 365.25`, one decimal place.
    pub age_years: Option<f64>,
    /// Past its replace-by date as of the report's day.
    pub past_replace_by: bool,
    /// Older than the shop's age limit.
    pub over_age_limit: bool,
}

/// Every hose in the filter, oldest first; hoses with no known date last (by id).
pub async fn hose_age(
    db: &Db,
    filter: &FleetFilter,
    as_of: Date,
) -> Result<(Vec<HoseAge>, Settings), sqlx::Error> {
    let settings = settings(db).await?;
    let rows = hose_rows(db, filter, HoseScope::default()).await?;
    let mut list: Vec<HoseAge> = rows.iter().map(|r| age_line(r, as_of, &settings)).collect();
    list.sort_by(|a, b| match (a.born_on, b.born_on) {
        (Some(x), Some(y)) => x.cmp(&y).then(a.hose_id.cmp(&b.hose_id)),
        (Some(_), None) => std::cmp::Ordering::Less,
        (None, Some(_)) => std::cmp::Ordering::Greater,
        (None, None) => a.hose_id.cmp(&b.hose_id),
    });
    Ok((list, settings))
}

/// The age line of one hose as of `as_of`.
pub fn age_line(row: &HoseRow, as_of: Date, settings: &Settings) -> HoseAge {
    let born = row.born();
    let age_days = born.map(|b| due::age_days(b, as_of));
    let limit_day = born
        .zip(settings.hose_age_limit_years)
        .and_then(|(b, y)| due::add_years(b, y));
    HoseAge {
        hose_id: row.id,
        machine_id: row.machine_id,
        unit_number: row.unit_number.clone(),
        site_id: row.site_id,
        site_name: row.site_name.clone(),
        cylinder_id: row.cylinder_id,
        place: row.place(),
        spec: row.spec.clone(),
        size: row.size.clone(),
        made_in: row.made_in.clone(),
        installed_on: row.installed_on.clone(),
        replace_by: row.replace_by.clone(),
        born_on: born,
        born_from: row.born_from(),
        age_days,
        age_years: age_days.map(|d| (d as f64 / 365.25 * 10.0).round() / 10.0),
        past_replace_by: row
            .replace_by
            .as_deref()
            .and_then(day_of)
            .is_some_and(|d| as_of > d),
        over_age_limit: limit_day.is_some_and(|d| as_of > d),
    }
}
