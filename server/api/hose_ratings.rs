//! `GET /api/v1/hose-ratings`: the table of maximum working pressures by hose type and size
//! (`calc::hose_table`), a default for the hose form to confirm against the layline.

use super::paging::{Params, shown};
use crate::app::AppState;
use crate::calc::hose_table::{self, HoseRating};
use crate::calc::quantity::{Dimension, UnitSystem};
use crate::error::{ApiResult, AppError};
use axum::routing::get;
use axum::{Json, Router};
use serde_json::{Value, json};

pub fn router() -> Router<AppState> {
    Router::new().route("/api/v1/hose-ratings", get(list))
}

/// Said with every answer: the table is a default, the layline and the shop's value rule.
pub const CAUTION: &str = "A default from a table kept from memory, not read in the standards: \
     confirm it against the hose's layline and the fittings' rating (the assembly's rating is the \
     lower of hose and fittings). The working pressure the shop records is what every check uses. \
     Defer to the manufacturer, local codes and qualified persons.";

/// One row as JSON, the pressure shown in `units`.
pub fn to_json(r: &HoseRating, units: UnitSystem) -> Value {
    json!({
        "spec": r.spec,
        "standard": r.standard,
        "edition": r.edition,
        "size": format!("-{}", r.dash),
        "dash": r.dash,
        "dn": r.dn,
        "max_working_pressure": shown(Some(r.max_working_pressure_pa), Dimension::Pressure, units),
        "table_value": { "value": r.value, "unit": r.unit },
        "source": r.source,
    })
}

async fn list(params: Params) -> ApiResult<Json<Value>> {
    params.deny_unknown(&["spec", "size", "units"])?;
    let units = params.units()?.unwrap_or_default();
    let dash = match params.get("size") {
        None => None,
        Some(text) => Some(hose_table::parse_size(text).ok_or_else(|| {
            AppError::field(
                "size",
                "invalid_size",
                format!(
                    "\"{text}\" is not a size of the table; write a dash size or DN: {}",
                    sizes_words()
                ),
            )
        })?),
    };
    let spec = params.get("spec");
    let items: Vec<Value> = hose_table::all()
        .iter()
        .filter(|r| dash.is_none_or(|d| r.dash == d))
        .filter(|r| spec.is_none_or(|s| hose_table::find_type(s).is_some_and(|t| t.spec == r.spec)))
        .map(|r| to_json(r, units))
        .collect();
    let note = match spec {
        Some(s) if hose_table::find_type(s).is_none() => Some(format!(
            "the table has no values for \"{s}\"; it holds: {}. Use the hose's layline.",
            hose_table::TYPES
                .iter()
                .map(|t| t.spec)
                .collect::<Vec<_>>()
                .join(", ")
        )),
        _ if items.is_empty() => Some(
            "the table has no value for this type at this size; use the hose's layline".to_string(),
        ),
        _ => None,
    };
    Ok(Json(
        json!({ "items": items, "note": note, "caution": CAUTION }),
    ))
}

fn sizes_words() -> String {
    hose_table::DASH_DN
        .iter()
        .map(|(d, dn)| format!("-{d} (DN{dn})"))
        .collect::<Vec<_>>()
        .join(", ")
}
