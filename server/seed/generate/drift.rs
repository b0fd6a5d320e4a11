//! Five years of drift tests for one generated cylinder, each analysed by the engineering core
//! through the same request parser and response writer as `POST
//! /api/v1/cylinders/{id}/drift-tests`, so a generated record reads like a real one.

use super::fleet::{CylinderSim, days, round_to, stamp};
use super::history::{MachineSim, ProcedureSim};
use super::rng::Rng;
use super::tables::DRIFT_TESTS;
use super::{Counts, Rows};
use crate::api::calc_input::{parse_cylinder_request, parse_drift_readings};
use crate::api::calc_output::drift_response;
use crate::api::input::Fields;
use crate::api::shop_input::{TEMPERATURE_CHANGE_FLAG, si};
use crate::calc::CALC_VERSION;
use crate::calc::cylinder::{Cylinder, End};
use crate::calc::drift::{analyse_drift, thermal_drift};
use crate::calc::quantity::Dimension as D;
use serde_json::{Map, Value, json};
use time::Date;

/// The cylinder half of the drift-test request, as the shop API builds it from the registry.
fn cylinder_request(c: &CylinderSim, relief: f64) -> Map<String, Value> {
    let mut r = Map::new();
    r.insert("bore".into(), si(c.bore, D::Length));
    r.insert("rod".into(), si(c.rod, D::Length));
    r.insert("stroke".into(), si(c.stroke, D::Length));
    r.insert("load_direction".into(), json!(c.direction));
    r.insert("load".into(), si(c.max_load, D::Force));
    r.insert("supply_pressure".into(), si(relief, D::Pressure));
    if let Some(od) = c.tube_od {
        r.insert("tube_outside_diameter".into(), si(od, D::Length));
        if let Some(y) = c.tube_yield {
            r.insert("tube_yield".into(), si(y, D::Pressure));
        }
    }
    if let Some(e) = c.end_condition {
        r.insert("end_condition".into(), json!(e));
    }
    let mut ratings = Map::new();
    if let Some(p) = c.rated {
        ratings.insert("cylinder".into(), si(p, D::Pressure));
    }
    let hoses: Vec<Value> = c
        .hoses
        .iter()
        .map(|(label, port, rating)| json!({"label": label, "port": port, "rating": si(*rating, D::Pressure)}))
        .collect();
    if !hoses.is_empty() {
        ratings.insert("hoses".into(), Value::Array(hoses));
    }
    if !ratings.is_empty() {
        r.insert("ratings".into(), Value::Object(ratings));
    }
    r
}

/// One drift test's readings, made from the cylinder's leak on the day (m per 10 minutes).
struct Readings {
    duration: f64,
    start: f64,
    end: f64,
    oil_start: f64,
    oil_end: f64,
    ambient: f64,
    /// (cap start, cap end, rod start, rod end), Pa, when gauges were fitted.
    pressures: Option<(f64, f64, f64, f64)>,
}

fn readings(
    rng: &mut Rng,
    c: &CylinderSim,
    p: &ProcedureSim,
    leak: f64,
    gauges: bool,
) -> Option<Readings> {
    let geometry = Cylinder::new(c.bore, c.rod, c.stroke).ok()?;
    let hold = if c.direction == "retract" {
        End::Cap
    } else {
        End::Rod
    };
    let duration = round_to(p.duration + rng.range(-30.0, 60.0), 1.0);
    let start = round_to(c.stroke * rng.range(0.3, 0.7), 0.001);
    let oil_start = if rng.chance(0.9) {
        rng.range(p.oil_min_k + 1.0, p.oil_max_k - 1.0)
    } else {
        rng.range(p.oil_min_k - 8.0, p.oil_max_k + 5.0)
    };
    let oil_start = round_to(oil_start, 0.5);
    let change = if rng.chance(0.1) {
        rng.range(0.0, 1.0)
    } else {
        -rng.range(0.0, 3.0)
    };
    let oil_end = round_to(oil_start + change, 0.5);
    let thermal = thermal_drift(
        geometry.volume(hold, start),
        geometry.area(hold),
        p.expansion,
        oil_end - oil_start,
    );
    let drift = thermal + leak * duration / 600.0;
    let end = if hold == End::Cap {
        start - drift
    } else {
        start + drift
    };
    let end = round_to(end.clamp(0.0, c.stroke), 0.0005);
    let pressures = gauges.then(|| {
        let held = c.max_load / geometry.area(hold) * rng.range(0.97, 1.03);
        let held_end = held * (1.0 - rng.range(0.0, 0.02));
        let other = rng.range(0.5e5, 3e5);
        let rise = if leak > 1e-3 {
            (held - other) * (leak / 5e-3).min(1.0) * 0.5
        } else {
            0.0
        };
        match hold {
            End::Cap => (held, held_end, other, other + rise),
            End::Rod => (other, other + rise, held, held_end),
        }
    });
    Some(Readings {
        duration,
        start,
        end,
        oil_start,
        oil_end,
        ambient: round_to(rng.range(275.0, 303.0), 0.5),
        pressures,
    })
}

