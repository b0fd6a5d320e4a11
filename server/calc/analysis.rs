//! The whole cylinder analysis: every figure the calculator and the registry's safety panel
//! show, from one [`CylinderInput`].

use super::buckling::BucklingReport;
use super::bypass::{Outcome, SealBypass, TubeWall};
use super::circuit::{self, Forces, Speeds};
use super::cylinder::{self, Holding};
use super::error::CalcError;
use super::quantity::UnitSystem;
use super::ratings::{self, Check, Scenario, Status};
use super::settle::{self, BypassWarming, Surroundings};
use super::strength::{self, TubeCheck};
use super::valves::{self, Counterbalance};
use super::{cautions, hazard_words, limits, worst_load};
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
    pub buckling: Option<BucklingReport>,
    /// Highest pressure any scenario puts in the cylinder, Pa.
    pub highest_pressure: f64,
    pub hazards: Vec<String>,
    /// What could not be checked, in words (an end with no rating).
    pub notes: Vec<String>,
    pub cautions: Vec<&'static str>,
}

/// Runs every cylinder calculation: areas, holding pressures, piston seal bypass, rod-side
/// intensification (with a supply pressure), speeds (with a flow), counterbalance setting,
/// trapped-oil heating, the ratings check over all scenarios, each scenario against the relief
/// setting (`supply_pressure`, [`limits`]), the tube's Tresca equivalent stress beside its Lamé
/// hoop stress (with outside diameter and yield) and rod buckling ([`super::buckling::check`]:
/// Euler, Johnson range, design factors).
///
/// Worst load, stated: every scenario is worked out at both ends of the load range
/// `[min_load, load]` and each end keeps its higher pressure with the load that gave it
/// ([`worst_load`]); the checks, the highest pressure, the tube and the hazards use those.
/// The other figures (holding, bypass, heating, counterbalance, buckling) are at `load`, the
/// heaviest, which is where they are highest; `rod_side_intensification` is the scenario's
/// rod-end figure, the highest over the range.
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

    let load = input.load;
    let mut scenarios = vec![Scenario::at(
        NORMAL_HOLDING,
        holding.cap_pressure,
        holding.rod_pressure,
        load,
    )];
    if let Some(p) = bypass.final_pressure {
        scenarios.push(Scenario::at(SEAL_BYPASS, p, p, load));
    }
    if let (Some(p_rod), Some(supply)) = (rod_side, input.supply_pressure) {
        scenarios.push(Scenario::at(ROD_SIDE_INTENSIFICATION, supply, p_rod, load));
    }
    scenarios.push(Scenario::at(
        TRAPPED_OIL_HEATING,
        heating.cap_pressure,
        heating.rod_pressure,
        load,
    ));
    if let Some(w) = warming {
        scenarios.push(Scenario::at(
            SEAL_BYPASS_WARMING,
            w.pressure,
            w.pressure,
            load,
        ));
    }
    // Worst load, stated: the same scenarios at the lightest load of the range; each end
    // keeps its higher figure and the load that gave it (worst_load.rs).
    let scenarios = match worst_load::lightest(input) {
        Some(light) => worst_load::worst_of(scenarios, &analyse(&light, units)?.scenarios),
        None => scenarios,
    };
    let rod_side = worst_load::find(&scenarios, ROD_SIDE_INTENSIFICATION)
        .map(|s| s.rod)
        .or(rod_side);
    let mut checks = ratings::check_ratings(&input.ratings, &scenarios);
    checks.extend(limits::relief_checks(input.supply_pressure, &scenarios));
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
    let buckling = super::buckling::check(input);
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
    hazards.extend(limits::relief_hazards(&checks, units));
    let mut notes =
        limits::unchecked_notes(&input.ratings, input.supply_pressure, &scenarios, units);
    notes.extend(limits::single_load_note(input, units));
    let over = checks.iter().any(|k| k.status != Status::Ok)
        || tube.is_some_and(|t| t.status != Status::Ok);
    let runaway = matches!(
        bypass.outcome,
        Outcome::RunsAway | Outcome::Sinks | Outcome::Creeps
    );
    let mut cautions = limits::with_relief_caution(cautions::for_result(over, runaway), &checks);
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
        notes,
        cautions,
    })
}
