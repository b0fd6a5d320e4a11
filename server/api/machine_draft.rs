//! Reading a machine from a JSON object (API body, page form, demo file) over a base record:
//! a PATCH sends only what changes, `null` clears an optional field, and the merged record
//! is checked as a whole.

use super::draft::{
    Problems, date, id, latest_past, positive, required_text, text, today, touched,
};
use super::input::Fields;
use crate::calc::quantity::Dimension;
use crate::db::machines::MachineFields;
use crate::error::AppError;
use serde_json::{Map, Value};

/// Fields a machine body may carry (`units` picks the display units of the answer).
pub const FIELDS: &[&str] = &[
    "unit_number",
    "site_id",
    "kind",
    "description",
    "serial",
    "status",
    "out_of_service_reason",
    "out_of_service_since",
    "relief_pressure",
    "hour_meter",
    "hour_meter_read_on",
    "periodic_interval_days",
    "periodic_interval_hours",
    "frequent_interval_days",
    "archived",
    "units",
];

pub const STATUSES: &[&str] = &["in_service", "out_of_service"];

/// Longest periodic or drift-test interval accepted, days (ten years).
pub const MAX_INTERVAL_DAYS: i64 = 3650;

/// A machine kind in one spelling: trimmed, lower case, single spaces (`Scissor  Lift` ->
/// `scissor lift`), so the fleet list's kind filter finds every machine of a kind.
pub fn normalise_kind(kind: &str) -> String {
    kind.split_whitespace()
        .collect::<Vec<_>>()
        .join(" ")
        .to_lowercase()
}

/// Reads a machine over `base`; returns the merged fields and the `archived` flag if given,
/// or every problem found.
pub fn read(
    map: &Map<String, Value>,
    base: MachineFields,
) -> Result<(MachineFields, Option<bool>), Vec<AppError>> {
    let f = Fields::new(map);
    let mut p = Problems::default();
    let mut m = base;
    let latest = Some(latest_past());
    p.take(f.deny_unknown(FIELDS));
    if touched(map, "unit_number")
        && let Some(v) = p.take(
            required_text(&f, "unit_number", 40)
                .and_then(|v| super::draft::name(&f, "unit_number", &v)),
        )
    {
        m.unit_number = v;
    }
    if touched(map, "site_id")
        && let Some(v) = p.take(id(&f, "site_id"))
    {
        m.site_id = v;
    }
    if touched(map, "kind")
        && let Some(v) = p.take(required_text(&f, "kind", 60))
    {
        m.kind = normalise_kind(&v);
    }
    if touched(map, "description")
        && let Some(v) = p.take(text(&f, "description", 200))
    {
        m.description = v;
    }
    if touched(map, "serial")
        && let Some(v) = p.take(
            text(&f, "serial", 80)
                .and_then(|v| v.map(|v| super::draft::name(&f, "serial", &v)).transpose()),
        )
    {
        m.serial = v;
    }
    if touched(map, "status")
        && let Some(v) = p.take(f.choice("status", STATUSES))
    {
        m.status = v.to_string();
    }
    if touched(map, "out_of_service_reason")
        && let Some(v) = p.take(text(&f, "out_of_service_reason", 500))
    {
        m.out_of_service_reason = v;
    }
    if touched(map, "out_of_service_since")
        && let Some(v) = p.take(date(&f, "out_of_service_since", latest))
    {
        m.out_of_service_since = v;
    }
    if touched(map, "relief_pressure")
        && let Some(v) = p.take(positive(&f, "relief_pressure", Dimension::Pressure))
    {
        m.relief_pressure_pa = v;
    }
    if touched(map, "hour_meter")
        && let Some(v) = p.take(super::plausible::hours(&f, "hour_meter"))
    {
        if v != m.hour_meter_h && !touched(map, "hour_meter_read_on") {
            m.hour_meter_read_on = v.map(|_| super::draft::date_text(today()));
        }
        m.hour_meter_h = v;
    }
    if touched(map, "hour_meter_read_on")
        && let Some(v) = p.take(date(&f, "hour_meter_read_on", latest))
    {
        m.hour_meter_read_on = v;
    }
    if touched(map, "periodic_interval_days")
        && let Some(v) = p.take(f.opt_integer("periodic_interval_days", 1, MAX_INTERVAL_DAYS))
    {
        m.periodic_interval_days = v;
    }
    if touched(map, "periodic_interval_hours")
        && let Some(v) = p.take(f.opt_number_min("periodic_interval_hours", 1.0))
    {
        m.periodic_interval_hours = v;
    }
    if touched(map, "frequent_interval_days")
        && let Some(v) = p.take(f.opt_integer("frequent_interval_days", 1, 366))
    {
        m.frequent_interval_days = v;
    }
    let archived = p.take(f.opt_bool("archived")).flatten();
    check(map, &mut m, &mut p);
    p.finish((m, archived))
}

/// Checks the merged record as a whole.
fn check(map: &Map<String, Value>, m: &mut MachineFields, p: &mut Problems) {
    if m.unit_number.is_empty() && !p.has("unit_number") {
        p.push(AppError::field(
            "unit_number",
            "required",
            "a unit number is required",
        ));
    }
    if m.kind.is_empty() && !p.has("kind") {
        p.push(AppError::field(
            "kind",
            "required",
            "the kind of machine is required (e.g. telehandler, excavator)",
        ));
    }
    if m.status == "in_service" {
        if touched(map, "out_of_service_reason") && m.out_of_service_reason.is_some() {
            p.push(AppError::field(
                "out_of_service_reason",
                "invalid",
                "a reason is kept only for a machine out of service; set status to out_of_service too",
            ));
        }
        m.out_of_service_reason = None;
        m.out_of_service_since = None;
    } else {
        if m.out_of_service_reason.is_none() && !p.has("out_of_service_reason") {
            p.push(AppError::field(
                "out_of_service_reason",
                "required",
                "say why the machine is out of service",
            ));
        }
        if m.out_of_service_since.is_none() {
            m.out_of_service_since = Some(super::draft::date_text(today()));
        }
    }
    if m.hour_meter_h.is_some() && m.hour_meter_read_on.is_none() {
        m.hour_meter_read_on = Some(super::draft::date_text(today()));
    }
    if m.hour_meter_h.is_none() && m.hour_meter_read_on.is_some() {
        if touched(map, "hour_meter_read_on") && !touched(map, "hour_meter") {
            p.push(AppError::field(
                "hour_meter_read_on",
                "invalid",
                "give the hour_meter reading with its date",
            ));
        }
        m.hour_meter_read_on = None;
    }
}
