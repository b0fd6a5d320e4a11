//! What the registry endpoints (sites, machines, cylinders, hoses) read alike: the record a
//! path names with the units asked, and the refusals every one of them gives in the same words.

use super::input::Fields;
use super::paging::{Params, path_id};
use crate::calc::quantity::UnitSystem;
use crate::error::{ApiResult, AppError};
use serde_json::{Map, Value};

/// Units asked in the body (`"units"`, when given and not null) or else the query string.
pub fn asked_units(
    params: &Params,
    body: Option<&Map<String, Value>>,
) -> ApiResult<Option<UnitSystem>> {
    // Checked first, so that a bad `?units=` is refused even when the body names units too.
    let from_query = params.units()?;
    if let Some(map) = body
        && map.get("units").is_some_and(|v| !v.is_null())
    {
        return Ok(Some(Fields::new(map).units()?));
    }
    Ok(from_query)
}

/// The id of the `what` a path names (`{id}`) and the units asked (query string only `units`;
/// the body, if given, may ask too).
pub fn path_and_units(
    params: &Params,
    id: &str,
    what: &str,
    body: Option<&Map<String, Value>>,
) -> ApiResult<(i64, Option<UnitSystem>)> {
    params.deny_unknown(&["units"])?;
    let id = path_id(id, what)?;
    Ok((id, asked_units(params, body)?))
}

/// 404 for the `what` with this id.
pub fn missing(what: &str, id: i64) -> AppError {
    AppError::not_found(format!("{what} {id}"))
}

/// Refuses `"archived": true` on a record being created (422 naming `archived`).
pub fn refuse_new_archived(archived: Option<bool>, what: &str) -> ApiResult<()> {
    if archived == Some(true) {
        return Err(AppError::field(
            "archived",
            "invalid",
            format!("a new {what} cannot be archived"),
        ));
    }
    Ok(())
}
