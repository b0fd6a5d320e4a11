//! One error type for the whole HTTP layer. API routes render it as JSON
//! `{"error": {"code", "message", "field"}, "errors": [{"code", "message", "field"}, ...]}`:
//! `errors` lists every problem found (one for most errors), `error` is the first of them.
//! Internal causes are logged, never sent.

use axum::Json;
use axum::http::{StatusCode, header};
use axum::response::{IntoResponse, Response};
use serde_json::json;

/// Everything a handler can fail with.
#[derive(Debug, thiserror::Error)]
pub enum AppError {
    /// Input that cannot be accepted; names the field (422, or 400 for a malformed body).
    #[error("{message}")]
    Invalid {
        status: StatusCode,
        code: &'static str,
        field: Option<String>,
        message: String,
    },
    #[error("not found: {0}")]
    NotFound(String),
    /// The request clashes with stored data (duplicate unit number, stale edit).
    #[error("conflict on {field}: {message}")]
    Conflict { field: String, message: String },
    #[error("login required")]
    Unauthorized,
    #[error("forbidden: {0}")]
    Forbidden(String),
    #[error("too many attempts")]
    TooManyRequests,
    /// The database cannot take the write now: busy with another writer (try again soon) or
    /// not writable at all (read-only file, full or failing disk). 503 with `Retry-After`.
    #[error("database unavailable: {message}")]
    Unavailable {
        code: &'static str,
        message: String,
        retry_after_s: u32,
    },
    #[error("internal error: {0}")]
    Internal(String),
    /// Every problem found in one request, in field order (never empty; made by
    /// `AppError::several`). Status and `error` are those of the first.
    #[error("{}", .0.first().map(ToString::to_string).unwrap_or_default())]
    Several(Vec<AppError>),
}

impl AppError {
    /// A 422 that names the field and says what was wrong.
    pub fn field(field: impl Into<String>, code: &'static str, message: impl Into<String>) -> Self {
        AppError::Invalid {
            status: StatusCode::UNPROCESSABLE_ENTITY,
            code,
            field: Some(field.into()),
            message: message.into(),
        }
    }

    /// A 400 for a body that is not readable at all.
    pub fn bad_request(code: &'static str, message: impl Into<String>) -> Self {
        AppError::Invalid {
            status: StatusCode::BAD_REQUEST,
            code,
            field: None,
            message: message.into(),
        }
    }

    pub fn not_found(what: impl Into<String>) -> Self {
        AppError::NotFound(what.into())
    }

    pub fn conflict(field: impl Into<String>, message: impl Into<String>) -> Self {
        AppError::Conflict {
            field: field.into(),
            message: message.into(),
        }
    }

    /// Wraps an internal cause; it is logged, the client gets a generic message.
    pub fn internal(cause: impl std::fmt::Display) -> Self {
        AppError::Internal(cause.to_string())
    }

    /// Every problem as one error: the single one itself, or `Several` (none: a 400).
    pub fn several(mut problems: Vec<AppError>) -> Self {
        match problems.len() {
            0 => AppError::bad_request("invalid", "the request could not be read"),
            1 => problems.remove(0),
            _ => AppError::Several(problems),
        }
    }

    /// The problems one by one (a single error is a list of one).
    pub fn problems(&self) -> Vec<&AppError> {
        match self {
            AppError::Several(list) => list.iter().flat_map(AppError::problems).collect(),
            other => vec![other],
        }
    }

    pub fn status(&self) -> StatusCode {
        match self {
            AppError::Several(list) => list
                .first()
                .map_or(StatusCode::UNPROCESSABLE_ENTITY, AppError::status),
            AppError::Invalid { status, .. } => *status,
            AppError::NotFound(_) => StatusCode::NOT_FOUND,
            AppError::Conflict { .. } => StatusCode::CONFLICT,
            AppError::Unauthorized => StatusCode::UNAUTHORIZED,
            AppError::Forbidden(_) => StatusCode::FORBIDDEN,
            AppError::TooManyRequests => StatusCode::TOO_MANY_REQUESTS,
            AppError::Unavailable { .. } => StatusCode::SERVICE_UNAVAILABLE,
            AppError::Internal(_) => StatusCode::INTERNAL_SERVER_ERROR,
        }
    }

    /// The `Retry-After` seconds of a 503, if any.
    pub fn retry_after(&self) -> Option<u32> {
        match self {
            AppError::Unavailable { retry_after_s, .. } => Some(*retry_after_s),
            _ => None,
        }
    }

    /// `(code, message, field)` as sent to the client.
    pub fn parts(&self) -> (&'static str, String, Option<String>) {
        match self {
            AppError::Several(list) => list.first().map_or_else(
                || ("invalid", "the request could not be read".into(), None),
                AppError::parts,
            ),
            AppError::Invalid {
                code,
                field,
                message,
                ..
            } => (code, message.clone(), field.clone()),
            AppError::NotFound(what) => ("not_found", format!("{what} was not found"), None),
            AppError::Conflict { field, message } => {
                ("conflict", message.clone(), Some(field.clone()))
            }
            AppError::Unauthorized => {
                ("unauthorized", "log in or send a bearer token".into(), None)
            }
            AppError::Forbidden(what) => ("forbidden", format!("your role may not {what}"), None),
            AppError::TooManyRequests => (
                "too_many_requests",
                "too many attempts; wait a minute and try again".into(),
                None,
            ),
            AppError::Unavailable { code, message, .. } => (code, message.clone(), None),
            AppError::Internal(_) => (
                "internal",
                "the server could not complete the request; it has been logged".into(),
                None,
            ),
        }
    }
}

impl From<sqlx::Error> for AppError {
    fn from(error: sqlx::Error) -> Self {
        if let Some(unavailable) = crate::db::health::unavailable(&error) {
            tracing::warn!(cause = %error, "database unavailable");
            return AppError::Unavailable {
                code: unavailable.code(),
                message: unavailable.message().into(),
                retry_after_s: unavailable.retry_after_s(),
            };
        }
        match error {
            sqlx::Error::RowNotFound => AppError::NotFound("the record".into()),
            other => AppError::Internal(other.to_string()),
        }
    }
}

impl IntoResponse for AppError {
    fn into_response(self) -> Response {
        if let AppError::Internal(cause) = &self {
            tracing::error!(%cause, "request failed");
        }
        let status = self.status();
        let retry = self.retry_after();
        let problem = |(code, message, field): (&str, String, Option<String>)| json!({"code": code, "message": message, "field": field});
        let errors: Vec<_> = self
            .problems()
            .into_iter()
            .map(|e| problem(e.parts()))
            .collect();
        let body = json!({"error": problem(self.parts()), "errors": errors});
        let mut response = (status, Json(body)).into_response();
        if let Some(seconds) = retry {
            response
                .headers_mut()
                .insert(header::RETRY_AFTER, seconds.into());
        }
        response
    }
}

pub type ApiResult<T> = Result<T, AppError>;
