//! Trapped oil warming or cooling in a cylinder whose piston is free under a constant load.
//! SI units: Pa, m, m³/Pa, K.
//!
//! Derivation (definition of the bulk modulus, force balance; REFERENCES.md "Added
//! 2026-12-02", two chambers coupled by a free piston):
//! - The oil of an end (chamber and line, volume `V`) would grow by `alpha V dT`. With the
//!   piston moving out by `dx`, the cap end gives up `A_cap dx` of that room and the rod end
//!   gains it, so each blocked end's pressure moves by
//!   `C_cap dp_cap = alpha V_cap dT - A_cap dx` and `C_rod dp_rod = alpha V_rod dT + A_ann dx`
//!   with `C` the end's compliance (oil, walls, lines: `bypass::Trapped::compliance`).
//! - The load is a constant force, so the piston moves until the force balance holds again:
//!   `A_cap dp_cap = A_ann dp_rod`. Solved:
//!   `dx = (A_cap h_cap / C_cap - A_ann h_rod / C_rod) / (A_cap² / C_cap + A_ann² / C_rod)`
//!   with `h = alpha V dT`. Oil only and rigid walls (`C = V / K`), this gives
//!   `dp_rod = K alpha dT (1 + A_rod / (A_cap (L - x)/x + A_ann))`: the rod end rises by up to
//!   the area ratio times `K alpha dT`, the cap end by less than `K alpha dT`.
//! - An end whose pressure cannot change (open to tank; a counterbalance valve relieving at its
//!   setting; oil at vacuum, where it cavitates) is held at its pressure: the force balance
//!   then holds the other end's pressure too, and the piston moves by that end's own growth
//!   over its area (`dx = alpha V dT / A`, REFERENCES.md "Trade facts", common practice).
//! - A piston that reaches the end of its stroke bottoms: from there both blocked ends are held
//!   (rigid stop), `dp = alpha V dT / C`.
//!
//! The change is followed in steps between these events, each step linear in `dT`, with the
//! compliances taken at the starting position (the motion is millimetres; ours to linearise).
//! The container's own thermal growth is neglected (steel grows about a twentieth as much as
//! oil), which errs on the high side.

use super::air::ATMOSPHERE;
use super::bypass::Trapped;
use super::cylinder::{Cylinder, End};
use serde::Serialize;

/// What one end does while the oil changes temperature.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct EndSetup {
    /// Pressure at the start, Pa gauge.
    pub pressure: f64,
    /// Open to tank: its pressure stays where it is.
    pub open: bool,
    /// Relieves at this pressure (a counterbalance valve's setting), Pa.
    pub relief: Option<f64>,
}

/// The result of [`free_piston`]. Pressures gauge, Pa; motion m (extension positive).
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct Thermal {
    pub cap_change: f64,
    pub rod_change: f64,
    pub cap_pressure: f64,
    pub rod_pressure: f64,
    /// Piston travel, m, positive when the rod goes out.
    pub motion: f64,
    /// The piston reached the end of its stroke.
    pub bottoms: bool,
    /// A counterbalance valve relieved (its setting was reached).
    pub relieves: bool,
    /// An end fell to vacuum (its oil cavitates).
    pub cavitates: bool,
}

#[derive(Clone, Copy)]
struct End2 {
    area: f64,
    compliance: f64,
    /// `alpha V dT` for the whole change, m³.
    growth: f64,
    fixed: bool,
    relief: Option<f64>,
    pressure: f64,
}

impl End2 {
    /// Pressure rate per whole change with the piston moving at `dx` (per whole change); an
    /// end that is not fixed has oil, so a compliance above zero.
    fn rate(&self, sign: f64, dx: f64) -> f64 {
        if self.fixed {
            0.0
        } else {
            (self.growth + sign * self.area * dx) / self.compliance
        }
    }
}

