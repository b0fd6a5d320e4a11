//! The drift-test form at the machine: the procedure and its cautions, the readings with the
//! stopwatch, the analysis on the spot. The form posts to the same reader as the API
//! (`api::drift_tests::prepare`), so both refuse the same things with the same words.

use super::form::{
    self, Field, Fields, in_unit, new_client_token, now_local_input, timestamp_input,
};
use super::words::{ProcedureView, procedure_view};
use super::{load_cylinder, redirect_to};
use crate::api::drift_tests::{prepare, store};
use crate::api::paging::pick_units;
use crate::app::AppState;
use crate::auth::Actor;
use crate::calc::quantity::{Dimension as D, UnitSystem};
use crate::db::cylinders::Cylinder;
use crate::db::drift_tests::{self, DriftTest};
use crate::db::machines::Machine;
use crate::db::procedures::{self, Procedure};
use crate::error::AppError;
use crate::pages::ctx::PageCtx;
use crate::pages::forms::{Posted, Values, refused};
use crate::pages::machine_page::{direction_words, size_text};
use crate::pages::page_error;
use crate::pages::view::{FieldErrors, q};
use askama::Template;
use askama_web::WebTemplate;
use axum::extract::{Path, Query, State};
use axum::http::StatusCode;
use axum::response::{IntoResponse, Response};
use serde::Deserialize;
use serde_json::{Map, Value};

/// Inputs that hold a quantity (the unit is chosen beside each).
pub const QUANTITIES: &[&str] = &[
    "duration",
    "drift",
    "start_position",
    "end_position",
    "oil_temperature_start",
    "oil_temperature_end",
    "ambient_temperature",
    "cap_pressure_start",
    "cap_pressure_end",
    "rod_pressure_start",
    "rod_pressure_end",
    "load",
    "limit_distance",
    "limit_per",
];

const TEXTS: &[&str] = &[
    "tested_at",
    "technician",
    "client_token",
    "notes",
    "load_direction",
];

