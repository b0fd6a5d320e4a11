//! Hose assembly pages: the add form on a machine, the edit form, and archiving.

use super::ctx::PageCtx;
use super::forms::{self, Builder, FormPage, Posted, Values};
use super::page_error;
use crate::api::hose_draft::{self, Draft};
use crate::api::hoses::machine_from_cylinder;
use crate::api::paging::{Params, path_id, pick_units};
use crate::app::AppState;
use crate::auth::Actor;
use crate::calc::quantity::{Dimension, UnitSystem};
use crate::db::cylinders;
use crate::db::hoses::{self as store, Hose, HoseFields};
use crate::db::machines::{self, Machine};
use crate::error::AppError;
use crate::pages::view::FieldErrors;
use axum::Router;
use axum::extract::{Path, State};
use axum::response::{IntoResponse, Redirect, Response};
use axum::routing::{get, post};

pub fn router() -> Router<AppState> {
    Router::new()
        .route("/machines/{id}/hoses/new", get(new_form).post(create))
        .route("/hoses/{id}/edit", get(edit_form).post(edit))
        .route("/hoses/{id}/archive", post(archive))
}

const NUMBERS: &[&str] = &["cylinder_id"];

/// The values a hose form is filled with, in `units`.
pub fn values(h: &HoseFields, units: UnitSystem) -> Values {
    let mut v = Values::new();
    let text = |s: &Option<String>| s.clone().unwrap_or_default();
    for (k, s) in [
        (
            "cylinder_id",
            h.cylinder_id.map(|c| c.to_string()).unwrap_or_default(),
        ),
        ("port", text(&h.port)),
        ("circuit", text(&h.circuit)),
        ("spec", text(&h.spec)),
        ("size", text(&h.size)),
        (
            "inside_diameter",
            forms::quantity_text(h.inside_diameter_m, Dimension::Length, units),
        ),
        (
            "length",
            forms::quantity_text(h.length_m, Dimension::Length, units),
        ),
        (
            "working_pressure",
            forms::quantity_text(h.working_pressure_pa, Dimension::Pressure, units),
        ),
        ("made_in", text(&h.made_in)),
        ("installed_on", text(&h.installed_on)),
        ("replace_by", text(&h.replace_by)),
    ] {
        v.insert(k.to_string(), s);
    }
    v
}

