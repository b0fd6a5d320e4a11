//! `/login` and `POST /logout`: the form, the session cookie, the way back to the page the
//! person was sent from.

use super::ctx::PageCtx;
use crate::app::AppState;
use crate::auth::login::{self, LoginError};
use crate::auth::middleware::{Credential, client_address};
use crate::auth::sessions::SessionError;
use crate::auth::{Actor, cookie, events, sessions};
use askama::Template;
use askama_web::WebTemplate;
use axum::extract::{Form, Query, State};
use axum::http::header::SET_COOKIE;
use axum::http::{Extensions, HeaderMap, StatusCode};
use axum::response::{IntoResponse, Redirect, Response};
use axum::routing::{get, post};
use axum::{Router, http::HeaderValue};
use serde::Deserialize;

pub fn router() -> Router<AppState> {
    Router::new()
        .route("/login", get(show).post(submit))
        .route("/logout", post(logout))
}

/// The login form.
#[derive(Template, WebTemplate)]
#[template(path = "login.html")]
pub struct LoginPage {
    pub ctx: PageCtx,
    /// The user name typed last time (kept after a refusal).
    pub username: String,
    /// Where to go after logging in: a local path.
    pub next: String,
    /// Why the last try was refused; empty on first show.
    pub message: String,
}

#[derive(Deserialize)]
struct NextQuery {
    #[serde(default)]
    next: String,
}

#[derive(Deserialize)]
struct LoginForm {
    #[serde(default)]
    username: String,
    #[serde(default)]
    password: String,
    #[serde(default)]
    next: String,
}

/// `next` if it is a path on this site, else the start page. Refuses `//host`, `/\host`,
/// schemes, control characters and a loop back to the login page.
pub fn safe_next(next: &str) -> String {
    let local = next.starts_with('/')
        && !next.starts_with("//")
        && !next.contains('\\')
        && !next.chars().any(|c| c.is_control())
        && !next.starts_with("/login")
        && !next.starts_with("/logout");
    if local {
        next.to_string()
    } else {
        "/".to_string()
    }
}

/// `next` as asked (made safe), or empty when none was asked: then the start page follows
/// the role ([`landing`]).
fn asked_next(next: &str) -> String {
    if next.trim().is_empty() {
        String::new()
    } else {
        safe_next(next)
    }
}

/// Where a login with no `next` lands: a technician on the shop, everyone else on the start
/// page.
pub fn landing(role: &str) -> &'static str {
    if role == crate::auth::Role::Technician.as_str() {
        "/shop"
    } else {
        "/"
    }
}

async fn show(ctx: PageCtx, Query(query): Query<NextQuery>) -> LoginPage {
    LoginPage {
        ctx,
        username: String::new(),
        next: asked_next(&query.next),
        message: String::new(),
    }
}

async fn submit(
    State(state): State<AppState>,
    ctx: PageCtx,
    extensions: Extensions,
    headers: HeaderMap,
    Form(form): Form<LoginForm>,
) -> Response {
    let address = client_address(&extensions);
    let next = asked_next(&form.next);
    if !super::origin::same_origin(&headers) {
        tracing::warn!(%address, "cross-site login refused");
        let page = LoginPage {
            ctx: ctx.clone(),
            username: String::new(),
            next,
            message: "This login form was sent from another site. Open the login page of \
                      this server and log in there."
                .into(),
        };
        return (StatusCode::FORBIDDEN, page).into_response();
    }
    let refused = |status: StatusCode, message: &str| {
        let page = LoginPage {
            ctx: ctx.clone(),
            username: form.username.clone(),
            next: next.clone(),
            message: message.to_string(),
        };
        (status, page).into_response()
    };
    if form.username.trim().is_empty() || form.password.is_empty() {
        return refused(
            StatusCode::UNPROCESSABLE_ENTITY,
            "Enter your user name and your password.",
        );
    }
    match login::attempt(&state.db, &form.username, &form.password, &address).await {
        Ok((user, session)) => {
            tracing::info!(user = %user.username, %address, "login");
            // A new login replaces the session this browser had, if any.
            if let Some(Credential::Session { id }) = extensions.get::<Credential>()
                && let Err(error) = sessions::end(&state.db, *id).await
            {
                return super::page_error(crate::error::AppError::from(error));
            }
            let max_age = sessions::LIFETIME.whole_seconds();
            let cookie = cookie::session(&session.token, max_age, cookie::secure());
            let target = if next.is_empty() {
                landing(&user.role).to_string()
            } else {
                next.clone()
            };
            let mut response = Redirect::to(&target).into_response();
            if let Ok(value) = HeaderValue::from_str(&cookie) {
                response.headers_mut().insert(SET_COOKIE, value);
            }
            response
        }
        Err(LoginError::Throttled(blocked)) => {
            tracing::warn!(user = %form.username, %address, ?blocked, "login throttled");
            refused(
                StatusCode::TOO_MANY_REQUESTS,
                "Too many failed logins for this account from this device. The lock lifts 15 \
                 minutes after the last failed try; logging in from another device still works, \
                 and an admin can unlock the account now.",
            )
        }
        Err(LoginError::Refused) => {
            tracing::warn!(user = %form.username, %address, "login refused");
            refused(
                StatusCode::UNAUTHORIZED,
                "That user name and password do not match an enabled account.",
            )
        }
        Err(LoginError::Session(SessionError::Db(error))) => {
            super::page_error(crate::error::AppError::from(error))
        }
        Err(LoginError::Session(error)) => {
            super::page_error(crate::error::AppError::internal(error))
        }
    }
}

/// Ends the session (if this request came with one) and clears the cookie.
async fn logout(State(state): State<AppState>, actor: Actor, extensions: Extensions) -> Response {
    if let Some(Credential::Session { id }) = extensions.get::<Credential>() {
        let detail = serde_json::json!({"address": client_address(&extensions)});
        let ended = match sessions::end(&state.db, *id).await {
            Ok(()) => {
                let user = ("user", actor.user_id.unwrap_or(0));
                events::note(&state.db, &actor.name, "logout", user, &detail).await
            }
            Err(error) => Err(error),
        };
        if let Err(error) = ended {
            return super::page_error(crate::error::AppError::from(error));
        }
    }
    let mut response = Redirect::to("/login").into_response();
    if let Ok(value) = HeaderValue::from_str(&cookie::cleared(cookie::secure())) {
        response.headers_mut().insert(SET_COOKIE, value);
    }
    response
}
