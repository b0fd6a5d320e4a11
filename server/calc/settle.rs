//! Piston seal bypass with the circuit around it: the stroke ends, entrained air and the
//! valves (a rod end open to tank, a counterbalance valve that relieves). SI units.
//!
//! Mass balance (definition of the bulk modulus; Boyle's law for the air): as the rod goes in
//! by `dx`, the room for the oil shrinks by `A_rod dx`; that is made up by the room each end
//! makes while its pressure moves from its holding value to the final `p`:
//! `A_rod dx = R_cap(p_cap0 -> p) + R_rod(p_rod0 -> p)`, where `R = C (p - p0)` for oil, walls
//! and lines ([`Trapped::compliance`]) plus the air's `f V p_atm (1/(p_atm + p0) -
//! 1/(p_atm + p))` ([`air::room_made`]). With `p = F / A_rod` (force balance) this gives the
//! settle. Where it exceeds the travel left (the position, for a load that pushes the rod in)
//! the piston bottoms: `dx` is the travel left and the same balance gives the lower `p` both
//! ends equalise at (solved by bisection; the room made grows with `p`).

use super::air;
use super::bypass::{Outcome, SealBypass, Trapped};
use super::cylinder::{Cylinder, End, LoadDirection};
use super::valves::Valves;

/// What surrounds the trapped oil besides the lines and walls.
#[derive(Clone, Copy, Debug, Default, PartialEq)]
pub struct Surroundings {
    /// Entrained air, volume fraction at atmospheric pressure (0 for none).
    pub air: f64,
    pub valves: Valves,
}

/// The share of entrained air shown beside the oil-only settle (1 %, the figure of
/// REFERENCES.md's worked example; ours to show).
pub const SHOWN_AIR: f64 = 0.01;

/// Room one end makes as its pressure goes from `from` to `to`, m³ (see the module docs).
pub fn room(
    cylinder: &Cylinder,
    trapped: &Trapped,
    end: End,
    position: f64,
    air_fraction: f64,
    from: f64,
    to: f64,
) -> f64 {
    trapped.compliance(cylinder, end, position) * (to - from)
        + air::room_made(
            trapped.oil_volume(cylinder, end, position),
            air_fraction,
            from,
            to,
        )
}

/// Piston seal bypass with both work ports blocked unless `around` opens one, for a load
/// `load` (N) at extension `position` (m); see [`super::bypass::seal_bypass`] for the force
/// balance and the module documentation for the mass balance. Outcomes: a load pushing the rod
/// in intensifies to `F / A_rod` (or, bottoming first, the lower pressure of the mass balance);
/// with the rod end open to tank it sinks (oil goes across the piston to tank); with a
/// counterbalance valve on the cap end set below `F / A_rod` both ends stop at the setting and
/// the load creeps. A load pulling the rod out runs away, or rests on the stop at full
/// extension.
pub fn seal_bypass_with(
    cylinder: &Cylinder,
    position: f64,
    load: f64,
    direction: LoadDirection,
    trapped: &Trapped,
    around: &Surroundings,
) -> SealBypass {
    let x = cylinder.clamp(position);
    let none = |outcome, travel_left| SealBypass {
        outcome,
        final_pressure: None,
        intensification_factor: None,
        settle_drift: None,
        travel_left,
        bottoms: false,
        settle_drift_oil_only: None,
        settle_drift_one_percent_air: None,
    };
    if direction == LoadDirection::Extend {
        let left = cylinder.stroke - x;
        return if left <= 0.0 {
            none(Outcome::RestsOnStop, 0.0)
        } else {
            none(Outcome::RunsAway, left)
        };
    }
    if around.valves.open_to_tank(End::Rod, direction) {
        return none(Outcome::Sinks, x);
    }
    let hold = load / cylinder.cap_area();
    let target = load / cylinder.rod_area();
    if let Some(setting) = around.valves.relief_setting().filter(|s| *s < target) {
        let mut out = none(Outcome::Creeps, x);
        out.final_pressure = Some(setting);
        out.intensification_factor = (hold > 0.0).then(|| setting / hold);
        return out;
    }
    let settle = |fraction: f64| settle(cylinder, trapped, x, hold, target, fraction);
    let (drift, pressure, bottoms) = settle(around.air);
    SealBypass {
        outcome: Outcome::Intensifies,
        final_pressure: Some(pressure),
        intensification_factor: Some(if bottoms && hold > 0.0 {
            pressure / hold
        } else {
            cylinder.cap_area() / cylinder.rod_area()
        }),
        settle_drift: Some(drift),
        travel_left: x,
        bottoms,
        settle_drift_oil_only: Some(settle(0.0).0),
        settle_drift_one_percent_air: Some(settle(SHOWN_AIR).0),
    }
}

