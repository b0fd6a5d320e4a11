//! Stroke ends (issue 12, fix 3) and the combined scenario of a passing seal in a warming
//! cylinder ("What to build" 4).

use crate::{DRIFT, FIGURE, close};
use loadhold::calc::analysis::{self, CylinderInput, SEAL_BYPASS_WARMING};
use loadhold::calc::bypass::Outcome;
use loadhold::calc::cylinder::{Cylinder, LoadDirection};
use loadhold::calc::quantity::UnitSystem;
use std::f64::consts::PI;

const K: f64 = 1.5e9;
const A_CAP: f64 = PI * 0.1 * 0.1 / 4.0;
const A_ROD: f64 = PI * 0.07 * 0.07 / 4.0;
const A_ANN: f64 = A_CAP - A_ROD;

/// 100/70 mm, 1 m stroke, 100 kN, oil only (1.5 GPa), rigid walls, no lines.
fn boom(x: f64, direction: LoadDirection) -> CylinderInput {
    let mut input = CylinderInput::new(Cylinder::new(0.100, 0.070, 1.0).unwrap(), 100e3, direction);
    input.position = Some(x);
    input.trapped.bulk_modulus = K;
    input
}

#[test]
fn a_piston_near_the_end_of_its_stroke_bottoms_and_the_ends_equalise_lower() {
    // Mass balance (definition of the bulk modulus), linear: A_rod dx = C_cap (p - p0) +
    // C_rod p with C = V / K. At x = 2 mm the settle to F/A_rod would be far more than 2 mm, so
    // dx = 2 mm and p = (A_rod x + C_cap p0) / (C_cap + C_rod) [C].
    let x = 0.002;
    let report = analysis::analyse(&boom(x, LoadDirection::Retract), UnitSystem::Metric).unwrap();
    let b = report.seal_bypass;
    let (c_cap, c_rod) = (A_CAP * x / K, A_ANN * (1.0 - x) / K);
    let p0 = 100e3 / A_CAP;
    let full = (c_cap * (100e3 / A_ROD - p0) + c_rod * 100e3 / A_ROD) / A_ROD;
    assert!(full > x, "the free settle {full} passes the stop");
    let p = (A_ROD * x + c_cap * p0) / (c_cap + c_rod);
    assert!(b.bottoms);
    close(
        b.settle_drift.unwrap(),
        x,
        FIGURE,
        "settle is the travel left",
    );
    close(b.final_pressure.unwrap(), p, DRIFT, "equalised pressure");
    assert!(b.final_pressure.unwrap() < 100e3 / A_ROD);
    assert!(
        report
            .hazards
            .iter()
            .any(|h| h.contains("end of its stroke"))
    );
}

#[test]
fn a_pulling_load_at_full_extension_rests_on_the_stop() {
    let report = analysis::analyse(&boom(1.0, LoadDirection::Extend), UnitSystem::Metric).unwrap();
    assert_eq!(report.seal_bypass.outcome, Outcome::RestsOnStop);
    assert!(report.hazards.iter().any(|h| h.contains("rests on")));
    assert!(
        !report.hazards.iter().any(|h| h.contains("runs out and")),
        "{:?}",
        report.hazards
    );
    // Three millimetres short of it, it runs out by those 3 mm.
    let report =
        analysis::analyse(&boom(0.997, LoadDirection::Extend), UnitSystem::Metric).unwrap();
    assert_eq!(report.seal_bypass.outcome, Outcome::RunsAway);
    close(report.seal_bypass.travel_left, 3e-3, FIGURE, "travel left");
}

/// The settle to `F / A_rod` by the linear mass balance (oil only, rigid), m [C].
fn settle(x: f64) -> f64 {
    let p0 = 100e3 / A_CAP;
    let pf = 100e3 / A_ROD;
    (A_CAP * x * (pf - p0) + A_ANN * (1.0 - x) * pf) / K / A_ROD
}

#[test]
fn a_passing_seal_in_a_warming_cylinder_lifts_the_load_at_f_over_a_rod() {
    // Both ends joined at one pressure: the force balance p A_rod = F keeps p = F/A_rod while
    // the oil's growth alpha V dT lifts the piston by alpha V dT / A_rod (continuity) [C].
    let (x, dt, alpha) = (0.5, 10.0, 7e-4);
    let mut input = boom(x, LoadDirection::Retract);
    input.temperature_rise = dt;
    let report = analysis::analyse(&input, UnitSystem::Metric).unwrap();
    let w = report.bypass_warming.unwrap();
    let x1 = x - settle(x);
    let v = A_CAP * x1 + A_ANN * (1.0 - x1);
    close(w.pressure, 100e3 / A_ROD, FIGURE, "pressure stays F/A_rod");
    close(w.piston_motion, alpha * v * dt / A_ROD, DRIFT, "lift");
    assert!(!w.reaches_stop);
    assert!(
        report
            .scenarios
            .iter()
            .any(|s| s.name == SEAL_BYPASS_WARMING)
    );
}

#[test]
fn a_passing_seal_near_full_extension_warms_onto_the_stop_and_then_rises_held() {
    // From x1 = x - settle, the room to the stop is A_rod (L - x1); growth beyond it is held:
    // dp = K (alpha V dT - A_rod (L - x1)) / V (definition of the bulk modulus) [C].
    let (x, dt, alpha) = (0.999, 20.0, 7e-4);
    let mut input = boom(x, LoadDirection::Retract);
    input.temperature_rise = dt;
    let w = analysis::analyse(&input, UnitSystem::Metric)
        .unwrap()
        .bypass_warming
        .unwrap();
    let x1 = x - settle(x);
    let v = A_CAP * x1 + A_ANN * (1.0 - x1);
    let extra = alpha * v * dt - A_ROD * (1.0 - x1);
    assert!(extra > 0.0 && w.reaches_stop);
    close(
        w.pressure,
        100e3 / A_ROD + K * extra / v,
        0.06,
        "held rise on the stop (thermal figure, 6 %)",
    );
}
