//! A stored test as the shop sees it right after saving: verdict, diagnosis and its
//! reasoning, hazards and cautions, the figures, the readings, who signed it and when, and
//! the records it amends or that amend it.

use super::load_cylinder;
use super::words::{diagnosis_words, flags_words, qd, shown, texts, verdict_words, when};
use crate::api::paging::{path_id, pick_units};
use crate::app::AppState;
use crate::calc::quantity::Dimension as D;
use crate::calc::quantity::UnitSystem;
use crate::db::cylinders::Cylinder;
use crate::db::{decay_tests, drift_tests};
use crate::error::AppError;
use crate::pages::ctx::PageCtx;
use crate::pages::machine_page::{function_text, size_text};
use crate::pages::page_error;
use askama::Template;
use askama_web::WebTemplate;
use axum::extract::{Path, Query, State};
use axum::response::{IntoResponse, Response};
use serde::Deserialize;
use serde_json::Value;

#[derive(Template, WebTemplate)]
#[template(path = "shop/record.html")]
pub struct RecordPage {
    pub ctx: PageCtx,
    /// `Drift test` or `Pressure-decay test`.
    pub title: &'static str,
    pub id: i64,
    pub cylinder_id: i64,
    pub machine_id: i64,
    pub unit_number: String,
    pub function: String,
    pub size: String,
    /// The record's decision first (`calc::decision`), its reasons and restrictions.
    pub decision: String,
    pub decision_words: String,
    pub reasons: Vec<String>,
    pub restrictions: Vec<String>,
    pub verdict: String,
    pub verdict_words: &'static str,
    pub diagnosis: String,
    pub diagnosis_words: &'static str,
    pub reasoning: Vec<String>,
    pub hazards: Vec<String>,
    pub cautions: Vec<String>,
    pub flags: Vec<String>,
    pub figures: Vec<(String, String)>,
    pub readings: Vec<(String, String)>,
    pub technician: String,
    pub tested_at: String,
    pub created_by: String,
    pub created_at: String,
    pub calc_version: String,
    pub notes: String,
    pub amends: Option<i64>,
    pub amended_by: Option<i64>,
    /// `drift-test` or `decay-test`, for the links.
    pub slug: &'static str,
    /// True when this page answers a resubmit that found the record already stored.
    pub repeated: bool,
}

#[derive(Debug, Default, Deserialize)]
pub struct RecordQuery {
    pub repeat: Option<String>,
}

/// One reading as a labelled line, when it was taken.
fn reading(label: &str, si: Option<f64>, d: D, units: UnitSystem) -> Option<(String, String)> {
    si.map(|v| (label.to_string(), qd(Some(v), d, units)))
}

fn figures(analysis: &Value, keys: &[(&str, &str)]) -> Vec<(String, String)> {
    keys.iter()
        .filter(|(key, _)| !analysis[*key].is_null())
        .map(|(key, label)| (label.to_string(), shown(&analysis[*key])))
        .collect()
}

fn limit_text(analysis: &Value, amount: &str) -> Option<(String, String)> {
    let l = &analysis["limit"];
    (!l.is_null()).then(|| {
        (
            "Limit".to_string(),
            format!("{} in {}", shown(&l[amount]), shown(&l["per"])),
        )
    })
}

/// What a stored test says of itself, for its page.
struct Signed<'a> {
    title: &'static str,
    slug: &'static str,
    id: i64,
    verdict: &'a str,
    diagnosis: &'a str,
    decision: Option<&'a str>,
    decision_json: Option<&'a str>,
    flags: Vec<String>,
    technician: &'a str,
    tested_at: &'a str,
    created_by: &'a str,
    created_at: &'a str,
    calc_version: &'a str,
    notes: Option<&'a str>,
    amends: Option<i64>,
    amended_by: Option<i64>,
}

/// A stored record of kind `what` found by id, else 404.
fn found<T>(row: Result<Option<T>, sqlx::Error>, what: &str, id: i64) -> Result<T, AppError> {
    row?.ok_or_else(|| AppError::not_found(format!("{what} {id}")))
}

/// Labelled lines of a page (label, value).
type Lines = Vec<(String, String)>;

