//! Every scenario against the machine's relief setting, and plain words where an end has no
//! rating to check it against.
//!
//! A blocked end is cut off from the relief valve: nothing limits its pressure to the relief
//! setting (that is what the scenarios show). Lines and parts are commonly chosen for the
//! relief setting (common practice), so a pressure above it is a pressure they may not have
//! been chosen for. The relief setting is a limit, not a rating: a pressure above it is
//! `exceeds`, anything at or below it `ok` (no low-margin band: the cap end sits at the relief
//! setting itself in the rod-side scenario; our own rule).

use super::analysis::CylinderInput;
use super::circuit;
use super::cylinder::{End, LoadDirection};
use super::quantity::{Dimension, UnitSystem};
use super::ratings::{Check, Exposure, Rating, Scenario, Status};
use super::{cautions, hazard_words, words};

/// The component name of the relief-setting checks.
pub const RELIEF_SETTING: &str = "relief_setting";

/// A pressure counts as above the relief setting only beyond this fraction of it (rounding
/// of the same figure worked out twice; our own figure).
const SAME: f64 = 1e-9;

/// `Status::Exceeds` above the relief setting, else `Status::Ok`.
pub fn relief_status(pressure: f64, relief: f64) -> Status {
    if pressure.is_nan() || pressure > relief * (1.0 + SAME) {
        Status::Exceeds
    } else {
        Status::Ok
    }
}

/// One check per scenario and end against the relief setting `relief` (Pa), component
/// [`RELIEF_SETTING`], exposure the end; none without a relief setting.
pub fn relief_checks(relief: Option<f64>, scenarios: &[Scenario]) -> Vec<Check> {
    let Some(relief) = relief.filter(|r| *r > 0.0) else {
        return Vec::new();
    };
    let mut out = Vec::new();
    for exposure in [Exposure::Cap, Exposure::Rod] {
        for s in scenarios {
            let pressure = s.pressure_on(exposure);
            out.push(Check {
                component: RELIEF_SETTING.into(),
                exposure,
                scenario: s.name,
                pressure,
                rating: relief,
                status: relief_status(pressure, relief),
                load: s.load_on(exposure),
            });
        }
    }
    out
}

fn end_of(exposure: Exposure) -> Option<End> {
    match exposure {
        Exposure::Cap => Some(End::Cap),
        Exposure::Rod => Some(End::Rod),
        Exposure::Both => None,
    }
}

/// True when some rating covers `end` (a rating on that end, or one on both ends).
pub fn end_rated(ratings: &[Rating], end: End) -> bool {
    ratings
        .iter()
        .any(|r| r.exposure == Exposure::Both || end_of(r.exposure) == Some(end))
}

/// True when a check decides a cylinder's status: every rating check, and a relief-setting
/// check only on an end with no rating (where a rating is recorded, the rating is the limit
/// of the parts; a blocked end above the relief setting but within its ratings is expected,
/// e.g. rod-side intensification; our own rule). The hazard words name every relief check
/// that is exceeded either way.
pub fn decides_status(check: &Check, ratings: &[Rating]) -> bool {
    check.component != RELIEF_SETTING
        || end_of(check.exposure).is_none_or(|end| !end_rated(ratings, end))
}

/// The highest pressure any scenario puts in `end`, with the scenario and its load.
fn highest(scenarios: &[Scenario], end: End) -> Option<&Scenario> {
    let exposure = Exposure::from(end);
    scenarios
        .iter()
        .max_by(|a, b| a.pressure_on(exposure).total_cmp(&b.pressure_on(exposure)))
}

fn end_words(end: End) -> &'static str {
    match end {
        End::Cap => "cap end",
        End::Rod => "rod end",
    }
}

