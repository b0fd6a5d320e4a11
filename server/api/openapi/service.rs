//! Service status: where a machine or cylinder stands, its status history, the two-person
//! return to service, and a cylinder's safety figures (every scenario against every rating).

use super::Op;
use super::dsl::*;

fn status_word() -> S {
    words(&["in_service", "restricted", "out_of_service"])
}

fn change() -> S {
    object(
        vec![
            ("id", id()),
            ("at", string()),
            ("by", string()),
            ("machine_id", id()),
            ("cylinder_id", nullable(id())),
            ("machine_status", status_word()),
            ("cylinder_status", nullable(status_word())),
            ("decision", nullable(string())),
            ("reason", string()),
            ("restrictions", array(string())),
            ("record", any()),
            ("note", nullable(string())),
        ],
        &[
            "id",
            "at",
            "by",
            "machine_id",
            "machine_status",
            "reason",
            "record",
        ],
    )
}

fn standing(extra: Vec<(&'static str, S)>) -> S {
    let mut props = vec![
        ("status", status_word()),
        ("restrictions", array(string())),
        ("eligible_for_return", boolean()),
        ("open_causes", array(any())),
    ];
    props.extend(extra);
    object(
        props,
        &[
            "status",
            "restrictions",
            "eligible_for_return",
            "open_causes",
        ],
    )
}

pub fn operations() -> Vec<Op> {
    vec![
        Op::post(
            "/api/v1/machines/{id}/return-to-service",
            "service",
            "A manager returns a machine after a passing retest signed by another account",
        )
        .body(closed(vec![("note", required_text(2000))], &["note"]))
        .errors(&[409])
        .ok(
            200,
            "The machine's standing after the return, and the changes written.",
            standing(vec![("machine_id", id()), ("changes", array(change()))]),
        ),
        Op::get(
            "/api/v1/machines/{id}/status-history",
            "service",
            "A machine's status, open restrictions and status history",
        )
        .ok(
            200,
            "The standing and every status change, newest first.",
            standing(vec![("machine_id", id()), ("items", array(change()))]),
        ),
        Op::get(
            "/api/v1/cylinders/{id}/status-history",
            "service",
            "A cylinder's status, open restrictions and status history",
        )
        .ok(
            200,
            "The standing and every status change of the cylinder, newest first.",
            standing(vec![
                ("cylinder_id", id()),
                ("machine_id", id()),
                ("items", array(change())),
            ]),
        ),
        Op::get(
            "/api/v1/cylinders/{id}/safety",
            "service",
            "Every scenario against every rating, with status, decision and cautions",
        )
        .query(
            "units",
            words(&["us", "metric"]),
            "Display units of the answer's quantities.",
        )
        .errors(&[409])
        .ok(
            200,
            "The cylinder's safety figures.",
            object(
                vec![
                    ("cylinder_id", id()),
                    ("machine_id", id()),
                    ("scenarios", array(any())),
                    ("ratings", array(any())),
                    ("checks", array(any())),
                    ("worst", any()),
                    (
                        "decision",
                        words(&["fit_for_service", "restricted", "remove_from_service"]),
                    ),
                    ("reasons", array(string())),
                    ("restrictions", array(string())),
                    ("hazards", array(string())),
                    ("cautions", array(string())),
                    ("service", any()),
                ],
                &["cylinder_id", "checks", "decision", "reasons", "cautions"],
            ),
        ),
    ]
}
