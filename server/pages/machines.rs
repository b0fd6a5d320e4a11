//! Machine forms: add and edit a machine, and archive one. (The fleet list is in `fleet.rs`,
//! the machine's page in `machine_page.rs`.)

use super::ctx::PageCtx;
use super::forms::{self, Builder, FormPage, Posted, Values};
use super::page_error;
use crate::api::machine_draft;
use crate::api::paging::{path_id, pick_units};
use crate::app::AppState;
use crate::auth::Actor;
use crate::calc::quantity::{Dimension, UnitSystem};
use crate::db::machines::{self as store, Machine, MachineFields};
use crate::db::sites;
use crate::error::AppError;
use crate::pages::view::FieldErrors;
use axum::Router;
use axum::extract::{Path, State};
use axum::response::{IntoResponse, Redirect, Response};
use axum::routing::{get, post};

pub fn router() -> Router<AppState> {
    Router::new()
        .route("/machines", get(super::fleet::list).post(create))
        .route("/machines/new", get(new_form))
        .route("/machines/{id}", get(super::machine_page::show))
        .route("/machines/{id}/edit", get(edit_form).post(edit))
        .route("/machines/{id}/archive", post(archive))
}

/// Form inputs that hold plain numbers.
const NUMBERS: &[&str] = &[
    "site_id",
    "hour_meter",
    "periodic_interval_days",
    "periodic_interval_hours",
    "frequent_interval_days",
];

/// The values a machine form is filled with, in `units`.
pub fn values(m: &MachineFields, units: UnitSystem) -> Values {
    let mut v = Values::new();
    let mut put = |k: &str, s: String| {
        v.insert(k.to_string(), s);
    };
    put("unit_number", m.unit_number.clone());
    put(
        "site_id",
        m.site_id.map(|s| s.to_string()).unwrap_or_default(),
    );
    put("kind", m.kind.clone());
    put("description", m.description.clone().unwrap_or_default());
    put("serial", m.serial.clone().unwrap_or_default());
    put("status", m.status.clone());
    put(
        "out_of_service_reason",
        m.out_of_service_reason.clone().unwrap_or_default(),
    );
    put(
        "out_of_service_since",
        m.out_of_service_since.clone().unwrap_or_default(),
    );
    put(
        "relief_pressure",
        forms::quantity_text(m.relief_pressure_pa, Dimension::Pressure, units),
    );
    put("hour_meter", forms::number_text(m.hour_meter_h));
    put(
        "hour_meter_read_on",
        m.hour_meter_read_on.clone().unwrap_or_default(),
    );
    put(
        "periodic_interval_days",
        forms::number_text(m.periodic_interval_days.map(|d| d as f64)),
    );
    put(
        "periodic_interval_hours",
        forms::number_text(m.periodic_interval_hours),
    );
    put(
        "frequent_interval_days",
        forms::number_text(m.frequent_interval_days.map(|d| d as f64)),
    );
    v
}

async fn form(
    state: &AppState,
    ctx: PageCtx,
    editing: Option<&Machine>,
    values: &Values,
    errors: &FieldErrors,
) -> Response {
    let all_sites = match sites::all_active(&state.db).await {
        Ok(s) => s,
        Err(e) => return page_error(e.into()),
    };
    let units = pick_units(None, editing.and_then(|m| m.site_units.as_deref()));
    let mut b = Builder::new(values, errors);
    b.text(
        "unit_number",
        "Unit number",
        "As marked on the machine, e.g. HV-TH-07",
    )
    .required = true;
    b.text(
        "kind",
        "Kind of machine",
        "e.g. telehandler, excavator, scissor lift",
    )
    .required = true;
    let mut site_options = vec![(String::new(), "No site yet".to_string())];
    site_options.extend(all_sites.iter().map(|s| (s.id.to_string(), s.name.clone())));
    b.select("site_id", "Site", site_options);
    b.text(
        "description",
        "Description",
        "Make and model, e.g. 3.5 t telehandler, 17 m",
    );
    b.text("serial", "Serial number", "");
    b.select(
        "status",
        "Status",
        forms::options(&[
            ("in_service", "In service"),
            ("out_of_service", "Out of service"),
        ]),
    );
    b.text(
        "out_of_service_reason",
        "Reason out of service",
        "Only when out of service",
    );
    b.date(
        "out_of_service_since",
        "Out of service since",
        "YYYY-MM-DD; today if left empty",
    );
    b.quantity(
        "relief_pressure",
        "System relief setting",
        Dimension::Pressure,
        units,
    );
    b.number("hour_meter", "Hour meter reading", "Hours, a number");
    b.date(
        "hour_meter_read_on",
        "Hour meter read on",
        "YYYY-MM-DD; today if left empty",
    );
    b.number(
        "periodic_interval_days",
        "Periodic inspection every",
        "Days",
    );
    b.number(
        "periodic_interval_hours",
        "…or every",
        "Hours on the meter, whichever comes first",
    );
    b.number(
        "frequent_interval_days",
        "Frequent inspection every",
        "Days",
    );
    let (title, action, cancel) = match editing {
        Some(m) => (
            format!("Edit {}", m.unit_number),
            format!("/machines/{}/edit", m.id),
            format!("/machines/{}", m.id),
        ),
        None => (
            "Add a machine".to_string(),
            "/machines".to_string(),
            "/machines".to_string(),
        ),
    };
    FormPage {
        ctx,
        title,
        intro: String::new(),
        action,
        submit: if editing.is_some() {
            "Save changes"
        } else {
            "Add machine"
        },
        cancel_href: cancel,
        inputs: b.finish(),
        summary: Vec::new(),
    }
    .respond(errors)
}

