//! Spreadsheet-safe CSV cells. A spreadsheet reads a cell that begins with `=`, `+`, `-`, `@`,
//! a tab or a carriage return as a formula, so text a technician typed (an inspector name, a
//! deficiency, a unit number) could run as one on the manager's desk. Such a cell that is not a
//! number gets a leading apostrophe, which spreadsheets show as text and do not evaluate.

/// The characters that make a spreadsheet treat a cell as a formula.
const TRIGGERS: [char; 6] = ['=', '+', '-', '@', '\t', '\r'];

/// `text` as a cell that no spreadsheet evaluates: unchanged unless it begins with a formula
/// character and is not a plain number (negative readings such as `-0.4` stay numbers).
pub fn cell(text: &str) -> std::borrow::Cow<'_, str> {
    let risky = text.starts_with(TRIGGERS);
    if risky && !is_number(text) {
        std::borrow::Cow::Owned(format!("'{text}"))
    } else {
        std::borrow::Cow::Borrowed(text)
    }
}

/// True for a finite decimal number such as `-12`, `+3.5` or `-1.2e-3` (not `inf` or `NaN`).
fn is_number(text: &str) -> bool {
    let digits_only = text
        .chars()
        .all(|c| c.is_ascii_digit() || matches!(c, '+' | '-' | '.' | 'e' | 'E'));
    digits_only && text.parse::<f64>().is_ok_and(f64::is_finite)
}
