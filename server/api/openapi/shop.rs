//! Shop records: drift tests, pressure-decay tests, inspections, and test procedures.

use super::Op;
use super::calc;
use super::dsl::*;
use super::registry::flag;
use crate::calc::quantity::Dimension as D;

/// Calculation fields a drift-test body may carry (geometry, ratings and supply come from
/// the registry).
pub const DRIFT_CALC: &[&str] = &[
    "position",
    "load",
    "load_direction",
    "oil_expansion",
    "bulk_modulus",
    "cap_line_volume",
    "rod_line_volume",
    "cap_port_centre",
    "rod_port_centre",
    "entrained_air",
    "units",
];

/// Calculation fields a decay-test body may carry.
pub const DECAY_CALC: &[&str] = &[
    "load",
    "load_direction",
    "oil_expansion",
    "bulk_modulus",
    "cap_line_volume",
    "rod_line_volume",
    "entrained_air",
    "units",
];

/// Fields of the stored record itself.
pub const RECORD: &[&str] = &[
    "tested_at",
    "technician",
    "procedure_id",
    "client_token",
    "amends",
    "notes",
    "ambient_temperature",
];

fn client_token() -> S {
    nullable(
        utoipa::openapi::schema::ObjectBuilder::new()
            .schema_type(utoipa::openapi::schema::Type::String)
            .pattern(Some(r"^\s*[A-Za-z0-9_.:-]{0,100}\s*$"))
            .into(),
    )
}

/// A record field, or a calculation field (where `load` and `load_direction` are optional:
/// the cylinder's are used when absent).
fn record_field(name: &str) -> S {
    match name {
        "tested_at" => nullable(text(64)),
        "technician" | "inspector" => required_text(120),
        "procedure_id" | "amends" => nullable(id()),
        "client_token" => client_token(),
        "notes" => nullable(text(2000)),
        "ambient_temperature" => nullable(quantity_in(D::Temperature, true)),
        "load" => opt_quantity_in(D::Force),
        "load_direction" => nullable(words(&["retract", "extend"])),
        other => calc::field(other),
    }
}

fn decay_record_field(name: &str) -> S {
    match name {
        "limit" => calc::decay_field("limit"),
        other => record_field(other),
    }
}

fn inspection_field(name: &str) -> S {
    match name {
        "kind" => words(&["periodic", "frequent"]),
        "performed_on" => date(),
        "hour_meter" => nullable(number_range(0.0, 500_000.0)),
        "hour_meter_replaced" => nullable(boolean()),
        "inspector" => required_text(120),
        "result" => words(&["pass", "pass_with_deficiencies", "fail"]),
        "items" => nullable(array_max(
            closed(
                vec![
                    ("item", required_text(60)),
                    (
                        "outcome",
                        words(&["ok", "attention", "fail", "not_checked"]),
                    ),
                    ("leakage_class", nullable(int_range(0, 5))),
                    ("note", nullable(text(500))),
                ],
                &["item", "outcome"],
            ),
            50,
        )),
        "deficiencies" | "corrective_action" => nullable(text(4000)),
        "client_token" => client_token(),
        "amends" => nullable(id()),
        _ => any(),
    }
}

pub const INSPECTION: &[&str] = &[
    "kind",
    "performed_on",
    "hour_meter",
    "inspector",
    "result",
    "items",
    "deficiencies",
    "corrective_action",
    "client_token",
    "amends",
    "hour_meter_replaced",
];

pub const PROCEDURE: &[&str] = &[
    "kind",
    "name",
    "cylinder_id",
    "machine_kind",
    "hold_load",
    "posture",
    "measure_at",
    "oil_temperature_min",
    "oil_temperature_max",
    "duration",
    "limit",
    "limit_table",
    "oil_expansion",
    "notes",
    "units",
    "archived",
];

fn procedure_field(name: &str) -> S {
    let amount = || {
        OneOf(vec![
            ("distance", quantity_in(D::Length, false)),
            ("pressure", quantity_in(D::Pressure, false)),
        ])
    };
    match name {
        "kind" => nullable(words(&["drift", "decay"])),
        "name" => required_text(200),
        "cylinder_id" => nullable(id()),
        "machine_kind" => nullable(text(100)),
        "hold_load" | "posture" | "measure_at" | "notes" => nullable(text(2000)),
        "oil_temperature_min" | "oil_temperature_max" => {
            nullable(quantity_in(D::Temperature, true))
        }
        "duration" => quantity_in(D::Time, false),
        "limit" => nullable(amount().objects(&[("per", quantity_in(D::Time, false))], &["per"])),
        "limit_table" => nullable(array_max(
            amount().objects(
                &[
                    ("from", quantity_in(D::Temperature, true)),
                    ("per", quantity_in(D::Time, false)),
                ],
                &["from", "per"],
            ),
            20,
        )),
        "oil_expansion" => opt_quantity_in(D::Expansion),
        "units" => nullable(words(&["us", "metric"])),
        "archived" => nullable(boolean()),
        _ => any(),
    }
}

