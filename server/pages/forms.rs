//! HTML forms of the registry: a posted form read into the same JSON object the API reads
//! (so both refuse the same things with the same words), and the inputs a form shows.

use crate::calc::quantity::{self, Dimension, UnitSystem};
use crate::error::AppError;
use crate::pages::view::FieldErrors;
use axum::Form;
use axum::extract::{FromRequest, Request};
use serde_json::{Map, Number, Value};
use std::collections::HashMap;

/// The name/value pairs of a posted form.
#[derive(Clone, Debug, Default)]
pub struct Posted(pub Vec<(String, String)>);

impl<S: Send + Sync> FromRequest<S> for Posted {
    type Rejection = axum::response::Response;

    async fn from_request(req: Request, state: &S) -> Result<Self, Self::Rejection> {
        match Form::<Vec<(String, String)>>::from_request(req, state).await {
            Ok(Form(pairs)) => Ok(Posted(pairs)),
            Err(_) => Err(super::error_page(
                axum::http::StatusCode::BAD_REQUEST,
                "The form could not be read",
                "Send the form from its page again.",
            )),
        }
    }
}

/// What each input of a form holds, by name, as typed.
pub type Values = HashMap<String, String>;

impl Posted {
    /// The values as typed (trimmed), for showing the form again after a refused submit.
    pub fn values(&self) -> Values {
        self.0
            .iter()
            .filter(|(k, _)| k != "csrf")
            .map(|(k, v)| (k.clone(), v.trim().to_string()))
            .collect()
    }

    /// The form as the JSON object the API reads: empty inputs become `null`, inputs named in
    /// `numbers` become JSON numbers when they read as one. With `unchanged` (the values the
    /// form was filled with), inputs left as they were are left out, so that an edit touches
    /// only what the user changed and a stored figure never drifts by rounding.
    pub fn to_object(&self, numbers: &[&str], unchanged: Option<&Values>) -> Map<String, Value> {
        let mut map = Map::new();
        for (name, value) in self.values() {
            if let Some(original) = unchanged
                && original.get(&name).map(String::as_str).unwrap_or("") == value
            {
                continue;
            }
            let json = if value.is_empty() {
                Value::Null
            } else if numbers.contains(&name.as_str()) {
                number(&value).unwrap_or(Value::String(value))
            } else {
                Value::String(value)
            };
            map.insert(name, json);
        }
        map
    }
}

fn number(text: &str) -> Option<Value> {
    if let Ok(n) = text.parse::<i64>() {
        return Some(Value::Number(n.into()));
    }
    text.parse::<f64>()
        .ok()
        .and_then(Number::from_f64)
        .map(Value::Number)
}

/// Every refused field, for showing beside each input.
pub fn field_errors(problems: &[AppError]) -> FieldErrors {
    let mut errors = FieldErrors::default();
    for problem in problems {
        errors.push_error(problem);
    }
    errors
}

/// A quantity as a form shows it: six significant figures in the display unit (`101.6 mm`).
pub fn quantity_text(si: Option<f64>, dimension: Dimension, units: UnitSystem) -> String {
    match si {
        Some(v) => {
            let shown = quantity::show(v, dimension, units);
            format!("{} {}", quantity::significant(shown.value, 6), shown.unit)
        }
        None => String::new(),
    }
}

/// The hint under a quantity input: an example in the site's units first, then the other.
pub fn quantity_hint(dimension: Dimension, units: UnitSystem) -> String {
    let (metric, us) = match dimension {
        Dimension::Length => ("100 mm", "4 in"),
        Dimension::Pressure => ("250 bar", "3600 psi"),
        Dimension::Force => ("45 kN", "10000 lbf"),
        _ => {
            return format!(
                "A number and its unit, e.g. {}",
                quantity::example(dimension)
            );
        }
    };
    match units {
        UnitSystem::Metric => format!("A number and its unit, e.g. {metric} (or {us})"),
        UnitSystem::Us => format!("A number and its unit, e.g. {us} (or {metric})"),
    }
}

/// A stress as a form shows it: six significant figures in MPa or ksi; empty when absent.
pub fn stress_input(si: Option<f64>, units: UnitSystem) -> String {
    let Some(si) = si else {
        return String::new();
    };
    let unit = match units {
        UnitSystem::Metric => "MPa",
        UnitSystem::Us => "ksi",
    };
    match quantity::from_si(si, unit, Dimension::Pressure) {
        Ok(v) => format!("{} {unit}", quantity::significant(v, 6)),
        Err(_) => quantity_text(Some(si), Dimension::Pressure, units),
    }
}

/// A stress for a page: MPa in metric, ksi in US units (`355 MPa`, `51.5 ksi`).
pub fn stress_text(si: f64, units: UnitSystem) -> String {
    let (unit, value) = match units {
        UnitSystem::Metric => ("MPa", quantity::from_si(si, "MPa", Dimension::Pressure)),
        UnitSystem::Us => ("ksi", quantity::from_si(si, "ksi", Dimension::Pressure)),
    };
    match value {
        Ok(v) => format!("{} {unit}", quantity::significant(v, 4)),
        Err(_) => quantity::format(si, Dimension::Pressure, units),
    }
}

/// One input of a form, ready for `_field.html`.
#[derive(Clone, Debug, Default)]
pub struct Input {
    pub name: &'static str,
    pub label: &'static str,
    pub hint: String,
    pub value: String,
    pub error: String,
    /// `text`, `number`, `date`, `select` or `textarea`.
    pub kind: &'static str,
    /// For a select: its choices, the current one marked.
    pub options: Vec<Choice>,
    pub required: bool,
}

