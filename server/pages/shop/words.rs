//! Stored records and procedures put into words for the shop pages.

use crate::api::shop_input::flag_words;
use crate::calc::quantity::{Dimension, UnitSystem, significant};
use crate::db::procedures::Procedure;
use crate::pages::view::q;
use serde_json::Value;

/// A quantity from a stored analysis (`{"si", "value", "unit"}`) as text, e.g. `"3.2 mm"`.
pub fn shown(v: &Value) -> String {
    match (v["value"].as_f64(), v["unit"].as_str()) {
        (Some(value), Some(unit)) => format!("{} {}", significant(value, 4), unit_words(unit)),
        _ => "—".into(),
    }
}

/// A unit symbol as a page shows it (`degC` as `°C`).
pub fn unit_words(unit: &str) -> String {
    unit.replace("deg", "°")
}

/// An SI value as a page shows it in `units`, temperatures with their degree sign and whole
/// minutes or hours as such (`10 min`).
pub fn qd(si: Option<f64>, dimension: Dimension, units: UnitSystem) -> String {
    match (si, dimension) {
        (Some(s), Dimension::Time) => duration_words(s),
        _ => unit_words(&q(si, dimension, units)),
    }
}

/// A duration in words: `10 min`, `2 h`, `45 s`.
pub fn duration_words(s: f64) -> String {
    let whole = |n: f64| n.fract() == 0.0;
    if s >= 3600.0 && whole(s / 3600.0) {
        format!("{} h", s / 3600.0)
    } else if s >= 60.0 && whole(s / 60.0) {
        format!("{} min", s / 60.0)
    } else {
        format!("{} s", significant(s, 4))
    }
}

/// The texts of a list in a stored analysis.
pub fn texts(v: &Value) -> Vec<String> {
    v.as_array()
        .map(|a| {
            a.iter()
                .filter_map(|t| t.as_str().map(str::to_string))
                .collect()
        })
        .unwrap_or_default()
}

/// A diagnosis word in plain words.
pub fn diagnosis_words(diagnosis: &str) -> &'static str {
    match diagnosis {
        "no_leak" => "No leak: the load held within what can be read.",
        "thermal_contraction" => "Thermal drift: the oil cooling explains the movement.",
        "piston_seal_bypass" => "Piston seal bypass: oil is crossing the piston.",
        "holding_circuit_leak" => {
            "Valve or circuit leak: oil is leaving the holding end through the valve, a load-holding valve, a fitting or the rod seal."
        }
        _ => "Inconclusive: the readings cannot tell the cause apart.",
    }
}

/// The condition flags in words.
pub fn flags_words(flags: &[String]) -> Vec<String> {
    flags.iter().map(|f| flag_words(f).to_string()).collect()
}

/// A stored timestamp as a page shows it: `2025-03-14 09:30 UTC`.
pub fn when(at: &str) -> String {
    match (at.get(..10), at.get(11..16)) {
        (Some(day), Some(time)) => format!("{day} {time} UTC"),
        _ => at.to_string(),
    }
}

/// A procedure as the shop form shows it.
#[derive(Clone, Debug, Default)]
pub struct ProcedureView {
    pub id: i64,
    pub name: String,
    pub scope: String,
    pub hold_load: String,
    pub posture: String,
    pub measure_at: String,
    pub window: String,
    pub duration: String,
    pub limit: String,
    pub table: Vec<String>,
    pub notes: String,
    pub selected: bool,
}

/// The limit amount of a procedure row as text: distance for drift, pressure for decay.
fn amount(kind: &str, distance: Option<f64>, drop: Option<f64>, units: UnitSystem) -> String {
    if kind == "decay" {
        qd(drop, Dimension::Pressure, units)
    } else {
        qd(distance, Dimension::Length, units)
    }
}

pub fn procedure_view(p: &Procedure, units: UnitSystem, selected: bool) -> ProcedureView {
    let t = |k: Option<f64>| qd(k, Dimension::Temperature, units);
    let window = match (p.oil_temperature_min_k, p.oil_temperature_max_k) {
        (Some(lo), Some(hi)) => format!("{} to {}", t(Some(lo)), t(Some(hi))),
        (Some(lo), None) => format!("at least {}", t(Some(lo))),
        (None, Some(hi)) => format!("at most {}", t(Some(hi))),
        (None, None) => "not given".into(),
    };
    let limit = match p.limit_distance_m.or(p.limit_pressure_drop_pa) {
        Some(_) => format!(
            "{} in {}",
            amount(&p.kind, p.limit_distance_m, p.limit_pressure_drop_pa, units),
            q(
                Some(p.limit_period_s.unwrap_or(p.duration_s)),
                Dimension::Time,
                units
            )
        ),
        None if p.limits.is_empty() => "not given".into(),
        None => "by oil temperature (below)".into(),
    };
    ProcedureView {
        id: p.id,
        name: p.name.clone(),
        scope: match (&p.cylinder_id, &p.machine_kind) {
            (Some(_), _) => "for this cylinder".into(),
            (None, Some(kind)) => format!("shared by every {kind}"),
            _ => String::new(),
        },
        hold_load: p.hold_load.clone().unwrap_or_default(),
        posture: p.posture.clone().unwrap_or_default(),
        measure_at: p.measure_at.clone().unwrap_or_default(),
        window,
        duration: qd(Some(p.duration_s), Dimension::Time, units),
        limit,
        table: p
            .limits
            .iter()
            .map(|r| {
                format!(
                    "From {}: {} in {}",
                    t(Some(r.oil_temperature_from_k)),
                    amount(&p.kind, r.limit_distance_m, r.limit_pressure_drop_pa, units),
                    qd(Some(r.limit_period_s), Dimension::Time, units)
                )
            })
            .collect(),
        notes: p.notes.clone().unwrap_or_default(),
        selected,
    }
}

/// The words of a verdict.
pub fn verdict_words(verdict: &str) -> &'static str {
    match verdict {
        "pass" => "Within the limit.",
        "fail" => "Over the limit.",
        _ => "No limit was given, so the test is not judged.",
    }
}
