//! The authentication layer: finds who is behind a request (bearer token or session cookie),
//! puts `Actor` and `CsrfToken` into its extensions, applies the access table in `rules`, and
//! checks the anti-forgery token of every session-cookie request that changes something.

use super::rules::{self, Access};
use super::{Actor, cookie, secret, sessions, tokens};
use crate::app::{AppState, BODY_LIMIT};
use crate::error::AppError;
use crate::pages::ctx::{CsrfToken, PageCtx};
use axum::body::Body;
use axum::extract::{ConnectInfo, Request, State};
use axum::http::header::{CACHE_CONTROL, CONTENT_TYPE, HeaderValue, WWW_AUTHENTICATE};
use axum::http::{Extensions, Method, StatusCode};
use axum::middleware::Next;
use axum::response::{IntoResponse, Redirect, Response};
use std::net::SocketAddr;

/// How the request proved who it is; handlers such as logout read it from the extensions.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum Credential {
    Session { id: i64 },
    Bearer { token_id: i64 },
}

/// Header a script may send instead of the `csrf` form field.
pub const CSRF_HEADER: &str = "x-csrf-token";

/// The client's address as the server saw it, `unknown` when not served over TCP.
pub fn client_address(extensions: &Extensions) -> String {
    extensions
        .get::<ConnectInfo<SocketAddr>>()
        .map(|c| c.0.ip().to_string())
        .unwrap_or_else(|| "unknown".into())
}

/// The middleware: `axum::middleware::from_fn_with_state(state, authenticate)`.
pub async fn authenticate(
    State(state): State<AppState>,
    mut request: Request,
    next: Next,
) -> Response {
    let path = request.uri().path().to_string();
    let method = request.method().clone();
    let is_api = path == "/api" || path.starts_with("/api/");
    let access = rules::access(&method, &path);

    let (bearer, session) = (
        cookie::bearer(request.headers()),
        cookie::token(request.headers()),
    );
    let found = match identify(&state, bearer, session).await {
        Ok(found) => found,
        Err(error) => return error.into_response(),
    };
    let (actor, credential, csrf) = match found {
        Some((actor, credential, csrf)) => (Some(actor), Some(credential), csrf),
        None => (None, None, None),
    };
    if let Some(actor) = &actor {
        request.extensions_mut().insert(actor.clone());
    }
    if let Some(credential) = &credential {
        request.extensions_mut().insert(credential.clone());
    }
    if let Some(csrf) = &csrf {
        request.extensions_mut().insert(CsrfToken(csrf.clone()));
    }

    let Access::AtLeast(needed, what) = access else {
        return next.run(request).await;
    };
    let Some(actor) = actor else {
        return login_required(is_api, &request);
    };
    let ctx = page_ctx(&actor, csrf.as_deref());
    if actor.role < needed {
        return refuse(is_api, ctx, AppError::Forbidden(what.to_string()));
    }
    let changes = !matches!(method, Method::GET | Method::HEAD | Method::OPTIONS);
    if let (true, Some(Credential::Session { .. }), Some(expected)) = (changes, &credential, &csrf)
    {
        request = match check_csrf(request, expected).await {
            Ok(request) => request,
            Err(error) => return refuse(is_api, ctx, error),
        };
    }
    let mut response = next.run(request).await;
    response
        .headers_mut()
        .entry(CACHE_CONTROL)
        .or_insert(HeaderValue::from_static("no-store"));
    response
}

type Found = (Actor, Credential, Option<String>);

/// A bearer token wins over a cookie; an unknown or revoked one identifies nobody.
async fn identify(
    state: &AppState,
    bearer: Option<String>,
    session: Option<String>,
) -> Result<Option<Found>, AppError> {
    if let Some(token) = bearer {
        let found = tokens::lookup(&state.db, &token).await?;
        return Ok(found.map(|t| (t.actor(), Credential::Bearer { token_id: t.id }, None)));
    }
    if let Some(token) = session {
        let found = sessions::lookup(&state.db, &token).await?;
        return Ok(found.map(|s| {
            (
                s.user.actor(),
                Credential::Session { id: s.id },
                Some(s.csrf),
            )
        }));
    }
    Ok(None)
}

fn page_ctx(actor: &Actor, csrf: Option<&str>) -> PageCtx {
    PageCtx {
        user: actor.user_id.map(|_| actor.name.clone()),
        role: actor.role.as_str().to_string(),
        csrf: csrf.unwrap_or_default().to_string(),
    }
}

