//! Worst load in the recorded range, every scenario against the relief setting, and plain
//! words where an end has no rating.
//!
//! Expected values come from the force balance on the piston written out here (REFERENCES.md
//! "Trade facts" and "Flow and circuits", common practice):
//!   holding (load pushing the rod in)  p_cap = F / A_cap;
//!   piston seal bypass                 p = F / A_rod;
//!   rod-side intensification           p_rod = (p_supply A_cap - F) / A_annulus.

use crate::{FIGURE, PSI, close};
use loadhold::calc::analysis::{
    self, CylinderInput, NORMAL_HOLDING, ROD_SIDE_INTENSIFICATION, SEAL_BYPASS,
};
use loadhold::calc::cautions;
use loadhold::calc::cylinder::{Cylinder, LoadDirection};
use loadhold::calc::limits::{self, RELIEF_SETTING};
use loadhold::calc::quantity::UnitSystem;
use loadhold::calc::ratings::{Exposure, Rating, Status};
use std::f64::consts::PI;

fn rating(component: &str, exposure: Exposure, pa: f64) -> Rating {
    Rating {
        component: component.into(),
        exposure,
        rating: pa,
    }
}

/// The 140/95 mm example of issue 12: 250 bar relief, 180 kN highest load pushing the rod in,
/// cylinder rated 350 bar, no lowest load recorded (0 N).
fn example_140_95() -> CylinderInput {
    let c = Cylinder::new(0.140, 0.095, 1.0).unwrap();
    let mut input = CylinderInput::new(c, 180e3, LoadDirection::Retract);
    input.min_load = Some(0.0);
    input.supply_pressure = Some(250e5);
    input
        .ratings
        .push(rating("cylinder", Exposure::Both, 350e5));
    input
}

#[test]
fn blocked_rod_end_of_the_140_95_example_is_worst_with_no_load() {
    // With the load: (250e5 x pi/4 x 0.14^2 - 180e3) / (pi/4 x (0.14^2 - 0.095^2))
    //   = (384,845 - 180,000) / 8.3056e-3 = 246.6 bar (what the panel showed).
    // With no load: 250 bar x 140^2 / (140^2 - 95^2) = 250 x 19600 / 10575 = 463.4 bar,
    // above the 350 bar rating (the issue rounds it to 463 bar).
    let input = example_140_95();
    let r = analysis::analyse(&input, UnitSystem::Metric).unwrap();
    let hand_light = 250e5 * 0.14f64.powi(2) / (0.14f64.powi(2) - 0.095f64.powi(2));
    close(hand_light / 1e5, 463.36, FIGURE, "by hand");
    let check = r
        .checks
        .iter()
        .find(|k| k.component == "cylinder" && k.scenario == ROD_SIDE_INTENSIFICATION)
        .expect("cylinder against rod-side");
    close(
        check.pressure,
        hand_light,
        FIGURE,
        "rod-side on the cylinder",
    );
    assert_eq!(check.status, Status::Exceeds);
    assert_eq!(check.load, 0.0, "found with no load");
    close(
        r.rod_side_intensification.unwrap(),
        hand_light,
        FIGURE,
        "rod-side figure",
    );
    // The holding pressure stays at the heavy load: 180e3 / 1.5394e-2 = 116.9 bar.
    let hold = r
        .scenarios
        .iter()
        .find(|s| s.name == NORMAL_HOLDING)
        .unwrap();
    close(hold.cap / 1e5, 116.93, FIGURE, "holding at 180 kN");
    assert_eq!(hold.cap_load, 180e3);
    assert!(
        r.hazards
            .iter()
            .any(|h| h.contains("463.4 bar") && h.contains("350 bar")),
        "{:?}",
        r.hazards
    );
    assert!(r.cautions.contains(&cautions::OVER_RATING));
}