/// A drift procedure's limits are distances, a decay procedure's pressure drops: one of two
/// closed objects that differ in that one field.
struct OneOf(Vec<(&'static str, S)>);

impl OneOf {
    fn objects(self, shared: &[(&'static str, S)], required: &[&'static str]) -> S {
        let mut one = utoipa::openapi::schema::OneOfBuilder::new();
        for (name, schema) in self.0 {
            let mut props = vec![(name, schema)];
            props.extend(shared.iter().cloned());
            let mut needed = required.to_vec();
            needed.push(name);
            one = one.item(closed(props, &needed));
        }
        one.into()
    }
}

fn all(lists: &[&[&'static str]]) -> Vec<&'static str> {
    lists.iter().flat_map(|l| l.iter().copied()).collect()
}

pub fn operations() -> Vec<Op> {
    let drift = all(&[calc::DRIFT, DRIFT_CALC, RECORD]);
    let decay = all(&[calc::DECAY, DECAY_CALC, RECORD]);
    vec![
        Op::get(
            "/api/v1/cylinders/{id}/drift-tests",
            "shop",
            "A cylinder's drift tests, oldest first",
        )
        .ok(
            200,
            "Every drift test of the cylinder, amended ones included.",
            page(reference("DriftTest")),
        ),
        Op::post(
            "/api/v1/cylinders/{id}/drift-tests",
            "shop",
            "Record a drift test; it is analysed on the spot",
        )
        .body(closed(
            pick(&drift, record_field),
            &[
                "duration",
                "oil_temperature_start",
                "oil_temperature_end",
                "technician",
            ],
        ))
        .errors(&[409])
        .ok(
            201,
            "The stored test with its analysis.",
            reference("DriftTest"),
        )
        .ok(
            200,
            "The test stored before under the same client_token.",
            reference("DriftTest"),
        ),
        Op::get("/api/v1/drift-tests/{id}", "shop", "One drift test").ok(
            200,
            "The drift test.",
            reference("DriftTest"),
        ),
        Op::get(
            "/api/v1/cylinders/{id}/decay-tests",
            "shop",
            "A cylinder's pressure-decay tests",
        )
        .ok(
            200,
            "Every decay test of the cylinder.",
            page(reference("DecayTest")),
        ),
        Op::post(
            "/api/v1/cylinders/{id}/decay-tests",
            "shop",
            "Record a pressure-decay test",
        )
        .body(closed(
            pick(&decay, decay_record_field),
            &[
                "pressurised_end",
                "duration",
                "pressure_start",
                "pressure_end",
                "oil_temperature_start",
                "oil_temperature_end",
                "technician",
            ],
        ))
        .errors(&[409])
        .ok(
            201,
            "The stored test with its analysis.",
            reference("DecayTest"),
        )
        .ok(
            200,
            "The test stored before under the same client_token.",
            reference("DecayTest"),
        ),
        Op::get(
            "/api/v1/decay-tests/{id}",
            "shop",
            "One pressure-decay test",
        )
        .ok(200, "The decay test.", reference("DecayTest")),
        Op::get(
            "/api/v1/machines/{id}/inspections",
            "shop",
            "A machine's inspections",
        )
        .ok(
            200,
            "Every inspection of the machine.",
            page(reference("Inspection")),
        ),
        Op::post(
            "/api/v1/machines/{id}/inspections",
            "shop",
            "Record an inspection; a fail takes the machine out of service",
        )
        .body(closed(
            pick(INSPECTION, inspection_field),
            &["kind", "performed_on", "inspector", "result"],
        ))
        .errors(&[409])
        .ok(201, "The stored inspection.", reference("Inspection"))
        .ok(
            200,
            "The inspection stored before under the same client_token.",
            reference("Inspection"),
        ),
        Op::get("/api/v1/inspections/{id}", "shop", "One inspection").ok(
            200,
            "The inspection.",
            reference("Inspection"),
        ),
        Op::get("/api/v1/procedures", "shop", "List test procedures")
            .query(
                "kind",
                words(&["drift", "decay"]),
                "Only procedures of this kind.",
            )
            .query("cylinder", id(), "Only this cylinder's own procedures.")
            .query(
                "machine_kind",
                string(),
                "Only procedures shared by this machine kind.",
            )
            .query("include_archived", flag(), "Include archived procedures.")
            .query(
                "units",
                words(&["us", "metric"]),
                "Display units of the answer's quantities.",
            )
            .ok(200, "The procedures.", page(reference("Procedure"))),
        Op::post("/api/v1/procedures", "shop", "Write down a test procedure")
            .body(closed(
                pick(PROCEDURE, procedure_field),
                &["name", "duration"],
            ))
            .errors(&[409])
            .ok(201, "The new procedure.", reference("Procedure")),
        Op::get("/api/v1/procedures/{id}", "shop", "One test procedure")
            .query(
                "units",
                words(&["us", "metric"]),
                "Display units of the answer's quantities.",
            )
            .ok(200, "The procedure.", reference("Procedure")),
        Op::patch(
            "/api/v1/procedures/{id}",
            "shop",
            "Change a procedure (only the fields sent)",
        )
        .body(closed(pick(PROCEDURE, procedure_field), &[]))
        .errors(&[409])
        .ok(200, "The procedure as changed.", reference("Procedure")),
    ]
}
