//! How the shop-record endpoints (drift tests, pressure-decay tests, inspections) find what a
//! path names and answer: 201 with a new record, 200 with the one a repeated client token had
//! stored, and lists of every record with no further page.

use super::paging::path_id;
use crate::db::Db;
use crate::db::cylinders::{self, Cylinder};
use crate::db::machines::{self, Machine};
use crate::db::records::Stored;
use crate::error::{ApiResult, AppError};
use axum::Json;
use axum::http::StatusCode;
use serde_json::{Value, json};

/// The cylinder a path names (`{id}`) and its machine; 404 for either missing.
pub async fn cylinder_and_machine(db: &Db, id: &str) -> ApiResult<(Cylinder, Machine)> {
    let id = path_id(id, "cylinder")?;
    let c = cylinders::find(db, id)
        .await?
        .ok_or_else(|| AppError::not_found(format!("cylinder {id}")))?;
    let m = machines::find(db, c.machine_id)
        .await?
        .ok_or_else(|| AppError::not_found(format!("machine {}", c.machine_id)))?;
    Ok((c, m))
}

/// Refuses a new test on an archived cylinder (409 naming `cylinder`).
pub fn refuse_archived(cylinder: &Cylinder) -> ApiResult<()> {
    if cylinder.archived_at.is_some() {
        return Err(AppError::conflict(
            "cylinder",
            "this cylinder is archived; restore it before recording tests",
        ));
    }
    Ok(())
}

/// 201 with a new record, 200 with the record a repeated client token stored before.
pub fn stored_answer<T>(stored: &Stored<T>, to_json: fn(&T) -> Value) -> (StatusCode, Json<Value>) {
    let status = if stored.is_new() {
        StatusCode::CREATED
    } else {
        StatusCode::OK
    };
    (status, Json(to_json(stored.record())))
}

/// Every record as one list (no further page).
pub fn all_items<T>(rows: &[T], to_json: fn(&T) -> Value) -> Json<Value> {
    Json(json!({
        "items": rows.iter().map(to_json).collect::<Vec<_>>(),
        "next_cursor": Value::Null,
    }))
}

/// A JSON column read back (`null` if it does not parse).
pub fn stored_json(text: &str) -> Value {
    serde_json::from_str::<Value>(text).unwrap_or(Value::Null)
}