#[test]
fn the_140_95_example_in_us_units() {
    // The same cylinder entered in inches and pounds: 5.5118 in / 3.7402 in, 3626 psi relief,
    // 40,466 lbf, rated 5076 psi. p_rod with no load = 3626 x 5.5118^2 / (5.5118^2 - 3.7402^2)
    // = 3626 x 1.85343 = 6720.5 psi (463.4 bar), above 5076 psi.
    let inch = 0.0254;
    let c = Cylinder::new(5.5118 * inch, 3.7402 * inch, 40.0 * inch).unwrap();
    let mut input = CylinderInput::new(c, 40_466.0 * 4.448_221_615_260_5, LoadDirection::Retract);
    input.min_load = Some(0.0);
    input.supply_pressure = Some(3626.0 * PSI);
    input
        .ratings
        .push(rating("cylinder", Exposure::Both, 5076.0 * PSI));
    let r = analysis::analyse(&input, UnitSystem::Us).unwrap();
    let (b, d) = (5.5118f64, 3.7402f64);
    let hand = 3626.0 * b * b / (b * b - d * d);
    close(hand, 6720.5, FIGURE, "by hand, psi");
    let check = r
        .checks
        .iter()
        .find(|k| k.component == "cylinder" && k.scenario == ROD_SIDE_INTENSIFICATION)
        .unwrap();
    close(check.pressure / PSI, hand, FIGURE, "rod-side, psi");
    assert_eq!(check.status, Status::Exceeds);
    assert!(
        r.hazards
            .iter()
            .any(|h| h.contains("psi") && h.contains("0 lbf")),
        "{:?}",
        r.hazards
    );
}

#[test]
fn cap_end_is_worst_at_the_heavy_load_and_rod_end_at_the_light_load() {
    // 100/70 mm, load pushing the rod in between 20 kN and 100 kN, 200 bar supply.
    // A_cap = 7.8540e-3, A_rod = 3.8485e-3, A_annulus = 4.0055e-3 m^2.
    //   bypass (both ends): 100 kN / A_rod = 259.8 bar (at 100 kN) vs 52.0 bar (at 20 kN);
    //   rod-side, rod end: (200e5 x 7.8540e-3 - F) / 4.0055e-3 = 142.5 bar at 100 kN,
    //                      342.2 bar at 20 kN; its cap end is the supply, 200 bar, at either.
    let c = Cylinder::new(0.100, 0.070, 1.0).unwrap();
    let mut input = CylinderInput::new(c, 100e3, LoadDirection::Retract);
    input.min_load = Some(20e3);
    input.supply_pressure = Some(200e5);
    input.ratings = vec![
        rating("cap_line", Exposure::Cap, 400e5),
        rating("rod_line", Exposure::Rod, 400e5),
    ];
    let r = analysis::analyse(&input, UnitSystem::Metric).unwrap();
    let (a_cap, a_rod) = (PI / 4.0 * 0.01, PI / 4.0 * 0.0049);
    let a_ann = a_cap - a_rod;
    let rod_light = (200e5 * a_cap - 20e3) / a_ann;
    let rod_heavy = (200e5 * a_cap - 100e3) / a_ann;
    close(rod_light / 1e5, 342.2, FIGURE, "rod-side at 20 kN, by hand");
    close(
        rod_heavy / 1e5,
        142.5,
        FIGURE,
        "rod-side at 100 kN, by hand",
    );
    let rod_side = r
        .scenarios
        .iter()
        .find(|s| s.name == ROD_SIDE_INTENSIFICATION)
        .unwrap();
    close(rod_side.rod, rod_light, FIGURE, "rod-side rod end");
    assert_eq!(rod_side.rod_load, 20e3, "rod end worst at the light load");
    close(rod_side.cap, 200e5, FIGURE, "rod-side cap end at supply");
    assert_eq!(rod_side.cap_load, 100e3, "a tie names the heavy load");
    let bypass = r.scenarios.iter().find(|s| s.name == SEAL_BYPASS).unwrap();
    close(bypass.cap, 100e3 / a_rod, FIGURE, "bypass at 100 kN");
    assert_eq!((bypass.cap_load, bypass.rod_load), (100e3, 100e3));
    // Per component: the cap line's worst is at the heavy load, the rod line's at the light.
    let worst = |component: &str| {
        r.checks
            .iter()
            .filter(|k| k.component == component)
            .max_by(|a, b| a.pressure.total_cmp(&b.pressure))
            .unwrap()
    };
    assert_eq!(worst("cap_line").load, 100e3);
    assert_eq!(worst("rod_line").scenario, ROD_SIDE_INTENSIFICATION);
    assert_eq!(worst("rod_line").load, 20e3);
    close(worst("rod_line").pressure, rod_light, FIGURE, "rod line");
    // Without the range (the load alone) the rod-side figure is the heavy-load one.
    input.min_load = None;
    let r = analysis::analyse(&input, UnitSystem::Metric).unwrap();
    close(
        r.rod_side_intensification.unwrap(),
        rod_heavy,
        FIGURE,
        "one load",
    );
}

