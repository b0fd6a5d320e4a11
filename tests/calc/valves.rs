//! Load-holding valves and the valve centre (issue 12, fix 5 and "What to build" 3).

use crate::{FIGURE, close};
use loadhold::calc::analysis::{self, CylinderInput, SEAL_BYPASS};
use loadhold::calc::bypass::Outcome;
use loadhold::calc::cylinder::{Cylinder, LoadDirection};
use loadhold::calc::quantity::UnitSystem;
use loadhold::calc::ratings::{Exposure, Rating, Status};
use loadhold::calc::valves::{Centre, HoldingValve, PilotSource, ValveKind};
use std::f64::consts::PI;

const A_CAP: f64 = PI * 0.1 * 0.1 / 4.0;
const A_ROD: f64 = PI * 0.07 * 0.07 / 4.0;
const A_ANN: f64 = A_CAP - A_ROD;

fn boom(direction: LoadDirection, valve: Option<HoldingValve>) -> CylinderInput {
    let mut input = CylinderInput::new(Cylinder::new(0.100, 0.070, 1.0).unwrap(), 100e3, direction);
    input.position = Some(0.5);
    input.valves.holding = valve;
    input
}

fn counterbalance(setting: f64, ratio: f64, pilot: PilotSource) -> Option<HoldingValve> {
    Some(HoldingValve {
        kind: ValveKind::Counterbalance,
        setting: Some(setting),
        pilot_ratio: Some(ratio),
        pilot,
    })
}

#[test]
fn counterbalance_pilot_from_the_other_port_also_pushes_the_piston() {
    // REFERENCES.md last entry [C], force balance on valve and piston:
    // valve opens at p_hold + R p_pilot = p_set; piston p_hold A_hold = F + p_pilot A_other.
    // Eliminating p_hold: p_pilot = (p_set - F/A_hold) / (R + A_other/A_hold).
    for (dir, a_hold, a_other) in [
        (LoadDirection::Retract, A_CAP, A_ANN),
        (LoadDirection::Extend, A_ANN, A_CAP),
    ] {
        let f = 100e3;
        let (p_set, r) = (1.3 * f / a_hold, 3.0);
        let input = boom(dir, counterbalance(p_set, r, PilotSource::OtherPort));
        let report = analysis::analyse(&input, UnitSystem::Metric).unwrap();
        let expected = (p_set - f / a_hold) / (r + a_other / a_hold);
        let got = report
            .holding_valve
            .unwrap()
            .pilot_opening_pressure
            .unwrap();
        close(got, expected, FIGURE, "pilot from the other port");
        close(
            report.counterbalance.pilot_opening_pressure.unwrap(),
            expected,
            FIGURE,
            "counterbalance block, same circuit",
        );
        // Both balances hold at that pilot pressure.
        let p_hold = f / a_hold + got * a_other / a_hold;
        close(p_hold + r * got, p_set, FIGURE, "valve balance");
        // External pilot: p_pilot = (p_set - F/A_hold) / R.
        let input = boom(dir, counterbalance(p_set, r, PilotSource::External));
        let report = analysis::analyse(&input, UnitSystem::Us).unwrap();
        close(
            report
                .holding_valve
                .unwrap()
                .pilot_opening_pressure
                .unwrap(),
            (p_set - f / a_hold) / r,
            FIGURE,
            "external pilot",
        );
    }
}

#[test]
fn a_counterbalance_figure_without_a_recorded_valve_uses_the_other_port_circuit() {
    // The suggested setting 1.3 F/A_cap (common practice, REFERENCES.md "Trade facts") with
    // the top-level pilot ratio 4: p_pilot = 0.3 F/A_cap / (4 + A_ann/A_cap) [C].
    let mut input = boom(LoadDirection::Retract, None);
    input.pilot_ratio = Some(4.0);
    let cb = analysis::analyse(&input, UnitSystem::Metric)
        .unwrap()
        .counterbalance;
    close(cb.setting, 1.3 * 100e3 / A_CAP, FIGURE, "suggested setting");
    close(
        cb.pilot_opening_pressure.unwrap(),
        0.3 * 100e3 / A_CAP / (4.0 + A_ANN / A_CAP),
        FIGURE,
        "pilot opening",
    );
}

