//! What a registry write can fail with, in storage terms (no HTTP here): the HTTP layers map
//! it to 404, 409 or 422 naming the field; and the small rules every archivable record's
//! update shares (what `archived_at` becomes, which audit action a change is).

use std::fmt;

/// Why a write to the registry was refused or failed.
#[derive(Debug)]
pub enum WriteError {
    /// The record to change does not exist; names the kind of record (`machine`).
    NotFound(&'static str),
    /// A value refers to something that does not exist or cannot be used (an unknown site).
    Invalid {
        field: &'static str,
        message: String,
    },
    /// The value clashes with a stored record (a duplicate unit number).
    Conflict {
        field: &'static str,
        message: String,
    },
    /// The database failed.
    Db(sqlx::Error),
}

impl WriteError {
    pub fn invalid(field: &'static str, message: impl Into<String>) -> Self {
        WriteError::Invalid {
            field,
            message: message.into(),
        }
    }

    pub fn conflict(field: &'static str, message: impl Into<String>) -> Self {
        WriteError::Conflict {
            field,
            message: message.into(),
        }
    }
}

impl From<sqlx::Error> for WriteError {
    fn from(error: sqlx::Error) -> Self {
        WriteError::Db(error)
    }
}

impl fmt::Display for WriteError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            WriteError::NotFound(what) => write!(f, "{what} not found"),
            WriteError::Invalid { field, message } | WriteError::Conflict { field, message } => {
                write!(f, "{field}: {message}")
            }
            WriteError::Db(error) => write!(f, "database error: {error}"),
        }
    }
}

impl std::error::Error for WriteError {}

/// True when `error` is a UNIQUE constraint violation.
pub fn is_unique_violation(error: &sqlx::Error) -> bool {
    error
        .as_database_error()
        .is_some_and(|e| e.is_unique_violation())
}

/// Maps a UNIQUE violation to `conflict()` and any other database error to `WriteError::Db`.
pub fn unique_as(conflict: impl FnOnce() -> WriteError) -> impl FnOnce(sqlx::Error) -> WriteError {
    move |e| {
        if is_unique_violation(&e) {
            conflict()
        } else {
            e.into()
        }
    }
}

/// A JSON snapshot of a record for the audit log.
pub fn snapshot<T: serde::Serialize>(record: &T) -> serde_json::Value {
    serde_json::to_value(record).unwrap_or(serde_json::Value::Null)
}

/// The `archived_at` an update leaves: unchanged when `archived` is `None`, cleared by
/// `Some(false)`, and by `Some(true)` kept when already archived, else set to `now()`.
pub fn archived_at_after(
    current: &Option<String>,
    archived: Option<bool>,
    now: impl FnOnce() -> String,
) -> Option<String> {
    match archived {
        None => current.clone(),
        Some(false) => None,
        Some(true) => current.clone().or_else(|| Some(now())),
    }
}

/// The audit action of an update, from `archived_at` before and after: `archive`, `restore`
/// or `update`.
pub fn change_action(before: &Option<String>, after: &Option<String>) -> &'static str {
    match (before, after) {
        (None, Some(_)) => "archive",
        (Some(_), None) => "restore",
        _ => "update",
    }
}
