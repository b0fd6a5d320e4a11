//! The answers of the shop routes: stored tests, inspections, procedures.

use super::dsl::*;

fn amendments() -> Vec<(&'static str, S)> {
    vec![
        ("client_token", nullable(string())),
        ("amends", nullable(integer())),
        ("amended_by", nullable(integer())),
        ("in_force", boolean()),
        ("created_at", string()),
        ("created_by", nullable(string())),
    ]
}

fn test_record(analysis: &str, extra: Vec<(&'static str, S)>) -> S {
    let mut props = vec![
        ("id", integer()),
        ("cylinder_id", integer()),
        ("procedure_id", nullable(integer())),
        ("tested_at", string()),
        ("technician", string()),
        ("readings", object(vec![], &[])),
        ("analysis", reference(analysis)),
        ("calc_version", string()),
        ("verdict", string()),
        ("diagnosis", string()),
        ("flags", array(string())),
        ("notes", nullable(string())),
    ];
    props.extend(extra);
    props.extend(amendments());
    object(
        props,
        &[
            "id",
            "cylinder_id",
            "tested_at",
            "technician",
            "analysis",
            "verdict",
        ],
    )
}

pub fn schemas() -> Vec<(&'static str, S)> {
    let limit_out = |amount: &'static str| {
        nullable(object(
            vec![(amount, opt_quantity()), ("per", opt_quantity())],
            &["per"],
        ))
    };
    vec![
        (
            "DriftTest",
            test_record("DriftReport", vec![("ambient_temperature", opt_quantity())]),
        ),
        ("DecayTest", test_record("DecayReport", vec![])),
        (
            "Inspection",
            object(
                [
                    vec![
                        ("id", integer()),
                        ("machine_id", integer()),
                        ("kind", words(&["periodic", "frequent"])),
                        ("performed_on", string()),
                        ("hour_meter", nullable(number())),
                        ("hour_meter_replaced", boolean()),
                        ("inspector", string()),
                        ("result", words(&["pass", "pass_with_deficiencies", "fail"])),
                        (
                            "items",
                            array(object(
                                vec![
                                    ("item", string()),
                                    ("outcome", string()),
                                    ("leakage_class", nullable(integer())),
                                    ("note", nullable(string())),
                                ],
                                &["item", "outcome"],
                            )),
                        ),
                        ("deficiencies", nullable(string())),
                        ("corrective_action", nullable(string())),
                    ],
                    amendments(),
                ]
                .concat(),
                &[
                    "id",
                    "machine_id",
                    "kind",
                    "performed_on",
                    "inspector",
                    "result",
                ],
            ),
        ),
        (
            "Procedure",
            object(
                vec![
                    ("id", integer()),
                    ("kind", words(&["drift", "decay"])),
                    ("name", string()),
                    ("cylinder_id", nullable(integer())),
                    ("machine_kind", nullable(string())),
                    ("hold_load", nullable(string())),
                    ("posture", nullable(string())),
                    ("measure_at", nullable(string())),
                    ("oil_temperature_min", opt_quantity()),
                    ("oil_temperature_max", opt_quantity()),
                    ("duration", quantity()),
                    ("limit", limit_out("distance")),
                    (
                        "limit_table",
                        array(object(vec![("from", quantity()), ("per", quantity())], &[])),
                    ),
                    ("oil_expansion", opt_quantity()),
                    ("notes", nullable(string())),
                    ("created_at", string()),
                    ("created_by", nullable(string())),
                    ("updated_at", string()),
                    ("archived", boolean()),
                    ("archived_at", nullable(string())),
                    ("units", words(&["us", "metric"])),
                ],
                &["id", "kind", "name", "duration"],
            ),
        ),
    ]
}
