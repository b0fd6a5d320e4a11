//! The demo fleet of "Harrow Vale Plant Hire", an invented plant-hire and service yard, read
//! from the JSON files in `seed-demo/` (compiled in) through the same readers as the API, so
//! the demo data obeys every rule a client must. And the scale generator for benchmarks.

pub mod generate;
pub mod history;

use crate::api::{cylinder_draft, draft, hose_draft, machine_draft, sites as site_input};
use crate::calc::bypass::{self, Line, Trapped};
use crate::calc::cylinder::{Cylinder as Geometry, LoadDirection};
use crate::calc::fluid;
use crate::db::machines::MachineFields;
use crate::db::sites::SiteFields;
use crate::db::{Db, cylinders, hoses, machines, sites};
use crate::error::AppError;
use serde_json::{Map, Value};
use sqlx::SqliteConnection;
use std::collections::HashMap;

const SITES: &str = include_str!("../../seed-demo/sites.json");
const FLEETS: [(&str, &str); 3] = [
    (
        "fleet-north.json",
        include_str!("../../seed-demo/fleet-north.json"),
    ),
    (
        "fleet-quarry.json",
        include_str!("../../seed-demo/fleet-quarry.json"),
    ),
    (
        "fleet-port.json",
        include_str!("../../seed-demo/fleet-port.json"),
    ),
];

/// Who the demo's audit rows name.
const LOADER: &str = "demo loader";

fn object(value: &Value, what: &str) -> Result<Map<String, Value>, String> {
    value
        .as_object()
        .cloned()
        .ok_or_else(|| format!("{what} must be a JSON object"))
}

fn take_array(map: &mut Map<String, Value>, key: &str) -> Vec<Value> {
    match map.remove(key) {
        Some(Value::Array(items)) => items,
        _ => Vec::new(),
    }
}

fn take_text(map: &mut Map<String, Value>, key: &str, what: &str) -> Result<String, String> {
    match map.remove(key) {
        Some(Value::String(text)) => Ok(text),
        _ => Err(format!("{what}: \"{key}\" is missing")),
    }
}

/// The registration timestamp of a `YYYY-MM-DD` date: 08:00 UTC that day.
fn registered(date: &str, what: &str) -> Result<String, String> {
    crate::api::input::parse_date(date)
        .map(|d| format!("{}T08:00:00Z", draft::date_text(d)))
        .ok_or_else(|| format!("{what}: registered_on must be a date YYYY-MM-DD"))
}

fn refused(what: &str, problems: Vec<AppError>) -> String {
    let lines: Vec<String> = problems
        .iter()
        .map(|p| {
            let (_, message, field) = p.parts();
            format!("{}: {message}", field.unwrap_or_default())
        })
        .collect();
    format!("{what}: {}", lines.join("; "))
}

/// Loads the demo fleet into `db` (which must hold no machines yet) in one transaction;
/// returns a one-line summary of the fleet.
pub async fn load_demo(db: &Db) -> Result<String, String> {
    let existing: i64 = sqlx::query_scalar("SELECT COUNT(*) FROM machines")
        .fetch_one(db)
        .await
        .map_err(|e| e.to_string())?;
    if existing > 0 {
        return Err(format!(
            "the database already holds {existing} machines; load the demo into an empty database"
        ));
    }
    let mut tx = db
        .begin_with("BEGIN IMMEDIATE")
        .await
        .map_err(|e| e.to_string())?;
    let company = load_fleet(&mut tx).await?;
    // shop: the demo's history (drift tests, inspections) loads here, in the same transaction.
    tx.commit().await.map_err(|e| e.to_string())?;
    let history = history::load(db).await?;
    Ok(format!("{}; {history}", summary(db, &company).await?))
}

async fn load_fleet(conn: &mut SqliteConnection) -> Result<String, String> {
    let sites_file: Value = serde_json::from_str(SITES).map_err(|e| format!("sites.json: {e}"))?;
    let company = sites_file["company"]
        .as_str()
        .unwrap_or("Demo fleet")
        .to_string();
    let mut site_ids = HashMap::new();
    for value in sites_file["sites"].as_array().into_iter().flatten() {
        let mut map = object(value, "sites.json: a site")?;
        let key = take_text(&mut map, "key", "sites.json: a site")?;
        let at = registered(&take_text(&mut map, "registered_on", &key)?, &key)?;
        let empty = SiteFields {
            name: String::new(),
            units: "metric".into(),
            trapped_oil_warming_k: None,
        };
        let (fields, _) = site_input::read(&map, empty).map_err(|p| refused(&key, p))?;
        let site = sites::insert(conn, LOADER, &at, &fields)
            .await
            .map_err(|e| format!("site {key}: {e}"))?;
        site_ids.insert(key, site.id);
    }
    for (file, text) in FLEETS {
        let fleet: Value = serde_json::from_str(text).map_err(|e| format!("{file}: {e}"))?;
        let key = fleet["site"].as_str().unwrap_or_default();
        let site_id = *site_ids
            .get(key)
            .ok_or_else(|| format!("{file}: unknown site \"{key}\""))?;
        for value in fleet["machines"].as_array().into_iter().flatten() {
            load_machine(conn, file, site_id, value).await?;
        }
    }
    Ok(company)
}

