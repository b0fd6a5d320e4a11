//! What the valves, the stroke ends and the warming do to a held load, in plain words, and the
//! load-holding valve's own figures. Words only: every figure comes from `valves`, `settle` and
//! `heating`.

use super::bypass::{Outcome, SealBypass};
use super::cylinder_input::CylinderInput;
use super::heating::Heating;
use super::quantity::{Dimension, UnitSystem};
use super::valves::{self, PilotSource, ValveKind};
use super::words;
use serde::Serialize;

/// The load-holding valve as the analysis used it.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct HoldingValveReport {
    pub kind: ValveKind,
    pub setting: Option<f64>,
    pub pilot_ratio: Option<f64>,
    pub pilot_source: PilotSource,
    /// Pilot pressure that opens the valve with the load on it, Pa
    /// ([`valves::counterbalance_opening`], [`valves::pilot_check_opening`]); `None` without a
    /// ratio (or a setting, for a counterbalance valve), or where the pilot cannot open it.
    pub pilot_opening_pressure: Option<f64>,
    /// True for a counterbalance valve with a setting: it relieves there.
    pub relieves: bool,
}

/// The load-holding valve's figures for `input`, if one is recorded.
pub fn holding_valve(input: &CylinderInput) -> Option<HoldingValveReport> {
    let v = input.valves.holding?;
    let c = &input.cylinder;
    let hold = input.load_direction.holding_end();
    let (a_hold, a_other) = (c.area(hold), c.area(hold.other()));
    let opening = match (v.kind, v.pilot_ratio, v.setting) {
        (ValveKind::Counterbalance, Some(r), Some(s)) => Some(valves::counterbalance_opening(
            s, input.load, a_hold, a_other, r, v.pilot,
        )),
        (ValveKind::PilotCheck, Some(r), _) => {
            valves::pilot_check_opening(input.load, a_hold, a_other, r, v.pilot)
        }
        _ => None,
    };
    Some(HoldingValveReport {
        kind: v.kind,
        setting: v.setting,
        pilot_ratio: v.pilot_ratio,
        pilot_source: v.pilot,
        pilot_opening_pressure: opening,
        relieves: v.kind == ValveKind::Counterbalance && v.setting.is_some(),
    })
}

/// Said when a counterbalance valve relieves instead of holding.
pub const RELIEVING_VALVE: &str = "The counterbalance valve relieves at its setting: the pressure stops there, but the load creeps down as the valve lets oil out. Do not rely on it to hold the load where anyone could be beneath it; support the load mechanically.";

/// Said when a pilot-operated check valve holds the load.
pub const CHECK_VALVE: &str = "A pilot-operated check valve does not relieve: trapped oil behind it keeps every pressure shown here, and opening its pilot lets the load move.";

/// The valve cautions for a result, beside the standard ones.
pub fn cautions(
    input: &CylinderInput,
    bypass: &SealBypass,
    heating: &Heating,
) -> Vec<&'static str> {
    let mut out = Vec::new();
    if bypass.outcome == Outcome::Creeps || heating.relieves {
        out.push(RELIEVING_VALVE);
    }
    if input
        .valves
        .holding
        .is_some_and(|v| v.kind == ValveKind::PilotCheck)
    {
        out.push(CHECK_VALVE);
    }
    out
}

/// Hazards of the stroke ends, an open port, a relieving valve and the warming, in `units`.
pub fn hazards(
    input: &CylinderInput,
    bypass: &SealBypass,
    heating: &Heating,
    units: UnitSystem,
) -> Vec<String> {
    let p = |si: f64| words::q(si, Dimension::Pressure, units);
    let len = |si: f64| words::q(si, Dimension::Length, units);
    let mut out = Vec::new();
    match bypass.outcome {
        Outcome::RestsOnStop => out.push("At full extension the load that pulls the rod out rests on the cylinder's stop; a passing piston seal cannot let it run further, but it runs away as soon as the rod is drawn in from the stop.".into()),
        Outcome::Sinks => out.push("The rod end is open to tank in the valve's centre: if the piston seal passes oil, the oil goes to tank and the load sinks, with no pressure rise to show it.".into()),
        Outcome::Creeps => out.push(format!(
            "If the piston seal passes oil, both ends rise to the counterbalance valve's setting of {} and the load then creeps down as the valve relieves.",
            p(bypass.final_pressure.unwrap_or(0.0))
        )),
        Outcome::RunsAway if bypass.travel_left > 0.0 => out.push(format!(
            "It can run out by the {} of travel left before the rod reaches its stop.",
            len(bypass.travel_left)
        )),
        _ => {}
    }
    if bypass.bottoms {
        out.push(format!(
            "With a passing piston seal the piston reaches the end of its stroke after {}: both ends then equalise at {} and the stop carries the rest of the load.",
            len(bypass.settle_drift.unwrap_or(0.0)),
            p(bypass.final_pressure.unwrap_or(0.0))
        ));
    }
    if heating.relieves {
        out.push(format!(
            "Warming by {} would take the holding end to the counterbalance valve's setting: the valve relieves there and the load creeps.",
            words::q(heating.temperature_rise, Dimension::TemperatureChange, units)
        ));
    }
    if heating.bottoms {
        out.push("While the oil warms, the piston reaches the end of its stroke; from there the trapped oil's pressure rises as in a closed vessel.".into());
    }
    if input.valves.relief_setting().is_some()
        && input.valves.centre(input.load_direction.holding_end()) == Some(valves::Centre::Blocked)
    {
        out.push("The counterbalance valve relieves into the line to the directional valve, which is blocked in its centre: that line must have a way to tank (an open-centre port is the usual choice, common practice), or the trapped pressure rises there.".into());
    }
    out
}