/// The page of a stored test of cylinder `c`, with its analysis `a` as stored.
fn record_page(
    ctx: PageCtx,
    (c, units): (&Cylinder, UnitSystem),
    t: Signed<'_>,
    a: &Value,
    (figures, readings): (Lines, Lines),
    repeated: bool,
) -> Response {
    let decided = crate::api::decision_answer::of_record(
        t.decision,
        t.decision_json,
        (Some(t.verdict), Some(t.diagnosis), None),
    );
    let word = |key: &str| decided[key].as_str().unwrap_or_default().to_string();
    RecordPage {
        decision: word("decision"),
        decision_words: word("decision_words"),
        reasons: texts(&decided["reasons"]),
        restrictions: texts(&decided["restrictions"]),
        ctx,
        title: t.title,
        id: t.id,
        cylinder_id: c.id,
        machine_id: c.machine_id,
        unit_number: c.unit_number.clone(),
        function: function_text(c),
        size: size_text(c, units),
        verdict_words: verdict_words(t.verdict),
        verdict: t.verdict.to_string(),
        diagnosis_words: diagnosis_words(t.diagnosis),
        diagnosis: t.diagnosis.to_string(),
        reasoning: texts(&a["reasoning"]),
        hazards: texts(&a["hazards"]),
        cautions: texts(&a["cautions"]),
        flags: flags_words(&t.flags),
        figures,
        readings,
        technician: t.technician.to_string(),
        tested_at: when(t.tested_at),
        created_by: t.created_by.to_string(),
        created_at: when(t.created_at),
        calc_version: t.calc_version.to_string(),
        notes: t.notes.unwrap_or_default().to_string(),
        amends: t.amends,
        amended_by: t.amended_by,
        slug: t.slug,
        repeated,
    }
    .into_response()
}

/// `GET /shop/drift-tests/{id}`.
pub async fn drift_test(
    State(state): State<AppState>,
    ctx: PageCtx,
    Path(id): Path<String>,
    Query(query): Query<RecordQuery>,
) -> Response {
    match drift_page(&state, ctx, &id, query).await {
        Ok(page) | Err(page) => page,
    }
}

async fn drift_page(
    state: &AppState,
    ctx: PageCtx,
    id: &str,
    query: RecordQuery,
) -> Result<Response, Response> {
    let id = path_id(id, "drift test").map_err(page_error)?;
    let t = found(drift_tests::find(&state.db, id).await, "drift test", id).map_err(page_error)?;
    let (c, _) = load_cylinder(state, &t.cylinder_id.to_string()).await?;
    let units = pick_units(None, c.site_units.as_deref());
    let a: Value = serde_json::from_str(&t.analysis_json).unwrap_or(Value::Null);
    let mut figs = figures(
        &a,
        &[
            ("drift", "Measured drift"),
            ("duration", "Duration"),
            ("temperature_change", "Oil temperature change"),
            ("thermal_drift", "Drift the oil's temperature explains"),
            ("leak_drift", "Drift left for leakage"),
            ("leak_flow", "Equivalent leakage flow"),
            ("scaled_drift", "Drift scaled to the limit's period"),
            ("scaled_leak_drift", "Leak drift scaled to the period"),
            ("scaled_per", "Period"),
        ],
    );
    figs.extend(limit_text(&a, "distance"));
    let opt = |label: &str, si: Option<f64>, d: D| reading(label, si, d, units);
    let readings: Lines = [
        opt("Drift", t.drift_m, D::Length),
        opt("Start position", t.start_position_m, D::Length),
        opt("End position", t.end_position_m, D::Length),
        opt("Duration", Some(t.duration_s), D::Time),
        opt(
            "Oil at start",
            Some(t.oil_temperature_start_k),
            D::Temperature,
        ),
        opt("Oil at end", Some(t.oil_temperature_end_k), D::Temperature),
        opt("Ambient", t.ambient_temperature_k, D::Temperature),
        opt("Cap end at start", t.cap_pressure_start_pa, D::Pressure),
        opt("Cap end at end", t.cap_pressure_end_pa, D::Pressure),
        opt("Rod end at start", t.rod_pressure_start_pa, D::Pressure),
        opt("Rod end at end", t.rod_pressure_end_pa, D::Pressure),
        opt("Load", t.load_n, D::Force),
    ]
    .into_iter()
    .flatten()
    .collect();
    let signed = Signed {
        title: "Drift test",
        slug: "drift-test",
        id: t.id,
        verdict: &t.verdict,
        diagnosis: &t.diagnosis,
        decision: t.decision.as_deref(),
        decision_json: t.decision_json.as_deref(),
        flags: t.flag_list(),
        technician: &t.technician,
        tested_at: &t.tested_at,
        created_by: &t.created_by,
        created_at: &t.created_at,
        calc_version: &t.calc_version,
        notes: t.notes.as_deref(),
        amends: t.amends_id,
        amended_by: t.amended_by_id,
    };
    let repeated = query.repeat.is_some();
    Ok(record_page(
        ctx,
        (&c, units),
        signed,
        &a,
        (figs, readings),
        repeated,
    ))
}

