//! The calculation endpoints: `/api/v1/calc/*` (no login, nothing stored).

use super::Op;
use super::dsl::*;
use crate::calc::quantity::Dimension as D;

/// Fields of a cylinder calculation request.
pub const CYLINDER: &[&str] = &[
    "bore",
    "rod",
    "stroke",
    "position",
    "load",
    "min_load",
    "load_direction",
    "bulk_modulus",
    "oil_expansion",
    "supply_pressure",
    "flow",
    "cap_line_volume",
    "rod_line_volume",
    "cap_line_expansion",
    "rod_line_expansion",
    "tube_outside_diameter",
    "tube_yield",
    "tube_safety_factor",
    "tube_youngs_modulus",
    "tube_poisson_ratio",
    "temperature_rise",
    "pilot_ratio",
    "end_condition",
    "buckling_length",
    "buckling_safety_factor",
    "rod_youngs_modulus",
    "rod_poisson_ratio",
    "rod_yield",
    "ratings",
    "units",
    "holding_valve",
    "holding_valve_setting",
    "holding_valve_pilot_ratio",
    "holding_valve_pilot",
    "cap_port_centre",
    "rod_port_centre",
    "entrained_air",
];

/// The readings of a position-drift test.
pub const DRIFT: &[&str] = &[
    "duration",
    "drift",
    "start_position",
    "end_position",
    "oil_temperature_start",
    "oil_temperature_end",
    "cap_pressure_start",
    "cap_pressure_end",
    "rod_pressure_start",
    "rod_pressure_end",
    "limit",
];

/// The readings of a pressure-decay test.
pub const DECAY: &[&str] = &[
    "pressurised_end",
    "duration",
    "pressure_start",
    "pressure_end",
    "oil_temperature_start",
    "oil_temperature_end",
    "other_pressure_start",
    "other_pressure_end",
    "limit",
];

/// The request schema of any calculation field (drift and decay `limit` differ: see
/// [`decay_field`]).
pub fn field(name: &str) -> S {
    match name {
        "bore" | "rod" | "stroke" => quantity_in(D::Length, false),
        "position"
        | "tube_outside_diameter"
        | "buckling_length"
        | "start_position"
        | "end_position" => opt_quantity_in(D::Length),
        "drift" => nullable(quantity_in(D::Length, true)),
        "load" => quantity_in(D::Force, false),
        "min_load" => opt_quantity_in(D::Force),
        "load_direction" => words(&["retract", "extend"]),
        "bulk_modulus"
        | "supply_pressure"
        | "tube_yield"
        | "tube_youngs_modulus"
        | "rod_youngs_modulus"
        | "rod_yield" => opt_quantity_in(D::Pressure),
        // Gauge readings: a vacuum is a reading (down to -1 atm, -101325 Pa; the server
        // refuses below that, naming the field).
        "cap_pressure_start"
        | "cap_pressure_end"
        | "rod_pressure_start"
        | "rod_pressure_end"
        | "other_pressure_start"
        | "other_pressure_end" => nullable(quantity_in(D::Pressure, true)),
        "pressure_start" | "pressure_end" => quantity_in(D::Pressure, true),
        "oil_expansion" => opt_quantity_in(D::Expansion),
        "flow" => opt_quantity_in(D::Flow),
        "cap_line_volume" | "rod_line_volume" => opt_quantity_in(D::Volume),
        "cap_line_expansion" | "rod_line_expansion" => opt_quantity_in(D::Compliance),
        "tube_safety_factor" | "pilot_ratio" | "buckling_safety_factor" => nullable(number()),
        "tube_poisson_ratio" | "rod_poisson_ratio" => nullable(number_range(0.0, 0.499)),
        "temperature_rise" => nullable(quantity_in(D::TemperatureChange, true)),
        "end_condition" => nullable(words(&[
            "fixed_free",
            "pinned_pinned",
            "fixed_pinned",
            "fixed_fixed",
        ])),
        "ratings" => nullable(closed(
            vec![
                ("cap_line", opt_quantity_in(D::Pressure)),
                ("rod_line", opt_quantity_in(D::Pressure)),
                ("cylinder", opt_quantity_in(D::Pressure)),
                (
                    "hoses",
                    nullable(array(closed(
                        vec![
                            ("label", required_text(2000)),
                            ("port", words(&["cap", "rod"])),
                            ("rating", quantity_in(D::Pressure, false)),
                        ],
                        &["label", "port", "rating"],
                    ))),
                ),
            ],
            &[],
        )),
        "units" => nullable(words(&["us", "metric"])),
        "duration" => quantity_in(D::Time, false),
        "oil_temperature_start" | "oil_temperature_end" => quantity_in(D::Temperature, true),
        "limit" => nullable(closed(
            vec![
                ("distance", quantity_in(D::Length, false)),
                ("per", quantity_in(D::Time, false)),
            ],
            &["distance", "per"],
        )),
        "pressurised_end" => words(&["cap", "rod"]),
        "holding_valve" => nullable(words(&["none", "counterbalance", "pilot_check"])),
        "holding_valve_setting" => opt_quantity_in(D::Pressure),
        "holding_valve_pilot_ratio" => nullable(number()),
        "holding_valve_pilot" => nullable(words(&["other_port", "external"])),
        "cap_port_centre" | "rod_port_centre" => nullable(words(&["blocked", "open_to_tank"])),
        "entrained_air" => nullable(number_range(0.0, 0.5)),
        _ => any(),
    }
}

