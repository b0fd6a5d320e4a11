//! The cylinder's safety panel: a registry cylinder, its machine's relief setting and its
//! hoses turned into the engineering core's input, and the core's report turned into words
//! for the page. No formulas here: every figure comes from `calc::analysis::analyse`.

use crate::calc::analysis::{self, CylinderInput, CylinderReport};
use crate::calc::bypass::{Outcome, TubeWall};
use crate::calc::cylinder::{Cylinder as Geometry, End, LoadDirection};
use crate::calc::quantity::{Dimension, UnitSystem};
use crate::calc::ratings::{Exposure, Rating, Status};
use crate::calc::strength::EndCondition;
use crate::db::cylinders::Cylinder;
use crate::db::hoses::Hose;
use crate::pages::view::q;

/// Where the load figure came from.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum LoadSource {
    Recorded,
    FromHoldingPressure,
    Unknown,
}

/// The held load used by the panel, N, and where it came from: the recorded highest load,
/// else the recorded holding pressure times the holding end's area, else none.
pub fn held_load(c: &Cylinder, geometry: &Geometry) -> (f64, LoadSource) {
    let direction = LoadDirection::parse(&c.load_direction).unwrap_or(LoadDirection::Retract);
    match (c.max_load_n, c.holding_pressure_pa) {
        (Some(load), _) => (load, LoadSource::Recorded),
        (None, Some(p)) => (
            p * geometry.area(direction.holding_end()),
            LoadSource::FromHoldingPressure,
        ),
        (None, None) => (0.0, LoadSource::Unknown),
    }
}

/// A hose's name in the panel: `H17 (cap port, SAE 100R2AT -8)`.
pub fn hose_label(h: &Hose) -> String {
    let mut parts = vec![h.place()];
    if let Some(spec) = &h.spec {
        parts.push(spec.clone());
    }
    if let Some(size) = &h.size {
        parts.push(size.clone());
    }
    format!("H{} ({})", h.id, parts.join(", "))
}

/// The engineering core's input for a registry cylinder: geometry, held load, the machine's
/// relief setting as supply pressure, tube wall and yield, rod end condition, and ratings
/// (the cylinder's on both ends; each rated hose fitted to it on its port's end).
pub fn input(c: &Cylinder, hoses: &[&Hose]) -> Result<(CylinderInput, LoadSource), String> {
    let geometry = Geometry::new(c.bore_m, c.rod_m, c.stroke_m).map_err(|e| e.message)?;
    let direction = LoadDirection::parse(&c.load_direction).unwrap_or(LoadDirection::Retract);
    let (load, source) = held_load(c, &geometry);
    let mut input = CylinderInput::new(geometry, load, direction);
    input.supply_pressure = c.machine_relief_pressure_pa;
    input.trapped.tube = c.tube_outside_diameter_m.map(TubeWall::steel);
    input.tube_yield = c.tube_outside_diameter_m.and(c.tube_yield_pa);
    if let Some(condition) = c.end_condition.as_deref().and_then(EndCondition::parse) {
        input.buckling.end_condition = condition;
    }
    if let Some(rating) = c.rated_pressure_pa {
        input.ratings.push(Rating {
            component: "cylinder".into(),
            exposure: Exposure::Both,
            rating,
        });
    }
    for hose in hoses {
        if let (Some(rating), Some(port)) = (hose.working_pressure_pa, hose.port.as_deref()) {
            let end = if port == "rod" { End::Rod } else { End::Cap };
            input.ratings.push(Rating {
                component: hose_label(hose),
                exposure: Exposure::from(end),
                rating,
            });
        }
    }
    Ok((input, source))
}

/// One cell of the ratings table: the pressure a scenario puts on a component, and its status.
#[derive(Clone, Debug)]
pub struct Cell {
    /// The scenario's heading (for the narrow-screen layout).
    pub heading: &'static str,
    pub pressure: String,
    pub status: &'static str,
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
    pub holding_end: &'static str,
    pub holding_pressure: String,
    pub runs_away: bool,
    pub bypass_pressure: String,
    pub bypass_factor: String,
    pub relief: String,
    pub rod_side: String,
    pub scenarios: Vec<&'static str>,
    pub rows: Vec<Row>,
    pub unrated: Vec<String>,
    pub tube: String,
    pub buckling: String,
    pub hazards: Vec<String>,
    pub cautions: Vec<&'static str>,
    /// `ok`, `low_margin` or `exceeds`: the worst status of any check.
    pub worst: &'static str,
}

