//! The whole cylinder analysis: every figure the calculator and the registry's safety panel
//! show, from one [`CylinderInput`].

use super::bypass::{Outcome, SealBypass, TubeWall};
use super::circuit::{self, Forces, Speeds};
use super::cylinder::{self, Holding, LoadDirection};
use super::error::CalcError;
use super::quantity::UnitSystem;
use super::ratings::{self, Check, Scenario, Status};
use super::settle::{self, BypassWarming, Surroundings};
use super::strength::{self, Buckling, TubeCheck};
use super::valves::{self, Counterbalance};
use super::{cautions, hazard_words};
use super::{heating, valve_words};

pub use super::cylinder_input::{CylinderInput, RodBuckling};
pub use super::hazard_words::{component_words, scenario_words};
use serde::Serialize;

/// Scenario names used in the ratings check.
pub const NORMAL_HOLDING: &str = "normal_holding";
pub const SEAL_BYPASS: &str = "seal_bypass";
pub const ROD_SIDE_INTENSIFICATION: &str = "rod_side_intensification";
pub const TRAPPED_OIL_HEATING: &str = "trapped_oil_heating";
pub const SEAL_BYPASS_WARMING: &str = "seal_bypass_warming";

/// Areas, m², and the area ratio.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct Areas {
    pub cap: f64,
    pub rod: f64,
    pub annulus: f64,
    pub ratio: f64,
}

/// Chamber oil volumes at the position, m³ (swept volume, no dead volume, no lines).
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct Volumes {
    pub cap: f64,
    pub rod: f64,
}

/// Trapped-oil heating with the piston free under the load ([`heating::scenario`]).
pub use super::heating::Heating;

/// Everything [`analyse`] finds. SI units.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct CylinderReport {
    pub position: f64,
    pub areas: Areas,
    pub volumes: Volumes,
    pub holding: Holding,
    pub seal_bypass: SealBypass,
    /// Rod-end pressure with the rod port blocked and the cap end at supply pressure, Pa.
    pub rod_side_intensification: Option<f64>,
    pub speeds: Option<Speeds>,
    pub forces: Option<Forces>,
    pub counterbalance: Counterbalance,
    pub heating: Heating,
    /// A passing piston seal in a warming cylinder, where the bypass intensifies.
    pub bypass_warming: Option<BypassWarming>,
    /// The load-holding valve's figures, where one is recorded.
    pub holding_valve: Option<valve_words::HoldingValveReport>,
    pub scenarios: Vec<Scenario>,
    pub checks: Vec<Check>,
    pub tube: Option<TubeCheck>,
    pub buckling: Option<Buckling>,
    /// Highest pressure any scenario puts in the cylinder, Pa.
    pub highest_pressure: f64,
    pub hazards: Vec<String>,
    pub cautions: Vec<&'static str>,
}

