//! View structs of the calculator page: the form's inputs and the reports as words and
//! figures in the chosen units. No formulas here: every figure comes from `calc`.

use crate::calc::analysis::{CylinderInput, CylinderReport, component_words, scenario_words};
use crate::calc::decay::DecayReport;
use crate::calc::drift::DriftReport;
use crate::calc::limits;
use crate::calc::quantity::{self, Dimension as D, UnitSystem};
use crate::calc::ratings::Exposure;
use crate::calc::words;

/// A figure with its label.
#[derive(Clone, Debug)]
pub struct Row {
    pub label: String,
    pub value: String,
}

fn row(label: &str, value: String) -> Row {
    Row {
        label: label.to_string(),
        value,
    }
}

/// One ratings check.
#[derive(Clone, Debug)]
pub struct CheckView {
    pub component: String,
    /// The scenario and the load behind its pressure.
    pub scenario: String,
    pub pressure: String,
    pub rating: String,
    pub status: &'static str,
}

/// The cylinder report for the page.
#[derive(Clone, Debug)]
pub struct CylinderView {
    pub geometry: Vec<Row>,
    pub holding: Vec<Row>,
    pub bypass_outcome: &'static str,
    pub bypass_explanation: &'static str,
    pub bypass: Vec<Row>,
    pub circuit: Vec<Row>,
    pub strength: Vec<Row>,
    pub checks: Vec<CheckView>,
    pub hazards: Vec<String>,
    /// What cannot be checked (an end with no rating).
    pub notes: Vec<String>,
    pub cautions: Vec<String>,
}

fn ratio(v: f64) -> String {
    quantity::significant(v, 4)
}

/// The cylinder report in words and figures.
pub fn cylinder(input: &CylinderInput, r: &CylinderReport, units: UnitSystem) -> CylinderView {
    let p = |si: f64| words::q(si, D::Pressure, units);
    let len = |si: f64| words::q(si, D::Length, units);
    let area = |si: f64| words::q(si, D::Area, units);
    let b = &r.seal_bypass;
    let mut bypass = Vec::new();
    if let (Some(fp), Some(f), Some(s)) =
        (b.final_pressure, b.intensification_factor, b.settle_drift)
    {
        bypass.push(row("Pressure in both ends", p(fp)));
        bypass.push(row("Times the holding pressure", ratio(f)));
        bypass.push(row("Settle drift before it stops", len(s)));
    }
    let mut circuit = Vec::new();
    if let Some(rod) = r.rod_side_intensification {
        circuit.push(row(
            "Rod-end pressure, rod port blocked, cap end at supply",
            p(rod),
        ));
    }
    if let Some(s) = r.speeds {
        let v = |si: f64| words::q(si, D::Speed, units);
        let q = |si: f64| words::q(si, D::Flow, units);
        circuit.push(row("Extend speed", v(s.extend)));
        circuit.push(row("Retract speed", v(s.retract)));
        circuit.push(row("Regenerative extend speed", v(s.regenerative_extend)));
        circuit.push(row(
            "Flow out of the cap end while retracting",
            q(s.retract_return_flow),
        ));
    }
    if let Some(f) = r.forces {
        circuit.push(row(
            "Regenerative extend force",
            words::q(f.regenerative_extend, D::Force, units),
        ));
    }
    let cb = &r.counterbalance;
    circuit.push(row(
        "Counterbalance valve setting (1.3 x load pressure)",
        p(cb.setting),
    ));
    if let (Some(ratio_), Some(pilot)) = (cb.pilot_ratio, cb.pilot_opening_pressure) {
        circuit.push(row(
            &format!("Pilot pressure to open it at {ratio_}:1"),
            p(pilot),
        ));
    }
    circuit.push(row(
        &format!(
            "Trapped oil warmed {}: cap end / rod end",
            words::q(r.heating.temperature_rise, D::TemperatureChange, units)
        ),
        format!(
            "{} / {}",
            p(r.heating.cap_pressure),
            p(r.heating.rod_pressure)
        ),
    ));
    let mut strength = Vec::new();
    if let Some(t) = r.tube {
        strength.push(row(
            "Tube hoop stress at the bore (Lamé), at the highest pressure",
            p(t.hoop_stress),
        ));
        strength.push(row("Tube stress checked (Tresca)", p(t.equivalent_stress)));
        strength.push(row(
            "Allowable (yield over safety factor)",
            format!(
                "{} ({})",
                p(t.allowable_stress),
                t.status.as_str().replace('_', " ")
            ),
        ));
    }
    if let Some(b) = r.buckling {
        let f = |si: f64| words::q(si, D::Force, units);
        let k = b.euler;
        strength.push(row(
            &format!("Rod buckling (Euler, K = {})", k.end_condition.factor()),
            format!(
                "{} at a free length of {}{}",
                f(k.critical_load),
                len(k.length),
                if b.length_assumed {
                    " (assumed: twice the stroke)"
                } else {
                    ""
                }
            ),
        ));
        for (label, figure) in [("theory", b.theoretical), ("design", b.design)] {
            strength.push(row(
                &format!(
                    "Rod buckling ({label}, K = {})",
                    figure.effective_length_factor
                ),
                format!(
                    "{} ({}, slenderness {:.0}, {} range)",
                    f(figure.critical_load),
                    figure.range.method(),
                    figure.slenderness,
                    figure.range.as_str()
                ),
            ));
        }
        strength.push(row(
            "Rod allowable (the lowest)",
            format!(
                "{} against {} ({})",
                f(b.governing_allowable_load),
                f(k.load),
                b.status.as_str().replace('_', " ")
            ),
        ));
    }
    CylinderView {
        geometry: vec![
            row("Cap (piston) area", area(r.areas.cap)),
            row("Rod area", area(r.areas.rod)),
            row("Annulus area", area(r.areas.annulus)),
            row("Area ratio (cap / annulus)", ratio(r.areas.ratio)),
            row("Position used", len(r.position)),
        ],
        holding: vec![
            row(
                "Holding end",
                input.load_direction.holding_end().as_str().to_string(),
            ),
            row("Cap-end pressure", p(r.holding.cap_pressure)),
            row("Rod-end pressure", p(r.holding.rod_pressure)),
        ],
        bypass_outcome: b.outcome.as_str(),
        bypass_explanation: b.outcome.explanation(),
        bypass,
        circuit,
        strength,
        checks: r
            .checks
            .iter()
            .map(|c| CheckView {
                component: match (c.component.as_str(), c.exposure) {
                    (limits::RELIEF_SETTING, Exposure::Cap) => "Relief setting, cap end".into(),
                    (limits::RELIEF_SETTING, _) => "Relief setting, rod end".into(),
                    _ => component_words(&c.component),
                },
                scenario: format!(
                    "{} (at a load of {})",
                    scenario_words(c.scenario),
                    words::q(c.load, D::Force, units)
                ),
                pressure: p(c.pressure),
                rating: p(c.rating),
                status: c.status.as_str(),
            })
            .collect(),
        hazards: r.hazards.clone(),
        notes: r.notes.clone(),
        cautions: r.cautions.iter().map(|c| c.to_string()).collect(),
    }
}

