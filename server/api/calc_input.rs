//! Calculation requests read into the engineering core's inputs, and its reports written out
//! as the JSON of the calculation API. Shared by `api::calc`, the `/calc` page and the stored
//! drift tests, so that a stored analysis is exactly what the calculation API answers.

use crate::api::input::Fields;
use crate::calc::analysis::{CylinderInput, RodBuckling};
use crate::calc::bypass::{Line, TubeWall};
use crate::calc::cylinder::{Cylinder, End, LoadDirection};
use crate::calc::decay::{DecayLimit, DecayReadings};
use crate::calc::drift::{DriftReadings, Limit, Movement, PortPressures};
use crate::calc::error::CalcError;
use crate::calc::quantity::Dimension as D;
use crate::calc::ratings::{Exposure, Rating};
use crate::calc::strength::EndCondition;
use crate::error::AppError;
use serde_json::{Map, Value};

pub use crate::api::calc_output::{decay_response, drift_response};
pub use crate::api::cylinder_answer::cylinder_response;

/// Fields of a cylinder request (`POST /api/v1/calc/cylinder`).
pub const CYLINDER_FIELDS: &[&str] = &[
    "bore",
    "rod",
    "stroke",
    "position",
    "load",
    "min_load",
    "load_direction",
    "bulk_modulus",
    "oil_expansion",
    "supply_pressure",
    "flow",
    "cap_line_volume",
    "rod_line_volume",
    "cap_line_expansion",
    "rod_line_expansion",
    "tube_outside_diameter",
    "tube_yield",
    "tube_safety_factor",
    "tube_youngs_modulus",
    "tube_poisson_ratio",
    "temperature_rise",
    "pilot_ratio",
    "end_condition",
    "buckling_length",
    "buckling_safety_factor",
    "rod_youngs_modulus",
    "rod_poisson_ratio",
    "rod_yield",
    "ratings",
    "units",
    // Valves and air (api::calc_valves).
    "holding_valve",
    "holding_valve_setting",
    "holding_valve_pilot_ratio",
    "holding_valve_pilot",
    "cap_port_centre",
    "rod_port_centre",
    "entrained_air",
];

/// Reading fields of a drift-test request, on top of [`CYLINDER_FIELDS`].
pub const DRIFT_FIELDS: &[&str] = &[
    "duration",
    "drift",
    "start_position",
    "end_position",
    "oil_temperature_start",
    "oil_temperature_end",
    "cap_pressure_start",
    "cap_pressure_end",
    "rod_pressure_start",
    "rod_pressure_end",
    "limit",
];

/// Reading fields of a pressure-decay request, on top of [`CYLINDER_FIELDS`].
pub const DECAY_FIELDS: &[&str] = &[
    "pressurised_end",
    "duration",
    "pressure_start",
    "pressure_end",
    "oil_temperature_start",
    "oil_temperature_end",
    "other_pressure_start",
    "other_pressure_end",
    "limit",
];

/// `a` followed by `b`, for `deny_unknown`.
pub fn allowed(a: &[&'static str], b: &[&'static str]) -> Vec<&'static str> {
    a.iter().chain(b).copied().collect()
}

/// A core error as the API's 422 naming the field.
pub fn calc_error(error: CalcError) -> AppError {
    AppError::field(error.field, "out_of_range", error.message)
}

/// The load direction words.
pub const LOAD_DIRECTIONS: &[&str] = &["retract", "extend"];