async fn new_form(State(state): State<AppState>, ctx: PageCtx) -> Response {
    let values = values(&MachineFields::default(), UnitSystem::Metric);
    form(&state, ctx, None, &values, &FieldErrors::default()).await
}

async fn create(
    State(state): State<AppState>,
    actor: Actor,
    ctx: PageCtx,
    posted: Posted,
) -> Response {
    let map = posted.to_object(NUMBERS, None);
    let saved = match machine_draft::read(&map, MachineFields::default()) {
        Err(problems) => Err(problems),
        Ok((fields, _)) => save(&state, &actor, None, &fields)
            .await
            .map_err(|e| vec![e]),
    };
    match saved {
        Ok(m) => Redirect::to(&format!("/machines/{}", m.id)).into_response(),
        Err(problems) => match forms::refused(problems) {
            Ok(errors) => form(&state, ctx, None, &posted.values(), &errors).await,
            Err(page) => *page,
        },
    }
}

async fn save(
    state: &AppState,
    actor: &Actor,
    id: Option<i64>,
    fields: &MachineFields,
) -> Result<Machine, AppError> {
    let (_write, mut tx) = crate::db::begin_write(&state.db).await?;
    let machine = match id {
        None => store::insert(&mut tx, &actor.name, &crate::db::now_rfc3339(), fields).await?,
        Some(id) => store::update(&mut tx, &actor.name, id, fields, None).await?,
    };
    tx.commit().await?;
    Ok(machine)
}

async fn load(state: &AppState, id: &str) -> Result<Machine, Response> {
    let id = path_id(id, "machine").map_err(page_error)?;
    match store::find(&state.db, id).await {
        Ok(Some(m)) => Ok(m),
        Ok(None) => Err(page_error(AppError::not_found(format!("machine {id}")))),
        Err(e) => Err(page_error(e.into())),
    }
}

async fn edit_form(
    State(state): State<AppState>,
    ctx: PageCtx,
    Path(id): Path<String>,
) -> Response {
    let machine = match load(&state, &id).await {
        Ok(m) => m,
        Err(page) => return page,
    };
    let units = pick_units(None, machine.site_units.as_deref());
    let values = values(&machine.fields(), units);
    form(
        &state,
        ctx,
        Some(&machine),
        &values,
        &FieldErrors::default(),
    )
    .await
}

async fn edit(
    State(state): State<AppState>,
    actor: Actor,
    ctx: PageCtx,
    Path(id): Path<String>,
    posted: Posted,
) -> Response {
    let machine = match load(&state, &id).await {
        Ok(m) => m,
        Err(page) => return page,
    };
    let units = pick_units(None, machine.site_units.as_deref());
    let before = values(&machine.fields(), units);
    let map = posted.to_object(NUMBERS, Some(&before));
    let saved = match machine_draft::read(&map, machine.fields()) {
        Err(problems) => Err(problems),
        Ok((fields, _)) => save(&state, &actor, Some(machine.id), &fields)
            .await
            .map_err(|e| vec![e]),
    };
    match saved {
        Ok(m) => Redirect::to(&format!("/machines/{}", m.id)).into_response(),
        Err(problems) => match forms::refused(problems) {
            Ok(errors) => form(&state, ctx, Some(&machine), &posted.values(), &errors).await,
            Err(page) => *page,
        },
    }
}

async fn archive(State(state): State<AppState>, actor: Actor, Path(id): Path<String>) -> Response {
    let machine = match load(&state, &id).await {
        Ok(m) => m,
        Err(page) => return page,
    };
    let result: Result<(), AppError> = async {
        let (_write, mut tx) = crate::db::begin_write(&state.db).await?;
        store::archive(&mut tx, &actor.name, machine.id).await?;
        tx.commit().await?;
        Ok(())
    }
    .await;
    match result {
        Ok(()) => Redirect::to(&format!("/machines/{}", machine.id)).into_response(),
        Err(e) => page_error(e),
    }
}