#[test]
fn a_pulling_load_is_worst_at_its_heaviest_everywhere() {
    // 100/70 mm, load pulling the rod out between 0 and 50 kN, 200 bar supply:
    // holding rod end 50 kN / 4.0055e-3 = 124.8 bar; rod-side (200e5 x 7.854e-3 + 50e3) /
    // 4.0055e-3 = 517.0 bar, both at 50 kN.
    let c = Cylinder::new(0.100, 0.070, 1.0).unwrap();
    let mut input = CylinderInput::new(c, 50e3, LoadDirection::Extend);
    input.min_load = Some(0.0);
    input.supply_pressure = Some(200e5);
    let r = analysis::analyse(&input, UnitSystem::Metric).unwrap();
    let rod_side = r
        .scenarios
        .iter()
        .find(|s| s.name == ROD_SIDE_INTENSIFICATION)
        .unwrap();
    close(rod_side.rod / 1e5, 517.0, FIGURE, "rod-side");
    assert_eq!(rod_side.rod_load, 50e3);
    let hold = r
        .scenarios
        .iter()
        .find(|s| s.name == NORMAL_HOLDING)
        .unwrap();
    close(hold.rod / 1e5, 124.83, FIGURE, "holding");
    assert_eq!(hold.rod_load, 50e3);
}

#[test]
fn a_scenario_above_the_relief_setting_with_no_ratings_carries_the_hazard() {
    // 100/70 mm, 200 kN pulling the rod out, 20 bar relief, nothing rated. Rod-side:
    // (20e5 x 7.854e-3 + 200e3) / 4.0055e-3 = 538.5 bar, 26.9 times the relief setting.
    let c = Cylinder::new(0.100, 0.070, 1.0).unwrap();
    let mut input = CylinderInput::new(c, 200e3, LoadDirection::Extend);
    input.supply_pressure = Some(20e5);
    let r = analysis::analyse(&input, UnitSystem::Metric).unwrap();
    let relief = r
        .checks
        .iter()
        .find(|k| {
            k.component == RELIEF_SETTING
                && k.exposure == Exposure::Rod
                && k.scenario == ROD_SIDE_INTENSIFICATION
        })
        .expect("rod end against the relief setting");
    close(relief.pressure / 1e5, 538.5, FIGURE, "rod-side");
    close(
        relief.pressure / relief.rating,
        26.93,
        FIGURE,
        "times relief",
    );
    assert_eq!(relief.status, Status::Exceeds);
    // Beyond the run-away warning: a hazard naming the rod end and the relief setting.
    assert!(
        r.hazards.iter().any(
            |h| h.starts_with("Rod end above the relief setting of 20 bar")
                && h.contains("rod-side intensification at supply pressure 538.5 bar (26.93 times")
        ),
        "{:?}",
        r.hazards
    );
    for caution in [
        cautions::ABOVE_RELIEF,
        cautions::OVER_RATING,
        cautions::NO_HANDS,
    ] {
        assert!(r.cautions.contains(&caution), "{caution}");
    }
    // Nothing rated: both ends say plainly that they cannot be checked.
    assert_eq!(r.notes.len(), 2, "{:?}", r.notes);
    assert!(r.notes.iter().all(|n| n.contains("cannot be checked")));
    assert!(
        r.notes[1].contains("rod end")
            && r.notes[1].contains("compared with the relief setting of 20 bar only"),
        "{}",
        r.notes[1]
    );
    // The cap end at the relief setting itself (rod-side scenario) is not above it.
    let cap = r
        .checks
        .iter()
        .find(|k| {
            k.component == RELIEF_SETTING
                && k.exposure == Exposure::Cap
                && k.scenario == ROD_SIDE_INTENSIFICATION
        })
        .unwrap();
    assert_eq!(cap.status, Status::Ok);
    // An unrated end's relief check decides the status; on a rated end the rating does.
    assert!(limits::decides_status(relief, &input.ratings));
    let rated = [rating("rod_line", Exposure::Rod, 600e5)];
    assert!(!limits::decides_status(relief, &rated));
}

