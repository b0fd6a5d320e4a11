//! The valve and air fields of a cylinder calculation request: the load-holding valve on the
//! holding end, the directional valve's centre at each port, entrained air.

use crate::api::input::Fields;
use crate::calc::quantity::Dimension as D;
use crate::calc::valves::{Centre, HoldingValve, PilotSource, ValveKind, Valves};
use crate::error::AppError;

/// `holding_valve`: `none`, `counterbalance` or `pilot_check`.
pub const HOLDING_VALVES: &[&str] = &["none", "counterbalance", "pilot_check"];

/// Reads the valve fields: `holding_valve` with its `holding_valve_setting` (a pressure),
/// `holding_valve_pilot_ratio` and `holding_valve_pilot` (`other_port`, the default, or
/// `external`); `cap_port_centre` and `rod_port_centre` (`blocked` or `open_to_tank`; not
/// given: not recorded, analysed as blocked). A setting or pilot without a valve is refused
/// naming the field, as is a counterbalance valve without a setting.
pub fn parse_valves(f: &Fields) -> Result<Valves, AppError> {
    let kind = f
        .opt_choice("holding_valve", HOLDING_VALVES)?
        .and_then(ValveKind::parse);
    let setting = f.opt_quantity("holding_valve_setting", D::Pressure)?;
    let ratio = f.opt_number("holding_valve_pilot_ratio")?;
    let pilot = f
        .opt_choice("holding_valve_pilot", &PilotSource::NAMES)?
        .and_then(PilotSource::parse);
    let holding = match kind {
        None => {
            for (name, given) in [
                ("holding_valve_setting", setting.is_some()),
                ("holding_valve_pilot_ratio", ratio.is_some()),
                ("holding_valve_pilot", pilot.is_some()),
            ] {
                if given {
                    return Err(AppError::field(
                        name,
                        "requires",
                        "give the holding_valve (counterbalance or pilot_check) too",
                    ));
                }
            }
            None
        }
        Some(ValveKind::Counterbalance) if setting.is_none() => {
            return Err(AppError::field(
                "holding_valve_setting",
                "required",
                "a counterbalance valve needs its setting",
            ));
        }
        Some(ValveKind::PilotCheck) if setting.is_some() => {
            return Err(AppError::field(
                "holding_valve_setting",
                "invalid",
                "a pilot-operated check valve has no relief setting",
            ));
        }
        Some(kind) => Some(HoldingValve {
            kind,
            setting,
            pilot_ratio: ratio,
            pilot: pilot.unwrap_or(PilotSource::OtherPort),
        }),
    };
    let centre = |name| -> Result<Option<Centre>, AppError> {
        Ok(f.opt_choice(name, &Centre::NAMES)?.and_then(Centre::parse))
    };
    Ok(Valves {
        holding,
        cap_centre: centre("cap_port_centre")?,
        rod_centre: centre("rod_port_centre")?,
    })
}

/// `entrained_air`: a volume fraction at atmospheric pressure, 0 to 0.5 (0.01 is 1 %).
pub fn parse_air(f: &Fields) -> Result<f64, AppError> {
    Ok(f.opt_number("entrained_air")?.unwrap_or(0.0))
}