/// `GET /shop/decay-tests/{id}`.
pub async fn decay_test(
    State(state): State<AppState>,
    ctx: PageCtx,
    Path(id): Path<String>,
    Query(query): Query<RecordQuery>,
) -> Response {
    match decay_page(&state, ctx, &id, query).await {
        Ok(page) | Err(page) => page,
    }
}

async fn decay_page(
    state: &AppState,
    ctx: PageCtx,
    id: &str,
    query: RecordQuery,
) -> Result<Response, Response> {
    let id = path_id(id, "decay test").map_err(page_error)?;
    let t = found(decay_tests::find(&state.db, id).await, "decay test", id).map_err(page_error)?;
    let (c, _) = load_cylinder(state, &t.cylinder_id.to_string()).await?;
    let units = pick_units(None, c.site_units.as_deref());
    let a: Value = serde_json::from_str(&t.analysis_json).unwrap_or(Value::Null);
    let mut figs = figures(
        &a,
        &[
            ("measured_change", "Measured pressure change"),
            ("duration", "Duration"),
            ("temperature_change", "Oil temperature change"),
            ("thermal_change", "Change the temperature explains"),
            ("leak_change", "Change left for leakage"),
            ("leak_flow", "Equivalent leakage flow"),
            ("scaled_drop", "Drop scaled to the limit's period"),
        ],
    );
    figs.extend(limit_text(&a, "pressure"));
    let p = |label: &str, si: Option<f64>, d: D| reading(label, si, d, units);
    let readings: Lines = [
        Some((
            "Pressurised end".to_string(),
            format!("{} end", t.pressurised_end),
        )),
        p("Duration", Some(t.duration_s), D::Time),
        p("Pressure at start", Some(t.pressure_start_pa), D::Pressure),
        p("Pressure at end", Some(t.pressure_end_pa), D::Pressure),
        p("Other end at start", t.other_pressure_start_pa, D::Pressure),
        p("Other end at end", t.other_pressure_end_pa, D::Pressure),
        p(
            "Oil at start",
            Some(t.oil_temperature_start_k),
            D::Temperature,
        ),
        p("Oil at end", Some(t.oil_temperature_end_k), D::Temperature),
        p("Ambient", t.ambient_temperature_k, D::Temperature),
    ]
    .into_iter()
    .flatten()
    .collect();
    let signed = Signed {
        title: "Pressure-decay test",
        slug: "decay-test",
        id: t.id,
        verdict: &t.verdict,
        diagnosis: &t.diagnosis,
        decision: t.decision.as_deref(),
        decision_json: t.decision_json.as_deref(),
        flags: t.flag_list(),
        technician: &t.technician,
        tested_at: &t.tested_at,
        created_by: &t.created_by,
        created_at: &t.created_at,
        calc_version: &t.calc_version,
        notes: t.notes.as_deref(),
        amends: t.amends_id,
        amended_by: t.amended_by_id,
    };
    let repeated = query.repeat.is_some();
    Ok(record_page(
        ctx,
        (&c, units),
        signed,
        &a,
        (figs, readings),
        repeated,
    ))
}
