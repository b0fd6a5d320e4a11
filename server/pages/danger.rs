//! The cylinder's worst hazard in words, shown before any shop form: the component, its
//! rating, the pressure, the scenario and what to do, with the cautions. Every figure comes
//! from the same analysis as the safety panel (`db::installed::analyse`) and the same rule
//! table as the records' decisions (`calc::decision`).

use crate::calc::analysis::{component_words, scenario_words};
use crate::calc::bypass::Outcome;
use crate::calc::decision::{Decision, decide};
use crate::calc::decision_findings::{standing, worst_check};
use crate::calc::quantity::{Dimension, UnitSystem};
use crate::db::cylinders::Cylinder;
use crate::db::hoses::Hose;
use crate::db::installed;
use crate::pages::view::q;

/// The worst hazard of one cylinder.
#[derive(Clone, Debug, Default)]
pub struct Danger {
    /// True when something is above or near a rating, or the load can run away.
    pub found: bool,
    /// `exceeds`, `low_margin`, `can_run_away`, `ok` or `unknown` (for the word-and-shape
    /// badge).
    pub status: &'static str,
    pub headline: String,
    pub what_to_do: String,
    /// The decision the cylinder's figures alone call for (`calc::decision`).
    pub decision: &'static str,
    pub decision_words: &'static str,
    /// Every other hazard of the analysis, in words.
    pub others: Vec<String>,
    pub cautions: Vec<&'static str>,
}

/// The worst hazard of cylinder `c` with the hoses fitted to it, in `units`.
pub fn worst(c: &Cylinder, hoses: &[&Hose], units: UnitSystem) -> Danger {
    let p = |si: f64| q(Some(si), Dimension::Pressure, units);
    let (input, _, report) = match installed::analyse(c, hoses, units) {
        Ok(ok) => ok,
        Err(message) => {
            return Danger {
                found: true,
                status: "unknown",
                headline: format!("The safety figures of this cylinder cannot be made: {message}."),
                what_to_do: "Have the registry record corrected before relying on this cylinder."
                    .into(),
                cautions: crate::calc::cautions::STANDARD.to_vec(),
                ..Danger::default()
            };
        }
    };
    let ruling = decide(&standing(&report), units);
    let mut danger = Danger {
        decision: ruling.decision.as_str(),
        decision_words: ruling.decision.words(),
        others: report.hazards.clone(),
        cautions: report.cautions.clone(),
        status: "ok",
        ..Danger::default()
    };
    if let Some(k) = worst_check(&report.deciding_checks) {
        danger.found = true;
        danger.status = k.status.as_str();
        danger.headline = format!(
            "{}, rated {}: {} puts {} on it ({}).",
            component_words(&k.component),
            p(k.rating),
            scenario_words(k.scenario),
            p(k.pressure),
            if k.status.as_str() == "exceeds" {
                "above its rating"
            } else {
                "within 10 % of its rating"
            }
        );
        danger.what_to_do = match ruling.decision {
            Decision::RemoveFromService => "Remove the machine from service: this pressure is there whenever the load is held. Keep people clear and have the component replaced by one rated above it.".into(),
            _ => ruling.restrictions().into_iter().next().unwrap_or_else(|| {
                "Keep people clear of it while a load is held, and check its rating against the manufacturer's data.".into()
            }),
        };
    } else if report.seal_bypass.outcome == Outcome::RunsAway && input.load > 0.0 {
        danger.found = true;
        danger.status = "can_run_away";
        danger.headline = "If the piston seal passes oil, this cylinder cannot hold a load that pulls its rod out: it runs out.".into();
        danger.what_to_do =
            "Block the load mechanically before anyone works beneath or beside it.".into();
    } else {
        danger.headline = format!(
            "No scenario puts a pressure near a rating (highest {}).",
            p(report.highest_pressure)
        );
    }
    danger
}
