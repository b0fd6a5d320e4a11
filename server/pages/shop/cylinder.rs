//! `/shop/cylinders/{id}`: the cylinder at the machine: its procedures, the buttons to start a
//! test, and its history with the chart.

use super::history::{HistoryPanel, history_panel};
use super::load_cylinder;
use super::words::{ProcedureView, procedure_view};
use crate::api::paging::pick_units;
use crate::app::AppState;
use crate::calc::quantity::Dimension;
use crate::db::procedures;
use crate::pages::ctx::PageCtx;
use crate::pages::machine_page::{direction_words, function_text, size_text};
use crate::pages::page_error;
use crate::pages::view::q;
use askama::Template;
use askama_web::WebTemplate;
use axum::extract::{Path, State};
use axum::response::{IntoResponse, Response};

#[derive(Template, WebTemplate)]
#[template(path = "shop/cylinder.html")]
pub struct CylinderShopPage {
    pub ctx: PageCtx,
    pub id: i64,
    pub machine_id: i64,
    pub unit_number: String,
    pub function: String,
    pub size: String,
    pub direction: &'static str,
    pub load: String,
    pub drift_procedures: Vec<ProcedureView>,
    pub decay_procedures: Vec<ProcedureView>,
    pub history: HistoryPanel,
    /// The worst hazard in words, shown before the test buttons.
    pub danger: crate::pages::danger::Danger,
    pub danger_id: i64,
    pub danger_for: String,
    /// The cylinder's service status and open restrictions; the machine's status.
    pub service: crate::pages::service_view::ServicePanel,
    pub machine_status: String,
    pub machine_status_words: &'static str,
}

/// `GET /shop/cylinders/{id}`.
pub async fn show(State(state): State<AppState>, ctx: PageCtx, Path(id): Path<String>) -> Response {
    let (c, m) = match load_cylinder(&state, &id).await {
        Ok(pair) => pair,
        Err(page) => return page,
    };
    let units = pick_units(None, c.site_units.as_deref());
    let mut views = Vec::new();
    for kind in ["drift", "decay"] {
        match procedures::for_cylinder(&state.db, c.id, &m.kind, kind).await {
            Ok(list) => views.push(
                list.iter()
                    .map(|p| procedure_view(p, units, false))
                    .collect::<Vec<_>>(),
            ),
            Err(e) => return page_error(e.into()),
        }
    }
    let history = match history_panel(&state.db, c.id, units).await {
        Ok(h) => h,
        Err(e) => return page_error(e),
    };
    let hoses = match crate::db::hoses::of_machine(&state.db, c.machine_id).await {
        Ok(h) => h,
        Err(e) => return page_error(e.into()),
    };
    let fitted: Vec<&crate::db::hoses::Hose> = hoses
        .iter()
        .filter(|h| h.cylinder_id == Some(c.id))
        .collect();
    let service = match crate::pages::service_view::cylinder_panel(&state.db, m.id, c.id).await {
        Ok(panel) => panel,
        Err(e) => return page_error(e.into()),
    };
    let machine = match crate::pages::service_view::machine_panel(&state.db, m.id).await {
        Ok(panel) => panel,
        Err(e) => return page_error(e.into()),
    };
    let decay_procedures = views.pop().unwrap_or_default();
    let drift_procedures = views.pop().unwrap_or_default();
    CylinderShopPage {
        ctx,
        id: c.id,
        machine_id: c.machine_id,
        unit_number: c.unit_number.clone(),
        function: function_text(&c),
        size: size_text(&c, units),
        direction: direction_words(&c.load_direction),
        load: q(c.max_load_n, Dimension::Force, units),
        drift_procedures,
        decay_procedures,
        history,
        danger: crate::pages::danger::worst(&c, &fitted, units),
        danger_id: c.id,
        danger_for: String::new(),
        service,
        machine_status: machine.status.clone(),
        machine_status_words: machine.status_words,
    }
    .into_response()
}
