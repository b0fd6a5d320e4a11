//! `/api/v1/cylinders/{id}/decay-tests`: pressure-decay tests (the cylinder blocked at end of
//! stroke, one end pressurised) analysed as `POST /api/v1/calc/pressure-decay` answers and
//! stored append-only with the readings, the analysis and the calculation version.

use super::calc_input::{DECAY_FIELDS, calc_error, parse_cylinder_request, parse_decay_readings};
use super::calc_output::decay_response;
use super::decision_answer;
use super::draft::{Problems, first};
use super::input::{Body, Fields};
use super::paging::path_id;
use super::shop_answer::{
    all_items, cylinder_and_machine, refuse_archived, stored_answer, stored_json,
};
use super::shop_input::{self, si};
use super::shop_request::cylinder_request;
use super::test_body::{accepted, complete_request, read_head};
use crate::app::AppState;
use crate::auth::Actor;
use crate::calc::CALC_VERSION;
use crate::calc::decay::analyse_decay;
use crate::calc::decision_findings::decay_ruling;
use crate::calc::quantity::Dimension as D;
use crate::db::Db;
use crate::db::cylinders::Cylinder;
use crate::db::decay_tests::{self as store, DecayTest, NewDecayTest};
use crate::db::machines::Machine;
use crate::db::procedures::Procedure;
use crate::db::records::Stored;
use crate::error::{ApiResult, AppError};
use axum::extract::{Path, State};
use axum::http::StatusCode;
use axum::routing::get;
use axum::{Json, Router};
use serde_json::{Map, Value, json};

pub fn router() -> Router<AppState> {
    Router::new()
        .route("/api/v1/cylinders/{id}/decay-tests", get(list).post(create))
        .route("/api/v1/decay-tests/{id}", get(show))
}

const CALC_FIELDS: &[&str] = &[
    "load",
    "load_direction",
    "oil_expansion",
    "bulk_modulus",
    "cap_line_volume",
    "rod_line_volume",
    "entrained_air",
    "units",
];

pub fn body_fields() -> Vec<&'static str> {
    accepted(DECAY_FIELDS, CALC_FIELDS)
}

fn check_readings(f: &Fields, p: &mut Problems) {
    p.take(f.choice("pressurised_end", &["cap", "rod"]));
    p.take(super::draft::required_positive(f, "duration", D::Time));
    p.take(super::plausible::limit(f, "pressure", D::Pressure));
    for name in ["pressure_start", "pressure_end"] {
        p.take(f.gauge_pressure(name));
    }
    for name in ["other_pressure_start", "other_pressure_end"] {
        p.take(f.opt_gauge_pressure(name));
    }
    p.take(f.opt_quantity("bulk_modulus", D::Pressure));
    for name in ["oil_temperature_start", "oil_temperature_end"] {
        p.take(f.quantity(name, D::Temperature));
    }
    p.take(f.opt_quantity("load", D::Force));
    p.take(f.opt_choice("load_direction", &["retract", "extend"]));
    p.take(f.opt_quantity("oil_expansion", D::Expansion));
    for name in ["cap_line_volume", "rod_line_volume"] {
        p.take(f.opt_quantity(name, D::Volume));
    }
    p.take(f.units());
}

/// Reads a decay-test body for `cylinder`, builds the calculation request, runs the analysis
/// and returns the record to store; every problem names its field.
pub async fn prepare(
    db: &Db,
    cylinder: &Cylinder,
    machine: &Machine,
    body: &Map<String, Value>,
    user: Option<&str>,
) -> Result<NewDecayTest, Vec<AppError>> {
    let f = Fields::new(body);
    f.deny_unknown(&body_fields()).map_err(|e| vec![e])?;
    let head = read_head(db, &f, "decay", (cylinder, machine), user, check_readings).await?;
    // A blocked cylinder at end of stroke holds no load of its own; the cylinder's load is
    // still given to the core for its ratings and hazards, and a zero load when none is known.
    let mut request = match cylinder_request(db, cylinder, f.has("load")).await {
        Ok(r) => r,
        Err(_) => {
            let mut r = cylinder_request(db, cylinder, true)
                .await
                .map_err(|e| vec![e])?;
            r.insert("load".into(), si(0.0, D::Force));
            r
        }
    };
    let sent = DECAY_FIELDS.iter().chain(CALC_FIELDS);
    let procedure = head.procedure.as_ref();
    complete_request(
        &mut request,
        &f,
        sent,
        (cylinder, procedure),
        ("pressure", D::Pressure),
    )
    .map_err(|e| vec![e])?;
    analyse(cylinder, procedure, request, head.common, head.ambient).map_err(|e| vec![e])
}

