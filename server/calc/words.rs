//! Quantities written into plain-words reasoning, in the reader's unit system.

use super::quantity::{self, Dimension, UnitSystem};

/// A quantity with four significant figures and its display unit, e.g. `"1.8 mm"`.
pub fn q(si: f64, dimension: Dimension, units: UnitSystem) -> String {
    quantity::format(si, dimension, units)
}

/// A duration in the unit a person would say: seconds below 2 min, minutes below 2 h.
pub fn duration(seconds: f64) -> String {
    if seconds < 120.0 {
        format!("{} s", quantity::significant(seconds, 3))
    } else if seconds < 7200.0 {
        format!("{} min", quantity::significant(seconds / 60.0, 3))
    } else {
        format!("{} h", quantity::significant(seconds / 3600.0, 3))
    }
}

/// A leakage flow, in mL/min or in³/min when small (as leaks are), else the display unit.
pub fn flow(si: f64, units: UnitSystem) -> String {
    match units {
        UnitSystem::Metric if si < 1e-3 / 60.0 * 0.1 => {
            format!("{} mL/min", quantity::significant(si * 60.0 * 1e6, 3))
        }
        UnitSystem::Us if si < quantity::US_GALLON / 60.0 * 0.1 => {
            let in3 = quantity::INCH.powi(3);
            format!("{} in3/min", quantity::significant(si * 60.0 / in3, 3))
        }
        _ => q(si, Dimension::Flow, units),
    }
}
