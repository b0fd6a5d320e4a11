//! Cylinder forms: add a cylinder to a machine, edit one, archive one. (The cylinder's page
//! with its safety panel is in `cylinder_page.rs`.)

use super::ctx::PageCtx;
use super::forms::{self, Builder, FormPage, Posted, Values};
use super::page_error;
use super::valve_inputs;
use crate::api::cylinder_draft::{self, Draft};
use crate::api::paging::{path_id, pick_units};
use crate::app::AppState;
use crate::auth::Actor;
use crate::calc::quantity::{Dimension, UnitSystem};
use crate::db::cylinders::{self as store, Cylinder, CylinderFields};
use crate::db::machines::{self, Machine};
use crate::error::AppError;
use crate::pages::view::FieldErrors;
use axum::Router;
use axum::extract::{Path, State};
use axum::response::{IntoResponse, Redirect, Response};
use axum::routing::{get, post};

pub fn router() -> Router<AppState> {
    Router::new()
        .route("/cylinders/{id}", get(super::cylinder_page::show))
        .route("/cylinders/{id}/edit", get(edit_form).post(edit))
        .route("/cylinders/{id}/archive", post(archive))
        .route("/machines/{id}/cylinders/new", get(new_form).post(create))
}

const NUMBERS: &[&str] = &["drift_test_interval_days"];

/// Every plain-number field of the form.
fn numbers() -> Vec<&'static str> {
    NUMBERS
        .iter()
        .chain(valve_inputs::NUMBERS)
        .copied()
        .collect()
}

pub(super) async fn load(state: &AppState, id: &str) -> Result<Cylinder, Response> {
    let id = path_id(id, "cylinder").map_err(page_error)?;
    match store::find(&state.db, id).await {
        Ok(Some(c)) => Ok(c),
        Ok(None) => Err(page_error(AppError::not_found(format!("cylinder {id}")))),
        Err(e) => Err(page_error(e.into())),
    }
}

/// The values a cylinder form is filled with, in `units`.
pub fn values(c: Option<&CylinderFields>, units: UnitSystem) -> Values {
    let mut v = Values::new();
    let Some(c) = c else {
        v.insert("load_direction".into(), "retract".into());
        return v;
    };
    let length = |si: Option<f64>| forms::quantity_text(si, Dimension::Length, units);
    let pressure = |si: Option<f64>| forms::quantity_text(si, Dimension::Pressure, units);
    for (k, s) in [
        ("function", c.function.clone().unwrap_or_default()),
        ("bore", length(Some(c.bore_m))),
        ("rod", length(Some(c.rod_m))),
        ("stroke", length(Some(c.stroke_m))),
        ("load_direction", c.load_direction.clone()),
        (
            "max_load",
            forms::quantity_text(c.max_load_n, Dimension::Force, units),
        ),
        (
            "min_load",
            forms::quantity_text(c.min_load_n, Dimension::Force, units),
        ),
        ("holding_pressure", pressure(c.holding_pressure_pa)),
        ("rated_pressure", pressure(c.rated_pressure_pa)),
        ("tube_outside_diameter", length(c.tube_outside_diameter_m)),
        ("tube_yield", forms::stress_input(c.tube_yield_pa, units)),
        ("end_condition", c.end_condition.clone().unwrap_or_default()),
        ("buckling_length", length(c.buckling_length_m)),
        ("rod_yield", forms::stress_input(c.rod_yield_pa, units)),
        ("serial", c.serial.clone().unwrap_or_default()),
        ("notes", c.notes.clone().unwrap_or_default()),
        (
            "drift_test_interval_days",
            forms::number_text(c.drift_test_interval_days.map(|d| d as f64)),
        ),
    ] {
        v.insert(k.to_string(), s);
    }
    valve_inputs::values(&mut v, &c.valves, units);
    v
}

