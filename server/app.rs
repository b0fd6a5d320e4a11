//! Application state and the router: the table of contents of every route.

use crate::db::Db;
use axum::Router;
use axum::extract::State;
use axum::http::StatusCode;
use axum::routing::get;
use std::time::Duration;
use tower_http::compression::CompressionLayer;
use tower_http::limit::RequestBodyLimitLayer;
use tower_http::timeout::TimeoutLayer;
use tower_http::trace::TraceLayer;

/// Shared state handed to every handler.
#[derive(Clone)]
pub struct AppState {
    pub db: Db,
}

impl AppState {
    pub fn new(db: Db) -> Self {
        AppState { db }
    }
}

/// Request bodies above this size are refused with 413.
pub const BODY_LIMIT: usize = 256 * 1024;

/// Builds the whole application: JSON API under `/api/v1`, pages, static assets, health.
pub fn app(state: AppState) -> Router {
    Router::new()
        .route("/healthz", get(healthz))
        .merge(crate::api::router())
        .merge(crate::pages::router())
        .with_state(state)
        .layer(RequestBodyLimitLayer::new(BODY_LIMIT))
        .layer(TimeoutLayer::with_status_code(
            StatusCode::SERVICE_UNAVAILABLE,
            Duration::from_secs(30),
        ))
        .layer(CompressionLayer::new())
        .layer(TraceLayer::new_for_http())
}

/// `GET /healthz`: 200 once the database answers, 503 otherwise.
async fn healthz(State(state): State<AppState>) -> (StatusCode, &'static str) {
    if crate::db::ping(&state.db).await {
        (StatusCode::OK, "ok")
    } else {
        (StatusCode::SERVICE_UNAVAILABLE, "database not ready")
    }
}
