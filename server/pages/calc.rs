//! `/calc`: the calculator page. A GET form (works without JavaScript) read into the same JSON
//! object the calculation API reads, so both refuse the same input with the same words; the
//! results are the same reports, shown in the chosen units with the cautions beside hazards.

use super::calc_fields::{self, FieldView};
use super::calc_view::{self, CylinderView, DecayView, DriftView};
use super::ctx::PageCtx;
use crate::api::calc_check::{self, Readings};
use crate::api::calc_input::{self, calc_error};
use crate::api::input::Fields;
use crate::app::AppState;
use crate::calc::quantity::UnitSystem;
use crate::calc::{analysis, decay, drift};
use crate::error::AppError;
use askama::Template;
use askama_web::WebTemplate;
use axum::Router;
use axum::extract::Query;
use axum::http::StatusCode;
use axum::response::{IntoResponse, Response};
use axum::routing::get;
use serde_json::{Map, Number, Value};

pub fn router() -> Router<AppState> {
    Router::new().route("/calc", get(page))
}

/// The calculator page.
#[derive(Template, WebTemplate)]
#[template(path = "calc/calc.html")]
pub struct CalcPage {
    pub ctx: PageCtx,
    /// `us` or `metric`.
    pub units: String,
    pub load_direction: String,
    pub end_condition: String,
    pub pressurised_end: String,
    pub cylinder_fields: Vec<FieldView>,
    pub option_fields: Vec<FieldView>,
    pub rating_fields: Vec<FieldView>,
    pub drift_fields: Vec<FieldView>,
    pub decay_fields: Vec<FieldView>,
    /// The first refused field and why (kept for the page's other uses).
    pub error: Option<(String, String)>,
    /// Every refused field: (label, message, input id), listed at the top linking to each
    /// input, and each shown beside its field.
    pub errors: Vec<(String, String, String)>,
    pub cylinder: Option<CylinderView>,
    pub drift: Option<DriftView>,
    pub decay: Option<DecayView>,
}

/// Form inputs that are plain numbers, not quantities.
const NUMBERS: &[&str] = &[
    "pilot_ratio",
    "tube_safety_factor",
    "buckling_safety_factor",
];

/// The query as the JSON object the API reads: `ratings.cap_line` and `limit.distance` become
/// nested objects, empty inputs are left out, plain-number inputs become JSON numbers.
/// `decay.` inputs go to a second object for the pressure-decay test.
fn to_objects(pairs: &[(String, String)]) -> (Map<String, Value>, Map<String, Value>) {
    let mut main = Map::new();
    let mut decay = Map::new();
    for (key, value) in pairs {
        let value = value.trim();
        if value.is_empty() {
            continue;
        }
        let json = if NUMBERS.contains(&key.as_str()) {
            value
                .parse::<f64>()
                .ok()
                .and_then(Number::from_f64)
                .map_or_else(|| Value::String(value.into()), Value::Number)
        } else {
            Value::String(value.into())
        };
        let (target, key) = match key.strip_prefix("decay.") {
            Some(rest) => (&mut decay, rest),
            None => (&mut main, key.as_str()),
        };
        match key.split_once('.') {
            Some((outer, inner)) => {
                let entry = target
                    .entry(outer.to_string())
                    .or_insert_with(|| Value::Object(Map::new()));
                if let Value::Object(object) = entry {
                    object.insert(inner.to_string(), json);
                }
            }
            None => {
                target.insert(key.to_string(), json);
            }
        }
    }
    (main, decay)
}

fn has_any(map: &Map<String, Value>, names: &[&str]) -> bool {
    names.iter().any(|n| map.contains_key(*n))
}