fn form(
    ctx: PageCtx,
    machine: &Machine,
    editing: Option<&Cylinder>,
    values: &Values,
    errors: &FieldErrors,
) -> Response {
    let units = pick_units(None, machine.site_units.as_deref());
    let mut b = Builder::new(values, errors);
    b.text(
        "function",
        "Function",
        "What it moves, e.g. boom lift, left",
    );
    b.quantity("bore", "Bore", Dimension::Length, units)
        .required = true;
    b.quantity("rod", "Rod diameter", Dimension::Length, units)
        .required = true;
    b.quantity("stroke", "Stroke", Dimension::Length, units)
        .required = true;
    b.select(
        "load_direction",
        "Held load",
        forms::options(&[
            ("retract", "Pushes the rod in (cap end holds it)"),
            ("extend", "Pulls the rod out (rod end holds it)"),
        ]),
    )
    .required = true;
    b.quantity("max_load", "Highest load held", Dimension::Force, units);
    b.quantity("min_load", "Lowest load held", Dimension::Force, units)
        .hint = "E.g. the empty attachment's weight; left empty counts as no load. Some failures are worst at the lightest load".into();
    b.quantity(
        "holding_pressure",
        "…or highest holding pressure",
        Dimension::Pressure,
        units,
    )
    .hint = "If the load is not known: the gauge reading on the holding end".into();
    b.quantity(
        "rated_pressure",
        "Cylinder rated pressure",
        Dimension::Pressure,
        units,
    );
    b.quantity(
        "tube_outside_diameter",
        "Tube outside diameter",
        Dimension::Length,
        units,
    );
    b.quantity(
        "tube_yield",
        "Tube yield strength",
        Dimension::Pressure,
        units,
    )
    .hint = "Of the tube material, e.g. 355 MPa (or 52 ksi)".into();
    b.select(
        "end_condition",
        "Mounting, for rod buckling",
        forms::options(&[
            ("", "Not recorded"),
            ("fixed_free", "Fixed – free (K = 2)"),
            ("pinned_pinned", "Pinned – pinned (K = 1)"),
            ("fixed_pinned", "Fixed – pinned (K = 0.7)"),
            ("fixed_fixed", "Fixed – fixed (K = 0.5)"),
        ]),
    );
    b.quantity(
        "buckling_length",
        "Rod free length, for buckling",
        Dimension::Length,
        units,
    )
    .hint = "Pin to pin at full extension; left empty, twice the stroke is assumed".into();
    b.quantity(
        "rod_yield",
        "Rod yield strength",
        Dimension::Pressure,
        units,
    )
    .hint = "Of the rod steel, e.g. 490 MPa; left empty, 355 MPa is assumed (errs low)".into();
    valve_inputs::add(&mut b, units);
    b.text("serial", "Serial number", "");
    b.number("drift_test_interval_days", "Drift test every", "Days");
    b.textarea("notes", "Notes");
    let (title, action, cancel) = match editing {
        Some(c) => (
            format!(
                "Edit {}",
                c.function
                    .clone()
                    .unwrap_or_else(|| format!("cylinder {}", c.id))
            ),
            format!("/cylinders/{}/edit", c.id),
            format!("/cylinders/{}", c.id),
        ),
        None => (
            "Add a cylinder".to_string(),
            format!("/machines/{}/cylinders/new", machine.id),
            format!("/machines/{}", machine.id),
        ),
    };
    FormPage {
        ctx,
        title,
        intro: format!("On machine {}", machine.unit_number),
        action,
        submit: if editing.is_some() {
            "Save changes"
        } else {
            "Add cylinder"
        },
        cancel_href: cancel,
        inputs: b.finish(),
        summary: Vec::new(),
    }
    .respond(errors)
}

async fn machine(state: &AppState, id: i64) -> Result<Machine, Response> {
    match machines::find(&state.db, id).await {
        Ok(Some(m)) => Ok(m),
        Ok(None) => Err(page_error(AppError::not_found(format!("machine {id}")))),
        Err(e) => Err(page_error(e.into())),
    }
}

async fn new_form(State(state): State<AppState>, ctx: PageCtx, Path(id): Path<String>) -> Response {
    let id = match path_id(&id, "machine") {
        Ok(id) => id,
        Err(e) => return page_error(e),
    };
    match machine(&state, id).await {
        Ok(m) => form(
            ctx,
            &m,
            None,
            &values(None, UnitSystem::Metric),
            &FieldErrors::default(),
        ),
        Err(page) => page,
    }
}

