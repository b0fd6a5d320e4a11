//! Piston seal bypass: final pressure, factor, settle drift, run-away.

use crate::geometry::from_areas;
use crate::{DRIFT, FIGURE, IN, LBF, PSI, close};
use loadhold::calc::analysis::{self, CylinderInput, SEAL_BYPASS};
use loadhold::calc::bypass::{self, Line, Outcome, Trapped, TubeWall};
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

/// An independent model of the settle: oil obeying `rho = rho0 exp(p / B)` (the integrated
/// definition of the bulk modulus), walls growing linearly with pressure, and the oil mass
/// conserved exactly (not linearised). Returns how far the rod goes in, m.
fn settle_by_mass_balance(
    c: &Cylinder,
    x0: f64,
    load: f64,
    b: f64,
    tube_per_pa: f64,
    lines: (f64, f64),
    line_per_pa: (f64, f64),
) -> f64 {
    let (ac, ar, aa, l) = (c.cap_area(), c.rod_area(), c.annulus_area(), c.stroke);
    let p0 = load / ac;
    let pf = load / ar;
    let mass = (ac * x0 * (1.0 + tube_per_pa * p0) + lines.0 + line_per_pa.0 * p0) * (p0 / b).exp()
        + aa * (l - x0)
        + lines.1;
    // Final: (A_cap x1 + A_ann (L - x1)) (1 + c pf) + lines + line growth = mass e^(-pf/B).
    let room = mass * (-pf / b).exp() - lines.0 - lines.1 - (line_per_pa.0 + line_per_pa.1) * pf;
    let x1 = (room / (1.0 + tube_per_pa * pf) - aa * l) / (ac - aa);
    x0 - x1
}

#[test]
fn settle_drift_agrees_with_an_exact_mass_balance() {
    // [C] mass conservation with the bulk-modulus definition; tube growth per pascal from the
    // Lamé plane-stress bore growth (REFERENCES.md "Tube and rod strength"):
    // dV/V per Pa = 2 u / (a p) = (2/E) ((b² + a²)/(b² - a²) + nu).
    let c = Cylinder::new(0.100, 0.070, 1.0).unwrap();
    let (x0, load, b) = (0.5, 100e3, 1.5e9);
    let (e, nu, od) = (210e9, 0.3, 0.121);
    let (a2, b2) = ((c.bore / 2.0).powi(2), (od / 2.0_f64).powi(2));
    let tube_per_pa = 2.0 / e * ((b2 + a2) / (b2 - a2) + nu);
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
    let exact = settle_by_mass_balance(&c, x0, load, b, tube_per_pa, lines, swell);
    close(
        ours,
        exact,
        DRIFT,
        "settle drift with lines, hose swell and tube",
    );

    // Oil alone, rigid walls and no lines.
    let rigid = Trapped {
        bulk_modulus: b,
        cap_line: Line::default(),
        rod_line: Line::default(),
        tube: None,
    };
    let ours = bypass::seal_bypass(&c, x0, load, LoadDirection::Retract, &rigid)
        .settle_drift
        .unwrap();
    let exact = settle_by_mass_balance(&c, x0, load, b, 0.0, (0.0, 0.0), (0.0, 0.0));
    close(ours, exact, DRIFT, "settle drift, oil only");
}

#[test]
fn a_bypassing_cylinder_settles_a_little_then_stops() {
    // REFERENCES.md "Trade facts" (common practice): a healthy cylinder with such a fault
    // still settles a little, then stops. Here: 100 kN on 100/70 mm at half stroke settles
    // by about 19.5 mm [C: 133 bar over 3.9 L in the cap end and 260 bar over 2.0 L in the rod
    // end, at 1.39 GPa with the tube, over the 38.5 cm² rod], and stops long before the piston
    // reaches the end of its stroke.
    let c = Cylinder::new(0.100, 0.070, 1.0).unwrap();
    let mut input = CylinderInput::new(c, 100e3, LoadDirection::Retract);
    input.trapped.tube = Some(TubeWall::steel(0.121));
    let report = analysis::analyse(&input, UnitSystem::Metric).unwrap();
    let settle = report.seal_bypass.settle_drift.unwrap();
    close(settle, 19.5e-3, DRIFT, "settle drift");
    assert!(settle < report.position, "stops before the end of stroke");
}
