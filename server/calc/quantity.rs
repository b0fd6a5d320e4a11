//! Physical quantities: parsing `"<number> <unit>"` text into SI, and showing SI values in
//! the display units of a unit system.
//!
//! Conversion factors are exact where the definition is exact: inch = 0.0254 m and
//! pound-force = 0.45359237 kg x 9.80665 m/s² (NIST SP 811), US gallon = 231 in³
//! (NIST Handbook 44, Appendix C), bar = 1e5 Pa (ISO 80000-4), kilogram-force = 1 kg x
//! 9.80665 m/s² (NIST SP 811). What people type is read by `calc::spelling` (decimal comma,
//! digit grouping, unit spellings such as `lbs`, `inch`, `°C`, `lpm`, one table).

use super::spelling::{self, STANDARD_GRAVITY, Spelling};
use serde::{Deserialize, Serialize};
use std::fmt;

/// Metres in one inch (exact, NIST SP 811).
pub const INCH: f64 = 0.0254;
/// Newtons in one pound-force (exact, NIST SP 811).
pub const LBF: f64 = 0.453_592_37 * 9.806_65;
/// Pascals in one psi (lbf/in², derived from the two above).
pub const PSI: f64 = LBF / (INCH * INCH);
/// Cubic metres in one US gallon (231 in³ exactly, NIST Handbook 44).
pub const US_GALLON: f64 = 231.0 * INCH * INCH * INCH;
/// Kelvin at 0 degC.
pub const ZERO_CELSIUS: f64 = 273.15;

/// The kind of a physical quantity; decides which units are accepted.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Dimension {
    Length,
    Area,
    Volume,
    Force,
    Pressure,
    Flow,
    Speed,
    /// An absolute temperature (SI: K).
    Temperature,
    /// A temperature difference (SI: K).
    TemperatureChange,
    Time,
    /// A cubical expansion coefficient (SI: 1/K).
    Expansion,
    /// Volume taken up per unit pressure, e.g. of a hose (SI: m³/Pa).
    Compliance,
}

impl Dimension {
    /// Lower-case name used in messages.
    pub fn name(self) -> &'static str {
        match self {
            Dimension::Length => "length",
            Dimension::Area => "area",
            Dimension::Volume => "volume",
            Dimension::Force => "force",
            Dimension::Pressure => "pressure",
            Dimension::Flow => "flow",
            Dimension::Speed => "speed",
            Dimension::Temperature => "temperature",
            Dimension::TemperatureChange => "temperature change",
            Dimension::Time => "time",
            Dimension::Expansion => "expansion coefficient",
            Dimension::Compliance => "volume per pressure",
        }
    }
}

/// Which display units a response uses.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq, Hash, Serialize, Deserialize)]
#[serde(rename_all = "lowercase")]
pub enum UnitSystem {
    /// in, in², in³, lbf, psi, gpm, in/s, degF.
    Us,
    /// mm, cm², L, kN, bar, L/min, mm/s, degC.
    #[default]
    Metric,
}

impl UnitSystem {
    /// Parses `"us"` or `"metric"`.
    pub fn parse(text: &str) -> Option<UnitSystem> {
        match text {
            "us" => Some(UnitSystem::Us),
            "metric" => Some(UnitSystem::Metric),
            _ => None,
        }
    }

    /// The wire name, `"us"` or `"metric"`.
    pub fn as_str(self) -> &'static str {
        match self {
            UnitSystem::Us => "us",
            UnitSystem::Metric => "metric",
        }
    }
}

/// How a unit maps to SI: `si = value * factor + offset`.
#[derive(Clone, Copy, Debug)]
pub struct Unit {
    pub symbol: &'static str,
    pub dimension: Dimension,
    pub factor: f64,
    pub offset: f64,
}

const fn u(symbol: &'static str, dimension: Dimension, factor: f64) -> Unit {
    Unit {
        symbol,
        dimension,
        factor,
        offset: 0.0,
    }
}

use Dimension as D;

