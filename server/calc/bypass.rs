//! Piston seal bypass with both work ports blocked: the pressure it produces and how far the
//! load settles before it stops.

use super::cylinder::{Cylinder, End, LoadDirection};
use super::fluid;
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
    /// `C = V_chamber / Be_chamber + V_line / B_oil + C_line`.
    /// Origin: definition of the bulk modulus, `dV = V dp / B`, summed over the parts.
    pub fn compliance(&self, cylinder: &Cylinder, end: End, position: f64) -> f64 {
        let line = self.line(end);
        cylinder.volume(end, position) / self.chamber_bulk_modulus(cylinder)
            + line.volume / self.bulk_modulus
            + line.expansion
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
}

impl Outcome {
    pub fn as_str(self) -> &'static str {
        match self {
            Outcome::Intensifies => "intensifies",
            Outcome::RunsAway => "runs_away",
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
/// `C = V_chamber / Be + V_line / B + C_line` ([`Trapped::compliance`]) at the position
/// (mass balance, linearised for a small `dx`). Tube compliance is the Lamé thick-wall term of
/// [`fluid::tube_bulk_modulus`]; hose swell is the line's expansion per unit pressure.
///
/// Load pulling the rod out (held by the rod end): a bypass lets rod-end oil into the cap end,
/// which needs more oil than the rod end gives (`A_cap > A_annulus`); no pressure can hold the
/// load (`p A_annulus - p A_cap < 0` for any `p > 0`), the cylinder runs out and both ends fall
/// below atmospheric (cavitation). Common practice, REFERENCES.md "Trade facts".
pub fn seal_bypass(
    cylinder: &Cylinder,
    position: f64,
    load: f64,
    direction: LoadDirection,
    trapped: &Trapped,
) -> SealBypass {
    match direction {
        LoadDirection::Extend => SealBypass {
            outcome: Outcome::RunsAway,
            final_pressure: None,
            intensification_factor: None,
            settle_drift: None,
        },
        LoadDirection::Retract => {
            let hold = load / cylinder.cap_area();
            let final_pressure = load / cylinder.rod_area();
            let absorbed = trapped.compliance(cylinder, End::Cap, position)
                * (final_pressure - hold)
                + trapped.compliance(cylinder, End::Rod, position) * final_pressure;
            SealBypass {
                outcome: Outcome::Intensifies,
                final_pressure: Some(final_pressure),
                intensification_factor: Some(cylinder.cap_area() / cylinder.rod_area()),
                settle_drift: Some(absorbed / cylinder.rod_area()),
            }
        }
    }
}