/// Reads the cylinder fields of a calculation request (unknown fields are the caller's to
/// refuse). Every quantity carries its unit; errors name the field (`ratings.cap_line`).
pub fn parse_cylinder_request(f: &Fields) -> Result<CylinderInput, AppError> {
    let bore = f.quantity("bore", D::Length)?;
    let rod = f.quantity("rod", D::Length)?;
    let stroke = f.quantity("stroke", D::Length)?;
    let cylinder = Cylinder::new(bore, rod, stroke).map_err(calc_error)?;
    let load = f.quantity("load", D::Force)?;
    let direction = match f.choice("load_direction", LOAD_DIRECTIONS)? {
        "extend" => LoadDirection::Extend,
        _ => LoadDirection::Retract,
    };
    let mut input = CylinderInput::new(cylinder, load, direction);
    input.min_load = f.opt_quantity("min_load", D::Force)?;
    input.position = f.opt_quantity("position", D::Length)?;
    if let Some(b) = f.opt_quantity("bulk_modulus", D::Pressure)? {
        input.trapped.bulk_modulus = b;
    }
    if let Some(a) = f.opt_quantity("oil_expansion", D::Expansion)? {
        input.oil_expansion = a;
    }
    input.supply_pressure = f.opt_quantity("supply_pressure", D::Pressure)?;
    input.flow = f.opt_quantity("flow", D::Flow)?;
    input.trapped.cap_line = Line {
        volume: f.opt_quantity("cap_line_volume", D::Volume)?.unwrap_or(0.0),
        expansion: f
            .opt_quantity("cap_line_expansion", D::Compliance)?
            .unwrap_or(0.0),
    };
    input.trapped.rod_line = Line {
        volume: f.opt_quantity("rod_line_volume", D::Volume)?.unwrap_or(0.0),
        expansion: f
            .opt_quantity("rod_line_expansion", D::Compliance)?
            .unwrap_or(0.0),
    };
    input.trapped.tube = f
        .opt_quantity("tube_outside_diameter", D::Length)?
        .map(TubeWall::steel);
    let tube_youngs = f.opt_quantity("tube_youngs_modulus", D::Pressure)?;
    let tube_poisson = f.opt_number("tube_poisson_ratio")?;
    if let Some(tube) = input.trapped.tube.as_mut() {
        tube.youngs = tube_youngs.unwrap_or(tube.youngs);
        tube.poisson = tube_poisson.unwrap_or(tube.poisson);
    } else {
        for (name, given) in [
            ("tube_youngs_modulus", tube_youngs.is_some()),
            ("tube_poisson_ratio", tube_poisson.is_some()),
        ] {
            if given {
                return Err(AppError::field(
                    name,
                    "requires",
                    format!("{name} needs the tube_outside_diameter too"),
                ));
            }
        }
    }
    input.tube_yield = f.opt_quantity("tube_yield", D::Pressure)?;
    if input.tube_yield.is_some() && input.trapped.tube.is_none() {
        return Err(AppError::field(
            "tube_yield",
            "requires",
            "a tube yield needs the tube_outside_diameter too",
        ));
    }
    if let Some(sf) = f.opt_number("tube_safety_factor")? {
        input.tube_safety_factor = sf;
    }
    if let Some(dt) = f.opt_quantity("temperature_rise", D::TemperatureChange)? {
        input.temperature_rise = dt;
    }
    input.pilot_ratio = f.opt_number("pilot_ratio")?;
    input.buckling = RodBuckling {
        checked: true,
        end_condition: match f.opt_choice("end_condition", &EndCondition::NAMES)? {
            Some(name) => EndCondition::parse(name).unwrap_or(EndCondition::PinnedPinned),
            None => EndCondition::PinnedPinned,
        },
        length: f.opt_quantity("buckling_length", D::Length)?,
        safety_factor: f
            .opt_number("buckling_safety_factor")?
            .unwrap_or(input.buckling.safety_factor),
        youngs: f
            .opt_quantity("rod_youngs_modulus", D::Pressure)?
            .unwrap_or(input.buckling.youngs),
        poisson: f
            .opt_number("rod_poisson_ratio")?
            .unwrap_or(input.buckling.poisson),
        yield_strength: f.opt_quantity("rod_yield", D::Pressure)?,
    };
    input.ratings = parse_ratings(f)?;
    input.valves = crate::api::calc_valves::parse_valves(f)?;
    input.entrained_air = crate::api::calc_valves::parse_air(f)?;
    input.validate().map_err(calc_error)?;
    Ok(input)
}

/// `ratings: {cap_line, rod_line, cylinder, hoses: [{label, port, rating}]}`.
fn parse_ratings(f: &Fields) -> Result<Vec<Rating>, AppError> {
    let Some(r) = f.object("ratings", "ratings")? else {
        return Ok(Vec::new());
    };
    r.deny_unknown(&["cap_line", "rod_line", "cylinder", "hoses"])?;
    let mut out = Vec::new();
    for (name, exposure) in [
        ("cap_line", Exposure::Cap),
        ("rod_line", Exposure::Rod),
        ("cylinder", Exposure::Both),
    ] {
        if let Some(rating) = r.opt_quantity(name, D::Pressure)? {
            out.push(Rating {
                component: name.into(),
                exposure,
                rating: positive(&r, name, rating)?,
            });
        }
    }
    match r.raw("hoses") {
        None => {}
        Some(Value::Array(items)) => {
            for (i, item) in items.iter().enumerate() {
                // Wrap the element so that `Fields` can name it `ratings.hoses[i]`.
                let mut holder = Map::new();
                holder.insert("hose".into(), item.clone());
                let prefix = format!("ratings.hoses[{i}]");
                let wrapped = Fields::new(&holder);
                let Some(h) = wrapped.object("hose", &prefix)? else {
                    return Err(AppError::field(prefix, "invalid", "each hose is an object"));
                };
                h.deny_unknown(&["label", "port", "rating"])?;
                let label = h.string("label")?;
                let exposure = match h.choice("port", &["cap", "rod"])? {
                    "rod" => Exposure::Rod,
                    _ => Exposure::Cap,
                };
                let rating = h.quantity("rating", D::Pressure)?;
                out.push(Rating {
                    component: label,
                    exposure,
                    rating: positive(&h, "rating", rating)?,
                });
            }
        }
        Some(_) => {
            return Err(AppError::field(
                "ratings.hoses",
                "invalid",
                "must be a list of hoses",
            ));
        }
    }
    Ok(out)
}

