//! The inputs of the calculator page's form: names (as the calculation API spells its
//! fields), labels and hints in the chosen unit system.

use crate::calc::quantity::UnitSystem;

/// One text input of the form.
#[derive(Clone, Debug)]
pub struct FieldView {
    pub name: String,
    pub label: &'static str,
    pub hint: &'static str,
    pub value: String,
    pub error: String,
}

/// `(name, label, metric hint, US hint)`.
pub type Spec = (&'static str, &'static str, &'static str, &'static str);

pub const CYLINDER: &[Spec] = &[
    ("bore", "Bore", "e.g. 100 mm", "e.g. 4 in"),
    ("rod", "Rod diameter", "e.g. 70 mm", "e.g. 2 in"),
    ("stroke", "Stroke", "e.g. 1000 mm", "e.g. 24 in"),
    (
        "position",
        "Position (extension)",
        "optional; half the stroke if empty",
        "optional; half the stroke if empty",
    ),
    ("load", "Held load", "e.g. 100 kN", "e.g. 10000 lbf"),
    (
        "min_load",
        "Lowest held load",
        "optional, e.g. 0 kN; each pressure is taken at its worst load",
        "optional, e.g. 0 lbf; each pressure is taken at its worst load",
    ),
    (
        "supply_pressure",
        "Supply (relief) pressure",
        "optional, e.g. 210 bar",
        "optional, e.g. 3000 psi",
    ),
    (
        "flow",
        "Supply flow",
        "optional, e.g. 60 L/min",
        "optional, e.g. 15 gpm",
    ),
];

pub const OPTIONS: &[Spec] = &[
    (
        "cap_line_volume",
        "Oil in the cap-end line",
        "optional, e.g. 0.5 L",
        "optional, e.g. 30 in3",
    ),
    (
        "rod_line_volume",
        "Oil in the rod-end line",
        "optional, e.g. 0.5 L",
        "optional, e.g. 30 in3",
    ),
    (
        "cap_line_expansion",
        "Cap-end hose swell",
        "optional, e.g. 0.5 cm3/bar",
        "optional, e.g. 0.002 in3/psi",
    ),
    (
        "rod_line_expansion",
        "Rod-end hose swell",
        "optional, e.g. 0.5 cm3/bar",
        "optional, e.g. 0.002 in3/psi",
    ),
    (
        "bulk_modulus",
        "Oil bulk modulus",
        "default 1.5 GPa (mineral oil)",
        "default 1.5 GPa (mineral oil)",
    ),
    (
        "oil_expansion",
        "Oil expansion coefficient",
        "default 0.0007 1/degC",
        "default 0.0007 1/degC",
    ),
    (
        "temperature_rise",
        "Trapped-oil warming",
        "default 10 degC",
        "default 18 degF",
    ),
    (
        "pilot_ratio",
        "Counterbalance pilot ratio",
        "optional number, e.g. 4",
        "optional number, e.g. 4",
    ),
    (
        "tube_outside_diameter",
        "Tube outside diameter",
        "optional, e.g. 121 mm",
        "optional, e.g. 4.75 in",
    ),
    (
        "tube_yield",
        "Tube yield strength",
        "optional, e.g. 355 MPa",
        "optional, e.g. 51 ksi",
    ),
    (
        "tube_safety_factor",
        "Tube safety factor",
        "number, default 2",
        "number, default 2",
    ),
    (
        "buckling_length",
        "Rod free length at full extension",
        "default twice the stroke",
        "default twice the stroke",
    ),
    (
        "rod_yield",
        "Rod yield strength",
        "default 355 MPa (assumed, errs low)",
        "default 51.5 ksi (assumed, errs low)",
    ),
    (
        "buckling_safety_factor",
        "Buckling safety factor",
        "number, default 3",
        "number, default 3",
    ),
];

