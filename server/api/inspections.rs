//! `/api/v1/machines/{id}/inspections`: periodic and frequent inspections of a machine,
//! append-only. A `fail` takes the machine out of service in the same transaction; a later
//! `pass` or `pass_with_deficiencies` puts it back.

use super::draft::{Problems, first};
use super::input::{Body, Fields};
use super::paging::path_id;
use super::plausible;
use super::shop_answer::{all_items, stored_answer, stored_json};
use super::shop_input;
use crate::app::AppState;
use crate::auth::Actor;
use crate::calc::decision::{self, InspectionResult};
use crate::calc::decision_findings;
use crate::db::Db;
use crate::db::inspections::{self as store, Inspection, KINDS, NewInspection, RESULTS};
use crate::db::machines::{self, Machine};
use crate::db::records::Stored;
use crate::error::{ApiResult, AppError};
use axum::extract::{Path, State};
use axum::http::StatusCode;
use axum::routing::get;
use axum::{Json, Router};
use serde_json::{Map, Value, json};

pub fn router() -> Router<AppState> {
    Router::new()
        .route("/api/v1/machines/{id}/inspections", get(list).post(create))
        .route("/api/v1/inspections/{id}", get(show))
}

/// The outcome words of one inspected item.
pub const OUTCOMES: [&str; 4] = ["ok", "attention", "fail", "not_checked"];

/// The items a shop checks on every machine, in the form's order (free names are accepted
/// too). `external_leakage` carries a class from 0 to 5 as ISO/TR 11340 grades it.
pub const STANDARD_ITEMS: [(&str, &str); 6] = [
    ("hoses", "Hoses and fittings"),
    ("rod", "Cylinder rods (scoring, dents, corrosion)"),
    ("seals", "Rod seals and wipers"),
    ("mounts", "Mounts, pins and rod eyes"),
    ("structure", "Structure and welds"),
    ("external_leakage", "External leakage"),
];

const FIELDS: &[&str] = &[
    "kind",
    "performed_on",
    "hour_meter",
    "inspector",
    "result",
    "items",
    "deficiencies",
    "corrective_action",
    "client_token",
    "amends",
    "hour_meter_replaced",
];

/// Reads `items`: a list (at most 50) of `{"item", "outcome", "leakage_class", "note"}`.
fn items(f: &Fields) -> Result<Vec<Value>, AppError> {
    let list = match f.raw("items") {
        None => return Ok(Vec::new()),
        Some(Value::Array(list)) => list,
        Some(_) => {
            return Err(AppError::field(
                "items",
                "invalid",
                "must be a list of {\"item\", \"outcome\", \"leakage_class\", \"note\"}",
            ));
        }
    };
    if list.len() > 50 {
        return Err(AppError::field("items", "too_long", "at most 50 items"));
    }
    let mut out = Vec::new();
    for (i, value) in list.iter().enumerate() {
        let prefix = format!("items[{i}]");
        let Value::Object(map) = value else {
            return Err(AppError::field(prefix, "invalid", "each item is an object"));
        };
        let item = Fields::new(map);
        let named = |e: AppError| match e {
            AppError::Invalid {
                status,
                code,
                field,
                message,
            } => AppError::Invalid {
                status,
                code,
                field: field.map(|n| format!("{prefix}.{n}")),
                message,
            },
            other => other,
        };
        item.deny_unknown(&["item", "outcome", "leakage_class", "note"])
            .map_err(named)?;
        let name = super::draft::required_text(&item, "item", 60).map_err(named)?;
        let outcome = item.choice("outcome", &OUTCOMES).map_err(named)?;
        let class = item.opt_integer("leakage_class", 0, 5).map_err(named)?;
        let note = super::draft::text(&item, "note", 500).map_err(named)?;
        out.push(json!({"item": name, "outcome": outcome, "leakage_class": class, "note": note}));
    }
    Ok(out)
}

