//! The drift-test form at the machine: the procedure and its cautions, the readings with the
//! stopwatch, the analysis on the spot. The form posts to the same reader as the API
//! (`api::drift_tests::prepare`), so both refuse the same things with the same words.

use super::drift_page::{Context, first_values, page};
use super::form::{self, form_field};
use super::{load_cylinder, procedures_for, redirect_to};
use crate::api::drift_tests::{prepare, store};
use crate::app::AppState;
use crate::auth::Actor;
use crate::db::drift_tests;
use crate::error::AppError;
use crate::pages::ctx::PageCtx;
use crate::pages::forms::{Posted, Values, refused};
use crate::pages::page_error;
use crate::pages::view::FieldErrors;
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

#[derive(Debug, Default, Deserialize)]
pub struct FormQuery {
    pub procedure: Option<String>,
    pub amends: Option<String>,
}

async fn context(
    state: &AppState,
    id: &str,
    procedure: Option<i64>,
    amends: Option<i64>,
) -> Result<Context, Response> {
    let (cylinder, machine) = load_cylinder(state, id).await?;
    let (procedures, procedure_id) =
        procedures_for(state, (&cylinder, &machine), "drift", procedure).await?;
    let hoses = crate::db::hoses::of_machine(&state.db, cylinder.machine_id)
        .await
        .map_err(|e| crate::pages::page_error(e.into()))?;
    let fitted: Vec<&crate::db::hoses::Hose> = hoses
        .iter()
        .filter(|h| h.cylinder_id == Some(cylinder.id))
        .collect();
    let danger =
        crate::pages::danger::worst(&cylinder, &fitted, super::drift_page::units_of(&cylinder));
    Ok(Context {
        cylinder,
        machine,
        procedures,
        procedure_id,
        amends,
        danger,
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
    form::ids_into(values, &["procedure_id", "amends"], &mut map, &mut problems);
    form::limit_into(
        &mut map,
        &mut problems,
        ("limit_distance", "distance"),
        "drift",
    );
    (map, problems)
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
