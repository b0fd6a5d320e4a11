//! `/reports`: the fleet overview: machines by site and status, and the due, out-of-service
//! and hazard lists in short.

use super::ctx::PageCtx;
use super::page_error;
use super::report_views::{self as views, DueLine, OutLine};
use super::reports::{Header, header};
use crate::api::reports as api;
use crate::app::AppState;
use crate::db::reports::fleet::{self, StatusCount};
use crate::db::reports::hazards::{self, HazardQuery};
use crate::db::reports::{self, DueQuery, FleetFilter};
use crate::error::AppError;
use askama::Template;
use askama_web::WebTemplate;
use axum::extract::State;
use axum::response::{IntoResponse, Response};

/// One site's machines by status, for the overview.
pub struct SiteCount {
    pub site: String,
    pub site_id: Option<i64>,
    pub in_service: i64,
    pub out_of_service: i64,
}

#[derive(Template, WebTemplate)]
#[template(path = "reports/overview.html")]
pub struct OverviewPage {
    pub ctx: PageCtx,
    pub head: Header,
    pub sites: Vec<SiteCount>,
    pub total_in: i64,
    pub total_out: i64,
    /// Machines in service that a record restricted (`db::reports::fleet::restricted`).
    pub restricted: Vec<crate::db::reports::fleet::Restricted>,
    pub due: Vec<DueLine>,
    pub due_total: usize,
    pub overdue_total: usize,
    pub out: Vec<OutLine>,
    pub pressures: usize,
    pub hoses: usize,
    pub trends: usize,
}

/// How many lines of each list the overview shows.
pub const SHORT_LIST: usize = 8;

fn site_counts(counts: &[StatusCount]) -> Vec<SiteCount> {
    let mut out: Vec<SiteCount> = Vec::new();
    for c in counts {
        let line = match out.iter_mut().find(|s| s.site_id == c.site_id) {
            Some(line) => line,
            None => {
                out.push(SiteCount {
                    site: c.site_name.clone().unwrap_or_else(|| "No site".into()),
                    site_id: c.site_id,
                    in_service: 0,
                    out_of_service: 0,
                });
                let last = out.len() - 1;
                &mut out[last]
            }
        };
        match c.status.as_str() {
            "out_of_service" => line.out_of_service += c.machines,
            _ => line.in_service += c.machines,
        }
    }
    out
}

pub async fn overview(State(state): State<AppState>, ctx: PageCtx) -> Response {
    let as_of = api::today();
    let filter = FleetFilter::default();
    let query = DueQuery::new(as_of);
    let hazard_query = HazardQuery {
        as_of,
        within_days: DueQuery::DEFAULT_WITHIN_DAYS,
        filter: filter.clone(),
    };
    let loaded = async {
        Ok::<_, AppError>((
            fleet::counts(&state.db, &filter).await?,
            reports::due_list(&state.db, &query).await?,
            fleet::out_of_service(&state.db, &filter).await?,
            hazards::hazards(&state.db, &hazard_query).await?,
            fleet::restricted(&state.db, &filter).await?,
        ))
    }
    .await;
    let (counts, due, out, found, restricted) = match loaded {
        Ok(all) => all,
        Err(e) => return page_error(e),
    };
    let sites = site_counts(&counts);
    let pairs = [("as_of", as_of.to_string())];
    OverviewPage {
        ctx,
        head: header(as_of, &filter, &[], "due", &pairs),
        total_in: sites.iter().map(|s| s.in_service).sum(),
        total_out: sites.iter().map(|s| s.out_of_service).sum(),
        restricted,
        sites,
        due_total: due.len(),
        overdue_total: due.iter().filter(|i| i.due.overdue).count(),
        due: due.iter().take(SHORT_LIST).map(views::due_line).collect(),
        out: out.iter().take(SHORT_LIST).map(views::out_line).collect(),
        pressures: found.pressures.len(),
        hoses: found.hoses.len(),
        trends: found.trends.len(),
    }
    .into_response()
}
