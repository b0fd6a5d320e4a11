//! The tablet forms: inputs with a unit chosen beside each quantity (so a gloved hand types
//! only the number, and the unit is shown, never guessed), the posted form read into the same
//! JSON object the API reads, and the client token that makes a resubmit store once.

use crate::calc::quantity::{Dimension, UnitSystem, display_unit};
use crate::error::AppError;
use crate::pages::forms::Values;
use crate::pages::view::FieldErrors;
use serde_json::{Map, Value};

/// The units offered beside a quantity input, the site's unit first.
pub fn unit_choices(dimension: Dimension, units: UnitSystem) -> Vec<&'static str> {
    let all: &[&'static str] = match dimension {
        Dimension::Length => &["mm", "in", "cm", "m"],
        Dimension::Temperature => &["degC", "degF", "K"],
        Dimension::Pressure => &["bar", "psi", "MPa", "kPa"],
        Dimension::Time => &["s", "min", "h"],
        Dimension::Force => &["kN", "lbf", "N", "kip"],
        Dimension::Expansion => &["1/degC", "1/degF", "1/K"],
        _ => &[],
    };
    let first = default_unit(dimension, units);
    let mut out = vec![first];
    out.extend(all.iter().copied().filter(|u| *u != first));
    out
}

/// The unit selected beside an input when the form is first shown.
pub fn default_unit(dimension: Dimension, units: UnitSystem) -> &'static str {
    match dimension {
        Dimension::Time => "s",
        other => display_unit(other, units),
    }
}

/// One input of a shop form.
#[derive(Clone, Debug, Default)]
pub struct Field {
    pub name: &'static str,
    pub label: &'static str,
    pub hint: String,
    pub value: String,
    pub error: String,
    /// `quantity`, `text`, `number`, `date`, `datetime`, `select`, `textarea`.
    pub kind: &'static str,
    /// For a quantity: the unit choices and the one selected.
    pub units: Vec<Choice>,
    /// For a select: its choices.
    pub options: Vec<Choice>,
    pub required: bool,
    /// Adds the stopwatch button (shown by app.js where JavaScript runs).
    pub timer: bool,
}

#[derive(Clone, Debug, Default)]
pub struct Choice {
    pub value: String,
    pub label: String,
    pub selected: bool,
}

/// Builds the inputs of one form from its values and errors.
pub struct Fields<'a> {
    values: &'a Values,
    errors: &'a FieldErrors,
    units: UnitSystem,
    pub list: Vec<Field>,
}

impl<'a> Fields<'a> {
    pub fn new(values: &'a Values, errors: &'a FieldErrors, units: UnitSystem) -> Self {
        Fields {
            values,
            errors,
            units,
            list: Vec::new(),
        }
    }

    fn push(&mut self, name: &'static str, label: &'static str, kind: &'static str) -> &mut Field {
        self.list.push(Field {
            name,
            label,
            kind,
            value: self.values.get(name).cloned().unwrap_or_default(),
            error: self.errors.get(name).to_string(),
            ..Field::default()
        });
        let last = self.list.len() - 1;
        &mut self.list[last]
    }

    /// A number with the unit chosen beside it (`{name}_unit`).
    pub fn quantity(
        &mut self,
        name: &'static str,
        label: &'static str,
        dimension: Dimension,
    ) -> &mut Field {
        let unit_key = format!("{name}_unit");
        let chosen = self
            .values
            .get(&unit_key)
            .cloned()
            .unwrap_or_else(|| default_unit(dimension, self.units).to_string());
        let choices = unit_choices(dimension, self.units);
        let field = self.push(name, label, "quantity");
        field.units = choices
            .into_iter()
            .map(|u| Choice {
                value: u.to_string(),
                label: u.replace("deg", "°"),
                selected: u == chosen,
            })
            .collect();
        field
    }

    pub fn text(&mut self, name: &'static str, label: &'static str) -> &mut Field {
        self.push(name, label, "text")
    }

    pub fn number(&mut self, name: &'static str, label: &'static str) -> &mut Field {
        self.push(name, label, "number")
    }

    pub fn date(&mut self, name: &'static str, label: &'static str) -> &mut Field {
        self.push(name, label, "date")
    }

    pub fn datetime(&mut self, name: &'static str, label: &'static str) -> &mut Field {
        self.push(name, label, "datetime")
    }

    pub fn textarea(&mut self, name: &'static str, label: &'static str) -> &mut Field {
        self.push(name, label, "textarea")
    }

    /// A select (or radio group); `options` are (value, label).
    pub fn select(
        &mut self,
        name: &'static str,
        label: &'static str,
        options: Vec<(String, String)>,
    ) -> &mut Field {
        let field = self.push(name, label, "select");
        field.options = options
            .into_iter()
            .map(|(value, label)| Choice {
                selected: value == field.value,
                value,
                label,
            })
            .collect();
        field
    }

    /// A row of large radio buttons; `options` are (value, label).
    pub fn radio(
        &mut self,
        name: &'static str,
        label: &'static str,
        options: Vec<(String, String)>,
    ) -> &mut Field {
        let field = self.select(name, label, options);
        field.kind = "radio";
        field
    }

