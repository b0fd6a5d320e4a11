//! Entrained air in trapped oil: the room it makes when the pressure rises. SI units.
//!
//! The air is given as its volume fraction `f` of the end's oil volume `V` at atmospheric
//! pressure. Compressed isothermally (Boyle's law, `p_abs V_g` constant: the same isothermal
//! gas term as `fluid::effective_bulk_modulus`, gas modulus = absolute pressure), its volume
//! at gauge pressure `p` is `V_g = f V p_atm / (p_atm + p)`. Air dissolved in the oil plays no
//! part; only free bubbles count.

/// Standard atmosphere, Pa (101,325 Pa; ISO 2533).
pub const ATMOSPHERE: f64 = 101_325.0;

/// Volume by which the air in oil volume `volume` (m³) with fraction `fraction` (at
/// atmospheric pressure) shrinks when the gauge pressure goes from `from` to `to` (Pa), m³:
/// `f V p_atm (1/(p_atm + from) - 1/(p_atm + to))` (Boyle's law, isothermal).
pub fn room_made(volume: f64, fraction: f64, from: f64, to: f64) -> f64 {
    if fraction <= 0.0 || volume <= 0.0 {
        return 0.0;
    }
    let abs = |p: f64| (ATMOSPHERE + p).max(1.0);
    fraction * volume * ATMOSPHERE * (1.0 / abs(from) - 1.0 / abs(to))
}

/// Compliance of the air at gauge pressure `pressure`, m³/Pa: the derivative of the above,
/// `f V p_atm / (p_atm + p)²` (Boyle's law, isothermal).
pub fn compliance(volume: f64, fraction: f64, pressure: f64) -> f64 {
    if fraction <= 0.0 || volume <= 0.0 {
        return 0.0;
    }
    let abs = (ATMOSPHERE + pressure).max(1.0);
    fraction * volume * ATMOSPHERE / (abs * abs)
}