fn positive(f: &Fields, name: &str, value: f64) -> Result<f64, AppError> {
    if value > 0.0 {
        Ok(value)
    } else {
        Err(AppError::field(
            f.path(name),
            "out_of_range",
            "a rating must be above zero",
        ))
    }
}

/// The `limit: {distance, per}` of a drift test.
fn parse_limit(f: &Fields) -> Result<Option<Limit>, AppError> {
    let Some(l) = f.object("limit", "limit")? else {
        return Ok(None);
    };
    l.deny_unknown(&["distance", "per"])?;
    Ok(Some(Limit {
        distance: l.quantity("distance", D::Length)?,
        per: l.quantity("per", D::Time)?,
    }))
}

/// Reads the readings of a position-drift test: `duration`, `drift` or `start_position` +
/// `end_position`, oil temperatures, optional port pressures and `limit`. The optional
/// `oil_expansion` is a cylinder field ([`parse_cylinder_request`]).
pub fn parse_drift_readings(f: &Fields) -> Result<DriftReadings, AppError> {
    let duration = f.quantity("duration", D::Time)?;
    let movement = match (
        f.opt_signed_quantity("drift", D::Length)?,
        f.opt_quantity("start_position", D::Length)?,
        f.opt_quantity("end_position", D::Length)?,
    ) {
        (Some(d), None, None) => Movement::Drift(d),
        (None, Some(start), Some(end)) => Movement::Positions { start, end },
        (Some(_), _, _) => {
            return Err(AppError::field(
                "drift",
                "conflict",
                "give either drift or start_position and end_position, not both",
            ));
        }
        (None, Some(_), None) => {
            return Err(AppError::field(
                "end_position",
                "required",
                "end_position is required with start_position",
            ));
        }
        (None, None, Some(_)) => {
            return Err(AppError::field(
                "start_position",
                "required",
                "start_position is required with end_position",
            ));
        }
        (None, None, None) => {
            return Err(AppError::field(
                "drift",
                "required",
                "give the drift, or start_position and end_position",
            ));
        }
    };
    Ok(DriftReadings {
        duration,
        movement,
        oil_temperature_start: f.quantity("oil_temperature_start", D::Temperature)?,
        oil_temperature_end: f.quantity("oil_temperature_end", D::Temperature)?,
        pressures: PortPressures {
            cap_start: f.opt_gauge_pressure("cap_pressure_start")?,
            cap_end: f.opt_gauge_pressure("cap_pressure_end")?,
            rod_start: f.opt_gauge_pressure("rod_pressure_start")?,
            rod_end: f.opt_gauge_pressure("rod_pressure_end")?,
        },
        limit: parse_limit(f)?,
    })
}

/// Reads the readings of a pressure-decay test: `pressurised_end` (`cap` or `rod`),
/// `duration`, `pressure_start`, `pressure_end`, oil temperatures, optional other-end
/// pressures and `limit: {pressure, per}`.
pub fn parse_decay_readings(f: &Fields) -> Result<DecayReadings, AppError> {
    let end = match f.choice("pressurised_end", &["cap", "rod"])? {
        "rod" => End::Rod,
        _ => End::Cap,
    };
    let limit = match f.object("limit", "limit")? {
        None => None,
        Some(l) => {
            l.deny_unknown(&["pressure", "per"])?;
            Some(DecayLimit {
                pressure: l.quantity("pressure", D::Pressure)?,
                per: l.quantity("per", D::Time)?,
            })
        }
    };
    Ok(DecayReadings {
        pressurised_end: end,
        duration: f.quantity("duration", D::Time)?,
        pressure_start: f.gauge_pressure("pressure_start")?,
        pressure_end: f.gauge_pressure("pressure_end")?,
        oil_temperature_start: f.quantity("oil_temperature_start", D::Temperature)?,
        oil_temperature_end: f.quantity("oil_temperature_end", D::Temperature)?,
        other_pressure_start: f.opt_gauge_pressure("other_pressure_start")?,
        other_pressure_end: f.opt_gauge_pressure("other_pressure_end")?,
        limit,
    })
}
