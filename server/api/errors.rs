//! How a storage write error reaches a client: 404, 409 or 422 naming the field.

use crate::db::write::WriteError;
use crate::error::AppError;

impl From<WriteError> for AppError {
    fn from(error: WriteError) -> Self {
        match error {
            WriteError::NotFound(what) => AppError::not_found(format!("the {what}")),
            WriteError::Invalid { field, message } => {
                AppError::field(field, "invalid_reference", message)
            }
            WriteError::Conflict { field, message } => AppError::conflict(field, message),
            WriteError::Db(error) => AppError::from(error),
        }
    }
}