fn analyse(
    cylinder: &Cylinder,
    procedure: Option<&Procedure>,
    request: Map<String, Value>,
    record: shop_input::Common,
    ambient: Option<f64>,
) -> Result<NewDecayTest, AppError> {
    let rf = Fields::new(&request);
    let units = rf.units()?;
    let input = parse_cylinder_request(&rf)?;
    let readings = parse_decay_readings(&rf)?;
    let report = analyse_decay(&input, &readings, units).map_err(calc_error)?;
    let ruling = decay_ruling(&input, &readings, &report, units).map_err(calc_error)?;
    let mut analysis = decay_response(&report, units);
    decision_answer::add(&mut analysis, &ruling);
    Ok(NewDecayTest {
        cylinder_id: cylinder.id,
        procedure_id: procedure.map(|p| p.id),
        tested_at: record.at.unwrap_or_else(crate::db::now_rfc3339),
        technician: record.signer.unwrap_or_default(),
        pressurised_end: readings.pressurised_end.as_str().to_string(),
        duration_s: readings.duration,
        pressure_start_pa: readings.pressure_start,
        pressure_end_pa: readings.pressure_end,
        other_pressure_start_pa: readings.other_pressure_start,
        other_pressure_end_pa: readings.other_pressure_end,
        oil_temperature_start_k: readings.oil_temperature_start,
        oil_temperature_end_k: readings.oil_temperature_end,
        ambient_temperature_k: ambient,
        limit_pressure_drop_pa: readings.limit.map(|l| l.pressure),
        limit_period_s: readings.limit.map(|l| l.per),
        readings_json: Value::Object(request).to_string(),
        analysis_json: analysis.to_string(),
        calc_version: CALC_VERSION.to_string(),
        verdict: report.verdict.as_str().to_string(),
        diagnosis: report.diagnosis.as_str().to_string(),
        pressure_change_pa: report.measured_change,
        thermal_pressure_change_pa: report.thermal_change,
        scaled_drop_pa: report.scaled_drop,
        scaled_period_s: report.limit.map_or(3600.0, |l| l.per),
        flags: shop_input::temperature_flags(
            procedure,
            readings.oil_temperature_start,
            readings.oil_temperature_end,
        ),
        notes: record.notes,
        client_token: record.token,
        amends_id: record.amends,
        decision: ruling.decision.as_str().to_string(),
        decision_json: decision_answer::stored(&ruling),
        signed_by_user_id: None,
    })
}

pub async fn store(db: &Db, actor: &Actor, new: &NewDecayTest) -> ApiResult<Stored<DecayTest>> {
    let mut new = new.clone();
    new.signed_by_user_id = actor.user_id;
    let (_write, mut tx) = crate::db::begin_write(db).await?;
    let stored = store::insert(&mut tx, &actor.name, &new).await?;
    tx.commit().await?;
    Ok(stored)
}

pub fn to_json(t: &DecayTest) -> Value {
    let decided = decision_answer::of_record(
        t.decision.as_deref(),
        t.decision_json.as_deref(),
        (Some(&t.verdict), Some(&t.diagnosis), None),
    );
    let mut answer = json!({
        "id": t.id,
        "cylinder_id": t.cylinder_id,
        "procedure_id": t.procedure_id,
        "tested_at": t.tested_at,
        "technician": t.technician,
        "readings": stored_json(&t.readings_json),
        "analysis": stored_json(&t.analysis_json),
        "calc_version": t.calc_version,
        "verdict": t.verdict,
        "diagnosis": t.diagnosis,
        "flags": t.flag_list(),
        "notes": t.notes,
        "client_token": t.client_token,
        "amends": t.amends_id,
        "amended_by": t.amended_by_id,
        "in_force": t.in_force(),
        "created_at": t.created_at,
        "created_by": t.created_by,
    });
    decision_answer::add_to_record(&mut answer, decided, &t.created_by, &t.technician);
    answer
}

async fn create(
    State(state): State<AppState>,
    actor: Actor,
    Path(id): Path<String>,
    Body(map): Body,
) -> ApiResult<(StatusCode, Json<Value>)> {
    let (cylinder, machine) = cylinder_and_machine(&state.db, &id).await?;
    refuse_archived(&cylinder)?;
    let user = actor.user_id.map(|_| actor.name.as_str());
    let new = prepare(&state.db, &cylinder, &machine, &map, user)
        .await
        .map_err(first)?;
    let stored = store(&state.db, &actor, &new).await?;
    Ok(stored_answer(&stored, to_json))
}

async fn list(State(state): State<AppState>, Path(id): Path<String>) -> ApiResult<Json<Value>> {
    let (cylinder, _) = cylinder_and_machine(&state.db, &id).await?;
    let rows = store::of_cylinder(&state.db, cylinder.id).await?;
    Ok(all_items(&rows, to_json))
}

async fn show(State(state): State<AppState>, Path(id): Path<String>) -> ApiResult<Json<Value>> {
    let id = path_id(&id, "decay test")?;
    let t = store::find(&state.db, id)
        .await?
        .ok_or_else(|| AppError::not_found(format!("decay test {id}")))?;
    Ok(Json(to_json(&t)))
}
