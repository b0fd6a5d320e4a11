//! `/api/v1/procedures`: drift-test and pressure-decay procedures as machine makers write
//! them. Create, read, list, update and archive (`"archived": true`); never deleted.

use super::draft::{Problems, first, touched};
use super::input::{Body, Fields};
use super::paging::{Params, path_id, shown};
use crate::app::AppState;
use crate::auth::Actor;
use crate::calc::quantity::{Dimension as D, UnitSystem};
use crate::db::procedures::{
    self as store, KINDS, LimitRow, Procedure, ProcedureFields, ProcedureFilter,
};
use crate::error::{ApiResult, AppError};
use axum::extract::{Path, State};
use axum::http::StatusCode;
use axum::routing::get;
use axum::{Json, Router};
use serde_json::{Map, Value, json};

pub fn router() -> Router<AppState> {
    Router::new()
        .route("/api/v1/procedures", get(list).post(create))
        .route("/api/v1/procedures/{id}", get(show).patch(update))
}

const FIELDS: &[&str] = &[
    "kind",
    "name",
    "cylinder_id",
    "machine_kind",
    "hold_load",
    "posture",
    "measure_at",
    "oil_temperature_min",
    "oil_temperature_max",
    "duration",
    "limit",
    "limit_table",
    "oil_expansion",
    "notes",
    "units",
    "archived",
];

fn limit_words(kind: &str) -> (&'static str, D) {
    if kind == "decay" {
        ("pressure", D::Pressure)
    } else {
        ("distance", D::Length)
    }
}

/// `limit_table`: `[{"from": "40 degC", "distance" | "pressure": ..., "per": "10 min"}]`.
fn limit_table(f: &Fields, kind: &str) -> Result<Vec<LimitRow>, AppError> {
    let list = match f.raw("limit_table") {
        None => return Ok(Vec::new()),
        Some(Value::Array(list)) => list,
        Some(_) => {
            return Err(AppError::field(
                "limit_table",
                "invalid",
                "must be a list of {\"from\", \"distance\" or \"pressure\", \"per\"}",
            ));
        }
    };
    if list.len() > 20 {
        return Err(AppError::field(
            "limit_table",
            "too_long",
            "at most 20 rows",
        ));
    }
    let (amount, dimension) = limit_words(kind);
    let mut rows: Vec<LimitRow> = Vec::new();
    for (i, value) in list.iter().enumerate() {
        let prefix = format!("limit_table[{i}]");
        let mut holder = Map::new();
        holder.insert("row".into(), value.clone());
        let wrapped = Fields::new(&holder);
        let Some(row) = wrapped.object("row", &prefix)? else {
            return Err(AppError::field(prefix, "invalid", "each row is an object"));
        };
        row.deny_unknown(&["from", amount, "per"])?;
        let from = row.quantity("from", D::Temperature)?;
        if from <= 0.0 {
            return Err(AppError::field(
                row.path("from"),
                "out_of_range",
                "an oil temperature lies above absolute zero (0 K, -273.15 degC)",
            ));
        }
        let value = row.quantity(amount, dimension)?;
        let per = super::draft::required_positive(&row, "per", D::Time)?;
        if rows
            .last()
            .is_some_and(|r| r.oil_temperature_from_k >= from)
        {
            return Err(AppError::field(
                row.path("from"),
                "out_of_order",
                "rows must go up in temperature",
            ));
        }
        rows.push(LimitRow {
            oil_temperature_from_k: from,
            limit_distance_m: (kind != "decay").then_some(value),
            limit_pressure_drop_pa: (kind == "decay").then_some(value),
            limit_period_s: per,
        });
    }
    Ok(rows)
}

