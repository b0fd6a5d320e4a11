//! The pressure-decay form: the cylinder driven to the end of its stroke, one end pressurised
//! and blocked, the pressure read at start and end. Posts to `api::decay_tests::prepare`.

use super::form::{self, Field, Fields, new_client_token, now_local_input};
use super::form::{form_field, summary_lines};
use super::words::{ProcedureView, procedure_view};
use super::{load_cylinder, procedures_for, redirect_to};
use crate::api::decay_tests::{prepare, store};
use crate::api::paging::pick_units;
use crate::app::AppState;
use crate::auth::Actor;
use crate::calc::quantity::Dimension as D;
use crate::db::cylinders::Cylinder;
use crate::db::machines::Machine;
use crate::db::procedures::Procedure;
use crate::error::AppError;
use crate::pages::ctx::PageCtx;
use crate::pages::forms::{Posted, Values, refused};
use crate::pages::machine_page::{function_text, size_text};
use crate::pages::view::FieldErrors;
use askama::Template;
use askama_web::WebTemplate;
use axum::extract::{Path, Query, State};
use axum::http::StatusCode;
use axum::response::{IntoResponse, Response};
use serde::Deserialize;
use serde_json::{Map, Value};

const QUANTITIES: &[&str] = &[
    "duration",
    "pressure_start",
    "pressure_end",
    "other_pressure_start",
    "other_pressure_end",
    "oil_temperature_start",
    "oil_temperature_end",
    "ambient_temperature",
    "limit_pressure",
    "limit_per",
];

const TEXTS: &[&str] = &[
    "tested_at",
    "technician",
    "client_token",
    "notes",
    "pressurised_end",
];

#[derive(Template, WebTemplate)]
#[template(path = "shop/decay_form.html")]
pub struct DecayFormPage {
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
    pub procedures: Vec<ProcedureView>,
    pub selected: Option<ProcedureView>,
    pub procedure_id: String,
    pub client_token: String,
    pub readings: Vec<Field>,
    pub limit: Vec<Field>,
    pub who: Vec<Field>,
    pub summary: Vec<String>,
}

#[derive(Debug, Default, Deserialize)]
pub struct FormQuery {
    pub procedure: Option<String>,
}

struct Context {
    cylinder: Cylinder,
    machine: Machine,
    procedures: Vec<Procedure>,
    procedure_id: Option<i64>,
    /// The cylinder's worst hazard, stated above the form.
    danger: crate::pages::danger::Danger,
}

async fn context(state: &AppState, id: &str, procedure: Option<i64>) -> Result<Context, Response> {
    let (cylinder, machine) = load_cylinder(state, id).await?;
    let (procedures, procedure_id) =
        procedures_for(state, (&cylinder, &machine), "decay", procedure).await?;
    let hoses = crate::db::hoses::of_machine(&state.db, cylinder.machine_id)
        .await
        .map_err(|e| crate::pages::page_error(e.into()))?;
    let fitted: Vec<&crate::db::hoses::Hose> = hoses
        .iter()
        .filter(|h| h.cylinder_id == Some(cylinder.id))
        .collect();
    let units = pick_units(None, cylinder.site_units.as_deref());
    let danger = crate::pages::danger::worst(&cylinder, &fitted, units);
    Ok(Context {
        cylinder,
        machine,
        procedures,
        procedure_id,
        danger,
    })
}

