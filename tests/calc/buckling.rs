//! Rod buckling beside Euler: slenderness, the Johnson parabola, the design factors, and the
//! check as the cylinder analysis runs it.
//!
//! Expected values are written out here from the formulas of standard machine-design texts
//! (e.g. Shigley, from memory; REFERENCES.md "Added 2026-12-02"):
//!   r = d/4 (solid round: I = pi d^4/64, A = pi d^2/4, r = sqrt(I/A));
//!   lambda = K L / r; lambda_t = sqrt(2 pi^2 E / sigma_y);
//!   Johnson sigma_cr = sigma_y - (sigma_y/(2 pi))^2 lambda^2 / E below lambda_t;
//!   Euler sigma_cr = pi^2 E / lambda^2 above it.

use crate::{FIGURE, close};
use loadhold::calc::analysis::{self, CylinderInput};
use loadhold::calc::buckling::{self, Range};
use loadhold::calc::cylinder::{Cylinder, LoadDirection};
use loadhold::calc::quantity::UnitSystem;
use loadhold::calc::ratings::Status;
use loadhold::calc::strength::EndCondition;
use std::f64::consts::PI;

const E: f64 = 210e9;
const SY: f64 = 355e6;

/// Johnson critical load by hand, N.
fn johnson(d: f64, lambda: f64) -> f64 {
    let k = SY / (2.0 * PI);
    (SY - k * k * lambda * lambda / E) * PI * d * d / 4.0
}

#[test]
fn a_short_rod_is_in_the_johnson_range_well_below_euler() {
    // d = 40 mm, L = 500 mm, pinned-pinned (K = 1), E = 210 GPa, sigma_y = 355 MPa:
    // r = 10 mm, lambda = 50; lambda_t = sqrt(2 pi^2 210e9 / 355e6) = 108.06: inelastic.
    // sigma_cr = 355 - (56.50)^2 x 2500 / 210000 = 355 - 38.00 = 317.00 MPa;
    // x A = 1.2566e-3 m^2: 398.4 kN. Euler at the same K L = 0.5 m is 1041.8 kN
    // (REFERENCES.md "Rod buckling" [C], d = 40 mm, L = 1 m, K = 0.5).
    close(
        buckling::slenderness(0.040, 0.5, 1.0),
        50.0,
        1e-12,
        "slenderness",
    );
    close(
        buckling::transition_slenderness(E, SY),
        108.06,
        FIGURE,
        "transition",
    );
    let r = buckling::rod_check(0.040, 0.5, E, SY, EndCondition::PinnedPinned, 100e3, 3.0);
    assert_eq!(r.theoretical.range, Range::Inelastic);
    close(
        r.theoretical.critical_load / 1e3,
        398.4,
        FIGURE,
        "Johnson load",
    );
    close(
        r.theoretical.critical_load,
        johnson(0.040, 50.0),
        1e-9,
        "Johnson by hand",
    );
    close(
        r.euler.critical_load / 1e3,
        1041.8,
        FIGURE,
        "Euler load kept",
    );
    // Pinned-pinned's design factor is 1.0, the same as the theoretical one.
    close(
        r.design.critical_load,
        r.theoretical.critical_load,
        1e-12,
        "design = theory",
    );
    // Allowable with the factor 3: 132.8 kN; 100 kN is ok, 125 kN within 10 %, 140 kN over,
    // though Euler's allowable (347 kN) would have called all three ok.
    close(
        r.governing_allowable_load / 1e3,
        132.8,
        FIGURE,
        "governing allowable",
    );
    assert_eq!(r.status, Status::Ok);
    assert_eq!(r.euler.status, Status::Ok);
    let near = buckling::rod_check(0.040, 0.5, E, SY, EndCondition::PinnedPinned, 125e3, 3.0);
    assert_eq!(near.status, Status::LowMargin);
    let over = buckling::rod_check(0.040, 0.5, E, SY, EndCondition::PinnedPinned, 140e3, 3.0);
    assert_eq!(over.status, Status::Exceeds);
    assert_eq!(over.euler.status, Status::Ok, "Euler alone misses it");
}

#[test]
fn the_design_factor_governs_a_fixed_fixed_rod() {
    // d = 40 mm, L = 1 m, fixed-fixed: theoretical K = 0.5 -> lambda 50, Johnson 398.4 kN;
    // the recommended design factor 0.65 (common practice, from memory) -> lambda 65:
    // sigma_cr = 355 - 3.1922e15 x 4225 / 2.1e11 Pa = 355 - 64.22 = 290.78 MPa -> 365.4 kN.
    let r = buckling::rod_check(0.040, 1.0, E, SY, EndCondition::FixedFixed, 50e3, 3.0);
    close(r.design.effective_length_factor, 0.65, 1e-12, "design K");
    close(r.design.slenderness, 65.0, 1e-9, "design slenderness");
    close(
        r.design.critical_load / 1e3,
        365.4,
        FIGURE,
        "design Johnson load",
    );
    close(
        r.theoretical.critical_load / 1e3,
        398.4,
        FIGURE,
        "theoretical Johnson",
    );
    close(
        r.euler.critical_load / 1e3,
        1041.8,
        FIGURE,
        "Euler, K = 0.5",
    );
    close(
        r.governing_allowable_load,
        365.4e3 / 3.0,
        FIGURE,
        "the strictest governs",
    );
    // The other design factors (common practice, from memory).
    for (ec, k) in [
        (EndCondition::FixedFree, 2.1),
        (EndCondition::PinnedPinned, 1.0),
        (EndCondition::FixedPinned, 0.80),
        (EndCondition::FixedFixed, 0.65),
    ] {
        close(buckling::design_factor(ec), k, 1e-12, ec.as_str());
    }
}

