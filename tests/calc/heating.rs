//! Trapped-oil heating with the piston free under a constant load (issue 12, fix 1).
//!
//! Expected values from the algebra written out here: each blocked end
//! `C dp = alpha V dT -+ A dx` (definition of the bulk modulus) and the force balance
//! `A_cap dp_cap = A_ann dp_rod` (a constant load). Oil only, rigid walls, `C = V / K`,
//! REFERENCES.md "Added 2026-12-02" check case [C]:
//! `dp_rod = K alpha dT (1 + A_rod / (A_cap (L - x)/x + A_ann))`.

use crate::{FIGURE, close};
use loadhold::calc::analysis::{self, CylinderInput};
use loadhold::calc::cylinder::{Cylinder, LoadDirection};
use loadhold::calc::quantity::UnitSystem;
use loadhold::calc::valves::{Centre, HoldingValve, PilotSource, ValveKind};
use std::f64::consts::PI;

const K: f64 = 1.5e9;
const ALPHA: f64 = 7e-4;

/// 100/70 mm, 1 m stroke, 100 kN pushing the rod in, oil only and rigid walls (no tube, no
/// lines), warmed by `dt`.
fn held_at(x: f64, dt: f64) -> CylinderInput {
    let mut input = CylinderInput::new(
        Cylinder::new(0.100, 0.070, 1.0).unwrap(),
        100e3,
        LoadDirection::Retract,
    );
    input.position = Some(x);
    input.trapped.bulk_modulus = K;
    input.oil_expansion = ALPHA;
    input.temperature_rise = dt;
    input
}

/// Areas of 100/70 mm, m² (geometry, pi D² / 4).
fn areas() -> (f64, f64, f64) {
    let cap = PI * 0.1 * 0.1 / 4.0;
    let rod = PI * 0.07 * 0.07 / 4.0;
    (cap, rod, cap - rod)
}

#[test]
fn a_free_piston_raises_the_rod_end_above_k_alpha_dt_and_the_cap_end_below_it() {
    let (a_cap, a_rod, a_ann) = areas();
    let (l, dt) = (1.0, 10.0);
    for x in [0.5, 0.2, 0.8] {
        let report = analysis::analyse(&held_at(x, dt), UnitSystem::Metric).unwrap();
        let h = report.heating;
        // REFERENCES.md check case [C]; cap end from the force balance.
        let rod = K * ALPHA * dt * (1.0 + a_rod / (a_cap * (l - x) / x + a_ann));
        let cap = rod * a_ann / a_cap;
        close(h.rod_rise, rod, FIGURE, "rod-end rise");
        close(h.cap_rise, cap, FIGURE, "cap-end rise");
        assert!(h.rod_rise > K * ALPHA * dt, "rod end above K alpha dT");
        assert!(h.cap_rise < K * ALPHA * dt, "cap end below K alpha dT");
        // The piston moves out: subtracting the two end equations with the force balance,
        // dx = alpha dT A_rod / (A_cap/x + A_ann/(L - x)) [C, same algebra].
        let dx = ALPHA * dt * a_rod / (a_cap / x + a_ann / (l - x));
        close(h.piston_motion, dx, FIGURE, "piston motion");
        assert!(!h.bottoms && !h.relieves);
        // The scenario the ratings check uses carries these pressures.
        close(
            h.rod_pressure,
            rod,
            FIGURE,
            "rod-end pressure (held at 0 before)",
        );
    }
}

#[test]
fn a_pulling_load_gives_the_same_rises_on_top_of_its_rod_end_holding_pressure() {
    // The end equations and the force balance are linear in the changes: the rises do not
    // depend on which end holds the load [C].
    let (a_cap, a_rod, a_ann) = areas();
    let mut input = held_at(0.5, 5.0);
    input.load_direction = LoadDirection::Extend;
    let report = analysis::analyse(&input, UnitSystem::Us).unwrap();
    let rod = K * ALPHA * 5.0 * (1.0 + a_rod / (a_cap + a_ann));
    close(report.heating.rod_rise, rod, FIGURE, "rod-end rise");
    close(
        report.heating.rod_pressure,
        100e3 / a_ann + rod,
        FIGURE,
        "rod-end pressure: F / A_ann plus the rise",
    );
}