/// As [`field`], with the decay test's `limit: {pressure, per}`.
pub fn decay_field(name: &str) -> S {
    match name {
        "limit" => nullable(closed(
            vec![
                ("pressure", quantity_in(D::Pressure, false)),
                ("per", quantity_in(D::Time, false)),
            ],
            &["pressure", "per"],
        )),
        other => field(other),
    }
}

const CYLINDER_REQUIRED: &[&str] = &["bore", "rod", "stroke", "load", "load_direction"];

fn request(names: &[&[&'static str]], lookup: fn(&str) -> S, required: &[&str]) -> S {
    let all: Vec<&'static str> = names.iter().flat_map(|n| n.iter().copied()).collect();
    closed(pick(&all, lookup), required)
}

pub fn operations() -> Vec<Op> {
    let drift_required: Vec<&str> = CYLINDER_REQUIRED
        .iter()
        .chain(&["duration", "oil_temperature_start", "oil_temperature_end"])
        .copied()
        .collect();
    let decay_required: Vec<&str> = CYLINDER_REQUIRED
        .iter()
        .chain(&[
            "pressurised_end",
            "duration",
            "pressure_start",
            "pressure_end",
            "oil_temperature_start",
            "oil_temperature_end",
        ])
        .copied()
        .collect();
    vec![
        Op::post(
            "/api/v1/calc/cylinder",
            "calc",
            "Areas, holding pressures, piston seal bypass, rod-side intensification, speeds, ratings checks",
        )
        .public()
        .body(request(&[CYLINDER], field, CYLINDER_REQUIRED))
        .ok(200, "The cylinder's analysis.", reference("CylinderReport")),
        Op::post(
            "/api/v1/calc/drift-test",
            "calc",
            "A position-drift test's verdict, diagnosis, reasoning and hazards",
        )
        .public()
        .body(request(&[CYLINDER, DRIFT], field, &drift_required))
        .ok(200, "The drift test's analysis.", reference("DriftReport")),
        Op::post(
            "/api/v1/calc/pressure-decay",
            "calc",
            "A pressure-decay test at the end of stroke",
        )
        .public()
        .body(request(&[CYLINDER, DECAY], decay_field, &decay_required))
        .ok(200, "The decay test's analysis.", reference("DecayReport")),
    ]
}
