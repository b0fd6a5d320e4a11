//! Shared pieces for reading registry records from a JSON object (API body, page form or
//! demo file): collect every problem, not only the first, so a form can mark each field.

use super::input::Fields;
use crate::calc::quantity::Dimension;
use crate::error::AppError;
use serde_json::{Map, Value};
use time::Date;
use time::macros::format_description;

/// Every problem found in one record, in field order.
#[derive(Debug, Default)]
pub struct Problems(pub Vec<AppError>);

impl Problems {
    /// Keeps the value of a good result; records the error of a bad one.
    pub fn take<T>(&mut self, result: Result<T, AppError>) -> Option<T> {
        match result {
            Ok(value) => Some(value),
            Err(error) => {
                self.0.push(error);
                None
            }
        }
    }

    pub fn push(&mut self, error: AppError) {
        self.0.push(error);
    }

    /// True when a problem was already recorded for `field` (so a later check can skip it).
    pub fn has(&self, field: &str) -> bool {
        self.0.iter().any(|e| e.parts().2.as_deref() == Some(field))
    }

    pub fn is_empty(&self) -> bool {
        self.0.is_empty()
    }

    /// `Ok(value)` when no problem was recorded, else every problem.
    pub fn finish<T>(self, value: T) -> Result<T, Vec<AppError>> {
        if self.0.is_empty() {
            Ok(value)
        } else {
            Err(self.0)
        }
    }
}

/// Every problem as one error for the JSON API: `error` names the first, `errors` lists all
/// (`AppError::several`). The name is kept from when only the first was sent.
pub fn first(problems: Vec<AppError>) -> AppError {
    AppError::several(problems)
}

/// True when the object has the key, even with `null` (which clears an optional field).
pub fn touched(map: &Map<String, Value>, name: &str) -> bool {
    map.contains_key(name)
}

/// A required text of at most `max` characters; `null` or empty is refused.
pub fn required_text(f: &Fields, name: &str, max: usize) -> Result<String, AppError> {
    let text = f.string(name)?;
    check_length(f, name, &text, max)?;
    Ok(text)
}

/// An optional text of at most `max` characters; empty counts as absent.
pub fn text(f: &Fields, name: &str, max: usize) -> Result<Option<String>, AppError> {
    let text = f.opt_string(name)?;
    if let Some(t) = &text {
        check_length(f, name, t, max)?;
    }
    Ok(text)
}

fn check_length(f: &Fields, name: &str, text: &str, max: usize) -> Result<(), AppError> {
    if text.chars().count() > max {
        return Err(AppError::field(
            f.path(name),
            "too_long",
            format!("at most {max} characters"),
        ));
    }
    Ok(())
}

/// An optional quantity that must be above zero (a size, a rating).
pub fn positive(f: &Fields, name: &str, dimension: Dimension) -> Result<Option<f64>, AppError> {
    match f.opt_quantity(name, dimension)? {
        Some(v) if v <= 0.0 => Err(AppError::field(
            f.path(name),
            "out_of_range",
            format!("the {} must be above zero", dimension.name()),
        )),
        other => Ok(other),
    }
}

/// A quantity that must be given and be above zero.
pub fn required_positive(f: &Fields, name: &str, dimension: Dimension) -> Result<f64, AppError> {
    match positive(f, name, dimension)? {
        Some(value) => Ok(value),
        // Absent: `quantity` answers with the "required" error naming the field.
        None => f.quantity(name, dimension),
    }
}

/// An optional id of another record (a whole number from 1).
pub fn id(f: &Fields, name: &str) -> Result<Option<i64>, AppError> {
    f.opt_integer(name, 1, i64::MAX)
}

/// An optional date `YYYY-MM-DD`, kept as text; refused when after `latest` if given.
pub fn date(f: &Fields, name: &str, latest: Option<Date>) -> Result<Option<String>, AppError> {
    let Some(date) = f.opt_date(name)? else {
        return Ok(None);
    };
    if let Some(latest) = latest
        && date > latest
    {
        return Err(AppError::field(
            f.path(name),
            "in_future",
            "this date is in the future",
        ));
    }
    Ok(Some(date_text(date)))
}

/// Today's date (UTC).
pub fn today() -> Date {
    time::OffsetDateTime::now_utc().date()
}

/// The latest date accepted for something that has already happened: tomorrow (UTC), so a
/// shop ahead of UTC is not refused.
pub fn latest_past() -> Date {
    today().next_day().unwrap_or_else(today)
}

/// A date as `YYYY-MM-DD`.
pub fn date_text(date: Date) -> String {
    date.format(format_description!("[year]-[month]-[day]"))
        .unwrap_or_default()
}

/// A unit number, serial or site name as stored (`db::names::clean`: NFKC, trimmed, no control
/// or invisible characters); an empty result is refused as missing.
pub fn name(f: &Fields, field: &str, text: &str) -> Result<String, AppError> {
    match crate::db::names::clean(text) {
        Ok(clean) if clean.is_empty() => Err(AppError::field(
            f.path(field),
            "required",
            "a name with visible characters is required",
        )),
        Ok(clean) => Ok(clean),
        Err(message) => Err(AppError::field(f.path(field), "invalid_character", message)),
    }
}
