//! The hazard list: cylinders where any scenario of the analysis (at the worst load of the
//! recorded range) puts a rated component above its rating, or, on an end with no rating, above
//! the machine's relief setting, one line per component at its worst scenario; hoses past their replace-by date or
//! older than the shop's age limit; cylinders whose drift trend reaches its limit within the
//! window. Three queries for the whole fleet (cylinders, hoses, drift tests); the figures come
//! from the engineering core (`calc::analysis`, `calc::trend`).

use super::hoses::{self, HoseAge, HoseRow, HoseScope};
use super::{FleetFilter, day_of};
use crate::calc::analysis::{self, CylinderInput};
use crate::calc::due::add_days;
use crate::calc::installed::{self, Installed, RatedLine};
use crate::calc::limits;
use crate::calc::quantity::UnitSystem;
use crate::calc::ratings::{Check, Status};
use crate::calc::trend::{self, Crossing, Sample};
use crate::db::Db;
use serde::Serialize;
use std::collections::BTreeMap;
use time::Date;
use time::OffsetDateTime;
use time::format_description::well_known::Rfc3339;

/// Which machines, as of which day, looking how far ahead for the drift trend.
#[derive(Clone, Debug, PartialEq)]
pub struct HazardQuery {
    pub as_of: Date,
    pub within_days: i64,
    pub filter: FleetFilter,
}

/// A pressure above a rating.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct PressureHazard {
    pub machine_id: i64,
    pub unit_number: String,
    pub site_id: Option<i64>,
    pub site_name: Option<String>,
    pub cylinder_id: i64,
    pub cylinder_function: Option<String>,
    /// The scenario that puts the highest pressure on the component over its rating, named as
    /// the analysis names it (`seal_bypass`, `rod_side_intensification`,
    /// `trapped_oil_heating`, `normal_holding`, or any scenario the core adds).
    pub scenario: &'static str,
    /// Every scenario that puts the component above its rating, worst first.
    pub scenarios_above: Vec<&'static str>,
    /// `cylinder`, the hose's label (`H12 (cap port, SAE 100R2AT)`), or `relief_setting` (an
    /// end with no rating recorded, whose pressure is above the machine's relief setting).
    pub component: String,
    /// The pressures the component sees: `cap`, `rod` or `both` (the cylinder).
    pub exposure: &'static str,
    /// The hose, when the rating is a hose's.
    pub hose_id: Option<i64>,
    /// Pressure the scenario puts on the component and its rating, Pa.
    pub pressure_pa: f64,
    pub rating_pa: f64,
    /// The load in the cylinder's recorded range behind the pressure, N (the worst one).
    pub load_n: f64,
}

/// A drift trend reaching its limit.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct TrendHazard {
    pub machine_id: i64,
    pub unit_number: String,
    pub site_id: Option<i64>,
    pub site_name: Option<String>,
    pub cylinder_id: i64,
    pub cylinder_function: Option<String>,
    /// The estimated day the trend line reaches the limit (an estimate from a straight line).
    pub crosses_on: Date,
    /// True when the line is already at the limit at the latest test.
    pub reached: bool,
    /// Limit, m per `limit_period_s`.
    pub limit_m: f64,
    pub limit_period_s: f64,
    /// The latest test's leak drift after the thermal correction, scaled to the period, m.
    pub latest_m: f64,
    pub tests_used: usize,
}

/// Everything on the hazard list.
#[derive(Clone, Debug, Default, PartialEq, Serialize)]
pub struct Hazards {
    pub pressures: Vec<PressureHazard>,
    pub hoses: Vec<HoseAge>,
    pub trends: Vec<TrendHazard>,
}

