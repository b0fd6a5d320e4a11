//! One generated machine with everything it owns: its cylinders, hose assemblies, inspections
//! and drift tests, as rows for the batch writer. Deterministic from the seed and the index.

use super::batch::Val;
use super::drift;
use super::fleet::{self, HosePlace, days, round_to, stamp};
use super::history::{self, MachineSim, ProcedureSim};
use super::kinds::KINDS;
use super::rng::Rng;
use super::tables::{CYLINDERS, HOSES, MACHINES};
use super::{Counts, Ids, Rows};
use time::Date;

/// What every machine of a run shares.
pub struct Ctx {
    pub seed: u64,
    pub today: Date,
    pub sites: Vec<fleet::Site>,
    /// The drift procedure of each kind, in the order of [`KINDS`].
    pub procedures: Vec<ProcedureSim>,
}

/// Makes machine number `index` (0-based) with ids from `ids`, appending its rows (the machine
/// first, then what it owns) and, if a failed inspection keeps it out of service, the
/// (machine, inspection) link to set once that inspection is written.
pub fn machine(
    ctx: &Ctx,
    index: u64,
    ids: &mut Ids,
    rows: &mut Rows,
    links: &mut Vec<(i64, i64)>,
    counts: &mut Counts,
) {
    let mut own = Rows::new();
    let mut rng = Rng::for_item(ctx.seed, 1, index);
    let kind_index = rng.below(KINDS.len() as u64) as usize;
    let plan = &KINDS[kind_index];
    let site = rng.pick(&ctx.sites);
    let id = ids.machine;
    ids.machine += 1;
    let today = ctx.today;
    let registered = if rng.chance(0.8) {
        today - days(5 * 365 + rng.int(0, 90))
    } else {
        today - days(rng.int(30, 5 * 365))
    };
    let stop = if rng.chance(0.04) {
        today - days(rng.int(60, 300))
    } else {
        today
    };
    let sim = MachineSim {
        id,
        plan,
        site,
        registered,
        stop: stop.max(registered),
        hours_per_day: rng.range(plan.hours_per_year.0, plan.hours_per_year.1) / 365.0,
        base_hours: round_to(rng.range(0.0, 3000.0), 1.0),
        relief: round_to(plan.relief_bar * rng.range(0.95, 1.05), 5.0) * 1e5,
    };
    let created = stamp(registered, 8, 0);

    let mut cylinders = Vec::new();
    for cp in plan.cylinders {
        if !rng.chance(cp.present) {
            continue;
        }
        let (c, row) = fleet::cylinder(&mut rng, ids.cylinder, id, cp, sim.relief, &created);
        ids.cylinder += 1;
        own.push((CYLINDERS, row));
        cylinders.push(c);
    }
    counts.cylinders += cylinders.len() as u64;

    let hose_count = rng.int(5, 7) as usize;
    let ports = cylinders.len() * 2;
    for h in 0..hose_count {
        let place = if h < ports {
            HosePlace::Port(&cylinders[h / 2], if h % 2 == 0 { "cap" } else { "rod" })
        } else {
            HosePlace::Circuit(fleet::circuit_name(h - ports))
        };
        let cylinder_index = (h < ports).then_some(h / 2);
        let (hose_rows, rated) = fleet::hose_rows(
            &mut rng,
            &mut ids.hose,
            id,
            place,
            sim.relief,
            registered,
            today,
        );
        counts.hoses += hose_rows.len() as u64;
        own.extend(hose_rows.into_iter().map(|r| (HOSES, r)));
        if let (Some(i), Some(rated)) = (cylinder_index, rated) {
            cylinders[i].hoses.push(rated);
        }
    }

    let inspected = history::inspections(&mut rng, &sim, &mut ids.inspection, &mut own, counts);
    let procedure = &ctx.procedures[kind_index];
    for c in &cylinders {
        drift::drift_tests(
            &mut rng,
            &sim,
            c,
            procedure,
            today,
            &mut ids.drift,
            &mut own,
            counts,
        );
    }

    let (status, reason, since, inspection_id) = match inspected.open_fail {
        Some((inspection, on, kind)) => (
            "out_of_service",
            Some(format!("failed the {kind} inspection of {on}")),
            Some(on.to_string()),
            Some(inspection),
        ),
        None if rng.chance(0.01) => (
            "out_of_service",
            Some("waiting for hydraulic parts".to_string()),
            Some((today - days(rng.int(1, 60))).to_string()),
            None,
        ),
        None => ("in_service", None, None, None),
    };
    let read_on = (today - days(rng.int(0, 20))).min(sim.stop).max(registered);
    let periodic_hours = plan.periodic_hours;
    let serial = format!("{}{:07}", plan.code, rng.below(10_000_000));
    rows.push((
        MACHINES,
        vec![
            id.into(),
            format!("{}-{:06}", plan.code, index + 1).into(),
            site.id.into(),
            plan.kind.into(),
            format!("{} of the scale fleet", plan.kind).into(),
            serial.into(),
            status.into(),
            reason.into(),
            since.into(),
            sim.relief.into(),
            sim.hours_on(read_on).into(),
            read_on.to_string().into(),
            365_i64.into(),
            periodic_hours.into(),
            plan.frequent_days.into(),
            created.clone().into(),
            created.into(),
            Val::Null,
        ],
    ));
    rows.extend(own);
    if let Some(inspection) = inspection_id {
        links.push((id, inspection));
    }
    counts.machines += 1;
}
