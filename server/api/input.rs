//! Reading JSON request bodies field by field, so that every error names its field.
//!
//! Quantities must carry their unit: `"4 in"` or `{"value": 4, "unit": "in"}`. A bare number
//! is refused: in a safety tool a unit is never guessed.

use super::json_strict::StrictError;
use crate::calc::quantity::{self, Dimension, UnitSystem};
use crate::error::AppError;
use axum::body::Bytes;
use axum::extract::{FromRequest, Request};
use axum::http::header::CONTENT_TYPE;
use serde_json::{Map, Value};
use time::Date;
use time::macros::format_description;

/// The largest magnitude of a quantity accepted, in SI units (1e12 Pa is 10 million bar).
pub const MAX_SI: f64 = 1e12;

/// A JSON object body. Refuses a missing or wrong content type (415 as 400-class JSON error),
/// unreadable JSON and non-objects (400), before any field is looked at.
pub struct Body(pub Map<String, Value>);

impl<S: Send + Sync> FromRequest<S> for Body {
    type Rejection = AppError;

    async fn from_request(req: Request, state: &S) -> Result<Self, Self::Rejection> {
        let is_json = req
            .headers()
            .get(CONTENT_TYPE)
            .and_then(|v| v.to_str().ok())
            .map(|v| {
                v.split(';')
                    .next()
                    .unwrap_or("")
                    .trim()
                    .eq_ignore_ascii_case("application/json")
            })
            .unwrap_or(false);
        if !is_json {
            return Err(AppError::Invalid {
                status: axum::http::StatusCode::UNSUPPORTED_MEDIA_TYPE,
                code: "unsupported_media_type",
                field: None,
                message: "send the body as JSON with Content-Type: application/json".into(),
            });
        }
        let bytes = Bytes::from_request(req, state).await.map_err(|_| {
            AppError::bad_request(
                "body_unreadable",
                "the request body could not be read (too large?)",
            )
        })?;
        let value = super::json_strict::parse(&bytes).map_err(|e| match e {
            StrictError::Duplicate(key) => AppError::Invalid {
                status: axum::http::StatusCode::BAD_REQUEST,
                code: "duplicate_key",
                field: Some(key.clone()),
                message: format!(
                    "the field \"{key}\" appears more than once in one object; send it once"
                ),
            },
            StrictError::Syntax(e) => {
                AppError::bad_request("invalid_json", format!("the body is not valid JSON: {e}"))
            }
        })?;
        match value {
            Value::Object(map) => Ok(Body(map)),
            _ => Err(AppError::bad_request(
                "invalid_json",
                "the body must be a JSON object",
            )),
        }
    }
}

/// A view of one JSON object with a path prefix for error messages (`ratings.cap_line`).
#[derive(Clone, Copy)]
pub struct Fields<'a> {
    map: &'a Map<String, Value>,
    prefix: &'a str,
}

fn present(value: Option<&Value>) -> Option<&Value> {
    value.filter(|v| !v.is_null())
}

impl<'a> Fields<'a> {
    pub fn new(map: &'a Map<String, Value>) -> Self {
        Fields { map, prefix: "" }
    }

    /// The full name of a field, with the prefix of its parent object.
    pub fn path(&self, name: &str) -> String {
        if self.prefix.is_empty() {
            name.to_string()
        } else {
            format!("{}.{name}", self.prefix)
        }
    }

    pub fn has(&self, name: &str) -> bool {
        present(self.map.get(name)).is_some()
    }