/// A cylinder with what the ratings check needs from it and its machine.
#[derive(Clone, Debug, sqlx::FromRow)]
struct CylinderRow {
    id: i64,
    machine_id: i64,
    unit_number: String,
    site_id: Option<i64>,
    site_name: Option<String>,
    function: Option<String>,
    bore_m: f64,
    rod_m: f64,
    stroke_m: f64,
    load_direction: String,
    max_load_n: Option<f64>,
    holding_pressure_pa: Option<f64>,
    rated_pressure_pa: Option<f64>,
    relief_pressure_pa: Option<f64>,
    tube_outside_diameter_m: Option<f64>,
    tube_yield_pa: Option<f64>,
    end_condition: Option<String>,
    min_load_n: Option<f64>,
    buckling_length_m: Option<f64>,
    rod_yield_pa: Option<f64>,
    #[sqlx(flatten)]
    valves: crate::db::cylinder_valves::ValveFields,
    trapped_oil_warming_k: Option<f64>,
}

async fn cylinder_rows(db: &Db, filter: &FleetFilter) -> Result<Vec<CylinderRow>, sqlx::Error> {
    sqlx::query_as::<_, CylinderRow>(
        "SELECT c.id, c.machine_id, m.unit_number, m.site_id, s.name AS site_name, c.function,
            c.bore_m, c.rod_m, c.stroke_m, c.load_direction, c.max_load_n,
            c.holding_pressure_pa, c.rated_pressure_pa, m.relief_pressure_pa,
            c.tube_outside_diameter_m, c.tube_yield_pa, c.end_condition, c.min_load_n,
            c.buckling_length_m, c.rod_yield_pa, c.holding_valve,
            c.holding_valve_setting_pa, c.holding_valve_pilot_ratio, c.holding_valve_pilot,
            c.cap_port_centre, c.rod_port_centre, s.trapped_oil_warming_k
         FROM cylinders c
         JOIN machines m ON m.id = c.machine_id
         LEFT JOIN sites s ON s.id = m.site_id
         WHERE c.archived_at IS NULL AND m.archived_at IS NULL
           AND (? IS NULL OR m.site_id = ?)
           AND (? IS NULL OR m.kind = ?)
           AND (? IS NULL OR m.status = ?)
         ORDER BY m.unit_number, c.id",
    )
    .bind(filter.site_id)
    .bind(filter.site_id)
    .bind(&filter.machine_kind)
    .bind(&filter.machine_kind)
    .bind(&filter.status)
    .bind(&filter.status)
    .fetch_all(db)
    .await
}

/// A hose's name among a cylinder's ratings, as the cylinder page's safety panel writes it.
fn hose_label(h: &HoseRow) -> String {
    let place = installed::place(h.port.as_deref(), h.circuit.as_deref());
    installed::line_label(h.id, &place, h.spec.as_deref(), h.size.as_deref())
}

/// The core's input for the ratings check, built as the cylinder page builds it
/// ([`Installed::input`]). `None` when the geometry cannot be used.
fn input(c: &CylinderRow, hoses: &[&HoseRow]) -> Option<CylinderInput> {
    let cylinder = Installed {
        bore: c.bore_m,
        rod: c.rod_m,
        stroke: c.stroke_m,
        load_direction: c.load_direction.clone(),
        max_load: c.max_load_n,
        holding_pressure: c.holding_pressure_pa,
        relief_pressure: c.relief_pressure_pa,
        rated_pressure: c.rated_pressure_pa,
        tube_outside_diameter: c.tube_outside_diameter_m,
        tube_yield: c.tube_yield_pa,
        end_condition: c.end_condition.clone(),
        min_load: c.min_load_n,
        buckling_length: c.buckling_length_m,
        rod_yield: c.rod_yield_pa,
        valves: c.valves.calc(),
        temperature_rise: c.trapped_oil_warming_k,
    };
    let lines: Vec<RatedLine> = hoses
        .iter()
        .filter_map(|h| match (h.working_pressure_pa, h.port.as_deref()) {
            (Some(rating), Some(port)) => Some(RatedLine {
                label: hose_label(h),
                port: port.to_string(),
                rating,
            }),
            _ => None,
        })
        .collect();
    cylinder.input(&lines).ok().map(|(input, _)| input)
}

