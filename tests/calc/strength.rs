//! Lamé hoop stress and Euler buckling.

use crate::{FIGURE, IN, LBF, PSI, close};
use loadhold::calc::ratings::Status;
use loadhold::calc::strength::{self, AxialState, EndCondition};

#[test]
fn lame_textbook_case() {
    // REFERENCES.md "Tube and rod strength" [C] from the Lamé solution: a = 10 mm, b = 20 mm,
    // p = 100 MPa, E = 210 GPa, nu = 0.3, plane strain: hoop 166.7 MPa at a, 66.7 MPa at b,
    // radial growth at a 9.08e-6 m.
    let (a, b, p) = (0.010, 0.020, 100e6);
    close(
        strength::lame_hoop_at_bore(p, a, b) / 1e6,
        166.7,
        FIGURE,
        "hoop at bore",
    );
    close(
        strength::lame_hoop_at_outside(p, a, b) / 1e6,
        66.7,
        FIGURE,
        "hoop at outside",
    );
    let u = strength::lame_radial_growth(p, a, b, 210e9, 0.3, AxialState::PlaneStrain);
    close(u, 9.08e-6, FIGURE, "radial growth, plane strain");
}

#[test]
fn thin_wall_hoop_stress_approaches_barlow() {
    // REFERENCES.md: Barlow P = 2St/D with D the outside diameter (common piping references).
    // For a thin wall the Lamé bore stress lies between Barlow on the outside and on the bore
    // diameter.
    let (d_out, t, p) = (0.2, 0.002, 10e6);
    let lame = strength::lame_hoop_at_bore(p, d_out / 2.0 - t, d_out / 2.0);
    let barlow_outside = p * d_out / (2.0 * t);
    let barlow_bore = p * (d_out - 2.0 * t) / (2.0 * t);
    assert!(
        lame > barlow_bore && lame < barlow_outside * 1.01,
        "{lame} vs {barlow_bore}..{barlow_outside}"
    );
}

#[test]
fn tube_check_against_yield_with_a_safety_factor() {
    // [C] bore 100 mm, OD 121 mm, 260 bar: hoop = p (a² + b²)/(b² - a²) = 5.309 p = 138.0 MPa;
    // E355 yield 355 MPa (EN 10305-1, from memory) over a factor 2 = 177.5 MPa: ok.
    let t = strength::tube_check(0.100, 0.121, 260e5, 355e6, 2.0);
    close(t.hoop_stress / 1e6, 138.0, FIGURE, "hoop stress");
    assert_eq!(t.status, Status::Ok);
    let t = strength::tube_check(0.100, 0.121, 400e5, 355e6, 2.0);
    assert_eq!(
        t.status,
        Status::Exceeds,
        "400 bar gives 212.4 MPa > 177.5 MPa"
    );
}

#[test]
fn euler_buckling_of_a_40_mm_rod() {
    // REFERENCES.md "Rod buckling" [C]: d = 40 mm, L = 1000 mm, E = 210 GPa: K = 1: 260.45 kN;
    // K = 2: 65.11 kN; K = 0.7: 531.5 kN; K = 0.5: 1041.8 kN (K factors from memory).
    for (ec, kn) in [
        (EndCondition::PinnedPinned, 260.45),
        (EndCondition::FixedFree, 65.11),
        (EndCondition::FixedPinned, 531.5),
        (EndCondition::FixedFixed, 1041.8),
    ] {
        let f = strength::euler_critical_load(0.040, 1.0, 210e9, ec.factor());
        close(f / 1e3, kn, FIGURE, ec.as_str());
    }
}

#[test]
fn euler_buckling_in_us_units() {
    // REFERENCES.md "Rod buckling" [C]: d = 2 in, L = 60 in, E = 30e6 psi, K = 1: 64,596 lbf.
    let f = strength::euler_critical_load(2.0 * IN, 60.0 * IN, 30e6 * PSI, 1.0);
    close(f / LBF, 64_596.0, FIGURE, "critical load");
    // With the common-practice factor of 3 (3 to 5) the allowable is 21,532 lbf [C]: 18,000 is
    // ok, 20,000 is within 10 % of it, 22,000 exceeds it.
    let ok = strength::buckling_check(
        2.0 * IN,
        60.0 * IN,
        30e6 * PSI,
        EndCondition::PinnedPinned,
        18_000.0 * LBF,
        3.0,
    );
    assert_eq!(ok.status, Status::Ok);
    let near = strength::buckling_check(
        2.0 * IN,
        60.0 * IN,
        30e6 * PSI,
        EndCondition::PinnedPinned,
        20_000.0 * LBF,
        3.0,
    );
    assert_eq!(near.status, Status::LowMargin);
    let over = strength::buckling_check(
        2.0 * IN,
        60.0 * IN,
        30e6 * PSI,
        EndCondition::PinnedPinned,
        22_000.0 * LBF,
        3.0,
    );
    assert_eq!(over.status, Status::Exceeds);
}
