//! Every problem of a calculation request at once. The readers in `calc_input` stop at the
//! first bad field (later fields depend on earlier ones); this pass reads each field on its
//! own first, so the API's `errors` list and the `/calc` page name every bad field together.
//! Problems between fields (a rod wider than the bore) come from the readers afterwards.

use super::input::Fields;
use crate::calc::quantity::Dimension as D;
use crate::error::AppError;

/// How a field is read on its own.
#[derive(Clone, Copy)]
enum Kind {
    /// A quantity that must not be negative.
    Size(D),
    /// A quantity that may be negative.
    Signed(D),
    /// A gauge pressure (down to -1 atm).
    Gauge,
    /// A plain number.
    Number,
}

/// The request fields read on their own, with whether they are required.
const CYLINDER: &[(&str, Kind, bool)] = &[
    ("bore", Kind::Size(D::Length), true),
    ("rod", Kind::Size(D::Length), true),
    ("stroke", Kind::Size(D::Length), true),
    ("load", Kind::Size(D::Force), true),
    ("position", Kind::Size(D::Length), false),
    ("min_load", Kind::Size(D::Force), false),
    ("bulk_modulus", Kind::Size(D::Pressure), false),
    ("oil_expansion", Kind::Size(D::Expansion), false),
    ("supply_pressure", Kind::Size(D::Pressure), false),
    ("flow", Kind::Size(D::Flow), false),
    ("cap_line_volume", Kind::Size(D::Volume), false),
    ("rod_line_volume", Kind::Size(D::Volume), false),
    ("cap_line_expansion", Kind::Size(D::Compliance), false),
    ("rod_line_expansion", Kind::Size(D::Compliance), false),
    ("tube_outside_diameter", Kind::Size(D::Length), false),
    ("tube_yield", Kind::Size(D::Pressure), false),
    ("tube_youngs_modulus", Kind::Size(D::Pressure), false),
    ("rod_youngs_modulus", Kind::Size(D::Pressure), false),
    ("rod_yield", Kind::Size(D::Pressure), false),
    ("buckling_length", Kind::Size(D::Length), false),
    ("temperature_rise", Kind::Size(D::TemperatureChange), false),
    ("holding_valve_setting", Kind::Size(D::Pressure), false),
    ("tube_safety_factor", Kind::Number, false),
    ("tube_poisson_ratio", Kind::Number, false),
    ("pilot_ratio", Kind::Number, false),
    ("buckling_safety_factor", Kind::Number, false),
    ("rod_poisson_ratio", Kind::Number, false),
    ("holding_valve_pilot_ratio", Kind::Number, false),
    ("entrained_air", Kind::Number, false),
];

const DRIFT: &[(&str, Kind, bool)] = &[
    ("duration", Kind::Size(D::Time), true),
    ("drift", Kind::Signed(D::Length), false),
    ("start_position", Kind::Size(D::Length), false),
    ("end_position", Kind::Size(D::Length), false),
    ("oil_temperature_start", Kind::Size(D::Temperature), true),
    ("oil_temperature_end", Kind::Size(D::Temperature), true),
    ("cap_pressure_start", Kind::Gauge, false),
    ("cap_pressure_end", Kind::Gauge, false),
    ("rod_pressure_start", Kind::Gauge, false),
    ("rod_pressure_end", Kind::Gauge, false),
];

const DECAY: &[(&str, Kind, bool)] = &[
    ("duration", Kind::Size(D::Time), true),
    ("pressure_start", Kind::Gauge, true),
    ("pressure_end", Kind::Gauge, true),
    ("oil_temperature_start", Kind::Size(D::Temperature), true),
    ("oil_temperature_end", Kind::Size(D::Temperature), true),
    ("other_pressure_start", Kind::Gauge, false),
    ("other_pressure_end", Kind::Gauge, false),
];

/// Which readings a request carries besides the cylinder.
#[derive(Clone, Copy, PartialEq, Eq)]
pub enum Readings {
    None,
    Drift,
    Decay,
}

/// Every field of the request read on its own; each problem names its field.
pub fn problems(f: &Fields, readings: Readings) -> Vec<AppError> {
    let mut out = Vec::new();
    let extra: &[(&str, Kind, bool)] = match readings {
        Readings::None => &[],
        Readings::Drift => DRIFT,
        Readings::Decay => DECAY,
    };
    let cylinder: &[(&str, Kind, bool)] = if readings == Readings::Decay {
        // The decay test needs no load: the handler fills it in when left out.
        &CYLINDER[..3]
    } else {
        &CYLINDER[..4]
    };
    let optional = &CYLINDER[4..];
    for &(name, kind, required) in cylinder.iter().chain(optional).chain(extra) {
        let result = match kind {
            Kind::Size(d) if required => f.quantity(name, d).map(drop),
            Kind::Size(d) => f.opt_quantity(name, d).map(drop),
            Kind::Signed(d) => f.opt_signed_quantity(name, d).map(drop),
            Kind::Gauge if required => f.gauge_pressure(name).map(drop),
            Kind::Gauge => f.opt_gauge_pressure(name).map(drop),
            Kind::Number => f.opt_number(name).map(drop),
        };
        if let Err(e) = result {
            out.push(e);
        }
    }
    if readings != Readings::Decay
        && let Err(e) = f.choice("load_direction", super::calc_input::LOAD_DIRECTIONS)
    {
        out.push(e);
    }
    if readings == Readings::Decay
        && let Err(e) = f.choice("pressurised_end", &["cap", "rod"])
    {
        out.push(e);
    }
    out
}

/// `Ok` when no field is bad on its own, else every problem as one error.
pub fn check(f: &Fields, readings: Readings) -> Result<(), AppError> {
    let found = problems(f, readings);
    if found.is_empty() {
        Ok(())
    } else {
        Err(AppError::several(found))
    }
}
