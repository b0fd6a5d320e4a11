//! What the report pages show: lines of each list in words, the filter form, and the line
//! printed at the top of each report (filters and time generated).

use super::forms::{Choice, encode};
use crate::calc::analysis::component_words;
use crate::calc::limits::RELIEF_SETTING;
use crate::calc::quantity::{Dimension, UnitSystem, significant};
use crate::db::reports::fleet::OutOfService;
use crate::db::reports::hazards::{PressureHazard, TrendHazard, scenario_words};
use crate::db::reports::hoses::HoseAge;
use crate::db::reports::{DueItem, FleetFilter};
use crate::db::sites::Site;
use crate::pages::view::q;
use time::Date;

/// The filters a report page was asked with, as the form shows them back.
#[derive(Clone, Debug, Default)]
pub struct FilterForm {
    pub as_of: String,
    pub within_days: String,
    pub within_hours: String,
    pub sites: Vec<Choice>,
    pub kinds: Vec<Choice>,
    pub statuses: Vec<Choice>,
}

/// The form's values from a parsed query (or the raw text when it did not parse).
pub fn filter_form(
    as_of: &str,
    within_days: &str,
    within_hours: &str,
    filter: &FleetFilter,
    sites: &[Site],
    kinds: &[String],
) -> FilterForm {
    let mut site_choices = vec![choice("", "Every site", filter.site_id.is_none())];
    site_choices.extend(
        sites
            .iter()
            .map(|s| choice(&s.id.to_string(), &s.name, filter.site_id == Some(s.id))),
    );
    let mut kind_choices = vec![choice("", "Every kind", filter.machine_kind.is_none())];
    kind_choices.extend(
        kinds
            .iter()
            .map(|k| choice(k, k, filter.machine_kind.as_deref() == Some(k))),
    );
    let status = filter.status.as_deref();
    FilterForm {
        as_of: as_of.to_string(),
        within_days: within_days.to_string(),
        within_hours: within_hours.to_string(),
        sites: site_choices,
        kinds: kind_choices,
        statuses: vec![
            choice("", "Any status", status.is_none()),
            choice("in_service", "In service", status == Some("in_service")),
            choice(
                "out_of_service",
                "Out of service",
                status == Some("out_of_service"),
            ),
        ],
    }
}

fn choice(value: &str, label: &str, selected: bool) -> Choice {
    Choice {
        value: value.to_string(),
        label: label.to_string(),
        selected,
    }
}

/// The filters in words for the printed header, e.g. `site North Yard · status in service`.
pub fn filter_words(filter: &FleetFilter, sites: &[Site]) -> String {
    let mut parts = Vec::new();
    if let Some(id) = filter.site_id {
        let name = sites
            .iter()
            .find(|s| s.id == id)
            .map_or_else(|| format!("#{id}"), |s| s.name.clone());
        parts.push(format!("site {name}"));
    }
    if let Some(kind) = &filter.machine_kind {
        parts.push(format!("kind {kind}"));
    }
    if let Some(status) = &filter.status {
        parts.push(format!("status {}", status.replace('_', " ")));
    }
    if parts.is_empty() {
        "every site, kind and status".into()
    } else {
        parts.join(" · ")
    }
}

/// A query string from name/value pairs, empty values left out.
pub fn query_string(pairs: &[(&str, String)]) -> String {
    pairs
        .iter()
        .filter(|(_, v)| !v.is_empty())
        .map(|(k, v)| format!("{k}={}", encode(v)))
        .collect::<Vec<_>>()
        .join("&")
}

/// The filter pairs of a fleet filter, as the API and the pages name them.
pub fn filter_pairs(filter: &FleetFilter) -> Vec<(&'static str, String)> {
    vec![
        (
            "site",
            filter.site_id.map(|s| s.to_string()).unwrap_or_default(),
        ),
        ("kind", filter.machine_kind.clone().unwrap_or_default()),
        ("status", filter.status.clone().unwrap_or_default()),
    ]
}

/// The time a report was generated, for people: `2025-06-01 14:03 UTC`.
pub fn generated_at() -> String {
    let now = time::OffsetDateTime::now_utc();
    format!("{} {:02}:{:02} UTC", now.date(), now.hour(), now.minute())
}

/// One due item in words.
#[derive(Clone, Debug)]
pub struct DueLine {
    /// `overdue`, `due_soon` or `scheduled`.
    pub state: &'static str,
    pub machine_id: i64,
    pub unit_number: String,
    pub site: String,
    pub what: &'static str,
    pub detail: String,
    pub cylinder_id: Option<i64>,
    pub hose_id: Option<i64>,
    pub due_on: String,
    pub due_at_hours: String,
    /// `date` or `hours`, in words.
    pub basis: &'static str,
    pub how_far: String,
    pub last_done: String,
    pub hour_meter: String,
}

