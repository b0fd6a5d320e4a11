//! The demo's inspections: periodic ones for two years back and the latest frequent checks of
//! every machine, with hour-meter readings that follow each machine's use. Invented data.

use super::{LOADER, TECHNICIANS, days_ago, parse, problems};
use crate::api::draft::date_text;
use crate::api::inspections as api;
use crate::db::cylinders::Cylinder;
use crate::db::inspections;
use crate::db::machines::Machine;
use crate::db::{Db, records::Stored};
use serde_json::{Value, json};
use time::Date;

/// Hours a day on the meter (our own scenario figures): two quarry machines on double shifts,
/// the rest of the hire fleet at moderate use.
fn rate(unit: &str) -> f64 {
    match unit {
        "HV-WL-07" => 7.2,
        "HV-EX-11" => 5.2,
        _ => 1.5,
    }
}

/// The meter reading on `day`, from the registry's reading and the machine's rate.
fn hours(m: &Machine, day: Date) -> Option<f64> {
    let h = m.hour_meter_h?;
    let read_on = m
        .hour_meter_read_on
        .as_deref()
        .and_then(parse)
        .unwrap_or(day);
    let days = (day - read_on).whole_days() as f64;
    Some(((h + rate(&m.unit_number) * days).max(0.0) * 10.0).round() / 10.0)
}

/// Days back to the latest periodic inspection: two units overdue by date, two due by hours.
fn last_periodic(m: &Machine) -> i64 {
    match m.unit_number.as_str() {
        "HV-TT-09" => 400,
        "HV-PR-06" => 380,
        "HV-WL-07" => 160,
        "HV-EX-11" => 120,
        _ => 100 + (m.id * 37) % 120,
    }
}

struct Planned {
    day: Date,
    kind: &'static str,
    result: &'static str,
    deficiencies: Option<&'static str>,
    corrective: Option<&'static str>,
    /// The failed item and its note.
    item: Option<(&'static str, &'static str, &'static str)>,
    /// A mistyped hour meter later corrected by an amendment.
    typo: bool,
}

fn plain(day: Date, kind: &'static str) -> Planned {
    Planned {
        day,
        kind,
        result: "pass",
        deficiencies: None,
        corrective: None,
        item: None,
        typo: false,
    }
}

fn plan(m: &Machine) -> Vec<Planned> {
    let registered = parse(m.created_at.get(..10).unwrap_or("")).unwrap_or(days_ago(730));
    let start = days_ago(730).max(registered);
    let mut out = Vec::new();
    if let Some(interval) = m.periodic_interval_days {
        let mut back = last_periodic(m);
        let mut first = true;
        while days_ago(back) >= start {
            let mut p = plain(days_ago(back), "periodic");
            if first && m.unit_number == "HV-EX-04" {
                p.result = "pass_with_deficiencies";
                p.deficiencies =
                    Some("Bucket cylinder rod lightly scored 60 mm from the gland; no leak yet.");
                p.corrective =
                    Some("Monitor at each frequent check; rod re-chrome at next major service.");
                p.item = Some(("rod", "attention", "Light scoring, bucket cylinder"));
            }
            p.typo = first && m.unit_number == "HV-TH-14";
            out.push(p);
            first = false;
            back += interval;
        }
    }
    if let Some(interval) = m.frequent_interval_days {
        let since = m.out_of_service_since.as_deref().and_then(parse);
        for k in 0..3 {
            let day = days_ago(1 + k * interval);
            if day < start || since.is_some_and(|s| day >= s) {
                continue;
            }
            let mut p = plain(day, "frequent");
            if k == 0 && m.unit_number == "HV-SS-16" {
                p.result = "fail";
                p.deficiencies = Some(
                    "Bucket tilt hose chafed through to the braid at the arm pivot; oil mist on the arm.",
                );
                p.corrective = Some(
                    "Do not use. Replace the hose assembly and fit a clamp; inspect the other arm hoses.",
                );
                p.item = Some(("hoses", "fail", "Chafed to the braid at the arm pivot"));
            }
            out.push(p);
        }
    }
    out.sort_by_key(|p| p.day);
    out
}

fn body(
    m: &Machine,
    p: &Planned,
    hour_meter: Option<f64>,
    token: String,
) -> serde_json::Map<String, Value> {
    let items: Vec<Value> = api::STANDARD_ITEMS
        .iter()
        .map(|(item, _)| {
            let mut v = json!({"item": item, "outcome": "ok", "leakage_class": null, "note": null});
            if *item == "external_leakage" {
                v["leakage_class"] = json!(if p.result == "fail" { 3 } else { 1 });
            }
            if let Some((name, outcome, note)) = p.item
                && name == *item
            {
                v["outcome"] = json!(outcome);
                v["note"] = json!(note);
            }
            v
        })
        .collect();
    let b = json!({
        "kind": p.kind,
        "performed_on": date_text(p.day),
        "hour_meter": hour_meter,
        "inspector": TECHNICIANS[(m.id as usize + p.day.ordinal() as usize) % 4],
        "result": p.result,
        "items": items,
        "deficiencies": p.deficiencies,
        "corrective_action": p.corrective,
        "client_token": token,
    });
    b.as_object().cloned().unwrap_or_default()
}

/// Stores the inspections of every machine in one transaction, oldest first per machine (a
/// fail takes its machine out of service as it would in the shop); returns how many.
pub async fn load(db: &Db, units: &[(Machine, Vec<Cylinder>)]) -> Result<usize, String> {
    let mut tx = db
        .begin_with("BEGIN IMMEDIATE")
        .await
        .map_err(|e| e.to_string())?;
    let mut count = 0;
    for (m, _) in units {
        for (k, p) in plan(m).iter().enumerate() {
            let reading = hours(m, p.day);
            let typed = if p.typo {
                reading.map(|h| h * 10.0)
            } else {
                reading
            };
            let token = format!("demo-inspection-{}-{k}", m.id);
            let what = format!(
                "{} {} inspection {}",
                m.unit_number,
                p.kind,
                date_text(p.day)
            );
            let new =
                api::prepare(m, &body(m, p, typed, token), None).map_err(|e| problems(&what, e))?;
            let stored = inspections::insert(&mut tx, LOADER, &new)
                .await
                .map_err(|e| format!("{what}: {e}"))?;
            count += 1;
            if p.typo {
                let mut fixed = body(m, p, reading, format!("demo-inspection-{}-{k}-fix", m.id));
                fixed.insert("amends".into(), json!(stored.record().id));
                let correction = api::prepare(m, &fixed, None).map_err(|e| problems(&what, e))?;
                if let Stored::Created(_) = inspections::insert(&mut tx, LOADER, &correction)
                    .await
                    .map_err(|e| format!("{what} (correction): {e}"))?
                {
                    count += 1;
                }
            }
        }
    }
    tx.commit().await.map_err(|e| e.to_string())?;
    Ok(count)
}