    pub fn finish(self) -> Vec<Field> {
        self.list
    }
}

/// Copies the id inputs `names` into `map` as integers; one that does not parse means the
/// form was not sent from its page, and is a problem naming the input.
pub fn ids_into(
    values: &Values,
    names: &[&'static str],
    map: &mut Map<String, Value>,
    problems: &mut Vec<AppError>,
) {
    for name in names {
        if let Some(text) = values.get(*name).filter(|t| !t.trim().is_empty()) {
            match text.trim().parse::<i64>() {
                Ok(n) => {
                    map.insert((*name).into(), Value::from(n));
                }
                Err(_) => problems.push(AppError::field(
                    *name,
                    "invalid",
                    "send the form from its page again",
                )),
            }
        }
    }
}

/// Joins the limit inputs (`amount`, `limit_per`) into the API's `limit` object as
/// `{key: amount, "per": per}`; one given without the other is a problem naming the missing
/// input. `what` is the allowed change in words (`drift`, `drop`).
pub fn limit_into(
    map: &mut Map<String, Value>,
    problems: &mut Vec<AppError>,
    (amount, key): (&'static str, &str),
    what: &str,
) {
    match (map.remove(amount), map.remove("limit_per")) {
        (Some(a), Some(per)) => {
            let mut limit = Map::new();
            limit.insert(key.into(), a);
            limit.insert("per".into(), per);
            map.insert("limit".into(), Value::Object(limit));
        }
        (Some(_), None) => problems.push(AppError::field(
            "limit_per",
            "required",
            format!("give the period the allowed {what} is for"),
        )),
        (None, Some(_)) => problems.push(AppError::field(
            amount,
            "required",
            format!("give the allowed {what} for this period"),
        )),
        (None, None) => {}
    }
}

/// Reads posted values into the API's JSON object: each name in `quantities` becomes
/// `"<number> <unit>"` with the unit chosen beside it when a bare number was typed (a number
/// typed with its unit is kept as typed); each name in `texts` is copied; empty inputs are
/// left out.
pub fn to_json(values: &Values, quantities: &[&str], texts: &[&str]) -> Map<String, Value> {
    let mut map = Map::new();
    for name in quantities {
        let Some(text) = values
            .get(*name)
            .map(|t| t.trim())
            .filter(|t| !t.is_empty())
        else {
            continue;
        };
        let unit = values
            .get(&format!("{name}_unit"))
            .map(|u| u.trim())
            .filter(|u| !u.is_empty());
        let value = match (text.parse::<f64>(), unit) {
            (Ok(_), Some(unit)) => format!("{text} {unit}"),
            _ => text.to_string(),
        };
        map.insert((*name).to_string(), Value::String(value));
    }
    for name in texts {
        if let Some(text) = values
            .get(*name)
            .map(|t| t.trim())
            .filter(|t| !t.is_empty())
        {
            map.insert((*name).to_string(), Value::String(text.to_string()));
        }
    }
    map
}

/// A fresh client token for a form being shown: 128 random bits as hex, or an empty token
/// (the form then stores without the resubmit guard) if the system's random source fails.
pub fn new_client_token() -> String {
    crate::auth::secret::random_hex(16).unwrap_or_default()
}

/// The current UTC time as a `datetime-local` input shows it (`YYYY-MM-DDTHH:MM`).
pub fn now_local_input() -> String {
    let now = time::OffsetDateTime::now_utc();
    let f = time::macros::format_description!("[year]-[month]-[day]T[hour]:[minute]");
    now.format(f).unwrap_or_default()
}

/// A stored RFC 3339 time as a `datetime-local` value (`YYYY-MM-DDTHH:MM`, UTC).
pub fn timestamp_input(at: &str) -> String {
    at.get(..16).unwrap_or(at).to_string()
}

/// An SI value as a form shows it in `unit` (six significant figures), for refilling a form.
pub fn in_unit(si: Option<f64>, unit: &str, dimension: Dimension) -> String {
    match si.and_then(|v| crate::calc::quantity::from_si(v, unit, dimension).ok()) {
        Some(v) => crate::calc::quantity::significant(v, 6),
        None => String::new(),
    }
}

/// The lines above a refused form (every error, by field label where known).
pub fn summary_lines(errors: &FieldErrors) -> Vec<String> {
    errors
        .0
        .iter()
        .map(|(field, message)| {
            if field.is_empty() {
                message.clone()
            } else {
                format!("{}: {message}", field.replace('_', " "))
            }
        })
        .collect()
}

/// Names the form's inputs in errors about the API's nested fields (`limit.per`). A missing
/// quantity is asked for as the form takes it: a number, its unit picked beside it.
pub fn form_field(error: AppError) -> AppError {
    match error {
        AppError::Invalid {
            status,
            code,
            field,
            message,
        } => AppError::Invalid {
            status,
            code,
            field: field.map(|f| {
                f.replace("limit.distance", "limit_distance")
                    .replace("limit.per", "limit_per")
            }),
            message: if code == "required" && message.contains(" such as ") {
                "type the number here and pick its unit beside it".to_string()
            } else {
                message
            },
        },
        other => other,
    }
}
