//! Why a held load drifted: the diagnosis of a position-drift test, in plain words.
//!
//! The rules, in order (thresholds in [`super::drift`] and [`pressure_tolerance`]):
//! 1. Load pushing the rod in, and the rod-end pressure climbed toward the cap end's (or the
//!    cap end's climbed while the load stayed the same) by more than the reading tolerance plus
//!    any rise the oil's warming explains: `piston_seal_bypass`. Checked first because a
//!    bypass with both ports blocked settles a little and stops, so the drift can be small.
//! 2. What is left after the thermal drift is within tolerance: `thermal_contraction` when
//!    cooling explains a drift larger than a reading resolves, else `no_leak` (or
//!    `inconclusive` when the test failed its limit on a drift too small to read).
//! 3. A real leak with a load pushing the rod in: `holding_circuit_leak` when the rod-end
//!    pressure was read and did not rise (and the cap end's did not rise either); without it,
//!    `inconclusive`.
//! 4. A real leak with a load pulling the rod out: `inconclusive`. Both a bypass and a leak
//!    from the rod end empty the rod end into a cap end that falls to vacuum, so the gauges read
//!    alike; a piston seal test with the load supported tells them apart.
//!
//! Physical reasoning: for a freely held load the holding pressure is set by the load
//! (`p_hold A_hold = F + p_other A_other`), so it stays steady while oil leaks out of the
//! holding end; it climbs only when the other end's pressure climbs, which a bypass causes.

use super::analysis::{CylinderReport, SEAL_BYPASS, component_words};
use super::bypass::Outcome;
use super::cylinder::{End, LoadDirection};
use super::drift::{DriftReadings, DriftReport, READING_TOLERANCE, THERMAL_TOLERANCE, Verdict};
use super::other_end;
use super::quantity::{Dimension, UnitSystem};
use super::ratings::Status;
use super::{analysis::CylinderInput, cautions, words};
use serde::Serialize;

/// The cause the readings point to.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Diagnosis {
    NoLeak,
    ThermalContraction,
    PistonSealBypass,
    HoldingCircuitLeak,
    Inconclusive,
}

impl Diagnosis {
    pub fn as_str(self) -> &'static str {
        match self {
            Diagnosis::NoLeak => "no_leak",
            Diagnosis::ThermalContraction => "thermal_contraction",
            Diagnosis::PistonSealBypass => "piston_seal_bypass",
            Diagnosis::HoldingCircuitLeak => "holding_circuit_leak",
            Diagnosis::Inconclusive => "inconclusive",
        }
    }
}

/// The diagnosis with its reasoning, hazards and cautions.
#[derive(Clone, Debug, PartialEq)]
pub struct Found {
    pub diagnosis: Diagnosis,
    pub reasoning: Vec<String>,
    pub hazards: Vec<String>,
    pub cautions: Vec<&'static str>,
}

/// A pressure change smaller than this is not read as a change, Pa: the larger of 0.5 bar and
/// 2 % of the holding pressure (about a gauge's reading error; our own figure).
pub fn pressure_tolerance(holding_pressure: f64) -> f64 {
    (0.5e5_f64).max(0.02 * holding_pressure.abs())
}

fn end_words(end: End) -> &'static str {
    match end {
        End::Cap => "cap end",
        End::Rod => "rod end",
    }
}

/// The end as a word before a noun: "cap-end pressure".
fn end_adj(end: End) -> &'static str {
    match end {
        End::Cap => "cap-end",
        End::Rod => "rod-end",
    }
}

