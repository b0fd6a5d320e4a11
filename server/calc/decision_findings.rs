//! What each kind of shop record found, as the decision table (`calc::decision`) reads it:
//! a drift test's or pressure-decay test's verdict, diagnosis, the cylinder's rated-pressure
//! checks and the pressures read against the ratings of their end; an inspection's result.

use super::analysis::{self, CylinderInput, CylinderReport};
use super::decay::{DecayReadings, DecayReport};
use super::decision::{Findings, InspectionResult, Measured, Ruling, decide};
use super::diagnosis::Diagnosis;
use super::drift::{DriftReadings, DriftReport, Verdict};
use super::error::CalcError;
use super::quantity::UnitSystem;
use super::ratings::{Check, Exposure, Rating, Status};

/// The ratings a reading on `exposure`'s end bears (that end's lines and the cylinder).
fn bearing(ratings: &[Rating], end: Exposure) -> impl Iterator<Item = &Rating> {
    ratings
        .iter()
        .filter(move |r| r.exposure == end || r.exposure == Exposure::Both)
}

/// Measured pressures above the ratings of the end they were read on; `reads` holds each
/// end's readings, Pa.
pub fn measured_over(ratings: &[Rating], reads: &[(Exposure, Option<f64>)]) -> Vec<Measured> {
    let mut out: Vec<Measured> = Vec::new();
    for (end, value) in reads {
        let Some(pressure) = *value else { continue };
        for r in bearing(ratings, *end).filter(|r| pressure > r.rating) {
            match out.iter_mut().find(|m| m.component == r.component) {
                Some(m) => m.pressure = m.pressure.max(pressure),
                None => out.push(Measured {
                    component: r.component.clone(),
                    pressure,
                    rating: r.rating,
                }),
            }
        }
    }
    out
}

/// The findings of a drift test: its verdict and diagnosis, the cylinder's checks, and the
/// port pressures read against the ratings of their end.
pub fn drift_findings(
    ratings: &[Rating],
    readings: &DriftReadings,
    report: &DriftReport,
    cylinder: &CylinderReport,
) -> Findings {
    let q = readings.pressures;
    Findings {
        verdict: Some(report.verdict),
        diagnosis: Some(report.diagnosis),
        checks: cylinder.deciding_checks.clone(),
        measured_over: measured_over(
            ratings,
            &[
                (Exposure::Cap, q.cap_start),
                (Exposure::Cap, q.cap_end),
                (Exposure::Rod, q.rod_start),
                (Exposure::Rod, q.rod_end),
            ],
        ),
        inspection: None,
    }
}

/// The findings of a pressure-decay test: verdict, diagnosis, the cylinder's checks, and the
/// pressures read on each end against that end's ratings.
pub fn decay_findings(
    ratings: &[Rating],
    readings: &DecayReadings,
    report: &DecayReport,
    cylinder: &CylinderReport,
) -> Findings {
    let end = Exposure::from(readings.pressurised_end);
    let other = Exposure::from(readings.pressurised_end.other());
    Findings {
        verdict: Some(report.verdict),
        diagnosis: Some(report.diagnosis),
        checks: cylinder.deciding_checks.clone(),
        measured_over: measured_over(
            ratings,
            &[
                (end, Some(readings.pressure_start)),
                (end, Some(readings.pressure_end)),
                (other, readings.other_pressure_start),
                (other, readings.other_pressure_end),
            ],
        ),
        inspection: None,
    }
}

/// The findings of an inspection: its result only.
pub fn inspection_findings(result: InspectionResult) -> Findings {
    Findings {
        inspection: Some(result),
        ..Findings::default()
    }
}

/// The ruling on a drift test: [`decide`] over [`drift_findings`], with the cylinder analysed
/// by [`analysis::analyse`] from the same input.
pub fn drift_ruling(
    input: &CylinderInput,
    readings: &DriftReadings,
    report: &DriftReport,
    units: UnitSystem,
) -> Result<Ruling, CalcError> {
    let cylinder = analysis::analyse(input, units)?;
    let findings = drift_findings(&input.ratings, readings, report, &cylinder);
    Ok(decide(&findings, units))
}

/// The ruling on a pressure-decay test: [`decide`] over [`decay_findings`].
pub fn decay_ruling(
    input: &CylinderInput,
    readings: &DecayReadings,
    report: &DecayReport,
    units: UnitSystem,
) -> Result<Ruling, CalcError> {
    let cylinder = analysis::analyse(input, units)?;
    let findings = decay_findings(&input.ratings, readings, report, &cylinder);
    Ok(decide(&findings, units))
}

/// The findings that stored words alone give (a verdict `pass`/`fail`/`no_limit`, a
/// diagnosis, an inspection result), for records stored before decisions were kept.
pub fn findings_from_words(
    verdict: Option<&str>,
    diagnosis: Option<&str>,
    inspection: Option<&str>,
) -> Findings {
    let verdict = verdict.and_then(|v| match v {
        "pass" => Some(Verdict::Pass),
        "fail" => Some(Verdict::Fail),
        "no_limit" => Some(Verdict::NoLimit),
        _ => None,
    });
    let diagnosis = diagnosis.and_then(|d| match d {
        "no_leak" => Some(Diagnosis::NoLeak),
        "thermal_contraction" => Some(Diagnosis::ThermalContraction),
        "piston_seal_bypass" => Some(Diagnosis::PistonSealBypass),
        "holding_circuit_leak" => Some(Diagnosis::HoldingCircuitLeak),
        "inconclusive" => Some(Diagnosis::Inconclusive),
        _ => None,
    });
    Findings {
        verdict,
        diagnosis,
        inspection: inspection.and_then(InspectionResult::parse),
        ..Findings::default()
    }
}

/// The findings of an installed cylinder with no record yet: its rated-pressure checks only
/// (every scenario the analysis computed against every rating).
pub fn standing(report: &CylinderReport) -> Findings {
    Findings {
        checks: report.deciding_checks.clone(),
        ..Findings::default()
    }
}

/// The worst of a cylinder's checks: any above its rating before any within the low margin,
/// then the highest pressure as a share of its rating. `None` when every check is ok.
pub fn worst_check(checks: &[Check]) -> Option<&Check> {
    let rank = |s: Status| match s {
        Status::Exceeds => 2,
        Status::LowMargin => 1,
        Status::Ok => 0,
    };
    checks
        .iter()
        .filter(|k| k.status != Status::Ok)
        .max_by(|a, b| {
            rank(a.status)
                .cmp(&rank(b.status))
                .then((a.pressure / a.rating).total_cmp(&(b.pressure / b.rating)))
        })
}
