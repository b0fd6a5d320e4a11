//! Position-drift test analysis: a load held part-way with the valve centred, its movement
//! over a duration, oil temperatures and (optionally) both port pressures.
//!
//! Sign convention: drift is positive in the load's direction (rod going in for a load that
//! pushes it in, out for a load that pulls it out).

use super::analysis::{self, CylinderInput};
use super::cylinder::{self, End, LoadDirection};
use super::diagnosis::{self, Diagnosis};
use super::error::{CalcError, MAX_LENGTH, MAX_PRESSURE, MIN_GAUGE_PRESSURE, in_range};
use super::other_end::{self, OtherEnd};
use super::quantity::UnitSystem;
use serde::Serialize;

/// Reading resolution assumed for a drift measurement, m (0.5 mm, about what a steel rule or
/// tape reads to; our own figure). Drift within it counts as no movement.
pub const READING_TOLERANCE: f64 = 0.5e-3;

/// The share of the thermal drift allowed as error when judging whether cooling explains the
/// drift (20 %: the expansion coefficient is known to about 10 % and a gauge reads the oil
/// temperature to about a degree; our own figure).
pub const THERMAL_TOLERANCE: f64 = 0.20;

/// How the movement was read.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub enum Movement {
    /// Drift in the load's direction, m (negative: moved against the load).
    Drift(f64),
    /// Extension at start and end, m.
    Positions { start: f64, end: f64 },
}

/// Port pressures read at start and end, Pa gauge.
#[derive(Clone, Copy, Debug, Default, PartialEq, Serialize)]
pub struct PortPressures {
    pub cap_start: Option<f64>,
    pub cap_end: Option<f64>,
    pub rod_start: Option<f64>,
    pub rod_end: Option<f64>,
}

impl PortPressures {
    /// `(start, end)` at one end, when both were read.
    pub fn pair(&self, end: End) -> Option<(f64, f64)> {
        match end {
            End::Cap => self.cap_start.zip(self.cap_end),
            End::Rod => self.rod_start.zip(self.rod_end),
        }
    }

    pub fn start(&self, end: End) -> Option<f64> {
        match end {
            End::Cap => self.cap_start,
            End::Rod => self.rod_start,
        }
    }
}

/// A drift limit: `distance` allowed per `per` seconds.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct Limit {
    pub distance: f64,
    pub per: f64,
}

/// The readings of one position-drift test. SI units (m, s, K, Pa, 1/K).
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct DriftReadings {
    pub duration: f64,
    pub movement: Movement,
    pub oil_temperature_start: f64,
    pub oil_temperature_end: f64,
    pub pressures: PortPressures,
    pub limit: Option<Limit>,
}

/// Pass or fail against the limit.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Verdict {
    Pass,
    Fail,
    /// No limit was given, so the test is not judged.
    NoLimit,
}

impl Verdict {
    pub fn as_str(self) -> &'static str {
        match self {
            Verdict::Pass => "pass",
            Verdict::Fail => "fail",
            Verdict::NoLimit => "no_limit",
        }
    }
}

/// What [`analyse_drift`] finds. SI units.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct DriftReport {
    /// Measured drift in the load's direction, m.
    pub drift: f64,
    pub duration: f64,
    /// Oil temperature change, end minus start, K.
    pub temperature_change: f64,
    /// Extension used for the chamber volumes, m.
    pub position: f64,
    /// Drift per second, m/s.
    pub drift_rate: f64,
    /// Drift explained by the oil's temperature change, m (positive for cooling), with the
    /// piston free under the load and the other end as `other_end` says.
    pub thermal_drift: f64,
    /// Pressure changes the temperature change explains in each end, Pa.
    pub thermal_cap_change: f64,
    pub thermal_rod_change: f64,
    /// The non-holding end during the test (open to tank or blocked) and why we think so.
    pub other_end: OtherEnd,
    /// Measured minus thermal drift, m.
    pub leak_drift: f64,
    /// Equivalent leakage out of the holding end, m³/s (0 when the leak drift is not positive).
    pub leak_flow: f64,
    /// Measured drift scaled to the limit's period (one hour without a limit), m.
    pub scaled_drift: f64,
    /// Leak drift scaled the same way, m.
    pub scaled_leak_drift: f64,
    /// The period the drifts are scaled to, s.
    pub scaled_per: f64,
    pub limit: Option<Limit>,
    pub verdict: Verdict,
    pub diagnosis: Diagnosis,
    pub reasoning: Vec<String>,
    pub hazards: Vec<String>,
    pub cautions: Vec<&'static str>,
}

