//! Rod buckling beside Euler: slenderness, the inelastic range by the Johnson parabola, and the
//! recommended design end-condition factors. SI units: m, Pa, N.
//!
//! Euler's load `pi² E I / (K L)²` ([`strength::euler_critical_load`]) holds only for a slender
//! rod: it grows without bound as the rod gets shorter, past the load that yields it. For a
//! solid round rod of diameter `d` the radius of gyration is `r = sqrt(I / A) = d / 4`
//! (`I = pi d⁴ / 64`, `A = pi d² / 4`), and the slenderness is `K L / r`. Below the transition
//! slenderness `sqrt(2 pi² E / sigma_y)` the Johnson parabola gives the critical stress
//! `sigma_cr = sigma_y - (sigma_y / (2 pi))² (K L / r)² / E`; above it, Euler's
//! `sigma_cr = pi² E / (K L / r)²`. The two meet, with the same slope, at the transition,
//! where `sigma_cr = sigma_y / 2`. Origin: standard machine-design texts (e.g. Shigley, from
//! memory; REFERENCES.md "Added 2026-12-02").
//!
//! The theoretical factors `K` (2, 1, 0.7, 0.5) assume perfect ends; real fixed ends rotate a
//! little, so the recommended design factors are fixed-free 2.1, pinned-pinned 1.0,
//! fixed-pinned 0.80, fixed-fixed 0.65 (steel-construction practice, from memory; common
//! practice to use them). Both are shown; the status follows the lowest allowable load.
//!
//! Default rod yield strength when none is given: 355 MPa (our own choice, made to err low:
//! below the 370 MPa that EN 10083-2 C45 +QT guarantees for 40 to 100 mm, REFERENCES.md, from
//! memory; usual rod steels are stronger). A lower yield never raises the Johnson load
//! (`d sigma_cr / d sigma_y = 1 - sigma_y (K L / r)² / (2 pi² E) > 0` below the transition),
//! so the default can only understate the capacity. The answer says when it was assumed.

use super::analysis::CylinderInput;
use super::cylinder::LoadDirection;
use super::ratings::{Status, status};
use super::strength::{self, Buckling, EndCondition};
use serde::Serialize;
use std::f64::consts::PI;

/// Rod yield strength assumed when none is given, Pa (ours; see the module text).
pub const DEFAULT_ROD_YIELD: f64 = 355e6;

/// Recommended design effective-length factor for an end condition (steel-construction
/// practice, from memory; common practice): fixed-free 2.1, pinned-pinned 1.0, fixed-pinned
/// 0.80, fixed-fixed 0.65.
pub fn design_factor(condition: EndCondition) -> f64 {
    match condition {
        EndCondition::FixedFree => 2.1,
        EndCondition::PinnedPinned => 1.0,
        EndCondition::FixedPinned => 0.80,
        EndCondition::FixedFixed => 0.65,
    }
}

/// Slenderness `K L / r` of a solid round rod, `r = d / 4` (geometry, see the module text).
pub fn slenderness(diameter: f64, length: f64, factor: f64) -> f64 {
    factor * length / (diameter / 4.0)
}

/// Transition slenderness between the Johnson and Euler ranges, `sqrt(2 pi² E / sigma_y)`.
pub fn transition_slenderness(youngs: f64, yield_strength: f64) -> f64 {
    (2.0 * PI * PI * youngs / yield_strength).sqrt()
}

/// Which formula gives the critical stress.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Range {
    /// Slender: Euler.
    Elastic,
    /// Below the transition slenderness: Johnson parabola.
    Inelastic,
}

impl Range {
    pub fn as_str(self) -> &'static str {
        match self {
            Range::Elastic => "elastic",
            Range::Inelastic => "inelastic",
        }
    }

    pub fn method(self) -> &'static str {
        match self {
            Range::Elastic => "euler",
            Range::Inelastic => "johnson",
        }
    }
}

/// Critical stress at slenderness `lambda`, Pa, and its range: the Johnson parabola below
/// [`transition_slenderness`], Euler `pi² E / lambda²` above (see the module text).
pub fn critical_stress(lambda: f64, youngs: f64, yield_strength: f64) -> (f64, Range) {
    if lambda < transition_slenderness(youngs, yield_strength) {
        let k = yield_strength / (2.0 * PI);
        (
            yield_strength - k * k * lambda * lambda / youngs,
            Range::Inelastic,
        )
    } else {
        (PI * PI * youngs / (lambda * lambda), Range::Elastic)
    }
}

