//! The decision table (`calc::decision::RULES`), row by row, and two whole cases built on the
//! piston-seal-bypass trade fact of REFERENCES.md (common practice): 10,000 lbf on a 10 in^2
//! piston is 1,000 psi; with a 2 in^2 rod a bypass brings both ends to 5,000 psi, above a
//! 3,000 psi line rating.
//!
//! The rules are ours (DEVELOPERS.md "Rules the code chose"); each row is checked with findings
//! that only it reads, so a row that stopped applying, or applied too widely, fails here.

use crate::{IN, LBF, PSI, close};
use loadhold::calc::analysis::{
    self, CylinderInput, NORMAL_HOLDING, ROD_SIDE_INTENSIFICATION, SEAL_BYPASS, TRAPPED_OIL_HEATING,
};
use loadhold::calc::cylinder::{Cylinder, LoadDirection};
use loadhold::calc::decision::{Decision, Findings, InspectionResult, Measured, RULES, decide};
use loadhold::calc::decision_findings;
use loadhold::calc::diagnosis::Diagnosis;
use loadhold::calc::drift::Verdict;
use loadhold::calc::quantity::UnitSystem;
use loadhold::calc::ratings::{Check, Exposure, Rating, Status};

const M: UnitSystem = UnitSystem::Metric;

fn check(scenario: &'static str, pressure: f64, rating: f64) -> Check {
    Check {
        component: "rod_line".into(),
        exposure: Exposure::Rod,
        scenario,
        pressure,
        rating,
        status: loadhold::calc::ratings::status(pressure, rating),
        load: 0.0,
    }
}

/// The rule names that gave reasons.
fn rules(f: &Findings) -> Vec<&'static str> {
    decide(f, M).reasons.iter().map(|r| r.rule).collect()
}

fn passing() -> Findings {
    Findings {
        verdict: Some(Verdict::Pass),
        diagnosis: Some(Diagnosis::NoLeak),
        ..Findings::default()
    }
}

#[test]
fn a_clean_pass_is_fit_for_service_with_one_reason_saying_so() {
    let r = decide(&passing(), M);
    assert_eq!(r.decision, Decision::FitForService);
    assert_eq!(rules(&passing()), vec!["nothing_found"]);
    assert!(r.restrictions().is_empty());
}

#[test]
fn row_limit_failed_removes_from_service() {
    let f = Findings {
        verdict: Some(Verdict::Fail),
        ..passing()
    };
    assert_eq!(decide(&f, M).decision, Decision::RemoveFromService);
    assert_eq!(rules(&f), vec!["limit_failed"]);
}

#[test]
fn row_bypass_found_removes_from_service_even_within_the_limit() {
    let f = Findings {
        diagnosis: Some(Diagnosis::PistonSealBypass),
        ..passing()
    };
    assert_eq!(decide(&f, M).decision, Decision::RemoveFromService);
    assert_eq!(rules(&f), vec!["bypass_found"]);
}

#[test]
fn row_measured_above_rating_removes_from_service() {
    let f = Findings {
        measured_over: vec![Measured {
            component: "cap_line".into(),
            pressure: 220e5,
            rating: 210e5,
        }],
        ..passing()
    };
    let r = decide(&f, M);
    assert_eq!(r.decision, Decision::RemoveFromService);
    assert_eq!(rules(&f), vec!["measured_above_rating"]);
    assert!(
        r.reasons[0].text.contains("220 bar"),
        "{}",
        r.reasons[0].text
    );
}

#[test]
fn row_pressure_above_rating_now_removes_from_service() {
    // Normal holding is always happening: 220 bar on a 210 bar line.
    let f = Findings {
        checks: vec![check(NORMAL_HOLDING, 220e5, 210e5)],
        ..passing()
    };
    assert_eq!(decide(&f, M).decision, Decision::RemoveFromService);
    assert_eq!(rules(&f), vec!["pressure_above_rating_now"]);
}

#[test]
fn row_inspection_failed_removes_from_service() {
    let f = decision_findings::inspection_findings(InspectionResult::Fail);
    assert_eq!(decide(&f, M).decision, Decision::RemoveFromService);
    assert_eq!(rules(&f), vec!["inspection_failed"]);
}

#[test]
fn row_pressure_above_rating_possible_restricts_for_every_other_scenario() {
    // Any scenario that the record does not show happening restricts, whatever its name: the
    // named ones and one the core may add later.
    for scenario in [
        SEAL_BYPASS,
        ROD_SIDE_INTENSIFICATION,
        TRAPPED_OIL_HEATING,
        "a_scenario_added_later",
    ] {
        let f = Findings {
            checks: vec![check(scenario, 220e5, 210e5)],
            ..passing()
        };
        let r = decide(&f, M);
        assert_eq!(r.decision, Decision::Restricted, "{scenario}");
        assert_eq!(
            rules(&f),
            vec!["pressure_above_rating_possible"],
            "{scenario}"
        );
        assert!(
            !r.restrictions().is_empty(),
            "{scenario} says what to keep to"
        );
    }
}

#[test]
fn a_pressure_within_its_rating_or_low_margin_decides_nothing() {
    // 200 bar on 210 bar is within 10 % (low margin) but not above: no row applies.
    let f = Findings {
        checks: vec![
            check(NORMAL_HOLDING, 200e5, 210e5),
            check(SEAL_BYPASS, 100e5, 210e5),
        ],
        ..passing()
    };
    assert_eq!(f.checks[0].status, Status::LowMargin);
    assert_eq!(decide(&f, M).decision, Decision::FitForService);
}

