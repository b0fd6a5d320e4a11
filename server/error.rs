//! One error type for the whole HTTP layer. API routes render it as JSON
//! `{"error": {"code", "message", "field"}}`; internal causes are logged, never sent.

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

    pub fn status(&self) -> StatusCode {
        match self {
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
        let (code, message, field) = self.parts();
        let body = json!({"error": {"code": code, "message": message, "field": field}});
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