async fn form(
    state: &AppState,
    ctx: PageCtx,
    machine: &Machine,
    editing: Option<&Hose>,
    values: &Values,
    errors: &FieldErrors,
) -> Response {
    let on_machine = match cylinders::of_machine(&state.db, machine.id).await {
        Ok(c) => c,
        Err(e) => return page_error(e.into()),
    };
    let units = pick_units(None, machine.site_units.as_deref());
    let mut b = Builder::new(values, errors);
    let mut cylinder_options = vec![(String::new(), "None: a hose on a circuit".to_string())];
    cylinder_options.extend(on_machine.iter().map(|c| {
        (
            c.id.to_string(),
            c.function
                .clone()
                .unwrap_or_else(|| format!("Cylinder {}", c.id)),
        )
    }));
    b.select("cylinder_id", "Cylinder", cylinder_options);
    b.select(
        "port",
        "Port",
        forms::options(&[
            ("", "None (circuit hose)"),
            ("cap", "Cap end"),
            ("rod", "Rod end"),
        ]),
    );
    b.text(
        "circuit",
        "Circuit",
        "Needed without a cylinder, e.g. pump to valve, pressure line",
    );
    b.text(
        "spec",
        "Type",
        "As the layline states it, e.g. SAE 100R2AT, EN 853 2SN, ISO 18752-AS",
    );
    b.text("size", "Size", "Dash size or DN, e.g. -8 or DN12");
    b.quantity(
        "inside_diameter",
        "Inside diameter",
        Dimension::Length,
        units,
    );
    b.quantity("length", "Length", Dimension::Length, units);
    b.quantity(
        "working_pressure",
        "Maximum working pressure",
        Dimension::Pressure,
        units,
    )
    .hint = format!(
        "Of the assembly: the lower of hose and fittings. {} {}",
        forms::quantity_hint(Dimension::Pressure, units),
        super::hose_suggestion::hint(values, units)
    );
    b.text(
        "made_in",
        "Made in",
        "Quarter and year on the layline, e.g. 2024-Q2",
    );
    b.date("installed_on", "Installed on", "YYYY-MM-DD");
    b.date("replace_by", "Replace by", "YYYY-MM-DD");
    let (title, action, cancel) = match editing {
        Some(h) => (
            format!("Edit hose H{}", h.id),
            format!("/hoses/{}/edit", h.id),
            format!("/machines/{}", machine.id),
        ),
        None => (
            "Add a hose assembly".to_string(),
            format!("/machines/{}/hoses/new", machine.id),
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
            "Add hose"
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

async fn load(state: &AppState, id: &str) -> Result<(Hose, Machine), Response> {
    let id = path_id(id, "hose").map_err(page_error)?;
    let hose = match store::find(&state.db, id).await {
        Ok(Some(h)) => h,
        Ok(None) => return Err(page_error(AppError::not_found(format!("hose {id}")))),
        Err(e) => return Err(page_error(e.into())),
    };
    let m = machine(state, hose.machine_id).await?;
    Ok((hose, m))
}

async fn new_form(
    State(state): State<AppState>,
    ctx: PageCtx,
    Path(id): Path<String>,
    params: Params,
) -> Response {
    let m = match path_id(&id, "machine") {
        Ok(id) => match machine(&state, id).await {
            Ok(m) => m,
            Err(page) => return page,
        },
        Err(e) => return page_error(e),
    };
    let mut values = Values::new();
    if let Some(cylinder) = params.get("cylinder") {
        values.insert("cylinder_id".into(), cylinder.to_string());
        values.insert("port".into(), "cap".into());
    }
    form(&state, ctx, &m, None, &values, &FieldErrors::default()).await
}

async fn save(
    state: &AppState,
    actor: &Actor,
    id: Option<i64>,
    mut draft: Draft,
) -> Result<Hose, Vec<AppError>> {
    let (_write, mut tx) = crate::db::begin_write(&state.db)
        .await
        .map_err(|e| vec![e.into()])?;
    machine_from_cylinder(&mut tx, &mut draft)
        .await
        .map_err(|e| vec![e])?;
    let fields = hose_draft::finish(draft)?;
    let hose = match id {
        None => store::insert(&mut tx, &actor.name, &crate::db::now_rfc3339(), &fields).await,
        Some(id) => store::update(&mut tx, &actor.name, id, &fields, None).await,
    }
    .map_err(|e| vec![e.into()])?;
    tx.commit().await.map_err(|e| vec![e.into()])?;
    Ok(hose)
}

async fn create(
    State(state): State<AppState>,
    actor: Actor,
    ctx: PageCtx,
    Path(id): Path<String>,
    posted: Posted,
) -> Response {
    let m = match path_id(&id, "machine") {
        Ok(id) => match machine(&state, id).await {
            Ok(m) => m,
            Err(page) => return page,
        },
        Err(e) => return page_error(e),
    };
    let map = posted.to_object(NUMBERS, None);
    let base = Draft {
        machine_id: Some(m.id),
        ..Draft::default()
    };
    let saved = match hose_draft::read(&map, base) {
        Err(problems) => Err(problems),
        Ok((draft, _)) => save(&state, &actor, None, draft).await,
    };
    match saved {
        Ok(h) => Redirect::to(&format!("/machines/{}", h.machine_id)).into_response(),
        Err(problems) => match forms::refused(problems) {
            Ok(errors) => form(&state, ctx, &m, None, &posted.values(), &errors).await,
            Err(page) => *page,
        },
    }
}

async fn edit_form(
    State(state): State<AppState>,
    ctx: PageCtx,
    Path(id): Path<String>,
) -> Response {
    let (hose, m) = match load(&state, &id).await {
        Ok(loaded) => loaded,
        Err(page) => return page,
    };
    let units = pick_units(None, m.site_units.as_deref());
    let values = values(&hose.fields(), units);
    form(
        &state,
        ctx,
        &m,
        Some(&hose),
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
    let (hose, m) = match load(&state, &id).await {
        Ok(loaded) => loaded,
        Err(page) => return page,
    };
    let units = pick_units(None, m.site_units.as_deref());
    let before = values(&hose.fields(), units);
    let map = posted.to_object(NUMBERS, Some(&before));
    let saved = match hose_draft::read(&map, Draft::from(hose.fields())) {
        Err(problems) => Err(problems),
        Ok((draft, _)) => save(&state, &actor, Some(hose.id), draft).await,
    };
    match saved {
        Ok(h) => Redirect::to(&format!("/machines/{}", h.machine_id)).into_response(),
        Err(problems) => match forms::refused(problems) {
            Ok(errors) => form(&state, ctx, &m, Some(&hose), &posted.values(), &errors).await,
            Err(page) => *page,
        },
    }
}

async fn archive(State(state): State<AppState>, actor: Actor, Path(id): Path<String>) -> Response {
    let (hose, _) = match load(&state, &id).await {
        Ok(loaded) => loaded,
        Err(page) => return page,
    };
    let result: Result<(), AppError> = async {
        let (_write, mut tx) = crate::db::begin_write(&state.db).await?;
        store::archive(&mut tx, &actor.name, hose.id).await?;
        tx.commit().await?;
        Ok(())
    }
    .await;
    match result {
        Ok(()) => Redirect::to(&format!("/machines/{}", hose.machine_id)).into_response(),
        Err(e) => page_error(e),
    }
}
