//! Position-drift tests: the figures against their formulas and the diagnosis rules.
//!
//! Readings come from relations written out in each test (thermal drift x = alpha (V/A) dT,
//! REFERENCES.md "Trade facts", common practice; the free-piston check case of REFERENCES.md
//! "Added 2026-12-02"; force balance), never from the code under test, so each case sits
//! clearly on one side of a rule.

use crate::{DRIFT, FIGURE, close};
use loadhold::calc::analysis::CylinderInput;
use loadhold::calc::cylinder::{Cylinder, LoadDirection};
use loadhold::calc::diagnosis::Diagnosis;
use loadhold::calc::drift::{self, DriftReadings, Limit, Movement, PortPressures, Verdict};
use loadhold::calc::quantity::UnitSystem;
use loadhold::calc::ratings::{Exposure, Rating};
use loadhold::calc::valves::Centre;

const C0: f64 = 273.15;

/// 100/70 mm, 1 m stroke, 100 kN pushing the rod in, held at 500 mm, mineral-oil defaults.
pub fn boom() -> CylinderInput {
    let mut input = CylinderInput::new(
        Cylinder::new(0.100, 0.070, 1.0).unwrap(),
        100e3,
        LoadDirection::Retract,
    );
    input.position = Some(0.5);
    input
}

pub fn readings(drift_m: f64, minutes: f64, t_start: f64, t_end: f64) -> DriftReadings {
    DriftReadings {
        duration: minutes * 60.0,
        movement: Movement::Drift(drift_m),
        oil_temperature_start: C0 + t_start,
        oil_temperature_end: C0 + t_end,
        pressures: PortPressures::default(),
        limit: None,
    }
}

#[test]
fn cooling_oil_explains_the_drift() {
    // x = alpha (V/A) dT (common practice): 7e-4 /K x 0.5 m x 6 K = 2.1 mm [C], with the rod
    // end read at zero throughout (open to tank, so the cap end alone sets the drift).
    let input = boom();
    let mut r = readings(2.2e-3, 30.0, 50.0, 44.0);
    r.pressures.rod_start = Some(0.0);
    r.pressures.rod_end = Some(0.0);
    let report = drift::analyse_drift(&input, &r, UnitSystem::Metric).unwrap();
    close(
        report.thermal_drift,
        7e-4 * 0.5 * 6.0,
        DRIFT,
        "thermal drift",
    );
    close(report.leak_drift, 2.2e-3 - 2.1e-3, 0.05, "leak drift");
    close(report.drift_rate, 2.2e-3 / 1800.0, FIGURE, "drift rate");
    // Continuity: leak flow = A_hold x leak drift / t.
    let a_cap = input.cylinder.cap_area();
    close(
        report.leak_flow,
        a_cap * report.leak_drift / 1800.0,
        FIGURE,
        "leak flow",
    );
    assert_eq!(report.diagnosis, Diagnosis::ThermalContraction);
    assert!(
        report
            .reasoning
            .iter()
            .any(|s| s.contains("Oil cooled 6 degC; that explains 2.1 mm of the 2.2 mm drift")),
        "{:?}",
        report.reasoning
    );
    assert_eq!(report.verdict, Verdict::NoLimit);
}

#[test]
fn thermal_drift_counts_the_holding_line() {
    // Common practice: V is all the oil trapped on the holding side. 2 L of line over the
    // 78.54 cm² piston adds 0.2546 m to V/A [C]: (0.5 + 0.2546) x 7e-4 x 5 K = 2.641 mm.
    let mut input = boom();
    input.trapped.cap_line.volume = 2e-3;
    let report = drift::analyse_drift(
        &input,
        &readings(3e-3, 30.0, 45.0, 40.0),
        UnitSystem::Metric,
    )
    .unwrap();
    close(
        report.thermal_drift,
        2.641e-3,
        DRIFT,
        "thermal drift with line",
    );
}

#[test]
fn rod_end_pressure_climbing_is_a_piston_seal_bypass() {
    let mut input = boom();
    input.ratings.push(Rating {
        component: "cap_line".into(),
        exposure: Exposure::Cap,
        rating: 210e5,
    });
    let mut r = readings(1.0e-3, 10.0, 40.0, 40.0);
    r.pressures = PortPressures {
        cap_start: Some(127e5),
        cap_end: Some(150e5),
        rod_start: Some(0.0),
        rod_end: Some(40e5),
    };
    let report = drift::analyse_drift(&input, &r, UnitSystem::Metric).unwrap();
    assert_eq!(report.diagnosis, Diagnosis::PistonSealBypass);
    // Force balance (common practice): both ends go to F / A_rod = 100 kN / 38.48 cm² = 259.8 bar.
    assert!(
        report.hazards.iter().any(|h| h.contains("259.8 bar")),
        "{:?}",
        report.hazards
    );
    assert!(
        report
            .hazards
            .iter()
            .any(|h| h.contains("Cap-end line") && h.contains("above")),
        "{:?}",
        report.hazards
    );
    assert!(
        report
            .cautions
            .iter()
            .any(|c| c.contains("above its rated pressure"))
    );
}