/// Every accepted unit symbol. The first symbol of each dimension is its SI unit.
pub const UNITS: &[Unit] = &[
    u("m", D::Length, 1.0),
    u("mm", D::Length, 1e-3),
    u("cm", D::Length, 1e-2),
    u("in", D::Length, INCH),
    u("ft", D::Length, 12.0 * INCH),
    u("m2", D::Area, 1.0),
    u("mm2", D::Area, 1e-6),
    u("cm2", D::Area, 1e-4),
    u("in2", D::Area, INCH * INCH),
    u("m3", D::Volume, 1.0),
    u("L", D::Volume, 1e-3),
    u("mL", D::Volume, 1e-6),
    u("cm3", D::Volume, 1e-6),
    u("cc", D::Volume, 1e-6),
    u("in3", D::Volume, INCH * INCH * INCH),
    u("gal", D::Volume, US_GALLON),
    u("N", D::Force, 1.0),
    u("kN", D::Force, 1e3),
    u("lbf", D::Force, LBF),
    u("kip", D::Force, 1e3 * LBF),
    // The weight of a kilogram and of a tonne (1000 kg) under standard gravity.
    u("kgf", D::Force, STANDARD_GRAVITY),
    u("t", D::Force, 1e3 * STANDARD_GRAVITY),
    u("Pa", D::Pressure, 1.0),
    u("kPa", D::Pressure, 1e3),
    u("MPa", D::Pressure, 1e6),
    u("GPa", D::Pressure, 1e9),
    u("bar", D::Pressure, 1e5),
    u("psi", D::Pressure, PSI),
    u("ksi", D::Pressure, 1e3 * PSI),
    u("m3/s", D::Flow, 1.0),
    u("L/min", D::Flow, 1e-3 / 60.0),
    u("gpm", D::Flow, US_GALLON / 60.0),
    u("m/s", D::Speed, 1.0),
    u("mm/s", D::Speed, 1e-3),
    u("in/s", D::Speed, INCH),
    u("ft/min", D::Speed, 12.0 * INCH / 60.0),
    Unit {
        symbol: "K",
        dimension: D::Temperature,
        factor: 1.0,
        offset: 0.0,
    },
    Unit {
        symbol: "degC",
        dimension: D::Temperature,
        factor: 1.0,
        offset: ZERO_CELSIUS,
    },
    Unit {
        symbol: "degF",
        dimension: D::Temperature,
        factor: 5.0 / 9.0,
        offset: ZERO_CELSIUS - 32.0 * 5.0 / 9.0,
    },
    u("K", D::TemperatureChange, 1.0),
    u("degC", D::TemperatureChange, 1.0),
    u("degF", D::TemperatureChange, 5.0 / 9.0),
    u("s", D::Time, 1.0),
    u("min", D::Time, 60.0),
    u("h", D::Time, 3600.0),
    u("1/K", D::Expansion, 1.0),
    u("1/degC", D::Expansion, 1.0),
    u("1/degF", D::Expansion, 9.0 / 5.0),
    u("m3/Pa", D::Compliance, 1.0),
    u("cm3/bar", D::Compliance, 1e-6 / 1e5),
    u("mL/bar", D::Compliance, 1e-6 / 1e5),
    u("L/bar", D::Compliance, 1e-3 / 1e5),
    u("in3/psi", D::Compliance, INCH * INCH * INCH / PSI),
];

/// Why a quantity could not be read. The caller adds the field name.
#[derive(Clone, Debug, PartialEq)]
pub struct QuantityError {
    pub message: String,
}

impl fmt::Display for QuantityError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(&self.message)
    }
}

impl std::error::Error for QuantityError {}

fn err(message: String) -> QuantityError {
    QuantityError { message }
}

/// The symbols accepted for a dimension, in table order.
pub fn accepted_units(dimension: Dimension) -> Vec<&'static str> {
    UNITS
        .iter()
        .filter(|unit| unit.dimension == dimension)
        .map(|unit| unit.symbol)
        .collect()
}

