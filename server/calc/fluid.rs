//! Oil and container properties: documented defaults and the effective bulk modulus.
//!
//! All values SI: Pa for moduli, 1/K for expansion coefficients, m for diameters.

/// Default bulk modulus of mineral hydraulic oil, Pa (1.5 GPa, about 218,000 psi).
///
/// Origin: the usual handbook range for mineral oil is 1.4 to 1.8 GPa (from memory, see
/// REFERENCES.md "Fluid properties"); 1.5 GPa is near the low end, which gives the larger
/// (more cautious) settle drift and the smaller trapped-oil pressure rise. Enter the oil
/// maker's figure where it is known.
pub const DEFAULT_BULK_MODULUS: f64 = 1.5e9;

/// Default cubical expansion coefficient of mineral oil, 1/K (7e-4).
///
/// Origin: the usual textbook figure, about 0.0007 per K (Rabie, Fluid Power Engineering,
/// as listed in REFERENCES.md); mineral oils lie between 6.3e-4 and 7e-4 per K.
pub const DEFAULT_EXPANSION: f64 = 7e-4;

/// Young's modulus of steel, Pa (210 GPa, the usual handbook value for carbon steel).
pub const STEEL_YOUNGS_MODULUS: f64 = 210e9;

/// Poisson's ratio of steel (0.3, the usual handbook value).
pub const STEEL_POISSON_RATIO: f64 = 0.3;

/// Default temperature rise of trapped oil for the ratings check, K (10 K).
///
/// Origin: our own assumption, not a published figure: a machine parked with its valves
/// closed, oil warming in the sun or from a hot engine bay. The response states the rise it
/// used; enter the rise expected on site.
pub const DEFAULT_TRAPPED_TEMPERATURE_RISE: f64 = 10.0;

/// Bulk modulus of a thick-walled tube treated as a container, Pa.
///
/// `1/Bc = (2/E) * ((Do² + D²)/(Do² - D²) + nu)` with bore `D`, outside diameter `Do`,
/// Young's modulus `E` and Poisson's ratio `nu`. Origin: Merritt, Hydraulic Control Systems
/// (from memory, REFERENCES.md); it equals `2 u / (a p)` with `u` the plane-stress Lamé radial
/// growth of the bore, i.e. the fractional growth of the bore's cross-section per pascal.
/// Returns `None` when `Do <= D` or an input is not positive and finite.
pub fn tube_bulk_modulus(
    bore: f64,
    outside_diameter: f64,
    youngs: f64,
    poisson: f64,
) -> Option<f64> {
    let ok = |v: f64| v.is_finite() && v > 0.0;
    if !(ok(bore) && ok(outside_diameter) && ok(youngs) && poisson.is_finite()) {
        return None;
    }
    if outside_diameter <= bore {
        return None;
    }
    let (d2, o2) = (bore * bore, outside_diameter * outside_diameter);
    let compliance = (2.0 / youngs) * ((o2 + d2) / (o2 - d2) + poisson);
    if compliance > 0.0 && compliance.is_finite() {
        Some(1.0 / compliance)
    } else {
        None
    }
}

/// Effective bulk modulus of oil in a compliant container with entrained gas, Pa.
///
/// `1/Be = 1/Bl + 1/Bc + (Vg/Vt) * (1/Bg)`: liquid modulus `Bl`, container modulus `Bc`
/// (`None` for a rigid container), gas volume fraction `Vg/Vt` and gas modulus `Bg` (for
/// air, about the absolute pressure when compressed isothermally). Origin: Merritt, Hydraulic
/// Control Systems (from memory); the same form in Rabie, Fluid Power Engineering, p. 55
/// (REFERENCES.md). Returns `Bl` unchanged when the other terms are absent.
pub fn effective_bulk_modulus(liquid: f64, container: Option<f64>, gas: Option<(f64, f64)>) -> f64 {
    let mut compliance = 1.0 / liquid;
    if let Some(bc) = container {
        compliance += 1.0 / bc;
    }
    if let Some((fraction, modulus)) = gas {
        compliance += fraction / modulus;
    }
    1.0 / compliance
}

/// Pressure rise of oil trapped in a closed volume that warms by `temperature_rise` K, Pa.
///
/// `dp = Be * alpha * dT`: the oil would expand by `alpha * dT` of its volume; the closed
/// volume forbids it, so the pressure rises until compression takes it back (definition of
/// the bulk modulus). Common practice; REFERENCES.md computes 1.5 GPa x 7e-4 = 10.5 bar per
/// degC. The container's own thermal growth is neglected (steel grows about a twentieth as
/// much as oil), which errs on the high side. Negative for cooling.
pub fn trapped_pressure_rise(
    effective_bulk_modulus: f64,
    expansion: f64,
    temperature_rise: f64,
) -> f64 {
    effective_bulk_modulus * expansion * temperature_rise
}