async fn load_machine(
    conn: &mut SqliteConnection,
    file: &str,
    site_id: i64,
    value: &Value,
) -> Result<(), String> {
    let mut map = object(value, &format!("{file}: a machine"))?;
    let unit = map["unit_number"].as_str().unwrap_or("?").to_string();
    let what = format!("{file}: {unit}");
    let at = registered(&take_text(&mut map, "registered_on", &what)?, &what)?;
    let cylinder_values = take_array(&mut map, "cylinders");
    let hose_values = take_array(&mut map, "hoses");
    map.insert("site_id".into(), Value::from(site_id));
    let (fields, _) =
        machine_draft::read(&map, MachineFields::default()).map_err(|p| refused(&what, p))?;
    let machine = machines::insert(conn, LOADER, &at, &fields)
        .await
        .map_err(|e| format!("{what}: {e}"))?;
    for value in &cylinder_values {
        let mut map = object(value, &format!("{what}: a cylinder"))?;
        let function = map["function"].as_str().unwrap_or("?").to_string();
        let what = format!("{what}: {function}");
        let hose_values = take_array(&mut map, "hoses");
        map.insert("machine_id".into(), Value::from(machine.id));
        let (fields, _) = cylinder_draft::read(&map, cylinder_draft::Draft::default())
            .map_err(|p| refused(&what, p))?;
        let cylinder = cylinders::insert(conn, LOADER, &at, &fields)
            .await
            .map_err(|e| format!("{what}: {e}"))?;
        for value in &hose_values {
            load_hose(conn, &what, &at, machine.id, Some(cylinder.id), value).await?;
        }
    }
    for value in &hose_values {
        load_hose(conn, &what, &at, machine.id, None, value).await?;
    }
    Ok(())
}

async fn load_hose(
    conn: &mut SqliteConnection,
    what: &str,
    at: &str,
    machine_id: i64,
    cylinder_id: Option<i64>,
    value: &Value,
) -> Result<(), String> {
    let mut map = object(value, &format!("{what}: a hose"))?;
    map.insert("machine_id".into(), Value::from(machine_id));
    if let Some(id) = cylinder_id {
        map.insert("cylinder_id".into(), Value::from(id));
    }
    let what = format!("{what}: hose {}", map["spec"].as_str().unwrap_or("?"));
    let (draft, _) =
        hose_draft::read(&map, hose_draft::Draft::default()).map_err(|p| refused(&what, p))?;
    let fields = hose_draft::finish(draft).map_err(|p| refused(&what, p))?;
    hoses::insert(conn, LOADER, at, &fields)
        .await
        .map_err(|e| format!("{what}: {e}"))?;
    Ok(())
}

/// `Harrow Vale Plant Hire: 3 sites, 16 machines, 40 cylinders, 81 hoses (...)`.
async fn summary(db: &Db, company: &str) -> Result<String, String> {
    let count = |sql: &'static str| async move {
        sqlx::query_scalar::<_, i64>(sql)
            .fetch_one(db)
            .await
            .map_err(|e| e.to_string())
    };
    let site_count = count("SELECT COUNT(*) FROM sites").await?;
    let machine_count = count("SELECT COUNT(*) FROM machines").await?;
    let cylinder_count = count("SELECT COUNT(*) FROM cylinders").await?;
    let hose_count = count("SELECT COUNT(*) FROM hoses").await?;
    let past: i64 = sqlx::query_scalar("SELECT COUNT(*) FROM hoses WHERE replace_by < ?")
        .bind(draft::date_text(draft::today()))
        .fetch_one(db)
        .await
        .map_err(|e| e.to_string())?;
    let below = hoses_below_bypass(db).await?;
    Ok(format!(
        "{company}: {site_count} sites, {machine_count} machines, {cylinder_count} cylinders, \
         {hose_count} hose assemblies ({below} rated below their cylinder's seal-bypass pressure, \
         {past} past their replace-by date)"
    ))
}

/// A hose fitted to a cylinder, with what the bypass check needs.
#[derive(sqlx::FromRow)]
struct FittedHose {
    bore_m: f64,
    rod_m: f64,
    stroke_m: f64,
    load_direction: String,
    max_load_n: Option<f64>,
    working_pressure_pa: Option<f64>,
}

/// How many cylinder hoses are rated below the pressure a piston seal bypass would put on them
/// (the engineering core's `seal_bypass`, with the recorded highest load).
pub async fn hoses_below_bypass(db: &Db) -> Result<usize, String> {
    let rows: Vec<FittedHose> = sqlx::query_as(
        "SELECT c.bore_m, c.rod_m, c.stroke_m, c.load_direction, c.max_load_n,
                h.working_pressure_pa
         FROM hoses h JOIN cylinders c ON c.id = h.cylinder_id
         WHERE h.archived_at IS NULL AND c.archived_at IS NULL",
    )
    .fetch_all(db)
    .await
    .map_err(|e| e.to_string())?;
    let trapped = Trapped {
        bulk_modulus: fluid::DEFAULT_BULK_MODULUS,
        cap_line: Line::default(),
        rod_line: Line::default(),
        tube: None,
    };
    Ok(rows
        .into_iter()
        .filter(|h| {
            let (Ok(geometry), Some(direction), Some(load), Some(rating)) = (
                Geometry::new(h.bore_m, h.rod_m, h.stroke_m),
                LoadDirection::parse(&h.load_direction),
                h.max_load_n,
                h.working_pressure_pa,
            ) else {
                return false;
            };
            bypass::seal_bypass(&geometry, h.stroke_m / 2.0, load, direction, &trapped)
                .final_pressure
                .is_some_and(|p| p > rating)
        })
        .count())
}

/// Generates `n` machines of synthetic fleet for benchmarks; returns a summary to print.
pub async fn generate(db: &Db, n: u32) -> Result<String, String> {
    generate::generate(db, n).await
}
