//! Areas, area ratio, chamber volumes and holding pressures.

use crate::{FIGURE, IN, LBF, PSI, close};
use loadhold::calc::cylinder::{self, Cylinder, LoadDirection};
use std::f64::consts::PI;

/// A cylinder whose piston and rod have the given areas (m²).
pub fn from_areas(cap: f64, rod: f64, stroke: f64) -> Cylinder {
    Cylinder::new((4.0 * cap / PI).sqrt(), (4.0 * rod / PI).sqrt(), stroke).expect("valid geometry")
}

#[test]
fn area_ratio_series_for_a_100_mm_bore() {
    // REFERENCES.md "Sizes and ratios" [C]: bore 100 mm, rod 45 -> 1.255, 56 -> 1.457,
    // 63 -> 1.659, 70 -> 1.961, 80 -> 2.78, 90 -> 5.26 (the phi series is from memory).
    for (rod, phi) in [
        (45.0, 1.255),
        (56.0, 1.457),
        (63.0, 1.659),
        (70.0, 1.961),
        (80.0, 2.78),
        (90.0, 5.26),
    ] {
        let c = Cylinder::new(0.1, rod / 1000.0, 1.0).unwrap();
        close(
            c.area_ratio(),
            phi,
            FIGURE,
            &format!("phi for 100/{rod} mm"),
        );
        close(
            c.cap_area() / c.annulus_area(),
            phi,
            FIGURE,
            "A_cap / A_annulus",
        );
    }
}

#[test]
fn areas_of_a_4_inch_bore_with_a_2_inch_rod() {
    // Geometry, [C]: pi x 4² / 4 = 12.566 in², pi x 2² / 4 = 3.1416 in², annulus 9.4248 in².
    let c = Cylinder::new(4.0 * IN, 2.0 * IN, 24.0 * IN).unwrap();
    let in2 = IN * IN;
    close(c.cap_area() / in2, 12.566_37, FIGURE, "cap area");
    close(
        c.rod_area() / in2,
        std::f64::consts::PI,
        FIGURE,
        "rod area: pi x 2² / 4 = pi in²",
    );
    close(c.annulus_area() / in2, 9.424_78, FIGURE, "annulus area");
    // Volumes at 10 in extension: cap 125.66 in³, rod 9.4248 x 14 = 131.95 in³.
    close(
        c.cap_volume(10.0 * IN) / IN.powi(3),
        125.663_7,
        FIGURE,
        "cap volume",
    );
    close(
        c.rod_volume(10.0 * IN) / IN.powi(3),
        131.946_9,
        FIGURE,
        "rod volume",
    );
}

#[test]
fn holding_pressure_of_10000_lbf_on_a_10_square_inch_piston_is_1000_psi() {
    // REFERENCES.md "Trade facts" (common practice): 10,000 lbf on 10 in² is 1,000 psi,
    // held by the cap end when the load pushes the rod in.
    let c = from_areas(10.0 * IN * IN, 2.0 * IN * IN, 1.0);
    let h = cylinder::holding_pressures(&c, 10_000.0 * LBF, LoadDirection::Retract);
    close(h.cap_pressure / PSI, 1000.0, FIGURE, "cap holding pressure");
    assert_eq!(h.rod_pressure, 0.0);
    // A load pulling the rod out is held by the annulus (8 in²): 1,250 psi [C].
    let h = cylinder::holding_pressures(&c, 10_000.0 * LBF, LoadDirection::Extend);
    close(h.rod_pressure / PSI, 1250.0, FIGURE, "rod holding pressure");
    assert_eq!(h.cap_pressure, 0.0);
}

#[test]
fn impossible_geometry_is_refused_naming_the_field() {
    assert_eq!(Cylinder::new(0.1, 0.1, 1.0).unwrap_err().field, "rod");
    assert_eq!(Cylinder::new(0.1, 0.12, 1.0).unwrap_err().field, "rod");
    assert_eq!(
        Cylinder::new(f64::NAN, 0.05, 1.0).unwrap_err().field,
        "bore"
    );
    assert_eq!(Cylinder::new(0.1, 0.05, -1.0).unwrap_err().field, "stroke");
    assert_eq!(Cylinder::new(0.1, 0.0, 1.0).unwrap_err().field, "rod");
    let c = Cylinder::new(0.1, 0.05, 1.0).unwrap();
    assert_eq!(
        cylinder::check_position(&c, "position", 1.5)
            .unwrap_err()
            .field,
        "position"
    );
    assert!(cylinder::check_load(f64::INFINITY).is_err());
}
