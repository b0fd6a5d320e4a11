//! The reports' rows as JSON objects and as CSV tables (same fields, same order). Dates are
//! `YYYY-MM-DD`; in CSV an absent value is an empty cell and a flag is `true` / `false`.

use super::paging::shown;
use crate::calc::cautions;
use crate::calc::quantity::{Dimension, UnitSystem, format as show_quantity};
use crate::db::reports::DueItem;
use crate::db::reports::fleet::{OutOfService, Restricted};
use crate::db::reports::hazards::{Hazards, scenario_words};
use crate::db::reports::hoses::HoseAge;
use serde_json::{Value, json};
use time::Date;

/// A CSV table: header and rows of text cells.
#[derive(Clone, Debug, Default, PartialEq)]
pub struct Table {
    pub header: Vec<&'static str>,
    pub rows: Vec<Vec<String>>,
}

fn cell<T: ToString>(value: Option<T>) -> String {
    value.map(|v| v.to_string()).unwrap_or_default()
}

fn date(value: Option<Date>) -> Value {
    value.map_or(Value::Null, |d| Value::String(d.to_string()))
}

/// One due item as the API's contract gives it, plus context fields.
pub fn due_json(i: &DueItem) -> Value {
    json!({
        "kind": i.kind.as_str(),
        "machine_id": i.machine_id,
        "unit_number": i.unit_number,
        "cylinder_id": i.cylinder_id,
        "hose_id": i.hose_id,
        "due_on": date(i.due.due_on),
        "due_at_hours": i.due.due_at_hours,
        "overdue": i.due.overdue,
        "basis": i.due.basis.as_str(),
        "due_soon": i.due.due_soon,
        "days_overdue": i.due.days_overdue,
        "hours_overdue": i.due.hours_overdue,
        "site_id": i.site_id,
        "site_name": i.site_name,
        "machine_kind": i.machine_kind,
        "machine_status": i.machine_status,
        "detail": i.detail,
        "last_done_on": i.last_done_on,
        "counted_from": i.counted_from,
        "interval_days": i.interval_days,
        "interval_hours": i.interval_hours,
        "hour_meter": i.hour_meter,
        "reason": i.reason,
    })
}

/// The due list as CSV, the columns of [`due_json`] in order.
pub fn due_table(items: &[DueItem]) -> Table {
    Table {
        header: vec![
            "kind",
            "machine_id",
            "unit_number",
            "cylinder_id",
            "hose_id",
            "due_on",
            "due_at_hours",
            "overdue",
            "basis",
            "due_soon",
            "days_overdue",
            "hours_overdue",
            "site_id",
            "site_name",
            "machine_kind",
            "machine_status",
            "detail",
            "last_done_on",
            "counted_from",
            "interval_days",
            "interval_hours",
            "hour_meter",
            "reason",
        ],
        rows: items
            .iter()
            .map(|i| {
                vec![
                    i.kind.as_str().to_string(),
                    i.machine_id.to_string(),
                    i.unit_number.clone(),
                    cell(i.cylinder_id),
                    cell(i.hose_id),
                    cell(i.due.due_on),
                    cell(i.due.due_at_hours),
                    i.due.overdue.to_string(),
                    i.due.basis.as_str().to_string(),
                    i.due.due_soon.to_string(),
                    cell(i.due.days_overdue),
                    cell(i.due.hours_overdue),
                    cell(i.site_id),
                    cell(i.site_name.as_ref()),
                    i.machine_kind.clone(),
                    i.machine_status.clone(),
                    cell(i.detail.as_ref()),
                    cell(i.last_done_on.as_ref()),
                    i.counted_from.clone(),
                    cell(i.interval_days),
                    cell(i.interval_hours),
                    cell(i.hour_meter),
                    cell(i.reason),
                ]
            })
            .collect(),
    }
}

/// One machine out of service, with the record that put it there.
pub fn out_of_service_json(o: &OutOfService) -> Value {
    let record = match o.record_type() {
        "inspection" => json!({
            "type": "inspection",
            "id": o.inspection_id,
            "kind": o.inspection_kind,
            "performed_on": o.inspection_on,
            "inspector": o.inspector,
            "result": o.inspection_result,
            "deficiencies": o.deficiencies,
        }),
        "registry_change" => json!({
            "type": "registry_change",
            "id": o.change_id,
            "at": o.change_at,
            "by": o.change_by,
        }),
        kind @ ("drift_test" | "decay_test") => json!({
            "type": kind,
            "id": o.status_record_id,
            "at": o.status_change_at,
        }),
        _ => json!({"type": "unknown", "id": null}),
    };
    json!({
        "machine_id": o.machine_id,
        "unit_number": o.unit_number,
        "site_id": o.site_id,
        "site_name": o.site_name,
        "machine_kind": o.machine_kind,
        "reason": o.reason,
        "since": o.since,
        "record": record,
    })
}

