//! The JSON API under `/api/v1`. Each resource has its own module with a `router()`.

use crate::app::AppState;
use crate::error::AppError;
use axum::Router;

pub mod csv_safe;
pub mod input;
pub mod json_strict;
pub mod openapi; // proof

// calc
pub mod calc;
pub mod calc_check;
pub mod calc_input;
pub mod calc_output;
pub mod calc_valves;
pub mod cylinder_answer;
pub mod decision_answer;

// registry
pub mod cylinder_draft;
pub mod cylinder_valves_draft;
pub mod cylinders;
pub mod draft;
pub mod errors;
pub mod hose_draft;
pub mod hose_ratings;
pub mod hoses;
pub mod machine_draft;
pub mod machines;
pub mod paging;
pub mod plausible;
pub mod registry;
pub mod sites;

// shop
pub mod decay_tests;
pub mod drift_tests;
pub mod inspections;
pub mod procedures;
pub mod shop_answer;
pub mod shop_input;
pub mod shop_request;
pub mod test_body;

// reports
pub mod report_rows;
pub mod reports;

// service status
pub mod safety;
pub mod service_status;

/// Every JSON route. Add one `.merge(...)` line per module.
pub fn router() -> Router<AppState> {
    Router::new()
        .merge(calc::router())
        // registry
        .merge(sites::router())
        .merge(machines::router())
        .merge(cylinders::router())
        .merge(hoses::router())
        .merge(hose_ratings::router())
        // shop
        .merge(drift_tests::router())
        .merge(decay_tests::router())
        .merge(inspections::router())
        .merge(procedures::router())
        // reports
        .merge(reports::router())
        .merge(service_status::router())
        .merge(safety::router())
        .merge(openapi::router()) // proof
        .route("/api/{*rest}", axum::routing::any(api_not_found))
}

async fn api_not_found() -> AppError {
    AppError::not_found("this API route")
}
