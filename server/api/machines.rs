//! `/api/v1/machines`: the fleet. Create, read, list with filters, update, archive (never
//! delete), and each machine's cylinders and hoses.

use super::draft::first;
use super::input::Body;
use super::machine_draft::{self, STATUSES, normalise_kind};
use super::paging::{Params, page_json, path_id, pick_units, shown};
use super::registry::{asked_units, missing, path_and_units, refuse_new_archived};
use super::{cylinders, hoses};
use crate::app::AppState;
use crate::auth::Actor;
use crate::calc::quantity::{Dimension, UnitSystem};
use crate::db::cylinders::CylinderFilter;
use crate::db::hoses::HoseFilter;
use crate::db::machines::{self as store, Machine, MachineFields, MachineFilter};
use crate::error::ApiResult;
use axum::extract::{Path, State};
use axum::http::StatusCode;
use axum::routing::{get, post};
use axum::{Json, Router};
use serde_json::{Value, json};

pub fn router() -> Router<AppState> {
    Router::new()
        .route("/api/v1/machines", get(list).post(create))
        .route(
            "/api/v1/machines/{id}",
            get(show).patch(update).delete(archive),
        )
        .route("/api/v1/machines/{id}/archive", post(archive))
        .route("/api/v1/machines/{id}/cylinders", get(list_cylinders))
        .route("/api/v1/machines/{id}/hoses", get(list_hoses))
}

/// A machine as the API shows it, quantities in `units`.
pub fn to_json(m: &Machine, units: UnitSystem) -> Value {
    json!({
        "id": m.id,
        "unit_number": m.unit_number,
        "site_id": m.site_id,
        "site_name": m.site_name,
        "kind": m.kind,
        "description": m.description,
        "serial": m.serial,
        "status": m.status,
        "out_of_service_reason": m.out_of_service_reason,
        "out_of_service_since": m.out_of_service_since,
        "relief_pressure": shown(m.relief_pressure_pa, Dimension::Pressure, units),
        "hour_meter": m.hour_meter_h,
        "hour_meter_read_on": m.hour_meter_read_on,
        "periodic_interval_days": m.periodic_interval_days,
        "periodic_interval_hours": m.periodic_interval_hours,
        "frequent_interval_days": m.frequent_interval_days,
        "cylinder_count": m.cylinder_count,
        "hose_count": m.hose_count,
        "created_at": m.created_at,
        "updated_at": m.updated_at,
        "archived": m.archived_at.is_some(),
        "archived_at": m.archived_at,
        "units": units.as_str(),
    })
}

fn reply(m: &Machine, asked: Option<UnitSystem>) -> Value {
    to_json(m, pick_units(asked, m.site_units.as_deref()))
}

async fn create(
    State(state): State<AppState>,
    actor: Actor,
    params: Params,
    Body(body): Body,
) -> ApiResult<(StatusCode, Json<Value>)> {
    params.deny_unknown(&["units"])?;
    let asked = asked_units(&params, Some(&body))?;
    let (fields, archived) = machine_draft::read(&body, MachineFields::default()).map_err(first)?;
    refuse_new_archived(archived, "machine")?;
    let (_write, mut tx) = crate::db::begin_write(&state.db).await?;
    let machine = store::insert(&mut tx, &actor.name, &crate::db::now_rfc3339(), &fields).await?;
    tx.commit().await?;
    Ok((StatusCode::CREATED, Json(reply(&machine, asked))))
}

async fn list(State(state): State<AppState>, params: Params) -> ApiResult<Json<Value>> {
    params.deny_unknown(&[
        "site", "status", "kind", "q", "archived", "limit", "cursor", "units",
    ])?;
    let filter = MachineFilter {
        site_id: params.id("site")?,
        status: params.choice("status", STATUSES)?,
        kind: params.get("kind").map(normalise_kind),
        q: params.get("q").map(str::to_string),
        include_archived: params.flag("archived")?,
    };
    let window = params.window()?;
    let asked = params.units()?;
    let page = store::list(&state.db, &filter, window).await?;
    Ok(Json(page_json(page, |m| reply(m, asked))))
}

async fn load(state: &AppState, id: &str) -> ApiResult<Machine> {
    let id = path_id(id, "machine")?;
    store::find(&state.db, id)
        .await?
        .ok_or_else(|| missing("machine", id))
}

async fn show(
    State(state): State<AppState>,
    Path(id): Path<String>,
    params: Params,
) -> ApiResult<Json<Value>> {
    params.deny_unknown(&["units"])?;
    let asked = params.units()?;
    let machine = load(&state, &id).await?;
    let mut body = reply(&machine, asked);
    body["due"] = super::reports::machine_due(&state, machine.id).await?; // reports
    Ok(Json(body))
}

async fn update(
    State(state): State<AppState>,
    actor: Actor,
    Path(id): Path<String>,
    params: Params,
    Body(body): Body,
) -> ApiResult<Json<Value>> {
    let (id, asked) = path_and_units(&params, &id, "machine", Some(&body))?;
    let (_write, mut tx) = crate::db::begin_write(&state.db).await?;
    let before = store::get(&mut tx, id)
        .await?
        .ok_or_else(|| missing("machine", id))?;
    let (fields, archived) = machine_draft::read(&body, before.fields()).map_err(first)?;
    let machine = store::update(&mut tx, &actor.name, id, &fields, archived).await?;
    tx.commit().await?;
    Ok(Json(reply(&machine, asked)))
}

async fn archive(
    State(state): State<AppState>,
    actor: Actor,
    Path(id): Path<String>,
    params: Params,
) -> ApiResult<Json<Value>> {
    let (id, asked) = path_and_units(&params, &id, "machine", None)?;
    let (_write, mut tx) = crate::db::begin_write(&state.db).await?;
    let machine = store::archive(&mut tx, &actor.name, id)
        .await
        .map_err(|e| match e {
            crate::db::write::WriteError::NotFound(_) => missing("machine", id),
            other => other.into(),
        })?;
    tx.commit().await?;
    Ok(Json(reply(&machine, asked)))
}

async fn list_cylinders(
    State(state): State<AppState>,
    Path(id): Path<String>,
    params: Params,
) -> ApiResult<Json<Value>> {
    params.deny_unknown(&["q", "archived", "limit", "cursor", "units"])?;
    let machine = load(&state, &id).await?;
    let filter = CylinderFilter {
        machine_id: Some(machine.id),
        site_id: None,
        q: params.get("q").map(str::to_string),
        include_archived: params.flag("archived")?,
    };
    let window = params.window()?;
    let asked = params.units()?;
    let page = crate::db::cylinders::list(&state.db, &filter, window).await?;
    Ok(Json(page_json(page, |c| cylinders::reply(c, asked))))
}

async fn list_hoses(
    State(state): State<AppState>,
    Path(id): Path<String>,
    params: Params,
) -> ApiResult<Json<Value>> {
    params.deny_unknown(&["q", "archived", "limit", "cursor", "units"])?;
    let machine = load(&state, &id).await?;
    let filter = HoseFilter {
        machine_id: Some(machine.id),
        q: params.get("q").map(str::to_string),
        include_archived: params.flag("archived")?,
        ..HoseFilter::default()
    };
    let window = params.window()?;
    let asked = params.units()?;
    let page = crate::db::hoses::list(&state.db, &filter, window).await?;
    Ok(Json(page_json(page, |h| hoses::reply(h, asked))))
}