/// Checks the readings, naming the request fields.
pub fn validate(input: &CylinderInput, r: &DriftReadings) -> Result<(), CalcError> {
    let c = &input.cylinder;
    in_range("duration", "the duration", r.duration, 1.0, 1e7)?;
    match r.movement {
        Movement::Drift(d) => {
            in_range("drift", "the drift", d, -c.stroke, c.stroke)?;
        }
        Movement::Positions { start, end } => {
            cylinder::check_position(c, "start_position", start)?;
            cylinder::check_position(c, "end_position", end)?;
        }
    }
    in_range(
        "oil_temperature_start",
        "the oil temperature",
        r.oil_temperature_start,
        173.15,
        573.15,
    )?;
    in_range(
        "oil_temperature_end",
        "the oil temperature",
        r.oil_temperature_end,
        173.15,
        573.15,
    )?;
    let p = r.pressures;
    for (name, value) in [
        ("cap_pressure_start", p.cap_start),
        ("cap_pressure_end", p.cap_end),
        ("rod_pressure_start", p.rod_start),
        ("rod_pressure_end", p.rod_end),
    ] {
        if let Some(v) = value {
            in_range(name, "a port pressure", v, MIN_GAUGE_PRESSURE, MAX_PRESSURE)?;
        }
    }
    if let Some(limit) = r.limit {
        in_range(
            "limit.distance",
            "the limit distance",
            limit.distance,
            0.0,
            MAX_LENGTH,
        )?;
        in_range("limit.per", "the limit period", limit.per, 1.0, 1e7)?;
    }
    Ok(())
}

/// Drift explained by a temperature change of the oil held in the holding end with the other
/// end open to tank (or cavitating), m.
///
/// `x = -alpha (V_hold / A_hold) dT`, with `V_hold` the oil in the holding end and its line,
/// `A_hold` that end's piston area, `dT` end minus start: cooling (`dT < 0`) shrinks the oil
/// and lets the load settle in its own direction. Origin: the volume change `alpha V dT` spread
/// over the piston area (common practice, REFERENCES.md "Trade facts").
pub fn thermal_drift(
    hold_volume: f64,
    hold_area: f64,
    expansion: f64,
    temperature_change: f64,
) -> f64 {
    -expansion * hold_volume / hold_area * temperature_change
}

/// Analyses a position-drift test for the cylinder in `input` (its position is taken from the
/// start position when given, else from `input`).
///
/// Drift rate `x / t`; thermal drift and the pressure changes it brings from
/// [`other_end::thermal`] (the piston free under the load; with the other end open to tank
/// this is [`thermal_drift`]); leak drift = measured - thermal;
/// leak flow = `A_hold x_leak / t` (continuity); scaled drift = `x per / t`; verdict `pass`
/// when the scaled drift is at most the limit distance. Diagnosis and reasoning from
/// [`diagnosis::diagnose`]; `units` chooses the units written into the texts.
pub fn analyse_drift(
    input: &CylinderInput,
    r: &DriftReadings,
    units: UnitSystem,
) -> Result<DriftReport, CalcError> {
    input.validate()?;
    validate(input, r)?;
    let c = &input.cylinder;
    let dir = input.load_direction;
    let hold = dir.holding_end();
    let (position, drift) = match r.movement {
        Movement::Drift(d) => (input.position(), d),
        Movement::Positions { start, end } => (
            start,
            match dir {
                LoadDirection::Retract => start - end,
                LoadDirection::Extend => end - start,
            },
        ),
    };
    let dt = r.oil_temperature_end - r.oil_temperature_start;
    let hold_area = c.area(hold);
    let holding = cylinder::holding_pressures(c, input.load, dir);
    let p = r.pressures;
    let start = (
        p.cap_start.unwrap_or(holding.cap_pressure),
        p.rod_start.unwrap_or(holding.rod_pressure),
    );
    let other = other_end::state(input, &p, holding.at(hold));
    let t = other_end::thermal(input, position, dt, start, other);
    let thermal = match dir {
        LoadDirection::Retract => -t.motion,
        LoadDirection::Extend => t.motion,
    };
    let leak = drift - thermal;
    let per = r.limit.map_or(3600.0, |l| l.per);
    let scale = per / r.duration;
    let scaled = drift * scale;
    let verdict = match r.limit {
        Some(l) if scaled <= l.distance => Verdict::Pass,
        Some(_) => Verdict::Fail,
        None => Verdict::NoLimit,
    };
    let cylinder_report = analysis::analyse(input, units)?;
    let mut report = DriftReport {
        drift,
        duration: r.duration,
        temperature_change: dt,
        position,
        drift_rate: drift / r.duration,
        thermal_drift: thermal,
        thermal_cap_change: t.cap_change,
        thermal_rod_change: t.rod_change,
        other_end: other,
        leak_drift: leak,
        leak_flow: hold_area * leak.max(0.0) / r.duration,
        scaled_drift: scaled,
        scaled_leak_drift: leak * scale,
        scaled_per: per,
        limit: r.limit,
        verdict,
        diagnosis: Diagnosis::Inconclusive,
        reasoning: Vec::new(),
        hazards: Vec::new(),
        cautions: Vec::new(),
    };
    let found = diagnosis::diagnose(input, r, &report, &cylinder_report, units);
    report.diagnosis = found.diagnosis;
    report.reasoning = found.reasoning;
    report.hazards = found.hazards;
    report.cautions = found.cautions;
    Ok(report)
}
