//! Query strings of the registry's list routes: filters, `limit`/`cursor` keyset paging,
//! `units`; and the `{"items", "next_cursor"}` answer.

use crate::calc::quantity::{self, Dimension, UnitSystem};
use crate::db::page::{MAX_LIMIT, Page, Window};
use crate::error::AppError;
use axum::extract::{FromRequestParts, Query};
use axum::http::request::Parts;
use serde_json::{Value, json};

/// The query string as name/value pairs. Unknown names are refused by [`Params::deny_unknown`]
/// so that a misspelt filter is never silently ignored.
#[derive(Clone, Debug, Default)]
pub struct Params(pub Vec<(String, String)>);

impl<S: Send + Sync> FromRequestParts<S> for Params {
    type Rejection = AppError;

    async fn from_request_parts(parts: &mut Parts, _state: &S) -> Result<Self, Self::Rejection> {
        Query::<Vec<(String, String)>>::try_from_uri(&parts.uri)
            .map(|Query(pairs)| Params(pairs))
            .map_err(|_| AppError::bad_request("invalid_query", "the query string is malformed"))
    }
}

impl Params {
    /// The value of `name`, trimmed; empty counts as absent.
    pub fn get(&self, name: &str) -> Option<&str> {
        self.0
            .iter()
            .find(|(k, _)| k == name)
            .map(|(_, v)| v.trim())
            .filter(|v| !v.is_empty())
    }

    pub fn deny_unknown(&self, allowed: &[&str]) -> Result<(), AppError> {
        for (key, _) in &self.0 {
            if !allowed.contains(&key.as_str()) {
                return Err(AppError::field(
                    key.clone(),
                    "unknown_parameter",
                    format!("unknown parameter; accepted: {}", allowed.join(", ")),
                ));
            }
        }
        Ok(())
    }

    /// `limit` (1 to 200, default 50) and `cursor` (the `next_cursor` of the page before).
    pub fn window(&self) -> Result<Window, AppError> {
        let mut window = Window::default();
        if let Some(text) = self.get("limit") {
            window.limit = text
                .parse::<i64>()
                .ok()
                .filter(|n| (1..=MAX_LIMIT).contains(n))
                .ok_or_else(|| {
                    AppError::field(
                        "limit",
                        "out_of_range",
                        format!("limit must be a whole number from 1 to {MAX_LIMIT}"),
                    )
                })?;
        }
        if let Some(text) = self.get("cursor") {
            window.after_id = text
                .parse::<i64>()
                .ok()
                .filter(|n| *n >= 0)
                .ok_or_else(|| {
                    AppError::field(
                        "cursor",
                        "invalid_cursor",
                        "cursor must be the next_cursor of an earlier page",
                    )
                })?;
        }
        Ok(window)
    }

    /// An id filter such as `site=3`.
    pub fn id(&self, name: &str) -> Result<Option<i64>, AppError> {
        match self.get(name) {
            None => Ok(None),
            Some(text) => text
                .parse::<i64>()
                .ok()
                .filter(|n| *n > 0)
                .map(Some)
                .ok_or_else(|| {
                    AppError::field(
                        name,
                        "invalid",
                        "must be the id of a record (a whole number)",
                    )
                }),
        }
    }

    /// One of a fixed set of words.
    pub fn choice(&self, name: &str, options: &[&str]) -> Result<Option<String>, AppError> {
        match self.get(name) {
            None => Ok(None),
            Some(text) if options.contains(&text) => Ok(Some(text.to_string())),
            Some(_) => Err(AppError::field(
                name,
                "invalid_choice",
                format!("must be one of: {}", options.join(", ")),
            )),
        }
    }

    /// `true` or `false` (also `1`/`0`, `yes`/`no`, `on`); absent is false.
    pub fn flag(&self, name: &str) -> Result<bool, AppError> {
        match self.get(name) {
            None => Ok(false),
            Some("true" | "1" | "yes" | "on") => Ok(true),
            Some("false" | "0" | "no" | "off") => Ok(false),
            Some(_) => Err(AppError::field(name, "invalid", "must be true or false")),
        }
    }

    /// `units=us|metric`, if asked.
    pub fn units(&self) -> Result<Option<UnitSystem>, AppError> {
        match self.get("units") {
            None => Ok(None),
            Some(text) => UnitSystem::parse(text).map(Some).ok_or_else(|| {
                AppError::field("units", "invalid_choice", "must be one of: us, metric")
            }),
        }
    }
}

/// The units an answer is shown in: the ones asked for, else the site's, else metric.
pub fn pick_units(asked: Option<UnitSystem>, site_units: Option<&str>) -> UnitSystem {
    asked
        .or_else(|| site_units.and_then(UnitSystem::parse))
        .unwrap_or_default()
}

/// A quantity as `{"si", "value", "unit"}`, or `null` when absent.
pub fn shown(si: Option<f64>, dimension: Dimension, units: UnitSystem) -> Value {
    match si {
        Some(v) => json!(quantity::show(v, dimension, units)),
        None => Value::Null,
    }
}

/// `{"items": [...], "next_cursor": "<id>" | null}`.
pub fn page_json<T>(page: Page<T>, to_json: impl Fn(&T) -> Value) -> Value {
    json!({
        "items": page.items.iter().map(to_json).collect::<Vec<_>>(),
        "next_cursor": page.next_cursor.map(|c| c.to_string()),
    })
}

/// Reads a path id; anything but a positive whole number is a 404 for `what`.
pub fn path_id(text: &str, what: &str) -> Result<i64, AppError> {
    text.parse::<i64>()
        .ok()
        .filter(|n| *n > 0)
        .ok_or_else(|| AppError::not_found(format!("{what} {text}")))
}
