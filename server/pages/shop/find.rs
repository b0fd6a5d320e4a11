//! `/shop`: find the unit by its number; `/shop/machines/{id}`: its status, its cylinders to
//! test, and its inspections.

use super::load_machine;
use super::words::when;
use crate::api::paging::pick_units;
use crate::app::AppState;
use crate::db::machines::{self, MachineFilter};
use crate::db::page::Window;
use crate::db::unit_search;
use crate::db::{cylinders, drift_tests, inspections};
use crate::pages::ctx::PageCtx;
use crate::pages::machine_page::{function_text, size_text};
use crate::pages::page_error;
use askama::Template;
use askama_web::WebTemplate;
use axum::extract::{Path, Query, State};
use axum::http::StatusCode;
use axum::http::header::LOCATION;
use axum::response::{IntoResponse, Response};
use serde::Deserialize;

/// One machine in the search results.
#[derive(Clone, Debug)]
pub struct Tile {
    pub id: i64,
    pub unit_number: String,
    pub kind: String,
    pub description: String,
    pub status: String,
}

#[derive(Template, WebTemplate)]
#[template(path = "shop/index.html")]
pub struct IndexPage {
    pub ctx: PageCtx,
    pub q: String,
    pub tiles: Vec<Tile>,
    pub more: bool,
}

#[derive(Debug, Default, Deserialize)]
pub struct Search {
    pub q: Option<String>,
}

/// `GET /shop?q=`: an exact unit number goes straight to the machine; otherwise the matches.
pub async fn index(
    State(state): State<AppState>,
    ctx: PageCtx,
    Query(search): Query<Search>,
) -> Response {
    let q = search.q.unwrap_or_default().trim().to_string();
    let filter = MachineFilter {
        q: (!q.is_empty()).then(|| q.clone()),
        ..MachineFilter::default()
    };
    let window = Window {
        after_id: 0,
        limit: 100,
    };
    let page = match machines::list(&state.db, &filter, window).await {
        Ok(page) => page,
        Err(e) => return page_error(e.into()),
    };
    if !q.is_empty()
        && let Some(m) = page
            .items
            .iter()
            .find(|m| unit_search::key(&m.unit_number) == unit_search::key(&q))
    {
        let target = format!("/shop/machines/{}", m.id);
        return (StatusCode::SEE_OTHER, [(LOCATION, target)]).into_response();
    }
    IndexPage {
        ctx,
        q,
        more: page.next_cursor.is_some(),
        tiles: page
            .items
            .iter()
            .map(|m| Tile {
                id: m.id,
                unit_number: m.unit_number.clone(),
                kind: m.kind.clone(),
                description: m.description.clone().unwrap_or_default(),
                status: m.status.clone(),
            })
            .collect(),
    }
    .into_response()
}

/// One cylinder on the machine's shop page, with its last drift test in force.
#[derive(Clone, Debug)]
pub struct CylinderTile {
    pub id: i64,
    pub function: String,
    pub size: String,
    pub last_verdict: String,
    pub last_diagnosis: String,
    pub last_at: String,
}

/// One inspection in the machine's list.
#[derive(Clone, Debug)]
pub struct InspectionLine {
    pub id: i64,
    pub kind: String,
    pub performed_on: String,
    pub hour_meter: String,
    pub inspector: String,
    pub result: String,
    pub amended_by: Option<i64>,
    pub amends: Option<i64>,
    pub entered: String,
}

#[derive(Template, WebTemplate)]
#[template(path = "shop/machine.html")]
pub struct MachinePage {
    pub ctx: PageCtx,
    pub id: i64,
    pub unit_number: String,
    pub kind: String,
    pub description: String,
    pub status: String,
    pub reason: String,
    pub since: String,
    pub hour_meter: String,
    pub cylinders: Vec<CylinderTile>,
    pub inspections: Vec<InspectionLine>,
}

/// `GET /shop/machines/{id}`.
pub async fn machine(
    State(state): State<AppState>,
    ctx: PageCtx,
    Path(id): Path<String>,
) -> Response {
    let m = match load_machine(&state, &id).await {
        Ok(m) => m,
        Err(page) => return page,
    };
    let units = pick_units(None, m.site_units.as_deref());
    let list = match cylinders::of_machine(&state.db, m.id).await {
        Ok(list) => list,
        Err(e) => return page_error(e.into()),
    };
    let mut tiles = Vec::new();
    for c in &list {
        let tests = match drift_tests::of_cylinder(&state.db, c.id).await {
            Ok(t) => t,
            Err(e) => return page_error(e.into()),
        };
        let last = tests.iter().rev().find(|t| t.in_force());
        tiles.push(CylinderTile {
            id: c.id,
            function: function_text(c),
            size: size_text(c, units),
            last_verdict: last.map(|t| t.verdict.clone()).unwrap_or_default(),
            last_diagnosis: last.map(|t| t.diagnosis.clone()).unwrap_or_default(),
            last_at: last.map(|t| when(&t.tested_at)).unwrap_or_default(),
        });
    }
    let records = match inspections::of_machine(&state.db, m.id).await {
        Ok(r) => r,
        Err(e) => return page_error(e.into()),
    };
    MachinePage {
        ctx,
        id: m.id,
        unit_number: m.unit_number.clone(),
        kind: m.kind.clone(),
        description: m.description.clone().unwrap_or_default(),
        status: m.status.clone(),
        reason: m.out_of_service_reason.clone().unwrap_or_default(),
        since: m.out_of_service_since.clone().unwrap_or_default(),
        hour_meter: match (m.hour_meter_h, &m.hour_meter_read_on) {
            (Some(h), Some(on)) => format!("{h} h (read {on})"),
            (Some(h), None) => format!("{h} h"),
            _ => "not recorded".into(),
        },
        cylinders: tiles,
        inspections: records.iter().take(20).map(inspection_line).collect(),
    }
    .into_response()
}

pub fn inspection_line(i: &inspections::Inspection) -> InspectionLine {
    InspectionLine {
        id: i.id,
        kind: i.kind.clone(),
        performed_on: i.performed_on.clone(),
        hour_meter: i
            .hour_meter_h
            .map(|h| format!("{h} h"))
            .unwrap_or_else(|| "—".into()),
        inspector: i.inspector.clone(),
        result: i.result.clone(),
        amended_by: i.amended_by_id,
        amends: i.amends_id,
        entered: format!("{} at {}", i.created_by, when(&i.created_at)),
    }
}
