//! Reading a cylinder from a JSON object over a base record; the merged geometry is checked
//! as a whole (a new rod against the stored bore).

use super::cylinder_valves_draft;
use super::draft::{Problems, id, positive, required_positive, text, touched};
use super::input::Fields;
use super::machine_draft::MAX_INTERVAL_DAYS;
use crate::calc::quantity::{self, Dimension, UnitSystem};
use crate::db::cylinder_valves::ValveFields;
use crate::db::cylinders::CylinderFields;
use crate::error::AppError;
use serde_json::{Map, Value};

/// Fields a cylinder body may carry (`units` picks the display units of the answer).
pub const FIELDS: &[&str] = &[
    "machine_id",
    "function",
    "bore",
    "rod",
    "stroke",
    "load_direction",
    "max_load",
    "min_load",
    "holding_pressure",
    "rated_pressure",
    "tube_outside_diameter",
    "tube_yield",
    "end_condition",
    "buckling_length",
    "rod_yield",
    "serial",
    "notes",
    "drift_test_interval_days",
    "archived",
    "units",
    // The valves (api::cylinder_valves_draft).
    "holding_valve",
    "holding_valve_setting",
    "holding_valve_pilot_ratio",
    "holding_valve_pilot",
    "cap_port_centre",
    "rod_port_centre",
];

/// `retract`: the load pushes the rod in (held by the cap end); `extend`: it pulls it out.
pub const LOAD_DIRECTIONS: &[&str] = &["retract", "extend"];

/// Buckling end conditions (effective-length factor 2, 1, 0.7, 0.5).
pub const END_CONDITIONS: &[&str] = &["fixed_free", "pinned_pinned", "fixed_pinned", "fixed_fixed"];

/// Largest bore or stroke accepted, m: a sanity limit that catches a wrong unit.
const MAX_SIZE: f64 = 20.0;

/// A cylinder being read: the required parts may still be missing.
#[derive(Clone, Debug, Default, PartialEq)]
pub struct Draft {
    pub machine_id: Option<i64>,
    pub function: Option<String>,
    pub bore_m: Option<f64>,
    pub rod_m: Option<f64>,
    pub stroke_m: Option<f64>,
    pub load_direction: Option<String>,
    pub max_load_n: Option<f64>,
    pub min_load_n: Option<f64>,
    pub holding_pressure_pa: Option<f64>,
    pub rated_pressure_pa: Option<f64>,
    pub tube_outside_diameter_m: Option<f64>,
    pub tube_yield_pa: Option<f64>,
    pub end_condition: Option<String>,
    pub buckling_length_m: Option<f64>,
    pub rod_yield_pa: Option<f64>,
    pub serial: Option<String>,
    pub notes: Option<String>,
    pub drift_test_interval_days: Option<i64>,
    pub valves: ValveFields,
}

impl From<CylinderFields> for Draft {
    fn from(c: CylinderFields) -> Self {
        Draft {
            machine_id: Some(c.machine_id),
            function: c.function,
            bore_m: Some(c.bore_m),
            rod_m: Some(c.rod_m),
            stroke_m: Some(c.stroke_m),
            load_direction: Some(c.load_direction),
            max_load_n: c.max_load_n,
            min_load_n: c.min_load_n,
            holding_pressure_pa: c.holding_pressure_pa,
            rated_pressure_pa: c.rated_pressure_pa,
            tube_outside_diameter_m: c.tube_outside_diameter_m,
            tube_yield_pa: c.tube_yield_pa,
            end_condition: c.end_condition,
            buckling_length_m: c.buckling_length_m,
            rod_yield_pa: c.rod_yield_pa,
            serial: c.serial,
            notes: c.notes,
            drift_test_interval_days: c.drift_test_interval_days,
            valves: c.valves,
        }
    }
}

fn size(f: &Fields, p: &mut Problems, name: &str) -> Option<f64> {
    let value = p.take(required_positive(f, name, Dimension::Length))?;
    if value > MAX_SIZE {
        p.push(AppError::field(
            name,
            "out_of_range",
            format!(
                "{} is larger than any cylinder; check the unit",
                quantity::format(value, Dimension::Length, UnitSystem::Metric)
            ),
        ));
        return None;
    }
    Some(value)
}

