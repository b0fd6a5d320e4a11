//! Piston seal bypass with both work ports blocked: the pressure it produces and how far the
//! load settles before it stops.

use super::cylinder::{Cylinder, End, LoadDirection};
use super::{fluid, settle, walls};
use serde::Serialize;

/// The oil and walls that take up a pressure rise in one end: the line between the port and
/// the blocking valve, and optionally the line's own expansion per unit pressure.
#[derive(Clone, Copy, Debug, Default, PartialEq, Serialize)]
pub struct Line {
    /// Oil volume of the line, m³.
    pub volume: f64,
    /// Volumetric expansion of the line per unit pressure, m³/Pa (hose swell); 0 if unknown.
    pub expansion: f64,
}

/// The tube wall, for its Lamé compliance.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct TubeWall {
    /// Outside diameter of the tube, m.
    pub outside_diameter: f64,
    /// Young's modulus, Pa.
    pub youngs: f64,
    /// Poisson's ratio.
    pub poisson: f64,
}

impl TubeWall {
    /// A steel tube (E = 210 GPa, nu = 0.3, handbook values).
    pub fn steel(outside_diameter: f64) -> Self {
        TubeWall {
            outside_diameter,
            youngs: fluid::STEEL_YOUNGS_MODULUS,
            poisson: fluid::STEEL_POISSON_RATIO,
        }
    }
}

/// What traps the oil: oil modulus, lines and tube.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct Trapped {
    /// Bulk modulus of the oil, Pa.
    pub bulk_modulus: f64,
    pub cap_line: Line,
    pub rod_line: Line,
    pub tube: Option<TubeWall>,
}

impl Trapped {
    fn line(&self, end: End) -> Line {
        match end {
            End::Cap => self.cap_line,
            End::Rod => self.rod_line,
        }
    }

    /// Effective bulk modulus of the oil inside the tube, Pa: the oil modulus in series with
    /// the tube's Lamé container modulus when an outside diameter is given
    /// ([`fluid::effective_bulk_modulus`], [`fluid::tube_bulk_modulus`]).
    pub fn chamber_bulk_modulus(&self, cylinder: &Cylinder) -> f64 {
        let tube = self.tube.and_then(|t| {
            fluid::tube_bulk_modulus(cylinder.bore, t.outside_diameter, t.youngs, t.poisson)
        });
        fluid::effective_bulk_modulus(self.bulk_modulus, tube, None)
    }

    /// Compliance of one end at `position`, m³/Pa: the volume of oil that must be pushed in
    /// to raise that end's pressure by one pascal with the piston held still:
    /// `C = (V_chamber + V_line) / B_oil + C_wall + C_line`, with the wall term of
    /// [`walls::wall_compliance`] (the bore's whole cross-section grows, and in the rod end the
    /// rod shrinks; Lamé) when the tube is given, else rigid walls.
    /// Origin: definition of the bulk modulus, `dV = V dp / B`, summed over the parts.
    pub fn compliance(&self, cylinder: &Cylinder, end: End, position: f64) -> f64 {
        let line = self.line(end);
        let wall = self
            .tube
            .map_or(0.0, |t| walls::wall_compliance(cylinder, &t, end, position));
        (cylinder.volume(end, position) + line.volume) / self.bulk_modulus + wall + line.expansion
    }

    /// Oil volume of one end with its line, m³.
    pub fn oil_volume(&self, cylinder: &Cylinder, end: End, position: f64) -> f64 {
        cylinder.volume(end, position) + self.line(end).volume
    }
}

/// What a piston seal bypass does to a held load.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Outcome {
    /// Both ends rise to load / rod area; the load settles a little and stops.
    Intensifies,
    /// The cylinder cannot hold the load: it runs out and the chambers cavitate.
    RunsAway,
    /// A load pulling the rod out at full extension: it rests on the cylinder's stop.
    RestsOnStop,
    /// The rod end is open to tank: oil crosses the piston and goes to tank, the load sinks
    /// and nothing intensifies.
    Sinks,
    /// A counterbalance valve on the holding end relieves below the bypass pressure: both ends
    /// stop at its setting and the load creeps down as the valve lets oil out.
    Creeps,
}