/// Writes the spellings people use for the same unit in one form (`°C` -> `degC`,
/// `in²` -> `in2`, `l/min` -> `L/min`); the spellings table (`calc::spelling::SPELLINGS`)
/// is read before these general rules.
fn canonical(symbol: &str, dimension: Dimension) -> Result<String, QuantityError> {
    match spelling::lookup(symbol.trim(), dimension) {
        Some(Spelling::Unit(symbol)) => return Ok(symbol.into()),
        Some(Spelling::Refused(why)) => return Err(err(why.into())),
        None => {}
    }
    let mut s = symbol
        .trim()
        .replace('°', "deg")
        .replace('²', "2")
        .replace('³', "3");
    s = s.replace("^2", "2").replace("^3", "3");
    Ok(match s.as_str() {
        "l" => "L".into(),
        "ml" => "mL".into(),
        "l/min" | "lpm" => "L/min".into(),
        "degc" | "C" => "degC".into(),
        "degf" | "F" => "degF".into(),
        "1/°C" => "1/degC".into(),
        "sec" => "s".into(),
        "hr" => "h".into(),
        _ => s,
    })
}

/// Looks up a unit symbol for a dimension.
pub fn find_unit(symbol: &str, dimension: Dimension) -> Result<&'static Unit, QuantityError> {
    let symbol = canonical(symbol, dimension)?;
    if let Some(unit) = UNITS
        .iter()
        .find(|unit| unit.symbol == symbol && unit.dimension == dimension)
    {
        return Ok(unit);
    }
    let accepted = accepted_units(dimension).join(", ");
    match UNITS.iter().find(|unit| unit.symbol == symbol) {
        Some(other) => Err(err(format!(
            "\"{symbol}\" is a unit of {}, not of {}; use one of: {accepted}",
            other.dimension.name(),
            dimension.name()
        ))),
        None => Err(err(format!(
            "unknown unit \"{symbol}\" for a {}; use one of: {accepted}",
            dimension.name()
        ))),
    }
}

/// Converts `value` in `unit` to SI (m, m², m³, N, Pa, m³/s, m/s, K, s, 1/K, m³/Pa).
/// Rejects NaN, infinity and temperatures below absolute zero.
pub fn to_si(value: f64, unit: &str, dimension: Dimension) -> Result<f64, QuantityError> {
    if !value.is_finite() {
        return Err(err(format!(
            "the number must be finite, got {value}; write a {} such as {}",
            dimension.name(),
            example(dimension)
        )));
    }
    let unit = find_unit(unit, dimension)?;
    let si = value * unit.factor + unit.offset;
    if !si.is_finite() {
        return Err(err(format!("{value} {} is out of range", unit.symbol)));
    }
    if dimension == Dimension::Temperature && si < 0.0 {
        return Err(err(format!(
            "{value} {} is below absolute zero",
            unit.symbol
        )));
    }
    Ok(si)
}

/// Parses `"<number> <unit>"` (the space is optional: `"4in"` is read as 4 in) into SI. The
/// number may use a decimal comma or digit grouping where only one reading fits
/// (`calc::spelling::read_number`); the unit may be any spelling of `calc::spelling::SPELLINGS`.
pub fn parse_str(text: &str, dimension: Dimension) -> Result<f64, QuantityError> {
    let text = text.trim();
    let (number, unit) = spelling::split(text);
    let unit = unit.trim();
    if number.is_empty() {
        return Err(err(format!(
            "type a number and a unit such as {}; \"{text}\" has no number",
            example(dimension)
        )));
    }
    if unit.is_empty() {
        return Err(err(format!(
            "a unit is required: type {} (accepted units: {})",
            example(dimension),
            accepted_units(dimension).join(", ")
        )));
    }
    let value = spelling::read_number(&number).map_err(err)?;
    to_si(value, unit, dimension)
}