pub const RATINGS: &[Spec] = &[
    (
        "ratings.cap_line",
        "Cap-end line rating",
        "optional, e.g. 210 bar",
        "optional, e.g. 3000 psi",
    ),
    (
        "ratings.rod_line",
        "Rod-end line rating",
        "optional, e.g. 210 bar",
        "optional, e.g. 3000 psi",
    ),
    (
        "ratings.cylinder",
        "Cylinder rating",
        "optional, e.g. 250 bar",
        "optional, e.g. 3600 psi",
    ),
];

pub const DRIFT: &[Spec] = &[
    ("duration", "Test duration", "e.g. 10 min", "e.g. 10 min"),
    (
        "drift",
        "Measured drift",
        "e.g. 2 mm, or give the positions",
        "e.g. 0.08 in, or give the positions",
    ),
    (
        "start_position",
        "Position at start",
        "e.g. 500 mm",
        "e.g. 12 in",
    ),
    (
        "end_position",
        "Position at end",
        "e.g. 498 mm",
        "e.g. 11.92 in",
    ),
    (
        "oil_temperature_start",
        "Oil temperature at start",
        "e.g. 50 degC",
        "e.g. 120 degF",
    ),
    (
        "oil_temperature_end",
        "Oil temperature at end",
        "e.g. 44 degC",
        "e.g. 110 degF",
    ),
    (
        "cap_pressure_start",
        "Cap-end pressure at start",
        "optional, e.g. 127 bar",
        "optional, e.g. 1000 psi",
    ),
    (
        "cap_pressure_end",
        "Cap-end pressure at end",
        "optional",
        "optional",
    ),
    (
        "rod_pressure_start",
        "Rod-end pressure at start",
        "optional",
        "optional",
    ),
    (
        "rod_pressure_end",
        "Rod-end pressure at end",
        "optional",
        "optional",
    ),
    (
        "limit.distance",
        "Allowed drift",
        "optional, e.g. 5 mm",
        "optional, e.g. 0.2 in",
    ),
    ("limit.per", "… per", "e.g. 10 min", "e.g. 10 min"),
];

pub const DECAY: &[Spec] = &[
    (
        "decay.duration",
        "Test duration",
        "e.g. 10 min",
        "e.g. 10 min",
    ),
    (
        "decay.pressure_start",
        "Pressure at start",
        "e.g. 200 bar",
        "e.g. 3000 psi",
    ),
    (
        "decay.pressure_end",
        "Pressure at end",
        "e.g. 185 bar",
        "e.g. 2800 psi",
    ),
    (
        "decay.oil_temperature_start",
        "Oil temperature at start",
        "e.g. 40 degC",
        "e.g. 104 degF",
    ),
    (
        "decay.oil_temperature_end",
        "Oil temperature at end",
        "e.g. 39 degC",
        "e.g. 102 degF",
    ),
    (
        "decay.other_pressure_start",
        "Other end's pressure at start",
        "optional",
        "optional",
    ),
    (
        "decay.other_pressure_end",
        "Other end's pressure at end",
        "optional",
        "optional",
    ),
    (
        "decay.limit.pressure",
        "Allowed drop",
        "optional, e.g. 10 bar",
        "optional, e.g. 150 psi",
    ),
    ("decay.limit.per", "… per", "e.g. 10 min", "e.g. 10 min"),
];

/// The inputs of one form section, filled with what was typed.
pub fn fields(specs: &[Spec], value: &dyn Fn(&str) -> String, units: UnitSystem) -> Vec<FieldView> {
    specs
        .iter()
        .map(|&(name, label, metric, us)| FieldView {
            name: name.to_string(),
            label,
            hint: if units == UnitSystem::Us { us } else { metric },
            value: value(name),
            error: String::new(),
        })
        .collect()
}

/// The label of a field for the error summary (the field name when it has no input).
pub fn label_of(field: &str) -> String {
    [CYLINDER, OPTIONS, RATINGS, DRIFT, DECAY]
        .iter()
        .flat_map(|s| s.iter())
        .find(|s| s.0 == field)
        .map_or_else(
            || match field {
                "load_direction" => "Load direction".to_string(),
                "end_condition" => "Rod end condition".to_string(),
                other => other.to_string(),
            },
            |s| s.1.to_string(),
        )
}
