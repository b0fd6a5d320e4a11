//! The hose form's suggested working pressure: the hose table's value for the type and size
//! the form holds, said as a default to confirm against the layline (the shop's value wins).

use super::forms::Values;
use crate::calc::hose_table;
use crate::calc::quantity::{self, Dimension, UnitSystem};

/// The words added to the working-pressure hint: the table's value with its standard, edition
/// and source, or where the table is (no type or size yet, or none in the table).
pub fn hint(values: &Values, units: UnitSystem) -> String {
    let spec = values.get("spec").map(String::as_str).unwrap_or("");
    let size = values.get("size").map(String::as_str).unwrap_or("");
    match hose_table::lookup(spec, size) {
        Some(r) => format!(
            "Suggested default for {} size -{}: {} ({} {}, {}; {}, edition {}). \
             Confirm it against the hose's layline and enter the value yourself: the value \
             entered here is the one every check uses.",
            r.spec,
            r.dash,
            quantity::format(r.max_working_pressure_pa, Dimension::Pressure, units),
            quantity::significant(r.value, 4),
            r.unit,
            r.standard,
            r.source,
            r.edition,
        ),
        None if spec.trim().is_empty() || size.trim().is_empty() => {
            "With the type and size saved, a default from the hose table is suggested here."
                .to_string()
        }
        None => format!(
            "The hose table has no value for \"{}\" at size \"{}\": use the layline.",
            spec.trim(),
            size.trim()
        ),
    }
}