/// The pressures above a rating of one cylinder: every scenario the analysis computed, with
/// one line per rated component at its worst scenario (the highest pressure over rating),
/// exactly as the cylinder page's safety panel and `GET /api/v1/cylinders/{id}/safety`
/// compute them.
fn pressure_hazards(c: &CylinderRow, hoses: &[&HoseRow]) -> Vec<PressureHazard> {
    let Some(input) = input(c, hoses) else {
        return Vec::new();
    };
    let Ok(report) = analysis::analyse(&input, UnitSystem::Metric) else {
        return Vec::new();
    };
    // Every scenario at the worst load of the range; a relief-setting check counts only on an
    // end with no rating (where a rating is recorded, the rating decides:
    // limits::decides_status). One line per component (and, for the relief setting, per end)
    // at its worst scenario, with every other scenario above it listed.
    let deciding: Vec<&Check> = report
        .checks
        .iter()
        .filter(|k| k.status == Status::Exceeds && limits::decides_status(k, &input.ratings))
        .collect();
    let mut components: Vec<(&str, &'static str)> = Vec::new();
    for k in &deciding {
        let key = (k.component.as_str(), k.exposure.as_str());
        if !components.contains(&key) {
            components.push(key);
        }
    }
    let mut out: Vec<PressureHazard> = Vec::new();
    for (component, exposure) in components {
        let mut above: Vec<&Check> = deciding
            .iter()
            .copied()
            .filter(|k| k.component == component && k.exposure.as_str() == exposure)
            .collect();
        above.sort_by(|a, b| (b.pressure / b.rating).total_cmp(&(a.pressure / a.rating)));
        let Some(worst) = above.first() else {
            continue;
        };
        out.push(PressureHazard {
            machine_id: c.machine_id,
            unit_number: c.unit_number.clone(),
            site_id: c.site_id,
            site_name: c.site_name.clone(),
            cylinder_id: c.id,
            cylinder_function: c.function.clone(),
            scenario: worst.scenario,
            scenarios_above: above.iter().map(|k| k.scenario).collect(),
            component: worst.component.clone(),
            exposure: worst.exposure.as_str(),
            hose_id: hoses
                .iter()
                .find(|h| hose_label(h) == worst.component)
                .map(|h| h.id),
            pressure_pa: worst.pressure,
            rating_pa: worst.rating,
            load_n: worst.load,
        });
    }
    out
}

/// A hazard's scenario in words, for pages and CSV (the analysis's own words).
pub fn scenario_words(scenario: &str) -> &'static str {
    analysis::scenario_words(scenario)
}

/// A drift test on a cylinder's trend.
#[derive(Clone, Debug, sqlx::FromRow)]
struct TestRow {
    cylinder_id: i64,
    tested_at: String,
    scaled_leak_drift_m: f64,
    limit_distance_m: f64,
    scaled_period_s: f64,
}

/// In-force drift tests with a limit, of cylinders in the filter, tested on or before `as_of`.
async fn test_rows(db: &Db, q: &HazardQuery) -> Result<Vec<TestRow>, sqlx::Error> {
    let f = &q.filter;
    sqlx::query_as::<_, TestRow>(
        "SELECT d.cylinder_id, d.tested_at, d.scaled_leak_drift_m, d.limit_distance_m,
            d.scaled_period_s
         FROM drift_tests d
         JOIN cylinders c ON c.id = d.cylinder_id
         JOIN machines m ON m.id = c.machine_id
         WHERE c.archived_at IS NULL AND m.archived_at IS NULL
           AND d.limit_distance_m IS NOT NULL
           AND substr(d.tested_at, 1, 10) <= ?
           AND NOT EXISTS (SELECT 1 FROM drift_tests a WHERE a.amends_id = d.id)
           AND (? IS NULL OR m.site_id = ?)
           AND (? IS NULL OR m.kind = ?)
           AND (? IS NULL OR m.status = ?)
         ORDER BY d.cylinder_id, d.tested_at",
    )
    .bind(q.as_of.to_string())
    .bind(f.site_id)
    .bind(f.site_id)
    .bind(&f.machine_kind)
    .bind(&f.machine_kind)
    .bind(&f.status)
    .bind(&f.status)
    .fetch_all(db)
    .await
}

