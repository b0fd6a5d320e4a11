//! Server-rendered pages. They work without JavaScript; `web/static/app.js` only improves them.

use crate::app::AppState;
use askama::Template;
use askama_web::WebTemplate;
use axum::Router;
use axum::http::StatusCode;
use axum::response::{IntoResponse, Redirect, Response};
use axum::routing::get;

pub mod account; // accounts
pub mod admin; // accounts
pub mod assets;
pub mod calc;
pub mod calc_fields;
pub mod calc_view;
pub mod ctx;
pub mod login; // accounts
pub mod origin; // accounts
pub mod view;

// registry
pub mod cylinder_page;
pub mod cylinders;
pub mod fleet;
pub mod forms;
pub mod hose_suggestion;
pub mod hoses;
pub mod machine_page;
pub mod machines;
pub mod pressure_chart;
pub mod safety;
pub mod sites;
pub mod valve_inputs;

// service status
pub mod danger;
pub mod service;
pub mod service_view;

// shop
pub mod shop;

// reports
pub mod report_overview;
pub mod report_views;
pub mod reports;

/// Every page route. Add one `.merge(...)` line per module.
pub fn router() -> Router<AppState> {
    Router::new()
        .route("/", get(start))
        .merge(assets::router())
        .merge(login::router()) // accounts
        .merge(account::router()) // accounts
        .merge(admin::router()) // accounts
        .merge(calc::router())
        // registry
        .merge(machines::router())
        .merge(cylinders::router())
        .merge(hoses::router())
        .merge(sites::router())
        // shop
        .merge(shop::router())
        // reports
        .merge(reports::router())
        .merge(service::router())
        .fallback(not_found)
}

/// `GET /`: the shop's work list for technicians, the fleet list for everyone else.
async fn start(ctx: ctx::PageCtx) -> Redirect {
    if ctx.role == "technician" {
        Redirect::to("/shop")
    } else {
        Redirect::to("/machines")
    }
}

/// A page-level error: a short page in the site's layout with the right status.
#[derive(Template, WebTemplate)]
#[template(path = "error.html")]
pub struct ErrorPage {
    pub ctx: ctx::PageCtx,
    pub title: String,
    pub message: String,
}

/// Renders `ErrorPage` with a status.
pub fn error_page(status: StatusCode, title: &str, message: &str) -> Response {
    let page = ErrorPage {
        ctx: ctx::PageCtx::default(),
        title: title.to_string(),
        message: message.to_string(),
    };
    (status, page).into_response()
}

async fn not_found() -> Response {
    error_page(
        StatusCode::NOT_FOUND,
        "Not found",
        "There is no page at this address. Check the unit number or go back to the fleet list.",
    )
}

/// Turns an `AppError` into a page for browsers (the API renders JSON instead).
pub fn page_error(error: crate::error::AppError) -> Response {
    let status = error.status();
    let retry = error.retry_after();
    let (_, message, _) = error.parts();
    if let crate::error::AppError::Internal(cause) = &error {
        tracing::error!(%cause, "page failed");
    }
    let mut response = error_page(
        status,
        status.canonical_reason().unwrap_or("Error"),
        &message,
    );
    if let Some(seconds) = retry {
        response
            .headers_mut()
            .insert(axum::http::header::RETRY_AFTER, seconds.into());
    }
    response
}