/// The rows of one drift test (and of its correction, one time in a hundred); `None` when the
/// engineering core refuses the readings. Returns the verdict with the rows.
#[allow(clippy::too_many_arguments)]
fn drift_test(
    rng: &mut Rng,
    m: &MachineSim<'_>,
    c: &CylinderSim,
    p: &ProcedureSim,
    base: &Map<String, Value>,
    on: Date,
    leak: f64,
    gauges: bool,
    next_id: &mut i64,
    rows: &mut Rows,
) -> Option<String> {
    let r = readings(rng, c, p, leak, gauges)?;
    let mut request = base.clone();
    request.insert("duration".into(), si(r.duration, D::Time));
    request.insert("start_position".into(), si(r.start, D::Length));
    request.insert("end_position".into(), si(r.end, D::Length));
    request.insert(
        "oil_temperature_start".into(),
        si(r.oil_start, D::Temperature),
    );
    request.insert("oil_temperature_end".into(), si(r.oil_end, D::Temperature));
    if let Some((cs, ce, rs, re)) = r.pressures {
        request.insert("cap_pressure_start".into(), si(cs, D::Pressure));
        request.insert("cap_pressure_end".into(), si(ce, D::Pressure));
        request.insert("rod_pressure_start".into(), si(rs, D::Pressure));
        request.insert("rod_pressure_end".into(), si(re, D::Pressure));
    }
    request.insert(
        "limit".into(),
        json!({"distance": si(p.limit_distance, D::Length), "per": si(p.per, D::Time)}),
    );
    request.insert("oil_expansion".into(), si(p.expansion, D::Expansion));
    request.insert("units".into(), json!(m.site.units));
    let f = Fields::new(&request);
    let units = f.units().ok()?;
    let input = parse_cylinder_request(&f).ok()?;
    let parsed = parse_drift_readings(&f).ok()?;
    let report = analyse_drift(&input, &parsed, units).ok()?;
    let analysis = drift_response(&report, units).to_string();
    let readings_json = Value::Object(request).to_string();
    let mut flags = Vec::new();
    if r.oil_start.min(r.oil_end) < p.oil_min_k {
        flags.push("oil_temperature_below_window");
    }
    if r.oil_start.max(r.oil_end) > p.oil_max_k {
        flags.push("oil_temperature_above_window");
    }
    if (r.oil_end - r.oil_start).abs() > TEMPERATURE_CHANGE_FLAG {
        flags.push("oil_temperature_changed");
    }
    let flags = json!(flags).to_string();
    let technician = rng.pick(&m.site.people).clone();
    let tested_at = stamp(on, rng.int(7, 15), rng.int(0, 59));
    let (cs, ce, rs, re) = match r.pressures {
        Some((a, b, c, d)) => (Some(a), Some(b), Some(c), Some(d)),
        None => (None, None, None, None),
    };
    let corrected = rng.chance(0.01);
    let id = *next_id;
    let versions = if corrected { 2 } else { 1 };
    for v in 0..versions {
        let row_id = *next_id;
        *next_id += 1;
        let (notes, amends, created) = if v == 0 {
            (None, None, tested_at.clone())
        } else {
            (
                Some("corrected: signed under the wrong name".to_string()),
                Some(id),
                stamp(on + days(1), 8, 30),
            )
        };
        rows.push((
            DRIFT_TESTS,
            vec![
                row_id.into(),
                c.id.into(),
                p.id.into(),
                tested_at.clone().into(),
                technician.clone().into(),
                r.duration.into(),
                r.start.into(),
                r.end.into(),
                r.oil_start.into(),
                r.oil_end.into(),
                r.ambient.into(),
                cs.into(),
                ce.into(),
                rs.into(),
                re.into(),
                input.load.into(),
                input.load_direction.as_str().into(),
                p.limit_distance.into(),
                p.per.into(),
                readings_json.clone().into(),
                analysis.clone().into(),
                CALC_VERSION.into(),
                report.verdict.as_str().into(),
                report.diagnosis.as_str().into(),
                report.scaled_drift.into(),
                report.leak_drift.into(),
                report.scaled_leak_drift.into(),
                report.scaled_per.into(),
                flags.clone().into(),
                notes.into(),
                amends.into(),
                created.into(),
                technician.clone().into(),
            ],
        ));
    }
    Some(report.verdict.as_str().to_string())
}

/// Drift tests of one cylinder on its interval from registration. About one cylinder in eight
/// starts wearing at some point (its leak grows by 0.6 to 2.5 mm per 10 minutes each year);
/// a failed test is followed by a reseal and a passing retest within two weeks.
#[allow(clippy::too_many_arguments)]
pub fn drift_tests(
    rng: &mut Rng,
    m: &MachineSim<'_>,
    c: &CylinderSim,
    p: &ProcedureSim,
    today: Date,
    next_id: &mut i64,
    rows: &mut Rows,
    counts: &mut Counts,
) {
    let Some(interval) = c.interval_days else {
        return;
    };
    let history = (today - m.registered).whole_days().max(1);
    let stop = if rng.chance(0.03) {
        today - days(rng.int(30, 400))
    } else {
        m.stop
    };
    let mut wear = rng.chance(0.12).then(|| {
        (
            m.registered + days(rng.int(0, history)),
            rng.range(0.6e-3, 2.5e-3),
        )
    });
    let base_leak = rng.range(0.0, 0.3e-3);
    let gauges = rng.chance(0.4);
    let base = cylinder_request(c, m.relief);
    let mut on = m.registered + days(interval - rng.int(0, 25));
    while on <= stop {
        let worn = wear.map_or(0.0, |(from, rate): (Date, f64)| {
            rate * ((on - from).whole_days().max(0) as f64 / 365.0)
        });
        let before = *next_id;
        match drift_test(
            rng,
            m,
            c,
            p,
            &base,
            on,
            base_leak + worn,
            gauges,
            next_id,
            rows,
        ) {
            Some(verdict) => {
                counts.drift_tests += (*next_id - before) as u64;
                if verdict == "fail" {
                    wear = rng
                        .chance(0.5)
                        .then(|| (on + days(rng.int(365, 3 * 365)), rng.range(0.6e-3, 2.5e-3)));
                    on += days(rng.int(3, 14));
                    continue;
                }
            }
            None => counts.refused += 1,
        }
        on += days(interval - rng.int(0, 25));
        if rng.chance(0.08) {
            on += days(rng.int(1, 30));
        }
    }
}
