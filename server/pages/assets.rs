//! Static assets compiled into the binary.

use crate::app::AppState;
use axum::Router;
use axum::http::header::{CACHE_CONTROL, CONTENT_TYPE};
use axum::response::IntoResponse;
use axum::routing::get;

const CSS: &str = include_str!("../../web/static/app.css");
const JS: &str = include_str!("../../web/static/app.js");
const ICON: &str = include_str!("../../web/static/icon.svg");

pub fn router() -> Router<AppState> {
    Router::new()
        .route(
            "/static/app.css",
            get(|| async { asset("text/css; charset=utf-8", CSS) }),
        )
        .route(
            "/static/app.js",
            get(|| async { asset("text/javascript; charset=utf-8", JS) }),
        )
        .route(
            "/static/icon.svg",
            get(|| async { asset("image/svg+xml", ICON) }),
        )
}

fn asset(content_type: &'static str, body: &'static str) -> impl IntoResponse {
    (
        [
            (CONTENT_TYPE, content_type),
            (CACHE_CONTROL, "public, max-age=3600"),
        ],
        body,
    )
}