/// A test analysis for the page.
#[derive(Clone, Debug)]
pub struct DriftView {
    pub rows: Vec<Row>,
    pub verdict: &'static str,
    pub diagnosis: &'static str,
    pub reasoning: Vec<String>,
    pub hazards: Vec<String>,
    pub cautions: Vec<String>,
}

pub type DecayView = DriftView;

/// The drift-test report in words and figures.
pub fn drift(r: &DriftReport, units: UnitSystem) -> DriftView {
    let len = |si: f64| words::q(si, D::Length, units);
    DriftView {
        rows: vec![
            row("Measured drift", len(r.drift)),
            row("Drift per minute", len(r.drift_rate * 60.0)),
            row(
                "Explained by the oil's temperature change",
                len(r.thermal_drift),
            ),
            row("Left for leakage", len(r.leak_drift)),
            row("Equivalent leakage", words::flow(r.leak_flow, units)),
            row(
                &format!("Drift scaled to {}", words::duration(r.scaled_per)),
                len(r.scaled_drift),
            ),
        ],
        verdict: r.verdict.as_str(),
        diagnosis: r.diagnosis.as_str(),
        reasoning: r.reasoning.clone(),
        hazards: r.hazards.clone(),
        cautions: r.cautions.iter().map(|c| c.to_string()).collect(),
    }
}

/// The pressure-decay report in words and figures.
pub fn decay(r: &DecayReport, units: UnitSystem) -> DecayView {
    let p = |si: f64| words::q(si, D::Pressure, units);
    DriftView {
        rows: vec![
            row("Measured change", p(r.measured_change)),
            row(
                "Explained by the oil's temperature change",
                p(r.thermal_change),
            ),
            row("Left for leakage", p(r.leak_change)),
            row("Equivalent leakage", words::flow(r.leak_flow, units)),
            row("Drop scaled to the limit's period", p(r.scaled_drop)),
        ],
        verdict: r.verdict.as_str(),
        diagnosis: r.diagnosis.as_str(),
        reasoning: r.reasoning.clone(),
        hazards: r.hazards.clone(),
        cautions: r.cautions.iter().map(|c| c.to_string()).collect(),
    }
}