#[derive(Template, WebTemplate)]
#[template(path = "shop/drift_form.html")]
pub struct DriftFormPage {
    pub ctx: PageCtx,
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

#[derive(Debug, Default, Deserialize)]
pub struct FormQuery {
    pub procedure: Option<String>,
    pub amends: Option<String>,
}

fn units_of(c: &Cylinder) -> UnitSystem {
    pick_units(None, c.site_units.as_deref())
}

/// The form's values when first shown: now, the signed-in user, a fresh client token; or the
/// readings of the record being amended.
fn first_values(ctx: &PageCtx, c: &Cylinder, amending: Option<&DriftTest>) -> Values {
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
}

fn page(ctx: PageCtx, c: &Context, values: &Values, errors: &FieldErrors) -> DriftFormPage {
    let cyl = &c.cylinder;
    let units = units_of(cyl);
    let mut who = Fields::new(values, errors, units);
    who.text("technician", "Technician (signs the record)")
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
        limit.quantity("limit_per", "in", D::Time);
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
        cylinder_id: cyl.id,
        machine_id: cyl.machine_id,
        unit_number: cyl.unit_number.clone(),
        function: cyl
            .function
            .clone()
            .unwrap_or_else(|| format!("Cylinder {}", cyl.id)),
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

/// The lines above a refused form (every error, by field label where known).
pub fn summary_lines(errors: &FieldErrors) -> Vec<String> {
    errors
        .0
        .iter()
        .map(|(field, message)| {
            if field.is_empty() {
                message.clone()
            } else {
                format!("{}: {message}", field.replace('_', " "))
            }
        })
        .collect()
}

async fn context(
    state: &AppState,
    id: &str,
    procedure: Option<i64>,
    amends: Option<i64>,
) -> Result<Context, Response> {
    let (cylinder, machine) = load_cylinder(state, id).await?;
    let procedures = procedures::for_cylinder(&state.db, cylinder.id, &machine.kind, "drift")
        .await
        .map_err(|e| page_error(e.into()))?;
    let procedure_id = match procedure {
        Some(p) if procedures.iter().any(|x| x.id == p) => Some(p),
        Some(_) => None,
        None => procedures.first().map(|p| p.id),
    };
    Ok(Context {
        cylinder,
        machine,
        procedures,
        procedure_id,
        amends,
    })
}

fn id_of(text: Option<&str>) -> Option<i64> {
    text.and_then(|t| t.trim().parse::<i64>().ok())
        .filter(|n| *n > 0)
}

/// `GET /shop/cylinders/{id}/drift-test`.
pub async fn show_form(
    State(state): State<AppState>,
    ctx: PageCtx,
    Path(id): Path<String>,
    Query(query): Query<FormQuery>,
) -> Response {
    let amends = id_of(query.amends.as_deref());
    let amending = match amends {
        Some(a) => match drift_tests::find(&state.db, a).await {
            Ok(t) => t,
            Err(e) => return page_error(e.into()),
        },
        None => None,
    };
    let procedure = id_of(query.procedure.as_deref())
        .or_else(|| amending.as_ref().and_then(|t| t.procedure_id));
    let c = match context(&state, &id, procedure, amending.as_ref().map(|t| t.id)).await {
        Ok(c) => c,
        Err(page) => return page,
    };
    if amending
        .as_ref()
        .is_some_and(|t| t.cylinder_id != c.cylinder.id)
    {
        return page_error(AppError::not_found(format!(
            "drift test {} of this cylinder",
            amends.unwrap_or(0)
        )));
    }
    let values = first_values(&ctx, &c.cylinder, amending.as_ref());
    page(ctx, &c, &values, &FieldErrors::default()).into_response()
}

/// The posted form as the API's JSON body.
pub fn body_of(values: &Values) -> (Map<String, Value>, Vec<AppError>) {
    let mut map = form::to_json(values, QUANTITIES, TEXTS);
    let mut problems = Vec::new();
    for name in ["procedure_id", "amends"] {
        if let Some(text) = values.get(name).filter(|t| !t.trim().is_empty()) {
            match text.trim().parse::<i64>() {
                Ok(n) => {
                    map.insert(name.into(), Value::from(n));
                }
                Err(_) => problems.push(AppError::field(
                    name,
                    "invalid",
                    "send the form from its page again",
                )),
            }
        }
    }
    let distance = map.remove("limit_distance");
    let per = map.remove("limit_per");
    match (distance, per) {
        (Some(d), Some(p)) => {
            map.insert("limit".into(), serde_json::json!({"distance": d, "per": p}));
        }
        (Some(_), None) => problems.push(AppError::field(
            "limit_per",
            "required",
            "give the period the allowed drift is for",
        )),
        (None, Some(_)) => problems.push(AppError::field(
            "limit_distance",
            "required",
            "give the allowed drift for this period",
        )),
        (None, None) => {}
    }
    (map, problems)
}

/// Names the form's inputs in errors about the API's nested fields (`limit.per`).
pub fn form_field(error: AppError) -> AppError {
    match error {
        AppError::Invalid {
            status,
            code,
            field,
            message,
        } => AppError::Invalid {
            status,
            code,
            field: field.map(|f| {
                f.replace("limit.distance", "limit_distance")
                    .replace("limit.per", "limit_per")
            }),
            message,
        },
        other => other,
    }
}

/// `POST /shop/cylinders/{id}/drift-test`: stores once and shows the analysis, or shows the
/// form again with every value kept and the errors beside their fields.
pub async fn submit(
    State(state): State<AppState>,
    ctx: PageCtx,
    actor: Actor,
    Path(id): Path<String>,
    posted: Posted,
) -> Response {
    let values = posted.values();
    let procedure = id_of(values.get("procedure_id").map(String::as_str));
    let amends = id_of(values.get("amends").map(String::as_str));
    let c = match context(&state, &id, procedure, amends).await {
        Ok(c) => c,
        Err(page) => return page,
    };
    let (body, mut problems) = body_of(&values);
    let user = ctx.user.clone();
    let prepared = prepare(&state.db, &c.cylinder, &c.machine, &body, user.as_deref()).await;
    let outcome = match prepared {
        Ok(new) if problems.is_empty() => store(&state.db, &actor, &new).await.map_err(|e| vec![e]),
        Ok(_) => Err(Vec::new()),
        Err(found) => Err(found),
    };
    match outcome {
        Ok(stored) => redirect_to(
            &format!("/shop/drift-tests/{}", stored.record().id),
            !stored.is_new(),
        ),
        Err(found) => {
            problems.extend(found);
            let problems: Vec<AppError> = problems.into_iter().map(form_field).collect();
            let errors = match refused(problems) {
                Ok(errors) => errors,
                Err(page) => return *page,
            };
            (
                StatusCode::UNPROCESSABLE_ENTITY,
                page(ctx, &c, &values, &errors),
            )
                .into_response()
        }
    }
}
