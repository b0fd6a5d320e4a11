//! Piston seal bypass: final pressure, factor, settle drift, run-away.

use crate::geometry::from_areas;
use crate::{DRIFT, FIGURE, IN, LBF, PSI, close};
use loadhold::calc::analysis::{self, CylinderInput, SEAL_BYPASS};
use loadhold::calc::bypass::{Outcome, TubeWall};
use loadhold::calc::cylinder::{Cylinder, LoadDirection};
use loadhold::calc::quantity::UnitSystem;
use loadhold::calc::ratings::{Exposure, Rating, Status};

#[test]
fn bypass_on_a_2_square_inch_rod_reaches_5000_psi_above_a_3000_psi_line() {
    // REFERENCES.md "Trade facts" (common practice): 10,000 lbf, 10 in² piston, 2 in² rod:
    // 1,000 psi held, 5,000 psi with a bypassing piston seal, above a 3,000 psi line rating.
    let c = from_areas(10.0 * IN * IN, 2.0 * IN * IN, 24.0 * IN);
    let mut input = CylinderInput::new(c, 10_000.0 * LBF, LoadDirection::Retract);
    input.ratings.push(Rating {
        component: "cap_line".into(),
        exposure: Exposure::Cap,
        rating: 3000.0 * PSI,
    });
    let report = analysis::analyse(&input, UnitSystem::Us).unwrap();
    assert_eq!(report.seal_bypass.outcome, Outcome::Intensifies);
    close(
        report.holding.cap_pressure / PSI,
        1000.0,
        FIGURE,
        "holding pressure",
    );
    close(
        report.seal_bypass.final_pressure.unwrap() / PSI,
        5000.0,
        FIGURE,
        "bypass pressure",
    );
    close(
        report.seal_bypass.intensification_factor.unwrap(),
        5.0,
        FIGURE,
        "factor A_cap/A_rod",
    );
    let check = report
        .checks
        .iter()
        .find(|k| k.component == "cap_line" && k.scenario == SEAL_BYPASS)
        .expect("a seal-bypass check on the cap line");
    assert_eq!(check.status, Status::Exceeds);
    let normal = report
        .checks
        .iter()
        .find(|k| k.scenario == analysis::NORMAL_HOLDING)
        .unwrap();
    assert_eq!(
        normal.status,
        Status::Ok,
        "1,000 psi on a 3,000 psi line is ok"
    );
    assert!(
        report.hazards.iter().any(|h| h.contains("5000 psi")),
        "hazards: {:?}",
        report.hazards
    );
}

#[test]
fn a_load_pulling_the_rod_out_runs_away_with_no_final_pressure() {
    // REFERENCES.md "Trade facts" (common practice): a bypassing piston cannot hold a load
    // that pulls the rod out; the cylinder runs out and the chambers cavitate.
    let c = Cylinder::new(0.1, 0.07, 1.0).unwrap();
    let input = CylinderInput::new(c, 50e3, LoadDirection::Extend);
    let report = analysis::analyse(&input, UnitSystem::Metric).unwrap();
    assert_eq!(report.seal_bypass.outcome, Outcome::RunsAway);
    assert_eq!(report.seal_bypass.final_pressure, None);
    assert_eq!(report.seal_bypass.settle_drift, None);
    assert!(
        report
            .cautions
            .iter()
            .any(|c| c.contains("may not hold its load"))
    );
}

#[test]
fn a_bypassing_cylinder_settles_a_little_then_stops() {
    // REFERENCES.md "Trade facts" (common practice): a healthy cylinder with such a fault
    // still settles a little, then stops. 100 kN on 100/70 mm at half stroke, 121 mm steel
    // tube. By hand [C], mass balance (definition of the bulk modulus):
    // A_rod dx = C_cap (F/A_rod - F/A_cap) + C_rod F/A_rod, with
    // C_cap = x (A_cap/B + g), C_rod = (L - x)(A_ann/B + g + s), g = A_cap 2 u_a/(a p) the
    // bore's area growth (Lamé, plane stress: u_a/p = (a/E)((b² + a²)/(b² - a²) + nu)) and
    // s = A_rod 2 (1 - nu)/E the rod's shrinkage (REFERENCES.md "Added 2026-12-02").
    let c = Cylinder::new(0.100, 0.070, 1.0).unwrap();
    let mut input = CylinderInput::new(c, 100e3, LoadDirection::Retract);
    input.trapped.tube = Some(TubeWall::steel(0.121));
    let report = analysis::analyse(&input, UnitSystem::Metric).unwrap();
    let settle = report.seal_bypass.settle_drift.unwrap();
    let pi = std::f64::consts::PI;
    let (a_cap, a_rod) = (pi * 0.01 / 4.0, pi * 0.0049 / 4.0);
    let a_ann = a_cap - a_rod;
    let (a, b, e, nu, k) = (0.05f64, 0.0605f64, 210e9, 0.3, 1.5e9);
    let g = a_cap * 2.0 * (a / e) * ((b * b + a * a) / (b * b - a * a) + nu) / a;
    let s = a_rod * 2.0 * (1.0 - nu) / e;
    let (p0, pf, x) = (100e3 / a_cap, 100e3 / a_rod, 0.5);
    let by_hand = (x * (a_cap / k + g) * (pf - p0) + (1.0 - x) * (a_ann / k + g + s) * pf) / a_rod;
    close(settle, by_hand, DRIFT, "settle drift");
    assert!(settle < report.position, "stops before the end of stroke");
    assert!(!report.seal_bypass.bottoms);
}