#[test]
fn a_slender_rod_stays_with_euler() {
    // d = 40 mm, L = 2 m, K = 1: lambda = 200 > 108.06, elastic: Euler
    // pi^2 E I / L^2 = 65.11 kN (REFERENCES.md: the same K L as K = 2, L = 1 m).
    let r = buckling::rod_check(0.040, 2.0, E, SY, EndCondition::PinnedPinned, 10e3, 3.0);
    assert_eq!(r.theoretical.range, Range::Elastic);
    close(r.theoretical.critical_load / 1e3, 65.11, FIGURE, "Euler");
    close(r.euler.critical_load / 1e3, 65.11, FIGURE, "Euler kept");
}

#[test]
fn johnson_meets_euler_at_the_transition_at_half_the_yield() {
    // At lambda_t: Johnson gives sigma_y - (sigma_y/(2 pi))^2 (2 pi^2 E / sigma_y) / E
    // = sigma_y / 2, and Euler pi^2 E / (2 pi^2 E / sigma_y) = sigma_y / 2 (algebra).
    let t = buckling::transition_slenderness(E, SY);
    let (below, range) = buckling::critical_stress(t * (1.0 - 1e-9), E, SY);
    assert_eq!(range, Range::Inelastic);
    let (above, range) = buckling::critical_stress(t * (1.0 + 1e-9), E, SY);
    assert_eq!(range, Range::Elastic);
    close(below, SY / 2.0, 1e-6, "Johnson at the transition");
    close(above, SY / 2.0, 1e-6, "Euler at the transition");
}

#[test]
fn the_analysis_states_an_assumed_free_length_and_yield() {
    // 100/56 mm, stroke 400 mm, 60 kN pushing in, fixed-pinned. No free length: twice the
    // stroke, 0.8 m, said as assumed; no yield: 355 MPa, said as assumed.
    // lambda (theory, K = 0.7) = 0.7 x 800 / 14 = 40; design (K = 0.8) = 45.71, both
    // Johnson: design sigma_cr = 355 - 3.1922e15 x 2089.8 / 2.1e11 = 323.23 MPa,
    // x A (2.4630e-3 m^2) = 796.1 kN; / 3 = 265.4 kN.
    let c = Cylinder::new(0.100, 0.056, 0.400).unwrap();
    let mut input = CylinderInput::new(c, 60e3, LoadDirection::Retract);
    input.buckling.end_condition = EndCondition::FixedPinned;
    let r = analysis::analyse(&input, UnitSystem::Metric).unwrap();
    let b = r.buckling.expect("checked");
    assert!(b.length_assumed && b.yield_assumed);
    close(b.euler.length, 0.8, 1e-12, "twice the stroke");
    close(b.yield_strength, 355e6, 1e-12, "default yield");
    close(b.theoretical.slenderness, 40.0, 1e-9, "theory slenderness");
    close(
        b.design.critical_load / 1e3,
        796.1,
        FIGURE,
        "design Johnson",
    );
    close(b.governing_allowable_load / 1e3, 265.4, FIGURE, "allowable");
    assert_eq!(b.status, Status::Ok);
    // Given: free length 1.5 m and yield 490 MPa: nothing assumed.
    input.buckling.length = Some(1.5);
    input.buckling.yield_strength = Some(490e6);
    let b = analysis::analyse(&input, UnitSystem::Metric)
        .unwrap()
        .buckling
        .unwrap();
    assert!(!b.length_assumed && !b.yield_assumed);
    close(b.euler.length, 1.5, 1e-12, "given length");
}

mod property {
    use super::*;
    use proptest::prelude::*;

    proptest! {
        #![proptest_config(ProptestConfig::with_cases(256))]

        /// For any rod: the figures are finite and positive; the Johnson load never exceeds
        /// the squash load sigma_y A nor Euler's load at the same slenderness (with
        /// x = sigma_y lambda² / (pi² E): 1 - x/4 <= 1/x because (x - 2)² >= 0, algebra);
        /// the governing allowable is the lowest of the three and the status follows it.
        #[test]
        fn buckling_figures_are_finite_bounded_and_the_strictest_governs(
            d in 0.005..0.3f64,
            l in 0.05..15.0f64,
            e in 50e9..250e9f64,
            sy in 150e6..1200e6f64,
            load in 0.0..5e6f64,
            sf in 1.0..6.0f64,
            which in 0usize..4,
        ) {
            let ec = [
                EndCondition::FixedFree,
                EndCondition::PinnedPinned,
                EndCondition::FixedPinned,
                EndCondition::FixedFixed,
            ][which];
            let r = buckling::rod_check(d, l, e, sy, ec, load, sf);
            let area = PI * d * d / 4.0;
            for f in [r.theoretical, r.design] {
                prop_assert!(f.critical_load.is_finite() && f.critical_load > 0.0);
                prop_assert!(f.critical_load <= sy * area * (1.0 + 1e-12));
                let euler_same = PI * PI * e / (f.slenderness * f.slenderness) * area;
                prop_assert!(f.critical_load <= euler_same * (1.0 + 1e-9));
            }
            prop_assert!(r.governing_allowable_load <= r.euler.allowable_load);
            prop_assert!(r.governing_allowable_load <= r.design.allowable_load);
            prop_assert!(r.governing_allowable_load <= r.theoretical.allowable_load);
            let expected = if load > r.governing_allowable_load {
                Status::Exceeds
            } else if load >= 0.9 * r.governing_allowable_load {
                Status::LowMargin
            } else {
                Status::Ok
            };
            prop_assert_eq!(r.status, expected);
        }
    }
}