fn hours(h: f64) -> String {
    format!("{} h", significant(h, 6))
}

fn day_count(n: i64) -> String {
    if n == 1 {
        "1 day".into()
    } else {
        format!("{n} days")
    }
}

/// How far past (or before) due, on the basis that comes first.
fn how_far(i: &DueItem) -> String {
    let d = &i.due;
    match d.basis {
        crate::calc::due::Basis::Hours => match d.hours_overdue {
            Some(h) if h > 0.0 => format!("{} over", hours(h)),
            Some(h) => format!("{} left", hours(-h)),
            None => "no meter reading".into(),
        },
        crate::calc::due::Basis::Date => match d.days_overdue {
            Some(n) if n > 0 => format!("{} overdue", day_count(n)),
            Some(0) => "due today".into(),
            Some(n) => format!("in {}", day_count(-n)),
            None => String::new(),
        },
    }
}

pub fn due_line(i: &DueItem) -> DueLine {
    DueLine {
        state: if i.due.overdue {
            "overdue"
        } else if i.due.due_soon {
            "due_soon"
        } else {
            "scheduled"
        },
        machine_id: i.machine_id,
        unit_number: i.unit_number.clone(),
        site: i.site_name.clone().unwrap_or_default(),
        what: i.kind.words(),
        detail: i.detail.clone().unwrap_or_default(),
        cylinder_id: i.cylinder_id,
        hose_id: i.hose_id,
        due_on: i.due.due_on.map(|d| d.to_string()).unwrap_or_default(),
        due_at_hours: i.due.due_at_hours.map(hours).unwrap_or_default(),
        basis: match i.due.basis {
            crate::calc::due::Basis::Date => "by date",
            crate::calc::due::Basis::Hours => "by hours",
        },
        how_far: how_far(i),
        last_done: match (&i.last_done_on, i.kind) {
            (Some(on), crate::db::reports::DueKind::HoseReplacement) => format!("installed {on}"),
            (Some(on), _) => on.clone(),
            (None, crate::db::reports::DueKind::HoseReplacement) => String::new(),
            (None, _) => format!("never (registered {})", i.counted_from),
        },
        hour_meter: i.hour_meter.map(hours).unwrap_or_default(),
    }
}

/// One machine out of service in words.
#[derive(Clone, Debug)]
pub struct OutLine {
    pub machine_id: i64,
    pub unit_number: String,
    pub site: String,
    pub kind: String,
    pub reason: String,
    pub since: String,
    pub record: String,
}

pub fn out_line(o: &OutOfService) -> OutLine {
    let record = match o.record_type() {
        "inspection" => format!(
            "{} inspection #{} on {} by {}: {}",
            o.inspection_kind.as_deref().unwrap_or(""),
            o.inspection_id.unwrap_or_default(),
            o.inspection_on.as_deref().unwrap_or("?"),
            o.inspector.as_deref().unwrap_or("?"),
            o.inspection_result
                .as_deref()
                .unwrap_or("")
                .replace('_', " ")
        ),
        "registry_change" => format!(
            "registry change #{} at {} by {}",
            o.change_id.unwrap_or_default(),
            o.change_at.as_deref().unwrap_or("?"),
            o.change_by.as_deref().unwrap_or("?")
        ),
        kind @ ("drift_test" | "decay_test") => format!(
            "{} #{}",
            kind.replace('_', " "),
            o.status_record_id.unwrap_or_default()
        ),
        _ => "not on file".into(),
    };
    OutLine {
        machine_id: o.machine_id,
        unit_number: o.unit_number.clone(),
        site: o.site_name.clone().unwrap_or_default(),
        kind: o.machine_kind.clone(),
        reason: o.reason.clone().unwrap_or_default(),
        since: o.since.clone().unwrap_or_default(),
        record,
    }
}

/// A pressure above a rating, in words.
#[derive(Clone, Debug)]
pub struct PressureLine {
    pub machine_id: i64,
    pub unit_number: String,
    pub cylinder_id: i64,
    pub cylinder: String,
    pub component: String,
    pub scenario: &'static str,
    pub pressure: String,
    pub rating: String,
    /// The load behind the pressure (the worst of the recorded range).
    pub load: String,
    /// Every other scenario above the rating, in words.
    pub also: Vec<&'static str>,
    /// True on the first line of each machine (the list is grouped by machine).
    pub first_of_machine: bool,
    pub site: String,
}

