//! Onboarding a fleet: the hose table by type and size.

use super::Op;
use super::dsl::*;

fn rating() -> S {
    object(
        vec![
            ("spec", string()),
            ("standard", string()),
            ("edition", string()),
            ("size", string()),
            ("dash", integer()),
            ("dn", integer()),
            ("max_working_pressure", reference("Quantity")),
            (
                "table_value",
                object(
                    vec![("value", number()), ("unit", string())],
                    &["value", "unit"],
                ),
            ),
            ("source", string()),
        ],
        &[
            "spec",
            "standard",
            "edition",
            "size",
            "dash",
            "max_working_pressure",
            "source",
        ],
    )
}

pub fn operations() -> Vec<Op> {
    vec![
        Op::get(
            "/api/v1/hose-ratings",
            "registry",
            "Maximum working pressure by hose type and size: a default to confirm against the layline",
        )
        .query(
            "spec",
            string(),
            "The hose type as the layline names it, e.g. SAE 100R2AT or EN 853 2SN.",
        )
        .query("size", string(), "Dash size or DN, e.g. -8 or DN12.")
        .query(
            "units",
            words(&["us", "metric"]),
            "Display units of the answer's quantities.",
        )
        .ok(
            200,
            "The table's rows that match (every row without parameters), each with its standard, edition and source.",
            object(
                vec![
                    ("items", array(rating())),
                    ("note", nullable(string())),
                    ("caution", string()),
                ],
                &["items", "caution"],
            ),
        ),
    ]
}
