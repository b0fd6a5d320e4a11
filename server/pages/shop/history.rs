//! A cylinder's test history for its pages: every drift test in a table (amended ones kept and
//! marked), a chart of leak drift after the thermal correction scaled to the procedure's
//! period, with the limit line and the least-squares trend, and when that trend crosses the
//! limit, labelled an estimate. Also the pressure-decay tests.
//!
//! The registry's cylinder page includes it: `{{ history|safe }}` with a `history` field made
//! by [`history_panel`].

use super::chart::{self, Chart, Sample};
use super::words::{flags_words, qd, when};
use crate::calc::quantity::{Dimension, UnitSystem};
use crate::calc::trend::{self, Crossing, Projection};
use crate::db::decay_tests::DecayTest;
use crate::db::drift_tests::DriftTest;
use crate::db::{Db, decay_tests, drift_tests};
use crate::error::AppError;
use crate::pages::view::q;
use askama::Template;
use time::OffsetDateTime;
use time::format_description::well_known::Rfc3339;

/// One drift test in the history table.
#[derive(Clone, Debug)]
pub struct Row {
    pub id: i64,
    pub tested_at: String,
    pub technician: String,
    pub scaled_drift: String,
    pub leak_drift: String,
    pub limit: String,
    pub verdict: String,
    pub diagnosis: String,
    /// The record's decision (shown first, by word and shape).
    pub decision: String,
    pub flags: Vec<String>,
    pub amends: Option<i64>,
    pub amended_by: Option<i64>,
    pub entered: String,
}

/// One pressure-decay test in the history table.
#[derive(Clone, Debug)]
pub struct DecayRow {
    pub id: i64,
    pub tested_at: String,
    pub technician: String,
    pub end: String,
    pub change: String,
    pub verdict: String,
    pub diagnosis: String,
    pub decision: String,
    pub amended_by: Option<i64>,
    pub entered: String,
}

/// The history panel: a fragment of a page (no form in it, so no page context).
#[derive(Template)]
#[template(path = "shop/history_panel.html")]
pub struct HistoryPanel {
    pub cylinder_id: i64,
    pub rows: Vec<Row>,
    pub decay_rows: Vec<DecayRow>,
    pub chart: Option<Chart>,
    /// What the chart's values are, in words.
    pub basis: String,
    pub projection: String,
    pub projection_is_estimate: bool,
}

/// Seconds since the epoch of a stored RFC 3339 time.
pub fn epoch(at: &str) -> Option<f64> {
    OffsetDateTime::parse(at, &Rfc3339)
        .ok()
        .map(|t| t.unix_timestamp() as f64)
}

fn date_of(at: f64) -> String {
    OffsetDateTime::from_unix_timestamp(at as i64)
        .ok()
        .map(|t| t.date().to_string())
        .unwrap_or_default()
}

/// The leak drift of each test in force, rescaled to the reference period (s), with times.
pub fn samples(tests: &[DriftTest], period: f64) -> Vec<(f64, f64, &DriftTest)> {
    tests
        .iter()
        .filter(|t| t.in_force())
        .filter_map(|t| {
            let at = epoch(&t.tested_at)?;
            let value = t.scaled_leak_drift_m * period / t.scaled_period_s;
            Some((at, value, t))
        })
        .collect()
}

/// The latest test in force that was judged against a limit: its limit (m) and period (s)
/// are the chart's reference; else the latest test's period and no limit.
pub fn reference(tests: &[DriftTest]) -> Option<(Option<f64>, f64)> {
    let in_force: Vec<&DriftTest> = tests.iter().filter(|t| t.in_force()).collect();
    if let Some(t) = in_force.iter().rev().find(|t| t.limit_distance_m.is_some()) {
        return Some((t.limit_distance_m, t.scaled_period_s));
    }
    in_force.last().map(|t| (None, t.scaled_period_s))
}

/// The projection of a cylinder's tests against its limit, as the reports and the page use
/// it: `None` without tests or without a limit.
pub fn projection_of(tests: &[DriftTest]) -> Option<Projection> {
    let (limit, period) = reference(tests)?;
    let limit = limit?;
    let points: Vec<trend::Sample> = samples(tests, period)
        .into_iter()
        .map(|(at, value, _)| trend::Sample { at, value })
        .collect();
    Some(trend::project(&points, limit, trend::RECENT_TESTS))
}

fn projection_words(p: Option<&Projection>, units: UnitSystem) -> (String, bool) {
    let Some(p) = p else {
        return (
            "No limit is recorded with these tests, so no crossing can be projected.".into(),
            false,
        );
    };
    let limit = q(Some(p.limit), Dimension::Length, units);
    match p.crossing {
        Crossing::TooFew => (
            "At least two tests on different days are needed for a trend.".into(),
            false,
        ),
        Crossing::NotRising => (
            format!(
                "Over the last {} tests the leak drift is steady or falling: the trend does not approach the limit of {limit}.",
                p.used
            ),
            false,
        ),
        Crossing::Reached { .. } => (
            format!(
                "The trend over the last {} tests is already at or above the limit of {limit}.",
                p.used
            ),
            true,
        ),
        Crossing::Estimated { at } => (
            format!(
                "Estimate: at the rate of the last {} tests, the leak drift reaches the limit of {limit} around {}. A straight line through past tests; wear often speeds up, so plan the repair before then.",
                p.used,
                date_of(at)
            ),
            true,
        ),
        Crossing::Distant => (
            format!(
                "The leak drift rises slowly; a straight line through the last {} tests reaches the limit of {limit} more than 50 years out.",
                p.used
            ),
            true,
        ),
    }
}

