//! The engineering core's drift and pressure-decay reports as the JSON of the calculation API. Every quantity is
//! `{"si", "value", "unit"}` in the request's unit system (DESIGN.md "API conventions").

use crate::calc::CALC_VERSION;
use crate::calc::decay::DecayReport;
use crate::calc::drift::DriftReport;
use crate::calc::quantity::{self, Dimension as D, UnitSystem};
use serde_json::{Value, json};

fn q(si: f64, dimension: D, units: UnitSystem) -> Value {
    json!(quantity::show(si, dimension, units))
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
        "thermal_cap_change": q(r.thermal_cap_change, D::Pressure, units),
        "thermal_rod_change": q(r.thermal_rod_change, D::Pressure, units),
        "other_end": {
            "state": if r.other_end.open { "open_to_tank" } else { "blocked" },
            "basis": r.other_end.basis.as_str(),
        },
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