/// Reads a procedure body over `base` (the stored fields for an update): only the fields
/// present change; `null` clears an optional one.
fn read(
    f: &Fields,
    map: &Map<String, Value>,
    base: Option<ProcedureFields>,
) -> Result<ProcedureFields, Vec<AppError>> {
    f.deny_unknown(FIELDS).map_err(|e| vec![e])?;
    let creating = base.is_none();
    let mut p = Problems::default();
    let mut out = base.unwrap_or(ProcedureFields {
        kind: "drift".into(),
        name: String::new(),
        cylinder_id: None,
        machine_kind: None,
        hold_load: None,
        posture: None,
        measure_at: None,
        oil_temperature_min_k: None,
        oil_temperature_max_k: None,
        duration_s: 0.0,
        limit_distance_m: None,
        limit_pressure_drop_pa: None,
        limit_period_s: None,
        oil_expansion_per_k: None,
        notes: None,
        limits: Vec::new(),
    });
    let changed = |name: &str| creating || touched(map, name);
    if changed("kind")
        && let Some(kind) = p.take(f.opt_choice("kind", &KINDS)).flatten()
    {
        out.kind = kind.into();
    }
    if changed("name")
        && let Some(name) = p.take(super::draft::required_text(f, "name", 200))
    {
        out.name = name;
    }
    if changed("cylinder_id") {
        out.cylinder_id = p.take(super::draft::id(f, "cylinder_id")).flatten();
    }
    if changed("machine_kind") {
        out.machine_kind = p
            .take(super::draft::text(f, "machine_kind", 100))
            .flatten()
            .map(|k| super::machine_draft::normalise_kind(&k));
    }
    for (name, slot) in [
        ("hold_load", &mut out.hold_load),
        ("posture", &mut out.posture),
        ("measure_at", &mut out.measure_at),
        ("notes", &mut out.notes),
    ] {
        if changed(name) {
            *slot = p.take(super::draft::text(f, name, 2000)).flatten();
        }
    }
    if changed("oil_temperature_min") {
        out.oil_temperature_min_k = p
            .take(super::draft::positive(
                f,
                "oil_temperature_min",
                D::Temperature,
            ))
            .flatten();
    }
    if changed("oil_temperature_max") {
        out.oil_temperature_max_k = p
            .take(super::draft::positive(
                f,
                "oil_temperature_max",
                D::Temperature,
            ))
            .flatten();
    }
    if changed("duration")
        && let Some(d) = p.take(super::draft::required_positive(f, "duration", D::Time))
    {
        out.duration_s = d;
    }
    if changed("oil_expansion") {
        out.oil_expansion_per_k = p
            .take(super::draft::positive(f, "oil_expansion", D::Expansion))
            .flatten();
    }
    if changed("limit") {
        let (amount, dimension) = limit_words(&out.kind);
        let limit = p.take(f.object("limit", "limit")).flatten();
        out.limit_distance_m = None;
        out.limit_pressure_drop_pa = None;
        out.limit_period_s = None;
        if let Some(l) = limit {
            p.take(l.deny_unknown(&[amount, "per"]));
            let value = p.take(l.quantity(amount, dimension));
            out.limit_period_s = p.take(super::draft::required_positive(&l, "per", D::Time));
            if out.kind == "decay" {
                out.limit_pressure_drop_pa = value;
            } else {
                out.limit_distance_m = value;
            }
        }
    }
    if changed("limit_table")
        && let Some(rows) = p.take(limit_table(f, &out.kind))
    {
        out.limits = rows;
    }
    match (out.cylinder_id.is_some(), out.machine_kind.is_some()) {
        (true, true) => p.push(AppError::field(
            "machine_kind",
            "conflict",
            "give cylinder_id or machine_kind, not both",
        )),
        (false, false) if !p.has("cylinder_id") && !p.has("machine_kind") => {
            p.push(AppError::field(
                "cylinder_id",
                "required",
                "give the cylinder_id this procedure is for, or the machine_kind that shares it",
            ))
        }
        _ => {}
    }
    if let (Some(lo), Some(hi)) = (out.oil_temperature_min_k, out.oil_temperature_max_k)
        && lo > hi
    {
        p.push(AppError::field(
            "oil_temperature_max",
            "out_of_range",
            "the window's top is below its bottom",
        ));
    }
    p.finish(out)
}

