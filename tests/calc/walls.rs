//! Tube and rod wall compliance (issue 12, fix 2): Lamé bore growth over each end's length,
//! the rod shrinking under external pressure in the rod end.

use crate::{DRIFT, FIGURE, close};
use loadhold::calc::analysis::CylinderInput;
use loadhold::calc::bypass::{Line, Trapped, TubeWall};
use loadhold::calc::cylinder::{Cylinder, End, LoadDirection};
use loadhold::calc::decay::{self, DecayReadings};
use loadhold::calc::diagnosis::Diagnosis;
use loadhold::calc::quantity::UnitSystem;
use loadhold::calc::{bypass, walls};
use std::f64::consts::PI;

const E: f64 = 210e9;
const NU: f64 = 0.3;

/// Lamé plane stress, written from the general solution `sigma_r = A - B/r²`,
/// `sigma_theta = A + B/r²` with `A = p a²/(b² - a²)`, `B = p a² b²/(b² - a²)` and Hooke's law
/// `u = r (sigma_theta - nu sigma_r) / E`, at `r = a` (REFERENCES.md "Tube and rod strength").
fn lame_u_at_bore(p: f64, a: f64, b: f64) -> f64 {
    let big_a = p * a * a / (b * b - a * a);
    let big_b = p * a * a * b * b / (b * b - a * a);
    let sigma_r = big_a - big_b / (a * a);
    let sigma_t = big_a + big_b / (a * a);
    a * (sigma_t - NU * sigma_r) / E
}

#[test]
fn bore_growth_is_the_lame_plane_stress_displacement() {
    // REFERENCES.md "Added 2026-12-02" [C]: u_a = (p a / E)((b² + a²)/(b² - a²) + nu).
    // a = 10 mm, b = 20 mm, p = 100 MPa: (1e8 x 0.01 / 210e9)(5/3 + 0.3) = 9.365e-6 m.
    let u = walls::bore_growth_per_pa(0.02, 0.04, E, NU) * 100e6;
    close(u, 9.365e-6, FIGURE, "u_a by the closed form");
    close(
        u,
        lame_u_at_bore(100e6, 0.01, 0.02),
        1e-9,
        "u_a from the stresses",
    );
}

/// Rod-end wall compliance by hand for bore `d`, rod `r`, outside diameter `od` over length
/// `len`: `len (A_cap 2 u_a / (a p) + A_rod 2 (1 - nu) / E)` (Lamé; a solid rod under external
/// pressure shrinks radially by (1 - nu) p r / E, REFERENCES.md "Added 2026-12-02").
fn rod_wall_by_hand(d: f64, r: f64, od: f64, len: f64) -> f64 {
    let p = 1e7;
    let a_cap = PI * d * d / 4.0;
    let a_rod = PI * r * r / 4.0;
    let u = lame_u_at_bore(p, d / 2.0, od / 2.0);
    len * (a_cap * 2.0 * u / (d / 2.0) / p + a_rod * 2.0 * (1.0 - NU) / E)
}

#[test]
fn the_rod_end_grows_by_the_whole_bore_and_the_rod_shrinks() {
    let c = Cylinder::new(0.100, 0.090, 1.0).unwrap();
    let tube = TubeWall::steel(0.108);
    let ours = walls::wall_compliance(&c, &tube, End::Rod, 0.3);
    close(
        ours,
        rod_wall_by_hand(0.1, 0.09, 0.108, 0.7),
        FIGURE,
        "rod-end wall",
    );
    // The old annulus-only term A_ann L / B_tube is far smaller on a fat rod: here the whole
    // bore is 4.3 times the annulus [C].
    let a_ann = PI * (0.1f64.powi(2) - 0.09f64.powi(2)) / 4.0;
    let p = 1e7;
    let old = a_ann * 0.7 * 2.0 * lame_u_at_bore(p, 0.05, 0.054) / 0.05 / p;
    assert!(ours > 4.0 * old, "{ours} vs {old}");
    // Cap end: the bore over the chamber length x.
    let cap = walls::wall_compliance(&c, &tube, End::Cap, 0.3);
    let a_cap = PI * 0.01 / 4.0;
    close(
        cap,
        0.3 * a_cap * 2.0 * lame_u_at_bore(p, 0.05, 0.054) / 0.05 / p,
        FIGURE,
        "cap-end wall",
    );
}

