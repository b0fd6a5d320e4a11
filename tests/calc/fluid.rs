//! Effective bulk modulus, tube compliance and the documented defaults.

use crate::{FIGURE, PSI, close};
use loadhold::calc::fluid;
use loadhold::calc::strength::{self, AxialState};

#[test]
fn merritt_style_worked_example_gives_about_41100_psi() {
    // REFERENCES.md "Fluid properties", worked example [C] from Merritt's inputs (from
    // memory): steel pipe D/t = 10, 1 % air, Bl = 250,000 psi, Bg = 500 psi; terms 4.0e-6,
    // 3.3e-7, 2.0e-5 per psi; about 41,100 psi. The example's container term is the thin-wall
    // D/(tE) with E = 30e6 psi.
    let container = 30e6 / 10.0; // psi, 1/Bc = D/(tE) = 3.33e-7 per psi
    let be = fluid::effective_bulk_modulus(250_000.0, Some(container), Some((0.01, 500.0)));
    close(be, 41_100.0, FIGURE, "effective bulk modulus");
    // With our thick-wall container term (D/t = 10 -> Do = 1.2 D) the container term grows to
    // 3.9e-7 per psi; the result still agrees with the example's 41,100 psi within 0.5 %.
    let thick = fluid::tube_bulk_modulus(1.0, 1.2, 30e6, 0.3).unwrap();
    let be = fluid::effective_bulk_modulus(250_000.0, Some(thick), Some((0.01, 500.0)));
    close(be, 41_100.0, FIGURE, "with the thick-wall container term");
}

#[test]
fn tube_modulus_is_the_lame_bore_growth() {
    // REFERENCES.md: 1/Bc = (2/E)((Do² + D²)/(Do² - D²) + nu) (Merritt, from memory) "follows
    // from Lamé" [C]: the bore's area grows by 2u/a, u the plane-stress Lamé radial growth.
    // u_a written out (REFERENCES.md "Added 2026-12-02" [C], plane stress):
    // u_a = (p a / E)((b² + a²)/(b² - a²) + nu) = 9.365e-6 m for this case.
    let (a, b, e, nu, p) = (0.01f64, 0.02f64, 210e9, 0.3, 100e6);
    let u = p * a / e * ((b * b + a * a) / (b * b - a * a) + nu);
    close(u, 9.365e-6, FIGURE, "u_a by hand");
    let bc = fluid::tube_bulk_modulus(2.0 * a, 2.0 * b, e, nu).unwrap();
    close(1.0 / bc, 2.0 * u / (a * p), 1e-9, "container compliance");
    // The strength module's general plane-stress growth agrees with the closed form.
    let general = strength::lame_radial_growth(p, a, b, e, nu, AxialState::PlaneStress);
    close(general, u, 1e-9, "Lamé plane stress");
    // Thin-wall limit (common textbook result): 1/Bc -> D/(tE) as the wall thins.
    let (d, t) = (0.1, 0.001);
    let thin = fluid::tube_bulk_modulus(d, d + 2.0 * t, e, nu).unwrap();
    close(1.0 / thin, d / (t * e), 0.02, "thin-wall limit within 2 %");
    assert_eq!(fluid::tube_bulk_modulus(0.1, 0.1, e, nu), None);
}

#[test]
fn defaults_lie_in_the_documented_ranges() {
    // REFERENCES.md "Fluid properties" (from memory): mineral oil 1.4 to 1.8 GPa; expansion
    // 6.3e-4 to 7e-4 per degC (Rabie: about 7e-4 per K).
    assert!((1.4e9..=1.8e9).contains(&fluid::DEFAULT_BULK_MODULUS));
    assert!((6.3e-4..=7e-4).contains(&fluid::DEFAULT_EXPANSION));
    // 1.5 GPa is about 218,000 psi, inside the 200,000 to 260,000 psi the same row gives.
    let psi = fluid::DEFAULT_BULK_MODULUS / PSI;
    assert!((200_000.0..=260_000.0).contains(&psi), "{psi}");
}
