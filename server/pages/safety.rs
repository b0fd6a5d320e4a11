//! The cylinder's safety panel: a registry cylinder, its machine's relief setting and its
//! hoses turned into the engineering core's input, and the core's report turned into words
//! for the page. No formulas here: every figure comes from `calc::analysis::analyse`.

use crate::calc::analysis::{self, CylinderInput, CylinderReport};
use crate::calc::buckling::{BucklingReport, Range};
use crate::calc::bypass::Outcome;
use crate::calc::installed::LoadSource;
use crate::calc::quantity::{Dimension, UnitSystem};
use crate::calc::ratings::{Exposure, Status};
use crate::calc::{limits, worst_load};
use crate::db::cylinders::Cylinder;
use crate::db::hoses::Hose;
use crate::pages::view::q;

pub use crate::db::installed::{hose_label, installed, rated_lines};

/// The engineering core's input for a registry cylinder ([`crate::calc::installed::Installed::input`]).
pub fn input(c: &Cylinder, hoses: &[&Hose]) -> Result<(CylinderInput, LoadSource), String> {
    installed(c)
        .input(&rated_lines(hoses))
        .map_err(|e| e.message)
}

/// One cell of the ratings table: the pressure a scenario puts on a component, and its status.
#[derive(Clone, Debug)]
pub struct Cell {
    /// The scenario's heading (for the narrow-screen layout).
    pub heading: &'static str,
    pub pressure: String,
    pub status: &'static str,
    /// The load behind the pressure (the worst of the recorded range).
    pub load: String,
}

/// One rated component and what each scenario puts on it.
#[derive(Clone, Debug)]
pub struct Row {
    pub component: String,
    pub rating: String,
    pub cells: Vec<Cell>,
}

/// Everything the cylinder page shows in its safety panel, as words and figures.
#[derive(Clone, Debug, Default)]
pub struct Panel {
    /// Why no figures could be made, if so.
    pub error: Option<String>,
    pub load: String,
    pub load_source: &'static str,
    /// The lowest load of the range and where it came from.
    pub min_load: String,
    pub rod_side_load: String,
    pub holding_end: &'static str,
    pub holding_pressure: String,
    pub runs_away: bool,
    pub bypass_pressure: String,
    pub bypass_factor: String,
    /// What the valves or the stroke end make of a bypass (rests on its stop, sinks to tank,
    /// creeps through a relieving valve), else empty.
    pub bypass_note: &'static str,
    pub relief: String,
    pub rod_side: String,
    pub scenarios: Vec<&'static str>,
    pub rows: Vec<Row>,
    /// True when no rating at all is recorded (the rows then hold the relief setting only).
    pub no_ratings: bool,
    pub unrated: Vec<String>,
    pub tube: String,
    pub buckling: String,
    pub hazards: Vec<String>,
    /// What cannot be checked (an end with no rating), in words.
    pub unchecked: Vec<String>,
    pub cautions: Vec<&'static str>,
    /// `ok`, `low_margin` or `exceeds`: the worst status of any check.
    pub worst: &'static str,
    /// The decision the figures alone call for (`calc::decision`), first on the page.
    pub decision: &'static str,
    pub decision_words: &'static str,
    pub restrictions: Vec<String>,
    /// Each scenario's pressure against each rating, as a chart.
    pub chart: super::pressure_chart::PressureChart,
}

/// The worst status of the checks that decide it ([`limits::decides_status`]: a
/// relief-setting check counts only on an end with no rating), the tube and the rod.
fn worst(input: &CylinderInput, report: &CylinderReport) -> Status {
    let mut statuses: Vec<Status> = report
        .checks
        .iter()
        .filter(|c| limits::decides_status(c, &input.ratings))
        .map(|c| c.status)
        .collect();
    statuses.extend(report.tube.map(|t| t.status));
    statuses.extend(report.buckling.map(|b| b.status));
    if statuses.contains(&Status::Exceeds) {
        Status::Exceeds
    } else if statuses.contains(&Status::LowMargin) {
        Status::LowMargin
    } else {
        Status::Ok
    }
}

/// Runs the engineering core for a registry cylinder ([`crate::db::installed::analyse`]).
/// Rod buckling is checked only when the cylinder's mounting (end condition) is recorded
/// ([`crate::calc::installed::Installed::input`]).
pub fn analyse(
    c: &Cylinder,
    hoses: &[&Hose],
    units: UnitSystem,
) -> Result<(CylinderInput, LoadSource, CylinderReport), String> {
    crate::db::installed::analyse(c, hoses, units)
}

/// The worst status of a cylinder's checks (`ok`, `low_margin`, `exceeds`), or `unknown` when
/// the figures cannot be made.
pub fn worst_status(c: &Cylinder, hoses: &[&Hose]) -> &'static str {
    match analyse(c, hoses, UnitSystem::Metric) {
        Ok((input, _, report)) => worst(&input, &report).as_str(),
        Err(_) => "unknown",
    }
}

