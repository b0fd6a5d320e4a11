//! A stored inspection as the shop sees it: result, items, deficiencies and corrective
//! action, who signed it and when, whether it put the machine out of service, and the records
//! it amends or that amend it.

use super::find::{InspectionLine, inspection_line};
use super::inspection::ITEMS;
use super::load_machine;
use super::words::when;
use crate::api::paging::path_id;
use crate::app::AppState;
use crate::db::inspections;
use crate::error::AppError;
use crate::pages::ctx::PageCtx;
use crate::pages::page_error;
use askama::Template;
use askama_web::WebTemplate;
use axum::extract::{Path, Query, State};
use axum::response::{IntoResponse, Response};
use serde::Deserialize;
use serde_json::Value;

#[derive(Template, WebTemplate)]
#[template(path = "shop/inspection.html")]
pub struct InspectionPage {
    pub ctx: PageCtx,
    pub line: InspectionLine,
    pub machine_id: i64,
    pub unit_number: String,
    pub machine_status: String,
    pub caused_out_of_service: bool,
    pub items: Vec<(String, String, String, String)>,
    pub deficiencies: String,
    pub corrective_action: String,
    pub created: String,
    pub repeated: bool,
    /// The record's decision first (`calc::decision`) and its reasons.
    pub decision: String,
    pub decision_words: String,
    pub reasons: Vec<String>,
    pub signed_by: String,
}

#[derive(Debug, Default, Deserialize)]
pub struct RecordQuery {
    pub repeat: Option<String>,
}

/// `GET /shop/inspections/{id}`.
pub async fn show(
    State(state): State<AppState>,
    ctx: PageCtx,
    Path(id): Path<String>,
    Query(query): Query<RecordQuery>,
) -> Response {
    let id = match path_id(&id, "inspection") {
        Ok(id) => id,
        Err(e) => return page_error(e),
    };
    let i = match inspections::find(&state.db, id).await {
        Ok(Some(i)) => i,
        Ok(None) => return page_error(AppError::not_found(format!("inspection {id}"))),
        Err(e) => return page_error(e.into()),
    };
    let m = match load_machine(&state, &i.machine_id.to_string()).await {
        Ok(m) => m,
        Err(page) => return page,
    };
    let cause = match inspections::out_of_service_cause(&state.db, m.id).await {
        Ok(c) => c,
        Err(e) => return page_error(e.into()),
    };
    let stored: Vec<Value> = serde_json::from_str(&i.items_json).unwrap_or_default();
    let items = stored
        .iter()
        .map(|s| {
            let name = s["item"].as_str().unwrap_or("");
            let label = ITEMS
                .iter()
                .find(|(item, ..)| *item == name)
                .map_or(name.replace('_', " "), |(.., l)| l.to_string());
            let outcome = s["outcome"].as_str().unwrap_or("not_checked").to_string();
            let class = s["leakage_class"]
                .as_i64()
                .map(|c| format!("class {c}"))
                .unwrap_or_default();
            (
                label,
                outcome,
                class,
                s["note"].as_str().unwrap_or("").to_string(),
            )
        })
        .collect();
    let decided = crate::api::decision_answer::of_record(
        i.decision.as_deref(),
        i.decision_json.as_deref(),
        (None, None, Some(&i.result)),
    );
    let word = |key: &str| decided[key].as_str().unwrap_or_default().to_string();
    InspectionPage {
        decision: word("decision"),
        decision_words: word("decision_words"),
        reasons: super::words::texts(&decided["reasons"]),
        signed_by: i.created_by.clone(),
        ctx,
        line: inspection_line(&i),
        machine_id: m.id,
        unit_number: m.unit_number.clone(),
        machine_status: m.status.clone(),
        caused_out_of_service: cause == Some(i.id),
        items,
        deficiencies: i.deficiencies.clone().unwrap_or_default(),
        corrective_action: i.corrective_action.clone().unwrap_or_default(),
        created: format!("{} at {}", i.created_by, when(&i.created_at)),
        repeated: query.repeat.is_some(),
    }
    .into_response()
}
