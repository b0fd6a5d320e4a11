//! The engineering core held against sources outside the project (../shared/REFERENCES.md).
//!
//! Beside each check: its source as REFERENCES.md names it, "common practice" for a trade fact,
//! "from memory" where REFERENCES.md marks a value so, "[C]" where it computes a value from
//! the inputs shown. Tolerances: figures 0.5 %, drifts 3 %.

mod buckling;
mod bypass;
mod circuit;
mod decay;
mod decision;
mod diagnosis;
mod diagnosis_ends;
mod due;
mod fluid;
mod geometry;
mod heating;
mod hose_table;
mod properties;
mod strength;
mod stroke_ends;
mod typed;
mod units;
mod valves;
mod walls;
mod worst_load;

/// Tolerance for figures (pressures, areas, forces, speeds): 0.5 %.
pub const FIGURE: f64 = 0.005;
/// Tolerance for drifts: 3 %.
pub const DRIFT: f64 = 0.03;

/// Asserts `actual` is within `rel` (a fraction) of `expected`, naming the check.
#[track_caller]
pub fn close(actual: f64, expected: f64, rel: f64, what: &str) {
    let err = ((actual - expected) / expected).abs();
    assert!(
        err <= rel,
        "{what}: got {actual}, expected {expected} (off by {:.3} %, allowed {:.3} %)",
        err * 100.0,
        rel * 100.0
    );
}

/// Metres in an inch, for building inputs (NIST SP 811, exact).
pub const IN: f64 = 0.0254;
/// Newtons in a pound-force (NIST SP 811).
pub const LBF: f64 = 4.448_221_615_260_5;
/// Pascals in a psi ([C] from the two above; scipy.constants.psi = 6.89475729316836e3).
pub const PSI: f64 = 6_894.757_293_168;