/// A restricted machine as the out-of-service report's JSON lists it.
pub fn restricted_json(r: &Restricted) -> Value {
    json!({
        "machine_id": r.machine_id,
        "unit_number": r.unit_number,
        "site_id": r.site_id,
        "site_name": r.site_name,
        "machine_kind": r.machine_kind,
        "status": "restricted",
        "reason": r.reason,
        "since": r.since,
        "restrictions": r.restrictions(),
        "record": {"type": r.record_kind, "id": r.record_id},
    })
}

pub fn out_of_service_table(items: &[OutOfService]) -> Table {
    Table {
        header: vec![
            "machine_id",
            "unit_number",
            "site_id",
            "site_name",
            "machine_kind",
            "reason",
            "since",
            "record_type",
            "record_id",
            "inspection_kind",
            "inspection_on",
            "inspector",
            "inspection_result",
            "deficiencies",
            "changed_at",
            "changed_by",
        ],
        rows: items
            .iter()
            .map(|o| {
                vec![
                    o.machine_id.to_string(),
                    o.unit_number.clone(),
                    cell(o.site_id),
                    cell(o.site_name.as_ref()),
                    o.machine_kind.clone(),
                    cell(o.reason.as_ref()),
                    cell(o.since.as_ref()),
                    o.record_type().to_string(),
                    cell(o.record_id()),
                    cell(o.inspection_kind.as_ref()),
                    cell(o.inspection_on.as_ref()),
                    cell(o.inspector.as_ref()),
                    cell(o.inspection_result.as_ref()),
                    cell(o.deficiencies.as_ref()),
                    cell(o.change_at.as_ref()),
                    cell(o.change_by.as_ref()),
                ]
            })
            .collect(),
    }
}

/// One hose on the age list.
pub fn hose_age_json(h: &HoseAge) -> Value {
    json!({
        "hose_id": h.hose_id,
        "machine_id": h.machine_id,
        "unit_number": h.unit_number,
        "site_id": h.site_id,
        "site_name": h.site_name,
        "cylinder_id": h.cylinder_id,
        "place": h.place,
        "spec": h.spec,
        "size": h.size,
        "made_in": h.made_in,
        "installed_on": h.installed_on,
        "replace_by": h.replace_by,
        "age_from": date(h.born_on),
        "age_from_field": h.born_from,
        "age_days": h.age_days,
        "age_years": h.age_years,
        "past_replace_by": h.past_replace_by,
        "over_age_limit": h.over_age_limit,
    })
}

pub fn hose_age_table(items: &[HoseAge]) -> Table {
    Table {
        header: vec![
            "hose_id",
            "machine_id",
            "unit_number",
            "site_id",
            "site_name",
            "cylinder_id",
            "place",
            "spec",
            "size",
            "made_in",
            "installed_on",
            "replace_by",
            "age_from",
            "age_from_field",
            "age_days",
            "age_years",
            "past_replace_by",
            "over_age_limit",
        ],
        rows: items
            .iter()
            .map(|h| {
                vec![
                    h.hose_id.to_string(),
                    h.machine_id.to_string(),
                    h.unit_number.clone(),
                    cell(h.site_id),
                    cell(h.site_name.as_ref()),
                    cell(h.cylinder_id),
                    h.place.clone(),
                    cell(h.spec.as_ref()),
                    cell(h.size.as_ref()),
                    cell(h.made_in.as_ref()),
                    cell(h.installed_on.as_ref()),
                    cell(h.replace_by.as_ref()),
                    cell(h.born_on),
                    cell(h.born_from),
                    cell(h.age_days),
                    cell(h.age_years),
                    h.past_replace_by.to_string(),
                    h.over_age_limit.to_string(),
                ]
            })
            .collect(),
    }
}

