//! Service status of machines and cylinders: where each stands (status, open restrictions,
//! the records that caused them and their retests), the status history, and a manager's
//! approval of a return to service (`POST /api/v1/machines/{id}/return-to-service`, the
//! two-person rule of `db::service_return`).

use super::input::{Body, Fields};
use super::paging::path_id;
use super::shop_answer::cylinder_and_machine;
use crate::app::AppState;
use crate::auth::Actor;
use crate::db::machines;
use crate::db::service_return::{self, Refusal, Standing};
use crate::db::status::{StatusChange, Who};
use crate::error::{ApiResult, AppError};
use axum::extract::{Path, State};
use axum::routing::{get, post};
use axum::{Json, Router};
use serde_json::{Value, json};

pub fn router() -> Router<AppState> {
    Router::new()
        .route(
            "/api/v1/machines/{id}/return-to-service",
            post(return_to_service),
        )
        .route("/api/v1/machines/{id}/status-history", get(machine_history))
        .route(
            "/api/v1/cylinders/{id}/status-history",
            get(cylinder_history),
        )
}

/// One status change as the API shows it.
pub fn change_json(c: &StatusChange) -> Value {
    json!({
        "id": c.id,
        "at": c.at,
        "by": c.actor,
        "machine_id": c.machine_id,
        "cylinder_id": c.cylinder_id,
        "machine_status": c.machine_status,
        "cylinder_status": c.cylinder_status,
        "decision": c.decision,
        "reason": c.reason,
        "restrictions": c.restrictions(),
        "record": {"kind": c.record_kind, "id": c.record_id},
        "note": c.note,
    })
}

/// A standing as the API shows it.
pub fn standing_json(s: &Standing) -> Value {
    json!({
        "status": s.status,
        "restrictions": s.restrictions,
        "eligible_for_return": s.eligible(),
        "open_causes": s.causes.iter().map(|c| json!({
            "change": change_json(&c.change),
            "retest": c.retest.as_ref().map(|r| json!({
                "kind": r.kind, "id": r.id, "signed_by": r.created_by, "at": r.created_at,
            })),
        })).collect::<Vec<_>>(),
    })
}

async fn machine_history(
    State(state): State<AppState>,
    Path(id): Path<String>,
) -> ApiResult<Json<Value>> {
    let id = path_id(&id, "machine")?;
    machines::find(&state.db, id)
        .await?
        .ok_or_else(|| AppError::not_found(format!("machine {id}")))?;
    let mut conn = state.db.acquire().await?;
    let standing = service_return::machine_standing(&mut conn, id).await?;
    let rows = crate::db::status::history(&mut conn, crate::db::status::Of::Machine(id)).await?;
    let mut answer = standing_json(&standing);
    answer["machine_id"] = json!(id);
    answer["items"] = json!(rows.iter().map(change_json).collect::<Vec<_>>());
    Ok(Json(answer))
}

async fn cylinder_history(
    State(state): State<AppState>,
    Path(id): Path<String>,
) -> ApiResult<Json<Value>> {
    let (cylinder, machine) = cylinder_and_machine(&state.db, &id).await?;
    let mut conn = state.db.acquire().await?;
    let standing = service_return::cylinder_standing(&mut conn, machine.id, cylinder.id).await?;
    let rows =
        crate::db::status::history(&mut conn, crate::db::status::Of::Cylinder(cylinder.id)).await?;
    let mut answer = standing_json(&standing);
    answer["cylinder_id"] = json!(cylinder.id);
    answer["machine_id"] = json!(machine.id);
    answer["items"] = json!(rows.iter().map(change_json).collect::<Vec<_>>());
    Ok(Json(answer))
}

/// Approves a return to service for `actor`; the errors name why (409 not eligible or nothing
/// to return, 403 the approver signed the retest, 404, 422 for the note).
pub async fn approve(
    state: &AppState,
    actor: &Actor,
    machine_id: i64,
    note: &str,
) -> ApiResult<Vec<StatusChange>> {
    let machine = machines::find(&state.db, machine_id)
        .await?
        .ok_or_else(|| AppError::not_found(format!("machine {machine_id}")))?;
    if machine.archived_at.is_some() {
        return Err(AppError::conflict("machine", "this machine is archived"));
    }
    let who = Who {
        name: &actor.name,
        user_id: actor.user_id,
    };
    let (_write, mut tx) = crate::db::begin_write(&state.db).await?;
    let rows = match service_return::approve(&mut tx, who, machine_id, note).await {
        Ok(rows) => rows,
        Err(Refusal::NothingToReturn(why)) => return Err(AppError::conflict("machine", why)),
        Err(Refusal::NotEligible(why)) => return Err(AppError::conflict("retest", why)),
        Err(Refusal::OwnRetest(why)) => return Err(AppError::Forbidden(why)),
        Err(Refusal::Write(e)) => return Err(e.into()),
    };
    tx.commit().await?;
    Ok(rows)
}

/// `POST /api/v1/machines/{id}/return-to-service` with `{"note": "..."}`: 200 with the
/// machine's new standing and the changes written.
async fn return_to_service(
    State(state): State<AppState>,
    actor: Actor,
    Path(id): Path<String>,
    Body(map): Body,
) -> ApiResult<Json<Value>> {
    let id = path_id(&id, "machine")?;
    let f = Fields::new(&map);
    f.deny_unknown(&["note"])?;
    let note = super::draft::required_text(&f, "note", 2000)?;
    if note.trim().is_empty() {
        return Err(AppError::field(
            "note",
            "required",
            "say what was repaired and retested before the machine returns to service",
        ));
    }
    let rows = approve(&state, &actor, id, &note).await?;
    let mut conn = state.db.acquire().await?;
    let standing = service_return::machine_standing(&mut conn, id).await?;
    let mut answer = standing_json(&standing);
    answer["machine_id"] = json!(id);
    answer["changes"] = json!(rows.iter().map(change_json).collect::<Vec<_>>());
    Ok(Json(answer))
}