#[test]
fn a_pilot_check_opens_at_the_load_over_ratio_less_the_area_ratio() {
    // Check opens at R p_pilot = p_hold (spring neglected, common practice), with
    // p_hold = F/A_hold + p_pilot A_other/A_hold (force balance on the piston) [C]:
    // p_pilot = (F/A_hold) / (R - A_other/A_hold). Pulling load, R = 1.5 below the area ratio
    // 1.96: the pilot never opens it.
    let check = |r, pilot| {
        Some(HoldingValve {
            kind: ValveKind::PilotCheck,
            setting: None,
            pilot_ratio: Some(r),
            pilot,
        })
    };
    let report = analysis::analyse(
        &boom(LoadDirection::Retract, check(4.0, PilotSource::OtherPort)),
        UnitSystem::Metric,
    )
    .unwrap();
    close(
        report
            .holding_valve
            .unwrap()
            .pilot_opening_pressure
            .unwrap(),
        100e3 / A_CAP / (4.0 - A_ANN / A_CAP),
        FIGURE,
        "other port",
    );
    assert!(
        report
            .cautions
            .iter()
            .any(|c| c.contains("does not relieve")),
        "{:?}",
        report.cautions
    );
    let pulled = analysis::analyse(
        &boom(LoadDirection::Extend, check(1.5, PilotSource::OtherPort)),
        UnitSystem::Metric,
    )
    .unwrap();
    assert_eq!(pulled.holding_valve.unwrap().pilot_opening_pressure, None);
    let external = analysis::analyse(
        &boom(LoadDirection::Extend, check(1.5, PilotSource::External)),
        UnitSystem::Metric,
    )
    .unwrap();
    close(
        external
            .holding_valve
            .unwrap()
            .pilot_opening_pressure
            .unwrap(),
        100e3 / A_ANN / 1.5,
        FIGURE,
        "external",
    );
}

#[test]
fn a_counterbalance_valve_caps_a_bypass_at_its_setting_and_the_load_creeps() {
    // F/A_rod = 100 kN / 38.48 cm² = 259.8 bar [C] is above a 200 bar setting: the valve
    // relieves, both ends stop at 200 bar and the load creeps.
    let mut input = boom(
        LoadDirection::Retract,
        counterbalance(200e5, 3.0, PilotSource::OtherPort),
    );
    input.ratings.push(Rating {
        component: "rod_line".into(),
        exposure: Exposure::Rod,
        rating: 190e5,
    });
    let report = analysis::analyse(&input, UnitSystem::Metric).unwrap();
    assert_eq!(report.seal_bypass.outcome, Outcome::Creeps);
    close(
        report.seal_bypass.final_pressure.unwrap(),
        200e5,
        FIGURE,
        "both ends at the setting",
    );
    let check = report
        .checks
        .iter()
        .find(|k| k.scenario == SEAL_BYPASS && k.component == "rod_line")
        .unwrap();
    assert_eq!(check.status, Status::Exceeds, "200 bar on a 190 bar line");
    assert!(report.cautions.iter().any(|c| c.contains("creeps")));
    // Set above F/A_rod it never opens and the bypass intensifies as without it.
    let input = boom(
        LoadDirection::Retract,
        counterbalance(300e5, 3.0, PilotSource::OtherPort),
    );
    let report = analysis::analyse(&input, UnitSystem::Metric).unwrap();
    assert_eq!(report.seal_bypass.outcome, Outcome::Intensifies);
    close(
        report.seal_bypass.final_pressure.unwrap(),
        100e3 / A_ROD,
        FIGURE,
        "F / A_rod",
    );
}

#[test]
fn a_rod_end_open_to_tank_lets_a_bypassing_load_sink_without_intensifying() {
    let mut input = boom(LoadDirection::Retract, None);
    input.valves.rod_centre = Some(Centre::OpenToTank);
    let report = analysis::analyse(&input, UnitSystem::Metric).unwrap();
    assert_eq!(report.seal_bypass.outcome, Outcome::Sinks);
    assert_eq!(report.seal_bypass.final_pressure, None);
    assert!(
        !report.scenarios.iter().any(|s| s.name == SEAL_BYPASS),
        "no bypass pressure to check"
    );
    assert!(report.hazards.iter().any(|h| h.contains("sinks")));
    assert!(
        report
            .cautions
            .iter()
            .any(|c| c.contains("may not hold its load"))
    );
}

#[test]
fn a_holding_end_open_to_tank_without_a_valve_is_refused_naming_the_port() {
    let mut input = boom(LoadDirection::Retract, None);
    input.valves.cap_centre = Some(Centre::OpenToTank);
    let err = analysis::analyse(&input, UnitSystem::Metric).unwrap_err();
    assert_eq!(err.field, "cap_port_centre");
    // With a counterbalance valve on that end it holds (motor-spool centre, common practice).
    input.valves.holding = counterbalance(170e5, 3.0, PilotSource::OtherPort);
    assert!(analysis::analyse(&input, UnitSystem::Metric).is_ok());
    let mut bad = boom(
        LoadDirection::Retract,
        counterbalance(f64::NAN, 3.0, PilotSource::OtherPort),
    );
    assert_eq!(
        analysis::analyse(&bad, UnitSystem::Metric)
            .unwrap_err()
            .field,
        "holding_valve_setting"
    );
    bad.valves.holding = counterbalance(170e5, -1.0, PilotSource::OtherPort);
    assert_eq!(
        analysis::analyse(&bad, UnitSystem::Metric)
            .unwrap_err()
            .field,
        "holding_valve_pilot_ratio"
    );
}