/// One choice of a select.
#[derive(Clone, Debug, Default)]
pub struct Choice {
    pub value: String,
    pub label: String,
    pub selected: bool,
}

/// Builds the inputs of one form from the values and errors.
pub struct Builder<'a> {
    pub values: &'a Values,
    pub errors: &'a FieldErrors,
    pub inputs: Vec<Input>,
}

impl<'a> Builder<'a> {
    pub fn new(values: &'a Values, errors: &'a FieldErrors) -> Self {
        Builder {
            values,
            errors,
            inputs: Vec::new(),
        }
    }

    fn input(&mut self, name: &'static str, label: &'static str, kind: &'static str) -> &mut Input {
        self.inputs.push(Input {
            name,
            label,
            kind,
            value: self.values.get(name).cloned().unwrap_or_default(),
            error: self.errors.get(name).to_string(),
            ..Input::default()
        });
        let last = self.inputs.len() - 1;
        &mut self.inputs[last]
    }

    pub fn text(&mut self, name: &'static str, label: &'static str, hint: &str) -> &mut Input {
        let input = self.input(name, label, "text");
        input.hint = hint.to_string();
        input
    }

    pub fn quantity(
        &mut self,
        name: &'static str,
        label: &'static str,
        dimension: Dimension,
        units: UnitSystem,
    ) -> &mut Input {
        let input = self.input(name, label, "text");
        input.hint = quantity_hint(dimension, units);
        input
    }

    pub fn number(&mut self, name: &'static str, label: &'static str, hint: &str) -> &mut Input {
        let input = self.input(name, label, "number");
        input.hint = hint.to_string();
        input
    }

    pub fn date(&mut self, name: &'static str, label: &'static str, hint: &str) -> &mut Input {
        let input = self.input(name, label, "date");
        input.hint = hint.to_string();
        input
    }

    pub fn textarea(&mut self, name: &'static str, label: &'static str) -> &mut Input {
        self.input(name, label, "textarea")
    }

    /// A select; `options` are (value, label), the first usually the empty choice.
    pub fn select(
        &mut self,
        name: &'static str,
        label: &'static str,
        options: Vec<(String, String)>,
    ) -> &mut Input {
        let input = self.input(name, label, "select");
        input.options = options
            .into_iter()
            .map(|(value, label)| Choice {
                selected: value == input.value,
                value,
                label,
            })
            .collect();
        input
    }

    pub fn finish(self) -> Vec<Input> {
        self.inputs
    }
}

/// Options from (value, label) string pairs.
pub fn options(pairs: &[(&str, &str)]) -> Vec<(String, String)> {
    pairs
        .iter()
        .map(|(v, l)| (v.to_string(), l.to_string()))
        .collect()
}

/// Every error as a line for the summary above a refused form: the input's label (or the
/// field's name when the form has no such input) and the message.
pub fn summary(inputs: &[Input], errors: &FieldErrors) -> Vec<String> {
    errors
        .0
        .iter()
        .map(
            |(field, message)| match inputs.iter().find(|i| i.name == field.as_str()) {
                Some(input) => format!("{}: {message}", input.label),
                None if field.is_empty() => message.clone(),
                None => format!("{field}: {message}"),
            },
        )
        .collect()
}

/// Percent-encodes a query-string value.
pub fn encode(text: &str) -> String {
    let mut out = String::new();
    for byte in text.bytes() {
        match byte {
            b'A'..=b'Z' | b'a'..=b'z' | b'0'..=b'9' | b'-' | b'_' | b'.' | b'~' => {
                out.push(byte as char)
            }
            _ => out.push_str(&format!("%{byte:02X}")),
        }
    }
    out
}

/// A number as a form shows it: no trailing `.0`.
pub fn number_text(value: Option<f64>) -> String {
    match value {
        Some(v) if v.fract() == 0.0 && v.abs() < 1e15 => format!("{}", v as i64),
        Some(v) => format!("{v}"),
        None => String::new(),
    }
}

/// The refused fields of a submit, or the page for a failure that is not the user's
/// (a database error), which must not be shown as a field error.
pub fn refused(problems: Vec<AppError>) -> Result<FieldErrors, Box<axum::response::Response>> {
    if let Some(index) = problems
        .iter()
        .position(|p| matches!(p, AppError::Internal(_)))
    {
        let mut problems = problems;
        return Err(Box::new(super::page_error(problems.swap_remove(index))));
    }
    Ok(field_errors(&problems))
}

/// A registry add or edit form: the shared `machines/record_form.html` page.
#[derive(askama::Template, askama_web::WebTemplate)]
#[template(path = "machines/record_form.html")]
pub struct FormPage {
    pub ctx: super::ctx::PageCtx,
    pub title: String,
    /// One line under the title (which machine a cylinder is added to...).
    pub intro: String,
    pub action: String,
    pub submit: &'static str,
    pub cancel_href: String,
    pub inputs: Vec<Input>,
    pub summary: Vec<String>,
}

impl FormPage {
    /// The page with its inputs and the summary of their errors; 422 when refused.
    pub fn respond(mut self, errors: &FieldErrors) -> axum::response::Response {
        use axum::response::IntoResponse;
        self.summary = summary(&self.inputs, errors);
        let status = if errors.is_empty() {
            axum::http::StatusCode::OK
        } else {
            axum::http::StatusCode::UNPROCESSABLE_ENTITY
        };
        (status, self).into_response()
    }
}
