//! Five years of inspections for one generated machine: periodic and frequent, on their
//! intervals (by days or hours, whichever comes first); and what a machine's life is.

use super::batch::Val;
use super::fleet::{Site, days, round_to, stamp};
use super::kinds::KindPlan;
use super::rng::Rng;
use super::tables::INSPECTIONS;
use super::{Counts, Rows};
use serde_json::{Value, json};
use time::Date;

/// The drift procedure shared by the machines of one kind.
pub struct ProcedureSim {
    pub id: i64,
    pub limit_distance: f64,
    pub per: f64,
    pub duration: f64,
    pub oil_min_k: f64,
    pub oil_max_k: f64,
    pub expansion: f64,
}

/// One machine's life, as its records need it.
pub struct MachineSim<'a> {
    pub id: i64,
    pub plan: &'a KindPlan,
    pub site: &'a Site,
    pub registered: Date,
    /// The last day anyone inspected it (today, or earlier for a machine that has lapsed).
    pub stop: Date,
    pub hours_per_day: f64,
    pub base_hours: f64,
    pub relief: f64,
}

impl MachineSim<'_> {
    pub fn hours_on(&self, day: Date) -> f64 {
        let run = (day - self.registered).whole_days().max(0) as f64;
        round_to(self.base_hours + run * self.hours_per_day, 0.1)
    }
}

/// What the inspections leave behind: a failed inspection not yet cleared, and the latest one.
#[derive(Default)]
pub struct Inspected {
    /// (inspection id, day, kind) of a fail no later record cleared.
    pub open_fail: Option<(i64, Date, &'static str)>,
    pub last: Option<Date>,
}

const ITEMS: [(&str, &str); 5] = [
    ("hoses and fittings", "hose cover chafed at a clamp"),
    ("rod surface", "scoring on the rod chrome"),
    ("rod seals", "oil weeping past the rod seal"),
    ("mounts and pins", "wear in a pivot pin bushing"),
    ("external leakage", "oil film building at the gland"),
];

/// The items of one inspection as JSON, with the deficiencies and the corrective action.
fn items(rng: &mut Rng, result: &str) -> (String, Option<String>, Option<String>) {
    let bad = rng.below(ITEMS.len() as u64) as usize;
    let list: Vec<Value> = ITEMS
        .iter()
        .enumerate()
        .map(|(i, (item, _))| {
            let outcome = match (i == bad, result) {
                (true, "fail") => "fail",
                (true, "pass_with_deficiencies") => "attention",
                _ => "ok",
            };
            let class = (*item == "external leakage").then(|| match outcome {
                "fail" => rng.int(3, 4),
                "attention" => 2,
                _ => rng.int(0, 1),
            });
            json!({"item": item, "outcome": outcome, "leakage_class": class, "note": null})
        })
        .collect();
    let text = Value::Array(list).to_string();
    match result {
        "pass" => (text, None, None),
        _ => (
            text,
            Some(ITEMS[bad].1.to_string()),
            (result == "fail").then(|| "machine tagged out; repair booked".to_string()),
        ),
    }
}

#[allow(clippy::too_many_arguments)]
fn inspection_row(
    id: i64,
    m: &MachineSim<'_>,
    kind: &'static str,
    on: Date,
    inspector: &str,
    result: &str,
    rng: &mut Rng,
    amends: Option<i64>,
) -> Vec<Val> {
    let (items, deficiencies, corrective) = items(rng, result);
    let hours = m.hours_on(on) + if amends.is_some() { 10.0 } else { 0.0 };
    let created = stamp(
        on + days(i64::from(amends.is_some())),
        rng.int(8, 16),
        rng.int(0, 59),
    );
    vec![
        id.into(),
        m.id.into(),
        kind.into(),
        on.to_string().into(),
        hours.into(),
        inspector.into(),
        result.into(),
        items.into(),
        deficiencies.into(),
        corrective.into(),
        amends.into(),
        created.into(),
        inspector.into(),
    ]
}

/// Periodic and frequent inspections from registration to `m.stop`, each a little before it is
/// due (some late). A fail is followed by a passing re-inspection after a repair of a few days
/// (a quarter of repairs wait weeks for parts); one in 200 records is corrected by a later one.
pub fn inspections(
    rng: &mut Rng,
    m: &MachineSim<'_>,
    next_id: &mut i64,
    rows: &mut Rows,
    counts: &mut Counts,
) -> Inspected {
    let mut out = Inspected::default();
    let kinds = [
        ("periodic", 365, m.plan.periodic_hours),
        ("frequent", m.plan.frequent_days, None),
    ];
    for (kind, interval_days, interval_hours) in kinds {
        let gap = interval_hours.map_or(interval_days, |h| {
            interval_days.min((h / m.hours_per_day.max(0.01)) as i64)
        });
        let gap = gap.max(7);
        let mut last = m.registered;
        loop {
            let mut on = last + days(gap - rng.int(0, (gap / 4).min(20)));
            if rng.chance(0.08) {
                on += days(rng.int(1, 25));
            }
            if on > m.stop {
                break;
            }
            let result = match rng.below(100) {
                0 | 1 => "fail",
                2..=9 => "pass_with_deficiencies",
                _ => "pass",
            };
            let inspector = rng.pick(&m.site.people).clone();
            let id = *next_id;
            *next_id += 1;
            rows.push((
                INSPECTIONS,
                inspection_row(id, m, kind, on, &inspector, result, rng, None),
            ));
            counts.inspections += 1;
            if rng.chance(0.005) {
                let fix = *next_id;
                *next_id += 1;
                rows.push((
                    INSPECTIONS,
                    inspection_row(fix, m, kind, on, &inspector, result, rng, Some(id)),
                ));
                counts.inspections += 1;
            }
            last = on;
            if result == "fail" {
                let wait = if rng.chance(0.25) {
                    rng.int(15, 120)
                } else {
                    rng.int(2, 10)
                };
                let back = on + days(wait);
                if back > m.stop {
                    if out.open_fail.is_none_or(|(_, d, _)| d < on) {
                        out.open_fail = Some((id, on, kind));
                    }
                    break;
                }
                let id = *next_id;
                *next_id += 1;
                rows.push((
                    INSPECTIONS,
                    inspection_row(id, m, kind, back, &inspector, "pass", rng, None),
                ));
                counts.inspections += 1;
                last = back;
            }
            out.last = Some(out.last.map_or(last, |d: Date| d.max(last)));
        }
    }
    out
}