#[test]
fn warming_alone_does_not_read_as_a_bypass() {
    // A blocked rod end gains about B alpha dT = 10.5 bar per degC (REFERENCES.md [C]);
    // 2 degC of warming and a 20 bar rise is within that, so it is no bypass.
    let input = boom();
    let mut r = readings(-0.6e-3, 10.0, 40.0, 42.0);
    r.pressures = PortPressures {
        cap_start: Some(127e5),
        cap_end: Some(127e5),
        rod_start: Some(0.0),
        rod_end: Some(20e5),
    };
    let report = drift::analyse_drift(&input, &r, UnitSystem::Metric).unwrap();
    assert_ne!(report.diagnosis, Diagnosis::PistonSealBypass);
    assert_eq!(report.diagnosis, Diagnosis::NoLeak);
}

#[test]
fn steady_pressures_with_a_real_drift_are_a_holding_circuit_leak() {
    // The rod port recorded as blocked in the valve centre: a bypass would have raised it.
    let mut input = boom();
    input.valves.rod_centre = Some(Centre::Blocked);
    let mut r = readings(8e-3, 10.0, 40.0, 40.0);
    r.pressures = PortPressures {
        cap_start: Some(127e5),
        cap_end: Some(126e5),
        rod_start: Some(0.0),
        rod_end: Some(0.0),
    };
    r.limit = Some(Limit {
        distance: 5e-3,
        per: 600.0,
    });
    let report = drift::analyse_drift(&input, &r, UnitSystem::Metric).unwrap();
    assert_eq!(report.diagnosis, Diagnosis::HoldingCircuitLeak);
    assert_eq!(report.verdict, Verdict::Fail);
    close(
        report.scaled_drift,
        8e-3,
        FIGURE,
        "scaled to the same 10 min",
    );
    assert!(report.hazards.iter().any(|h| h.contains("keeps moving")));
}

#[test]
fn small_drift_at_steady_temperature_is_no_leak_and_passes() {
    let input = boom();
    let mut r = readings(0.2e-3, 10.0, 40.0, 40.0);
    r.limit = Some(Limit {
        distance: 5e-3,
        per: 600.0,
    });
    let report = drift::analyse_drift(&input, &r, UnitSystem::Metric).unwrap();
    assert_eq!(report.diagnosis, Diagnosis::NoLeak);
    assert_eq!(report.verdict, Verdict::Pass);
    assert!(report.hazards.is_empty(), "{:?}", report.hazards);
}

#[test]
fn a_leak_without_pressures_is_inconclusive_and_warns_of_a_possible_bypass() {
    let input = boom();
    let report = drift::analyse_drift(
        &input,
        &readings(6e-3, 10.0, 40.0, 40.0),
        UnitSystem::Metric,
    )
    .unwrap();
    assert_eq!(report.diagnosis, Diagnosis::Inconclusive);
    assert!(
        report
            .hazards
            .iter()
            .any(|h| h.starts_with("If the piston seal is passing oil")),
        "{:?}",
        report.hazards
    );
}

#[test]
fn a_leak_under_a_pulling_load_is_inconclusive_and_can_run_away() {
    let mut input = boom();
    input.load_direction = LoadDirection::Extend;
    let mut r = readings(0.0, 10.0, 40.0, 40.0);
    r.movement = Movement::Positions {
        start: 0.5,
        end: 0.506,
    };
    let report = drift::analyse_drift(&input, &r, UnitSystem::Metric).unwrap();
    close(
        report.drift,
        6e-3,
        FIGURE,
        "drift in the load's direction (rod going out)",
    );
    assert_eq!(report.diagnosis, Diagnosis::Inconclusive);
    assert!(
        report
            .cautions
            .iter()
            .any(|c| c.contains("may not hold its load"))
    );
}

#[test]
fn positions_give_the_drift_and_the_limit_scales_it() {
    // Rod going in from 500 mm to 497 mm under a pushing load: 3 mm in 10 min, 18 mm per hour.
    let input = boom();
    let mut r = readings(0.0, 10.0, 40.0, 40.0);
    r.movement = Movement::Positions {
        start: 0.5,
        end: 0.497,
    };
    r.limit = Some(Limit {
        distance: 20e-3,
        per: 3600.0,
    });
    let report = drift::analyse_drift(&input, &r, UnitSystem::Us).unwrap();
    close(report.drift, 3e-3, FIGURE, "drift");
    close(report.scaled_drift, 18e-3, FIGURE, "scaled drift");
    assert_eq!(report.verdict, Verdict::Pass);
    // US units in the words.
    assert!(
        report.reasoning.iter().any(|s| s.contains(" in ")),
        "{:?}",
        report.reasoning
    );
}

#[test]
fn bad_readings_name_their_field() {
    let input = boom();
    let mut r = readings(1e-3, 10.0, 40.0, 40.0);
    r.duration = 0.0;
    assert_eq!(
        drift::analyse_drift(&input, &r, UnitSystem::Metric)
            .unwrap_err()
            .field,
        "duration"
    );
    let mut r = readings(1e-3, 10.0, 40.0, 40.0);
    r.movement = Movement::Positions {
        start: 0.5,
        end: 1.5,
    };
    assert_eq!(
        drift::analyse_drift(&input, &r, UnitSystem::Metric)
            .unwrap_err()
            .field,
        "end_position"
    );
    let mut r = readings(1e-3, 10.0, 40.0, 40.0);
    r.limit = Some(Limit {
        distance: f64::NAN,
        per: 600.0,
    });
    assert_eq!(
        drift::analyse_drift(&input, &r, UnitSystem::Metric)
            .unwrap_err()
            .field,
        "limit.distance"
    );
}