/// An independent settle: oil obeying `rho = rho0 exp(p / B)` (the integrated definition of
/// the bulk modulus), the bore's cross-section growing by `g p` and the rod's shrinking by
/// `s p` (Lamé, plane stress), lines with their own swell, the oil mass conserved exactly (not
/// linearised). Returns how far the rod goes in, m.
#[allow(clippy::too_many_arguments)]
fn settle_by_mass_balance(
    (a_cap, a_rod, l): (f64, f64, f64),
    x0: f64,
    load: f64,
    b: f64,
    (g, s): (f64, f64),
    lines: (f64, f64),
    swell: (f64, f64),
) -> f64 {
    let a_ann = a_cap - a_rod;
    let p0 = load / a_cap;
    let pf = load / a_rod;
    // Cap end at p: x (A_cap + g p); rod end at p: (L - x)(A_ann + (g + s) p).
    let mass = (x0 * (a_cap + g * p0) + lines.0 + swell.0 * p0) * (p0 / b).exp()
        + (l - x0) * a_ann
        + lines.1;
    // Final, both ends at pf: x1 (A_cap + g pf) + (L - x1)(A_ann + (g + s) pf) + lines + swell
    // = mass exp(-pf / B); solve for x1.
    let room = mass * (-pf / b).exp() - lines.0 - lines.1 - (swell.0 + swell.1) * pf;
    let per_x = (a_cap + g * pf) - (a_ann + (g + s) * pf);
    let x1 = (room - l * (a_ann + (g + s) * pf)) / per_x;
    x0 - x1
}

#[test]
fn settle_drift_agrees_with_an_exact_mass_balance_on_a_fat_rod_in_a_thin_tube() {
    // [C] mass conservation with the bulk-modulus definition and the Lamé wall terms above.
    for (d, r, od) in [(0.100, 0.070, 0.121), (0.100, 0.090, 0.108)] {
        let c = Cylinder::new(d, r, 1.0).unwrap();
        let (x0, load, b) = (0.5, 100e3, 1.5e9);
        let p = 1e7;
        let a_cap = PI * d * d / 4.0;
        let a_rod = PI * r * r / 4.0;
        let g = a_cap * 2.0 * lame_u_at_bore(p, d / 2.0, od / 2.0) / (d / 2.0) / p;
        let s = a_rod * 2.0 * (1.0 - NU) / E;
        let lines = (2e-3, 1.5e-3);
        let swell = (0.5e-6 / 1e5, 0.4e-6 / 1e5); // 0.5 and 0.4 cm³/bar
        let trapped = Trapped {
            bulk_modulus: b,
            cap_line: Line {
                volume: lines.0,
                expansion: swell.0,
            },
            rod_line: Line {
                volume: lines.1,
                expansion: swell.1,
            },
            tube: Some(TubeWall::steel(od)),
        };
        let ours = bypass::seal_bypass(&c, x0, load, LoadDirection::Retract, &trapped)
            .settle_drift
            .unwrap();
        let exact = settle_by_mass_balance((a_cap, a_rod, 1.0), x0, load, b, (g, s), lines, swell);
        close(
            ours,
            exact,
            DRIFT,
            "settle drift with lines, hose swell and walls",
        );
    }
}

#[test]
fn a_leak_in_a_thin_walled_fat_rod_cylinder_is_not_read_as_cooling() {
    // 100/90 mm, 108 mm tube (4 mm wall), 1 m stroke, rod end pressurised at full retraction,
    // 200 bar, cooled 3 K, read 174 bar after 10 min.
    // Expected thermal change [C] (definition of the bulk modulus): dp = alpha V dT / C with
    // V = A_ann L and C = V/K + (rod-end wall by hand). That is about -15.4 bar, so 10.6 bar is
    // lost to leakage. The old annulus-only wall term gave -26.5 bar and read it all as cooling.
    let c = Cylinder::new(0.100, 0.090, 1.0).unwrap();
    let mut input = CylinderInput::new(c, 0.0, LoadDirection::Retract);
    input.trapped.tube = Some(TubeWall::steel(0.108));
    let r = DecayReadings {
        pressurised_end: End::Rod,
        duration: 600.0,
        pressure_start: 200e5,
        pressure_end: 174e5,
        oil_temperature_start: 313.15,
        oil_temperature_end: 310.15,
        other_pressure_start: None,
        other_pressure_end: None,
        limit: None,
    };
    let report = decay::analyse_decay(&input, &r, UnitSystem::Metric).unwrap();
    let a_ann = PI * (0.1f64.powi(2) - 0.09f64.powi(2)) / 4.0;
    let v = a_ann * 1.0;
    let compliance = v / 1.5e9 + rod_wall_by_hand(0.1, 0.09, 0.108, 1.0);
    let thermal = 7e-4 * v * -3.0 / compliance;
    close(report.thermal_change, thermal, FIGURE, "thermal change");
    close(
        report.leak_change,
        -26e5 - thermal,
        FIGURE,
        "pressure lost to leakage",
    );
    // Leaked volume: -C dp_leak (definition of compliance) over the 600 s.
    close(
        report.leak_flow * 600.0,
        -compliance * (-26e5 - thermal),
        FIGURE,
        "leaked volume",
    );
    assert_ne!(report.diagnosis, Diagnosis::ThermalContraction);
    assert_ne!(report.diagnosis, Diagnosis::NoLeak);
}