/// Seconds since the Unix epoch of an RFC 3339 timestamp (or a bare date at 00:00 UTC).
fn epoch_seconds(text: &str) -> Option<f64> {
    if let Ok(t) = OffsetDateTime::parse(text.trim(), &Rfc3339) {
        return Some(t.unix_timestamp() as f64);
    }
    day_of(text).map(|d| d.midnight().assume_utc().unix_timestamp() as f64)
}

/// The trend of one cylinder's tests (oldest first), judged against the latest test's limit
/// over the tests scaled to that same period; a hazard when the line reaches the limit on or
/// before `as_of + within_days`.
fn trend_hazard(c: &CylinderRow, tests: &[&TestRow], q: &HazardQuery) -> Option<TrendHazard> {
    let latest = tests.last()?;
    let samples: Vec<Sample> = tests
        .iter()
        .filter(|t| (t.scaled_period_s - latest.scaled_period_s).abs() < 1e-6)
        .filter_map(|t| {
            Some(Sample {
                at: epoch_seconds(&t.tested_at)?,
                value: t.scaled_leak_drift_m,
            })
        })
        .collect();
    let projection = trend::project(&samples, latest.limit_distance_m, trend::RECENT_TESTS);
    let (at, reached) = match projection.crossing {
        Crossing::Reached { at } => (at, true),
        Crossing::Estimated { at } => (at, false),
        _ => return None,
    };
    let crosses_on = OffsetDateTime::from_unix_timestamp(at as i64).ok()?.date();
    let horizon = add_days(q.as_of, q.within_days)?;
    (crosses_on <= horizon).then(|| TrendHazard {
        machine_id: c.machine_id,
        unit_number: c.unit_number.clone(),
        site_id: c.site_id,
        site_name: c.site_name.clone(),
        cylinder_id: c.id,
        cylinder_function: c.function.clone(),
        crosses_on,
        reached,
        limit_m: latest.limit_distance_m,
        limit_period_s: latest.scaled_period_s,
        latest_m: latest.scaled_leak_drift_m,
        tests_used: projection.used,
    })
}

/// The hazard list as of `q.as_of`.
pub async fn hazards(db: &Db, q: &HazardQuery) -> Result<Hazards, sqlx::Error> {
    let cylinders = cylinder_rows(db, &q.filter).await?;
    let hose_rows = hoses::hose_rows(db, &q.filter, HoseScope::default()).await?;
    let tests = test_rows(db, q).await?;
    let settings = hoses::settings(db).await?;

    let mut hoses_of: BTreeMap<i64, Vec<&HoseRow>> = BTreeMap::new();
    for h in &hose_rows {
        if let Some(cylinder_id) = h.cylinder_id {
            hoses_of.entry(cylinder_id).or_default().push(h);
        }
    }
    let mut tests_of: BTreeMap<i64, Vec<&TestRow>> = BTreeMap::new();
    for t in &tests {
        tests_of.entry(t.cylinder_id).or_default().push(t);
    }

    let mut out = Hazards::default();
    for c in &cylinders {
        let fitted = hoses_of.get(&c.id).map(Vec::as_slice).unwrap_or(&[]);
        out.pressures.extend(pressure_hazards(c, fitted));
        if let Some(t) = tests_of.get(&c.id).and_then(|t| trend_hazard(c, t, q)) {
            out.trends.push(t);
        }
    }
    out.pressures.sort_by(|a, b| {
        (b.pressure_pa / b.rating_pa)
            .total_cmp(&(a.pressure_pa / a.rating_pa))
            .then(a.unit_number.cmp(&b.unit_number))
    });
    out.trends.sort_by(|a, b| {
        a.crosses_on
            .cmp(&b.crosses_on)
            .then(a.unit_number.cmp(&b.unit_number))
    });
    out.hoses = hose_rows
        .iter()
        .map(|h| hoses::age_line(h, q.as_of, &settings))
        .filter(|a| a.past_replace_by || a.over_age_limit)
        .collect();
    out.hoses
        .sort_by_key(|a| (a.born_on.is_none(), a.born_on, a.hose_id));
    Ok(out)
}
