//! A stored cylinder, its machine's relief setting and the rated hoses on its ports as the
//! engineering core's installed cylinder (`calc::installed`). The cylinder page's safety
//! panel, `GET /api/v1/cylinders/{id}/safety` and the shop's hazard words all start here, so
//! they name every component alike and compute the same scenarios.

use super::cylinders::Cylinder;
use super::hoses::Hose;
use crate::calc::analysis::{self, CylinderInput, CylinderReport};
use crate::calc::installed::{self, Installed, LoadSource, RatedLine};
use crate::calc::quantity::UnitSystem;

/// What the registry stores of a cylinder and its machine, as the core's installed cylinder.
pub fn installed(c: &Cylinder) -> Installed {
    Installed {
        bore: c.bore_m,
        rod: c.rod_m,
        stroke: c.stroke_m,
        load_direction: c.load_direction.clone(),
        max_load: c.max_load_n,
        holding_pressure: c.holding_pressure_pa,
        relief_pressure: c.machine_relief_pressure_pa,
        rated_pressure: c.rated_pressure_pa,
        tube_outside_diameter: c.tube_outside_diameter_m,
        tube_yield: c.tube_yield_pa,
        end_condition: c.end_condition.clone(),
        min_load: c.min_load_n,
        buckling_length: c.buckling_length_m,
        rod_yield: c.rod_yield_pa,
        valves: c.valves.calc(),
        temperature_rise: c.site_trapped_oil_warming_k,
    }
}

/// A hose's name among a cylinder's ratings: `H17 (cap port, SAE 100R2AT, -8)`.
pub fn hose_label(h: &Hose) -> String {
    installed::line_label(h.id, &h.place(), h.spec.as_deref(), h.size.as_deref())
}

/// The rated hoses fitted to a port of the cylinder.
pub fn rated_lines(hoses: &[&Hose]) -> Vec<RatedLine> {
    hoses
        .iter()
        .filter_map(|h| match (h.working_pressure_pa, h.port.as_deref()) {
            (Some(rating), Some(port)) => Some(RatedLine {
                label: hose_label(h),
                port: port.to_string(),
                rating,
            }),
            _ => None,
        })
        .collect()
}

/// Runs the engineering core for a stored cylinder and the hoses fitted to it; the error is a
/// message naming why the figures cannot be made.
pub fn analyse(
    c: &Cylinder,
    hoses: &[&Hose],
    units: UnitSystem,
) -> Result<(CylinderInput, LoadSource, CylinderReport), String> {
    let (input, source) = installed(c)
        .input(&rated_lines(hoses))
        .map_err(|e| e.message)?;
    let report =
        analysis::analyse(&input, units).map_err(|e| format!("{}: {}", e.field, e.message))?;
    Ok((input, source, report))
}
