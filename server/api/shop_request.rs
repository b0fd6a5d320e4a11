//! What the shop's test records take from the registry: the calculation request of a stored
//! cylinder (geometry, held load, relief setting, tube, end condition, ratings of the cylinder
//! and of each hose on its ports), and the check that a chosen procedure applies to it.

use super::shop_input::si;
use crate::calc::cylinder::{Cylinder as Geometry, LoadDirection};
use crate::calc::quantity::Dimension as D;
use crate::db::cylinders::Cylinder;
use crate::db::machines::Machine;
use crate::db::procedures::{self, Procedure};
use crate::db::{Db, hoses};
use crate::error::AppError;
use serde_json::{Map, Value, json};

/// The procedure named by `procedure_id`, checked to be a drift procedure that applies to
/// this cylinder (its own, or shared by its machine's kind) and not archived.
pub async fn applicable_procedure(
    db: &Db,
    id: i64,
    kind: &str,
    cylinder: &Cylinder,
    machine: &Machine,
) -> Result<Procedure, AppError> {
    let bad = |message: String| AppError::field("procedure_id", "invalid_reference", message);
    let p = procedures::find(db, id)
        .await?
        .ok_or_else(|| bad(format!("there is no procedure {id}")))?;
    if p.kind != kind {
        return Err(bad(format!("procedure {id} is a {} procedure", p.kind)));
    }
    if p.archived_at.is_some() {
        return Err(bad(format!("procedure {id} is archived")));
    }
    let fits = p.cylinder_id == Some(cylinder.id)
        || p.machine_kind.as_deref() == Some(machine.kind.as_str());
    if !fits {
        return Err(bad(format!(
            "procedure {id} is for another cylinder or machine kind"
        )));
    }
    Ok(p)
}

/// The calculation request for a registry cylinder: its geometry, held load, relief setting,
/// tube, end condition and ratings (cylinder and each rated hose on its ports), as SI JSON.
pub async fn cylinder_request(
    db: &Db,
    c: &Cylinder,
    load_given: bool,
) -> Result<Map<String, Value>, AppError> {
    let mut r = Map::new();
    r.insert("bore".into(), si(c.bore_m, D::Length));
    r.insert("rod".into(), si(c.rod_m, D::Length));
    r.insert("stroke".into(), si(c.stroke_m, D::Length));
    r.insert("load_direction".into(), json!(c.load_direction));
    if !load_given {
        let geometry = Geometry::new(c.bore_m, c.rod_m, c.stroke_m).map_err(|e| {
            AppError::conflict(
                "cylinder",
                format!("the registered geometry cannot be analysed: {}", e.message),
            )
        })?;
        let direction = LoadDirection::parse(&c.load_direction).unwrap_or(LoadDirection::Retract);
        let load = c.max_load_n.or_else(|| {
            c.holding_pressure_pa
                .map(|p| p * geometry.area(direction.holding_end()))
        });
        match load {
            Some(load) => {
                r.insert("load".into(), si(load, D::Force));
            }
            None => {
                return Err(AppError::field(
                    "load",
                    "required",
                    "the cylinder record has no load or holding pressure; give the load held in this test",
                ));
            }
        }
    }
    if let Some(p) = c.machine_relief_pressure_pa {
        r.insert("supply_pressure".into(), si(p, D::Pressure));
    }
    if let Some(od) = c.tube_outside_diameter_m {
        r.insert("tube_outside_diameter".into(), si(od, D::Length));
        if let Some(y) = c.tube_yield_pa {
            r.insert("tube_yield".into(), si(y, D::Pressure));
        }
    }
    if let Some(e) = &c.end_condition {
        r.insert("end_condition".into(), json!(e));
    }
    valve_request(c, &mut r);
    let mut ratings = Map::new();
    if let Some(p) = c.rated_pressure_pa {
        ratings.insert("cylinder".into(), si(p, D::Pressure));
    }
    let fitted: Vec<Value> = hoses::of_machine(db, c.machine_id)
        .await?
        .into_iter()
        .filter(|h| h.cylinder_id == Some(c.id))
        .filter_map(|h| match (h.working_pressure_pa, h.port.as_deref()) {
            (Some(rating), Some(port)) => Some(json!({
                "label": crate::db::installed::hose_label(&h),
                "port": port,
                "rating": si(rating, D::Pressure),
            })),
            _ => None,
        })
        .collect();
    if !fitted.is_empty() {
        ratings.insert("hoses".into(), Value::Array(fitted));
    }
    if !ratings.is_empty() {
        r.insert("ratings".into(), Value::Object(ratings));
    }
    Ok(r)
}

/// The recorded valves and the site's trapped-oil warming as calculation request fields.
fn valve_request(c: &Cylinder, r: &mut Map<String, Value>) {
    let v = &c.valves;
    for (name, word) in [
        ("holding_valve", &v.holding_valve),
        ("holding_valve_pilot", &v.holding_valve_pilot),
        ("cap_port_centre", &v.cap_port_centre),
        ("rod_port_centre", &v.rod_port_centre),
    ] {
        if let Some(w) = word {
            r.insert(name.into(), json!(w));
        }
    }
    if let Some(s) = v.holding_valve_setting_pa {
        r.insert("holding_valve_setting".into(), si(s, D::Pressure));
    }
    if let Some(ratio) = v.holding_valve_pilot_ratio {
        r.insert("holding_valve_pilot_ratio".into(), json!(ratio));
    }
    if let Some(k) = c.site_trapped_oil_warming_k {
        r.insert("temperature_rise".into(), si(k, D::TemperatureChange));
    }
}
