//! The drift-test form page: the view of the cylinder, its procedures and cautions, and the
//! inputs grouped as a technician fills them, with their values and errors.

use super::form::{
    self, Field, Fields, in_unit, new_client_token, now_local_input, summary_lines, timestamp_input,
};
use super::words::{ProcedureView, procedure_view};
use crate::api::paging::pick_units;
use crate::calc::quantity::{Dimension as D, UnitSystem};
use crate::db::cylinders::Cylinder;
use crate::db::drift_tests::DriftTest;
use crate::db::machines::Machine;
use crate::db::procedures::Procedure;
use crate::pages::ctx::PageCtx;
use crate::pages::forms::Values;
use crate::pages::machine_page::{direction_words, function_text, size_text};
use crate::pages::view::{FieldErrors, q};
use askama::Template;
use askama_web::WebTemplate;

#[derive(Template, WebTemplate)]
#[template(path = "shop/drift_form.html")]
pub struct DriftFormPage {
    pub ctx: PageCtx,
    /// The cylinder's worst hazard, before the form (`service/danger.html`).
    pub danger: crate::pages::danger::Danger,
    pub danger_id: i64,
    pub danger_for: String,
    pub cylinder_id: i64,
    pub machine_id: i64,
    pub unit_number: String,
    pub function: String,
    pub size: String,
    pub direction: &'static str,
    pub recorded_load: String,
    pub procedures: Vec<ProcedureView>,
    pub selected: Option<ProcedureView>,
    pub procedure_id: String,
    pub client_token: String,
    pub amends: String,
    pub who: Vec<Field>,
    pub movement: Vec<Field>,
    pub temperatures: Vec<Field>,
    pub pressures: Vec<Field>,
    pub load: Vec<Field>,
    pub limit: Vec<Field>,
    pub notes: Vec<Field>,
    pub summary: Vec<String>,
}

pub fn units_of(c: &Cylinder) -> UnitSystem {
    pick_units(None, c.site_units.as_deref())
}

/// The form's values when first shown: now, the signed-in user, a fresh client token; or the
/// readings of the record being amended.
pub fn first_values(ctx: &PageCtx, c: &Cylinder, amending: Option<&DriftTest>) -> Values {
    let units = units_of(c);
    let mut v = Values::new();
    v.insert("client_token".into(), new_client_token());
    v.insert("tested_at".into(), now_local_input());
    if let Some(user) = &ctx.user {
        v.insert("technician".into(), user.clone());
    }
    let Some(t) = amending else {
        return v;
    };
    let put = |v: &mut Values, name: &str, si: Option<f64>, dimension: D| {
        let unit = form::default_unit(dimension, units);
        v.insert(name.into(), in_unit(si, unit, dimension));
        v.insert(format!("{name}_unit"), unit.into());
    };
    v.insert("tested_at".into(), timestamp_input(&t.tested_at));
    v.insert("technician".into(), t.technician.clone());
    put(&mut v, "duration", Some(t.duration_s), D::Time);
    put(&mut v, "drift", t.drift_m, D::Length);
    put(&mut v, "start_position", t.start_position_m, D::Length);
    put(&mut v, "end_position", t.end_position_m, D::Length);
    put(
        &mut v,
        "oil_temperature_start",
        Some(t.oil_temperature_start_k),
        D::Temperature,
    );
    put(
        &mut v,
        "oil_temperature_end",
        Some(t.oil_temperature_end_k),
        D::Temperature,
    );
    put(
        &mut v,
        "ambient_temperature",
        t.ambient_temperature_k,
        D::Temperature,
    );
    put(
        &mut v,
        "cap_pressure_start",
        t.cap_pressure_start_pa,
        D::Pressure,
    );
    put(
        &mut v,
        "cap_pressure_end",
        t.cap_pressure_end_pa,
        D::Pressure,
    );
    put(
        &mut v,
        "rod_pressure_start",
        t.rod_pressure_start_pa,
        D::Pressure,
    );
    put(
        &mut v,
        "rod_pressure_end",
        t.rod_pressure_end_pa,
        D::Pressure,
    );
    if t.procedure_id.is_none() {
        put(&mut v, "limit_distance", t.limit_distance_m, D::Length);
        put(&mut v, "limit_per", t.limit_period_s, D::Time);
    }
    if let Some(notes) = &t.notes {
        v.insert("notes".into(), notes.clone());
    }
    v
}

