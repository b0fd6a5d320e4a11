//! The JSON API under `/api/v1`. Each resource has its own module with a `router()`.

use crate::app::AppState;
use crate::error::AppError;
use axum::Router;

pub mod input;

/// Every JSON route. Add one `.merge(...)` line per module.
pub fn router() -> Router<AppState> {
    Router::new()
        // calc: .merge(calc::router())
        // registry: .merge(sites::router()).merge(machines::router()) ...
        .route("/api/{*rest}", axum::routing::any(api_not_found))
}

async fn api_not_found() -> AppError {
    AppError::not_found("this API route")
}
