//! The manager's reports: due list, out of service, hazards, hose age; and their settings.

use super::Op;
use super::dsl::*;

fn fleet(op: Op) -> Op {
    op.query("site", id(), "Only this site (an unknown site is refused).")
        .query("kind", string(), "Only machines of this kind.")
        .csv()
        .query(
            "format",
            words(&["json", "csv"]),
            "json (default) or csv (RFC 4180, header row).",
        )
}

fn status(op: Op) -> Op {
    op.query(
        "status",
        words(&["in_service", "out_of_service"]),
        "Only machines in this status.",
    )
}

fn as_of(op: Op) -> Op {
    op.query(
        "as_of",
        date(),
        "The day the list is for (default today, UTC).",
    )
}

fn within_days(op: Op) -> Op {
    op.query(
        "within_days",
        int_range(0, 3660),
        "Look-ahead in days (default 30).",
    )
}

pub fn operations() -> Vec<Op> {
    vec![
        within_days(as_of(status(fleet(Op::get(
            "/api/v1/reports/due",
            "reports",
            "Everything overdue or due within the window, furthest overdue first",
        )))))
        .query("within_hours", number_range(0.0, 100_000.0), "Look-ahead in hour-meter hours.")
        .ok(
            200,
            "The due list (JSON, or CSV with format=csv).",
            object(vec![("items", array(reference("DueItem")))], &["items"]),
        ),
        fleet(Op::get(
            "/api/v1/reports/out-of-service",
            "reports",
            "Machines out of service: why, since when, which record",
        ))
        .ok(
            200,
            "The out-of-service list, and the machines a record restricted.",
            object(
                vec![
                    ("items", array(reference("OutOfService"))),
                    ("restricted", array(any())),
                ],
                &["items"],
            ),
        ),
        within_days(as_of(status(fleet(Op::get(
            "/api/v1/reports/hazards",
            "reports",
            "Pressures above ratings, hoses past replace-by or age, drift trends reaching their limit",
        )))))
        .query("units", words(&["us", "metric"]), "Display units of the answer's quantities.")
        .ok(200, "The hazard list with the usual cautions.", reference("Hazards")),
        as_of(status(fleet(Op::get("/api/v1/reports/hose-age", "reports", "Every hose, oldest first"))))
            .ok(
                200,
                "The hose age list.",
                object(
                    vec![
                        ("as_of", string()),
                        ("hose_age_limit_years", nullable(integer())),
                        ("items", array(reference("HoseAge"))),
                    ],
                    &["as_of", "items"],
                ),
            ),
        Op::get("/api/v1/reports/settings", "reports", "The shop's report settings")
            .ok(200, "The settings.", reference("ReportSettings")),
        Op::put("/api/v1/reports/settings", "reports", "Set the hose age limit")
            .body(closed(
                vec![("hose_age_limit_years", nullable(int_range(1, 100)))],
                &["hose_age_limit_years"],
            ))
            .ok(200, "The settings as saved.", reference("ReportSettings")),
        Op::patch("/api/v1/reports/settings", "reports", "Set the hose age limit")
            .body(closed(
                vec![("hose_age_limit_years", nullable(int_range(1, 100)))],
                &["hose_age_limit_years"],
            ))
            .ok(200, "The settings as saved.", reference("ReportSettings")),
    ]
}