/// Diagnoses a drift test from its numbers (see the module documentation for the rules).
pub fn diagnose(
    input: &CylinderInput,
    r: &DriftReadings,
    report: &DriftReport,
    cyl: &CylinderReport,
    units: UnitSystem,
) -> Found {
    let len = |si: f64| words::q(si, Dimension::Length, units);
    let pr = |si: f64| words::q(si, Dimension::Pressure, units);
    let dir = input.load_direction;
    let hold = dir.holding_end();
    let other = hold.other();
    let mut reasoning = Vec::new();
    let mut hazards = Vec::new();

    reasoning.push(format!(
        "The load moved {} in its own direction in {} ({} per minute).",
        len(report.drift),
        words::duration(report.duration),
        len(report.drift_rate * 60.0)
    ));
    let dt = report.temperature_change;
    let dt_words = words::q(dt.abs(), Dimension::TemperatureChange, units);
    if dt < 0.0 {
        reasoning.push(format!(
            "Oil cooled {dt_words}; that explains {} of the {} drift.",
            len(report.thermal_drift),
            len(report.drift)
        ));
    } else if dt > 0.0 {
        reasoning.push(format!(
            "Oil warmed {dt_words}; that alone would move the load {} against its direction.",
            len(-report.thermal_drift)
        ));
    } else {
        reasoning.push(
            "The oil temperature held steady, so none of the drift comes from cooling.".into(),
        );
    }

    // Pressure signature of a bypass (loads pushing the rod in only).
    let holding_pressure = r.pressures.start(hold).unwrap_or(cyl.holding.at(hold));
    let tol_p = pressure_tolerance(holding_pressure);
    // The rise the temperature change explains in each end (free piston; `other_end`).
    let warm = |end: End| {
        match end {
            End::Cap => report.thermal_cap_change,
            End::Rod => report.thermal_rod_change,
        }
        .max(0.0)
    };
    reasoning.push(other_end::words(report.other_end, other));
    let threshold = tol_p + warm(other);
    let other_pair = r.pressures.pair(other);
    let hold_pair = r.pressures.pair(hold);
    let other_rose =
        other_pair.is_some_and(|(a, b)| b - a > threshold && holding_pressure - a > tol_p);
    let hold_rose = hold_pair.is_some_and(|(a, b)| b - a > tol_p + warm(hold));
    // A non-holding end open to tank cannot show a bypass by pressure.
    let bypass_signature =
        dir == LoadDirection::Retract && !report.other_end.open && (other_rose || hold_rose);

    let tol_leak = READING_TOLERANCE.max(THERMAL_TOLERANCE * report.thermal_drift.abs());
    let leaking = report.leak_drift > tol_leak;
    let diagnosis = if bypass_signature {
        match (other_pair, hold_pair) {
            (Some((a, b)), _) if other_rose => reasoning.push(format!(
                "The {} pressure rose from {} to {} while the {} held {}: oil is crossing the piston.",
                end_adj(other),
                pr(a),
                pr(b),
                end_words(hold),
                pr(holding_pressure)
            )),
            (_, Some((a, b))) => reasoning.push(format!(
                "The {} pressure rose from {} to {} with the same load on it; that happens only when the {} pressure rises beneath it, i.e. oil crossing the piston.",
                end_adj(hold),
                pr(a),
                pr(b),
                end_adj(other)
            )),
            _ => {}
        }
        if let Some(p) = cyl.seal_bypass.final_pressure {
            reasoning.push(format!(
                "Left blocked, both ends settle near {} (the load over the rod area) and the load stops after about {} more.",
                pr(p),
                len(cyl.seal_bypass.settle_drift.unwrap_or(0.0))
            ));
        }
        Diagnosis::PistonSealBypass
    } else if !leaking {
        let rest = format!(
            "What is left for leakage, {}, is within what the readings resolve.",
            len(report.leak_drift)
        );
        reasoning.push(rest);
        if report.thermal_drift > READING_TOLERANCE {
            hazards.push("A held load keeps settling while its oil cools: support it mechanically before anyone works beneath it.".into());
            Diagnosis::ThermalContraction
        } else if report.verdict == Verdict::Fail {
            reasoning.push("The drift is too small to read over this duration, yet scaled up it exceeds the limit: repeat the test for longer.".into());
            Diagnosis::Inconclusive
        } else {
            Diagnosis::NoLeak
        }
    } else {
        reasoning.push(format!(
            "That leaves {} for leakage: about {} out of the {}.",
            len(report.leak_drift),
            words::flow(report.leak_flow, units),
            end_words(hold)
        ));
        if dir == LoadDirection::Retract && report.other_end.open {
            reasoning.push(format!(
                "With the {} open to tank, oil crossing the piston goes to tank just as oil leaking from the {} does, so the pressures cannot tell a piston seal bypass from a leak in the holding circuit. Block both ports, fit gauges on both and repeat.",
                end_words(other),
                end_words(hold)
            ));
            Diagnosis::Inconclusive
        } else {
            leak_cause(
                dir,
                hold,
                other,
                other_pair,
                hold_pair,
                threshold,
                tol_p,
                &pr,
                &mut reasoning,
            )
        }
    };

    if report.leak_drift < -tol_leak && !bypass_signature {
        reasoning.push(if dt < 0.0 {
            "The load moved less than cooling predicts; the oil in the cylinder may not have cooled as much as the reading shows.".into()
        } else {
            "The load moved against its own direction by more than warming explains: oil may be reaching the holding end from the supply through the valve.".into()
        });
    }
    if let (Some(limit), verdict) = (report.limit, report.verdict) {
        reasoning.push(format!(
            "Scaled to {}, the drift is {} against a limit of {}: {}.",
            words::duration(limit.per),
            len(report.scaled_drift),
            len(limit.distance),
            verdict.as_str()
        ));
    }

    let bypass_possible = matches!(diagnosis, Diagnosis::PistonSealBypass)
        || (matches!(diagnosis, Diagnosis::Inconclusive) && leaking);
    let mut over_rating = false;
    let mut runaway = false;
    if bypass_possible {
        match cyl.seal_bypass.outcome {
            Outcome::Intensifies => {
                let lead = if diagnosis == Diagnosis::PistonSealBypass {
                    "The"
                } else {
                    "If the piston seal is passing oil, the"
                };
                if let (Some(p), Some(f)) = (
                    cyl.seal_bypass.final_pressure,
                    cyl.seal_bypass.intensification_factor,
                ) {
                    hazards.push(format!(
                        "{lead} lines at both ends are under about {} now, {:.2} times the holding pressure, with no gauge to show it unless one is fitted.",
                        pr(p),
                        f
                    ));
                }
                let measured = [r.pressures.cap_end, r.pressures.rod_end]
                    .into_iter()
                    .flatten()
                    .fold(0.0, f64::max);
                for check in cyl
                    .checks
                    .iter()
                    .filter(|c| c.scenario == SEAL_BYPASS && c.status != Status::Ok)
                {
                    over_rating = true;
                    hazards.push(format!(
                        "{}: rated {}, so that pressure is {} its rating.",
                        component_words(&check.component),
                        pr(check.rating),
                        if check.status == Status::Exceeds {
                            "above"
                        } else {
                            "within 10 % of"
                        }
                    ));
                }
                for check in cyl
                    .checks
                    .iter()
                    .filter(|c| c.scenario == SEAL_BYPASS && measured > c.rating)
                {
                    over_rating = true;
                    hazards.push(format!(
                        "Measured {} is already above the {} rating of {}.",
                        pr(measured),
                        component_words(&check.component).to_lowercase(),
                        pr(check.rating)
                    ));
                }
            }
            Outcome::RestsOnStop => {
                hazards.push(cyl.seal_bypass.outcome.explanation().into());
            }
            Outcome::Sinks | Outcome::Creeps => {
                runaway = true;
                hazards.push(cyl.seal_bypass.outcome.explanation().into());
            }
            Outcome::RunsAway => {
                runaway = true;
                hazards.push("A passing piston seal cannot hold a load that pulls the rod out: the cylinder can run out, with both ends falling to vacuum.".into());
            }
        }
    }
    if leaking && diagnosis != Diagnosis::PistonSealBypass {
        runaway = true;
        hazards.push("The load keeps moving for as long as the leak lasts: keep everyone from under it and support it mechanically.".into());
    }
    if report.verdict == Verdict::Fail {
        hazards.push("The cylinder failed its drift test: do not rely on it to hold a load until the cause is found and repaired.".into());
    }
    Found {
        diagnosis,
        reasoning,
        hazards,
        cautions: cautions::for_result(over_rating, runaway),
    }
}