/// 401 JSON for the API; for pages, a redirect to the login page that comes back here.
fn login_required(is_api: bool, request: &Request) -> Response {
    if is_api {
        let mut response = AppError::Unauthorized.into_response();
        response.headers_mut().insert(
            WWW_AUTHENTICATE,
            HeaderValue::from_static("Bearer realm=\"loadhold\""),
        );
        return response;
    }
    let back = request
        .uri()
        .path_and_query()
        .map(|p| p.as_str())
        .unwrap_or("/");
    let back = if request.method() == Method::GET {
        back
    } else {
        request.uri().path()
    };
    Redirect::to(&format!("/login?next={}", urlencode(back))).into_response()
}

/// The refusal as JSON for the API, or as a page in the site's layout.
fn refuse(is_api: bool, ctx: PageCtx, error: AppError) -> Response {
    if is_api {
        return error.into_response();
    }
    let status = error.status();
    let (title, message) = match &error {
        AppError::Forbidden(what) => (
            "Not allowed".to_string(),
            format!(
                "Your role ({}) may not {what}. Ask a manager or an admin if you need this.",
                ctx.role
            ),
        ),
        other => ("Form refused".to_string(), other.parts().1),
    };
    let page = crate::pages::ErrorPage {
        ctx,
        title,
        message,
    };
    (status, page).into_response()
}

fn csrf_refused() -> AppError {
    AppError::Invalid {
        status: StatusCode::FORBIDDEN,
        code: "csrf",
        field: Some("csrf".into()),
        message: "the form's anti-forgery token is missing or out of date; reload the page and \
                  submit it again"
            .into(),
    }
}

/// Passes the request on when its `X-CSRF-Token` header or its urlencoded `csrf` field holds
/// the session's token. The form body is read (within the body limit) and handed on intact.
async fn check_csrf(request: Request, expected: &str) -> Result<Request, AppError> {
    if let Some(sent) = request.headers().get(CSRF_HEADER) {
        let sent = sent.to_str().unwrap_or("");
        return if secret::constant_time_eq(sent, expected) {
            Ok(request)
        } else {
            Err(csrf_refused())
        };
    }
    let is_form = request
        .headers()
        .get(CONTENT_TYPE)
        .and_then(|v| v.to_str().ok())
        .is_some_and(|v| v.starts_with("application/x-www-form-urlencoded"));
    if !is_form {
        return Err(csrf_refused());
    }
    let (parts, body) = request.into_parts();
    let bytes = axum::body::to_bytes(body, BODY_LIMIT)
        .await
        .map_err(|_| AppError::Invalid {
            status: StatusCode::PAYLOAD_TOO_LARGE,
            code: "too_large",
            field: None,
            message: format!("the form is larger than {} KiB", BODY_LIMIT / 1024),
        })?;
    let sent = form_value(&bytes, "csrf").unwrap_or_default();
    if !secret::constant_time_eq(&sent, expected) {
        return Err(csrf_refused());
    }
    Ok(Request::from_parts(parts, Body::from(bytes)))
}

/// The first value of `key` in an urlencoded body, decoded.
pub fn form_value(body: &[u8], key: &str) -> Option<String> {
    body.split(|&b| b == b'&').find_map(|pair| {
        let mut halves = pair.splitn(2, |&b| b == b'=');
        let name = decode(halves.next()?);
        (name == key).then(|| decode(halves.next().unwrap_or(b"")))
    })
}

fn decode(bytes: &[u8]) -> String {
    let mut out = Vec::with_capacity(bytes.len());
    let mut i = 0;
    while i < bytes.len() {
        match bytes[i] {
            b'+' => out.push(b' '),
            b'%' if i + 2 < bytes.len() => {
                let hex = std::str::from_utf8(&bytes[i + 1..i + 3]).ok();
                match hex.and_then(|h| u8::from_str_radix(h, 16).ok()) {
                    Some(b) => {
                        out.push(b);
                        i += 2;
                    }
                    None => out.push(b'%'),
                }
            }
            b => out.push(b),
        }
        i += 1;
    }
    String::from_utf8_lossy(&out).into_owned()
}

/// Percent-encodes a value for a query string.
pub fn urlencode(text: &str) -> String {
    let mut out = String::with_capacity(text.len());
    for byte in text.bytes() {
        match byte {
            b'A'..=b'Z' | b'a'..=b'z' | b'0'..=b'9' | b'-' | b'_' | b'.' | b'~' | b'/' => {
                out.push(byte as char)
            }
            _ => out.push_str(&format!("%{byte:02X}")),
        }
    }
    out
}