async fn save(
    state: &AppState,
    actor: &Actor,
    id: Option<i64>,
    fields: &CylinderFields,
) -> Result<Cylinder, AppError> {
    let (_write, mut tx) = crate::db::begin_write(&state.db).await?;
    let cylinder = match id {
        None => store::insert(&mut tx, &actor.name, &crate::db::now_rfc3339(), fields).await?,
        Some(id) => store::update(&mut tx, &actor.name, id, fields, None).await?,
    };
    tx.commit().await?;
    Ok(cylinder)
}

async fn create(
    State(state): State<AppState>,
    actor: Actor,
    ctx: PageCtx,
    Path(id): Path<String>,
    posted: Posted,
) -> Response {
    let id = match path_id(&id, "machine") {
        Ok(id) => id,
        Err(e) => return page_error(e),
    };
    let m = match machine(&state, id).await {
        Ok(m) => m,
        Err(page) => return page,
    };
    let map = posted.to_object(&numbers(), None);
    let base = Draft {
        machine_id: Some(m.id),
        ..Draft::default()
    };
    let saved = match cylinder_draft::read(&map, base) {
        Err(problems) => Err(problems),
        Ok((fields, _)) => save(&state, &actor, None, &fields)
            .await
            .map_err(|e| vec![e]),
    };
    match saved {
        Ok(c) => Redirect::to(&format!("/cylinders/{}", c.id)).into_response(),
        Err(problems) => match forms::refused(problems) {
            Ok(errors) => form(ctx, &m, None, &posted.values(), &errors),
            Err(page) => *page,
        },
    }
}

async fn edit_form(
    State(state): State<AppState>,
    ctx: PageCtx,
    Path(id): Path<String>,
) -> Response {
    let c = match load(&state, &id).await {
        Ok(c) => c,
        Err(page) => return page,
    };
    let m = match machine(&state, c.machine_id).await {
        Ok(m) => m,
        Err(page) => return page,
    };
    let units = pick_units(None, m.site_units.as_deref());
    form(
        ctx,
        &m,
        Some(&c),
        &values(Some(&c.fields()), units),
        &FieldErrors::default(),
    )
}

async fn edit(
    State(state): State<AppState>,
    actor: Actor,
    ctx: PageCtx,
    Path(id): Path<String>,
    posted: Posted,
) -> Response {
    let c = match load(&state, &id).await {
        Ok(c) => c,
        Err(page) => return page,
    };
    let m = match machine(&state, c.machine_id).await {
        Ok(m) => m,
        Err(page) => return page,
    };
    let units = pick_units(None, m.site_units.as_deref());
    let before = values(Some(&c.fields()), units);
    let map = posted.to_object(&numbers(), Some(&before));
    let saved = match cylinder_draft::read(&map, Draft::from(c.fields())) {
        Err(problems) => Err(problems),
        Ok((fields, _)) => save(&state, &actor, Some(c.id), &fields)
            .await
            .map_err(|e| vec![e]),
    };
    match saved {
        Ok(c) => Redirect::to(&format!("/cylinders/{}", c.id)).into_response(),
        Err(problems) => match forms::refused(problems) {
            Ok(errors) => form(ctx, &m, Some(&c), &posted.values(), &errors),
            Err(page) => *page,
        },
    }
}

async fn archive(State(state): State<AppState>, actor: Actor, Path(id): Path<String>) -> Response {
    let c = match load(&state, &id).await {
        Ok(c) => c,
        Err(page) => return page,
    };
    let result: Result<(), AppError> = async {
        let (_write, mut tx) = crate::db::begin_write(&state.db).await?;
        store::archive(&mut tx, &actor.name, c.id).await?;
        tx.commit().await?;
        Ok(())
    }
    .await;
    match result {
        Ok(()) => Redirect::to(&format!("/machines/{}", c.machine_id)).into_response(),
        Err(e) => page_error(e),
    }
}
