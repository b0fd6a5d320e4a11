//! Application state and the router: the table of contents of every route.

use crate::db::Db;
use axum::Router;
use axum::extract::State;
use axum::http::{HeaderValue, StatusCode, header};
use axum::routing::get;
use std::time::Duration;
use tower_http::compression::CompressionLayer;
use tower_http::limit::RequestBodyLimitLayer;
use tower_http::set_header::SetResponseHeaderLayer;
use tower_http::timeout::TimeoutLayer;
use tower_http::trace::TraceLayer;

/// Shared state handed to every handler.
#[derive(Clone)]
pub struct AppState {
    pub db: Db,
    /// The address clients reach the server at (`--public-url`, `LOADHOLD_PUBLIC_URL`),
    /// without a trailing slash; labels' QR codes use it, never the request's `Host` header.
    pub public_url: Option<std::sync::Arc<str>>,
}

impl AppState {
    pub fn new(db: Db) -> Self {
        AppState {
            db,
            public_url: None,
        }
    }

    /// Sets the public address (a trailing slash is dropped; empty means none).
    pub fn with_public_url(mut self, url: Option<&str>) -> Self {
        self.public_url = url
            .map(|u| u.trim().trim_end_matches('/'))
            .filter(|u| !u.is_empty())
            .map(std::sync::Arc::from);
        self
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
        // accounts: who is asking, and may they (auth::rules); CSRF on session forms
        .layer(axum::middleware::from_fn_with_state(
            state.clone(),
            crate::auth::middleware::authenticate,
        ))
        .with_state(state)
        .layer(RequestBodyLimitLayer::new(BODY_LIMIT))
        .layer(TimeoutLayer::with_status_code(
            StatusCode::SERVICE_UNAVAILABLE,
            Duration::from_secs(30),
        ))
        .layer(CompressionLayer::new())
        // accounts: security headers on every response
        .layer(SetResponseHeaderLayer::if_not_present(
            header::CONTENT_SECURITY_POLICY,
            HeaderValue::from_static(crate::auth::CONTENT_SECURITY_POLICY),
        ))
        .layer(SetResponseHeaderLayer::if_not_present(
            header::X_CONTENT_TYPE_OPTIONS,
            HeaderValue::from_static("nosniff"),
        ))
        .layer(SetResponseHeaderLayer::if_not_present(
            header::REFERRER_POLICY,
            HeaderValue::from_static("same-origin"),
        ))
        .layer(SetResponseHeaderLayer::if_not_present(
            header::X_FRAME_OPTIONS,
            HeaderValue::from_static("DENY"),
        ))
        .layer(TraceLayer::new_for_http())
}

/// `GET /healthz`: 200 once the database answers and takes a write (rolled back); 503 with
/// `Retry-After` and the reason when it is busy, cannot be written or does not answer.
async fn healthz(State(state): State<AppState>) -> axum::response::Response {
    use axum::response::IntoResponse;
    if !crate::db::ping(&state.db).await {
        let retry = [(header::RETRY_AFTER, "5")];
        return (StatusCode::SERVICE_UNAVAILABLE, retry, "database not ready").into_response();
    }
    match crate::db::health::check_write(&state.db).await {
        Ok(()) => (StatusCode::OK, "ok").into_response(),
        Err(error) => {
            let why = crate::db::health::unavailable(&error)
                .unwrap_or(crate::db::health::Unavailable::NotWritable);
            tracing::warn!(cause = %error, "health check: the database cannot be written");
            let retry = [(header::RETRY_AFTER, why.retry_after_s().to_string())];
            (StatusCode::SERVICE_UNAVAILABLE, retry, why.message()).into_response()
        }
    }
}