impl Outcome {
    pub fn as_str(self) -> &'static str {
        match self {
            Outcome::Intensifies => "intensifies",
            Outcome::RunsAway => "runs_away",
            Outcome::RestsOnStop => "rests_on_stop",
            Outcome::Sinks => "sinks",
            Outcome::Creeps => "creeps",
        }
    }

    /// The outcome in a sentence, for the calculator's answer and page.
    pub fn explanation(self) -> &'static str {
        match self {
            Outcome::Intensifies => {
                "With both ports blocked and oil crossing the piston, both ends rise to the load over the rod area; the load settles by the settle drift and stops (on its stop, at a lower pressure, if the travel left runs out first)."
            }
            Outcome::RunsAway => {
                "With oil crossing the piston, no pressure can hold a load that pulls the rod out: the cylinder runs out and both ends fall below atmospheric pressure (cavitation). There is no final pressure."
            }
            Outcome::RestsOnStop => {
                "At full extension a load that pulls the rod out rests on the cylinder's stop: oil crossing the piston cannot move it further. There is no final pressure."
            }
            Outcome::Sinks => {
                "The rod end is open to tank: oil crossing the piston goes to tank, the load sinks and no pressure rises. There is no final pressure."
            }
            Outcome::Creeps => {
                "A counterbalance valve on the holding end relieves below the bypass pressure: both ends stop at its setting and the load creeps down as the valve lets oil out."
            }
        }
    }
}

/// Result of [`seal_bypass`].
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct SealBypass {
    pub outcome: Outcome,
    /// Pressure in both ends once the oil has crossed the piston, Pa; `None` on a run-away.
    pub final_pressure: Option<f64>,
    /// Final pressure over the normal holding pressure, `A_cap / A_rod`; `None` on a run-away.
    pub intensification_factor: Option<f64>,
    /// How far the load sinks before the pressure rise is taken up, m; `None` on a run-away.
    pub settle_drift: Option<f64>,
    /// Travel left in the load's direction before the piston reaches its stop, m.
    pub travel_left: f64,
    /// The settle was limited by the travel left: the piston bottoms and the ends equalise
    /// below `load / A_rod` (`final_pressure` is that lower pressure).
    pub bottoms: bool,
    /// The settle with oil, walls and lines only (no entrained air), m.
    pub settle_drift_oil_only: Option<f64>,
    /// The settle with 1 % entrained air (by volume at atmospheric pressure), m.
    pub settle_drift_one_percent_air: Option<f64>,
}

/// Piston seal bypass with both work ports blocked, for a load `load` (N) at extension
/// `position` (m).
///
/// Load pushing the rod in (held by the cap end at `F / A_cap`): oil crosses the piston until
/// both ends stand at the same pressure `p`; the piston then balances `p (A_cap - A_annulus) =
/// p A_rod = F`, so `p = F / A_rod` and the factor over the holding pressure is
/// `A_cap / A_rod` (force balance; common practice, REFERENCES.md "Trade facts": 10,000 lbf,
/// 10 in² piston, 2 in² rod -> 1,000 psi held, 5,000 psi bypassed).
///
/// Settle drift: as the rod goes in by `dx`, the cap end loses `A_cap dx` of room and the rod
/// end gains `A_annulus dx`; the oil crosses the piston but is not lost, so the room for it
/// shrinks by `A_rod dx`. That shortfall is made up only by squeezing the oil and stretching
/// the walls while each end's pressure moves from its holding value to `p`:
/// `A_rod dx = C_cap (p - p_cap0) + C_rod (p - p_rod0)`, with each end's compliance
/// `C = (V_chamber + V_line) / B + C_wall + C_line` ([`Trapped::compliance`]) at the position
/// (mass balance, linearised for a small `dx`). The wall term is the Lamé bore growth over
/// each end's length, with the rod's shrinkage in the rod end ([`walls::wall_compliance`]);
/// hose swell is the line's expansion per unit pressure. The settle never exceeds the travel
/// left: a piston that bottoms first leaves both ends at the lower pressure the same mass
/// balance gives with `dx` set to the travel left ([`settle::seal_bypass_with`], which also
/// takes entrained air and the valves).
///
/// Load pulling the rod out (held by the rod end): a bypass lets rod-end oil into the cap end,
/// which needs more oil than the rod end gives (`A_cap > A_annulus`); no pressure can hold the
/// load (`p A_annulus - p A_cap < 0` for any `p > 0`), the cylinder runs out and both ends fall
/// below atmospheric (cavitation). Common practice, REFERENCES.md "Trade facts". At full
/// extension it has nowhere to go and rests on the stop.
pub fn seal_bypass(
    cylinder: &Cylinder,
    position: f64,
    load: f64,
    direction: LoadDirection,
    trapped: &Trapped,
) -> SealBypass {
    settle::seal_bypass_with(
        cylinder,
        position,
        load,
        direction,
        trapped,
        &settle::Surroundings::default(),
    )
}
