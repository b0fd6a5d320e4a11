//! The parts of a drift-test and a pressure-decay-test body that both read alike: the record
//! fields (when, who, procedure, ambient temperature) around the readings, and the completion
//! of the calculation request from the body, the chosen procedure and the site's units.

use super::draft::Problems;
use super::input::Fields;
use super::shop_input::{self, si};
use super::shop_request::applicable_procedure;
use crate::calc::quantity::Dimension as D;
use crate::db::Db;
use crate::db::cylinders::Cylinder;
use crate::db::machines::Machine;
use crate::db::procedures::Procedure;
use crate::error::AppError;
use serde_json::{Map, Value, json};

/// Fields of the record itself, the same in every cylinder test body.
const RECORD_FIELDS: &[&str] = &[
    "tested_at",
    "technician",
    "procedure_id",
    "client_token",
    "amends",
    "notes",
    "ambient_temperature",
];

/// Every field a cylinder test body accepts: its readings, the calculation fields it may
/// carry, and the record's own.
pub fn accepted(readings: &[&'static str], calc: &[&'static str]) -> Vec<&'static str> {
    readings
        .iter()
        .chain(calc)
        .chain(RECORD_FIELDS)
        .copied()
        .collect()
}

/// The record fields of a cylinder test body, read and checked.
pub struct Head {
    pub common: shop_input::Common,
    pub procedure: Option<Procedure>,
    pub ambient: Option<f64>,
}

/// Reads the record fields and (with `check_readings`) the readings of a body for a `kind`
/// procedure (`drift`, `decay`), so that every bad field is named at once, in body order.
pub async fn read_head(
    db: &Db,
    f: &Fields<'_>,
    kind: &str,
    (cylinder, machine): (&Cylinder, &Machine),
    user: Option<&str>,
    check_readings: fn(&Fields, &mut Problems),
) -> Result<Head, Vec<AppError>> {
    let mut problems = Problems::default();
    let common = shop_input::common(f, "tested_at", "technician", user, &mut problems);
    if let Some(at) = &common.at {
        problems.take(super::plausible::record_date(machine, "tested_at", at));
    }
    let procedure_id = problems.take(super::draft::id(f, "procedure_id")).flatten();
    check_readings(f, &mut problems);
    let procedure = match procedure_id {
        Some(id) => problems.take(applicable_procedure(db, id, kind, cylinder, machine).await),
        None => None,
    };
    let ambient = problems
        .take(f.opt_quantity("ambient_temperature", D::Temperature))
        .flatten();
    if !problems.is_empty() {
        return Err(problems.0);
    }
    Ok(Head {
        common,
        procedure,
        ambient,
    })
}

/// Completes a calculation request: the body's fields named in `sent` as given, then what the
/// procedure sets where the body does not (the limit allowed at the starting oil temperature,
/// as `limit.0` of dimension `limit.1` per time, and the oil expansion), and the site's units.
pub fn complete_request<'a>(
    request: &mut Map<String, Value>,
    f: &Fields,
    sent: impl IntoIterator<Item = &'a &'a str>,
    (cylinder, procedure): (&Cylinder, Option<&Procedure>),
    limit: (&str, D),
) -> Result<(), AppError> {
    for name in sent {
        if let Some(v) = f.raw(name) {
            request.insert((*name).into(), v.clone());
        }
    }
    let oil_start = f.quantity("oil_temperature_start", D::Temperature)?;
    if let Some(p) = procedure {
        if !f.has("limit")
            && let Some(a) = p.allowed_at(oil_start)
        {
            let (key, dimension) = limit;
            request.insert(
                "limit".into(),
                json!({key: si(a.amount, dimension), "per": si(a.per, D::Time)}),
            );
        }
        if !f.has("oil_expansion")
            && let Some(e) = p.oil_expansion_per_k
        {
            request.insert("oil_expansion".into(), si(e, D::Expansion));
        }
    }
    if !f.has("units") {
        let units = cylinder.site_units.as_deref().unwrap_or("metric");
        request.insert("units".into(), json!(units));
    }
    Ok(())
}
