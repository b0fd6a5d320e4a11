//! `/account`: a logged-in person changes their own password, giving the old one. A wrong old
//! password counts as a failed login (the same throttle); a new one is checked by the password
//! rules; the change ends the person's other sessions, keeps this one going (a new session) and
//! is audited (`set_password`).

use super::ctx::PageCtx;
use super::view::FieldErrors;
use crate::app::AppState;
use crate::auth::middleware::client_address;
use crate::auth::{Actor, cookie, password, sessions, throttle, users};
use crate::db::write::WriteError;
use crate::error::AppError;
use askama::Template;
use askama_web::WebTemplate;
use axum::Router;
use axum::extract::{Form, State};
use axum::http::header::SET_COOKIE;
use axum::http::{Extensions, HeaderValue, StatusCode};
use axum::response::{IntoResponse, Response};
use axum::routing::{get, post};
use serde::Deserialize;

pub fn router() -> Router<AppState> {
    Router::new()
        .route("/account", get(show))
        .route("/account/password", post(change))
}

#[derive(Template, WebTemplate)]
#[template(path = "account.html")]
pub struct AccountPage {
    pub ctx: PageCtx,
    pub min_len: usize,
    pub notice: String,
    pub errors: FieldErrors,
}

#[derive(Deserialize)]
struct PasswordForm {
    #[serde(default)]
    old_password: String,
    #[serde(default)]
    new_password: String,
    #[serde(default)]
    repeat_password: String,
}

fn page(ctx: PageCtx) -> AccountPage {
    AccountPage {
        ctx,
        min_len: password::MIN_LEN,
        notice: String::new(),
        errors: FieldErrors::default(),
    }
}

/// Only a person logged in with a user name has a password to change (not a bearer token).
fn person(actor: &Actor) -> Result<i64, Box<Response>> {
    actor.user_id.ok_or_else(|| {
        Box::new(super::page_error(AppError::Forbidden(
            "change a password with an API token; log in with your user name".into(),
        )))
    })
}

async fn show(ctx: PageCtx, actor: Actor) -> Response {
    match person(&actor) {
        Ok(_) => page(ctx).into_response(),
        Err(refusal) => *refusal,
    }
}

async fn change(
    State(state): State<AppState>,
    ctx: PageCtx,
    actor: Actor,
    extensions: Extensions,
    Form(form): Form<PasswordForm>,
) -> Response {
    let id = match person(&actor) {
        Ok(id) => id,
        Err(refusal) => return *refusal,
    };
    match try_change(&state, &actor, id, &client_address(&extensions), &form).await {
        Ok(session) => {
            let mut done = page(ctx);
            done.notice = "Password changed. Your other sessions have ended.".into();
            done.ctx.csrf = session.csrf.clone();
            let max_age = sessions::LIFETIME.whole_seconds();
            let value = cookie::session(&session.token, max_age, cookie::secure());
            let mut response = done.into_response();
            if let Ok(value) = HeaderValue::from_str(&value) {
                response.headers_mut().insert(SET_COOKIE, value);
            }
            response
        }
        Err(Refusal::Field(field, message)) => {
            let mut refused = page(ctx);
            refused.errors.push(field, message);
            (StatusCode::UNPROCESSABLE_ENTITY, refused).into_response()
        }
        Err(Refusal::Locked) => {
            let mut refused = page(ctx);
            refused.errors.push(
                "old_password",
                "too many wrong passwords from this device; wait 15 minutes or ask an admin",
            );
            (StatusCode::TOO_MANY_REQUESTS, refused).into_response()
        }
        Err(Refusal::Failed(error)) => super::page_error(error),
    }
}

enum Refusal {
    Field(&'static str, String),
    Locked,
    Failed(AppError),
}

impl From<sqlx::Error> for Refusal {
    fn from(error: sqlx::Error) -> Self {
        Refusal::Failed(error.into())
    }
}

async fn try_change(
    state: &AppState,
    actor: &Actor,
    id: i64,
    address: &str,
    form: &PasswordForm,
) -> Result<sessions::NewSession, Refusal> {
    let user = users::find(&state.db, id)
        .await?
        .ok_or(Refusal::Failed(AppError::not_found("your account")))?;
    let standing = throttle::standing(&state.db, &user.username, address).await?;
    if standing.locked() {
        return Err(Refusal::Locked);
    }
    tokio::time::sleep(standing.delay()).await;
    let (_, hash) = users::credentials(&state.db, &user.username)
        .await?
        .ok_or(Refusal::Failed(AppError::not_found("your account")))?;
    let old = form.old_password.clone();
    let matches = tokio::task::spawn_blocking(move || password::verify(&old, &hash))
        .await
        .unwrap_or(false);
    if !matches {
        let (_write, mut tx) = crate::db::begin_write(&state.db).await?;
        throttle::record(&mut tx, &user.username, address, false).await?;
        tx.commit().await?;
        return Err(Refusal::Field(
            "old_password",
            "that is not your current password".into(),
        ));
    }
    if form.new_password != form.repeat_password {
        return Err(Refusal::Field(
            "repeat_password",
            "the two new passwords differ".into(),
        ));
    }
    match users::set_password(&state.db, actor, id, &form.new_password).await {
        Ok(_) => {}
        Err(WriteError::Invalid { message, .. }) => {
            return Err(Refusal::Field("new_password", message));
        }
        Err(other) => return Err(Refusal::Failed(other.into())),
    }
    sessions::create(&state.db, id).await.map_err(|e| match e {
        sessions::SessionError::Db(e) => Refusal::from(e),
        other => Refusal::Failed(AppError::internal(other)),
    })
}
