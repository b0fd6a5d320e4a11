//! `/api/v1/cylinders/{id}/drift-tests`: drift tests recorded against a registry cylinder,
//! analysed by the engineering core exactly as `POST /api/v1/calc/drift-test` answers, and
//! stored append-only with the readings, the analysis and the calculation version.

use super::calc_input::{DRIFT_FIELDS, calc_error, parse_cylinder_request, parse_drift_readings};
use super::calc_output::drift_response;
use super::decision_answer;
use super::draft::{Problems, first};
use super::input::{Body, Fields};
use super::paging::path_id;
use super::shop_answer::{
    all_items, cylinder_and_machine, refuse_archived, stored_answer, stored_json,
};
use super::shop_input;
use super::shop_request::cylinder_request;
use super::test_body::{accepted, complete_request, read_head};
use crate::app::AppState;
use crate::auth::Actor;
use crate::calc::CALC_VERSION;
use crate::calc::decision_findings::drift_ruling;
use crate::calc::drift::{Movement, analyse_drift};
use crate::calc::quantity::Dimension as D;
use crate::db::Db;
use crate::db::cylinders::Cylinder;
use crate::db::drift_tests::{self as store, DriftTest, NewDriftTest};
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
        .route("/api/v1/cylinders/{id}/drift-tests", get(list).post(create))
        .route("/api/v1/drift-tests/{id}", get(show))
}

/// Fields of the calculation request a drift-test body may carry (the geometry, ratings and
/// supply pressure come from the registry).
const CALC_FIELDS: &[&str] = &[
    "position",
    "load",
    "load_direction",
    "oil_expansion",
    "bulk_modulus",
    "cap_line_volume",
    "rod_line_volume",
    "cap_port_centre",
    "rod_port_centre",
    "entrained_air",
    "units",
];

/// Every field a drift-test body accepts.
pub fn body_fields() -> Vec<&'static str> {
    accepted(DRIFT_FIELDS, CALC_FIELDS)
}

/// Checks the form of each reading so that every bad field is named at once (the core's
/// parser stops at the first).
fn check_readings(f: &Fields, problems: &mut Problems) {
    problems.take(super::draft::required_positive(f, "duration", D::Time));
    problems.take(super::plausible::limit(f, "distance", D::Length));
    problems.take(f.opt_signed_quantity("drift", D::Length));
    for name in ["start_position", "end_position", "position"] {
        problems.take(f.opt_quantity(name, D::Length));
    }
    for name in ["oil_temperature_start", "oil_temperature_end"] {
        problems.take(f.quantity(name, D::Temperature));
    }
    for name in [
        "cap_pressure_start",
        "cap_pressure_end",
        "rod_pressure_start",
        "rod_pressure_end",
    ] {
        problems.take(f.opt_gauge_pressure(name));
    }
    problems.take(f.opt_quantity("bulk_modulus", D::Pressure));
    problems.take(f.opt_quantity("load", D::Force));
    problems.take(f.opt_choice("load_direction", &["retract", "extend"]));
    problems.take(f.opt_quantity("oil_expansion", D::Expansion));
    for name in ["cap_line_volume", "rod_line_volume"] {
        problems.take(f.opt_quantity(name, D::Volume));
    }
    problems.take(f.units());
}

/// Reads a drift-test body (API JSON or the shop form, already as JSON) for `cylinder`, builds
/// the calculation request, runs the analysis and returns the record to store. Every problem
/// found is returned, each naming its field.
pub async fn prepare(
    db: &Db,
    cylinder: &Cylinder,
    machine: &Machine,
    body: &Map<String, Value>,
    user: Option<&str>,
) -> Result<NewDriftTest, Vec<AppError>> {
    let f = Fields::new(body);
    f.deny_unknown(&body_fields()).map_err(|e| vec![e])?;
    let head = read_head(db, &f, "drift", (cylinder, machine), user, check_readings).await?;
    let mut request = cylinder_request(db, cylinder, f.has("load"))
        .await
        .map_err(|e| vec![e])?;
    let sent = DRIFT_FIELDS.iter().chain(CALC_FIELDS);
    let procedure = head.procedure.as_ref();
    complete_request(
        &mut request,
        &f,
        sent,
        (cylinder, procedure),
        ("distance", D::Length),
    )
    .map_err(|e| vec![e])?;
    analyse(cylinder, procedure, request, head.common, head.ambient).map_err(|e| vec![e])
}