pub fn schemas() -> Vec<(&'static str, S)> {
    let ostr = || nullable(string());
    let oint = || nullable(integer());
    let onum = || nullable(number());
    vec![
        (
            "DueItem",
            object(
                vec![
                    (
                        "kind",
                        words(&[
                            "periodic_inspection",
                            "frequent_inspection",
                            "drift_test",
                            "hose_replacement",
                        ]),
                    ),
                    ("machine_id", integer()),
                    ("unit_number", string()),
                    ("cylinder_id", oint()),
                    ("hose_id", oint()),
                    ("due_on", nullable(date())),
                    ("due_at_hours", onum()),
                    ("overdue", boolean()),
                    ("basis", words(&["date", "hours"])),
                    ("due_soon", boolean()),
                    ("days_overdue", oint()),
                    ("hours_overdue", onum()),
                    ("site_id", oint()),
                    ("site_name", ostr()),
                    ("machine_kind", string()),
                    ("machine_status", string()),
                    ("detail", ostr()),
                    ("last_done_on", ostr()),
                    ("counted_from", string()),
                    ("interval_days", oint()),
                    ("interval_hours", onum()),
                    ("hour_meter", onum()),
                    ("reason", ostr()),
                ],
                &[
                    "kind",
                    "machine_id",
                    "unit_number",
                    "cylinder_id",
                    "hose_id",
                    "due_on",
                    "due_at_hours",
                    "overdue",
                    "basis",
                ],
            ),
        ),
        (
            "OutOfService",
            object(
                vec![
                    ("machine_id", integer()),
                    ("unit_number", string()),
                    ("site_id", oint()),
                    ("site_name", ostr()),
                    ("machine_kind", string()),
                    ("reason", ostr()),
                    ("since", ostr()),
                    (
                        "record",
                        object(
                            vec![
                                (
                                    "type",
                                    words(&[
                                        "inspection",
                                        "drift_test",
                                        "decay_test",
                                        "registry_change",
                                        "unknown",
                                    ]),
                                ),
                                ("id", oint()),
                            ],
                            &["type", "id"],
                        ),
                    ),
                ],
                &["machine_id", "unit_number", "reason", "since", "record"],
            ),
        ),
        (
            "HoseAge",
            object(
                vec![
                    ("hose_id", integer()),
                    ("machine_id", integer()),
                    ("unit_number", string()),
                    ("site_id", oint()),
                    ("site_name", ostr()),
                    ("cylinder_id", oint()),
                    ("place", string()),
                    ("spec", ostr()),
                    ("size", ostr()),
                    ("made_in", ostr()),
                    ("installed_on", ostr()),
                    ("replace_by", ostr()),
                    ("age_from", nullable(date())),
                    ("age_from_field", ostr()),
                    ("age_days", oint()),
                    ("age_years", onum()),
                    ("past_replace_by", boolean()),
                    ("over_age_limit", boolean()),
                ],
                &["hose_id", "machine_id", "unit_number"],
            ),
        ),
        (
            "Hazards",
            object(
                vec![
                    ("as_of", string()),
                    (
                        "pressures",
                        array(object(
                            vec![
                                ("machine_id", integer()),
                                ("unit_number", string()),
                                ("cylinder_id", integer()),
                                ("hose_id", oint()),
                                ("scenario", string()),
                                ("component", string()),
                                ("exposure", words(&["cap", "rod", "both"])),
                                ("pressure", quantity()),
                                ("rating", quantity()),
                                ("load", quantity()),
                            ],
                            &[
                                "machine_id",
                                "cylinder_id",
                                "scenario",
                                "pressure",
                                "rating",
                            ],
                        )),
                    ),
                    ("hoses", array(reference("HoseAge"))),
                    (
                        "trends",
                        array(object(
                            vec![
                                ("machine_id", integer()),
                                ("cylinder_id", integer()),
                                ("crosses_on", string()),
                                ("reached", boolean()),
                                ("estimate", boolean()),
                                ("limit", opt_quantity()),
                                ("latest", opt_quantity()),
                                ("tests_used", integer()),
                            ],
                            &["machine_id", "cylinder_id", "crosses_on", "estimate"],
                        )),
                    ),
                    ("cautions", array(string())),
                ],
                &["as_of", "pressures", "hoses", "trends", "cautions"],
            ),
        ),
        (
            "ReportSettings",
            object(
                vec![
                    ("hose_age_limit_years", oint()),
                    ("updated_at", ostr()),
                    ("updated_by", ostr()),
                ],
                &["hose_age_limit_years"],
            ),
        ),
    ]
}
