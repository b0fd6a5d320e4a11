//! The engineering core's reports as the JSON of the calculation API. Every quantity is
//! `{"si", "value", "unit"}` in the request's unit system (DESIGN.md "API conventions").

use crate::calc::CALC_VERSION;
use crate::calc::analysis::{CylinderInput, CylinderReport};
use crate::calc::bypass::Outcome;
use crate::calc::decay::DecayReport;
use crate::calc::drift::DriftReport;
use crate::calc::quantity::{self, Dimension as D, UnitSystem};
use serde_json::{Value, json};

fn q(si: f64, dimension: D, units: UnitSystem) -> Value {
    json!(quantity::show(si, dimension, units))
}

fn oq(si: Option<f64>, dimension: D, units: UnitSystem) -> Value {
    si.map_or(Value::Null, |v| q(v, dimension, units))
}

/// The answer of `POST /api/v1/calc/cylinder`.
pub fn cylinder_response(input: &CylinderInput, r: &CylinderReport, units: UnitSystem) -> Value {
    let p = |si: f64| q(si, D::Pressure, units);
    let b = &r.seal_bypass;
    let explanation = match b.outcome {
        Outcome::Intensifies => {
            "With both ports blocked and oil crossing the piston, both ends rise to the load over the rod area; the load settles by the settle drift and stops."
        }
        Outcome::RunsAway => {
            "With oil crossing the piston, no pressure can hold a load that pulls the rod out: the cylinder runs out and both ends fall below atmospheric pressure (cavitation). There is no final pressure."
        }
    };
    json!({
        "calc_version": CALC_VERSION,
        "units": units.as_str(),
        "load_direction": input.load_direction.as_str(),
        "position": q(r.position, D::Length, units),
        "areas": {
            "cap": q(r.areas.cap, D::Area, units),
            "rod": q(r.areas.rod, D::Area, units),
            "annulus": q(r.areas.annulus, D::Area, units),
            "ratio": r.areas.ratio,
        },
        "volumes": {
            "cap": q(r.volumes.cap, D::Volume, units),
            "rod": q(r.volumes.rod, D::Volume, units),
        },
        "holding": {
            "holding_end": input.load_direction.holding_end().as_str(),
            "cap_pressure": p(r.holding.cap_pressure),
            "rod_pressure": p(r.holding.rod_pressure),
        },
        "seal_bypass": {
            "outcome": b.outcome.as_str(),
            "final_pressure": oq(b.final_pressure, D::Pressure, units),
            "intensification_factor": b.intensification_factor,
            "settle_drift": oq(b.settle_drift, D::Length, units),
            "explanation": explanation,
        },
        "rod_side_intensification": match (r.rod_side_intensification, input.supply_pressure) {
            (Some(rod), Some(supply)) => json!({"supply_pressure": p(supply), "rod_pressure": p(rod)}),
            _ => Value::Null,
        },
        "speeds": r.speeds.map_or(Value::Null, |s| json!({
            "extend": q(s.extend, D::Speed, units),
            "retract": q(s.retract, D::Speed, units),
            "regenerative_extend": q(s.regenerative_extend, D::Speed, units),
            "retract_return_flow": q(s.retract_return_flow, D::Flow, units),
            "extend_return_flow": q(s.extend_return_flow, D::Flow, units),
        })),
        "forces": r.forces.map_or(Value::Null, |f| json!({
            "extend": q(f.extend, D::Force, units),
            "retract": q(f.retract, D::Force, units),
            "regenerative_extend": q(f.regenerative_extend, D::Force, units),
        })),
        "counterbalance": {
            "setting": p(r.counterbalance.setting),
            "load_pressure": p(r.counterbalance.load_pressure),
            "pilot_ratio": r.counterbalance.pilot_ratio,
            "pilot_opening_pressure": oq(r.counterbalance.pilot_opening_pressure, D::Pressure, units),
        },
        "trapped_oil_heating": {
            "temperature_rise": q(r.heating.temperature_rise, D::TemperatureChange, units),
            "cap_rise": p(r.heating.cap_rise),
            "rod_rise": p(r.heating.rod_rise),
            "cap_pressure": p(r.heating.cap_pressure),
            "rod_pressure": p(r.heating.rod_pressure),
        },
        "tube": r.tube.map_or(Value::Null, |t| json!({
            "pressure": p(t.pressure),
            "hoop_stress": p(t.hoop_stress),
            "yield_strength": p(t.yield_strength),
            "safety_factor": t.safety_factor,
            "allowable_stress": p(t.allowable_stress),
            "utilisation": t.utilisation,
            "status": t.status.as_str(),
        })),
        "buckling": r.buckling.map_or(Value::Null, |k| json!({
            "end_condition": k.end_condition.as_str(),
            "effective_length_factor": k.end_condition.factor(),
            "length": q(k.length, D::Length, units),
            "critical_load": q(k.critical_load, D::Force, units),
            "safety_factor": k.safety_factor,
            "allowable_load": q(k.allowable_load, D::Force, units),
            "load": q(k.load, D::Force, units),
            "status": k.status.as_str(),
        })),
        "highest_pressure": p(r.highest_pressure),
        "checks": r.checks.iter().map(|c| json!({
            "component": c.component,
            "scenario": c.scenario,
            "pressure": p(c.pressure),
            "rating": p(c.rating),
            "status": c.status.as_str(),
        })).collect::<Vec<_>>(),
        "hazards": r.hazards,
        "cautions": r.cautions,
    })
}

