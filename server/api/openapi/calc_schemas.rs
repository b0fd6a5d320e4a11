//! The answers of the calculation routes: the engineering core's reports.

use super::dsl::*;

fn status() -> S {
    words(&["ok", "low_margin", "exceeds"])
}

/// One effective-length factor's buckling figures.
fn buckling_figure() -> S {
    object(
        vec![
            ("effective_length_factor", number()),
            ("slenderness", number()),
            ("range", words(&["elastic", "inelastic"])),
            ("method", words(&["euler", "johnson"])),
            ("critical_load", quantity()),
            ("allowable_load", quantity()),
        ],
        &["effective_length_factor", "slenderness", "critical_load"],
    )
}

fn texts() -> S {
    array(string())
}

pub fn schemas() -> Vec<(&'static str, S)> {
    let qs = |names: &[&'static str]| -> Vec<(&'static str, S)> {
        names.iter().map(|n| (*n, quantity())).collect()
    };
    let req = |names: &[&'static str]| names.to_vec();
    let with = |mut a: Vec<(&'static str, S)>, b: Vec<(&'static str, S)>| {
        a.extend(b);
        a
    };
    vec![
        (
            "CylinderReport",
            object(
                vec![
                    ("calc_version", string()),
                    ("units", words(&["us", "metric"])),
                    ("load_direction", words(&["retract", "extend"])),
                    (
                        "load_range",
                        object(qs(&["min_load", "load"]), &["min_load", "load"]),
                    ),
                    ("position", quantity()),
                    (
                        "areas",
                        object(
                            with(qs(&["cap", "rod", "annulus"]), vec![("ratio", number())]),
                            &req(&["cap", "rod", "annulus", "ratio"]),
                        ),
                    ),
                    ("volumes", object(qs(&["cap", "rod"]), &["cap", "rod"])),
                    (
                        "holding",
                        object(
                            with(
                                vec![("holding_end", words(&["cap", "rod"]))],
                                qs(&["cap_pressure", "rod_pressure"]),
                            ),
                            &["holding_end", "cap_pressure", "rod_pressure"],
                        ),
                    ),
                    (
                        "seal_bypass",
                        object(
                            vec![
                                (
                                    "outcome",
                                    words(&[
                                        "intensifies",
                                        "runs_away",
                                        "rests_on_stop",
                                        "sinks",
                                        "creeps",
                                    ]),
                                ),
                                ("final_pressure", opt_quantity()),
                                ("intensification_factor", nullable(number())),
                                ("settle_drift", opt_quantity()),
                                ("explanation", string()),
                                ("travel_left", quantity()),
                                ("bottoms", boolean()),
                                ("settle_drift_oil_only", opt_quantity()),
                                ("settle_drift_one_percent_air", opt_quantity()),
                            ],
                            &[
                                "outcome",
                                "final_pressure",
                                "intensification_factor",
                                "settle_drift",
                            ],
                        ),
                    ),
                    (
                        "rod_side_intensification",
                        nullable(object(
                            qs(&["supply_pressure", "rod_pressure", "load"]),
                            &["supply_pressure", "rod_pressure"],
                        )),
                    ),
                    (
                        "speeds",
                        nullable(object(
                            qs(&[
                                "extend",
                                "retract",
                                "regenerative_extend",
                                "retract_return_flow",
                                "extend_return_flow",
                            ]),
                            &[
                                "extend",
                                "retract",
                                "regenerative_extend",
                                "retract_return_flow",
                            ],
                        )),
                    ),
                    (
                        "forces",
                        nullable(object(
                            qs(&["extend", "retract", "regenerative_extend"]),
                            &["extend", "retract", "regenerative_extend"],
                        )),
                    ),
                    (
                        "counterbalance",
                        object(
                            vec![
                                ("setting", quantity()),
                                ("load_pressure", quantity()),
                                ("pilot_ratio", nullable(number())),
                                ("pilot_opening_pressure", opt_quantity()),
                                ("pilot_source", words(&["other_port", "external"])),
                                ("setting_used", quantity()),
                                ("setting_recorded", boolean()),
                            ],
                            &["setting", "load_pressure"],
                        ),
                    ),
                    (
                        "seal_bypass_warming",
                        nullable(object(
                            with(
                                qs(&["temperature_rise", "pressure", "piston_motion"]),
                                vec![("reaches_stop", boolean())],
                            ),
                            &["pressure"],
                        )),
                    ),
                    (
                        "holding_valve",
                        nullable(object(
                            vec![
                                ("kind", words(&["counterbalance", "pilot_check"])),
                                ("setting", opt_quantity()),
                                ("pilot_ratio", nullable(number())),
                                ("pilot_source", words(&["other_port", "external"])),
                                ("pilot_opening_pressure", opt_quantity()),
                                ("relieves", boolean()),
                            ],
                            &["kind"],
                        )),
                    ),
                    (
                        "valve_centre",
                        object(
                            vec![
                                ("cap", words(&["blocked", "open_to_tank", "not_recorded"])),
                                ("rod", words(&["blocked", "open_to_tank", "not_recorded"])),
                            ],
                            &["cap", "rod"],
                        ),
                    ),
                    ("entrained_air", number()),
                    (
                        "trapped_oil_heating",
                        object(
                            with(
                                qs(&[
                                    "temperature_rise",
                                    "cap_rise",
                                    "rod_rise",
                                    "cap_pressure",
                                    "rod_pressure",
                                    "piston_motion",
                                    "held_oil_rise",
                                ]),
                                vec![
                                    ("model", words(&["free_piston"])),
                                    ("bottoms", boolean()),
                                    ("relieves", boolean()),
                                ],
                            ),
                            &["temperature_rise", "cap_pressure", "rod_pressure"],
                        ),
                    ),
                    (
                        "tube",
                        nullable(object(
                            with(
                                qs(&[
                                    "pressure",
                                    "hoop_stress",
                                    "equivalent_stress",
                                    "yield_strength",
                                    "allowable_stress",
                                ]),
                                vec![
                                    ("criterion", words(&["tresca"])),
                                    ("youngs_modulus", opt_quantity()),
                                    ("poisson_ratio", nullable(number())),
                                    ("equivalent_utilisation", number()),
                                    ("safety_factor", number()),
                                    ("utilisation", number()),
                                    ("status", status()),
                                ],
                            ),
                            &["pressure", "hoop_stress", "equivalent_stress", "status"],
                        )),
                    ),
                    (
                        "buckling",
                        nullable(object(
                            with(
                                qs(&[
                                    "length",
                                    "critical_load",
                                    "allowable_load",
                                    "load",
                                    "youngs_modulus",
                                    "rod_yield_strength",
                                    "governing_allowable_load",
                                ]),
                                vec![
                                    ("end_condition", string()),
                                    ("effective_length_factor", number()),
                                    ("safety_factor", number()),
                                    ("status", status()),
                                    ("euler_status", status()),
                                    ("length_assumed", boolean()),
                                    ("length_basis", string()),
                                    ("rod_yield_assumed", boolean()),
                                    ("inelastic_method", words(&["johnson"])),
                                    ("slenderness", number()),
                                    ("transition_slenderness", number()),
                                    ("theoretical", buckling_figure()),
                                    ("design", buckling_figure()),
                                ],
                            ),
                            &["critical_load", "status", "governing_allowable_load"],
                        )),
                    ),
                    ("highest_pressure", quantity()),
                    (
                        "scenarios",
                        array(object(
                            with(
                                vec![("name", string())],
                                qs(&["cap_pressure", "rod_pressure", "cap_load", "rod_load"]),
                            ),
                            &[
                                "name",
                                "cap_pressure",
                                "rod_pressure",
                                "cap_load",
                                "rod_load",
                            ],
                        )),
                    ),
                    (
                        "checks",
                        array(object(
                            vec![
                                ("component", string()),
                                ("exposure", words(&["cap", "rod", "both"])),
                                ("scenario", string()),
                                ("pressure", quantity()),
                                ("rating", quantity()),
                                ("status", status()),
                                ("load", quantity()),
                            ],
                            &["component", "scenario", "pressure", "rating", "status"],
                        )),
                    ),
                    ("hazards", texts()),
                    ("notes", texts()),
                    ("cautions", texts()),
                ],
                &[
                    "areas",
                    "holding",
                    "seal_bypass",
                    "rod_side_intensification",
                    "speeds",
                    "checks",
                    "cautions",
                ],
            ),
        ),
        (
            "DriftReport",
            object(
                with(
                    qs(&[
                        "drift",
                        "duration",
                        "temperature_change",
                        "position",
                        "drift_rate",
                        "thermal_drift",
                        "leak_drift",
                        "leak_flow",
                        "scaled_drift",
                        "scaled_leak_drift",
                        "scaled_per",
                        "thermal_cap_change",
                        "thermal_rod_change",
                    ]),
                    vec![
                        (
                            "other_end",
                            object(
                                vec![
                                    ("state", words(&["blocked", "open_to_tank"])),
                                    ("basis", words(&["recorded", "readings", "assumed"])),
                                ],
                                &["state", "basis"],
                            ),
                        ),
                        ("calc_version", string()),
                        ("units", words(&["us", "metric"])),
                        (
                            "limit",
                            nullable(object(qs(&["distance", "per"]), &["distance", "per"])),
                        ),
                        ("verdict", string()),
                        ("diagnosis", string()),
                        ("reasoning", texts()),
                        ("hazards", texts()),
                        ("cautions", texts()),
                    ],
                ),
                &[
                    "drift_rate",
                    "thermal_drift",
                    "leak_drift",
                    "leak_flow",
                    "scaled_drift",
                    "verdict",
                    "diagnosis",
                    "reasoning",
                    "hazards",
                    "cautions",
                ],
            ),
        ),
        (
            "DecayReport",
            object(
                with(
                    qs(&[
                        "duration",
                        "temperature_change",
                        "oil_volume",
                        "measured_change",
                        "thermal_change",
                        "leak_change",
                        "leak_flow",
                        "scaled_drop",
                    ]),
                    vec![
                        ("calc_version", string()),
                        ("units", words(&["us", "metric"])),
                        ("pressurised_end", words(&["cap", "rod"])),
                        (
                            "limit",
                            nullable(object(qs(&["pressure", "per"]), &["pressure", "per"])),
                        ),
                        ("verdict", string()),
                        ("diagnosis", string()),
                        ("reasoning", texts()),
                        ("hazards", texts()),
                        ("cautions", texts()),
                    ],
                ),
                &["verdict", "diagnosis", "reasoning", "hazards", "cautions"],
            ),
        ),
    ]
}
