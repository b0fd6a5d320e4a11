//! The demo's test procedures: one drift-test procedure shared by each machine kind, a boom
//! lift cylinder with its maker's temperature table, and the press ram's pressure-decay
//! procedure. Invented figures.

use super::{LOADER, ZERO_C};
use crate::db::Db;
use crate::db::cylinders::Cylinder;
use crate::db::machines::Machine;
use crate::db::procedures::{self, LimitRow, ProcedureFields};
use std::collections::HashMap;

/// A procedure shared by one machine kind: limit in mm per 10 minutes.
fn shared(kind: &str, limit_mm: f64, hold: &str, measure: &str) -> ProcedureFields {
    ProcedureFields {
        kind: "drift".into(),
        name: format!("{} hold test", capitalised(kind)),
        cylinder_id: None,
        machine_kind: Some(kind.into()),
        hold_load: Some(hold.into()),
        posture: Some(
            "Engine at idle, controls in neutral, load raised clear of the ground".into(),
        ),
        measure_at: Some(measure.into()),
        oil_temperature_min_k: Some(40.0 + ZERO_C),
        oil_temperature_max_k: Some(60.0 + ZERO_C),
        duration_s: 600.0,
        limit_distance_m: Some(limit_mm * 1e-3),
        limit_pressure_drop_pa: None,
        limit_period_s: Some(600.0),
        oil_expansion_per_k: Some(7e-4),
        notes: Some(
            "Support the load before anyone works beneath it; stand clear during the hold.".into(),
        ),
        limits: Vec::new(),
    }
}

fn capitalised(text: &str) -> String {
    let mut chars = text.chars();
    chars
        .next()
        .map(|c| c.to_uppercase().collect::<String>() + chars.as_str())
        .unwrap_or_default()
}

/// The procedures of the demo; returns them by machine kind, and the press's decay procedure.
pub async fn load(db: &Db, units: &[(Machine, Vec<Cylinder>)]) -> Result<usize, String> {
    let table: HashMap<&str, (f64, &str, &str)> = HashMap::from([
        (
            "telehandler",
            (
                8.0,
                "Rated load on the forks at half reach",
                "Exposed rod from gland face to the paint mark",
            ),
        ),
        (
            "excavator",
            (
                10.0,
                "Bucket heaped, arm vertical, boom level",
                "Bucket tooth height above a marked board",
            ),
        ),
        (
            "wheel loader",
            (
                10.0,
                "Bucket full, arms raised to carry height",
                "Exposed rod from gland face to the paint mark",
            ),
        ),
        (
            "scissor lift",
            (
                5.0,
                "Rated platform load",
                "Platform height against a fixed rule",
            ),
        ),
        (
            "boom lift",
            (
                5.0,
                "Rated basket load, boom horizontal",
                "Basket floor height above a marked board",
            ),
        ),
        (
            "skid steer loader",
            (
                10.0,
                "Bucket full, arms raised to carry height",
                "Exposed rod from gland face to the paint mark",
            ),
        ),
        (
            "tipper trailer",
            (
                15.0,
                "Body loaded, raised a quarter",
                "Exposed rod from gland face to the paint mark",
            ),
        ),
        (
            "press",
            (
                2.0,
                "Test block at rated force",
                "Ram position on the dial gauge",
            ),
        ),
    ]);
    let mut count = 0;
    let mut tx = db
        .begin_with("BEGIN IMMEDIATE")
        .await
        .map_err(|e| e.to_string())?;
    let mut kinds: Vec<&str> = units.iter().map(|(m, _)| m.kind.as_str()).collect();
    kinds.sort_unstable();
    kinds.dedup();
    for kind in kinds {
        if let Some((limit, hold, measure)) = table.get(kind) {
            procedures::insert(&mut tx, LOADER, &shared(kind, *limit, hold, measure))
                .await
                .map_err(|e| format!("procedure {kind}: {e}"))?;
            count += 1;
        }
    }
    for (m, cyls) in units {
        for c in cyls {
            if m.unit_number == "HV-TH-01" && c.function.as_deref() == Some("Boom lift") {
                let mut p = shared(
                    &m.kind,
                    8.0,
                    "Rated load on the forks, boom at 40 degrees",
                    "Exposed rod from gland face to the paint mark",
                );
                p.name = "Boom lift, maker's temperature table".into();
                p.cylinder_id = Some(c.id);
                p.machine_kind = None;
                p.limits = [(20.0, 6.0), (40.0, 8.0), (60.0, 10.0)]
                    .iter()
                    .map(|(t, mm)| LimitRow {
                        oil_temperature_from_k: t + ZERO_C,
                        limit_distance_m: Some(mm * 1e-3),
                        limit_pressure_drop_pa: None,
                        limit_period_s: 600.0,
                    })
                    .collect();
                procedures::insert(&mut tx, LOADER, &p)
                    .await
                    .map_err(|e| e.to_string())?;
                count += 1;
            }
            if m.kind == "press" {
                let mut p = shared(
                    "press",
                    2.0,
                    "Ram driven to full stroke",
                    "Gauge on the cap-end test point",
                );
                p.kind = "decay".into();
                p.name = "Ram blocked at full stroke".into();
                p.cylinder_id = Some(c.id);
                p.machine_kind = None;
                p.limit_distance_m = None;
                p.limit_pressure_drop_pa = Some(10e5);
                procedures::insert(&mut tx, LOADER, &p)
                    .await
                    .map_err(|e| e.to_string())?;
                count += 1;
            }
        }
    }
    tx.commit().await.map_err(|e| e.to_string())?;
    Ok(count)
}