/// The hazard list: the three kinds of hazard and the usual cautions.
pub fn hazards_json(h: &Hazards, as_of: Date, units: UnitSystem) -> Value {
    let pressure = |si: f64| shown(Some(si), Dimension::Pressure, units);
    let length = |si: f64| shown(Some(si), Dimension::Length, units);
    json!({
        "as_of": as_of.to_string(),
        "pressures": h.pressures.iter().map(|p| json!({
            "machine_id": p.machine_id,
            "unit_number": p.unit_number,
            "site_id": p.site_id,
            "site_name": p.site_name,
            "cylinder_id": p.cylinder_id,
            "cylinder_function": p.cylinder_function,
            "hose_id": p.hose_id,
            "scenario": p.scenario,
            "scenario_words": scenario_words(p.scenario),
            "scenarios_above": p.scenarios_above,
            "component": p.component,
            "exposure": p.exposure,
            "pressure": pressure(p.pressure_pa),
            "rating": pressure(p.rating_pa),
            "load": shown(Some(p.load_n), Dimension::Force, units),
        })).collect::<Vec<_>>(),
        "by_machine": by_machine(h),
        "hoses": h.hoses.iter().map(hose_age_json).collect::<Vec<_>>(),
        "trends": h.trends.iter().map(|t| json!({
            "machine_id": t.machine_id,
            "unit_number": t.unit_number,
            "site_id": t.site_id,
            "site_name": t.site_name,
            "cylinder_id": t.cylinder_id,
            "cylinder_function": t.cylinder_function,
            "crosses_on": t.crosses_on.to_string(),
            "reached": t.reached,
            "estimate": true,
            "limit": length(t.limit_m),
            "limit_period_s": t.limit_period_s,
            "latest": length(t.latest_m),
            "tests_used": t.tests_used,
        })).collect::<Vec<_>>(),
        "cautions": crate::calc::limits::with_relief_caution_if(
            cautions::for_result(!h.pressures.is_empty(), false),
            h.pressures.iter().any(|p| p.component == crate::calc::limits::RELIEF_SETTING),
        ),
    })
}

/// The pressure hazards grouped by machine (unit number order), each machine's lines worst
/// first: `{machine_id, unit_number, site_name, components: [{cylinder_id, component,
/// scenario, pressure_pa, rating_pa}]}`.
fn by_machine(h: &Hazards) -> Vec<Value> {
    let mut machines: Vec<(&str, i64)> = h
        .pressures
        .iter()
        .map(|p| (p.unit_number.as_str(), p.machine_id))
        .collect();
    machines.sort_unstable();
    machines.dedup();
    machines
        .into_iter()
        .map(|(unit, id)| {
            let lines: Vec<Value> = h
                .pressures
                .iter()
                .filter(|p| p.machine_id == id)
                .map(|p| {
                    json!({
                        "cylinder_id": p.cylinder_id,
                        "cylinder_function": p.cylinder_function,
                        "component": p.component,
                        "hose_id": p.hose_id,
                        "scenario": p.scenario,
                        "scenario_words": scenario_words(p.scenario),
                        "pressure_pa": p.pressure_pa,
                        "rating_pa": p.rating_pa,
                    })
                })
                .collect();
            let site = h
                .pressures
                .iter()
                .find(|p| p.machine_id == id)
                .and_then(|p| p.site_name.clone());
            json!({"machine_id": id, "unit_number": unit, "site_name": site, "components": lines})
        })
        .collect()
}

/// The hazard list as one CSV table, one row per hazard: `pressure`, `hose` or `drift_trend`.
pub fn hazard_table(h: &Hazards, units: UnitSystem) -> Table {
    let p = |si: f64| show_quantity(si, Dimension::Pressure, units);
    let l = |si: f64| show_quantity(si, Dimension::Length, units);
    let mut rows = Vec::new();
    for x in &h.pressures {
        rows.push(vec![
            "pressure".into(),
            x.machine_id.to_string(),
            x.unit_number.clone(),
            cell(x.site_name.as_ref()),
            x.cylinder_id.to_string(),
            cell(x.hose_id),
            format!(
                "{}: {} (at a load of {})",
                x.component,
                scenario_words(x.scenario),
                show_quantity(x.load_n, Dimension::Force, units)
            ),
            p(x.pressure_pa),
            p(x.rating_pa),
            String::new(),
        ]);
    }
    for x in &h.hoses {
        let why = match (x.past_replace_by, x.over_age_limit) {
            (true, true) => "past replace-by date and over the age limit",
            (true, false) => "past replace-by date",
            _ => "over the age limit",
        };
        rows.push(vec![
            "hose".into(),
            x.machine_id.to_string(),
            x.unit_number.clone(),
            cell(x.site_name.as_ref()),
            cell(x.cylinder_id),
            x.hose_id.to_string(),
            format!("{}: {why}", x.place),
            cell(x.age_years.map(|y| format!("{y} years"))),
            cell(x.replace_by.as_ref()),
            cell(x.born_on),
        ]);
    }
    for x in &h.trends {
        rows.push(vec![
            "drift_trend".into(),
            x.machine_id.to_string(),
            x.unit_number.clone(),
            cell(x.site_name.as_ref()),
            x.cylinder_id.to_string(),
            String::new(),
            format!(
                "{}: trend {} the limit (estimate)",
                cell(x.cylinder_function.as_ref()),
                if x.reached { "has reached" } else { "reaches" }
            ),
            l(x.latest_m),
            l(x.limit_m),
            x.crosses_on.to_string(),
        ]);
    }
    Table {
        header: vec![
            "hazard",
            "machine_id",
            "unit_number",
            "site_name",
            "cylinder_id",
            "hose_id",
            "what",
            "value",
            "limit",
            "on",
        ],
        rows,
    }
}
