//! Tube and rod strength: Lamé hoop stress of the tube and Euler buckling of the rod.
//! SI units: m, Pa, N.

use super::ratings::{Status, status};
use serde::Serialize;
use std::f64::consts::PI;

/// Default safety factor on tube yield (2): our own default, not a published figure; enter the
/// factor your design code or the manufacturer asks for.
pub const DEFAULT_TUBE_SAFETY_FACTOR: f64 = 2.0;

/// Default safety factor on Euler buckling (3), the low end of the 3 to 5 that is common
/// practice (REFERENCES.md "Rod buckling").
pub const DEFAULT_BUCKLING_SAFETY_FACTOR: f64 = 3.0;

/// Hoop stress at the bore of a thick-walled tube under internal pressure `p`, Pa:
/// `p (a² + b²) / (b² - a²)` for bore radius `a` and outside radius `b`.
/// Origin: the Lamé solution (REFERENCES.md "Tube and rod strength").
pub fn lame_hoop_at_bore(pressure: f64, inner_radius: f64, outer_radius: f64) -> f64 {
    let (a2, b2) = (inner_radius * inner_radius, outer_radius * outer_radius);
    pressure * (a2 + b2) / (b2 - a2)
}

/// Hoop stress at the outside of a thick-walled tube, Pa: `2 p a² / (b² - a²)` (Lamé).
pub fn lame_hoop_at_outside(pressure: f64, inner_radius: f64, outer_radius: f64) -> f64 {
    let (a2, b2) = (inner_radius * inner_radius, outer_radius * outer_radius);
    2.0 * pressure * a2 / (b2 - a2)
}

/// Tresca equivalent stress at the bore of a thick-walled tube under internal pressure `p`, Pa:
/// `sigma_theta - sigma_r = p (b² + a²)/(b² - a²) + p = 2 p b² / (b² - a²)`.
/// At the bore the principal stresses are the hoop `p (b² + a²)/(b² - a²)`, the radial `-p`
/// and, with closed ends, the axial `p a²/(b² - a²)`, which lies between them, so the largest
/// difference (Tresca, maximum shear) is hoop minus radial whether the ends are closed or
/// open. Origin: the Lamé solution with the Tresca criterion (REFERENCES.md "Added
/// 2026-12-02"). Tresca is the more cautious of the two usual criteria here: von Mises gives
/// `sqrt(3) p b² / (b² - a²)` with closed ends, 13 % lower.
pub fn tresca_at_bore(pressure: f64, inner_radius: f64, outer_radius: f64) -> f64 {
    let (a2, b2) = (inner_radius * inner_radius, outer_radius * outer_radius);
    2.0 * pressure * b2 / (b2 - a2)
}

/// The criterion behind the tube's equivalent stress, as the answer names it.
pub const EQUIVALENT_CRITERION: &str = "tresca";

/// How the tube's ends are held, for its radial growth.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum AxialState {
    /// No axial stress (open ends): the case behind Merritt's container modulus.
    PlaneStress,
    /// No axial strain (long tube held at its ends).
    PlaneStrain,
}

/// Radial growth of the bore under internal pressure `p`, m.
///
/// With Lamé constants `A = p a²/(b² - a²)`, `B = p a² b²/(b² - a²)`:
/// plane stress `u = [(1 - nu) A a + (1 + nu) B / a] / E`;
/// plane strain `u = (1 + nu) [(1 - 2 nu) A a + B / a] / E`.
/// Origin: the Lamé solution with Hooke's law (REFERENCES.md: a = 10 mm, b = 20 mm,
/// p = 100 MPa, E = 210 GPa, nu = 0.3, plane strain gives 9.08e-6 m).
pub fn lame_radial_growth(
    pressure: f64,
    inner_radius: f64,
    outer_radius: f64,
    youngs: f64,
    poisson: f64,
    state: AxialState,
) -> f64 {
    let (a, b) = (inner_radius, outer_radius);
    let big_a = pressure * a * a / (b * b - a * a);
    let big_b = pressure * a * a * b * b / (b * b - a * a);
    match state {
        AxialState::PlaneStress => {
            ((1.0 - poisson) * big_a * a + (1.0 + poisson) * big_b / a) / youngs
        }
        AxialState::PlaneStrain => {
            (1.0 + poisson) * ((1.0 - 2.0 * poisson) * big_a * a + big_b / a) / youngs
        }
    }
}

/// The tube's stresses at the highest pressure against its yield strength.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct TubeCheck {
    /// The pressure checked, Pa.
    pub pressure: f64,
    /// Lamé hoop stress at the bore, Pa.
    pub hoop_stress: f64,
    /// Equivalent stress at the bore by [`EQUIVALENT_CRITERION`] ([`tresca_at_bore`]), Pa:
    /// what is checked against the allowable.
    pub equivalent_stress: f64,
    pub criterion: &'static str,
    /// `equivalent stress / allowable`.
    pub equivalent_utilisation: f64,
    pub yield_strength: f64,
    pub safety_factor: f64,
    /// `yield / safety factor`, Pa.
    pub allowable_stress: f64,
    /// `hoop stress / allowable`.
    pub utilisation: f64,
    pub status: Status,
}