/// `(settle, final pressure, bottoms)` for a load pushing the rod in, held at `hold` by the cap
/// end, with the rod end at 0 and `target = F / A_rod` (mass balance, module documentation).
fn settle(
    cylinder: &Cylinder,
    trapped: &Trapped,
    x: f64,
    hold: f64,
    target: f64,
    air_fraction: f64,
) -> (f64, f64, bool) {
    let made = |p: f64| {
        room(cylinder, trapped, End::Cap, x, air_fraction, hold, p)
            + room(cylinder, trapped, End::Rod, x, air_fraction, 0.0, p)
    };
    let a_rod = cylinder.rod_area();
    let full = made(target) / a_rod;
    if full <= x {
        return (full, target, false);
    }
    // Bottoms: find p with made(p) = A_rod x; made(0) <= 0 <= A_rod x < made(target).
    let (mut lo, mut hi) = (0.0, target);
    for _ in 0..200 {
        let mid = 0.5 * (lo + hi);
        if made(mid) > a_rod * x {
            hi = mid;
        } else {
            lo = mid;
        }
    }
    (x, 0.5 * (lo + hi), true)
}

/// A passing piston seal in a warming cylinder (a parked machine in the sun): both ends joined
/// through the seal at one pressure, the load on a free piston.
#[derive(Clone, Copy, Debug, PartialEq, serde::Serialize)]
pub struct BypassWarming {
    pub temperature_rise: f64,
    /// Pressure in both ends at the end of the warming, Pa.
    pub pressure: f64,
    /// Piston travel while warming, m (positive: rod going out).
    pub piston_motion: f64,
    /// The piston reached full extension and the oil then rose as held.
    pub reaches_stop: bool,
}

/// The combined scenario for a load pushing the rod in, once the bypass has settled (outcome
/// `intensifies`), for a warming `dt` (K). One volume at one pressure `p`: while the piston is
/// free, the force balance `p A_rod = F` keeps `p = F / A_rod` and the oil's growth
/// `alpha V_total dT` pushes the rod out by `alpha V_total dT / A_rod` (definition of the
/// expansion coefficient, continuity). On a stop the joined ends rise as held:
/// `dp = alpha V_total dT / (C_cap + C_rod)` (definition of the bulk modulus). A piston bottomed
/// at full retraction below `F / A_rod` first rises to it held, then lifts off. Air is left
/// out (it would lower the held rise; errs high). `None` unless the bypass intensifies.
pub fn bypass_warming(
    cylinder: &Cylinder,
    trapped: &Trapped,
    bypass: &SealBypass,
    position: f64,
    load: f64,
    expansion: f64,
    dt: f64,
) -> Option<BypassWarming> {
    if bypass.outcome != Outcome::Intensifies {
        return None;
    }
    let start = bypass.final_pressure?;
    let x1 = (cylinder.clamp(position) - bypass.settle_drift.unwrap_or(0.0)).max(0.0);
    let target = load / cylinder.rod_area();
    let volume =
        trapped.oil_volume(cylinder, End::Cap, x1) + trapped.oil_volume(cylinder, End::Rod, x1);
    let compliance =
        trapped.compliance(cylinder, End::Cap, x1) + trapped.compliance(cylinder, End::Rod, x1);
    let growth = expansion * volume * dt;
    let mut left = growth;
    let mut pressure = start;
    // Bottomed at full retraction: rise held until the load lifts off.
    if start < target && compliance > 0.0 {
        let needed = compliance * (target - start);
        let used = needed.min(left);
        pressure += used / compliance;
        left -= used;
    }
    let room_to_stop = cylinder.rod_area() * (cylinder.stroke - x1);
    let free = left.min(room_to_stop);
    let motion = free / cylinder.rod_area();
    left -= free;
    let reaches_stop = left > 0.0;
    if reaches_stop && compliance > 0.0 {
        pressure += left / compliance;
    }
    Some(BypassWarming {
        temperature_rise: dt,
        pressure,
        piston_motion: motion,
        reaches_stop,
    })
}
