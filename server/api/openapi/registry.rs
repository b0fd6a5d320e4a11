//! The fleet registry: sites, machines, cylinders, hose assemblies.

use super::Op;
use super::dsl::*;
use crate::calc::quantity::Dimension as D;

fn units() -> S {
    nullable(words(&["us", "metric"]))
}

fn opt_text(max: usize) -> S {
    nullable(text(max))
}

fn opt_int(min: i64, max: i64) -> S {
    nullable(int_range(min, max))
}

fn opt_date() -> S {
    nullable(date())
}

fn units_param(op: Op) -> Op {
    op.query(
        "units",
        words(&["us", "metric"]),
        "Display units of the answer's quantities.",
    )
}

fn paging(op: Op) -> Op {
    op.query("limit", int_range(1, 200), "Page size (default 50).")
        .query(
            "cursor",
            int_range(0, i64::MAX),
            "The next_cursor of the page before.",
        )
        .query("archived", flag(), "Include archived records.")
}

/// `true`/`false` (also `1`/`0`, `yes`/`no`, `on`/`off`).
pub fn flag() -> S {
    words(&["true", "false", "1", "0", "yes", "no", "on", "off"])
}

pub fn site_field(name: &str) -> S {
    match name {
        "name" => required_text(120),
        "units" => words(&["us", "metric"]),
        "archived" => nullable(boolean()),
        "trapped_oil_warming" => nullable(quantity_in(D::TemperatureChange, false)),
        _ => any(),
    }
}

pub const SITE: &[&str] = &["name", "units", "archived", "trapped_oil_warming"];