/// Checks a tube of bore `bore` and outside diameter `outside_diameter` (m) at `pressure`
/// (Pa): the Tresca equivalent stress at the bore ([`tresca_at_bore`]) against
/// `yield_strength / safety_factor`; the hoop stress ([`lame_hoop_at_bore`]) and its
/// utilisation are shown beside it. Status as in the ratings check (`low_margin` within 10 %
/// of the allowable), from the equivalent stress.
pub fn tube_check(
    bore: f64,
    outside_diameter: f64,
    pressure: f64,
    yield_strength: f64,
    safety_factor: f64,
) -> TubeCheck {
    let hoop = lame_hoop_at_bore(pressure, bore / 2.0, outside_diameter / 2.0);
    let equivalent = tresca_at_bore(pressure, bore / 2.0, outside_diameter / 2.0);
    let allowable = yield_strength / safety_factor;
    TubeCheck {
        pressure,
        hoop_stress: hoop,
        equivalent_stress: equivalent,
        criterion: EQUIVALENT_CRITERION,
        equivalent_utilisation: equivalent / allowable,
        yield_strength,
        safety_factor,
        allowable_stress: allowable,
        utilisation: hoop / allowable,
        status: status(equivalent, allowable),
    }
}

/// End condition of a strut for Euler buckling, with its effective-length factor `K`
/// (REFERENCES.md "Rod buckling", from memory: 2 fixed-free, 1 pinned-pinned,
/// 0.7 fixed-pinned, 0.5 fixed-fixed).
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum EndCondition {
    FixedFree,
    PinnedPinned,
    FixedPinned,
    FixedFixed,
}

impl EndCondition {
    pub const NAMES: [&'static str; 4] =
        ["fixed_free", "pinned_pinned", "fixed_pinned", "fixed_fixed"];

    pub fn parse(text: &str) -> Option<Self> {
        match text {
            "fixed_free" => Some(EndCondition::FixedFree),
            "pinned_pinned" => Some(EndCondition::PinnedPinned),
            "fixed_pinned" => Some(EndCondition::FixedPinned),
            "fixed_fixed" => Some(EndCondition::FixedFixed),
            _ => None,
        }
    }

    pub fn as_str(self) -> &'static str {
        match self {
            EndCondition::FixedFree => "fixed_free",
            EndCondition::PinnedPinned => "pinned_pinned",
            EndCondition::FixedPinned => "fixed_pinned",
            EndCondition::FixedFixed => "fixed_fixed",
        }
    }

    /// Effective-length factor `K`.
    pub fn factor(self) -> f64 {
        match self {
            EndCondition::FixedFree => 2.0,
            EndCondition::PinnedPinned => 1.0,
            EndCondition::FixedPinned => 0.7,
            EndCondition::FixedFixed => 0.5,
        }
    }
}

/// Euler critical load of a solid round rod, N: `F_cr = pi² E I / (K L)²`, `I = pi d⁴ / 64`.
/// Origin: Euler's column formula (REFERENCES.md "Rod buckling": d = 40 mm, L = 1 m,
/// E = 210 GPa, K = 1 gives 260.45 kN). The rod alone: the fuller whole-cylinder method of
/// ISO/TS 13725 gives a lower capacity.
pub fn euler_critical_load(diameter: f64, length: f64, youngs: f64, factor: f64) -> f64 {
    let inertia = PI * diameter.powi(4) / 64.0;
    let effective = factor * length;
    PI * PI * youngs * inertia / (effective * effective)
}

/// The rod's buckling capacity at full extension against the load.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct Buckling {
    pub end_condition: EndCondition,
    /// Free length used, m.
    pub length: f64,
    pub critical_load: f64,
    pub safety_factor: f64,
    /// `critical load / safety factor`, N.
    pub allowable_load: f64,
    /// The compressive load checked, N.
    pub load: f64,
    pub status: Status,
}

/// Checks a rod of `diameter` and free length `length` (m) under compressive `load` (N)
/// against `F_cr / safety_factor` ([`euler_critical_load`]); status as in the ratings check.
pub fn buckling_check(
    diameter: f64,
    length: f64,
    youngs: f64,
    end_condition: EndCondition,
    load: f64,
    safety_factor: f64,
) -> Buckling {
    let critical = euler_critical_load(diameter, length, youngs, end_condition.factor());
    let allowable = critical / safety_factor;
    Buckling {
        end_condition,
        length,
        critical_load: critical,
        safety_factor,
        allowable_load: allowable,
        load,
        status: status(load, allowable),
    }
}
