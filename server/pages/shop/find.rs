//! `/shop`: find the unit by its number; `/shop/machines/{id}`: its status, its cylinders to
//! test, and its inspections.

use super::load_machine;
use super::words::when;
use crate::api::paging::pick_units;
use crate::app::AppState;
use crate::db::machines::{self, MachineFilter};
use crate::db::page::Window;
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
    /// What is due and overdue at the user's site (every site without one), nearest first.
    pub work: Vec<super::worklist::WorkItem>,
    /// The site's name, empty for every site.
    pub work_site: String,
}

#[derive(Debug, Default, Deserialize)]
pub struct Search {
    pub q: Option<String>,
}

/// `GET /shop?q=`: an exact unit number goes straight to the machine; otherwise the matches.
pub async fn index(
    State(state): State<AppState>,
    ctx: PageCtx,
    actor: crate::auth::Actor,
    Query(search): Query<Search>,
) -> Response {
    let q = search.q.unwrap_or_default().trim().to_string();
    // On the shop an underscore is a separator typed for a dash, not a pattern character.
    let filter = MachineFilter {
        q: (!q.is_empty()).then(|| q.replace('_', " ")),
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
            .find(|m| crate::db::names::key(&m.unit_number) == crate::db::names::key(&q))
    {
        let target = format!("/shop/machines/{}", m.id);
        return (StatusCode::SEE_OTHER, [(LOCATION, target)]).into_response();
    }
    let (work, work_site) = if q.is_empty() {
        match super::worklist::work_list(&state.db, actor.user_id).await {
            Ok(found) => found,
            Err(e) => return page_error(e.into()),
        }
    } else {
        (Vec::new(), None)
    };
    IndexPage {
        ctx,
        q,
        work,
        work_site: work_site.unwrap_or_default(),
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
    /// The cylinder's worst hazard in words (shown before any form).
    pub danger: crate::pages::danger::Danger,
    /// The last test's decision (`fit_for_service`, `restricted`, `remove_from_service`).
    pub last_decision: String,
    pub last_decision_words: String,
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
    /// The machine's service status, open restrictions and history.
    pub service: crate::pages::service_view::ServicePanel,
    /// True when any cylinder has a hazard (the cautions are then shown with them).
    pub any_danger: bool,
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
    let machine_hoses = match crate::db::hoses::of_machine(&state.db, m.id).await {
        Ok(h) => h,
        Err(e) => return page_error(e.into()),
    };
    let service = match crate::pages::service_view::machine_panel(&state.db, m.id).await {
        Ok(panel) => panel,
        Err(e) => return page_error(e.into()),
    };
    let mut tiles = Vec::new();
    for c in &list {
        let fitted: Vec<&crate::db::hoses::Hose> = machine_hoses
            .iter()
            .filter(|h| h.cylinder_id == Some(c.id))
            .collect();
        let tests = match drift_tests::of_cylinder(&state.db, c.id).await {
            Ok(t) => t,
            Err(e) => return page_error(e.into()),
        };
        let last = tests.iter().rev().find(|t| t.in_force());
        let decided = last.map(|t| {
            crate::api::decision_answer::of_record(
                t.decision.as_deref(),
                t.decision_json.as_deref(),
                (Some(&t.verdict), Some(&t.diagnosis), None),
            )
        });
        let word = |key: &str| {
            decided
                .as_ref()
                .and_then(|d| d[key].as_str().map(str::to_string))
                .unwrap_or_default()
        };
        tiles.push(CylinderTile {
            id: c.id,
            function: function_text(c),
            size: size_text(c, units),
            danger: crate::pages::danger::worst(c, &fitted, units),
            last_decision: word("decision"),
            last_decision_words: word("decision_words"),
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
        any_danger: tiles.iter().any(|t| t.danger.found),
        cylinders: tiles,
        inspections: records.iter().take(20).map(inspection_line).collect(),
        service,
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