pub fn to_json(p: &Procedure, units: UnitSystem) -> Value {
    let (amount, dimension) = limit_words(&p.kind);
    let fixed = match (
        p.limit_distance_m.or(p.limit_pressure_drop_pa),
        p.limit_period_s,
    ) {
        (Some(a), Some(per)) => {
            json!({amount: shown(Some(a), dimension, units), "per": shown(Some(per), D::Time, units)})
        }
        _ => Value::Null,
    };
    json!({
        "id": p.id,
        "kind": p.kind,
        "name": p.name,
        "cylinder_id": p.cylinder_id,
        "machine_kind": p.machine_kind,
        "hold_load": p.hold_load,
        "posture": p.posture,
        "measure_at": p.measure_at,
        "oil_temperature_min": shown(p.oil_temperature_min_k, D::Temperature, units),
        "oil_temperature_max": shown(p.oil_temperature_max_k, D::Temperature, units),
        "duration": shown(Some(p.duration_s), D::Time, units),
        "limit": fixed,
        "limit_table": p.limits.iter().map(|r| json!({
            "from": shown(Some(r.oil_temperature_from_k), D::Temperature, units),
            amount: shown(r.limit_distance_m.or(r.limit_pressure_drop_pa), dimension, units),
            "per": shown(Some(r.limit_period_s), D::Time, units),
        })).collect::<Vec<_>>(),
        "oil_expansion": shown(p.oil_expansion_per_k, D::Expansion, units),
        "notes": p.notes,
        "created_at": p.created_at,
        "created_by": p.created_by,
        "updated_at": p.updated_at,
        "archived": p.archived_at.is_some(),
        "archived_at": p.archived_at,
        "units": units.as_str(),
    })
}

fn body_units(f: &Fields) -> ApiResult<UnitSystem> {
    f.units()
}

async fn create(
    State(state): State<AppState>,
    actor: Actor,
    Body(map): Body,
) -> ApiResult<(StatusCode, Json<Value>)> {
    let f = Fields::new(&map);
    let units = body_units(&f)?;
    if f.has("archived") {
        return Err(AppError::field(
            "archived",
            "invalid",
            "a new procedure is not archived",
        ));
    }
    let fields = read(&f, &map, None).map_err(first)?;
    let (_write, mut tx) = crate::db::begin_write(&state.db).await?;
    let stored = store::insert(&mut tx, &actor.name, &fields).await?;
    tx.commit().await?;
    Ok((StatusCode::CREATED, Json(to_json(&stored, units))))
}

async fn update(
    State(state): State<AppState>,
    actor: Actor,
    Path(id): Path<String>,
    Body(map): Body,
) -> ApiResult<Json<Value>> {
    let id = path_id(&id, "procedure")?;
    let f = Fields::new(&map);
    let units = body_units(&f)?;
    let archived = f.opt_bool("archived")?;
    let (_write, mut tx) = crate::db::begin_write(&state.db).await?;
    let before = store::get(&mut tx, id)
        .await?
        .ok_or_else(|| AppError::not_found(format!("procedure {id}")))?;
    let fields = read(&f, &map, Some(before.fields())).map_err(first)?;
    let after = store::update(&mut tx, &actor.name, id, &fields, archived).await?;
    tx.commit().await?;
    Ok(Json(to_json(&after, units)))
}

async fn show(
    State(state): State<AppState>,
    Path(id): Path<String>,
    params: Params,
) -> ApiResult<Json<Value>> {
    params.deny_unknown(&["units"])?;
    let id = path_id(&id, "procedure")?;
    let p = store::find(&state.db, id)
        .await?
        .ok_or_else(|| AppError::not_found(format!("procedure {id}")))?;
    Ok(Json(to_json(&p, params.units()?.unwrap_or_default())))
}

/// `GET /api/v1/procedures?kind=&cylinder=&machine_kind=&include_archived=&units=`.
async fn list(State(state): State<AppState>, params: Params) -> ApiResult<Json<Value>> {
    params.deny_unknown(&[
        "kind",
        "cylinder",
        "machine_kind",
        "include_archived",
        "units",
    ])?;
    let filter = ProcedureFilter {
        kind: params.choice("kind", &KINDS)?,
        cylinder_id: params.id("cylinder")?,
        machine_kind: params
            .get("machine_kind")
            .map(super::machine_draft::normalise_kind),
        include_archived: params.flag("include_archived")?,
    };
    let units = params.units()?.unwrap_or_default();
    let rows = store::list(&state.db, &filter).await?;
    Ok(Json(json!({
        "items": rows.iter().map(|p| to_json(p, units)).collect::<Vec<_>>(),
        "next_cursor": Value::Null,
    })))
}
