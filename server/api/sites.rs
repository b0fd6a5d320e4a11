//! `/api/v1/sites`: yards and depots, and the units their people read.

use super::draft::{Problems, first, required_text, touched};
use super::input::{Body, Fields};
use super::paging::{Params, page_json, path_id};
use super::registry::{missing, refuse_new_archived};
use crate::app::AppState;
use crate::auth::Actor;
use crate::calc::fluid;
use crate::calc::quantity::{self, Dimension, UnitSystem};
use crate::db::sites::{self, Site, SiteFields};
use crate::error::{ApiResult, AppError};
use axum::extract::{Path, State};
use axum::http::StatusCode;
use axum::routing::get;
use axum::{Json, Router};
use serde_json::{Map, Value, json};

pub fn router() -> Router<AppState> {
    Router::new()
        .route("/api/v1/sites", get(list).post(create))
        .route("/api/v1/sites/{id}", get(show).patch(update))
}

/// Fields a site body may carry.
pub const FIELDS: &[&str] = &["name", "units", "archived", "trapped_oil_warming"];

/// Reads a site from a JSON object over `base` (the stored site, or empty for a new one).
/// Returns the fields and the `archived` flag if given; every problem when refused.
pub fn read(
    map: &Map<String, Value>,
    base: SiteFields,
) -> Result<(SiteFields, Option<bool>), Vec<AppError>> {
    let f = Fields::new(map);
    let mut p = Problems::default();
    let mut site = base;
    p.take(f.deny_unknown(FIELDS));
    if touched(map, "name")
        && let Some(name) =
            p.take(required_text(&f, "name", 120).and_then(|v| super::draft::name(&f, "name", &v)))
    {
        site.name = name;
    }
    if touched(map, "units")
        && let Some(units) = p.take(f.choice("units", &["us", "metric"]))
    {
        site.units = units.to_string();
    }
    if touched(map, "trapped_oil_warming")
        && let Some(k) = p.take(f.opt_quantity("trapped_oil_warming", Dimension::TemperatureChange))
    {
        match k {
            Some(k) if !(0.0..=200.0).contains(&k) => p.push(AppError::field(
                "trapped_oil_warming",
                "out_of_range",
                "the warming must lie between 0 and 200 K",
            )),
            _ => site.trapped_oil_warming_k = k,
        }
    }
    let archived = p.take(f.opt_bool("archived")).flatten();
    if site.name.is_empty() && !p.has("name") {
        p.push(AppError::field(
            "name",
            "required",
            "a site name is required",
        ));
    }
    p.finish((site, archived))
}

/// Why the default warming is what it is (ours, stated with it).
pub const DEFAULT_WARMING_REASON: &str = "our default of 10 K, not a published figure: a machine parked with its valves closed, its oil warming in the sun or from a hot engine bay; record the warming expected on this site";

/// A site as the API shows it.
pub fn to_json(site: &Site) -> Value {
    let units = if site.units == "us" {
        UnitSystem::Us
    } else {
        UnitSystem::Metric
    };
    let warming = |k: f64| quantity::show(k, Dimension::TemperatureChange, units);
    json!({
        "trapped_oil_warming": site.trapped_oil_warming_k.map(warming),
        "trapped_oil_warming_used": warming(
            site.trapped_oil_warming_k.unwrap_or(fluid::DEFAULT_TRAPPED_TEMPERATURE_RISE)
        ),
        "trapped_oil_warming_basis": if site.trapped_oil_warming_k.is_some() { "recorded" } else { "default" },
        "trapped_oil_warming_reason": if site.trapped_oil_warming_k.is_some() {
            "recorded for this site"
        } else {
            DEFAULT_WARMING_REASON
        },
        "id": site.id,
        "name": site.name,
        "units": site.units,
        "machine_count": site.machine_count,
        "created_at": site.created_at,
        "updated_at": site.updated_at,
        "archived": site.archived_at.is_some(),
        "archived_at": site.archived_at,
    })
}

async fn create(
    State(state): State<AppState>,
    actor: Actor,
    Body(body): Body,
) -> ApiResult<(StatusCode, Json<Value>)> {
    let empty = SiteFields {
        name: String::new(),
        units: "metric".into(),
        trapped_oil_warming_k: None,
    };
    let (fields, archived) = read(&body, empty).map_err(first)?;
    refuse_new_archived(archived, "site")?;
    let (_write, mut tx) = crate::db::begin_write(&state.db).await?;
    let site = sites::insert(&mut tx, &actor.name, &crate::db::now_rfc3339(), &fields).await?;
    tx.commit().await?;
    Ok((StatusCode::CREATED, Json(to_json(&site))))
}

async fn list(State(state): State<AppState>, params: Params) -> ApiResult<Json<Value>> {
    params.deny_unknown(&["archived", "limit", "cursor"])?;
    let window = params.window()?;
    let page = sites::list(&state.db, params.flag("archived")?, window).await?;
    Ok(Json(page_json(page, to_json)))
}

async fn show(State(state): State<AppState>, Path(id): Path<String>) -> ApiResult<Json<Value>> {
    let id = path_id(&id, "site")?;
    let site = sites::find(&state.db, id)
        .await?
        .ok_or_else(|| missing("site", id))?;
    Ok(Json(to_json(&site)))
}

async fn update(
    State(state): State<AppState>,
    actor: Actor,
    Path(id): Path<String>,
    Body(body): Body,
) -> ApiResult<Json<Value>> {
    let id = path_id(&id, "site")?;
    let (_write, mut tx) = crate::db::begin_write(&state.db).await?;
    let before = sites::get(&mut tx, id)
        .await?
        .ok_or_else(|| missing("site", id))?;
    let (fields, archived) = read(&body, before.fields()).map_err(first)?;
    let site = sites::update(&mut tx, &actor.name, id, &fields, archived).await?;
    tx.commit().await?;
    Ok(Json(to_json(&site)))
}