/// Everything the form page needs besides the values.
pub struct Context {
    pub cylinder: Cylinder,
    pub machine: Machine,
    pub procedures: Vec<Procedure>,
    pub procedure_id: Option<i64>,
    pub amends: Option<i64>,
    /// The cylinder's worst hazard, stated above the form.
    pub danger: crate::pages::danger::Danger,
}

pub fn page(ctx: PageCtx, c: &Context, values: &Values, errors: &FieldErrors) -> DriftFormPage {
    let cyl = &c.cylinder;
    let units = units_of(cyl);
    let mut who = Fields::new(values, errors, units);
    who.text(
        "technician",
        "Performed by (your login signs the record; name who did the test if someone else)",
    )
    .required = true;
    who.datetime("tested_at", "Time of test (UTC)").hint =
        "Leave as it is for a test done now.".into();
    let mut movement = Fields::new(values, errors, units);
    movement
        .quantity("drift", "Drift in the load's direction", D::Length)
        .hint = "The movement measured, or fill start and end positions instead.".into();
    movement.quantity("start_position", "Start position (extension)", D::Length);
    movement.quantity("end_position", "End position (extension)", D::Length);
    let duration = movement.quantity("duration", "Duration of the hold", D::Time);
    duration.required = true;
    duration.timer = true;
    duration.hint = "Type the time, or use the timer.".into();
    let mut temperatures = Fields::new(values, errors, units);
    temperatures
        .quantity(
            "oil_temperature_start",
            "Oil temperature at start",
            D::Temperature,
        )
        .required = true;
    temperatures
        .quantity(
            "oil_temperature_end",
            "Oil temperature at end",
            D::Temperature,
        )
        .required = true;
    temperatures.quantity("ambient_temperature", "Ambient temperature", D::Temperature);
    let mut pressures = Fields::new(values, errors, units);
    pressures.quantity(
        "cap_pressure_start",
        "Cap-end pressure at start",
        D::Pressure,
    );
    pressures.quantity("cap_pressure_end", "Cap-end pressure at end", D::Pressure);
    pressures.quantity(
        "rod_pressure_start",
        "Rod-end pressure at start",
        D::Pressure,
    );
    pressures.quantity("rod_pressure_end", "Rod-end pressure at end", D::Pressure);
    let mut load = Fields::new(values, errors, units);
    load.quantity("load", "Load held in this test", D::Force)
        .hint = "Leave empty to use the cylinder's recorded load.".into();
    load.select(
        "load_direction",
        "The load",
        vec![
            (
                String::new(),
                format!("as recorded: {}", direction_words(&cyl.load_direction)),
            ),
            ("retract".into(), direction_words("retract").into()),
            ("extend".into(), direction_words("extend").into()),
        ],
    );
    let mut limit = Fields::new(values, errors, units);
    if c.procedure_id.is_none() {
        limit.quantity("limit_distance", "Allowed drift", D::Length);
        limit.quantity(
            "limit_per",
            "Per how long (the time the allowed drift is for)",
            D::Time,
        );
    }
    let mut notes = Fields::new(values, errors, units);
    notes.textarea("notes", "Notes");
    let views: Vec<ProcedureView> = c
        .procedures
        .iter()
        .map(|p| procedure_view(p, units, Some(p.id) == c.procedure_id))
        .collect();
    DriftFormPage {
        ctx,
        danger: c.danger.clone(),
        danger_id: cyl.id,
        danger_for: String::new(),
        cylinder_id: cyl.id,
        machine_id: cyl.machine_id,
        unit_number: cyl.unit_number.clone(),
        function: function_text(cyl),
        size: size_text(cyl, units),
        direction: direction_words(&cyl.load_direction),
        recorded_load: q(cyl.max_load_n, D::Force, units),
        selected: views.iter().find(|v| v.selected).cloned(),
        procedures: views,
        procedure_id: c.procedure_id.map(|i| i.to_string()).unwrap_or_default(),
        client_token: values.get("client_token").cloned().unwrap_or_default(),
        amends: c.amends.map(|i| i.to_string()).unwrap_or_default(),
        who: who.finish(),
        movement: movement.finish(),
        temperatures: temperatures.finish(),
        pressures: pressures.finish(),
        load: load.finish(),
        limit: limit.finish(),
        notes: notes.finish(),
        summary: summary_lines(errors),
    }
}
