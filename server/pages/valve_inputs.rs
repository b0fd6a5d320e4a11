//! The valve inputs of the cylinder form: the load-holding valve on the holding end and the
//! directional valve's centre at each work port (fields of `api::cylinder_valves_draft`).

use crate::calc::quantity::{Dimension, UnitSystem};
use crate::db::cylinder_valves::ValveFields;
use crate::pages::forms::{self, Builder, Values};

/// The plain-number fields among them (posted as numbers).
pub const NUMBERS: &[&str] = &["holding_valve_pilot_ratio"];

/// Adds the valve inputs to a cylinder form.
pub fn add(b: &mut Builder, units: UnitSystem) {
    b.select(
        "holding_valve",
        "Load-holding valve on the holding end",
        forms::options(&[
            ("", "None recorded"),
            (
                "counterbalance",
                "Counterbalance valve (relieves at its setting)",
            ),
            ("pilot_check", "Pilot-operated check valve (no relief)"),
        ]),
    );
    b.quantity(
        "holding_valve_setting",
        "Counterbalance valve setting",
        Dimension::Pressure,
        units,
    )
    .hint = "Its relief setting with no pilot pressure".into();
    b.number("holding_valve_pilot_ratio", "Pilot ratio", "e.g. 3 or 4.5");
    b.select(
        "holding_valve_pilot",
        "Pilot comes from",
        forms::options(&[
            ("", "The other work port (usual)"),
            ("other_port", "The other work port"),
            ("external", "An external pilot line"),
        ]),
    );
    for (name, label) in [
        ("cap_port_centre", "Cap port with the valve centred"),
        ("rod_port_centre", "Rod port with the valve centred"),
    ] {
        b.select(
            name,
            label,
            forms::options(&[
                ("", "Not recorded (taken as blocked)"),
                ("blocked", "Blocked"),
                ("open_to_tank", "Open to tank"),
            ]),
        );
    }
}

/// The form values of stored valves, in `units`.
pub fn values(v: &mut Values, valves: &ValveFields, units: UnitSystem) {
    let word = |w: &Option<String>| w.clone().unwrap_or_default();
    v.insert("holding_valve".into(), word(&valves.holding_valve));
    v.insert(
        "holding_valve_setting".into(),
        forms::quantity_text(valves.holding_valve_setting_pa, Dimension::Pressure, units),
    );
    v.insert(
        "holding_valve_pilot_ratio".into(),
        forms::number_text(valves.holding_valve_pilot_ratio),
    );
    v.insert(
        "holding_valve_pilot".into(),
        word(&valves.holding_valve_pilot),
    );
    v.insert("cap_port_centre".into(), word(&valves.cap_port_centre));
    v.insert("rod_port_centre".into(), word(&valves.rod_port_centre));
}

/// The recorded valves in words for the cylinder page, e.g. "counterbalance valve set at
/// 170 bar, pilot ratio 3.5 from the other port; cap port not recorded, rod port blocked".
pub fn describe(valves: &ValveFields, units: UnitSystem) -> String {
    let valve = match valves.holding_valve.as_deref() {
        Some("counterbalance") => format!(
            "counterbalance valve{}",
            valves
                .holding_valve_setting_pa
                .map(|s| format!(
                    " set at {}",
                    forms::quantity_text(Some(s), Dimension::Pressure, units)
                ))
                .unwrap_or_default()
        ),
        Some("pilot_check") => "pilot-operated check valve".to_string(),
        _ => "no load-holding valve recorded".to_string(),
    };
    let pilot = match (
        valves.holding_valve_pilot_ratio,
        valves.holding_valve_pilot.as_deref(),
    ) {
        (Some(r), Some("external")) => format!(", pilot ratio {r} from an external line"),
        (Some(r), _) => format!(", pilot ratio {r} from the other port"),
        _ => String::new(),
    };
    let centre = |c: &Option<String>| match c.as_deref() {
        Some("open_to_tank") => "open to tank",
        Some("blocked") => "blocked",
        _ => "not recorded (taken as blocked)",
    };
    format!(
        "{valve}{pilot}; centred, cap port {}, rod port {}",
        centre(&valves.cap_port_centre),
        centre(&valves.rod_port_centre)
    )
}