#[test]
fn row_holding_circuit_leak_restricts_and_says_support_the_load() {
    let f = Findings {
        diagnosis: Some(Diagnosis::HoldingCircuitLeak),
        ..passing()
    };
    let r = decide(&f, M);
    assert_eq!(r.decision, Decision::Restricted);
    assert_eq!(rules(&f), vec!["holding_circuit_leak"]);
    assert!(r.restrictions()[0].contains("support or lower it"));
}

#[test]
fn row_cause_not_known_restricts() {
    let f = Findings {
        diagnosis: Some(Diagnosis::Inconclusive),
        ..passing()
    };
    assert_eq!(decide(&f, M).decision, Decision::Restricted);
    assert_eq!(rules(&f), vec!["cause_not_known"]);
}

#[test]
fn row_settles_as_oil_cools_restricts() {
    let f = Findings {
        diagnosis: Some(Diagnosis::ThermalContraction),
        ..passing()
    };
    assert_eq!(decide(&f, M).decision, Decision::Restricted);
    assert_eq!(rules(&f), vec!["settles_as_oil_cools"]);
}

#[test]
fn row_inspection_deficiencies_restricts_and_a_pass_is_fit() {
    let f = decision_findings::inspection_findings(InspectionResult::PassWithDeficiencies);
    assert_eq!(decide(&f, M).decision, Decision::Restricted);
    assert_eq!(rules(&f), vec!["inspection_deficiencies"]);
    let f = decision_findings::inspection_findings(InspectionResult::Pass);
    assert_eq!(decide(&f, M).decision, Decision::FitForService);
}

#[test]
fn the_most_severe_row_wins_and_every_reason_is_kept_most_severe_first() {
    let f = Findings {
        verdict: Some(Verdict::Fail),
        diagnosis: Some(Diagnosis::HoldingCircuitLeak),
        checks: vec![check(SEAL_BYPASS, 220e5, 210e5)],
        ..Findings::default()
    };
    let r = decide(&f, M);
    assert_eq!(r.decision, Decision::RemoveFromService);
    assert_eq!(
        rules(&f),
        vec![
            "limit_failed",
            "pressure_above_rating_possible",
            "holding_circuit_leak"
        ]
    );
}

#[test]
fn every_row_has_a_distinct_name() {
    let mut names: Vec<&str> = RULES.iter().map(|r| r.name).collect();
    names.sort_unstable();
    names.dedup();
    assert_eq!(names.len(), RULES.len());
}

/// The REFERENCES.md bypass case: cap area 10 in^2, rod area 2 in^2, 10,000 lbf pushing the rod
/// in, both lines rated 3,000 psi.
fn reference_case() -> CylinderInput {
    let bore = (4.0 * 10.0 / std::f64::consts::PI).sqrt() * IN;
    let rod = (4.0 * 2.0 / std::f64::consts::PI).sqrt() * IN;
    let mut input = CylinderInput::new(
        Cylinder::new(bore, rod, 24.0 * IN).unwrap(),
        10_000.0 * LBF,
        LoadDirection::Retract,
    );
    for (component, exposure) in [("cap_line", Exposure::Cap), ("rod_line", Exposure::Rod)] {
        input.ratings.push(Rating {
            component: component.into(),
            exposure,
            rating: 3_000.0 * PSI,
        });
    }
    input
}

#[test]
fn a_hose_under_the_bypass_pressure_restricts_a_sound_cylinder_and_removes_a_bypassing_one() {
    let input = reference_case();
    let report = analysis::analyse(&input, M).unwrap();
    close(
        report.holding.cap_pressure,
        1_000.0 * PSI,
        0.005,
        "holding, force balance",
    );
    let bypass = report
        .checks
        .iter()
        .find(|k| k.scenario == SEAL_BYPASS && k.component == "rod_line")
        .expect("bypass check on the rod line");
    // Both ends near load / rod area = 5,000 psi (a little less as the oil compresses).
    close(bypass.pressure, 5_000.0 * PSI, 0.02, "bypass pressure");
    assert_eq!(bypass.status, Status::Exceeds);

    let sound = Findings {
        verdict: Some(Verdict::Pass),
        diagnosis: Some(Diagnosis::NoLeak),
        checks: report.checks.clone(),
        ..Findings::default()
    };
    let r = decide(&sound, UnitSystem::Us);
    assert_eq!(
        r.decision,
        Decision::Restricted,
        "a hazard never sits beside a plain pass"
    );
    assert!(
        r.reasons
            .iter()
            .all(|x| x.rule == "pressure_above_rating_possible")
    );

    let bypassing = Findings {
        diagnosis: Some(Diagnosis::PistonSealBypass),
        ..sound
    };
    let r = decide(&bypassing, UnitSystem::Us);
    assert_eq!(r.decision, Decision::RemoveFromService);
    let names: Vec<&str> = r.reasons.iter().map(|x| x.rule).collect();
    assert!(names.contains(&"bypass_found"));
    assert!(names.contains(&"pressure_above_rating_now"), "{names:?}");
}

#[test]
fn a_gauge_reading_above_its_end_rating_is_measured_over_only_on_that_end() {
    let input = reference_case();
    // 3,200 psi read on the rod end: above the rod line's 3,000 psi, not the cap line's.
    let over = decision_findings::measured_over(
        &input.ratings,
        &[
            (Exposure::Cap, Some(1_000.0 * PSI)),
            (Exposure::Rod, Some(3_200.0 * PSI)),
        ],
    );
    assert_eq!(over.len(), 1);
    assert_eq!(over[0].component, "rod_line");
    close(over[0].pressure, 3_200.0 * PSI, 1e-9, "reading kept");
}