pub fn pressure_line(p: &PressureHazard, units: UnitSystem) -> PressureLine {
    PressureLine {
        machine_id: p.machine_id,
        unit_number: p.unit_number.clone(),
        cylinder_id: p.cylinder_id,
        cylinder: p.cylinder_function.clone().unwrap_or_default(),
        component: match (p.component.as_str(), p.exposure) {
            (RELIEF_SETTING, "cap") => "Relief setting, cap end (no rating recorded)".into(),
            (RELIEF_SETTING, _) => "Relief setting, rod end (no rating recorded)".into(),
            _ => component_words(&p.component),
        },
        scenario: scenario_words(p.scenario),
        pressure: q(Some(p.pressure_pa), Dimension::Pressure, units),
        rating: q(Some(p.rating_pa), Dimension::Pressure, units),
        load: q(Some(p.load_n), Dimension::Force, units),
        also: p
            .scenarios_above
            .iter()
            .skip(1)
            .map(|s| scenario_words(s))
            .collect(),
        first_of_machine: false,
        site: p.site_name.clone().unwrap_or_default(),
    }
}

/// The pressure lines grouped by machine (unit number order; each machine's lines keep the
/// list's worst-first order), the first line of each marked.
pub fn by_machine(mut lines: Vec<PressureLine>) -> Vec<PressureLine> {
    lines.sort_by(|a, b| a.unit_number.cmp(&b.unit_number));
    let mut last = None;
    for line in &mut lines {
        line.first_of_machine = last != Some(line.machine_id);
        last = Some(line.machine_id);
    }
    lines
}

/// A drift trend reaching its limit, in words.
#[derive(Clone, Debug)]
pub struct TrendLine {
    pub machine_id: i64,
    pub unit_number: String,
    pub cylinder_id: i64,
    pub cylinder: String,
    pub crosses_on: String,
    pub reached: bool,
    pub latest: String,
    pub limit: String,
    pub tests_used: usize,
}

pub fn trend_line(t: &TrendHazard, units: UnitSystem) -> TrendLine {
    let period = crate::calc::words::duration(t.limit_period_s);
    TrendLine {
        machine_id: t.machine_id,
        unit_number: t.unit_number.clone(),
        cylinder_id: t.cylinder_id,
        cylinder: t.cylinder_function.clone().unwrap_or_default(),
        crosses_on: t.crosses_on.to_string(),
        reached: t.reached,
        latest: format!(
            "{} per {period}",
            q(Some(t.latest_m), Dimension::Length, units)
        ),
        limit: format!(
            "{} per {period}",
            q(Some(t.limit_m), Dimension::Length, units)
        ),
        tests_used: t.tests_used,
    }
}

/// A hose on the age list, in words.
#[derive(Clone, Debug)]
pub struct HoseLine {
    pub hose_id: i64,
    pub machine_id: i64,
    pub unit_number: String,
    pub site: String,
    pub place: String,
    pub spec: String,
    pub age: String,
    pub age_from: String,
    pub replace_by: String,
    /// `past_replace_by`, `over_age_limit`, both words, or `ok`.
    pub state: &'static str,
}

pub fn hose_line(h: &HoseAge) -> HoseLine {
    let age = match (h.age_years, h.age_days) {
        (Some(y), Some(d)) => format!("{y} years ({d} days)"),
        _ => "unknown".into(),
    };
    let age_from = match (h.born_on, h.born_from) {
        (Some(d), Some("made_in")) => {
            format!("made {} ({d})", h.made_in.clone().unwrap_or_default())
        }
        (Some(d), _) => format!("installed {d}"),
        _ => "no date on file".into(),
    };
    HoseLine {
        hose_id: h.hose_id,
        machine_id: h.machine_id,
        unit_number: h.unit_number.clone(),
        site: h.site_name.clone().unwrap_or_default(),
        place: h.place.clone(),
        spec: [h.spec.clone(), h.size.clone()]
            .into_iter()
            .flatten()
            .collect::<Vec<_>>()
            .join(" "),
        age,
        age_from,
        replace_by: h.replace_by.clone().unwrap_or_default(),
        state: match (h.past_replace_by, h.over_age_limit) {
            (true, _) => "past_replace_by",
            (false, true) => "over_age_limit",
            _ => "ok",
        },
    }
}

/// `as_of` for the header, with `(today)` when it is today.
pub fn as_of_words(as_of: Date) -> String {
    if as_of == crate::api::reports::today() {
        format!("{as_of} (today)")
    } else {
        as_of.to_string()
    }
}
