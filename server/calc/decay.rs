//! Pressure-decay test: the cylinder driven to the end of its stroke, one end pressurised and
//! blocked, its pressure read at start and end of a duration with the oil temperature.

use super::analysis::CylinderInput;
use super::circuit;
use super::cylinder::End;
use super::diagnosis::{Diagnosis, pressure_tolerance};
use super::drift::Verdict;
use super::error::{CalcError, MAX_PRESSURE, MIN_GAUGE_PRESSURE, in_range};
use super::heating;
use super::quantity::{Dimension, UnitSystem};
use super::ratings::Exposure;
use super::{cautions, words};
use serde::Serialize;

/// An allowed pressure drop `pressure` per `per` seconds.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct DecayLimit {
    pub pressure: f64,
    pub per: f64,
}

/// The readings of one pressure-decay test. SI units (s, Pa, K).
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct DecayReadings {
    /// The blocked, pressurised end: `cap` at full extension, `rod` at full retraction.
    pub pressurised_end: End,
    pub duration: f64,
    pub pressure_start: f64,
    pub pressure_end: f64,
    pub oil_temperature_start: f64,
    pub oil_temperature_end: f64,
    /// The other end's pressure, if read.
    pub other_pressure_start: Option<f64>,
    pub other_pressure_end: Option<f64>,
    pub limit: Option<DecayLimit>,
}

/// What [`analyse_decay`] finds. Pressure changes are end minus start, Pa.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct DecayReport {
    pub pressurised_end: End,
    pub duration: f64,
    pub temperature_change: f64,
    /// Oil volume of the pressurised end with its line, m³.
    pub oil_volume: f64,
    pub measured_change: f64,
    /// Change the temperature change explains, Pa.
    pub thermal_change: f64,
    /// Measured minus thermal, Pa (negative: pressure lost to leakage).
    pub leak_change: f64,
    /// Equivalent leakage out of the pressurised end, m³/s (0 when nothing is lost).
    pub leak_flow: f64,
    /// Pressure drop (start minus end) scaled to the limit's period (one hour without one), Pa.
    pub scaled_drop: f64,
    pub limit: Option<DecayLimit>,
    pub verdict: Verdict,
    pub diagnosis: Diagnosis,
    pub reasoning: Vec<String>,
    pub hazards: Vec<String>,
    pub cautions: Vec<&'static str>,
}

fn validate(r: &DecayReadings) -> Result<(), CalcError> {
    in_range("duration", "the duration", r.duration, 1.0, 1e7)?;
    in_range(
        "pressure_start",
        "the start pressure",
        r.pressure_start,
        MIN_GAUGE_PRESSURE,
        MAX_PRESSURE,
    )?;
    in_range(
        "pressure_end",
        "the end pressure",
        r.pressure_end,
        MIN_GAUGE_PRESSURE,
        MAX_PRESSURE,
    )?;
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
    for (name, v) in [
        ("other_pressure_start", r.other_pressure_start),
        ("other_pressure_end", r.other_pressure_end),
    ] {
        if let Some(v) = v {
            in_range(name, "a port pressure", v, MIN_GAUGE_PRESSURE, MAX_PRESSURE)?;
        }
    }
    if let Some(l) = r.limit {
        in_range(
            "limit.pressure",
            "the limit pressure",
            l.pressure,
            0.0,
            MAX_PRESSURE,
        )?;
        in_range("limit.per", "the limit period", l.per, 1.0, 1e7)?;
    }
    Ok(())
}