/// Reads an inspection body (API JSON or the shop form as JSON) for `machine`; every problem
/// names its field.
pub fn prepare(
    machine: &Machine,
    body: &Map<String, Value>,
    user: Option<&str>,
) -> Result<NewInspection, Vec<AppError>> {
    let f = Fields::new(body);
    f.deny_unknown(FIELDS).map_err(|e| vec![e])?;
    let mut p = Problems::default();
    let kind = p.take(f.choice("kind", &KINDS));
    let performed_on = p.take(
        super::draft::date(&f, "performed_on", Some(super::draft::latest_past())).and_then(|d| {
            d.ok_or_else(|| {
                AppError::field(
                    "performed_on",
                    "required",
                    "the date of the inspection, YYYY-MM-DD, is required",
                )
            })
        }),
    );
    let hour_meter = p.take(plausible::hours(&f, "hour_meter")).flatten();
    let replaced = p
        .take(f.opt_bool("hour_meter_replaced"))
        .flatten()
        .unwrap_or(false);
    if let Some(day) = &performed_on {
        p.take(plausible::record_date(machine, "performed_on", day));
        if let Some(h) = hour_meter {
            p.take(plausible::hour_meter(machine, day, h, replaced));
        }
    }
    let inspector = p.take(shop_input::signer(&f, "inspector", user));
    let result = p.take(f.choice("result", &RESULTS));
    let items = p.take(items(&f));
    let deficiencies = p
        .take(super::draft::text(&f, "deficiencies", 4000))
        .flatten();
    let corrective = p
        .take(super::draft::text(&f, "corrective_action", 4000))
        .flatten();
    let token = p.take(shop_input::client_token(&f)).flatten();
    let amends = p.take(super::draft::id(&f, "amends")).flatten();
    if let (Some(result), Some(items)) = (result, &items) {
        let failed = items.iter().any(|i| i["outcome"] == "fail");
        if result == "pass" && failed {
            p.push(AppError::field(
                "result",
                "inconsistent",
                "an item failed: record pass_with_deficiencies or fail",
            ));
        }
        if result != "pass" && deficiencies.is_none() {
            p.push(AppError::field(
                "deficiencies",
                "required",
                "describe the deficiencies found",
            ));
        }
    }
    let (Some(kind), Some(performed_on), Some(inspector), Some(result), Some(items)) =
        (kind, performed_on, inspector, result, items)
    else {
        return Err(p.0);
    };
    let ruling = decision::decide(
        &decision_findings::inspection_findings(
            InspectionResult::parse(result).unwrap_or(InspectionResult::Fail),
        ),
        Default::default(),
    );
    p.finish(NewInspection {
        machine_id: machine.id,
        kind: kind.into(),
        performed_on,
        hour_meter_h: hour_meter,
        inspector,
        result: result.into(),
        items_json: Value::Array(items).to_string(),
        deficiencies,
        corrective_action: corrective,
        client_token: token,
        amends_id: amends,
        decision: ruling.decision.as_str().to_string(),
        decision_json: super::decision_answer::stored(&ruling),
        signed_by_user_id: None,
        hour_meter_replaced: replaced && hour_meter.is_some(),
    })
}

/// Stores a prepared inspection (and its effect on the machine's status) in one transaction.
pub async fn store(db: &Db, actor: &Actor, new: &NewInspection) -> ApiResult<Stored<Inspection>> {
    let mut new = new.clone();
    new.signed_by_user_id = actor.user_id;
    let (_write, mut tx) = crate::db::begin_write(db).await?;
    let stored = store::insert(&mut tx, &actor.name, &new).await?;
    tx.commit().await?;
    Ok(stored)
}

pub fn to_json(i: &Inspection) -> Value {
    let decided = super::decision_answer::of_record(
        i.decision.as_deref(),
        i.decision_json.as_deref(),
        (None, None, Some(&i.result)),
    );
    let mut answer = json!({
        "id": i.id,
        "machine_id": i.machine_id,
        "kind": i.kind,
        "performed_on": i.performed_on,
        "hour_meter": i.hour_meter_h,
        "hour_meter_replaced": i.hour_meter_replaced,
        "inspector": i.inspector,
        "result": i.result,
        "items": stored_json(&i.items_json),
        "deficiencies": i.deficiencies,
        "corrective_action": i.corrective_action,
        "client_token": i.client_token,
        "amends": i.amends_id,
        "amended_by": i.amended_by_id,
        "in_force": i.in_force(),
        "created_at": i.created_at,
        "created_by": i.created_by,
    });
    super::decision_answer::add_to_record(&mut answer, decided, &i.created_by, &i.inspector);
    answer
}

async fn machine(db: &Db, id: &str) -> ApiResult<Machine> {
    let id = path_id(id, "machine")?;
    machines::find(db, id)
        .await?
        .ok_or_else(|| AppError::not_found(format!("machine {id}")))
}

/// `POST /api/v1/machines/{id}/inspections`: 201 with the record (200 for a repeated
/// `client_token`); the machine's status follows a fail or a clearing pass.
async fn create(
    State(state): State<AppState>,
    actor: Actor,
    Path(id): Path<String>,
    Body(map): Body,
) -> ApiResult<(StatusCode, Json<Value>)> {
    let machine = machine(&state.db, &id).await?;
    let user = actor.user_id.map(|_| actor.name.as_str());
    let new = prepare(&machine, &map, user).map_err(first)?;
    let stored = store(&state.db, &actor, &new).await?;
    Ok(stored_answer(&stored, to_json))
}

/// `GET /api/v1/machines/{id}/inspections`: every record, amended ones included, newest first.
async fn list(State(state): State<AppState>, Path(id): Path<String>) -> ApiResult<Json<Value>> {
    let machine = machine(&state.db, &id).await?;
    let rows = store::of_machine(&state.db, machine.id).await?;
    Ok(all_items(&rows, to_json))
}

/// `GET /api/v1/inspections/{id}`.
async fn show(State(state): State<AppState>, Path(id): Path<String>) -> ApiResult<Json<Value>> {
    let id = path_id(&id, "inspection")?;
    let i = store::find(&state.db, id)
        .await?
        .ok_or_else(|| AppError::not_found(format!("inspection {id}")))?;
    Ok(Json(to_json(&i)))
}
