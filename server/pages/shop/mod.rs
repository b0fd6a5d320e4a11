//! The shop on a tablet: find the unit by its number, pick the cylinder, run a drift test or
//! a pressure-decay test, record an inspection; every record shown with its analysis, and the
//! cylinder's history with its trend. Also the printable labels with a QR code.

use crate::api::paging::path_id;
use crate::app::AppState;
use crate::db::cylinders::{self, Cylinder};
use crate::db::machines::{self, Machine};
use crate::db::procedures::{self, Procedure};
use crate::error::AppError;
use crate::pages::page_error;
use axum::Router;
use axum::http::StatusCode;
use axum::http::header::{CACHE_CONTROL, CONTENT_TYPE, LOCATION};
use axum::response::{IntoResponse, Response};
use axum::routing::get;

pub mod chart;
pub mod cylinder;
pub mod decay;
pub mod drift;
pub mod drift_page;
pub mod find;
pub mod form;
pub mod history;
pub mod inspection;
pub mod inspection_record;
pub mod label;
pub mod qr;
pub mod record;
pub mod words;
pub mod worklist;

const CSS: &str = include_str!("../../../web/static/shop.css");

pub fn router() -> Router<AppState> {
    Router::new()
        .route("/static/shop.css", get(css))
        .route("/shop", get(find::index))
        .route("/shop/machines/{id}", get(find::machine))
        .route(
            "/shop/machines/{id}/inspection",
            get(inspection::show_form).post(inspection::submit),
        )
        .route("/shop/cylinders/{id}", get(cylinder::show))
        .route(
            "/shop/cylinders/{id}/drift-test",
            get(drift::show_form).post(drift::submit),
        )
        .route(
            "/shop/cylinders/{id}/decay-test",
            get(decay::show_form).post(decay::submit),
        )
        .route("/shop/drift-tests/{id}", get(record::drift_test))
        .route("/shop/decay-tests/{id}", get(record::decay_test))
        .route("/shop/inspections/{id}", get(inspection_record::show))
        .route("/machines/{id}/label", get(label::machine))
        .route("/cylinders/{id}/label", get(label::cylinder))
}

async fn css() -> impl IntoResponse {
    (
        [
            (CONTENT_TYPE, "text/css; charset=utf-8"),
            (CACHE_CONTROL, "public, max-age=3600"),
        ],
        CSS,
    )
}

/// A cylinder and its machine from a path id, or the error page.
pub async fn load_cylinder(state: &AppState, id: &str) -> Result<(Cylinder, Machine), Response> {
    let id = path_id(id, "cylinder").map_err(page_error)?;
    let c = cylinders::find(&state.db, id)
        .await
        .map_err(|e| page_error(e.into()))?
        .ok_or_else(|| page_error(AppError::not_found(format!("cylinder {id}"))))?;
    let m = machines::find(&state.db, c.machine_id)
        .await
        .map_err(|e| page_error(e.into()))?
        .ok_or_else(|| page_error(AppError::not_found(format!("machine {}", c.machine_id))))?;
    Ok((c, m))
}

/// The `kind` procedures (`drift`, `decay`) that apply to a cylinder, and the one chosen: the
/// `asked` one when it is among them (none when it is not), else the first.
pub async fn procedures_for(
    state: &AppState,
    (cylinder, machine): (&Cylinder, &Machine),
    kind: &str,
    asked: Option<i64>,
) -> Result<(Vec<Procedure>, Option<i64>), Response> {
    let procedures = procedures::for_cylinder(&state.db, cylinder.id, &machine.kind, kind)
        .await
        .map_err(|e| page_error(e.into()))?;
    let chosen = match asked {
        Some(p) if procedures.iter().any(|x| x.id == p) => Some(p),
        Some(_) => None,
        None => procedures.first().map(|p| p.id),
    };
    Ok((procedures, chosen))
}

/// A machine from a path id, or the error page.
pub async fn load_machine(state: &AppState, id: &str) -> Result<Machine, Response> {
    let id = path_id(id, "machine").map_err(page_error)?;
    machines::find(&state.db, id)
        .await
        .map_err(|e| page_error(e.into()))?
        .ok_or_else(|| page_error(AppError::not_found(format!("machine {id}"))))
}

/// `303 See Other` to a stored record's page; `repeated` marks a resubmit that found the record
/// already stored.
pub fn redirect_to(path: &str, repeated: bool) -> Response {
    let target = if repeated {
        format!("{path}?repeat=1")
    } else {
        path.to_string()
    };
    (StatusCode::SEE_OTHER, [(LOCATION, target)]).into_response()
}