#[test]
fn no_relief_setting_and_no_rating_say_nothing_can_be_compared() {
    let c = Cylinder::new(0.100, 0.070, 1.0).unwrap();
    let input = CylinderInput::new(c, 50e3, LoadDirection::Retract);
    let r = analysis::analyse(&input, UnitSystem::Metric).unwrap();
    assert!(r.checks.is_empty());
    assert_eq!(r.notes.len(), 2);
    assert!(
        r.notes
            .iter()
            .all(|n| n.contains("nothing can be compared"))
    );
    // A cylinder rating covers both ends: no note.
    let mut rated = input.clone();
    rated
        .ratings
        .push(rating("cylinder", Exposure::Both, 300e5));
    assert!(
        analysis::analyse(&rated, UnitSystem::Metric)
            .unwrap()
            .notes
            .is_empty()
    );
}

#[test]
fn a_lowest_load_above_the_load_is_refused_naming_min_load() {
    let c = Cylinder::new(0.100, 0.070, 1.0).unwrap();
    let mut input = CylinderInput::new(c, 50e3, LoadDirection::Retract);
    input.min_load = Some(60e3);
    let e = analysis::analyse(&input, UnitSystem::Metric).unwrap_err();
    assert_eq!(e.field, "min_load");
}

mod range_property {
    use super::*;
    use proptest::prelude::*;

    proptest! {
        #![proptest_config(ProptestConfig::with_cases(128))]

        /// No scenario shows a pressure below what any load in the recorded range gives: each
        /// end's figure is at least the same scenario's figure analysed at a load picked inside
        /// the range (the analysis at one load is the check; nothing here trusts the merge).
        #[test]
        fn no_scenario_is_below_any_load_of_the_range(
            bore in 0.02..0.5f64,
            k in 0.1..0.9f64,
            heavy in 0.0..2e6f64,
            light_share in 0.0..1.0f64,
            inside in 0.0..1.0f64,
            supply in 1e5..5e7f64,
            pull in any::<bool>(),
        ) {
            let c = Cylinder::new(bore, bore * k, 1.0).unwrap();
            let dir = if pull { LoadDirection::Extend } else { LoadDirection::Retract };
            let light = heavy * light_share;
            let mut input = CylinderInput::new(c, heavy, dir);
            input.min_load = Some(light);
            input.supply_pressure = Some(supply);
            let worst = analysis::analyse(&input, UnitSystem::Metric).unwrap();
            let mut at = input.clone();
            at.min_load = None;
            at.load = light + (heavy - light) * inside;
            let one = analysis::analyse(&at, UnitSystem::Metric).unwrap();
            for s in &one.scenarios {
                let w = worst.scenarios.iter().find(|w| w.name == s.name).unwrap();
                prop_assert!(w.cap >= s.cap * (1.0 - 1e-12) - 1e-6, "{} cap {} < {}", s.name, w.cap, s.cap);
                prop_assert!(w.rod >= s.rod * (1.0 - 1e-12) - 1e-6, "{} rod {} < {}", s.name, w.rod, s.rod);
                prop_assert!(w.cap_load >= light && w.cap_load <= heavy);
                prop_assert!(w.rod_load >= light && w.rod_load <= heavy);
            }
            prop_assert!(worst.highest_pressure >= one.highest_pressure * (1.0 - 1e-12));
        }
    }
}