/// Follows a temperature change `dt` (K) of the oil trapped in both ends of `cylinder` at
/// extension `position` with a constant load on a free piston (derivation in the module
/// documentation). `cap` and `rod` give each end's start pressure and whether it is open to
/// tank or relieves; `held` starts the piston on a rigid stop (as in a pressure-decay test).
#[allow(clippy::too_many_arguments)]
pub fn free_piston(
    cylinder: &Cylinder,
    trapped: &Trapped,
    position: f64,
    expansion: f64,
    dt: f64,
    cap: EndSetup,
    rod: EndSetup,
    held: bool,
) -> Thermal {
    let x0 = cylinder.clamp(position);
    let fallback = trapped.chamber_bulk_modulus(cylinder) * expansion * dt;
    let make = |end: End, s: EndSetup| End2 {
        area: cylinder.area(end),
        compliance: trapped.compliance(cylinder, end, x0),
        growth: expansion * trapped.oil_volume(cylinder, end, x0) * dt,
        fixed: s.open || s.relief.is_some_and(|r| s.pressure >= r && dt > 0.0),
        relief: s.relief,
        pressure: s.pressure,
    };
    let mut ends = [make(End::Cap, cap), make(End::Rod, rod)];
    let mut relieves = ends.iter().any(|e| e.fixed && e.relief.is_some());
    // An end with no oil (the piston on that end's stop, no line) cannot hold the piston: it
    // moves freely away from that stop, and the stop event holds it against it.
    let empty = [ends[0].compliance <= 0.0, ends[1].compliance <= 0.0];
    for (e, is_empty) in ends.iter_mut().zip(empty) {
        e.fixed |= is_empty;
    }
    let (mut x, mut left, mut stopped, mut bottoms, mut cavitates) = (x0, 1.0, held, false, false);
    for _ in 0..8 {
        if left <= 0.0 {
            break;
        }
        let dx = if stopped { 0.0 } else { motion_rate(&ends) };
        let rates = [ends[0].rate(-1.0, dx), ends[1].rate(1.0, dx)];
        // The first event in the rest of the change.
        let mut step = left;
        let mut event = None;
        let mut consider = |t: f64, what: Event| {
            if t.is_finite() && t >= 0.0 && t < step {
                step = t;
                event = Some(what);
            }
        };
        if dx > 0.0 {
            consider((cylinder.stroke - x) / dx, Event::Stop);
        } else if dx < 0.0 {
            consider(-x / dx, Event::Stop);
        }
        for (i, e) in ends.iter().enumerate() {
            if e.fixed {
                continue;
            }
            if rates[i] < 0.0 {
                consider((-ATMOSPHERE - e.pressure) / rates[i], Event::Vacuum(i));
            }
            if let (Some(r), true) = (e.relief, rates[i] > 0.0) {
                consider((r - e.pressure) / rates[i], Event::Relief(i));
            }
        }
        x += dx * step;
        for (e, r) in ends.iter_mut().zip(rates) {
            e.pressure += r * step;
        }
        left -= step;
        match event {
            Some(Event::Stop) => {
                stopped = true;
                bottoms = true;
                x = x.clamp(0.0, cylinder.stroke);
            }
            Some(Event::Vacuum(i)) => {
                ends[i].fixed = true;
                ends[i].pressure = -ATMOSPHERE;
                cavitates = true;
            }
            Some(Event::Relief(i)) => {
                ends[i].fixed = true;
                relieves = true;
            }
            None => {}
        }
    }
    // An empty end's port still holds a little oil: shown held (`B alpha dT`, never below
    // vacuum), the cautious figure for the line fitted there.
    for (i, start) in [cap.pressure, rod.pressure].into_iter().enumerate() {
        if empty[i] && !(i == 0 && cap.open || i == 1 && rod.open) {
            ends[i].pressure = start + fallback.max(-ATMOSPHERE - start);
        }
    }
    Thermal {
        cap_change: ends[0].pressure - cap.pressure,
        rod_change: ends[1].pressure - rod.pressure,
        cap_pressure: ends[0].pressure,
        rod_pressure: ends[1].pressure,
        motion: x - x0,
        bottoms,
        relieves,
        cavitates,
    }
}

#[derive(Clone, Copy)]
enum Event {
    Stop,
    Vacuum(usize),
    Relief(usize),
}