/// Runs every cylinder calculation: areas, holding pressures, piston seal bypass, rod-side
/// intensification (with a supply pressure), speeds (with a flow), counterbalance setting,
/// trapped-oil heating, the ratings check over all scenarios, the tube's Lamé hoop stress
/// (with outside diameter and yield) and Euler buckling of the rod.
///
/// Buckling is checked for the held load when it pushes the rod in, and for the stall force
/// `p_supply A_cap` when a supply pressure is given, whichever is larger. Without a free length
/// it takes twice the stroke: a single-stage cylinder is longer closed than its stroke, so its
/// pin-to-pin length at full extension is at least that (enter the real length where known).
/// `units` chooses the units written into the hazard texts.
pub fn analyse(input: &CylinderInput, units: UnitSystem) -> Result<CylinderReport, CalcError> {
    input.validate()?;
    let c = &input.cylinder;
    let position = input.position();
    let dir = input.load_direction;
    let holding = cylinder::holding_pressures(c, input.load, dir);
    let around = Surroundings {
        air: input.entrained_air,
        valves: input.valves,
    };
    let bypass = settle::seal_bypass_with(c, position, input.load, dir, &input.trapped, &around);
    let rod_side = input
        .supply_pressure
        .map(|p| circuit::rod_side_intensification(c, p, input.load, dir));
    let heating = heating::scenario(input, &holding, position);
    let warming = settle::bypass_warming(
        c,
        &input.trapped,
        &bypass,
        position,
        input.load,
        input.oil_expansion,
        input.temperature_rise,
    );

    let mut scenarios = vec![Scenario {
        name: NORMAL_HOLDING,
        cap: holding.cap_pressure,
        rod: holding.rod_pressure,
    }];
    if let Some(p) = bypass.final_pressure {
        scenarios.push(Scenario {
            name: SEAL_BYPASS,
            cap: p,
            rod: p,
        });
    }
    if let (Some(p_rod), Some(supply)) = (rod_side, input.supply_pressure) {
        scenarios.push(Scenario {
            name: ROD_SIDE_INTENSIFICATION,
            cap: supply,
            rod: p_rod,
        });
    }
    scenarios.push(Scenario {
        name: TRAPPED_OIL_HEATING,
        cap: heating.cap_pressure,
        rod: heating.rod_pressure,
    });
    if let Some(w) = warming {
        scenarios.push(Scenario {
            name: SEAL_BYPASS_WARMING,
            cap: w.pressure,
            rod: w.pressure,
        });
    }
    let checks = ratings::check_ratings(&input.ratings, &scenarios);
    let highest = scenarios
        .iter()
        .map(|s| s.cap.max(s.rod))
        .fold(0.0, f64::max);

    let tube = match (input.trapped.tube, input.tube_yield) {
        (
            Some(TubeWall {
                outside_diameter, ..
            }),
            Some(y),
        ) => Some(strength::tube_check(
            c.bore,
            outside_diameter,
            highest,
            y,
            input.tube_safety_factor,
        )),
        _ => None,
    };
    let buckling = buckling(input);
    let mut hazards = hazard_words::cylinder_hazards(
        input,
        &holding,
        &bypass,
        &checks,
        tube.as_ref(),
        buckling.as_ref(),
        units,
    );
    hazards.extend(valve_words::hazards(input, &bypass, &heating, units));
    let over = checks.iter().any(|k| k.status != Status::Ok)
        || tube.is_some_and(|t| t.status != Status::Ok);
    let runaway = matches!(
        bypass.outcome,
        Outcome::RunsAway | Outcome::Sinks | Outcome::Creeps
    );
    let mut cautions = cautions::for_result(over, runaway);
    cautions.extend(valve_words::cautions(input, &bypass, &heating));

    Ok(CylinderReport {
        position,
        areas: Areas {
            cap: c.cap_area(),
            rod: c.rod_area(),
            annulus: c.annulus_area(),
            ratio: c.area_ratio(),
        },
        volumes: Volumes {
            cap: c.cap_volume(position),
            rod: c.rod_volume(position),
        },
        holding,
        seal_bypass: bypass,
        rod_side_intensification: rod_side,
        speeds: input.flow.map(|q| circuit::speeds(c, q)),
        forces: input.supply_pressure.map(|p| circuit::forces(c, p)),
        counterbalance: valves::counterbalance(
            c,
            input.load,
            dir,
            &input.valves,
            input.pilot_ratio,
        ),
        heating,
        bypass_warming: warming,
        holding_valve: valve_words::holding_valve(input),
        scenarios,
        checks,
        tube,
        buckling,
        highest_pressure: highest,
        hazards,
        cautions,
    })
}

fn buckling(input: &CylinderInput) -> Option<Buckling> {
    if !input.buckling.checked {
        return None;
    }
    let c = &input.cylinder;
    let held = match input.load_direction {
        LoadDirection::Retract => input.load,
        LoadDirection::Extend => 0.0,
    };
    let stall = input.supply_pressure.map_or(0.0, |p| p * c.cap_area());
    let load = held.max(stall);
    if load <= 0.0 {
        return None;
    }
    let b = &input.buckling;
    let length = b.length.unwrap_or(2.0 * c.stroke);
    Some(strength::buckling_check(
        c.rod,
        length,
        b.youngs,
        b.end_condition,
        load,
        b.safety_factor,
    ))
}
