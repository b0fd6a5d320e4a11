//! `GET /api/v1/cylinders/{id}/safety`: every scenario of the cylinder's analysis against
//! every rating, with each check's status, the worst check, the decision the figures alone
//! call for (`calc::decision`), the hazards and the cautions, and the cylinder's service
//! standing. The same computation as the cylinder page's safety panel and the hazard list
//! (`db::installed::analyse`).

use super::decision_answer;
use super::paging::{Params, pick_units, shown};
use super::shop_answer::cylinder_and_machine;
use crate::app::AppState;
use crate::calc::analysis::{component_words, scenario_words};
use crate::calc::decision::decide;
use crate::calc::decision_findings::{standing, worst_check};
use crate::calc::limits;
use crate::calc::quantity::Dimension as D;
use crate::calc::ratings::Check;
use crate::db::{hoses, installed, service_return};
use crate::error::{ApiResult, AppError};
use axum::extract::{Path, State};
use axum::routing::get;
use axum::{Json, Router};
use serde_json::{Value, json};

pub fn router() -> Router<AppState> {
    Router::new().route("/api/v1/cylinders/{id}/safety", get(show))
}

async fn show(
    State(state): State<AppState>,
    Path(id): Path<String>,
    params: Params,
) -> ApiResult<Json<Value>> {
    params.deny_unknown(&["units"])?;
    let (c, m) = cylinder_and_machine(&state.db, &id).await?;
    let units = pick_units(params.units()?, c.site_units.as_deref());
    let all = hoses::of_machine(&state.db, c.machine_id).await?;
    let fitted: Vec<&hoses::Hose> = all.iter().filter(|h| h.cylinder_id == Some(c.id)).collect();
    let (input, _, report) = installed::analyse(&c, &fitted, units)
        .map_err(|why| AppError::conflict("cylinder", format!("no figures: {why}")))?;
    let p = |si: f64| shown(Some(si), D::Pressure, units);
    let check = |k: &Check| {
        json!({
            "component": k.component,
            "component_words": component_words(&k.component),
            "scenario": k.scenario,
            "scenario_words": scenario_words(k.scenario),
            "pressure": p(k.pressure),
            "rating": p(k.rating),
            "status": k.status.as_str(),
            "exposure": k.exposure.as_str(),
            "load": shown(Some(k.load), D::Force, units),
            // A relief-setting check decides only on an end with no rating (limits.rs).
            "decides_status": limits::decides_status(k, &input.ratings),
        })
    };
    let ruling = decide(&standing(&report), units);
    let mut conn = state.db.acquire().await?;
    let service = service_return::cylinder_standing(&mut conn, m.id, c.id).await?;
    let mut answer = json!({
        "cylinder_id": c.id,
        "machine_id": m.id,
        "unit_number": m.unit_number,
        "units": units.as_str(),
        "load": shown(Some(input.load), D::Force, units),
        "load_direction": input.load_direction.as_str(),
        "scenarios": report.scenarios.iter().map(|s| json!({
            "name": s.name,
            "words": scenario_words(s.name),
            "cap": p(s.cap),
            "rod": p(s.rod),
        })).collect::<Vec<_>>(),
        "ratings": input.ratings.iter().map(|r| json!({
            "component": r.component,
            "component_words": component_words(&r.component),
            "exposure": r.exposure,
            "rating": p(r.rating),
        })).collect::<Vec<_>>(),
        "checks": report.checks.iter().map(check).collect::<Vec<_>>(),
        "worst": worst_check(&report.deciding_checks).map(check),
        "highest_pressure": p(report.highest_pressure),
        "hazards": report.hazards,
        "cautions": report.cautions,
        "service": {"status": service.status, "restrictions": service.restrictions},
    });
    decision_answer::add(&mut answer, &ruling);
    Ok(Json(answer))
}