pub const MACHINE: &[&str] = &[
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

pub fn machine_field(name: &str) -> S {
    match name {
        "unit_number" => required_text(40),
        "kind" => required_text(60),
        "site_id" => nullable(id()),
        "description" => opt_text(200),
        "serial" => opt_text(80),
        "status" => words(&["in_service", "out_of_service"]),
        "out_of_service_reason" => opt_text(500),
        "out_of_service_since" | "hour_meter_read_on" => opt_date(),
        "relief_pressure" => opt_quantity_in(D::Pressure),
        "hour_meter" => nullable(number_range(0.0, 500_000.0)),
        "periodic_interval_days" => opt_int(1, 3650),
        "periodic_interval_hours" => nullable(number_range(1.0, 1e12)),
        "frequent_interval_days" => opt_int(1, 366),
        "archived" => nullable(boolean()),
        "units" => units(),
        _ => any(),
    }
}

pub const CYLINDER: &[&str] = &[
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
    "holding_valve",
    "holding_valve_setting",
    "holding_valve_pilot_ratio",
    "holding_valve_pilot",
    "cap_port_centre",
    "rod_port_centre",
];

pub fn cylinder_field(name: &str) -> S {
    match name {
        "machine_id" => id(),
        "function" => opt_text(120),
        "bore" | "rod" | "stroke" => quantity_in(D::Length, false),
        "load_direction" => words(&["retract", "extend"]),
        "max_load" | "min_load" => opt_quantity_in(D::Force),
        "holding_pressure" | "rated_pressure" | "tube_yield" | "rod_yield" => {
            opt_quantity_in(D::Pressure)
        }
        "tube_outside_diameter" | "buckling_length" => opt_quantity_in(D::Length),
        "end_condition" => nullable(words(&[
            "fixed_free",
            "pinned_pinned",
            "fixed_pinned",
            "fixed_fixed",
        ])),
        "serial" => opt_text(80),
        "notes" => opt_text(2000),
        "drift_test_interval_days" => opt_int(1, 3650),
        "archived" => nullable(boolean()),
        "units" => units(),
        "holding_valve" => nullable(words(&["counterbalance", "pilot_check"])),
        "holding_valve_setting" => opt_quantity_in(D::Pressure),
        "holding_valve_pilot_ratio" => nullable(number_range(0.1, 1e12)),
        "holding_valve_pilot" => nullable(words(&["other_port", "external"])),
        "cap_port_centre" | "rod_port_centre" => nullable(words(&["blocked", "open_to_tank"])),
        _ => any(),
    }
}

pub const HOSE: &[&str] = &[
    "machine_id",
    "cylinder_id",
    "port",
    "circuit",
    "spec",
    "size",
    "inside_diameter",
    "length",
    "working_pressure",
    "made_in",
    "installed_on",
    "replace_by",
    "archived",
    "units",
];

pub fn hose_field(name: &str) -> S {
    match name {
        "machine_id" | "cylinder_id" => nullable(id()),
        "port" => nullable(words(&["cap", "rod"])),
        "circuit" => opt_text(120),
        "spec" => opt_text(80),
        "size" => opt_text(20),
        "inside_diameter" | "length" => opt_quantity_in(D::Length),
        "working_pressure" => opt_quantity_in(D::Pressure),
        "made_in" => nullable(
            utoipa::openapi::schema::ObjectBuilder::new()
                .schema_type(utoipa::openapi::schema::Type::String)
                .pattern(Some(r"^\s*[0-9]{4}-[Qq][1-4]\s*$"))
                .into(),
        ),
        "installed_on" | "replace_by" => opt_date(),
        "archived" => nullable(boolean()),
        "units" => units(),
        _ => any(),
    }
}

/// A create body: the listed fields, `required` among them.
fn create_body(fields: &[&'static str], lookup: fn(&str) -> S, required: &[&str]) -> S {
    closed(pick(fields, lookup), required)
}

pub fn operations() -> Vec<Op> {
    vec![
        // sites
        paging(Op::get("/api/v1/sites", "registry", "List sites")).ok(
            200,
            "A page of sites.",
            page(reference("Site")),
        ),
        Op::post("/api/v1/sites", "registry", "Register a site")
            .body(create_body(SITE, site_field, &["name"]))
            .errors(&[409])
            .ok(201, "The new site.", reference("Site")),
        Op::get("/api/v1/sites/{id}", "registry", "One site").ok(
            200,
            "The site.",
            reference("Site"),
        ),
        Op::patch(
            "/api/v1/sites/{id}",
            "registry",
            "Change a site (only the fields sent)",
        )
        .body(create_body(SITE, site_field, &[]))
        .errors(&[409])
        .ok(200, "The site as changed.", reference("Site")),
        // machines
        units_param(paging(Op::get(
            "/api/v1/machines",
            "registry",
            "List machines",
        )))
        .query("site", id(), "Only this site's machines.")
        .query(
            "status",
            words(&["in_service", "out_of_service"]),
            "Only machines in this status.",
        )
        .query("kind", string(), "Only machines of this kind.")
        .query("q", string(), "Search unit number, description, serial.")
        .ok(200, "A page of machines.", page(reference("Machine"))),
        units_param(Op::post(
            "/api/v1/machines",
            "registry",
            "Register a machine",
        ))
        .body(create_body(
            MACHINE,
            machine_field,
            &["unit_number", "kind"],
        ))
        .errors(&[409])
        .ok(201, "The new machine.", reference("Machine")),
        units_param(Op::get("/api/v1/machines/{id}", "registry", "One machine")).ok(
            200,
            "The machine.",
            reference("Machine"),
        ),
        units_param(Op::patch(
            "/api/v1/machines/{id}",
            "registry",
            "Change a machine (only the fields sent)",
        ))
        .body(create_body(MACHINE, machine_field, &[]))
        .errors(&[409])
        .ok(200, "The machine as changed.", reference("Machine")),
        units_param(Op::delete(
            "/api/v1/machines/{id}",
            "registry",
            "Archive a machine (never deleted)",
        ))
        .errors(&[409])
        .ok(200, "The archived machine.", reference("Machine")),
        units_param(Op::post(
            "/api/v1/machines/{id}/archive",
            "registry",
            "Archive a machine (never deleted)",
        ))
        .errors(&[409])
        .ok(200, "The archived machine.", reference("Machine")),
        units_param(paging(Op::get(
            "/api/v1/machines/{id}/cylinders",
            "registry",
            "A machine's cylinders",
        )))
        .query("q", string(), "Search function and serial.")
        .ok(200, "A page of cylinders.", page(reference("Cylinder"))),
        units_param(paging(Op::get(
            "/api/v1/machines/{id}/hoses",
            "registry",
            "A machine's hoses",
        )))
        .query("q", string(), "Search spec, size, circuit.")
        .ok(200, "A page of hoses.", page(reference("Hose"))),
        // cylinders
        units_param(paging(Op::get(
            "/api/v1/cylinders",
            "registry",
            "List cylinders",
        )))
        .query("machine", id(), "Only this machine's cylinders.")
        .query("site", id(), "Only cylinders at this site.")
        .query("q", string(), "Search function and serial.")
        .ok(200, "A page of cylinders.", page(reference("Cylinder"))),
        units_param(Op::post(
            "/api/v1/cylinders",
            "registry",
            "Register a cylinder",
        ))
        .body(create_body(
            CYLINDER,
            cylinder_field,
            &["machine_id", "bore", "rod", "stroke", "load_direction"],
        ))
        .errors(&[409])
        .ok(201, "The new cylinder.", reference("Cylinder")),
        units_param(Op::get(
            "/api/v1/cylinders/{id}",
            "registry",
            "One cylinder",
        ))
        .ok(200, "The cylinder.", reference("Cylinder")),
        units_param(Op::patch(
            "/api/v1/cylinders/{id}",
            "registry",
            "Change a cylinder (only the fields sent)",
        ))
        .body(create_body(CYLINDER, cylinder_field, &[]))
        .errors(&[409])
        .ok(200, "The cylinder as changed.", reference("Cylinder")),
        units_param(Op::delete(
            "/api/v1/cylinders/{id}",
            "registry",
            "Archive a cylinder (never deleted)",
        ))
        .errors(&[409])
        .ok(200, "The archived cylinder.", reference("Cylinder")),
        units_param(Op::post(
            "/api/v1/cylinders/{id}/archive",
            "registry",
            "Archive a cylinder (never deleted)",
        ))
        .errors(&[409])
        .ok(200, "The archived cylinder.", reference("Cylinder")),
        // hoses
        units_param(paging(Op::get(
            "/api/v1/hoses",
            "registry",
            "List hose assemblies",
        )))
        .query("machine", id(), "Only this machine's hoses.")
        .query("cylinder", id(), "Only this cylinder's hoses.")
        .query("site", id(), "Only hoses at this site.")
        .query("q", string(), "Search spec, size, circuit.")
        .ok(200, "A page of hoses.", page(reference("Hose"))),
        units_param(Op::post(
            "/api/v1/hoses",
            "registry",
            "Register a hose assembly",
        ))
        .body(create_body(HOSE, hose_field, &[]))
        .errors(&[409])
        .ok(201, "The new hose assembly.", reference("Hose")),
        units_param(Op::get(
            "/api/v1/hoses/{id}",
            "registry",
            "One hose assembly",
        ))
        .ok(200, "The hose assembly.", reference("Hose")),
        units_param(Op::patch(
            "/api/v1/hoses/{id}",
            "registry",
            "Change a hose assembly (only the fields sent)",
        ))
        .body(create_body(HOSE, hose_field, &[]))
        .errors(&[409])
        .ok(200, "The hose assembly as changed.", reference("Hose")),
        units_param(Op::delete(
            "/api/v1/hoses/{id}",
            "registry",
            "Archive a hose assembly (never deleted)",
        ))
        .errors(&[409])
        .ok(200, "The archived hose assembly.", reference("Hose")),
        units_param(Op::post(
            "/api/v1/hoses/{id}/archive",
            "registry",
            "Archive a hose assembly (never deleted)",
        ))
        .errors(&[409])
        .ok(200, "The archived hose assembly.", reference("Hose")),
    ]
}