async fn page(ctx: PageCtx, Query(pairs): Query<Vec<(String, String)>>) -> Response {
    let (main, decay_map) = to_objects(&pairs);
    let value = |name: &str| {
        pairs
            .iter()
            .find(|(k, _)| k == name)
            .map(|(_, v)| v.trim().to_string())
            .unwrap_or_default()
    };
    let units = match value("units").as_str() {
        "us" => UnitSystem::Us,
        _ => UnitSystem::Metric,
    };
    let mut page = CalcPage {
        ctx,
        units: units.as_str().to_string(),
        load_direction: value("load_direction"),
        end_condition: value("end_condition"),
        pressurised_end: value("decay.pressurised_end"),
        cylinder_fields: calc_fields::fields(calc_fields::CYLINDER, &value, units),
        option_fields: calc_fields::fields(calc_fields::OPTIONS, &value, units),
        rating_fields: calc_fields::fields(calc_fields::RATINGS, &value, units),
        drift_fields: calc_fields::fields(calc_fields::DRIFT, &value, units),
        decay_fields: calc_fields::fields(calc_fields::DECAY, &value, units),
        error: None,
        errors: Vec::new(),
        cylinder: None,
        drift: None,
        decay: None,
    };
    if main.is_empty() || (main.len() == 1 && main.contains_key("units")) {
        return page.into_response();
    }
    match compute(&mut page, &main, &decay_map, units) {
        Ok(()) => page.into_response(),
        Err(refusals) => {
            let mut status = StatusCode::UNPROCESSABLE_ENTITY;
            for (prefix, error) in refusals
                .iter()
                .flat_map(|(p, e)| e.problems().into_iter().map(move |one| (*p, one)))
            {
                if error.status().is_client_error() && page.errors.is_empty() {
                    status = error.status();
                }
                let (_, message, field) = error.parts();
                let field = format!("{prefix}{}", field.unwrap_or_default());
                let mut anchor = String::new();
                for f in page
                    .cylinder_fields
                    .iter_mut()
                    .chain(page.option_fields.iter_mut())
                    .chain(page.rating_fields.iter_mut())
                    .chain(page.drift_fields.iter_mut())
                    .chain(page.decay_fields.iter_mut())
                {
                    if f.name == field && f.error.is_empty() {
                        f.error = message.clone();
                        anchor = format!("c-{field}");
                    }
                }
                let label = calc_fields::label_of(&field);
                page.error
                    .get_or_insert_with(|| (label.clone(), message.clone()));
                page.errors.push((label, message, anchor));
            }
            (status, page).into_response()
        }
    }
}

/// Runs the calculations the form asks for. An error carries the prefix of the form section
/// its field belongs to (`decay.` for the pressure-decay inputs).
fn compute(
    page: &mut CalcPage,
    main: &Map<String, Value>,
    decay_map: &Map<String, Value>,
    units: UnitSystem,
) -> Result<(), Vec<(&'static str, AppError)>> {
    let f = Fields::new(main);
    let d = Fields::new(decay_map);
    let with_drift = has_any(main, calc_input::DRIFT_FIELDS);
    let with_decay = decay_map.keys().any(|k| k != "pressurised_end");
    // Every field on its own first, so that every bad field is marked at once.
    let readings = if with_drift {
        Readings::Drift
    } else {
        Readings::None
    };
    let mut found: Vec<(&'static str, AppError)> = calc_check::problems(&f, readings)
        .into_iter()
        .map(|e| ("", e))
        .collect();
    if with_decay {
        let decay_only = calc_check::problems(&d, Readings::Decay)
            .into_iter()
            .filter(|e| {
                // The cylinder fields live in the main object; only the readings are here.
                let field = e.parts().2.unwrap_or_default();
                calc_input::DECAY_FIELDS.contains(&field.as_str())
            })
            .map(|e| ("decay.", e));
        found.extend(decay_only);
    }
    if !found.is_empty() {
        return Err(found);
    }
    let one = |prefix: &'static str, e: AppError| vec![(prefix, e)];
    let input = calc_input::parse_cylinder_request(&f).map_err(|e| one("", e))?;
    let report = analysis::analyse(&input, units).map_err(|e| one("", calc_error(e)))?;
    page.cylinder = Some(calc_view::cylinder(&input, &report, units));
    if with_drift {
        let readings = calc_input::parse_drift_readings(&f).map_err(|e| one("", e))?;
        let r =
            drift::analyse_drift(&input, &readings, units).map_err(|e| one("", calc_error(e)))?;
        page.drift = Some(calc_view::drift(&r, units));
    }
    if with_decay {
        let readings = calc_input::parse_decay_readings(&d).map_err(|e| one("decay.", e))?;
        let r = decay::analyse_decay(&input, &readings, units)
            .map_err(|e| one("decay.", calc_error(e)))?;
        page.decay = Some(calc_view::decay(&r, units));
    }
    Ok(())
}
