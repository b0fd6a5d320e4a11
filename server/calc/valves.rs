//! The valves that hold a cylinder's oil: a load-holding valve on the holding end
//! (counterbalance valve or pilot-operated check valve) and the directional valve's centre at
//! each work port. SI units: Pa, N, m².

use super::circuit::COUNTERBALANCE_FACTOR;
use super::cylinder::{Cylinder, End, LoadDirection};
use super::error::{CalcError, MAX_PRESSURE, in_range};
use serde::Serialize;

/// What the directional valve does with a work port in its centre position.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Centre {
    /// The port is blocked: the oil of that end is trapped.
    Blocked,
    /// The port is open to tank: that end stays at tank pressure (taken as 0 gauge).
    OpenToTank,
}

impl Centre {
    pub const NAMES: [&'static str; 2] = ["blocked", "open_to_tank"];

    pub fn parse(text: &str) -> Option<Self> {
        match text {
            "blocked" => Some(Centre::Blocked),
            "open_to_tank" => Some(Centre::OpenToTank),
            _ => None,
        }
    }

    pub fn as_str(self) -> &'static str {
        match self {
            Centre::Blocked => "blocked",
            Centre::OpenToTank => "open_to_tank",
        }
    }
}

/// The kind of load-holding valve fitted at the holding end's port.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum ValveKind {
    /// Relieves above its setting (less the pilot's help); opened by pilot pressure.
    Counterbalance,
    /// A check valve opened by pilot pressure; it does not relieve.
    PilotCheck,
}

impl ValveKind {
    pub const NAMES: [&'static str; 2] = ["counterbalance", "pilot_check"];

    pub fn parse(text: &str) -> Option<Self> {
        match text {
            "counterbalance" => Some(ValveKind::Counterbalance),
            "pilot_check" => Some(ValveKind::PilotCheck),
            _ => None,
        }
    }

    pub fn as_str(self) -> &'static str {
        match self {
            ValveKind::Counterbalance => "counterbalance",
            ValveKind::PilotCheck => "pilot_check",
        }
    }
}

/// Where the valve's pilot pressure comes from.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum PilotSource {
    /// Teed off the other work port (the usual circuit): the pilot pressure also acts on the
    /// piston's other side.
    OtherPort,
    /// A separate pilot supply that does not act on the piston.
    External,
}

impl PilotSource {
    pub const NAMES: [&'static str; 2] = ["other_port", "external"];

    pub fn parse(text: &str) -> Option<Self> {
        match text {
            "other_port" => Some(PilotSource::OtherPort),
            "external" => Some(PilotSource::External),
            _ => None,
        }
    }

    pub fn as_str(self) -> &'static str {
        match self {
            PilotSource::OtherPort => "other_port",
            PilotSource::External => "external",
        }
    }
}

/// A load-holding valve on the holding end.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct HoldingValve {
    pub kind: ValveKind,
    /// Counterbalance valve setting (its relief pressure with no pilot), Pa.
    pub setting: Option<f64>,
    pub pilot_ratio: Option<f64>,
    pub pilot: PilotSource,
}

/// The valves of a cylinder's circuit. `None` centres are not recorded: the analysis then
/// takes the port as blocked (the trapped case, which gives the higher pressures; ours).
#[derive(Clone, Copy, Debug, Default, PartialEq, Serialize)]
pub struct Valves {
    pub holding: Option<HoldingValve>,
    pub cap_centre: Option<Centre>,
    pub rod_centre: Option<Centre>,
}

impl Valves {
    /// The recorded centre of one port.
    pub fn centre(&self, end: End) -> Option<Centre> {
        match end {
            End::Cap => self.cap_centre,
            End::Rod => self.rod_centre,
        }
    }

    /// True when the end is open to tank: its port open in the centre and no load-holding
    /// valve in between (a load-holding valve sits on the holding end and blocks it).
    pub fn open_to_tank(&self, end: End, direction: LoadDirection) -> bool {
        let valve_here = self.holding.is_some() && end == direction.holding_end();
        !valve_here && self.centre(end) == Some(Centre::OpenToTank)
    }

    /// The counterbalance valve's setting on the holding end, Pa, when one is recorded.
    pub fn relief_setting(&self) -> Option<f64> {
        self.holding
            .filter(|v| v.kind == ValveKind::Counterbalance)
            .and_then(|v| v.setting)
    }

    /// Checks the valve figures, naming the request fields; a holding end open to tank with a
    /// load on it and no load-holding valve holds nothing and is refused.
    pub fn validate(&self, direction: LoadDirection, load: f64) -> Result<(), CalcError> {
        if let Some(v) = self.holding {
            if let Some(s) = v.setting {
                in_range(
                    "holding_valve_setting",
                    "the valve setting",
                    s,
                    1e3,
                    MAX_PRESSURE,
                )?;
            }
            if let Some(r) = v.pilot_ratio {
                in_range("holding_valve_pilot_ratio", "the pilot ratio", r, 0.1, 1e3)?;
            }
        }
        let hold = direction.holding_end();
        if load > 0.0 && self.open_to_tank(hold, direction) {
            return Err(CalcError::new(
                format!("{}_port_centre", hold.as_str()),
                "the holding end open to tank holds no load: give the load-holding valve on that end, or the centre that blocks it",
            ));
        }
        Ok(())
    }
}

