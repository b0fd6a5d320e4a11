//! The fleet list: every machine with search and filters (`q`, `site`, `status`, `kind`,
//! archived), one page at a time.

use super::ctx::PageCtx;
use super::forms::{Choice, encode};
use super::page_error;
use crate::api::machine_draft::{STATUSES, normalise_kind};
use crate::api::paging::Params;
use crate::app::AppState;
use crate::db::machines::{self as store, MachineFilter};
use crate::db::sites;
use askama::Template;
use askama_web::WebTemplate;
use axum::extract::State;
use axum::response::{IntoResponse, Response};

/// One line of the fleet list.
pub struct Line {
    pub id: i64,
    pub unit_number: String,
    pub kind: String,
    pub description: String,
    pub site: String,
    pub status: String,
    pub cylinders: i64,
    pub hoses: i64,
    pub archived: bool,
}

#[derive(Template, WebTemplate)]
#[template(path = "machines/list.html")]
pub struct ListPage {
    pub ctx: PageCtx,
    pub lines: Vec<Line>,
    pub q: String,
    pub sites: Vec<Choice>,
    pub kinds: Vec<Choice>,
    pub statuses: Vec<Choice>,
    pub archived: bool,
    pub filtered: bool,
    pub next_href: String,
    pub problem: String,
}

fn choices(all: Vec<(String, String)>, current: Option<&str>) -> Vec<Choice> {
    all.into_iter()
        .map(|(value, label)| Choice {
            selected: Some(value.as_str()) == current,
            value,
            label,
        })
        .collect()
}

/// `GET /machines`.
pub async fn list(State(state): State<AppState>, ctx: PageCtx, params: Params) -> Response {
    let mut problems = Vec::new();
    let site_id = params.id("site").unwrap_or_else(|e| {
        problems.push(e.parts().1);
        None
    });
    let status = params.choice("status", STATUSES).unwrap_or_else(|e| {
        problems.push(e.parts().1);
        None
    });
    let problem = problems.join(" ");
    let filter = MachineFilter {
        site_id,
        status,
        kind: params.get("kind").map(normalise_kind),
        q: params.get("q").map(str::to_string),
        include_archived: params.flag("archived").unwrap_or(false),
    };
    let window = params.window().unwrap_or_default();
    let page = match store::list(&state.db, &filter, window).await {
        Ok(page) => page,
        Err(e) => return page_error(e.into()),
    };
    let (all_sites, kinds) = match (
        sites::all_active(&state.db).await,
        store::kinds(&state.db).await,
    ) {
        (Ok(s), Ok(k)) => (s, k),
        (Err(e), _) | (_, Err(e)) => return page_error(e.into()),
    };
    let mut next_href = String::new();
    if let Some(cursor) = page.next_cursor {
        let mut query: Vec<String> = params
            .0
            .iter()
            .filter(|(k, v)| k != "cursor" && !v.trim().is_empty())
            .map(|(k, v)| format!("{}={}", encode(k), encode(v)))
            .collect();
        query.push(format!("cursor={cursor}"));
        next_href = format!("/machines?{}", query.join("&"));
    }
    let site_text = filter.site_id.map(|s| s.to_string());
    let mut site_options = vec![(String::new(), "Every site".to_string())];
    site_options.extend(all_sites.iter().map(|s| (s.id.to_string(), s.name.clone())));
    let mut kind_options = vec![(String::new(), "Every kind".to_string())];
    kind_options.extend(kinds.into_iter().map(|k| (k.clone(), k)));
    let status_options = vec![
        (String::new(), "Any status".to_string()),
        ("in_service".to_string(), "In service".to_string()),
        ("out_of_service".to_string(), "Out of service".to_string()),
    ];
    let filtered = filter != MachineFilter::default();
    ListPage {
        ctx,
        lines: page
            .items
            .iter()
            .map(|m| Line {
                id: m.id,
                unit_number: m.unit_number.clone(),
                kind: m.kind.clone(),
                description: m.description.clone().unwrap_or_default(),
                site: m.site_name.clone().unwrap_or_else(|| "—".into()),
                status: m.status.clone(),
                cylinders: m.cylinder_count,
                hoses: m.hose_count,
                archived: m.archived_at.is_some(),
            })
            .collect(),
        q: filter.q.clone().unwrap_or_default(),
        sites: choices(site_options, site_text.as_deref()),
        kinds: choices(kind_options, filter.kind.as_deref()),
        statuses: choices(status_options, filter.status.as_deref()),
        archived: filter.include_archived,
        filtered,
        next_href,
        problem,
    }
    .into_response()
}