fn page(ctx: PageCtx, c: &Context, values: &Values, errors: &FieldErrors) -> DecayFormPage {
    let cyl = &c.cylinder;
    let units = pick_units(None, cyl.site_units.as_deref());
    let mut r = Fields::new(values, errors, units);
    r.radio(
        "pressurised_end",
        "Pressurised, blocked end",
        vec![
            ("cap".into(), "Cap end (rod fully out)".into()),
            ("rod".into(), "Rod end (rod fully in)".into()),
        ],
    )
    .required = true;
    r.quantity("pressure_start", "Pressure at start", D::Pressure)
        .required = true;
    r.quantity("pressure_end", "Pressure at end", D::Pressure)
        .required = true;
    let duration = r.quantity("duration", "Duration of the hold", D::Time);
    duration.required = true;
    duration.timer = true;
    r.quantity("other_pressure_start", "Other end at start", D::Pressure);
    r.quantity("other_pressure_end", "Other end at end", D::Pressure);
    r.quantity(
        "oil_temperature_start",
        "Oil temperature at start",
        D::Temperature,
    )
    .required = true;
    r.quantity(
        "oil_temperature_end",
        "Oil temperature at end",
        D::Temperature,
    )
    .required = true;
    r.quantity("ambient_temperature", "Ambient temperature", D::Temperature);
    let mut limit = Fields::new(values, errors, units);
    if c.procedure_id.is_none() {
        limit.quantity("limit_pressure", "Allowed pressure drop", D::Pressure);
        limit.quantity(
            "limit_per",
            "Per how long (the time the allowed drop is for)",
            D::Time,
        );
    }
    let mut who = Fields::new(values, errors, units);
    who.text("technician", "Technician (signs the record)")
        .required = true;
    who.datetime("tested_at", "Time of test (UTC)");
    who.textarea("notes", "Notes");
    let views: Vec<ProcedureView> = c
        .procedures
        .iter()
        .map(|p| procedure_view(p, units, Some(p.id) == c.procedure_id))
        .collect();
    DecayFormPage {
        ctx,
        danger: c.danger.clone(),
        danger_id: cyl.id,
        danger_for: String::new(),
        cylinder_id: cyl.id,
        machine_id: cyl.machine_id,
        unit_number: cyl.unit_number.clone(),
        function: function_text(cyl),
        size: size_text(cyl, units),
        selected: views.iter().find(|v| v.selected).cloned(),
        procedures: views,
        procedure_id: c.procedure_id.map(|i| i.to_string()).unwrap_or_default(),
        client_token: values.get("client_token").cloned().unwrap_or_default(),
        readings: r.finish(),
        limit: limit.finish(),
        who: who.finish(),
        summary: summary_lines(errors),
    }
}

/// `GET /shop/cylinders/{id}/decay-test`.
pub async fn show_form(
    State(state): State<AppState>,
    ctx: PageCtx,
    Path(id): Path<String>,
    Query(query): Query<FormQuery>,
) -> Response {
    let procedure = query.procedure.and_then(|p| p.parse::<i64>().ok());
    let c = match context(&state, &id, procedure).await {
        Ok(c) => c,
        Err(page) => return page,
    };
    let mut values = Values::new();
    values.insert("client_token".into(), new_client_token());
    values.insert("tested_at".into(), now_local_input());
    values.insert("pressurised_end".into(), "cap".into());
    if let Some(user) = &ctx.user {
        values.insert("technician".into(), user.clone());
    }
    page(ctx, &c, &values, &FieldErrors::default()).into_response()
}

fn body_of(values: &Values) -> (Map<String, Value>, Vec<AppError>) {
    let mut map = form::to_json(values, QUANTITIES, TEXTS);
    let mut problems = Vec::new();
    form::ids_into(values, &["procedure_id"], &mut map, &mut problems);
    form::limit_into(
        &mut map,
        &mut problems,
        ("limit_pressure", "pressure"),
        "drop",
    );
    (map, problems)
}

/// `POST /shop/cylinders/{id}/decay-test`.
pub async fn submit(
    State(state): State<AppState>,
    ctx: PageCtx,
    actor: Actor,
    Path(id): Path<String>,
    posted: Posted,
) -> Response {
    let values = posted.values();
    let procedure = values
        .get("procedure_id")
        .and_then(|p| p.trim().parse::<i64>().ok());
    let c = match context(&state, &id, procedure).await {
        Ok(c) => c,
        Err(page) => return page,
    };
    let (body, mut problems) = body_of(&values);
    let prepared = prepare(
        &state.db,
        &c.cylinder,
        &c.machine,
        &body,
        ctx.user.as_deref(),
    )
    .await;
    let outcome = match prepared {
        Ok(new) if problems.is_empty() => store(&state.db, &actor, &new).await.map_err(|e| vec![e]),
        Ok(_) => Err(Vec::new()),
        Err(found) => Err(found),
    };
    match outcome {
        Ok(stored) => redirect_to(
            &format!("/shop/decay-tests/{}", stored.record().id),
            !stored.is_new(),
        ),
        Err(found) => {
            problems.extend(found);
            let problems: Vec<AppError> = problems
                .into_iter()
                .map(|e| match form_field(e) {
                    AppError::Invalid {
                        status,
                        code,
                        field,
                        message,
                    } => AppError::Invalid {
                        status,
                        code,
                        field: field.map(|f| f.replace("limit.pressure", "limit_pressure")),
                        message,
                    },
                    other => other,
                })
                .collect();
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
