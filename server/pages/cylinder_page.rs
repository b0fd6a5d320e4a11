//! A cylinder's page: its record and the safety panel computed by the engineering core
//! (holding pressure, seal bypass and rod side at relief against every rating, cautions).

use super::ctx::PageCtx;
use super::cylinders::load;
use super::forms;
use super::machine_page::{HoseLine, direction_words, hose_line, size_text};
use super::page_error;
use super::safety::{self, Panel};
use crate::api::paging::{Params, pick_units};
use crate::app::AppState;
use crate::calc::quantity::Dimension;
use crate::db::hoses::{self, Hose};
use crate::pages::machine_page::function_text;
use crate::pages::view::q;
use askama::Template;
use askama_web::WebTemplate;
use axum::extract::{Path, State};
use axum::response::{IntoResponse, Response};

#[derive(Template, WebTemplate)]
#[template(path = "cylinders/show.html")]
pub struct CylinderPage {
    pub ctx: PageCtx,
    pub id: i64,
    pub machine_id: i64,
    pub unit_number: String,
    pub function: String,
    pub size: String,
    pub bore: String,
    pub rod: String,
    pub stroke: String,
    pub load_direction: &'static str,
    pub max_load: String,
    pub holding_pressure: String,
    pub rated: String,
    pub tube: String,
    pub end_condition: String,
    /// The recorded load-holding valve and valve centre, in words.
    pub valves: String,
    pub serial: String,
    pub notes: String,
    pub drift_interval: String,
    pub archived_at: String,
    pub units: &'static str,
    pub panel: Panel,
    pub headings: Vec<&'static str>,
    pub hoses: Vec<HoseLine>,
    /// shop: the drift-test history with its chart.
    pub history: crate::pages::shop::history::HistoryPanel,
    /// The cylinder's service status, open restrictions and status history.
    pub service: super::service_view::ServicePanel,
}

/// `GET /cylinders/{id}`; `?units=us|metric` overrides the site's units.
pub async fn show(
    State(state): State<AppState>,
    ctx: PageCtx,
    Path(id): Path<String>,
    params: Params,
) -> Response {
    let c = match load(&state, &id).await {
        Ok(c) => c,
        Err(page) => return page,
    };
    let machine_hoses = match hoses::of_machine(&state.db, c.machine_id).await {
        Ok(h) => h,
        Err(e) => return page_error(e.into()),
    };
    let fitted: Vec<&Hose> = machine_hoses
        .iter()
        .filter(|h| h.cylinder_id == Some(c.id))
        .collect();
    let units = pick_units(params.units().ok().flatten(), c.site_units.as_deref());
    let length = |si: f64| q(Some(si), Dimension::Length, units);
    let panel = safety::panel(&c, &fitted, units);
    let history = match crate::pages::shop::history::history_panel(&state.db, c.id, units).await {
        Ok(h) => h,
        Err(e) => return page_error(e),
    };
    let service = match super::service_view::cylinder_panel(&state.db, c.machine_id, c.id).await {
        Ok(panel) => panel,
        Err(e) => return page_error(e.into()),
    };
    CylinderPage {
        service,
        ctx,
        id: c.id,
        machine_id: c.machine_id,
        unit_number: c.unit_number.clone(),
        function: function_text(&c),
        size: size_text(&c, units),
        bore: length(c.bore_m),
        rod: length(c.rod_m),
        stroke: length(c.stroke_m),
        load_direction: direction_words(&c.load_direction),
        max_load: q(c.max_load_n, Dimension::Force, units),
        holding_pressure: q(c.holding_pressure_pa, Dimension::Pressure, units),
        rated: q(c.rated_pressure_pa, Dimension::Pressure, units),
        tube: match (c.tube_outside_diameter_m, c.tube_yield_pa) {
            (Some(od), Some(y)) => format!(
                "{} outside, yield {}",
                length(od),
                forms::stress_text(y, units)
            ),
            (Some(od), None) => format!("{} outside", length(od)),
            _ => "—".into(),
        },
        end_condition: c
            .end_condition
            .clone()
            .map(|e| e.replace('_', "–"))
            .unwrap_or_else(|| "not recorded (pinned–pinned assumed)".into()),
        valves: crate::pages::valve_inputs::describe(&c.valves, units),
        serial: c.serial.clone().unwrap_or_default(),
        notes: c.notes.clone().unwrap_or_default(),
        drift_interval: c
            .drift_test_interval_days
            .map(|d| format!("every {d} days"))
            .unwrap_or_else(|| "no interval set".into()),
        archived_at: c.archived_at.clone().unwrap_or_default(),
        units: units.as_str(),
        headings: panel
            .scenarios
            .iter()
            .map(|s| safety::scenario_heading(s))
            .collect(),
        panel,
        hoses: fitted.iter().map(|h| hose_line(h, units)).collect(),
        history,
    }
    .into_response()
}
