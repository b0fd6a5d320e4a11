//! The kinds of machine in the invented scale fleet and the cylinders each carries. Every
//! figure is our own invention for load testing, chosen to look like a rental yard's fleet;
//! none is a maker's.

/// One cylinder position on a kind of machine.
pub struct CylinderPlan {
    pub function: &'static str,
    /// Bore range, mm.
    pub bore_mm: (f64, f64),
    /// Stroke range, m.
    pub stroke_m: (f64, f64),
    /// `retract` (the load pushes the rod in) or `extend`.
    pub direction: &'static str,
    /// Share of machines of the kind that have this cylinder.
    pub present: f64,
}

/// A kind of machine.
pub struct KindPlan {
    pub kind: &'static str,
    pub code: &'static str,
    pub relief_bar: f64,
    /// Hours run per year, range.
    pub hours_per_year: (f64, f64),
    pub periodic_hours: Option<f64>,
    pub frequent_days: i64,
    /// Drift allowed by the kind's hold-test procedure, mm per 10 minutes (invented).
    pub limit_mm: f64,
    pub cylinders: &'static [CylinderPlan],
}

const fn cyl(
    function: &'static str,
    bore_mm: (f64, f64),
    stroke_m: (f64, f64),
    direction: &'static str,
    present: f64,
) -> CylinderPlan {
    CylinderPlan {
        function,
        bore_mm,
        stroke_m,
        direction,
        present,
    }
}

pub const KINDS: [KindPlan; 8] = [
    KindPlan {
        kind: "excavator",
        code: "EX",
        relief_bar: 350.0,
        hours_per_year: (900.0, 1700.0),
        periodic_hours: Some(1000.0),
        frequent_days: 90,
        limit_mm: 5.0,
        cylinders: &[
            cyl(
                "boom lift, left",
                (110.0, 160.0),
                (1.0, 1.6),
                "retract",
                1.0,
            ),
            cyl(
                "boom lift, right",
                (110.0, 160.0),
                (1.0, 1.6),
                "retract",
                1.0,
            ),
            cyl("arm", (100.0, 150.0), (1.2, 1.8), "extend", 1.0),
            cyl("bucket", (90.0, 130.0), (0.9, 1.2), "extend", 1.0),
        ],
    },
    KindPlan {
        kind: "wheel loader",
        code: "WL",
        relief_bar: 280.0,
        hours_per_year: (800.0, 1500.0),
        periodic_hours: Some(1000.0),
        frequent_days: 90,
        limit_mm: 6.0,
        cylinders: &[
            cyl("lift arm, left", (125.0, 160.0), (0.7, 0.9), "retract", 1.0),
            cyl(
                "lift arm, right",
                (125.0, 160.0),
                (0.7, 0.9),
                "retract",
                1.0,
            ),
            cyl("bucket tilt", (140.0, 180.0), (0.5, 0.7), "extend", 1.0),
            cyl("steering", (63.0, 80.0), (0.3, 0.45), "retract", 0.8),
        ],
    },
    KindPlan {
        kind: "telehandler",
        code: "TH",
        relief_bar: 270.0,
        hours_per_year: (500.0, 1100.0),
        periodic_hours: Some(500.0),
        frequent_days: 90,
        limit_mm: 4.0,
        cylinders: &[
            cyl("boom lift", (110.0, 140.0), (1.0, 1.4), "retract", 1.0),
            cyl("boom extension", (63.0, 90.0), (2.5, 4.0), "extend", 1.0),
            cyl("carriage tilt", (80.0, 100.0), (0.4, 0.6), "extend", 1.0),
            cyl("frame levelling", (63.0, 80.0), (0.2, 0.3), "retract", 0.7),
        ],
    },
    KindPlan {
        kind: "scissor lift",
        code: "SL",
        relief_bar: 200.0,
        hours_per_year: (150.0, 400.0),
        periodic_hours: None,
        frequent_days: 90,
        limit_mm: 3.0,
        cylinders: &[
            cyl(
                "platform lift, lower",
                (80.0, 110.0),
                (1.0, 1.4),
                "retract",
                1.0,
            ),
            cyl(
                "platform lift, upper",
                (80.0, 110.0),
                (1.0, 1.4),
                "retract",
                0.6,
            ),
            cyl("steering", (40.0, 50.0), (0.1, 0.15), "retract", 1.0),
        ],
    },
    KindPlan {
        kind: "boom lift",
        code: "BL",
        relief_bar: 230.0,
        hours_per_year: (200.0, 500.0),
        periodic_hours: None,
        frequent_days: 90,
        limit_mm: 3.0,
        cylinders: &[
            cyl("main boom lift", (110.0, 150.0), (1.0, 1.5), "retract", 1.0),
            cyl(
                "main boom extension",
                (63.0, 90.0),
                (3.0, 5.0),
                "extend",
                1.0,
            ),
            cyl("jib lift", (63.0, 80.0), (0.4, 0.6), "retract", 1.0),
            cyl(
                "platform levelling",
                (50.0, 63.0),
                (0.2, 0.3),
                "retract",
                1.0,
            ),
            cyl("steering", (40.0, 50.0), (0.1, 0.15), "retract", 1.0),
        ],
    },
    KindPlan {
        kind: "skid steer",
        code: "SK",
        relief_bar: 220.0,
        hours_per_year: (400.0, 900.0),
        periodic_hours: Some(500.0),
        frequent_days: 90,
        limit_mm: 6.0,
        cylinders: &[
            cyl("lift arm, left", (63.0, 80.0), (0.7, 0.9), "retract", 1.0),
            cyl("lift arm, right", (63.0, 80.0), (0.7, 0.9), "retract", 1.0),
            cyl("tilt, left", (63.0, 80.0), (0.35, 0.5), "extend", 1.0),
            cyl("tilt, right", (63.0, 80.0), (0.35, 0.5), "extend", 1.0),
        ],
    },
    KindPlan {
        kind: "tipper trailer",
        code: "TT",
        relief_bar: 180.0,
        hours_per_year: (100.0, 300.0),
        periodic_hours: None,
        frequent_days: 90,
        limit_mm: 8.0,
        cylinders: &[cyl("body tip", (110.0, 160.0), (2.0, 3.5), "retract", 1.0)],
    },
    KindPlan {
        kind: "loader crane",
        code: "LC",
        relief_bar: 320.0,
        hours_per_year: (300.0, 800.0),
        periodic_hours: None,
        frequent_days: 30,
        limit_mm: 3.0,
        cylinders: &[
            cyl("main boom", (140.0, 200.0), (0.8, 1.2), "retract", 1.0),
            cyl("outer boom", (110.0, 160.0), (0.8, 1.2), "extend", 1.0),
            cyl("extension", (63.0, 90.0), (1.5, 3.0), "extend", 1.0),
            cyl("slew", (80.0, 100.0), (0.3, 0.5), "retract", 0.5),
            cyl(
                "stabiliser, left",
                (80.0, 110.0),
                (0.4, 0.6),
                "retract",
                1.0,
            ),
            cyl(
                "stabiliser, right",
                (80.0, 110.0),
                (0.4, 0.6),
                "retract",
                1.0,
            ),
        ],
    },
];
