//! Wall compliance of each end of a cylinder: how much room the tube and the rod make per
//! pascal of pressure in that end. SI units: m, m², m³/Pa, Pa.
//!
//! Derivation (Lamé, REFERENCES.md "Added 2026-12-02", plane stress: the tube's ends are
//! carried by the head and cap, so we take no axial stress in the wall, which gives the larger
//! growth; ours to choose, and the choice behind Merritt's container term):
//! - Under internal pressure `p` the bore (radius `a`, outside radius `b`) grows radially by
//!   `u_a = (p a / E)((b² + a²)/(b² - a²) + nu)`; its cross-section grows by
//!   `dA = 2 pi a u_a = A_cap (2 u_a / a)`.
//! - The cap end is that bore over its chamber length `x`: `C_wall_cap = x A_cap (2 u_a/a) / p`.
//! - The rod end is the annulus between bore and rod over its length `L - x`. The bore grows as
//!   above, and the rod, a solid cylinder under external pressure `p` (plane stress,
//!   `sigma_r = sigma_theta = -p`), shrinks radially by `(1 - nu_rod) p r / E_rod`, so its
//!   cross-section shrinks by `A_rod 2 (1 - nu_rod) p / E_rod`. Both make room:
//!   `C_wall_rod = (L - x)(A_cap (2 u_a / a) / p + A_rod 2 (1 - nu_rod) / E_rod)`.
//!   (Not `A_annulus (L - x) / B_tube`: the whole bore grows, not only the annulus.)

use super::bypass::TubeWall;
use super::cylinder::{Cylinder, End};
use super::fluid;

/// Radial growth of the bore per pascal of internal pressure, m/Pa:
/// `u_a / p = (a / E)((b² + a²)/(b² - a²) + nu)` (Lamé, plane stress, REFERENCES.md).
/// Zero when the outside diameter is not larger than the bore.
pub fn bore_growth_per_pa(bore: f64, outside_diameter: f64, youngs: f64, poisson: f64) -> f64 {
    let (a, b) = (bore / 2.0, outside_diameter / 2.0);
    if !(b > a && a > 0.0 && youngs > 0.0) {
        return 0.0;
    }
    let (a2, b2) = (a * a, b * b);
    a / youngs * ((b2 + a2) / (b2 - a2) + poisson)
}

/// Growth of the bore's cross-section per pascal and per metre of length, m²/Pa:
/// `A_cap (2 u_a / a) / p` (Lamé, see the module documentation).
pub fn bore_area_growth_per_pa(cylinder: &Cylinder, tube: &TubeWall) -> f64 {
    let a = cylinder.bore / 2.0;
    cylinder.cap_area()
        * 2.0
        * bore_growth_per_pa(
            cylinder.bore,
            tube.outside_diameter,
            tube.youngs,
            tube.poisson,
        )
        / a
}

/// Shrinkage of the rod's cross-section per pascal of external pressure, m²/Pa:
/// `A_rod 2 (1 - nu) / E` (plane stress, solid rod, REFERENCES.md "Added 2026-12-02").
pub fn rod_area_shrink_per_pa(cylinder: &Cylinder, youngs: f64, poisson: f64) -> f64 {
    cylinder.rod_area() * 2.0 * (1.0 - poisson) / youngs
}

/// Wall compliance of one end at extension `position`, m³/Pa: the room the tube (and, in the
/// rod end, the rod) makes per pascal in that end. Cap end `x A_cap (2 u_a/a)/p`; rod end
/// `(L - x)(A_cap (2 u_a/a)/p + A_rod 2 (1 - nu)/E)` with the rod in steel (E = 210 GPa,
/// nu = 0.3, handbook values). Derivation in the module documentation.
pub fn wall_compliance(cylinder: &Cylinder, tube: &TubeWall, end: End, position: f64) -> f64 {
    let x = cylinder.clamp(position);
    let bore = bore_area_growth_per_pa(cylinder, tube);
    match end {
        End::Cap => x * bore,
        End::Rod => {
            let rod = rod_area_shrink_per_pa(
                cylinder,
                fluid::STEEL_YOUNGS_MODULUS,
                fluid::STEEL_POISSON_RATIO,
            );
            (cylinder.stroke - x) * (bore + rod)
        }
    }
}
