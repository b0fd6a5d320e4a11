//! `/api/v1/calc/*`: the engineering core over JSON. No login needed; nothing is stored.

use super::calc_check::{self, Readings};
use super::calc_input::{
    self, CYLINDER_FIELDS, DECAY_FIELDS, DRIFT_FIELDS, allowed, calc_error, parse_cylinder_request,
};
use super::input::{Body, Fields};
use crate::app::AppState;
use crate::calc::{analysis, decay, decision_findings, drift};
use crate::error::ApiResult;
use axum::response::{IntoResponse, Response};
use axum::routing::post;
use axum::{Json, Router};
use serde_json::Value;

pub fn router() -> Router<AppState> {
    Router::new()
        .route("/api/v1/calc/cylinder", post(cylinder))
        .route("/api/v1/calc/drift-test", post(drift_test))
        .route("/api/v1/calc/pressure-decay", post(pressure_decay))
}

/// `POST /api/v1/calc/cylinder`: areas, holding pressures, piston seal bypass, rod-side
/// intensification, speeds, counterbalance, trapped-oil heating, ratings checks, strength.
async fn cylinder(Body(map): Body) -> ApiResult<Response> {
    let f = Fields::new(&map);
    f.deny_unknown(CYLINDER_FIELDS)?;
    let units = f.units()?;
    calc_check::check(&f, Readings::None)?;
    let input = parse_cylinder_request(&f)?;
    let report = analysis::analyse(&input, units).map_err(calc_error)?;
    Ok(Json(calc_input::cylinder_response(&input, &report, units)).into_response())
}

/// `POST /api/v1/calc/drift-test`: a position-drift test's verdict, diagnosis and reasoning.
async fn drift_test(Body(map): Body) -> ApiResult<Json<Value>> {
    let f = Fields::new(&map);
    f.deny_unknown(&allowed(CYLINDER_FIELDS, DRIFT_FIELDS))?;
    let units = f.units()?;
    calc_check::check(&f, Readings::Drift)?;
    let input = parse_cylinder_request(&f)?;
    let readings = calc_input::parse_drift_readings(&f)?;
    let report = drift::analyse_drift(&input, &readings, units).map_err(calc_error)?;
    let ruling =
        decision_findings::drift_ruling(&input, &readings, &report, units).map_err(calc_error)?;
    let mut answer = calc_input::drift_response(&report, units);
    super::decision_answer::add(&mut answer, &ruling);
    Ok(Json(answer))
}

/// `POST /api/v1/calc/pressure-decay`: a pressure-decay test at the end of stroke.
/// The load plays no part at the end of stroke, so `load` and `load_direction` may be left out.
async fn pressure_decay(Body(mut map): Body) -> ApiResult<Json<Value>> {
    if map.get("load").is_none_or(Value::is_null) {
        map.insert("load".into(), Value::String("0 N".into()));
    }
    if map.get("load_direction").is_none_or(Value::is_null) {
        map.insert("load_direction".into(), Value::String("retract".into()));
    }
    let f = Fields::new(&map);
    f.deny_unknown(&allowed(CYLINDER_FIELDS, DECAY_FIELDS))?;
    let units = f.units()?;
    calc_check::check(&f, Readings::Decay)?;
    let input = parse_cylinder_request(&f)?;
    let readings = calc_input::parse_decay_readings(&f)?;
    let report = decay::analyse_decay(&input, &readings, units).map_err(calc_error)?;
    let ruling =
        decision_findings::decay_ruling(&input, &readings, &report, units).map_err(calc_error)?;
    let mut answer = calc_input::decay_response(&report, units);
    super::decision_answer::add(&mut answer, &ruling);
    Ok(Json(answer))
}
