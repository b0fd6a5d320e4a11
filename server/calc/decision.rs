//! One decision per shop record: `fit_for_service`, `restricted` (with what the restriction
//! is) or `remove_from_service`, derived from a record's verdict, diagnosis, the cylinder's
//! rated-pressure checks, the pressures read and an inspection's result by one rule table,
//! [`RULES`]. Every row that applies gives a reason; the decision is the most severe of them.
//!
//! The rules are ours (not from a standard); they lean to the safe side. A scenario that the
//! record shows is happening (normal holding always; a piston seal bypass when the record
//! found one) counts as a pressure present now. Every other scenario of the analysis (those
//! named today and any added later) is a pressure that can arise, and restricts the cylinder.

use super::analysis::{NORMAL_HOLDING, SEAL_BYPASS, component_words};
use super::diagnosis::Diagnosis;
use super::drift::Verdict;
use super::quantity::{Dimension, UnitSystem};
use super::ratings::{Check, Status};
use super::{hazard_words, words};
use serde::Serialize;

/// The decision, least severe first (the order is used to take the worst).
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Decision {
    FitForService,
    Restricted,
    RemoveFromService,
}

impl Decision {
    pub fn as_str(self) -> &'static str {
        match self {
            Decision::FitForService => "fit_for_service",
            Decision::Restricted => "restricted",
            Decision::RemoveFromService => "remove_from_service",
        }
    }

    /// The decision in words, for pages.
    pub fn words(self) -> &'static str {
        match self {
            Decision::FitForService => "Fit for service",
            Decision::Restricted => "Restricted use",
            Decision::RemoveFromService => "Remove from service",
        }
    }

    pub fn parse(text: &str) -> Option<Decision> {
        match text {
            "fit_for_service" => Some(Decision::FitForService),
            "restricted" => Some(Decision::Restricted),
            "remove_from_service" => Some(Decision::RemoveFromService),
            _ => None,
        }
    }
}

/// An inspection's overall result.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum InspectionResult {
    Pass,
    PassWithDeficiencies,
    Fail,
}

impl InspectionResult {
    pub fn parse(text: &str) -> Option<InspectionResult> {
        match text {
            "pass" => Some(InspectionResult::Pass),
            "pass_with_deficiencies" => Some(InspectionResult::PassWithDeficiencies),
            "fail" => Some(InspectionResult::Fail),
            _ => None,
        }
    }
}

/// A pressure read during a test above a component's rating, Pa.
#[derive(Clone, Debug, PartialEq)]
pub struct Measured {
    pub component: String,
    pub pressure: f64,
    pub rating: f64,
}

/// What a record found, as the rule table reads it.
#[derive(Clone, Debug, Default, PartialEq)]
pub struct Findings {
    pub verdict: Option<Verdict>,
    pub diagnosis: Option<Diagnosis>,
    /// The cylinder's rated-pressure checks (every scenario against every rating).
    pub checks: Vec<Check>,
    /// Pressures read during the test above a rating.
    pub measured_over: Vec<Measured>,
    pub inspection: Option<InspectionResult>,
}

impl Findings {
    /// True when the scenario is happening according to this record: normal holding always,
    /// a piston seal bypass when the record found one.
    pub fn present_now(&self, scenario: &str) -> bool {
        scenario == NORMAL_HOLDING
            || (scenario == SEAL_BYPASS && self.diagnosis == Some(Diagnosis::PistonSealBypass))
    }
}

/// One reason: which row gave it, the decision it calls for, the words, and the restriction
/// (for `restricted` rows).
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Reason {
    pub rule: &'static str,
    pub decision: Decision,
    pub text: String,
    pub restriction: Option<String>,
}

/// The decision with its reasons (every row that applied, most severe first) and the
/// restrictions to keep while it stands.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Ruling {
    pub decision: Decision,
    pub reasons: Vec<Reason>,
}

impl Ruling {
    /// The reasons' words, most severe first.
    pub fn reason_texts(&self) -> Vec<String> {
        self.reasons.iter().map(|r| r.text.clone()).collect()
    }

    /// The restrictions, in order, without repeats.
    pub fn restrictions(&self) -> Vec<String> {
        let mut out: Vec<String> = Vec::new();
        for r in self.reasons.iter().filter_map(|r| r.restriction.clone()) {
            if !out.contains(&r) {
                out.push(r);
            }
        }
        out
    }
}

/// The reasons one row gives: each as (text, restriction).
pub type Found = Vec<(String, Option<String>)>;

/// One row of the table: its name, the decision it calls for, and what it finds.
pub struct Rule {
    pub name: &'static str,
    pub decision: Decision,
    /// The reasons (text, restriction) this row gives for the findings; empty when it does
    /// not apply.
    pub applies: fn(&Findings, UnitSystem) -> Found,
}

const SUPPORT: &str = "Do not leave a load raised on this cylinder: support or lower it before anyone works beneath or beside it.";

fn p(si: f64, units: UnitSystem) -> String {
    words::q(si, Dimension::Pressure, units)
}

fn one(text: &str, restriction: Option<&str>) -> Found {
    vec![(text.to_string(), restriction.map(str::to_string))]
}

/// A component's name inside a sentence: `hose H17 (...)`, `the cylinder`.
fn in_sentence(component: &str) -> String {
    let words = component_words(component);
    match words.strip_prefix("Hose ") {
        Some(rest) => format!("hose {rest}"),
        None => format!("the {}", words.to_lowercase()),
    }
}

