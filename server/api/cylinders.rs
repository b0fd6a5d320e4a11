//! `/api/v1/cylinders`: create, read, list, update and archive (never delete) cylinders.

use super::cylinder_draft::{self, Draft};
use super::draft::first;
use super::input::Body;
use super::paging::{Params, page_json, pick_units, shown};
use super::registry::{asked_units, missing, path_and_units, refuse_new_archived};
use crate::app::AppState;
use crate::auth::Actor;
use crate::calc::quantity::{Dimension, UnitSystem};
use crate::db::cylinders::{self as store, Cylinder, CylinderFilter};
use crate::error::ApiResult;
use axum::extract::{Path, State};
use axum::http::StatusCode;
use axum::routing::{get, post};
use axum::{Json, Router};
use serde_json::{Value, json};

pub fn router() -> Router<AppState> {
    Router::new()
        .route("/api/v1/cylinders", get(list).post(create))
        .route(
            "/api/v1/cylinders/{id}",
            get(show).patch(update).delete(archive),
        )
        .route("/api/v1/cylinders/{id}/archive", post(archive))
}

/// A cylinder as the API shows it, quantities in `units`.
pub fn to_json(c: &Cylinder, units: UnitSystem) -> Value {
    let length = |v: f64| shown(Some(v), Dimension::Length, units);
    let mut out = json!({
        "id": c.id,
        "machine_id": c.machine_id,
        "unit_number": c.unit_number,
        "function": c.function,
        "bore": length(c.bore_m),
        "rod": length(c.rod_m),
        "stroke": length(c.stroke_m),
        "load_direction": c.load_direction,
        "max_load": shown(c.max_load_n, Dimension::Force, units),
        "min_load": shown(c.min_load_n, Dimension::Force, units),
        "holding_pressure": shown(c.holding_pressure_pa, Dimension::Pressure, units),
        "rated_pressure": shown(c.rated_pressure_pa, Dimension::Pressure, units),
        "tube_outside_diameter": shown(c.tube_outside_diameter_m, Dimension::Length, units),
        "tube_yield": shown(c.tube_yield_pa, Dimension::Pressure, units),
        "end_condition": c.end_condition,
        "buckling_length": shown(c.buckling_length_m, Dimension::Length, units),
        "rod_yield": shown(c.rod_yield_pa, Dimension::Pressure, units),
        "serial": c.serial,
        "notes": c.notes,
        "drift_test_interval_days": c.drift_test_interval_days,
        "hose_count": c.hose_count,
        "created_at": c.created_at,
        "updated_at": c.updated_at,
        "archived": c.archived_at.is_some(),
        "archived_at": c.archived_at,
        "units": units.as_str(),
    });
    if let Value::Object(map) = &mut out {
        super::cylinder_valves_draft::to_json(&c.valves, units, map);
    }
    out
}

/// The answer for one cylinder: asked units, else its site's, else metric.
pub fn reply(c: &Cylinder, asked: Option<UnitSystem>) -> Value {
    to_json(c, pick_units(asked, c.site_units.as_deref()))
}

async fn create(
    State(state): State<AppState>,
    actor: Actor,
    params: Params,
    Body(body): Body,
) -> ApiResult<(StatusCode, Json<Value>)> {
    params.deny_unknown(&["units"])?;
    let asked = asked_units(&params, Some(&body))?;
    let (fields, archived) = cylinder_draft::read(&body, Draft::default()).map_err(first)?;
    refuse_new_archived(archived, "cylinder")?;
    let (_write, mut tx) = crate::db::begin_write(&state.db).await?;
    let cylinder = store::insert(&mut tx, &actor.name, &crate::db::now_rfc3339(), &fields).await?;
    tx.commit().await?;
    Ok((StatusCode::CREATED, Json(reply(&cylinder, asked))))
}

async fn list(State(state): State<AppState>, params: Params) -> ApiResult<Json<Value>> {
    params.deny_unknown(&[
        "machine", "site", "q", "archived", "limit", "cursor", "units",
    ])?;
    let filter = CylinderFilter {
        machine_id: params.id("machine")?,
        site_id: params.id("site")?,
        q: params.get("q").map(str::to_string),
        include_archived: params.flag("archived")?,
    };
    let window = params.window()?;
    let asked = params.units()?;
    let page = store::list(&state.db, &filter, window).await?;
    Ok(Json(page_json(page, |c| reply(c, asked))))
}

async fn show(
    State(state): State<AppState>,
    Path(id): Path<String>,
    params: Params,
) -> ApiResult<Json<Value>> {
    let (id, asked) = path_and_units(&params, &id, "cylinder", None)?;
    let cylinder = store::find(&state.db, id)
        .await?
        .ok_or_else(|| missing("cylinder", id))?;
    let mut body = reply(&cylinder, asked);
    body["due"] = super::reports::cylinder_due(&state, cylinder.id).await?; // reports
    Ok(Json(body))
}

async fn update(
    State(state): State<AppState>,
    actor: Actor,
    Path(id): Path<String>,
    params: Params,
    Body(body): Body,
) -> ApiResult<Json<Value>> {
    let (id, asked) = path_and_units(&params, &id, "cylinder", Some(&body))?;
    let (_write, mut tx) = crate::db::begin_write(&state.db).await?;
    let before = store::get(&mut tx, id)
        .await?
        .ok_or_else(|| missing("cylinder", id))?;
    let (fields, archived) =
        cylinder_draft::read(&body, Draft::from(before.fields())).map_err(first)?;
    let cylinder = store::update(&mut tx, &actor.name, id, &fields, archived).await?;
    tx.commit().await?;
    Ok(Json(reply(&cylinder, asked)))
}

async fn archive(
    State(state): State<AppState>,
    actor: Actor,
    Path(id): Path<String>,
    params: Params,
) -> ApiResult<Json<Value>> {
    let (id, asked) = path_and_units(&params, &id, "cylinder", None)?;
    let (_write, mut tx) = crate::db::begin_write(&state.db).await?;
    let cylinder = store::archive(&mut tx, &actor.name, id).await?;
    tx.commit().await?;
    Ok(Json(reply(&cylinder, asked)))
}