/// Runs the calculation request through the engineering core as the calculation API does and
/// fills the record.
fn analyse(
    cylinder: &Cylinder,
    procedure: Option<&Procedure>,
    request: Map<String, Value>,
    common: shop_input::Common,
    ambient: Option<f64>,
) -> Result<NewDriftTest, AppError> {
    let rf = Fields::new(&request);
    let units = rf.units()?;
    let input = parse_cylinder_request(&rf)?;
    let readings = parse_drift_readings(&rf)?;
    let report = analyse_drift(&input, &readings, units).map_err(calc_error)?;
    let ruling = drift_ruling(&input, &readings, &report, units).map_err(calc_error)?;
    let mut analysis = drift_response(&report, units);
    decision_answer::add(&mut analysis, &ruling);
    let (drift_m, start, end) = match readings.movement {
        Movement::Drift(d) => (Some(d), None, None),
        Movement::Positions { start, end } => (None, Some(start), Some(end)),
    };
    let p = readings.pressures;
    Ok(NewDriftTest {
        cylinder_id: cylinder.id,
        procedure_id: procedure.map(|p| p.id),
        tested_at: common.at.unwrap_or_else(crate::db::now_rfc3339),
        technician: common.signer.unwrap_or_default(),
        duration_s: readings.duration,
        drift_m,
        start_position_m: start,
        end_position_m: end,
        oil_temperature_start_k: readings.oil_temperature_start,
        oil_temperature_end_k: readings.oil_temperature_end,
        ambient_temperature_k: ambient,
        cap_pressure_start_pa: p.cap_start,
        cap_pressure_end_pa: p.cap_end,
        rod_pressure_start_pa: p.rod_start,
        rod_pressure_end_pa: p.rod_end,
        load_n: Some(input.load),
        load_direction: input.load_direction.as_str().to_string(),
        limit_distance_m: readings.limit.map(|l| l.distance),
        limit_period_s: readings.limit.map(|l| l.per),
        readings_json: Value::Object(request).to_string(),
        analysis_json: analysis.to_string(),
        calc_version: CALC_VERSION.to_string(),
        verdict: report.verdict.as_str().to_string(),
        diagnosis: report.diagnosis.as_str().to_string(),
        scaled_drift_m: report.scaled_drift,
        leak_drift_m: report.leak_drift,
        scaled_leak_drift_m: report.scaled_leak_drift,
        scaled_period_s: report.scaled_per,
        flags: shop_input::temperature_flags(
            procedure,
            readings.oil_temperature_start,
            readings.oil_temperature_end,
        ),
        notes: common.notes,
        client_token: common.token,
        amends_id: common.amends,
        decision: ruling.decision.as_str().to_string(),
        decision_json: decision_answer::stored(&ruling),
        signed_by_user_id: None,
    })
}

/// Stores a prepared drift test with its audit row, committed with whatever other drift tests
/// arrived meanwhile (`db::group_commit`: one fsync for the group); answered after the commit.
pub async fn store(db: &Db, actor: &Actor, new: &NewDriftTest) -> ApiResult<Stored<DriftTest>> {
    let (name, mut new) = (actor.name.clone(), new.clone());
    new.signed_by_user_id = actor.user_id;
    let stored = crate::db::group_commit::write(db, move |conn| {
        Box::pin(async move { store::insert(conn, &name, &new).await })
    })
    .await?;
    Ok(stored)
}

/// A stored drift test as the API shows it: the readings as sent to the core, the analysis as
/// computed, and who recorded it and when.
pub fn to_json(t: &DriftTest) -> Value {
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
        "ambient_temperature": super::paging::shown(
            t.ambient_temperature_k,
            D::Temperature,
            Default::default()
        ),
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

/// `POST /api/v1/cylinders/{id}/drift-tests`: 201 with the new record, or 200 with the record
/// a repeated `client_token` stored before.
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

/// `GET /api/v1/cylinders/{id}/drift-tests`: every record, amended ones included, oldest test
/// first.
async fn list(State(state): State<AppState>, Path(id): Path<String>) -> ApiResult<Json<Value>> {
    let (cylinder, _) = cylinder_and_machine(&state.db, &id).await?;
    let rows = store::of_cylinder(&state.db, cylinder.id).await?;
    Ok(all_items(&rows, to_json))
}

/// `GET /api/v1/drift-tests/{id}`.
async fn show(State(state): State<AppState>, Path(id): Path<String>) -> ApiResult<Json<Value>> {
    let id = path_id(&id, "drift test")?;
    let t = store::find(&state.db, id)
        .await?
        .ok_or_else(|| AppError::not_found(format!("drift test {id}")))?;
    Ok(Json(to_json(&t)))
}