/// The answer of `POST /api/v1/calc/drift-test`, also stored as a drift test's `analysis`.
pub fn drift_response(r: &DriftReport, units: UnitSystem) -> Value {
    let len = |si: f64| q(si, D::Length, units);
    json!({
        "calc_version": CALC_VERSION,
        "units": units.as_str(),
        "drift": len(r.drift),
        "duration": q(r.duration, D::Time, units),
        "temperature_change": q(r.temperature_change, D::TemperatureChange, units),
        "position": len(r.position),
        "drift_rate": q(r.drift_rate, D::Speed, units),
        "thermal_drift": len(r.thermal_drift),
        "leak_drift": len(r.leak_drift),
        "leak_flow": q(r.leak_flow, D::Flow, units),
        "scaled_drift": len(r.scaled_drift),
        "scaled_leak_drift": len(r.scaled_leak_drift),
        "scaled_per": q(r.scaled_per, D::Time, units),
        "limit": r.limit.map_or(Value::Null, |l| json!({
            "distance": len(l.distance),
            "per": q(l.per, D::Time, units),
        })),
        "verdict": r.verdict.as_str(),
        "diagnosis": r.diagnosis.as_str(),
        "reasoning": r.reasoning,
        "hazards": r.hazards,
        "cautions": r.cautions,
    })
}

/// The answer of `POST /api/v1/calc/pressure-decay`.
pub fn decay_response(r: &DecayReport, units: UnitSystem) -> Value {
    let p = |si: f64| q(si, D::Pressure, units);
    json!({
        "calc_version": CALC_VERSION,
        "units": units.as_str(),
        "pressurised_end": r.pressurised_end.as_str(),
        "duration": q(r.duration, D::Time, units),
        "temperature_change": q(r.temperature_change, D::TemperatureChange, units),
        "oil_volume": q(r.oil_volume, D::Volume, units),
        "measured_change": p(r.measured_change),
        "thermal_change": p(r.thermal_change),
        "leak_change": p(r.leak_change),
        "leak_flow": q(r.leak_flow, D::Flow, units),
        "scaled_drop": p(r.scaled_drop),
        "limit": r.limit.map_or(Value::Null, |l| json!({
            "pressure": p(l.pressure),
            "per": q(l.per, D::Time, units),
        })),
        "verdict": r.verdict.as_str(),
        "diagnosis": r.diagnosis.as_str(),
        "reasoning": r.reasoning,
        "hazards": r.hazards,
        "cautions": r.cautions,
    })
}
