//! How a typed quantity is read: the number (decimal comma, digit grouping) and the unit
//! spellings people use. One table, `SPELLINGS`, maps what people type to a symbol of
//! `quantity::UNITS` (or refuses it, saying why); `read_number` holds the separator rules.
//!
//! Number rules (ours; a site number format does not exist yet, so nothing is guessed):
//! - A point is always the decimal point: `101.6`.
//! - A single comma is a decimal comma where nothing else fits: `101,6`, `0,450`, `2,45`.
//! - A single comma followed by exactly three digits after one to three leading digits
//!   (`2,450`) could be a thousands separator (2450) or a decimal comma (2.45): refused,
//!   naming both readings.
//! - Several commas or several points are digit grouping when every group after the first has
//!   three digits (`1,234,567`, `1.234.567`); a space or a narrow space between three-digit
//!   groups is grouping too (`10 000`).
//! - A comma and a point together: the last one is the decimal mark, the other groups digits
//!   in threes (`1,234.5`, `1.234,5`).

use super::quantity::Dimension;

/// Standard acceleration of gravity, m/s² (exact; CGPM 1901, NIST SP 811 Appendix B.8).
pub const STANDARD_GRAVITY: f64 = 9.806_65;

/// What a spelling stands for.
#[derive(Clone, Copy, Debug)]
pub enum Spelling {
    /// The symbol in `quantity::UNITS`.
    Unit(&'static str),
    /// Not accepted, with the reason and what to type instead.
    Refused(&'static str),
}

use Dimension as D;
use Spelling::{Refused, Unit};

/// Spellings people type, with the dimension they apply to (`None`: any) and what they mean.
/// Looked up exactly as typed (after trimming): `MPa` and `mPa` differ, so case is only
/// forgiven where it is listed.
pub const SPELLINGS: &[(&str, Option<Dimension>, Spelling)] = &[
    // Length
    ("inch", Some(D::Length), Unit("in")),
    ("inches", Some(D::Length), Unit("in")),
    ("″", Some(D::Length), Unit("in")),
    ("\"", Some(D::Length), Unit("in")),
    ("''", Some(D::Length), Unit("in")),
    ("IN", Some(D::Length), Unit("in")),
    ("foot", Some(D::Length), Unit("ft")),
    ("feet", Some(D::Length), Unit("ft")),
    ("′", Some(D::Length), Unit("ft")),
    ("'", Some(D::Length), Unit("ft")),
    ("MM", Some(D::Length), Unit("mm")),
    // Area and volume
    ("sq in", Some(D::Area), Unit("in2")),
    ("sq. in", Some(D::Area), Unit("in2")),
    ("cu in", Some(D::Volume), Unit("in3")),
    ("litre", Some(D::Volume), Unit("L")),
    ("litres", Some(D::Volume), Unit("L")),
    ("liter", Some(D::Volume), Unit("L")),
    ("liters", Some(D::Volume), Unit("L")),
    // Force: a pound in a force field is the pound-force; a mass unit in a force field is
    // the weight of that mass under standard gravity.
    ("lb", Some(D::Force), Unit("lbf")),
    ("lbs", Some(D::Force), Unit("lbf")),
    ("LB", Some(D::Force), Unit("lbf")),
    ("LBS", Some(D::Force), Unit("lbf")),
    ("Lbs", Some(D::Force), Unit("lbf")),
    ("LBF", Some(D::Force), Unit("lbf")),
    ("kn", Some(D::Force), Unit("kN")),
    ("KN", Some(D::Force), Unit("kN")),
    ("kips", Some(D::Force), Unit("kip")),
    ("kg", Some(D::Force), Unit("kgf")),
    ("tonne", Some(D::Force), Unit("t")),
    ("tonnes", Some(D::Force), Unit("t")),
    (
        "ton",
        Some(D::Force),
        Refused(
            "\"ton\" may mean 1000 kg, 2000 lb (US) or 2240 lb (UK); write t for a metric tonne, or the load in lbf",
        ),
    ),
    (
        "tons",
        Some(D::Force),
        Refused(
            "\"tons\" may mean 1000 kg, 2000 lb (US) or 2240 lb (UK); write t for metric tonnes, or the load in lbf",
        ),
    ),
    // Pressure
    ("PSI", Some(D::Pressure), Unit("psi")),
    ("Psi", Some(D::Pressure), Unit("psi")),
    ("BAR", Some(D::Pressure), Unit("bar")),
    ("Bar", Some(D::Pressure), Unit("bar")),
    ("kpa", Some(D::Pressure), Unit("kPa")),
    ("KPa", Some(D::Pressure), Unit("kPa")),
    (
        "psia",
        Some(D::Pressure),
        Refused("pressures here are gauge pressures; write the gauge reading in psi"),
    ),
    ("psig", Some(D::Pressure), Unit("psi")),
    ("barg", Some(D::Pressure), Unit("bar")),
    (
        "mpa",
        Some(D::Pressure),
        Refused("write MPa (megapascal) with a capital M and P"),
    ),
    // Flow
    ("lpm", Some(D::Flow), Unit("L/min")),
    ("LPM", Some(D::Flow), Unit("L/min")),
    ("l/min", Some(D::Flow), Unit("L/min")),
    ("GPM", Some(D::Flow), Unit("gpm")),
    ("gal/min", Some(D::Flow), Unit("gpm")),
    ("US gpm", Some(D::Flow), Unit("gpm")),
    // Temperature (absolute and change alike)
    ("°C", None, Unit("degC")),
    ("ºC", None, Unit("degC")),
    ("C", None, Unit("degC")),
    ("celsius", None, Unit("degC")),
    ("°F", None, Unit("degF")),
    ("ºF", None, Unit("degF")),
    ("F", None, Unit("degF")),
    ("fahrenheit", None, Unit("degF")),
    // Time
    ("sec", Some(D::Time), Unit("s")),
    ("secs", Some(D::Time), Unit("s")),
    ("seconds", Some(D::Time), Unit("s")),
    ("mins", Some(D::Time), Unit("min")),
    ("minutes", Some(D::Time), Unit("min")),
    ("hr", Some(D::Time), Unit("h")),
    ("hrs", Some(D::Time), Unit("h")),
    ("hours", Some(D::Time), Unit("h")),
];

/// The spelling's meaning for a field of `dimension`, if the table lists it.
pub fn lookup(typed: &str, dimension: Dimension) -> Option<Spelling> {
    SPELLINGS
        .iter()
        .find(|(text, dim, _)| *text == typed && dim.is_none_or(|d| d == dimension))
        .map(|(_, _, meaning)| *meaning)
}

/// True when `c` may be part of the number of a typed quantity.
fn number_char(c: char) -> bool {
    c.is_ascii_digit() || matches!(c, '.' | ',' | '+' | '-')
}

/// Splits typed text into its number and its unit. A space (or a no-break or narrow space)
/// counts as digit grouping only between a digit and exactly three digits that end the
/// number or are followed by a separator.
pub fn split(text: &str) -> (String, &str) {
    let chars: Vec<(usize, char)> = text.char_indices().collect();
    let mut number = String::new();
    let mut i = 0;
    while i < chars.len() {
        let (at, c) = chars[i];
        let next = chars.get(i + 1).map(|&(_, n)| n);
        let exponent = (c == 'e' || c == 'E')
            && i > 0
            && number.chars().last().is_some_and(|p| p.is_ascii_digit())
            && next.is_some_and(|n| n.is_ascii_digit() || n == '-' || n == '+');
        let grouping_space = matches!(c, ' ' | '\u{a0}' | '\u{202f}')
            && number.chars().last().is_some_and(|p| p.is_ascii_digit())
            && (1..=3).all(|k| chars.get(i + k).is_some_and(|&(_, d)| d.is_ascii_digit()))
            && chars.get(i + 4).is_none_or(|&(_, d)| !d.is_ascii_digit())
            && !number.contains(['e', 'E']);
        if number_char(c) || exponent {
            number.push(c);
        } else if !grouping_space {
            return (number, &text[at..]);
        }
        i += 1;
    }
    (number, "")
}

/// True when `groups` are digit groups: the first of one to three digits, every other of three.
fn grouped(groups: &[&str]) -> bool {
    let digits = |g: &str| !g.is_empty() && g.bytes().all(|b| b.is_ascii_digit());
    groups.first().is_some_and(|g| digits(g) && g.len() <= 3)
        && groups[1..].iter().all(|g| digits(g) && g.len() == 3)
}

/// Reads a typed number by the rules in this module's comment; the error says what to type.
pub fn read_number(typed: &str) -> Result<f64, String> {
    let not_a_number = || format!("\"{typed}\" is not a number; type digits such as 101.6");
    let (sign, body) = match typed.strip_prefix(['-', '+']) {
        Some(rest) => (&typed[..1], rest),
        None => ("", typed),
    };
    let (mantissa, exponent) = match body.find(['e', 'E']) {
        Some(at) => body.split_at(at),
        None => (body, ""),
    };
    let commas = mantissa.matches(',').count();
    let points = mantissa.matches('.').count();
    let plain: String = match (commas, points) {
        (0, 0) | (0, 1) => mantissa.to_string(),
        (1, 0) => {
            let (whole, fraction) = mantissa.split_once(',').unwrap_or((mantissa, ""));
            let thousands = grouped(&[whole, fraction]) && !whole.starts_with('0');
            if thousands {
                return Err(format!(
                    "\"{typed}\" could be {sign}{whole}{fraction} (comma as thousands separator) or {sign}{whole}.{fraction} (decimal comma); type {sign}{whole}{fraction} or {sign}{whole}.{fraction}"
                ));
            }
            format!("{whole}.{fraction}")
        }
        (0, _) | (_, 0) => {
            let mark = if commas > 0 { ',' } else { '.' };
            let groups: Vec<&str> = mantissa.split(mark).collect();
            if !grouped(&groups) {
                return Err(not_a_number());
            }
            groups.concat()
        }
        _ => {
            let last_comma = mantissa.rfind(',').unwrap_or(0);
            let last_point = mantissa.rfind('.').unwrap_or(0);
            let (group_mark, decimal_mark) = if last_comma > last_point {
                ('.', ',')
            } else {
                (',', '.')
            };
            let Some((whole, fraction)) = mantissa.rsplit_once(decimal_mark) else {
                return Err(not_a_number());
            };
            let groups: Vec<&str> = whole.split(group_mark).collect();
            if whole.contains(decimal_mark) || fraction.contains(group_mark) || !grouped(&groups) {
                return Err(not_a_number());
            }
            format!("{}.{fraction}", groups.concat())
        }
    };
    if plain.is_empty() || plain.starts_with('.') && plain.len() == 1 {
        return Err(not_a_number());
    }
    format!("{sign}{plain}{exponent}")
        .parse::<f64>()
        .map_err(|_| not_a_number())
}
