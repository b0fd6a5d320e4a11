//! The answers of the registry routes: sites, machines, cylinders and hose assemblies.

use super::dsl::*;

fn stamps() -> Vec<(&'static str, S)> {
    vec![
        ("created_at", string()),
        ("updated_at", string()),
        ("archived", boolean()),
        ("archived_at", nullable(string())),
    ]
}

fn record(mut props: Vec<(&'static str, S)>, required: &[&str]) -> S {
    props.extend(stamps());
    object(props, required)
}

pub fn schemas() -> Vec<(&'static str, S)> {
    let ostr = || nullable(string());
    let oint = || nullable(integer());
    let onum = || nullable(number());
    vec![
        (
            "Site",
            record(
                vec![
                    ("id", integer()),
                    ("name", string()),
                    ("units", words(&["us", "metric"])),
                    ("machine_count", integer()),
                    ("trapped_oil_warming", opt_quantity()),
                    ("trapped_oil_warming_used", quantity()),
                    ("trapped_oil_warming_basis", words(&["recorded", "default"])),
                    ("trapped_oil_warming_reason", string()),
                ],
                &["id", "name", "units"],
            ),
        ),
        (
            "Machine",
            record(
                vec![
                    ("id", integer()),
                    ("unit_number", string()),
                    ("site_id", oint()),
                    ("site_name", ostr()),
                    ("kind", string()),
                    ("description", ostr()),
                    ("serial", ostr()),
                    ("status", words(&["in_service", "out_of_service"])),
                    ("out_of_service_reason", ostr()),
                    ("out_of_service_since", ostr()),
                    ("relief_pressure", opt_quantity()),
                    ("hour_meter", onum()),
                    ("hour_meter_read_on", ostr()),
                    ("periodic_interval_days", oint()),
                    ("periodic_interval_hours", onum()),
                    ("frequent_interval_days", oint()),
                    ("cylinder_count", integer()),
                    ("hose_count", integer()),
                    ("units", words(&["us", "metric"])),
                ],
                &[
                    "id",
                    "unit_number",
                    "site_id",
                    "kind",
                    "status",
                    "relief_pressure",
                    "hour_meter",
                ],
            ),
        ),
        (
            "Cylinder",
            record(
                vec![
                    ("id", integer()),
                    ("machine_id", integer()),
                    ("unit_number", ostr()),
                    ("function", ostr()),
                    ("bore", quantity()),
                    ("rod", quantity()),
                    ("stroke", quantity()),
                    ("load_direction", words(&["retract", "extend"])),
                    ("max_load", opt_quantity()),
                    ("min_load", opt_quantity()),
                    ("holding_pressure", opt_quantity()),
                    ("rated_pressure", opt_quantity()),
                    ("tube_outside_diameter", opt_quantity()),
                    ("tube_yield", opt_quantity()),
                    ("end_condition", ostr()),
                    ("buckling_length", opt_quantity()),
                    ("rod_yield", opt_quantity()),
                    ("serial", ostr()),
                    ("notes", ostr()),
                    ("drift_test_interval_days", oint()),
                    ("hose_count", integer()),
                    ("holding_valve", ostr()),
                    ("holding_valve_setting", opt_quantity()),
                    ("holding_valve_pilot_ratio", onum()),
                    ("holding_valve_pilot", ostr()),
                    ("cap_port_centre", ostr()),
                    ("rod_port_centre", ostr()),
                    ("units", words(&["us", "metric"])),
                ],
                &[
                    "id",
                    "machine_id",
                    "bore",
                    "rod",
                    "stroke",
                    "load_direction",
                ],
            ),
        ),
        (
            "Hose",
            record(
                vec![
                    ("id", integer()),
                    ("machine_id", integer()),
                    ("unit_number", ostr()),
                    ("cylinder_id", oint()),
                    ("cylinder_function", ostr()),
                    ("port", nullable(words(&["cap", "rod"]))),
                    ("circuit", ostr()),
                    ("spec", ostr()),
                    ("size", ostr()),
                    ("inside_diameter", opt_quantity()),
                    ("length", opt_quantity()),
                    ("working_pressure", opt_quantity()),
                    ("made_in", ostr()),
                    ("installed_on", ostr()),
                    ("replace_by", ostr()),
                    ("units", words(&["us", "metric"])),
                ],
                &[
                    "id",
                    "machine_id",
                    "cylinder_id",
                    "port",
                    "spec",
                    "working_pressure",
                ],
            ),
        ),
    ]
}