fn worst(report: &CylinderReport) -> Status {
    let mut statuses: Vec<Status> = report.checks.iter().map(|c| c.status).collect();
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

/// Runs the engineering core for a registry cylinder. Rod buckling is kept only when the
/// cylinder's mounting (end condition) is recorded: without it the core's default (pinned at
/// both ends, free length twice the stroke) is a guess, and a guessed alarm on every long
/// cylinder would teach people to ignore the real ones.
pub fn analyse(
    c: &Cylinder,
    hoses: &[&Hose],
    units: UnitSystem,
) -> Result<(CylinderInput, LoadSource, CylinderReport), String> {
    let (input, source) = input(c, hoses)?;
    let mut report =
        analysis::analyse(&input, units).map_err(|e| format!("{}: {}", e.field, e.message))?;
    if c.end_condition.is_none() && report.buckling.take().is_some() {
        let words = buckling_hazard_start();
        report.hazards.retain(|h| !h.starts_with(words));
    }
    Ok((input, source, report))
}

/// How the core's buckling hazard sentence begins (see `calc::analysis`).
fn buckling_hazard_start() -> &'static str {
    "Rod: the compressive load"
}

/// The worst status of a cylinder's checks (`ok`, `low_margin`, `exceeds`), or `unknown` when
/// the figures cannot be made.
pub fn worst_status(c: &Cylinder, hoses: &[&Hose]) -> &'static str {
    match analyse(c, hoses, UnitSystem::Metric) {
        Ok((_, _, report)) => worst(&report).as_str(),
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
    let rows = input
        .ratings
        .iter()
        .map(|rating| Row {
            component: analysis::component_words(&rating.component),
            rating: p(rating.rating),
            cells: report
                .checks
                .iter()
                .filter(|check| check.component == rating.component)
                .map(|check| Cell {
                    heading: scenario_heading(check.scenario),
                    pressure: p(check.pressure),
                    status: check.status.as_str(),
                })
                .collect(),
        })
        .collect();
    let unrated = hoses
        .iter()
        .filter(|h| h.working_pressure_pa.is_none() && h.port.is_some())
        .map(|h| hose_label(h))
        .collect();
    Panel {
        error: None,
        load: q(Some(input.load), Dimension::Force, units),
        load_source: match source {
            LoadSource::Recorded => "recorded highest load",
            LoadSource::FromHoldingPressure => "from the recorded holding pressure",
            LoadSource::Unknown => "not recorded",
        },
        holding_end: end.as_str(),
        holding_pressure: p(report.holding.at(end)),
        runs_away: report.seal_bypass.outcome == Outcome::RunsAway,
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
        unrated,
        tube: report
            .tube
            .map(|t| {
                format!(
                    "hoop stress at the bore {} at {}, allowable {} (yield over {})",
                    crate::pages::forms::stress_text(t.hoop_stress, units),
                    p(t.pressure),
                    crate::pages::forms::stress_text(t.allowable_stress, units),
                    t.safety_factor
                )
            })
            .unwrap_or_default(),
        buckling: report
            .buckling
            .map(|b| {
                format!(
                    "{} against an allowable {} (Euler, K = {}, free length {}, factor {})",
                    q(Some(b.load), Dimension::Force, units),
                    q(Some(b.allowable_load), Dimension::Force, units),
                    b.end_condition.factor(),
                    q(Some(b.length), Dimension::Length, units),
                    b.safety_factor
                )
            })
            .unwrap_or_else(|| {
                if c.end_condition.is_none() {
                    "not checked: record the mounting (end condition) to check it".into()
                } else {
                    String::new()
                }
            }),
        hazards: report.hazards.clone(),
        cautions: report.cautions.clone(),
        worst: worst(&report).as_str(),
    }
}

/// A scenario's name for a table heading.
pub fn scenario_heading(name: &str) -> &'static str {
    match name {
        analysis::NORMAL_HOLDING => "Normal holding",
        analysis::SEAL_BYPASS => "Piston seal bypass",
        analysis::ROD_SIDE_INTENSIFICATION => "Rod side at relief setting",
        analysis::TRAPPED_OIL_HEATING => "Trapped oil warming",
        _ => "Scenario",
    }
}