/// Hazards: for each end, the scenarios that put it above the relief setting, highest first,
/// each with its pressure, how many times the relief setting that is, and its load; in words
/// in `units`.
pub fn relief_hazards(checks: &[Check], units: UnitSystem) -> Vec<String> {
    let p = |si: f64| words::q(si, Dimension::Pressure, units);
    let mut out = Vec::new();
    for exposure in [Exposure::Cap, Exposure::Rod] {
        let mut over: Vec<&Check> = checks
            .iter()
            .filter(|k| k.component == RELIEF_SETTING && k.exposure == exposure)
            .filter(|k| k.status == Status::Exceeds)
            .collect();
        if over.is_empty() {
            continue;
        }
        over.sort_by(|a, b| b.pressure.total_cmp(&a.pressure));
        let list: Vec<String> = over
            .iter()
            .map(|k| {
                format!(
                    "{} {} ({:.2} times, at a load of {})",
                    hazard_words::scenario_words(k.scenario),
                    p(k.pressure),
                    k.pressure / k.rating,
                    words::q(k.load, Dimension::Force, units),
                )
            })
            .collect();
        let end = end_of(exposure).map_or("cylinder", end_words);
        out.push(format!(
            "{} above the relief setting of {}: {}. A blocked end is cut off from the relief valve, so nothing limits it there.",
            capitalised(end),
            p(over[0].rating),
            list.join("; "),
        ));
    }
    out
}

/// Notes, in words in `units`, for each end with no rating recorded: its highest pressure and
/// that it cannot be checked against a rating.
pub fn unchecked_notes(
    ratings: &[Rating],
    relief: Option<f64>,
    scenarios: &[Scenario],
    units: UnitSystem,
) -> Vec<String> {
    let p = |si: f64| words::q(si, Dimension::Pressure, units);
    let mut out = Vec::new();
    for end in [End::Cap, End::Rod] {
        if end_rated(ratings, end) {
            continue;
        }
        let Some(s) = highest(scenarios, end) else {
            continue;
        };
        let exposure = Exposure::from(end);
        let against = match relief {
            Some(r) => format!("it is compared with the relief setting of {} only", p(r)),
            None => "nor is a relief setting given, so nothing can be compared with it".into(),
        };
        out.push(format!(
            "No rating is recorded for the {} (its line, hoses or the cylinder): its highest pressure, {} ({} at a load of {}), cannot be checked against a rating; {against}.",
            end_words(end),
            p(s.pressure_on(exposure)),
            hazard_words::scenario_words(s.name),
            words::q(s.load_on(exposure), Dimension::Force, units),
        ));
    }
    out
}

/// `cautions` with [`cautions::ABOVE_RELIEF`] after the specific ones when a relief-setting
/// check is exceeded.
pub fn with_relief_caution(list: Vec<&'static str>, checks: &[Check]) -> Vec<&'static str> {
    let above = checks
        .iter()
        .any(|k| k.component == RELIEF_SETTING && k.status == Status::Exceeds);
    with_relief_caution_if(list, above)
}

/// `cautions` with [`cautions::ABOVE_RELIEF`] after the specific ones when `above`.
pub fn with_relief_caution_if(mut list: Vec<&'static str>, above: bool) -> Vec<&'static str> {
    if above {
        let at = list
            .iter()
            .position(|c| cautions::STANDARD.contains(c))
            .unwrap_or(list.len());
        list.insert(at, cautions::ABOVE_RELIEF);
    }
    list
}

/// A note for an answer worked out at one load (no `min_load`) where a lighter load would give
/// a higher figure: with a load pushing the rod in, the blocked rod end under supply pressure
/// rises as the load falls, up to `p A_cap / A_annulus` with no load (force balance on the
/// piston; REFERENCES.md "Flow and circuits"). `None` when there is nothing to say.
pub fn single_load_note(input: &CylinderInput, units: UnitSystem) -> Option<String> {
    let supply = input.supply_pressure?;
    if input.min_load.is_some()
        || input.load <= 0.0
        || input.load_direction != LoadDirection::Retract
    {
        return None;
    }
    let c = &input.cylinder;
    let at_load = circuit::rod_side_intensification(c, supply, input.load, input.load_direction);
    let none = circuit::rod_side_intensification(c, supply, 0.0, input.load_direction);
    Some(format!(
        "Worked out at the load given ({}) only: with a lighter load the blocked rod end under {} rises above {}, up to {} with no load. Give min_load for the lightest load held; each pressure is then taken at its worst load.",
        words::q(input.load, Dimension::Force, units),
        words::q(supply, Dimension::Pressure, units),
        words::q(at_load, Dimension::Pressure, units),
        words::q(none, Dimension::Pressure, units),
    ))
}

fn capitalised(text: &str) -> String {
    let mut chars = text.chars();
    match chars.next() {
        Some(first) => first.to_uppercase().chain(chars).collect(),
        None => String::new(),
    }
}
