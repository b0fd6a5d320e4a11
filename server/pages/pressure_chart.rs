//! The cylinder page's chart: for each rated component, one bar per scenario (the pressure it
//! puts on the component) against a line at the component's rating. Status is written under
//! each bar as a word and a shape (circle ok, triangle low margin, square above), never by
//! colour alone; bars are numbered by scenario with a legend. Geometry only here; the names
//! are placed (and escaped) by the template `cylinders/chart.html`.

use crate::calc::analysis::{CylinderInput, CylinderReport, component_words};
use crate::calc::quantity::{Dimension, UnitSystem};
use crate::pages::safety::scenario_heading;
use crate::pages::view::q;

const PLOT_TOP: f64 = 24.0;
const PLOT_HEIGHT: f64 = 220.0;
const LEFT: f64 = 8.0;
const BAR: f64 = 26.0;
const GAP: f64 = 6.0;
const GROUP_GAP: f64 = 28.0;

/// One bar: its box, the scenario number, and its status in words and shape.
#[derive(Clone, Debug)]
pub struct Bar {
    pub x: String,
    pub y: String,
    pub w: String,
    pub h: String,
    /// Centre of the bar, for its labels.
    pub cx: String,
    pub number: usize,
    /// `ok`, `low_margin` or `exceeds`.
    pub status: &'static str,
    /// `●`, `▲` or `■`.
    pub shape: &'static str,
    pub title: String,
}

/// One rated component: its bars and its rating line.
#[derive(Clone, Debug)]
pub struct Group {
    pub x: String,
    pub x2: String,
    pub cx: String,
    pub rating_y: String,
    pub rating: String,
    pub name: String,
    /// The group's number for the legend under the chart.
    pub letter: char,
    pub bars: Vec<Bar>,
}

/// The whole chart.
#[derive(Clone, Debug, Default)]
pub struct PressureChart {
    pub width: String,
    pub height: String,
    pub baseline: String,
    pub groups: Vec<Group>,
    /// Scenario number and its name.
    pub legend: Vec<(usize, &'static str)>,
    pub highest: String,
}

fn n(v: f64) -> String {
    format!("{v:.1}")
}

fn shape(status: &str) -> &'static str {
    match status {
        "exceeds" => "■",
        "low_margin" => "▲",
        _ => "●",
    }
}

/// The chart of `report`'s checks for the ratings of `input`, pressures written in `units`.
/// Empty (no groups) when nothing is rated.
pub fn chart(input: &CylinderInput, report: &CylinderReport, units: UnitSystem) -> PressureChart {
    let p = |si: f64| q(Some(si), Dimension::Pressure, units);
    let top = report
        .checks
        .iter()
        .map(|k| k.pressure.max(k.rating))
        .fold(0.0, f64::max)
        * 1.1;
    if input.ratings.is_empty() || top <= 0.0 {
        return PressureChart::default();
    }
    let y_of = |pressure: f64| PLOT_TOP + PLOT_HEIGHT * (1.0 - (pressure.max(0.0) / top).min(1.0));
    let scenarios = report.scenarios.len();
    let group_width = scenarios as f64 * (BAR + GAP) - GAP;
    let mut groups = Vec::new();
    for (i, rating) in input.ratings.iter().enumerate() {
        let x0 = LEFT + i as f64 * (group_width + GROUP_GAP);
        let bars = report
            .checks
            .iter()
            .filter(|k| k.component == rating.component)
            .enumerate()
            .map(|(j, k)| {
                let x = x0 + j as f64 * (BAR + GAP);
                let y = y_of(k.pressure);
                let status = k.status.as_str();
                Bar {
                    x: n(x),
                    y: n(y),
                    w: n(BAR),
                    h: n(PLOT_TOP + PLOT_HEIGHT - y),
                    cx: n(x + BAR / 2.0),
                    number: j + 1,
                    status,
                    shape: shape(status),
                    title: format!(
                        "{}: {} of {} rating, {}",
                        scenario_heading(k.scenario),
                        p(k.pressure),
                        p(k.rating),
                        status.replace('_', " ")
                    ),
                }
            })
            .collect();
        groups.push(Group {
            x: n(x0 - 3.0),
            x2: n(x0 + group_width + 3.0),
            cx: n(x0 + group_width / 2.0),
            rating_y: n(y_of(rating.rating)),
            rating: p(rating.rating),
            name: component_words(&rating.component),
            letter: (b'A' + (i % 26) as u8) as char,
            bars,
        });
    }
    let width = LEFT * 2.0 + input.ratings.len() as f64 * (group_width + GROUP_GAP) - GROUP_GAP;
    PressureChart {
        width: n(width.max(200.0)),
        height: n(PLOT_TOP + PLOT_HEIGHT + 56.0),
        baseline: n(PLOT_TOP + PLOT_HEIGHT),
        groups,
        legend: report
            .scenarios
            .iter()
            .enumerate()
            .map(|(i, s)| (i + 1, scenario_heading(s.name)))
            .collect(),
        highest: p(report.highest_pressure),
    }
}