    pub fn raw(&self, name: &str) -> Option<&'a Value> {
        present(self.map.get(name))
    }

    /// Refuses any field not in `allowed`, so a misspelt field is never silently ignored.
    pub fn deny_unknown(&self, allowed: &[&str]) -> Result<(), AppError> {
        for key in self.map.keys() {
            if !allowed.contains(&key.as_str()) {
                return Err(AppError::field(
                    self.path(key),
                    "unknown_field",
                    format!("unknown field; accepted fields are: {}", allowed.join(", ")),
                ));
            }
        }
        Ok(())
    }

    fn missing(&self, name: &str, what: &str) -> AppError {
        AppError::field(self.path(name), "required", format!("{what} is required"))
    }

    /// A nested object, if present (`null` counts as absent).
    pub fn object(&self, name: &str, prefix: &'a str) -> Result<Option<Fields<'a>>, AppError> {
        match present(self.map.get(name)) {
            None => Ok(None),
            Some(Value::Object(map)) => Ok(Some(Fields { map, prefix })),
            Some(_) => Err(AppError::field(
                self.path(name),
                "invalid",
                "must be a JSON object",
            )),
        }
    }

    /// A quantity in SI, which must not be negative (a size, a pressure, a duration...).
    /// Temperatures are absolute and may be below 0 degC but not below 0 K.
    pub fn opt_quantity(&self, name: &str, dimension: Dimension) -> Result<Option<f64>, AppError> {
        let si = self.opt_signed_quantity(name, dimension)?;
        if let Some(v) = si
            && v < 0.0
            && dimension != Dimension::Temperature
            && dimension != Dimension::TemperatureChange
        {
            return Err(AppError::field(
                self.path(name),
                "negative",
                format!("a {} here cannot be negative", dimension.name()),
            ));
        }
        Ok(si)
    }

    pub fn quantity(&self, name: &str, dimension: Dimension) -> Result<f64, AppError> {
        self.opt_quantity(name, dimension)?.ok_or_else(|| {
            self.missing(
                name,
                &format!(
                    "a {} such as {}",
                    dimension.name(),
                    quantity::example(dimension)
                ),
            )
        })
    }

    /// A quantity that may be negative (a position, a drift, a change).
    pub fn opt_signed_quantity(
        &self,
        name: &str,
        dimension: Dimension,
    ) -> Result<Option<f64>, AppError> {
        let Some(value) = present(self.map.get(name)) else {
            return Ok(None);
        };
        let field = self.path(name);
        let bad =
            |code: &'static str, message: String| AppError::field(field.clone(), code, message);
        let si = match value {
            Value::String(text) => quantity::parse_str(text, dimension),
            Value::Object(object) => {
                let number = object.get("value").and_then(Value::as_f64);
                let unit = object.get("unit").and_then(Value::as_str);
                if object.keys().any(|k| k != "value" && k != "unit") {
                    return Err(bad(
                        "invalid_quantity",
                        "a quantity object has only \"value\" and \"unit\"".into(),
                    ));
                }
                match (number, unit) {
                    (Some(number), Some(unit)) => quantity::to_si(number, unit, dimension),
                    _ => {
                        return Err(bad(
                            "invalid_quantity",
                            format!(
                                "write {{\"value\": <number>, \"unit\": \"<unit>\"}} or a string such as {}",
                                quantity::example(dimension)
                            ),
                        ));
                    }
                }
            }
            Value::Number(_) => {
                return Err(bad(
                    "unit_required",
                    format!(
                        "a bare number is not accepted: a unit is never guessed; write {} (accepted units: {})",
                        quantity::example(dimension),
                        quantity::accepted_units(dimension).join(", ")
                    ),
                ));
            }
            _ => {
                return Err(bad(
                    "invalid_quantity",
                    format!(
                        "expected a {} such as {}",
                        dimension.name(),
                        quantity::example(dimension)
                    ),
                ));
            }
        };
        let si = si.map_err(|e| bad("invalid_quantity", e.message))?;
        // Far beyond any machine (and beyond what a display unit can show without overflow).
        if si.abs() > MAX_SI {
            return Err(bad(
                "out_of_range",
                format!(
                    "this {} is far outside any plausible value; check the number and its unit",
                    dimension.name()
                ),
            ));
        }
        Ok(Some(si))
    }

    /// A gauge pressure reading, Pa: may be negative (a vacuum, e.g. the cap end of a cylinder
    /// whose pulling load drains it), down to -1 atm (-101,325 Pa gauge is absolute zero,
    /// ISO 80000-4 / NIST SP 811 standard atmosphere); below that it is refused naming the field.
    pub fn opt_gauge_pressure(&self, name: &str) -> Result<Option<f64>, AppError> {
        let si = self.opt_signed_quantity(name, Dimension::Pressure)?;
        if let Some(v) = si
            && v < crate::calc::error::MIN_GAUGE_PRESSURE
        {
            return Err(AppError::field(
                self.path(name),
                "below_vacuum",
                "a gauge pressure cannot be below -1 atm (-101325 Pa, -1.01325 bar, -14.696 psi): that is absolute zero",
            ));
        }
        Ok(si)
    }

    /// A gauge pressure reading that must be given ([`Fields::opt_gauge_pressure`]).
    pub fn gauge_pressure(&self, name: &str) -> Result<f64, AppError> {
        self.opt_gauge_pressure(name)?.ok_or_else(|| {
            self.missing(
                name,
                &format!(
                    "a pressure such as {}",
                    quantity::example(Dimension::Pressure)
                ),
            )
        })
    }

    pub fn signed_quantity(&self, name: &str, dimension: Dimension) -> Result<f64, AppError> {
        self.opt_signed_quantity(name, dimension)?.ok_or_else(|| {
            self.missing(
                name,
                &format!(
                    "a {} such as {}",
                    dimension.name(),
                    quantity::example(dimension)
                ),
            )
        })
    }

    pub fn opt_string(&self, name: &str) -> Result<Option<String>, AppError> {
        match present(self.map.get(name)) {
            None => Ok(None),
            Some(Value::String(s)) => {
                let s = s.trim();
                // SQLite's length() stops at a NUL, so such text would break the table checks.
                if s.contains('\0') {
                    return Err(AppError::field(
                        self.path(name),
                        "invalid",
                        "must not contain a NUL character",
                    ));
                }
                if s.chars().count() > 2000 {
                    return Err(AppError::field(
                        self.path(name),
                        "too_long",
                        "at most 2000 characters",
                    ));
                }
                Ok(if s.is_empty() {
                    None
                } else {
                    Some(s.to_string())
                })
            }
            Some(_) => Err(AppError::field(
                self.path(name),
                "invalid",
                "must be a string",
            )),
        }
    }

    pub fn string(&self, name: &str) -> Result<String, AppError> {
        self.opt_string(name)?
            .ok_or_else(|| self.missing(name, "a non-empty string"))
    }

    /// One of a fixed set of words.
    pub fn opt_choice(
        &self,
        name: &str,
        options: &[&'static str],
    ) -> Result<Option<&'static str>, AppError> {
        match self.opt_string(name)? {
            None => Ok(None),
            Some(s) => options
                .iter()
                .find(|o| **o == s)
                .copied()
                .map(Some)
                .ok_or_else(|| {
                    AppError::field(
                        self.path(name),
                        "invalid_choice",
                        format!("must be one of: {}", options.join(", ")),
                    )
                }),
        }
    }

    pub fn choice(&self, name: &str, options: &[&'static str]) -> Result<&'static str, AppError> {
        self.opt_choice(name, options)?
            .ok_or_else(|| self.missing(name, &format!("one of {}", options.join(", "))))
    }

    /// A plain number (a count, a ratio, hours on a meter), finite.
    pub fn opt_number(&self, name: &str) -> Result<Option<f64>, AppError> {
        match present(self.map.get(name)) {
            None => Ok(None),
            Some(Value::Number(n)) => match n.as_f64() {
                Some(v) if v.is_finite() => Ok(Some(v)),
                _ => Err(AppError::field(
                    self.path(name),
                    "invalid",
                    "must be a finite number",
                )),
            },
            Some(_) => Err(AppError::field(
                self.path(name),
                "invalid",
                "must be a number",
            )),
        }
    }

    /// A number that must be at least `min`.
    pub fn opt_number_min(&self, name: &str, min: f64) -> Result<Option<f64>, AppError> {
        match self.opt_number(name)? {
            Some(v) if v < min => Err(AppError::field(
                self.path(name),
                "out_of_range",
                format!("must be at least {min}"),
            )),
            other => Ok(other),
        }
    }

    /// A whole number in `min..=max`.
    pub fn opt_integer(&self, name: &str, min: i64, max: i64) -> Result<Option<i64>, AppError> {
        match present(self.map.get(name)) {
            None => Ok(None),
            Some(Value::Number(n)) => match n.as_i64() {
                Some(v) if (min..=max).contains(&v) => Ok(Some(v)),
                _ => Err(AppError::field(
                    self.path(name),
                    "out_of_range",
                    format!("must be a whole number from {min} to {max}"),
                )),
            },
            Some(_) => Err(AppError::field(
                self.path(name),
                "invalid",
                "must be a whole number",
            )),
        }
    }

    pub fn opt_bool(&self, name: &str) -> Result<Option<bool>, AppError> {
        match present(self.map.get(name)) {
            None => Ok(None),
            Some(Value::Bool(b)) => Ok(Some(*b)),
            Some(_) => Err(AppError::field(
                self.path(name),
                "invalid",
                "must be true or false",
            )),
        }
    }

    /// A calendar date written `YYYY-MM-DD`.
    pub fn opt_date(&self, name: &str) -> Result<Option<Date>, AppError> {
        match self.opt_string(name)? {
            None => Ok(None),
            Some(text) => parse_date(&text).map(Some).ok_or_else(|| {
                AppError::field(
                    self.path(name),
                    "invalid_date",
                    "must be a date written YYYY-MM-DD",
                )
            }),
        }
    }

    pub fn date(&self, name: &str) -> Result<Date, AppError> {
        self.opt_date(name)?
            .ok_or_else(|| self.missing(name, "a date written YYYY-MM-DD"))
    }

    /// The display unit system from the `units` field (default metric).
    pub fn units(&self) -> Result<UnitSystem, AppError> {
        Ok(match self.opt_choice("units", &["us", "metric"])? {
            Some("us") => UnitSystem::Us,
            _ => UnitSystem::Metric,
        })
    }
}

/// Parses `YYYY-MM-DD`.
pub fn parse_date(text: &str) -> Option<Date> {
    Date::parse(text.trim(), format_description!("[year]-[month]-[day]")).ok()
}