fn exceeding(f: &Findings, now: bool, units: UnitSystem) -> Found {
    let over: Vec<&Check> = f
        .checks
        .iter()
        .filter(|k| k.status == Status::Exceeds && f.present_now(k.scenario) == now)
        .collect();
    // The restriction is given once per component, with its worst pressure.
    let worst = |k: &Check| {
        !over
            .iter()
            .any(|o| o.component == k.component && o.pressure > k.pressure)
            && over
                .iter()
                .position(|o| o.component == k.component && o.pressure == k.pressure)
                == over.iter().position(|o| std::ptr::eq(*o, k))
    };
    over.iter()
        .map(|k| {
            let text = format!(
                "{}: {} puts {} on it, above its rating of {}.",
                component_words(&k.component),
                hazard_words::scenario_words(k.scenario),
                p(k.pressure, units),
                p(k.rating, units)
            );
            let restriction = (!now && worst(k)).then(|| {
                format!(
                    "Keep people clear of {}; until it is replaced by one rated above {}, do not leave the load held with the valve centred and do not drive the cylinder against a blocked port or the end of its stroke.",
                    in_sentence(&k.component),
                    p(k.pressure, units)
                )
            });
            (text, restriction)
        })
        .collect()
}

/// The rule table, in order of severity. Reasons appear in this order.
pub static RULES: &[Rule] = &[
    Rule {
        name: "limit_failed",
        decision: Decision::RemoveFromService,
        applies: |f, _| match f.verdict {
            Some(Verdict::Fail) => one(
                "The test failed its limit: do not rely on this cylinder to hold a load until the cause is found and repaired.",
                None,
            ),
            _ => Vec::new(),
        },
    },
    Rule {
        name: "bypass_found",
        decision: Decision::RemoveFromService,
        applies: |f, _| match f.diagnosis {
            Some(Diagnosis::PistonSealBypass) => one(
                "Oil is crossing the piston (piston seal bypass): with the ports blocked both ends rise toward the load over the rod area.",
                None,
            ),
            _ => Vec::new(),
        },
    },
    Rule {
        name: "measured_above_rating",
        decision: Decision::RemoveFromService,
        applies: |f, units| {
            f.measured_over
                .iter()
                .map(|m| {
                    (
                        format!(
                            "{}: {} was read during the test, above its rating of {}.",
                            component_words(&m.component),
                            p(m.pressure, units),
                            p(m.rating, units)
                        ),
                        None,
                    )
                })
                .collect()
        },
    },
    Rule {
        name: "pressure_above_rating_now",
        decision: Decision::RemoveFromService,
        applies: |f, units| exceeding(f, true, units),
    },
    Rule {
        name: "inspection_failed",
        decision: Decision::RemoveFromService,
        applies: |f, _| match f.inspection {
            Some(InspectionResult::Fail) => one(
                "The inspection failed: the machine may not work until the deficiencies are repaired.",
                None,
            ),
            _ => Vec::new(),
        },
    },
    Rule {
        name: "pressure_above_rating_possible",
        decision: Decision::Restricted,
        applies: |f, units| exceeding(f, false, units),
    },
    Rule {
        name: "holding_circuit_leak",
        decision: Decision::Restricted,
        applies: |f, _| match f.diagnosis {
            Some(Diagnosis::HoldingCircuitLeak) => one(
                "Oil is leaving the holding end (valve, load-holding valve, fittings or hoses): the load keeps moving for as long as the leak lasts.",
                Some(SUPPORT),
            ),
            _ => Vec::new(),
        },
    },
    Rule {
        name: "cause_not_known",
        decision: Decision::Restricted,
        applies: |f, _| match f.diagnosis {
            Some(Diagnosis::Inconclusive) => one(
                "The readings do not tell a piston seal bypass from a leak in the holding circuit: repeat the test with gauges on both ports and both ports blocked.",
                Some(SUPPORT),
            ),
            _ => Vec::new(),
        },
    },
    Rule {
        name: "settles_as_oil_cools",
        decision: Decision::Restricted,
        applies: |f, _| match f.diagnosis {
            Some(Diagnosis::ThermalContraction) => one(
                "The load settled as the oil cooled; it keeps settling while the oil cools further.",
                Some("Support a held load mechanically before anyone works beneath it."),
            ),
            _ => Vec::new(),
        },
    },
    Rule {
        name: "inspection_deficiencies",
        decision: Decision::Restricted,
        applies: |f, _| match f.inspection {
            Some(InspectionResult::PassWithDeficiencies) => one(
                "The inspection passed with deficiencies.",
                Some(
                    "Correct the deficiencies recorded with the inspection; until then work only as they allow.",
                ),
            ),
            _ => Vec::new(),
        },
    },
];

/// Applies [`RULES`] to `findings`: every row that applies gives its reasons; the decision is
/// the most severe of those rows, `fit_for_service` (with one reason saying so) when none does.
/// `units` chooses the units written into the reasons.
pub fn decide(findings: &Findings, units: UnitSystem) -> Ruling {
    let mut reasons = Vec::new();
    for rule in RULES {
        for (text, restriction) in (rule.applies)(findings, units) {
            reasons.push(Reason {
                rule: rule.name,
                decision: rule.decision,
                text,
                restriction,
            });
        }
    }
    reasons.sort_by_key(|r| std::cmp::Reverse(r.decision));
    let decision = reasons
        .iter()
        .map(|r| r.decision)
        .max()
        .unwrap_or(Decision::FitForService);
    if reasons.is_empty() {
        reasons.push(Reason {
            rule: "nothing_found",
            decision: Decision::FitForService,
            text: "No finding of this record restricts the machine.".into(),
            restriction: None,
        });
    }
    Ruling { decision, reasons }
}
