//! Rod-side intensification, speeds and flows, counterbalance valve, trapped-oil heating.

use crate::{FIGURE, IN, close};
use loadhold::calc::bypass::{Line, Trapped};
use loadhold::calc::circuit;
use loadhold::calc::cylinder::{Cylinder, End, LoadDirection};
use std::f64::consts::PI;

#[test]
fn blocked_rod_port_at_200_bar_on_100_70_mm_reaches_392_bar() {
    // REFERENCES.md "Flow and circuits" [C]: 100/70 mm at 200 bar: phi = 1.961, 392 bar.
    let c = Cylinder::new(0.100, 0.070, 1.0).unwrap();
    let p = circuit::rod_side_intensification(&c, 200e5, 0.0, LoadDirection::Retract);
    close(p / 1e5, 392.0, FIGURE, "rod-side pressure");
    // "plus any load pulling the rod out, over A_annulus" (same source): 20 kN adds
    // 20e3 / 4.006e-3 m² = 49.9 bar [C]; a load pushing the rod in takes it away.
    let ann = c.annulus_area();
    let pull = circuit::rod_side_intensification(&c, 200e5, 20e3, LoadDirection::Extend);
    close(
        pull,
        200e5 * c.cap_area() / ann + 20e3 / ann,
        FIGURE,
        "with a pulling load",
    );
    let push = circuit::rod_side_intensification(&c, 200e5, 20e3, LoadDirection::Retract);
    close(
        push,
        200e5 * c.cap_area() / ann - 20e3 / ann,
        FIGURE,
        "with a pushing load",
    );
}

#[test]
fn regenerative_extension_worked_example() {
    // The open textbook "Hydraulics" (Open Oregon Educational Resources), regenerative
    // extension exercise, as REFERENCES.md gives it: Q = 20 L/min, p = 80 bar, A1 = 4 cm²,
    // A2 = 2 cm² -> regenerative 100 m/min at 1600 N; normal extend 50 m/min at 3200 N;
    // retract 100 m/min [C].
    let bore = (4.0 * 4e-4 / PI).sqrt();
    let rod = (4.0 * 2e-4 / PI).sqrt();
    let c = Cylinder::new(bore, rod, 1.0).unwrap();
    let q = 20e-3 / 60.0;
    let s = circuit::speeds(&c, q);
    let per_min = |v: f64| v * 60.0;
    close(
        per_min(s.regenerative_extend),
        100.0,
        FIGURE,
        "regenerative speed, m/min",
    );
    close(per_min(s.extend), 50.0, FIGURE, "extend speed, m/min");
    close(per_min(s.retract), 100.0, FIGURE, "retract speed, m/min");
    let f = circuit::forces(&c, 80e5);
    close(f.regenerative_extend, 1600.0, FIGURE, "regenerative force");
    close(f.extend, 3200.0, FIGURE, "extend force");
    // Continuity [C]: retracting at Q/A2 pushes Q A1/A2 = 40 L/min out of the cap end.
    close(
        s.retract_return_flow * 60e3,
        40.0,
        FIGURE,
        "return flow, L/min",
    );
}

#[test]
fn speed_rule_of_thumb_3_85_gpm_per_square_inch() {
    // REFERENCES.md "Trade facts" (common practice): v(in/s) = 3.85 x Q(gpm) / A(in²),
    // 231/60 = 3.85 exactly.
    let c = Cylinder::new(4.0 * IN, 2.0 * IN, 1.0).unwrap();
    let gpm = 3.785_411_784e-3 / 60.0;
    let s = circuit::speeds(&c, 10.0 * gpm);
    let area_in2 = c.cap_area() / (IN * IN);
    close(
        s.extend / IN,
        3.85 * 10.0 / area_in2,
        FIGURE,
        "extend speed in in/s",
    );
}

#[test]
fn trapped_oil_gains_about_10_5_bar_per_degree() {
    // REFERENCES.md "Fluid properties" [C]: 1.5 GPa x 7e-4 = 10.5 bar per degC
    // (bulk modulus and expansion from memory, Rabie for the 7e-4).
    let c = Cylinder::new(0.1, 0.05, 1.0).unwrap();
    let trapped = Trapped {
        bulk_modulus: 1.5e9,
        cap_line: Line::default(),
        rod_line: Line::default(),
        tube: None,
    };
    let dp = circuit::trapped_heating(&c, &trapped, End::Cap, 0.5, 7e-4, 1.0);
    close(dp / 1e5, 10.5, FIGURE, "rise per degC");
    close(
        loadhold::calc::fluid::trapped_pressure_rise(1.5e9, 7e-4, 10.0) / 1e5,
        105.0,
        FIGURE,
        "10 degC",
    );
    // A soft line takes some of it: the rise must then be smaller.
    let soft = Trapped {
        cap_line: Line {
            volume: 1e-3,
            expansion: 1e-6 / 1e5,
        },
        ..trapped
    };
    assert!(circuit::trapped_heating(&c, &soft, End::Cap, 0.5, 7e-4, 1.0) < dp);
}
