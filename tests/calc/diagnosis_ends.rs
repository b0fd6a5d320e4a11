//! Drift tests: the non-holding end blocked or open to tank, and the free-piston thermal
//! figures that follow (issue 12, "What to build" 6).

use crate::diagnosis::{boom, readings};
use crate::{FIGURE, close};
use loadhold::calc::diagnosis::Diagnosis;
use loadhold::calc::drift::{self, PortPressures};
use loadhold::calc::quantity::UnitSystem;
use loadhold::calc::valves::Centre;

#[test]
fn a_warming_healthy_cylinder_with_both_ports_blocked_is_no_leak() {
    // REFERENCES.md "Added 2026-12-02" check case [C], oil only, rigid walls, 100/70 mm,
    // L = 1 m, x = 0.5 m, warmed 3 K: dp_rod = K alpha dT (1 + A_rod/(A_cap (L-x)/x + A_ann))
    // = 41.7 bar, dp_cap = (A_ann/A_cap) dp_rod = 21.3 bar (force balance), and the load rises
    // dx = alpha dT A_rod / (A_cap/x + A_ann/(L-x)) = 0.34 mm. A held-piston model would expect
    // only K alpha dT = 31.5 bar at the rod end and read the 41.7 bar as a bypass.
    let pi = std::f64::consts::PI;
    let (a_cap, a_rod) = (pi * 0.01 / 4.0, pi * 0.0049 / 4.0);
    let a_ann = a_cap - a_rod;
    let (k, alpha, dt, x, l) = (1.5e9, 7e-4, 3.0, 0.5, 1.0);
    let rod = k * alpha * dt * (1.0 + a_rod / (a_cap * (l - x) / x + a_ann));
    let cap = rod * a_ann / a_cap;
    let lift = alpha * dt * a_rod / (a_cap / x + a_ann / (l - x));
    let held = 100e3 / a_cap;
    let input = boom();
    let mut r = readings(-lift, 20.0, 40.0, 40.0 + dt);
    r.pressures = PortPressures {
        cap_start: Some(held),
        cap_end: Some(held + cap),
        rod_start: Some(0.0),
        rod_end: Some(rod),
    };
    let report = drift::analyse_drift(&input, &r, UnitSystem::Metric).unwrap();
    assert_eq!(
        report.diagnosis,
        Diagnosis::NoLeak,
        "{:?}",
        report.reasoning
    );
    close(report.thermal_drift, -lift, 0.06, "thermal drift (6 %)");
    close(
        report.thermal_rod_change,
        rod,
        0.06,
        "expected rod-end rise",
    );
    assert!(!report.other_end.open);
}

#[test]
fn cooling_with_the_rod_end_blocked_at_zero_cavitates_it_and_the_cap_end_sets_the_drift() {
    // Cooling 6 K with the rod end blocked at 0 gauge: coupled, the rod end falls at
    // K alpha (1 + A_rod/(A_cap + A_ann)) per K (check case above, x = L/2) and reaches vacuum
    // (-1 atm, 101,325 Pa) after the share s = p_atm / (that x 6 K) of the cooling; from there
    // it cannot fall further and the cap end alone sets the drift, alpha x dT (common
    // practice). Drift [C]: s alpha dT A_rod/(A_cap/x + A_ann/(L-x)) + (1 - s) alpha x dT.
    let pi = std::f64::consts::PI;
    let (a_cap, a_rod) = (pi * 0.01 / 4.0, pi * 0.0049 / 4.0);
    let a_ann = a_cap - a_rod;
    let (k, alpha, dt, x) = (1.5e9, 7e-4, 6.0, 0.5);
    let rate = k * alpha * dt * (1.0 + a_rod / (a_cap + a_ann));
    let s = 101_325.0 / rate;
    let expected = s * alpha * dt * a_rod / (a_cap / x + a_ann / x) + (1.0 - s) * alpha * x * dt;
    let mut input = boom();
    input.valves.rod_centre = Some(Centre::Blocked);
    let report = drift::analyse_drift(
        &input,
        &readings(expected, 30.0, 50.0, 44.0),
        UnitSystem::Metric,
    )
    .unwrap();
    close(report.thermal_drift, expected, 0.06, "thermal drift (6 %)");
    close(
        report.thermal_rod_change,
        -101_325.0,
        FIGURE,
        "rod end at vacuum",
    );
}

#[test]
fn with_the_rod_end_open_to_tank_a_leak_cannot_be_told_from_a_bypass() {
    let mut input = boom();
    input.valves.rod_centre = Some(Centre::OpenToTank);
    let mut r = readings(8e-3, 10.0, 40.0, 40.0);
    r.pressures = PortPressures {
        cap_start: Some(127e5),
        cap_end: Some(127e5),
        rod_start: Some(0.0),
        rod_end: Some(0.0),
    };
    let report = drift::analyse_drift(&input, &r, UnitSystem::Metric).unwrap();
    assert_eq!(report.diagnosis, Diagnosis::Inconclusive);
    assert!(
        report.reasoning.iter().any(|s| s.contains("open to tank")),
        "{:?}",
        report.reasoning
    );
    // No pressures and nothing recorded: the analysis says it took the port as blocked.
    let report = drift::analyse_drift(
        &boom(),
        &readings(8e-3, 10.0, 40.0, 40.0),
        UnitSystem::Metric,
    )
    .unwrap();
    assert!(
        report
            .reasoning
            .iter()
            .any(|s| s.contains("taken as blocked")),
        "{:?}",
        report.reasoning
    );
}