fn row(t: &DriftTest, units: UnitSystem) -> Row {
    let length = |si: f64| q(Some(si), Dimension::Length, units);
    let per = qd(Some(t.scaled_period_s), Dimension::Time, units);
    Row {
        id: t.id,
        tested_at: when(&t.tested_at),
        technician: t.technician.clone(),
        scaled_drift: format!("{} / {per}", length(t.scaled_drift_m)),
        leak_drift: format!("{} / {per}", length(t.scaled_leak_drift_m)),
        limit: match (t.limit_distance_m, t.limit_period_s) {
            (Some(d), Some(p)) => {
                format!("{} / {}", length(d), qd(Some(p), Dimension::Time, units))
            }
            _ => "—".into(),
        },
        decision: decision_of(
            t.decision.as_deref(),
            t.decision_json.as_deref(),
            &t.verdict,
            &t.diagnosis,
        ),
        verdict: t.verdict.clone(),
        diagnosis: t.diagnosis.clone(),
        flags: flags_words(&t.flag_list()),
        amends: t.amends_id,
        amended_by: t.amended_by_id,
        entered: format!("entered {} by {}", when(&t.created_at), t.created_by),
    }
}

/// A stored test's decision word (`fit_for_service`, ...), from its stored decision or, for a
/// record stored before decisions were kept, from its verdict and diagnosis.
fn decision_of(
    decision: Option<&str>,
    json: Option<&str>,
    verdict: &str,
    diagnosis: &str,
) -> String {
    crate::api::decision_answer::of_record(decision, json, (Some(verdict), Some(diagnosis), None))
        ["decision"]
        .as_str()
        .unwrap_or_default()
        .to_string()
}

fn decay_row(t: &DecayTest, units: UnitSystem) -> DecayRow {
    DecayRow {
        id: t.id,
        tested_at: when(&t.tested_at),
        technician: t.technician.clone(),
        end: format!("{} end", t.pressurised_end),
        change: q(Some(t.pressure_change_pa), Dimension::Pressure, units),
        decision: decision_of(
            t.decision.as_deref(),
            t.decision_json.as_deref(),
            &t.verdict,
            &t.diagnosis,
        ),
        verdict: t.verdict.clone(),
        diagnosis: t.diagnosis.clone(),
        amended_by: t.amended_by_id,
        entered: format!("entered {} by {}", when(&t.created_at), t.created_by),
    }
}

/// Builds the panel from stored tests (pure; [`history_panel`] loads them).
pub fn panel(
    cylinder_id: i64,
    tests: &[DriftTest],
    decays: &[DecayTest],
    units: UnitSystem,
) -> HistoryPanel {
    let reference = reference(tests);
    let projection = projection_of(tests);
    let chart = reference.and_then(|(limit, period)| {
        let points: Vec<Sample> = samples(tests, period)
            .into_iter()
            .map(|(at, value, t)| Sample {
                at,
                value,
                verdict: t.verdict.clone(),
                title: format!(
                    "#{} {}: {} {} ({})",
                    t.id,
                    when(&t.tested_at),
                    q(Some(value), Dimension::Length, units),
                    t.verdict,
                    t.diagnosis.replace('_', " ")
                ),
            })
            .collect();
        chart::build(&points, limit, projection.as_ref(), units)
    });
    let basis = reference
        .map(|(_, period)| {
            format!(
                "Leak drift: the measured drift less what the oil's temperature change explains, scaled to {}.",
                qd(Some(period), Dimension::Time, units)
            )
        })
        .unwrap_or_default();
    let (projection, projection_is_estimate) = projection_words(projection.as_ref(), units);
    let mut rows: Vec<Row> = tests.iter().map(|t| row(t, units)).collect();
    rows.reverse();
    let mut decay_rows: Vec<DecayRow> = decays.iter().map(|t| decay_row(t, units)).collect();
    decay_rows.reverse();
    HistoryPanel {
        cylinder_id,
        rows,
        decay_rows,
        chart,
        basis,
        projection,
        projection_is_estimate,
    }
}

/// The history panel of a cylinder, for any page that shows the cylinder.
pub async fn history_panel(
    db: &Db,
    cylinder_id: i64,
    units: UnitSystem,
) -> Result<HistoryPanel, AppError> {
    let tests = drift_tests::of_cylinder(db, cylinder_id).await?;
    let decays = decay_tests::of_cylinder(db, cylinder_id).await?;
    Ok(panel(cylinder_id, &tests, &decays, units))
}