/// Analyses a pressure-decay test on the cylinder in `input`.
///
/// Expected change from the temperature change `dp = alpha V_oil dT / C` with `C` the end's
/// compliance with its walls (Lamé bore growth; in the rod end also the rod's shrinkage) and
/// any entrained air at the mean test pressure ([`heating::held_change`]; about `B alpha dT`,
/// 10.5 bar per degC for mineral oil, REFERENCES.md [C]); leak change = measured - expected;
/// leaked volume `-C dp_leak`
/// (definition of compliance) over the duration gives the leak flow. Chamber volume at the end
/// of stroke: `A_cap L` for the cap end (fully extended), `A_annulus L` for the rod end (fully
/// retracted). A pressure change below [`pressure_tolerance`] of the start pressure is not
/// counted. `units` chooses the units written into the texts.
pub fn analyse_decay(
    input: &CylinderInput,
    r: &DecayReadings,
    units: UnitSystem,
) -> Result<DecayReport, CalcError> {
    input.validate()?;
    validate(r)?;
    let c = &input.cylinder;
    let end = r.pressurised_end;
    let position = match end {
        End::Cap => c.stroke,
        End::Rod => 0.0,
    };
    let dt = r.oil_temperature_end - r.oil_temperature_start;
    let mean = 0.5 * (r.pressure_start + r.pressure_end);
    let (thermal, compliance) = heating::held_change(
        c,
        &input.trapped,
        end,
        position,
        input.oil_expansion,
        dt,
        input.entrained_air,
        mean,
    );
    let measured = r.pressure_end - r.pressure_start;
    let leak = measured - thermal;
    let leak_flow = (-leak).max(0.0) * compliance / r.duration;
    let per = r.limit.map_or(3600.0, |l| l.per);
    let scaled_drop = -measured * per / r.duration;
    let verdict = match r.limit {
        Some(l) if scaled_drop <= l.pressure => Verdict::Pass,
        Some(_) => Verdict::Fail,
        None => Verdict::NoLimit,
    };
    let tol = pressure_tolerance(r.pressure_start);
    let pr = |si: f64| words::q(si, Dimension::Pressure, units);
    let end_adj = match end {
        End::Cap => "cap-end",
        End::Rod => "rod-end",
    };
    let end_name = match end {
        End::Cap => "cap end",
        End::Rod => "rod end",
    };
    let mut reasoning = vec![format!(
        "The {end_adj} pressure went from {} to {} in {}.",
        pr(r.pressure_start),
        pr(r.pressure_end),
        words::duration(r.duration)
    )];
    let dt_words = words::q(dt.abs(), Dimension::TemperatureChange, units);
    reasoning.push(match dt {
        d if d < 0.0 => format!(
            "Oil cooled {dt_words}; that explains a change of {}.",
            pr(thermal)
        ),
        d if d > 0.0 => format!(
            "Oil warmed {dt_words}; that alone would raise the pressure by {}.",
            pr(thermal)
        ),
        _ => {
            "The oil temperature held steady, so none of the change comes from temperature.".into()
        }
    });
    let other_rose = r
        .other_pressure_start
        .zip(r.other_pressure_end)
        .is_some_and(|(a, b)| {
            b - a
                > tol
                    + circuit::trapped_heating(
                        c,
                        &input.trapped,
                        end.other(),
                        position,
                        input.oil_expansion,
                        dt,
                    )
                    .max(0.0)
        });
    let diagnosis = if -leak <= tol {
        reasoning.push(format!(
            "What is left for leakage, {}, is within what a gauge reads.",
            pr(leak)
        ));
        if -thermal > tol {
            Diagnosis::ThermalContraction
        } else {
            Diagnosis::NoLeak
        }
    } else {
        reasoning.push(format!(
            "That leaves a loss of {} to leakage, about {} out of the {end_name}.",
            pr(-leak),
            words::flow(leak_flow, units)
        ));
        if other_rose {
            reasoning.push(
                "The other end's pressure rose at the same time: oil is crossing the piston."
                    .into(),
            );
            Diagnosis::PistonSealBypass
        } else if r.other_pressure_start.is_some() && r.other_pressure_end.is_some() {
            reasoning.push(format!("The other end's pressure did not rise: the oil is leaving through the valve, a fitting or a seal of the {end_name} (or across the piston to an open port)."));
            Diagnosis::HoldingCircuitLeak
        } else {
            reasoning.push("Without the other end's pressure, a leak across the piston cannot be told from a leak in the valve or fittings.".into());
            Diagnosis::Inconclusive
        }
    };
    if let Some(l) = r.limit {
        reasoning.push(format!(
            "Scaled to {}, the drop is {} against a limit of {}: {}.",
            words::duration(l.per),
            pr(scaled_drop),
            pr(l.pressure),
            verdict.as_str()
        ));
    }
    let exposure = Exposure::from(end);
    let highest = r.pressure_start.max(r.pressure_end);
    let mut hazards = Vec::new();
    for rating in input
        .ratings
        .iter()
        .filter(|x| x.exposure == exposure || x.exposure == Exposure::Both)
    {
        if highest > rating.rating {
            hazards.push(format!(
                "The test pressure {} is above the {} rating of {}.",
                pr(highest),
                rating.component.replace('_', " "),
                pr(rating.rating)
            ));
        }
    }
    Ok(DecayReport {
        pressurised_end: end,
        duration: r.duration,
        temperature_change: dt,
        oil_volume: input.trapped.oil_volume(c, end, position),
        measured_change: measured,
        thermal_change: thermal,
        leak_change: leak,
        leak_flow,
        scaled_drop,
        limit: r.limit,
        verdict,
        diagnosis,
        reasoning,
        cautions: cautions::for_result(!hazards.is_empty(), false),
        hazards,
    })
}
