//! Small helpers shared by page view structs.

use crate::calc::quantity::{self, Dimension, UnitSystem};

/// Formats an SI value for display, e.g. `"3000 psi"`; `"—"` when absent.
pub fn q(si: Option<f64>, dimension: Dimension, units: UnitSystem) -> String {
    match si {
        Some(v) => quantity::format(v, dimension, units),
        None => "—".to_string(),
    }
}

/// Form input text for an SI value in the display unit, e.g. `"4 in"`; empty when absent.
pub fn input(si: Option<f64>, dimension: Dimension, units: UnitSystem) -> String {
    match si {
        Some(v) => quantity::format(v, dimension, units),
        None => String::new(),
    }
}

/// One form field's error, shown beside the field.
#[derive(Clone, Debug, Default)]
pub struct FieldErrors(pub Vec<(String, String)>);

impl FieldErrors {
    pub fn get(&self, field: &str) -> &str {
        self.0
            .iter()
            .find(|(f, _)| f == field)
            .map(|(_, m)| m.as_str())
            .unwrap_or("")
    }

    pub fn has(&self, field: &str) -> bool {
        self.0.iter().any(|(f, _)| f == field)
    }

    pub fn is_empty(&self) -> bool {
        self.0.is_empty()
    }

    pub fn push(&mut self, field: impl Into<String>, message: impl Into<String>) {
        self.0.push((field.into(), message.into()));
    }

    /// Records an `AppError` under its field (or under `""` for a form-level error).
    /// Adds each problem of `error` beside its field, in words: the API's option codes in a
    /// choice's message (`pass_with_deficiencies`) are written as words on a page, where the
    /// choice is made with a control, not typed.
    pub fn push_error(&mut self, error: &crate::error::AppError) {
        for problem in error.problems() {
            let (code, message, field) = problem.parts();
            let message = if matches!(code, "invalid_choice" | "required") {
                message.replace('_', " ")
            } else {
                message
            };
            self.0.push((field.unwrap_or_default(), message));
        }
    }
}
