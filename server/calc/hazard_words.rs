//! Hazard texts of the cylinder analysis, and the names of components and scenarios as a
//! sentence writes them. Words only: every figure comes from `analysis`.

use super::analysis::{
    CylinderInput, NORMAL_HOLDING, ROD_SIDE_INTENSIFICATION, SEAL_BYPASS, SEAL_BYPASS_WARMING,
    TRAPPED_OIL_HEATING,
};
use super::buckling::BucklingReport;
use super::bypass::{Outcome, SealBypass};
use super::cylinder::Holding;
use super::limits::RELIEF_SETTING;
use super::quantity::{Dimension, UnitSystem};
use super::ratings::{Check, Status};
use super::strength::TubeCheck;
use super::words;

/// The hazards a cylinder report implies, in plain words in `units`: the pressure a piston
/// seal bypass produces (or that the load can run away), each rating at or near its limit,
/// an overstressed tube and a rod near buckling.
pub fn cylinder_hazards(
    input: &CylinderInput,
    holding: &Holding,
    bypass: &SealBypass,
    checks: &[Check],
    tube: Option<&TubeCheck>,
    buckling: Option<&BucklingReport>,
    units: UnitSystem,
) -> Vec<String> {
    let p = |si: f64| words::q(si, Dimension::Pressure, units);
    let mut out = Vec::new();
    match (bypass.outcome, bypass.final_pressure, bypass.intensification_factor) {
        (Outcome::Intensifies, Some(fp), Some(factor)) if input.load > 0.0 => out.push(format!(
            "If the piston seal passes oil with both ports blocked, both ends rise to {} ({:.2} times the holding pressure of {}), with no gauge to show it.",
            p(fp),
            factor,
            p(holding.cap_pressure)
        )),
        (Outcome::RunsAway, ..) => out.push(
            "If the piston seal passes oil, this cylinder cannot hold a load that pulls its rod out: it runs out and the chambers fall below atmospheric pressure."
                .to_string(),
        ),
        _ => {}
    }
    // Relief-setting checks have their own words (limits::relief_hazards).
    for check in checks
        .iter()
        .filter(|k| k.status != Status::Ok && k.component != RELIEF_SETTING)
    {
        let how = match check.status {
            Status::Exceeds => "above",
            _ => "within 10 % of",
        };
        out.push(format!(
            "{}: {} puts {} on it (at a load of {}), {} its rating of {}.",
            component_words(&check.component),
            scenario_words(check.scenario),
            p(check.pressure),
            words::q(check.load, Dimension::Force, units),
            how,
            p(check.rating)
        ));
    }
    if let Some(t) = tube.filter(|t| t.status != Status::Ok) {
        out.push(format!(
            "Tube: the equivalent stress at the bore (Tresca) reaches {} at {} (hoop stress {}), against an allowable {} (yield over a factor of {}).",
            p(t.equivalent_stress),
            p(t.pressure),
            p(t.hoop_stress),
            p(t.allowable_stress),
            t.safety_factor
        ));
    }
    if let Some(b) = buckling.filter(|b| b.status != Status::Ok) {
        let d = &b.design;
        out.push(format!(
            "Rod: the compressive load {} is {} the buckling allowable of {} (the lowest of Euler with K = {} at {}, and {} with the design factor K = {} at {}; slenderness {:.0}, factor {}{}).",
            words::q(b.euler.load, Dimension::Force, units),
            if b.status == Status::Exceeds { "above" } else { "within 10 % of" },
            words::q(b.governing_allowable_load, Dimension::Force, units),
            b.euler.end_condition.factor(),
            words::q(b.euler.allowable_load, Dimension::Force, units),
            if d.range == super::buckling::Range::Inelastic { "Johnson" } else { "Euler" },
            d.effective_length_factor,
            words::q(d.allowable_load, Dimension::Force, units),
            d.slenderness,
            b.euler.safety_factor,
            if b.length_assumed { "; free length assumed twice the stroke" } else { "" }
        ));
    }
    out
}

/// A component name for a sentence.
pub fn component_words(component: &str) -> String {
    match component {
        "cap_line" => "Cap-end line".into(),
        "rod_line" => "Rod-end line".into(),
        "cylinder" => "Cylinder".into(),
        RELIEF_SETTING => "Relief setting".into(),
        other => format!("Hose {other}"),
    }
}

/// A scenario name for a sentence.
pub fn scenario_words(scenario: &str) -> &'static str {
    match scenario {
        NORMAL_HOLDING => "normal holding",
        SEAL_BYPASS => "a piston seal bypass",
        ROD_SIDE_INTENSIFICATION => "rod-side intensification at supply pressure",
        TRAPPED_OIL_HEATING => "trapped-oil heating",
        SEAL_BYPASS_WARMING => "a piston seal bypass in a warming cylinder",
        _ => "this scenario",
    }
}