#[allow(clippy::too_many_arguments)]
fn leak_cause(
    dir: LoadDirection,
    hold: End,
    other: End,
    other_pair: Option<(f64, f64)>,
    hold_pair: Option<(f64, f64)>,
    threshold: f64,
    tol_p: f64,
    pr: &dyn Fn(f64) -> String,
    reasoning: &mut Vec<String>,
) -> Diagnosis {
    if dir == LoadDirection::Extend {
        reasoning.push("With a load that pulls the rod out, a leak from the rod end (valve, load-holding valve, fitting or rod seal) and a piston seal bypass both empty the rod end into a cap end that falls to vacuum, so the gauges read alike. With the load supported, a piston seal test (pressure on one end, the other port open) tells them apart.".into());
        return Diagnosis::Inconclusive;
    }
    let hold_steady = hold_pair.is_none_or(|(a, b)| b - a <= tol_p);
    match other_pair {
        Some((a, b)) if b - a <= threshold && hold_steady => {
            let hold_words = match hold_pair {
                Some((s, e)) if e < s - tol_p => format!(
                    "The {} pressure fell from {} to {}",
                    end_adj(hold),
                    pr(s),
                    pr(e)
                ),
                Some((s, _)) => {
                    format!("The {} pressure stayed at about {}", end_adj(hold), pr(s))
                }
                None => format!("The {} pressure was not read, but", end_adj(hold)),
            };
            reasoning.push(format!(
                "{hold_words} and the {} pressure did not rise ({} to {}): oil is leaving the {}, not crossing the piston. Look at the directional valve, any load-holding valve, and the fittings and hoses of the {}.",
                end_adj(other),
                pr(a),
                pr(b),
                end_words(hold),
                end_words(hold)
            ));
            reasoning.push(format!(
                "If the {} port was open to tank during the test, a piston seal bypass looks the same: block both ports and repeat to rule it out.",
                end_adj(other)
            ));
            Diagnosis::HoldingCircuitLeak
        }
        Some(_) => {
            reasoning.push("The pressures moved in a way that neither a bypass nor a holding-circuit leak explains; check the gauges and repeat.".into());
            Diagnosis::Inconclusive
        }
        None => {
            reasoning.push(format!(
                "Without the {} pressure at start and end, a piston seal bypass cannot be told from a leak in the holding circuit: fit gauges on both ports, block both and repeat.",
                end_adj(other)
            ));
            Diagnosis::Inconclusive
        }
    }
}
