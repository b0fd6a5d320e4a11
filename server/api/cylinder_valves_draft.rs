//! The valve fields of a registry cylinder body (`holding_valve`, `holding_valve_setting`,
//! `holding_valve_pilot_ratio`, `holding_valve_pilot`, `cap_port_centre`, `rod_port_centre`),
//! read over the stored ones and checked together.

use super::draft::{Problems, positive, touched};
use super::input::Fields;
use crate::calc::cylinder::LoadDirection;
use crate::calc::quantity::{Dimension, UnitSystem, show};
use crate::calc::valves::{Centre, PilotSource, ValveKind};
use crate::db::cylinder_valves::ValveFields;
use crate::error::AppError;
use serde_json::{Map, Value, json};

/// `holding_valve`: `counterbalance` or `pilot_check` (null: none recorded).
pub const KINDS: &[&str] = &ValveKind::NAMES;

/// Reads the valve fields present in `map` over `v`, pushing every problem to `p`.
pub fn read(map: &Map<String, Value>, f: &Fields, p: &mut Problems, v: &mut ValveFields) {
    if touched(map, "holding_valve")
        && let Some(k) = p.take(f.opt_choice("holding_valve", KINDS))
    {
        v.holding_valve = k.map(str::to_string);
    }
    if touched(map, "holding_valve_setting")
        && let Some(s) = p.take(positive(f, "holding_valve_setting", Dimension::Pressure))
    {
        v.holding_valve_setting_pa = s;
    }
    if touched(map, "holding_valve_pilot_ratio")
        && let Some(r) = p.take(f.opt_number_min("holding_valve_pilot_ratio", 0.1))
    {
        v.holding_valve_pilot_ratio = r;
    }
    if touched(map, "holding_valve_pilot")
        && let Some(s) = p.take(f.opt_choice("holding_valve_pilot", &PilotSource::NAMES))
    {
        v.holding_valve_pilot = s.map(str::to_string);
    }
    for (name, slot) in [
        ("cap_port_centre", &mut v.cap_port_centre),
        ("rod_port_centre", &mut v.rod_port_centre),
    ] {
        if touched(map, name)
            && let Some(c) = p.take(f.opt_choice(name, &Centre::NAMES))
        {
            *slot = c.map(str::to_string);
        }
    }
}

/// Checks the merged valves: a setting only on a counterbalance valve (which needs one), a
/// pilot only with a valve, and a holding end open to tank only behind a load-holding valve.
pub fn check(v: &ValveFields, load_direction: Option<&str>, p: &mut Problems) {
    let kind = v.holding_valve.as_deref();
    if v.holding_valve_setting_pa.is_some() && kind != Some("counterbalance") {
        p.push(AppError::field(
            "holding_valve_setting",
            "requires",
            "a setting belongs to a counterbalance valve (holding_valve: counterbalance)",
        ));
    }
    if kind == Some("counterbalance") && v.holding_valve_setting_pa.is_none() {
        p.push(AppError::field(
            "holding_valve_setting",
            "required",
            "a counterbalance valve needs its setting",
        ));
    }
    if kind.is_none() && (v.holding_valve_pilot_ratio.is_some() || v.holding_valve_pilot.is_some())
    {
        p.push(AppError::field(
            "holding_valve",
            "required",
            "a pilot ratio or source needs the holding_valve too",
        ));
    }
    let direction = load_direction
        .and_then(LoadDirection::parse)
        .unwrap_or(LoadDirection::Retract);
    let hold = direction.holding_end();
    if v.calc().open_to_tank(hold, direction) {
        p.push(AppError::field(
            format!("{}_port_centre", hold.as_str()),
            "invalid",
            "the holding end open to tank holds no load: record the load-holding valve on that end, or the centre that blocks it",
        ));
    }
}

/// The valve fields as the API shows them, quantities in `units`.
pub fn to_json(v: &ValveFields, units: UnitSystem, into: &mut Map<String, Value>) {
    into.insert("holding_valve".into(), json!(v.holding_valve));
    into.insert(
        "holding_valve_setting".into(),
        json!(
            v.holding_valve_setting_pa
                .map(|s| show(s, Dimension::Pressure, units))
        ),
    );
    into.insert(
        "holding_valve_pilot_ratio".into(),
        json!(v.holding_valve_pilot_ratio),
    );
    into.insert("holding_valve_pilot".into(), json!(v.holding_valve_pilot));
    into.insert("cap_port_centre".into(), json!(v.cap_port_centre));
    into.insert("rod_port_centre".into(), json!(v.rod_port_centre));
}
