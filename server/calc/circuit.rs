//! Circuit figures: rod-side intensification, speeds and flows, the counterbalance factor,
//! trapped-oil heating of a held end (the valves themselves: `valves`). SI units: Pa, N, m³/s, m/s, K.

use super::bypass::Trapped;
use super::cylinder::{Cylinder, End, LoadDirection};
use serde::Serialize;

/// Rod-end pressure with the rod port blocked and the cap end at supply pressure `supply`
/// (Pa), for a load `load` (N) acting in `direction`, Pa gauge.
///
/// `p_rod = (p A_cap + F_pull) / A_annulus`, where `F_pull = +F` for a load pulling the rod out
/// and `-F` for a load pushing it in (force balance on the piston; REFERENCES.md "Flow and
/// circuits": 100/70 mm at 200 bar gives 392 bar with no load). Never below 0: a push load
/// larger than `p A_cap` drives the piston home instead.
pub fn rod_side_intensification(
    cylinder: &Cylinder,
    supply: f64,
    load: f64,
    direction: LoadDirection,
) -> f64 {
    let pull = match direction {
        LoadDirection::Extend => load,
        LoadDirection::Retract => -load,
    };
    ((supply * cylinder.cap_area() + pull) / cylinder.annulus_area()).max(0.0)
}

/// Speeds and flows for a supply flow `Q` (m³/s), m/s and m³/s.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct Speeds {
    /// `Q / A_cap`.
    pub extend: f64,
    /// `Q / A_annulus`.
    pub retract: f64,
    /// Regenerative extend (rod-end oil joins the supply): `Q / A_rod`.
    pub regenerative_extend: f64,
    /// Oil leaving the cap end while retracting: `Q A_cap / A_annulus`, m³/s.
    pub retract_return_flow: f64,
    /// Oil leaving the rod end while extending: `Q A_annulus / A_cap`, m³/s.
    pub extend_return_flow: f64,
}

/// Speeds and flows for a supply flow `flow` (m³/s). Origin: continuity, `v = Q / A`;
/// regenerative extension `v = Q / A_rod` (REFERENCES.md "Flow and circuits", the open
/// textbook "Hydraulics", Open Oregon Educational Resources). In US units this is the rule of
/// thumb v(in/s) = 3.85 Q(gpm) / A(in²) (common practice).
pub fn speeds(cylinder: &Cylinder, flow: f64) -> Speeds {
    let (cap, rod, annulus) = (
        cylinder.cap_area(),
        cylinder.rod_area(),
        cylinder.annulus_area(),
    );
    Speeds {
        extend: flow / cap,
        retract: flow / annulus,
        regenerative_extend: flow / rod,
        retract_return_flow: flow * cap / annulus,
        extend_return_flow: flow * annulus / cap,
    }
}

/// Forces at supply pressure `p` (Pa), N.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct Forces {
    /// `p A_cap`.
    pub extend: f64,
    /// `p A_annulus`.
    pub retract: f64,
    /// Regenerative extend, both ends at `p`: `p A_rod`.
    pub regenerative_extend: f64,
}

/// Forces at supply pressure `supply` (Pa). Origin: `F = p A`; regenerative `F = p A_rod`
/// (REFERENCES.md "Flow and circuits").
pub fn forces(cylinder: &Cylinder, supply: f64) -> Forces {
    Forces {
        extend: supply * cylinder.cap_area(),
        retract: supply * cylinder.annulus_area(),
        regenerative_extend: supply * cylinder.rod_area(),
    }
}

/// The usual counterbalance valve setting over the highest load-induced pressure
/// (common practice, REFERENCES.md "Trade facts").
pub const COUNTERBALANCE_FACTOR: f64 = 1.3;

/// Pressure rise in one blocked end (with its line) when the trapped oil warms by
/// `temperature_rise` (K), the piston held still (on a stop), Pa. With the piston free under a
/// load the ends are coupled: see [`super::heating`].
///
/// The oil would grow by `alpha V_oil dT`; the closed end takes that back by compression and
/// wall stretch, so `dp = alpha V_oil dT / C` with `C` the end's compliance
/// ([`Trapped::compliance`]). With no lines or wall stretch this is `B alpha dT`, the
/// figure REFERENCES.md computes (1.5 GPa x 7e-4 = 10.5 bar per degC; common practice).
pub fn trapped_heating(
    cylinder: &Cylinder,
    trapped: &Trapped,
    end: End,
    position: f64,
    expansion: f64,
    temperature_rise: f64,
) -> f64 {
    let volume = trapped.oil_volume(cylinder, end, position);
    let compliance = trapped.compliance(cylinder, end, position);
    if volume > 0.0 && compliance > 0.0 {
        expansion * volume * temperature_rise / compliance
    } else {
        trapped.chamber_bulk_modulus(cylinder) * expansion * temperature_rise
    }
}