/// Reads a cylinder over `base`; returns the merged fields and the `archived` flag if given,
/// or every problem found.
pub fn read(
    map: &Map<String, Value>,
    base: Draft,
) -> Result<(CylinderFields, Option<bool>), Vec<AppError>> {
    let f = Fields::new(map);
    let mut p = Problems::default();
    let mut c = base;
    p.take(f.deny_unknown(FIELDS));
    if touched(map, "machine_id")
        && let Some(v) = p.take(id(&f, "machine_id"))
    {
        c.machine_id = v;
    }
    if touched(map, "function")
        && let Some(v) = p.take(text(&f, "function", 120))
    {
        c.function = v;
    }
    for (name, slot) in [
        ("bore", &mut c.bore_m),
        ("rod", &mut c.rod_m),
        ("stroke", &mut c.stroke_m),
    ] {
        if touched(map, name) {
            *slot = size(&f, &mut p, name);
        }
    }
    if touched(map, "load_direction")
        && let Some(v) = p.take(f.choice("load_direction", LOAD_DIRECTIONS))
    {
        c.load_direction = Some(v.to_string());
    }
    if touched(map, "max_load")
        && let Some(v) = p.take(f.opt_quantity("max_load", Dimension::Force))
    {
        c.max_load_n = v;
    }
    if touched(map, "min_load")
        && let Some(v) = p.take(f.opt_quantity("min_load", Dimension::Force))
    {
        c.min_load_n = v;
    }
    for (name, dimension, slot) in [
        (
            "holding_pressure",
            Dimension::Pressure,
            &mut c.holding_pressure_pa,
        ),
        (
            "rated_pressure",
            Dimension::Pressure,
            &mut c.rated_pressure_pa,
        ),
        (
            "tube_outside_diameter",
            Dimension::Length,
            &mut c.tube_outside_diameter_m,
        ),
        ("tube_yield", Dimension::Pressure, &mut c.tube_yield_pa),
        (
            "buckling_length",
            Dimension::Length,
            &mut c.buckling_length_m,
        ),
        ("rod_yield", Dimension::Pressure, &mut c.rod_yield_pa),
    ] {
        if touched(map, name)
            && let Some(v) = p.take(positive(&f, name, dimension))
        {
            *slot = v;
        }
    }
    if touched(map, "end_condition")
        && let Some(v) = p.take(f.opt_choice("end_condition", END_CONDITIONS))
    {
        c.end_condition = v.map(str::to_string);
    }
    if touched(map, "serial")
        && let Some(v) = p.take(text(&f, "serial", 80))
    {
        c.serial = v;
    }
    if touched(map, "notes")
        && let Some(v) = p.take(text(&f, "notes", 2000))
    {
        c.notes = v;
    }
    if touched(map, "drift_test_interval_days")
        && let Some(v) = p.take(f.opt_integer("drift_test_interval_days", 1, MAX_INTERVAL_DAYS))
    {
        c.drift_test_interval_days = v;
    }
    cylinder_valves_draft::read(map, &f, &mut p, &mut c.valves);
    let archived = p.take(f.opt_bool("archived")).flatten();
    let fields = finish(c, &mut p);
    match fields {
        Some(fields) if p.is_empty() => Ok((fields, archived)),
        _ => Err(p.0),
    }
}

fn missing(p: &mut Problems, name: &str, what: &str) {
    if !p.has(name) {
        p.push(AppError::field(
            name,
            "required",
            format!("{what} is required"),
        ));
    }
}

/// Checks the merged cylinder: required parts present, rod smaller than bore, sizes the
/// engineering core accepts, tube outside diameter larger than the bore.
fn finish(c: Draft, p: &mut Problems) -> Option<CylinderFields> {
    if c.machine_id.is_none() {
        missing(
            p,
            "machine_id",
            "the machine the cylinder is on (machine_id)",
        );
    }
    if c.bore_m.is_none() {
        missing(p, "bore", "the bore, such as \"4 in\" or \"100 mm\",");
    }
    if c.rod_m.is_none() {
        missing(p, "rod", "the rod diameter, such as \"2 in\" or \"56 mm\",");
    }
    if c.stroke_m.is_none() {
        missing(p, "stroke", "the stroke, such as \"24 in\" or \"600 mm\",");
    }
    if c.load_direction.is_none() {
        missing(
            p,
            "load_direction",
            "which way the held load acts (retract: pushes the rod in; extend: pulls it out)",
        );
    }
    if let (Some(bore), Some(rod)) = (c.bore_m, c.rod_m)
        && rod >= bore
    {
        p.push(AppError::field(
            "rod",
            "rod_not_smaller_than_bore",
            format!(
                "the rod ({}) must be smaller than the bore ({})",
                quantity::format(rod, Dimension::Length, UnitSystem::Metric),
                quantity::format(bore, Dimension::Length, UnitSystem::Metric)
            ),
        ));
    }
    // The registry keeps only cylinders the engineering core can analyse (its size limits).
    if let (Some(bore), Some(rod), Some(stroke)) = (c.bore_m, c.rod_m, c.stroke_m)
        && rod < bore
        && let Err(e) = crate::calc::cylinder::Cylinder::new(bore, rod, stroke)
    {
        p.push(AppError::field(e.field, "out_of_range", e.message));
    }
    if let Some(light) = c.min_load_n
        && light > c.max_load_n.unwrap_or(f64::INFINITY)
    {
        p.push(AppError::field(
            "min_load",
            "min_load_above_max_load",
            "the lowest load held must not be above the highest load held (max_load)",
        ));
    }
    if let Some(length) = c.buckling_length_m
        && length > MAX_SIZE
    {
        p.push(AppError::field(
            "buckling_length",
            "out_of_range",
            "the free length is longer than any cylinder; check the unit",
        ));
    }
    if let Some(y) = c.rod_yield_pa
        && y < 1e6
    {
        p.push(AppError::field(
            "rod_yield",
            "out_of_range",
            "the rod yield strength must be at least 1 MPa; check the unit",
        ));
    }
    if let (Some(bore), Some(outside)) = (c.bore_m, c.tube_outside_diameter_m)
        && outside <= bore
    {
        p.push(AppError::field(
            "tube_outside_diameter",
            "tube_not_larger_than_bore",
            "the tube's outside diameter must be larger than the bore",
        ));
    }
    cylinder_valves_draft::check(&c.valves, c.load_direction.as_deref(), p);
    Some(CylinderFields {
        machine_id: c.machine_id?,
        function: c.function,
        bore_m: c.bore_m?,
        rod_m: c.rod_m?,
        stroke_m: c.stroke_m?,
        load_direction: c.load_direction?,
        max_load_n: c.max_load_n,
        min_load_n: c.min_load_n,
        holding_pressure_pa: c.holding_pressure_pa,
        rated_pressure_pa: c.rated_pressure_pa,
        tube_outside_diameter_m: c.tube_outside_diameter_m,
        tube_yield_pa: c.tube_yield_pa,
        end_condition: c.end_condition,
        buckling_length_m: c.buckling_length_m,
        rod_yield_pa: c.rod_yield_pa,
        serial: c.serial,
        notes: c.notes,
        drift_test_interval_days: c.drift_test_interval_days,
        valves: c.valves,
    })
}