#[test]
fn a_rod_end_open_to_tank_has_no_trapped_oil_rise_and_the_load_rises_instead() {
    // Rod end at tank pressure: the force balance keeps the cap end at F / A_cap, so the cap
    // oil's growth alpha V dT lifts the piston by alpha x dT (common practice, REFERENCES.md
    // "Trade facts", the cooling relation run the other way).
    let mut input = held_at(0.5, 10.0);
    input.valves.rod_centre = Some(Centre::OpenToTank);
    let h = analysis::analyse(&input, UnitSystem::Metric)
        .unwrap()
        .heating;
    assert_eq!(h.cap_rise, 0.0);
    assert_eq!(h.rod_rise, 0.0);
    close(h.piston_motion, ALPHA * 0.5 * 10.0, FIGURE, "piston rises");
}

#[test]
fn a_piston_that_reaches_its_stop_while_warming_then_rises_as_held() {
    // Rod end open to tank, piston 1 mm from full extension. Free, it would rise alpha x dT =
    // 7e-4 x 0.999 m x 10 K = 6.99 mm; it reaches the stop after the share
    // s = 1 mm / 6.99 mm of the warming, and from there the cap oil is held by a rigid stop:
    // dp = K alpha dT (1 - s) (definition of the bulk modulus) [C].
    let (x, dt) = (0.999, 10.0);
    let mut input = held_at(x, dt);
    input.valves.rod_centre = Some(Centre::OpenToTank);
    let h = analysis::analyse(&input, UnitSystem::Metric)
        .unwrap()
        .heating;
    let s = (1.0 - x) / (ALPHA * x * dt);
    close(
        h.cap_rise,
        K * ALPHA * dt * (1.0 - s),
        FIGURE,
        "held rise after the stop",
    );
    close(h.piston_motion, 1.0 - x, FIGURE, "travel to the stop");
    assert!(h.bottoms);
}

#[test]
fn a_counterbalance_valve_stops_the_holding_end_at_its_setting() {
    // 100 kN on 100/70 mm: 127.3 bar held. Warmed 10 K, the free cap-end rise would be
    // (A_ann/A_cap) K alpha dT (1 + A_rod/(A_cap + A_ann)) = 70.9 bar [C], past a 140 bar
    // setting: the valve relieves, the cap end stays at 140 bar and the force balance fixes
    // the rod end at (A_cap 140 bar - F) / A_ann [C].
    let (a_cap, _, a_ann) = areas();
    let mut input = held_at(0.5, 10.0);
    input.valves.holding = Some(HoldingValve {
        kind: ValveKind::Counterbalance,
        setting: Some(140e5),
        pilot_ratio: Some(3.0),
        pilot: PilotSource::OtherPort,
    });
    let report = analysis::analyse(&input, UnitSystem::Metric).unwrap();
    let h = report.heating;
    assert!(h.relieves);
    close(h.cap_pressure, 140e5, FIGURE, "cap end at the setting");
    close(
        h.rod_pressure,
        (a_cap * 140e5 - 100e3) / a_ann,
        FIGURE,
        "rod end from the force balance",
    );
    assert!(
        report.cautions.iter().any(|c| c.contains("creeps")),
        "{:?}",
        report.cautions
    );
}

#[test]
fn at_full_extension_a_pushing_load_warms_against_the_stop_and_cools_away_from_it() {
    // x = L: the rod end holds no oil. Warming pushes the piston onto its stop, so the cap oil
    // is held: K alpha dT (definition of the bulk modulus). Cooling lets the load sink freely:
    // alpha x dT (common practice, REFERENCES.md "Trade facts") [C].
    let dt = 4.0;
    let h = analysis::analyse(&held_at(1.0, dt), UnitSystem::Metric)
        .unwrap()
        .heating;
    close(h.cap_rise, K * ALPHA * dt, FIGURE, "held cap-end rise");
    assert_eq!(h.piston_motion, 0.0);
    let cooled = loadhold::calc::heating::free_piston(
        &held_at(1.0, dt).cylinder,
        &held_at(1.0, dt).trapped,
        1.0,
        ALPHA,
        -dt,
        loadhold::calc::heating::EndSetup {
            pressure: 127e5,
            open: false,
            relief: None,
        },
        loadhold::calc::heating::EndSetup {
            pressure: 0.0,
            open: false,
            relief: None,
        },
        false,
    );
    close(
        cooled.motion,
        -ALPHA * 1.0 * dt,
        FIGURE,
        "sinks by alpha x dT",
    );
    assert_eq!(cooled.cap_change, 0.0);
}
