//! Whether the non-holding end was blocked during a drift test, and the thermal drift and
//! pressure changes that follow from it with the piston free under the load.

use super::cylinder::End;
use super::cylinder_input::CylinderInput;
use super::diagnosis::pressure_tolerance;
use super::drift::PortPressures;
use super::heating::{self, EndSetup, Thermal};
use serde::Serialize;

/// Where the non-holding end's state came from.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Basis {
    /// The valve centre recorded for that port.
    Recorded,
    /// The port's pressure as read during the test.
    Readings,
    /// Neither: taken as blocked.
    Assumed,
}

impl Basis {
    pub fn as_str(self) -> &'static str {
        match self {
            Basis::Recorded => "recorded",
            Basis::Readings => "readings",
            Basis::Assumed => "assumed",
        }
    }
}

/// The non-holding end during the test: open to tank or blocked, and why we think so.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
pub struct OtherEnd {
    pub open: bool,
    pub basis: Basis,
}

/// The non-holding end's state: the recorded valve centre where given; otherwise from its
/// readings (start and end both within [`pressure_tolerance`] of zero: open to tank; held or
/// changed pressure: blocked); with no readings, taken as blocked. Blocked is the assumption
/// that lets a temperature change explain the least drift, so it never hides a leak (ours).
pub fn state(input: &CylinderInput, pressures: &PortPressures, holding_pressure: f64) -> OtherEnd {
    let dir = input.load_direction;
    let other = dir.holding_end().other();
    if input.valves.centre(other).is_some() {
        return OtherEnd {
            open: input.valves.open_to_tank(other, dir),
            basis: Basis::Recorded,
        };
    }
    match pressures.pair(other) {
        Some((a, b)) => {
            let tol = pressure_tolerance(holding_pressure);
            OtherEnd {
                open: a.abs() <= tol && b.abs() <= tol,
                basis: Basis::Readings,
            }
        }
        None => OtherEnd {
            open: false,
            basis: Basis::Assumed,
        },
    }
}

/// The oil's temperature change `dt` (K) in a drift test at `position`, with the holding end
/// blocked (its counterbalance valve relieving at its setting, if one is recorded) and the
/// other end as `other` says, from the start pressures given (else the holding pressures):
/// [`heating::free_piston`] (free piston under a constant load; definition of the bulk modulus,
/// force balance).
pub fn thermal(
    input: &CylinderInput,
    position: f64,
    dt: f64,
    start: (f64, f64),
    other: OtherEnd,
) -> Thermal {
    let hold = input.load_direction.holding_end();
    let setup = |end, pressure| EndSetup {
        pressure,
        open: end != hold && other.open,
        relief: (end == hold)
            .then(|| input.valves.relief_setting())
            .flatten(),
    };
    heating::free_piston(
        &input.cylinder,
        &input.trapped,
        position,
        input.oil_expansion,
        dt,
        setup(End::Cap, start.0),
        setup(End::Rod, start.1),
        false,
    )
}

/// Where the analysis took the non-holding end's state from, in a sentence.
pub fn words(state: OtherEnd, other: End) -> String {
    let port = match other {
        End::Cap => "cap-end",
        End::Rod => "rod-end",
    };
    match (state.basis, state.open) {
        (Basis::Recorded, true) => {
            format!("The {port} port is open to tank in the valve's centre, as recorded.")
        }
        (Basis::Recorded, false) => {
            format!("The {port} port is blocked in the valve's centre, as recorded.")
        }
        (Basis::Readings, true) => format!(
            "The {port} pressure stayed at zero, so that port was taken as open to tank during the test."
        ),
        (Basis::Readings, false) => format!(
            "The {port} pressure held or changed, so that port was taken as blocked during the test."
        ),
        (Basis::Assumed, _) => format!(
            "The {port} port's state was not recorded and its pressure not read: it is taken as blocked, the case in which a temperature change explains the least drift, so no leak is explained away."
        ),
    }
}
