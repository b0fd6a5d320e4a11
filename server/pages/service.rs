//! `POST /machines/{id}/return-to-service`: a manager's return of a machine from its page
//! (the form beside the status panel). The rule is `db::service_return`'s, through the same
//! call as the API; a refusal is a page naming why.

use super::forms::Posted;
use super::page_error;
use crate::api::paging::path_id;
use crate::app::AppState;
use crate::auth::Actor;
use crate::error::AppError;
use axum::Router;
use axum::extract::{Path, State};
use axum::response::{IntoResponse, Redirect, Response};
use axum::routing::post;

pub fn router() -> Router<AppState> {
    Router::new().route("/machines/{id}/return-to-service", post(return_to_service))
}

async fn return_to_service(
    State(state): State<AppState>,
    actor: Actor,
    Path(id): Path<String>,
    form: Posted,
) -> Response {
    let id = match path_id(&id, "machine") {
        Ok(id) => id,
        Err(e) => return page_error(e),
    };
    let note = form.values().get("note").cloned().unwrap_or_default();
    if note.trim().is_empty() {
        return page_error(AppError::field(
            "note",
            "required",
            "Say what was repaired and retested before the machine returns to service.",
        ));
    }
    match crate::api::service_status::approve(&state, &actor, id, note.trim()).await {
        Ok(_) => Redirect::to(&format!("/machines/{id}")).into_response(),
        Err(e) => page_error(e),
    }
}
