//! `/api/v1/hoses`: create, read, list, update and archive (never delete) hose assemblies.

use super::draft::first;
use super::hose_draft::{self, Draft};
use super::input::Body;
use super::paging::{Params, page_json, pick_units, shown};
use super::registry::{asked_units, missing, path_and_units, refuse_new_archived};
use crate::app::AppState;
use crate::auth::Actor;
use crate::calc::quantity::{Dimension, UnitSystem};
use crate::db::hoses::{self as store, Hose, HoseFilter};
use crate::error::{ApiResult, AppError};
use axum::extract::{Path, State};
use axum::http::StatusCode;
use axum::routing::{get, post};
use axum::{Json, Router};
use serde_json::{Value, json};
use sqlx::SqliteConnection;

pub fn router() -> Router<AppState> {
    Router::new()
        .route("/api/v1/hoses", get(list).post(create))
        .route(
            "/api/v1/hoses/{id}",
            get(show).patch(update).delete(archive),
        )
        .route("/api/v1/hoses/{id}/archive", post(archive))
}

/// A hose assembly as the API shows it, quantities in `units`.
pub fn to_json(h: &Hose, units: UnitSystem) -> Value {
    json!({
        "id": h.id,
        "machine_id": h.machine_id,
        "unit_number": h.unit_number,
        "cylinder_id": h.cylinder_id,
        "cylinder_function": h.cylinder_function,
        "port": h.port,
        "circuit": h.circuit,
        "spec": h.spec,
        "size": h.size,
        "inside_diameter": shown(h.inside_diameter_m, Dimension::Length, units),
        "length": shown(h.length_m, Dimension::Length, units),
        "working_pressure": shown(h.working_pressure_pa, Dimension::Pressure, units),
        "made_in": h.made_in,
        "installed_on": h.installed_on,
        "replace_by": h.replace_by,
        "created_at": h.created_at,
        "updated_at": h.updated_at,
        "archived": h.archived_at.is_some(),
        "archived_at": h.archived_at,
        "units": units.as_str(),
    })
}

/// The answer for one hose: asked units, else its site's, else metric.
pub fn reply(h: &Hose, asked: Option<UnitSystem>) -> Value {
    to_json(h, pick_units(asked, h.site_units.as_deref()))
}

/// Fills a missing `machine_id` from the cylinder; an unknown cylinder names `cylinder_id`.
pub async fn machine_from_cylinder(
    conn: &mut SqliteConnection,
    draft: &mut Draft,
) -> ApiResult<()> {
    if draft.machine_id.is_none()
        && let Some(cylinder_id) = draft.cylinder_id
    {
        let cylinder = crate::db::cylinders::get(conn, cylinder_id)
            .await?
            .ok_or_else(|| {
                AppError::field(
                    "cylinder_id",
                    "invalid_reference",
                    format!("there is no cylinder {cylinder_id}"),
                )
            })?;
        draft.machine_id = Some(cylinder.machine_id);
    }
    Ok(())
}

async fn create(
    State(state): State<AppState>,
    actor: Actor,
    params: Params,
    Body(body): Body,
) -> ApiResult<(StatusCode, Json<Value>)> {
    params.deny_unknown(&["units"])?;
    let asked = asked_units(&params, Some(&body))?;
    let (mut draft, archived) = hose_draft::read(&body, Draft::default()).map_err(first)?;
    refuse_new_archived(archived, "hose")?;
    let (_write, mut tx) = crate::db::begin_write(&state.db).await?;
    machine_from_cylinder(&mut tx, &mut draft).await?;
    let fields = hose_draft::finish(draft).map_err(first)?;
    let hose = store::insert(&mut tx, &actor.name, &crate::db::now_rfc3339(), &fields).await?;
    tx.commit().await?;
    Ok((StatusCode::CREATED, Json(reply(&hose, asked))))
}

async fn list(State(state): State<AppState>, params: Params) -> ApiResult<Json<Value>> {
    params.deny_unknown(&[
        "machine", "cylinder", "site", "q", "archived", "limit", "cursor", "units",
    ])?;
    let filter = HoseFilter {
        machine_id: params.id("machine")?,
        cylinder_id: params.id("cylinder")?,
        site_id: params.id("site")?,
        q: params.get("q").map(str::to_string),
        include_archived: params.flag("archived")?,
    };
    let window = params.window()?;
    let asked = params.units()?;
    let page = store::list(&state.db, &filter, window).await?;
    Ok(Json(page_json(page, |h| reply(h, asked))))
}

async fn show(
    State(state): State<AppState>,
    Path(id): Path<String>,
    params: Params,
) -> ApiResult<Json<Value>> {
    let (id, asked) = path_and_units(&params, &id, "hose", None)?;
    let hose = store::find(&state.db, id)
        .await?
        .ok_or_else(|| missing("hose", id))?;
    Ok(Json(reply(&hose, asked)))
}

async fn update(
    State(state): State<AppState>,
    actor: Actor,
    Path(id): Path<String>,
    params: Params,
    Body(body): Body,
) -> ApiResult<Json<Value>> {
    let (id, asked) = path_and_units(&params, &id, "hose", Some(&body))?;
    let (_write, mut tx) = crate::db::begin_write(&state.db).await?;
    let before = store::get(&mut tx, id)
        .await?
        .ok_or_else(|| missing("hose", id))?;
    let (draft, archived) = hose_draft::read(&body, Draft::from(before.fields())).map_err(first)?;
    let fields = hose_draft::finish(draft).map_err(first)?;
    let hose = store::update(&mut tx, &actor.name, id, &fields, archived).await?;
    tx.commit().await?;
    Ok(Json(reply(&hose, asked)))
}

async fn archive(
    State(state): State<AppState>,
    actor: Actor,
    Path(id): Path<String>,
    params: Params,
) -> ApiResult<Json<Value>> {
    let (id, asked) = path_and_units(&params, &id, "hose", None)?;
    let (_write, mut tx) = crate::db::begin_write(&state.db).await?;
    let hose = store::archive(&mut tx, &actor.name, id).await?;
    tx.commit().await?;
    Ok(Json(reply(&hose, asked)))
}