/// Counterbalance valve figures on the holding end.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct Counterbalance {
    /// Suggested setting, Pa: 1.3 x the load-induced pressure (common practice).
    pub setting: f64,
    /// The load-induced pressure it was based on, Pa.
    pub load_pressure: f64,
    /// Pilot ratio used, if given.
    pub pilot_ratio: Option<f64>,
    /// Pilot pressure that opens the valve with the load on it, Pa, if a ratio is given.
    pub pilot_opening_pressure: Option<f64>,
    /// Where the pilot comes from (`other_port` unless recorded otherwise).
    pub pilot_source: PilotSource,
    /// The setting the opening pressure was found for, Pa: the recorded valve setting, else
    /// the suggested one.
    pub setting_used: f64,
    /// True when `setting_used` is a recorded valve setting.
    pub setting_recorded: bool,
}

/// Pilot pressure that opens a counterbalance valve holding load `load` (N) on area `a_hold`
/// (m²), Pa, never below 0.
///
/// The valve opens when the holding pressure plus `R` times the pilot pressure reaches the
/// setting: `p_hold + R p_pilot = p_set` (force balance on the valve's poppet, common
/// practice). With the pilot teed off the other work port the pilot pressure also acts on
/// the piston's other side, so `p_hold A_hold = F + p_pilot A_other` (force balance on the
/// piston) and `p_pilot = (p_set - F/A_hold) / (R + A_other/A_hold)`; with an external pilot
/// `p_hold = F / A_hold` and `p_pilot = (p_set - F/A_hold) / R` (REFERENCES.md last entry).
pub fn counterbalance_opening(
    setting: f64,
    load: f64,
    a_hold: f64,
    a_other: f64,
    ratio: f64,
    pilot: PilotSource,
) -> f64 {
    let margin = setting - load / a_hold;
    let denominator = match pilot {
        PilotSource::OtherPort => ratio + a_other / a_hold,
        PilotSource::External => ratio,
    };
    (margin / denominator).max(0.0)
}

/// Pilot pressure that opens a pilot-operated check valve holding load `load` (N) on area
/// `a_hold`, Pa, or `None` when the other port's pressure cannot open it.
///
/// The check opens when `R p_pilot` reaches the holding pressure (its spring neglected; force
/// balance on the poppet, common practice). Pilot from the other work port:
/// `p_hold = F/A_hold + p_pilot A_other/A_hold` (force balance on the piston), so
/// `p_pilot = (F/A_hold) / (R - A_other/A_hold)`, and with `R <= A_other/A_hold` the pilot
/// raises the holding pressure as fast as it pushes the poppet: it never opens. External pilot:
/// `p_pilot = F / (A_hold R)`.
pub fn pilot_check_opening(
    load: f64,
    a_hold: f64,
    a_other: f64,
    ratio: f64,
    pilot: PilotSource,
) -> Option<f64> {
    let hold = load / a_hold;
    match pilot {
        PilotSource::External => Some(hold / ratio),
        PilotSource::OtherPort if ratio > a_other / a_hold => {
            Some(hold / (ratio - a_other / a_hold))
        }
        PilotSource::OtherPort => None,
    }
}

/// The counterbalance figures for a cylinder holding `load` (N) in `direction`: the suggested
/// setting `1.3 F / A_hold` (common practice) and, with a pilot ratio (the valve's, else
/// `pilot_ratio`), the pilot opening pressure of [`counterbalance_opening`] at the recorded
/// setting (else the suggested one), pilot from the other port unless recorded as external.
pub fn counterbalance(
    cylinder: &Cylinder,
    load: f64,
    direction: LoadDirection,
    valves: &Valves,
    pilot_ratio: Option<f64>,
) -> Counterbalance {
    let hold = direction.holding_end();
    let (a_hold, a_other) = (cylinder.area(hold), cylinder.area(hold.other()));
    let load_pressure = load / a_hold;
    let suggested = COUNTERBALANCE_FACTOR * load_pressure;
    let valve = valves.holding;
    let ratio = valve
        .and_then(|v| v.pilot_ratio)
        .or(pilot_ratio)
        .filter(|r| r.is_finite() && *r > 0.0);
    let pilot = valve.map_or(PilotSource::OtherPort, |v| v.pilot);
    let recorded = valves.relief_setting();
    let setting_used = recorded.unwrap_or(suggested);
    Counterbalance {
        setting: suggested,
        load_pressure,
        pilot_ratio: ratio,
        pilot_opening_pressure: ratio
            .map(|r| counterbalance_opening(setting_used, load, a_hold, a_other, r, pilot)),
        pilot_source: pilot,
        setting_used,
        setting_recorded: recorded.is_some(),
    }
}

impl Valves {
    /// The valves from their stored words (`calc::valves` names; unknown words read as not
    /// recorded): kind, setting (Pa), pilot ratio, pilot source (`other_port` unless
    /// `external`), cap and rod port centres.
    pub fn from_words(
        holding: Option<&str>,
        setting: Option<f64>,
        pilot_ratio: Option<f64>,
        pilot: Option<&str>,
        cap_centre: Option<&str>,
        rod_centre: Option<&str>,
    ) -> Valves {
        Valves {
            holding: holding.and_then(ValveKind::parse).map(|kind| HoldingValve {
                kind,
                setting: setting.filter(|_| kind == ValveKind::Counterbalance),
                pilot_ratio,
                pilot: pilot
                    .and_then(PilotSource::parse)
                    .unwrap_or(PilotSource::OtherPort),
            }),
            cap_centre: cap_centre.and_then(Centre::parse),
            rod_centre: rod_centre.and_then(Centre::parse),
        }
    }
}