/// The panel for a cylinder and the hoses fitted to it, in `units`.
pub fn panel(c: &Cylinder, hoses: &[&Hose], units: UnitSystem) -> Panel {
    let p = |si: f64| q(Some(si), Dimension::Pressure, units);
    let (input, source, report) = match analyse(c, hoses, units) {
        Ok(ok) => ok,
        Err(message) => {
            return Panel {
                error: Some(message),
                worst: "unknown",
                ..Panel::default()
            };
        }
    };
    let end = input.load_direction.holding_end();
    let scenarios: Vec<&'static str> = report.scenarios.iter().map(|s| s.name).collect();
    let force = |si: f64| q(Some(si), Dimension::Force, units);
    let cells = |component: &str, exposure: Exposure| -> Vec<Cell> {
        report
            .checks
            .iter()
            .filter(|check| check.component == component && check.exposure == exposure)
            .map(|check| Cell {
                heading: scenario_heading(check.scenario),
                pressure: p(check.pressure),
                status: check.status.as_str(),
                load: force(check.load),
            })
            .collect()
    };
    let mut rows: Vec<Row> = input
        .ratings
        .iter()
        .map(|rating| Row {
            component: analysis::component_words(&rating.component),
            rating: p(rating.rating),
            cells: cells(&rating.component, rating.exposure),
        })
        .collect();
    if let Some(relief) = input.supply_pressure {
        for (exposure, words) in [
            (Exposure::Cap, "Relief setting, cap end"),
            (Exposure::Rod, "Relief setting, rod end"),
        ] {
            rows.push(Row {
                component: words.into(),
                rating: p(relief),
                cells: cells(limits::RELIEF_SETTING, exposure),
            });
        }
    }
    let (light, _) = worst_load::range(&input);
    let rod_side_load = worst_load::find(&report.scenarios, analysis::ROD_SIDE_INTENSIFICATION)
        .map(|s| force(s.rod_load))
        .unwrap_or_default();
    let unrated = hoses
        .iter()
        .filter(|h| h.working_pressure_pa.is_none() && h.port.is_some())
        .map(|h| hose_label(h))
        .collect();
    let ruling =
        crate::calc::decision::decide(&crate::calc::decision_findings::standing(&report), units);
    Panel {
        decision: ruling.decision.as_str(),
        decision_words: ruling.decision.words(),
        restrictions: ruling.restrictions(),
        chart: super::pressure_chart::chart(&input, &report, units),
        error: None,
        load: q(Some(input.load), Dimension::Force, units),
        load_source: match source {
            LoadSource::Recorded => "recorded highest load",
            LoadSource::FromHoldingPressure => "from the recorded holding pressure",
            LoadSource::Unknown => "not recorded",
        },
        min_load: format!(
            "{} ({})",
            force(light),
            if c.min_load_n.is_some() {
                "recorded lowest load"
            } else {
                "no lowest load recorded: none"
            }
        ),
        rod_side_load,
        holding_end: end.as_str(),
        holding_pressure: p(report.holding.at(end)),
        runs_away: report.seal_bypass.outcome == Outcome::RunsAway,
        bypass_note: match report.seal_bypass.outcome {
            Outcome::RestsOnStop | Outcome::Sinks | Outcome::Creeps => {
                report.seal_bypass.outcome.explanation()
            }
            Outcome::Intensifies | Outcome::RunsAway => "",
        },
        bypass_pressure: report.seal_bypass.final_pressure.map(p).unwrap_or_default(),
        bypass_factor: report
            .seal_bypass
            .intensification_factor
            .map(|f| format!("{f:.2}"))
            .unwrap_or_default(),
        relief: input.supply_pressure.map(p).unwrap_or_default(),
        rod_side: report.rod_side_intensification.map(p).unwrap_or_default(),
        scenarios,
        rows,
        no_ratings: input.ratings.is_empty(),
        unrated,
        tube: report
            .tube
            .map(|t| {
                format!(
                    "equivalent stress at the bore (Tresca) {} at {} (hoop stress {}), allowable {} (yield over {})",
                    crate::pages::forms::stress_text(t.equivalent_stress, units),
                    p(t.pressure),
                    crate::pages::forms::stress_text(t.hoop_stress, units),
                    crate::pages::forms::stress_text(t.allowable_stress, units),
                    t.safety_factor
                )
            })
            .unwrap_or_default(),
        buckling: report
            .buckling
            .map(|b| buckling_words(&b, units))
            .unwrap_or_else(|| {
                if c.end_condition.is_none() {
                    "not checked: record the mounting (end condition) to check it".into()
                } else {
                    String::new()
                }
            }),
        hazards: report.hazards.clone(),
        unchecked: report.notes.clone(),
        cautions: report.cautions.clone(),
        worst: worst(&input, &report).as_str(),
    }
}

/// The rod buckling line of the panel: the load against the lowest allowable, with Euler
/// (theoretical factor), the design factor's figure and its range, and the free length
/// (said as assumed when it is the default).
fn buckling_words(b: &BucklingReport, units: UnitSystem) -> String {
    let f = |si: f64| q(Some(si), Dimension::Force, units);
    let e = &b.euler;
    let d = &b.design;
    format!(
        "{} against an allowable {} (the lowest of: Euler with K = {}, {}; {} with the design factor K = {}, slenderness {:.0}, {}), factor {}; free length {}{}; rod yield {}{}",
        f(e.load),
        f(b.governing_allowable_load),
        e.end_condition.factor(),
        f(e.allowable_load),
        if d.range == Range::Inelastic {
            "Johnson"
        } else {
            "Euler"
        },
        d.effective_length_factor,
        d.slenderness,
        f(d.allowable_load),
        e.safety_factor,
        q(Some(e.length), Dimension::Length, units),
        if b.length_assumed {
            " (assumed: twice the stroke; record the free length)"
        } else {
            ""
        },
        crate::pages::forms::stress_text(b.yield_strength, units),
        if b.yield_assumed {
            " (assumed, erring low; record the rod's yield strength)"
        } else {
            ""
        },
    )
}

/// A scenario's name for a table heading.
pub fn scenario_heading(name: &str) -> &'static str {
    match name {
        analysis::NORMAL_HOLDING => "Normal holding",
        analysis::SEAL_BYPASS => "Piston seal bypass",
        analysis::ROD_SIDE_INTENSIFICATION => "Rod side at relief setting",
        analysis::TRAPPED_OIL_HEATING => "Trapped oil warming",
        analysis::SEAL_BYPASS_WARMING => "Seal bypass while warming",
        _ => "Scenario",
    }
}
