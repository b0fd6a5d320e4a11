//! The one error the engineering core returns: an input outside what a formula can take.

use std::fmt;

/// An input the calculations cannot use, naming the request field it came from
/// (e.g. `rod`, `position`, `ratings.cap_line`) and saying what is accepted.
#[derive(Clone, Debug, PartialEq)]
pub struct CalcError {
    pub field: String,
    pub message: String,
}

impl CalcError {
    pub fn new(field: impl Into<String>, message: impl Into<String>) -> Self {
        CalcError {
            field: field.into(),
            message: message.into(),
        }
    }
}

impl fmt::Display for CalcError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "{}: {}", self.field, self.message)
    }
}

impl std::error::Error for CalcError {}

/// Refuses a value that is not finite or lies outside `min..=max` (SI), naming `field`.
/// `what` describes the value for the message, e.g. "the bore".
pub fn in_range(field: &str, what: &str, value: f64, min: f64, max: f64) -> Result<f64, CalcError> {
    if !value.is_finite() {
        return Err(CalcError::new(
            field,
            format!("{what} must be a finite number"),
        ));
    }
    if value < min || value > max {
        return Err(CalcError::new(
            field,
            format!(
                "{what} must lie between {} and {} (SI units: m, N, Pa, K, s), got {}",
                plain(min),
                plain(max),
                plain(value)
            ),
        ));
    }
    Ok(value)
}

/// A number as people read it: `0`, `500`, `0.001`, and powers of ten (`1e12`) only for the
/// very large or very small.
fn plain(x: f64) -> String {
    if x == 0.0 || (1e-3..1e7).contains(&x.abs()) {
        let text = format!("{x:.6}");
        text.trim_end_matches('0').trim_end_matches('.').to_string()
    } else {
        format!("{x:e}")
    }
}

/// Upper bound on any length the core accepts, m (a sanity limit, not physics).
pub const MAX_LENGTH: f64 = 100.0;
/// Upper bound on any pressure or modulus the core accepts, Pa (1000 GPa).
pub const MAX_PRESSURE: f64 = 1e12;

/// Lowest gauge pressure a reading can have, Pa: -1 standard atmosphere (101,325 Pa exactly,
/// ISO 80000-4 / NIST SP 811), i.e. absolute zero. A vacuum reading is evidence (a cap end
/// drained by a pulling load), not an error.
pub const MIN_GAUGE_PRESSURE: f64 = -101_325.0;
/// Upper bound on any force the core accepts, N (about 100,000 tonnes-force).
pub const MAX_FORCE: f64 = 1e9;