/// Piston travel per whole change with a free piston: both blocked, the coupled solution;
/// one end fixed, the other end's growth over its area; both fixed, none.
fn motion_rate(ends: &[End2; 2]) -> f64 {
    let [c, r] = ends;
    match (c.fixed, r.fixed) {
        (false, false) => {
            let num = c.area * c.growth / c.compliance - r.area * r.growth / r.compliance;
            let den = c.area * c.area / c.compliance + r.area * r.area / r.compliance;
            num / den
        }
        (false, true) => c.growth / c.area,
        (true, false) => -r.growth / r.area,
        (true, true) => 0.0,
    }
}

/// Trapped-oil heating of a held cylinder for the ratings check: both ends from their holding
/// pressures, warmed by the input's temperature rise, the piston free under the load
/// ([`free_piston`]). An end open to tank in the valve centre has no trapped-oil rise; a
/// counterbalance valve on the holding end stops that end at its setting (it relieves, and the
/// load creeps instead).
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct Heating {
    /// Temperature rise assumed, K.
    pub temperature_rise: f64,
    /// Pressure rise in each end, Pa.
    pub cap_rise: f64,
    pub rod_rise: f64,
    /// Holding pressure plus rise, Pa.
    pub cap_pressure: f64,
    pub rod_pressure: f64,
    /// Piston travel while warming, m (positive: rod going out).
    pub piston_motion: f64,
    /// The piston reached the end of its stroke and the ends then rose as held.
    pub bottoms: bool,
    /// A counterbalance valve relieved at its setting.
    pub relieves: bool,
    /// `K alpha dT` with the oil's modulus: the rise of oil held in a rigid closed volume, Pa.
    pub held_oil_rise: f64,
}

/// The heating scenario of [`Heating`] for `input` at `position` with the given holding
/// pressures (derivation in the module documentation).
pub fn scenario(
    input: &super::cylinder_input::CylinderInput,
    holding: &super::cylinder::Holding,
    position: f64,
) -> Heating {
    let dir = input.load_direction;
    let valves = &input.valves;
    let setup = |end: End| EndSetup {
        pressure: holding.at(end),
        open: valves.open_to_tank(end, dir),
        relief: (end == dir.holding_end())
            .then(|| valves.relief_setting())
            .flatten(),
    };
    let t = free_piston(
        &input.cylinder,
        &input.trapped,
        position,
        input.oil_expansion,
        input.temperature_rise,
        setup(End::Cap),
        setup(End::Rod),
        false,
    );
    Heating {
        temperature_rise: input.temperature_rise,
        cap_rise: t.cap_change,
        rod_rise: t.rod_change,
        cap_pressure: t.cap_pressure,
        rod_pressure: t.rod_pressure,
        piston_motion: t.motion,
        bottoms: t.bottoms,
        relieves: t.relieves,
        held_oil_rise: input.trapped.bulk_modulus * input.oil_expansion * input.temperature_rise,
    }
}

/// Pressure change of oil held in one end on a rigid stop (a pressure-decay test) when it
/// changes temperature by `dt` (K), Pa, and the end's compliance used, m³/Pa:
/// `dp = alpha V dT / C` (definition of the bulk modulus), `C` the end's compliance with its
/// walls and lines ([`Trapped::compliance`]) plus the entrained air's at `pressure`
/// ([`super::air::compliance`], Boyle's law). An end with no compliance (no oil) gives
/// `B_chamber alpha dT`. With no lines, walls or air this is `B alpha dT`, about 10.5 bar per
/// degC for mineral oil (REFERENCES.md [C]).
#[allow(clippy::too_many_arguments)]
pub fn held_change(
    cylinder: &Cylinder,
    trapped: &Trapped,
    end: End,
    position: f64,
    expansion: f64,
    dt: f64,
    air_fraction: f64,
    pressure: f64,
) -> (f64, f64) {
    let volume = trapped.oil_volume(cylinder, end, position);
    let compliance = trapped.compliance(cylinder, end, position)
        + super::air::compliance(volume, air_fraction, pressure);
    if volume > 0.0 && compliance > 0.0 {
        (expansion * volume * dt / compliance, compliance)
    } else {
        (
            trapped.chamber_bulk_modulus(cylinder) * expansion * dt,
            compliance,
        )
    }
}