/// One effective-length factor's figures.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct Figure {
    pub effective_length_factor: f64,
    pub slenderness: f64,
    pub range: Range,
    /// `sigma_cr A`, N (Johnson or Euler by the range).
    pub critical_load: f64,
    /// `critical load / safety factor`, N.
    pub allowable_load: f64,
}

fn figure(
    diameter: f64,
    length: f64,
    youngs: f64,
    yield_strength: f64,
    factor: f64,
    sf: f64,
) -> Figure {
    let lambda = slenderness(diameter, length, factor);
    let (stress, range) = critical_stress(lambda, youngs, yield_strength);
    let critical = stress * PI * diameter * diameter / 4.0;
    Figure {
        effective_length_factor: factor,
        slenderness: lambda,
        range,
        critical_load: critical,
        allowable_load: critical / sf,
    }
}

/// The rod's buckling check: Euler with the theoretical factor (as before), and beside it the
/// slenderness range and the recommended design factor; `status` follows the lowest allowable.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct BucklingReport {
    /// Euler with the theoretical factor and the given safety factor (its `status` is Euler's
    /// alone).
    pub euler: Buckling,
    /// True when the free length is the default of twice the stroke, not a given one.
    pub length_assumed: bool,
    /// Rod yield strength used, Pa, and whether it is the default [`DEFAULT_ROD_YIELD`].
    pub yield_strength: f64,
    pub yield_assumed: bool,
    pub youngs: f64,
    pub transition_slenderness: f64,
    /// Theoretical factor, Johnson below the transition.
    pub theoretical: Figure,
    /// Recommended design factor, Johnson below the transition.
    pub design: Figure,
    /// The lowest of the three allowable loads, N.
    pub governing_allowable_load: f64,
    pub status: Status,
}

/// Checks a rod of `diameter` and free length `length` (m), Young's modulus `youngs` and yield
/// `yield_strength` (Pa), under compressive `load` (N) with `safety_factor`: Euler
/// ([`strength::buckling_check`]) and the two [`Figure`]s; status against the lowest allowable
/// ([`status`]: `low_margin` within 10 %).
#[allow(clippy::too_many_arguments)]
pub fn rod_check(
    diameter: f64,
    length: f64,
    youngs: f64,
    yield_strength: f64,
    end_condition: EndCondition,
    load: f64,
    safety_factor: f64,
) -> BucklingReport {
    let euler =
        strength::buckling_check(diameter, length, youngs, end_condition, load, safety_factor);
    let at = |factor| {
        figure(
            diameter,
            length,
            youngs,
            yield_strength,
            factor,
            safety_factor,
        )
    };
    let theoretical = at(end_condition.factor());
    let design = at(design_factor(end_condition));
    let governing = euler
        .allowable_load
        .min(theoretical.allowable_load)
        .min(design.allowable_load);
    BucklingReport {
        euler,
        length_assumed: false,
        yield_strength,
        yield_assumed: false,
        youngs,
        transition_slenderness: transition_slenderness(youngs, yield_strength),
        theoretical,
        design,
        governing_allowable_load: governing,
        status: status(load, governing),
    }
}

/// The buckling check of a cylinder input, or `None` when it is not checked or nothing pushes
/// the rod in. The load checked is the larger of the heaviest held load when it pushes the rod
/// in and the stall force `p_supply A_cap` with a supply pressure. Without a free length it
/// takes twice the stroke (a single-stage cylinder is longer closed than its stroke, so its
/// pin-to-pin length at full extension is at least that; our default, said in the answer as
/// an assumption); without a rod yield strength, [`DEFAULT_ROD_YIELD`].
pub fn check(input: &CylinderInput) -> Option<BucklingReport> {
    if !input.buckling.checked {
        return None;
    }
    let c = &input.cylinder;
    let held = match input.load_direction {
        LoadDirection::Retract => input.load,
        LoadDirection::Extend => 0.0,
    };
    let stall = input.supply_pressure.map_or(0.0, |p| p * c.cap_area());
    let load = held.max(stall);
    if load <= 0.0 {
        return None;
    }
    let b = &input.buckling;
    let length = b.length.unwrap_or(2.0 * c.stroke);
    let yield_strength = b.yield_strength.unwrap_or(DEFAULT_ROD_YIELD);
    let mut report = rod_check(
        c.rod,
        length,
        b.youngs,
        yield_strength,
        b.end_condition,
        load,
        b.safety_factor,
    );
    report.length_assumed = b.length.is_none();
    report.yield_assumed = b.yield_strength.is_none();
    Some(report)
}