/// An example of a well-formed quantity, for messages.
pub fn example(dimension: Dimension) -> &'static str {
    match dimension {
        Dimension::Length => "\"4 in\" or \"101.6 mm\"",
        Dimension::Area => "\"12.57 in2\" or \"81 cm2\"",
        Dimension::Volume => "\"2 L\" or \"120 in3\"",
        Dimension::Force => "\"10000 lbf\" or \"45 kN\"",
        Dimension::Pressure => "\"3000 psi\" or \"207 bar\"",
        Dimension::Flow => "\"20 gpm\" or \"75 L/min\"",
        Dimension::Speed => "\"4 in/s\" or \"100 mm/s\"",
        Dimension::Temperature => "\"60 degC\" or \"140 degF\"",
        Dimension::TemperatureChange => "\"10 degC\" or \"18 degF\"",
        Dimension::Time => "\"10 min\" or \"600 s\"",
        Dimension::Expansion => "\"0.0007 1/degC\"",
        Dimension::Compliance => "\"0.5 cm3/bar\"",
    }
}

/// A quantity as the API shows it: SI value, display value and display unit.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct Shown {
    pub si: f64,
    pub value: f64,
    pub unit: &'static str,
}

/// The display unit of a dimension in a unit system.
pub fn display_unit(dimension: Dimension, units: UnitSystem) -> &'static str {
    match (units, dimension) {
        (UnitSystem::Us, D::Length) => "in",
        (UnitSystem::Us, D::Area) => "in2",
        (UnitSystem::Us, D::Volume) => "in3",
        (UnitSystem::Us, D::Force) => "lbf",
        (UnitSystem::Us, D::Pressure) => "psi",
        (UnitSystem::Us, D::Flow) => "gpm",
        (UnitSystem::Us, D::Speed) => "in/s",
        (UnitSystem::Us, D::Temperature) => "degF",
        (UnitSystem::Us, D::TemperatureChange) => "degF",
        (UnitSystem::Us, D::Expansion) => "1/degF",
        (UnitSystem::Us, D::Compliance) => "in3/psi",
        (UnitSystem::Metric, D::Length) => "mm",
        (UnitSystem::Metric, D::Area) => "cm2",
        (UnitSystem::Metric, D::Volume) => "L",
        (UnitSystem::Metric, D::Force) => "kN",
        (UnitSystem::Metric, D::Pressure) => "bar",
        (UnitSystem::Metric, D::Flow) => "L/min",
        (UnitSystem::Metric, D::Speed) => "mm/s",
        (UnitSystem::Metric, D::Temperature) => "degC",
        (UnitSystem::Metric, D::TemperatureChange) => "degC",
        (UnitSystem::Metric, D::Expansion) => "1/degC",
        (UnitSystem::Metric, D::Compliance) => "cm3/bar",
        (_, D::Time) => "s",
    }
}

/// Converts an SI value to `unit` (a symbol of `dimension`).
pub fn from_si(si: f64, unit: &str, dimension: Dimension) -> Result<f64, QuantityError> {
    let unit = find_unit(unit, dimension)?;
    Ok((si - unit.offset) / unit.factor)
}

/// Shows an SI value in the display unit of `units`.
pub fn show(si: f64, dimension: Dimension, units: UnitSystem) -> Shown {
    let symbol = display_unit(dimension, units);
    let unit = UNITS
        .iter()
        .find(|unit| unit.symbol == symbol && unit.dimension == dimension)
        .expect("every display unit is in the table");
    Shown {
        si,
        value: (si - unit.offset) / unit.factor,
        unit: unit.symbol,
    }
}

/// Formats an SI value for a page: display value with four significant figures and its unit,
/// e.g. `"3000 psi"`, `"101.6 mm"`.
pub fn format(si: f64, dimension: Dimension, units: UnitSystem) -> String {
    let shown = show(si, dimension, units);
    format!("{} {}", significant(shown.value, 4), shown.unit)
}

/// Formats a number to `digits` significant figures without trailing zeros.
pub fn significant(value: f64, digits: usize) -> String {
    if value == 0.0 || !value.is_finite() {
        return format!("{value}");
    }
    let magnitude = value.abs().log10().floor() as i32;
    let decimals = (digits as i32 - 1 - magnitude).max(0) as usize;
    let text = format!("{value:.decimals$}");
    if text.contains('.') {
        text.trim_end_matches('0').trim_end_matches('.').to_string()
    } else {
        text
    }
}
