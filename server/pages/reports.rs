//! The manager's report pages: `/reports` (fleet overview), `/reports/due`,
//! `/reports/out-of-service`, `/reports/hazards`, `/reports/hose-age`. Filters are GET form
//! fields with the API's names; each page prints its filters and the time it was generated,
//! and links to the same list as CSV.

use super::ctx::PageCtx;
use super::page_error;
use super::report_views::{
    self as views, DueLine, FilterForm, HoseLine, OutLine, PressureLine, TrendLine,
};
use crate::api::paging::Params;
use crate::api::reports as api;
use crate::app::AppState;
use crate::calc::quantity::UnitSystem;
use crate::db::reports::fleet;
use crate::db::reports::hazards::{self, HazardQuery};
use crate::db::reports::{self, DueQuery, FleetFilter, hoses};
use crate::db::sites::{self, Site};
use crate::error::AppError;
use askama::Template;
use askama_web::WebTemplate;
use axum::Router;
use axum::extract::State;
use axum::http::StatusCode;
use axum::http::header::{CACHE_CONTROL, CONTENT_TYPE};
use axum::response::{IntoResponse, Redirect, Response};
use axum::routing::{get, post};
use time::Date;

const CSS: &str = include_str!("../../web/static/reports.css");

pub fn router() -> Router<AppState> {
    Router::new()
        .route("/reports", get(super::report_overview::overview))
        .route("/reports/due", get(due))
        .route("/reports/out-of-service", get(out_of_service))
        .route("/reports/hazards", get(hazard_page))
        .route("/reports/hose-age", get(hose_age))
        .route("/reports/settings", post(save_settings))
        .route("/static/reports.css", get(css))
}

async fn css() -> impl IntoResponse {
    (
        [
            (CONTENT_TYPE, "text/css; charset=utf-8"),
            (CACHE_CONTROL, "public, max-age=3600"),
        ],
        CSS,
    )
}

/// What every report page prints at its top.
pub struct Header {
    pub as_of: String,
    pub filters: String,
    pub generated_at: String,
    /// The same list as CSV, with the same filters.
    pub csv_href: String,
    /// The message for a filter that could not be read (the list is then empty).
    pub problem: String,
}

/// Sites and machine kinds for the filter form.
async fn choices(state: &AppState) -> Result<(Vec<Site>, Vec<String>), AppError> {
    Ok((
        sites::all_active(&state.db).await?,
        crate::db::machines::kinds(&state.db).await?,
    ))
}

pub fn header(
    as_of: Date,
    filter: &FleetFilter,
    all: &[Site],
    csv: &str,
    pairs: &[(&str, String)],
) -> Header {
    let mut pairs = pairs.to_vec();
    pairs.extend(views::filter_pairs(filter));
    pairs.push(("format", "csv".into()));
    Header {
        as_of: views::as_of_words(as_of),
        filters: views::filter_words(filter, all),
        generated_at: views::generated_at(),
        csv_href: format!("/api/v1/reports/{csv}?{}", views::query_string(&pairs)),
        problem: String::new(),
    }
}

/// A page whose filters did not parse: the form with the text as typed and the message.
fn refused<T: IntoResponse>(page: T) -> Response {
    (StatusCode::UNPROCESSABLE_ENTITY, page).into_response()
}

#[derive(Template, WebTemplate)]
#[template(path = "reports/due.html")]
pub struct DuePage {
    pub ctx: PageCtx,
    pub head: Header,
    pub form: FilterForm,
    pub lines: Vec<DueLine>,
    pub overdue: usize,
    pub due_soon: usize,
    pub window: String,
}

fn window_words(q: &DueQuery) -> String {
    match q.window.hours {
        Some(h) => format!("{} days or {h} meter hours", q.window.days),
        None => format!("{} days", q.window.days),
    }
}

async fn due(State(state): State<AppState>, ctx: PageCtx, params: Params) -> Response {
    let (all, kinds) = match choices(&state).await {
        Ok(c) => c,
        Err(e) => return page_error(e),
    };
    let raw = |name: &str| params.get(name).unwrap_or("").to_string();
    let parsed = api::due_query(&state, &params).await;
    let query = parsed
        .as_ref()
        .cloned()
        .unwrap_or_else(|_| DueQuery::new(api::today()));
    let form = views::filter_form(
        &query.as_of.to_string(),
        &raw("within_days"),
        &raw("within_hours"),
        &query.filter,
        &all,
        &kinds,
    );
    let pairs = [
        ("as_of", query.as_of.to_string()),
        ("within_days", query.window.days.to_string()),
        (
            "within_hours",
            query
                .window
                .hours
                .map(|h| h.to_string())
                .unwrap_or_default(),
        ),
    ];
    let mut page = DuePage {
        ctx,
        head: header(query.as_of, &query.filter, &all, "due", &pairs),
        form,
        lines: Vec::new(),
        overdue: 0,
        due_soon: 0,
        window: window_words(&query),
    };
    if let Err(error) = parsed {
        page.form.as_of = raw("as_of");
        page.head.problem = error.parts().1;
        return refused(page);
    }
    let items = match reports::due_list(&state.db, &query).await {
        Ok(items) => items,
        Err(e) => return page_error(e.into()),
    };
    page.lines = items.iter().map(views::due_line).collect();
    page.overdue = items.iter().filter(|i| i.due.overdue).count();
    page.due_soon = items.len() - page.overdue;
    page.into_response()
}

#[derive(Template, WebTemplate)]
#[template(path = "reports/out_of_service.html")]
pub struct OutPage {
    pub ctx: PageCtx,
    pub head: Header,
    pub form: FilterForm,
    pub lines: Vec<OutLine>,
    /// Machines in service under a restriction a record set.
    pub restricted: Vec<crate::db::reports::fleet::Restricted>,
}

async fn out_of_service(State(state): State<AppState>, ctx: PageCtx, params: Params) -> Response {
    let (all, kinds) = match choices(&state).await {
        Ok(c) => c,
        Err(e) => return page_error(e),
    };
    let parsed = api::fleet_filter(&state, &params).await;
    let filter = parsed.as_ref().cloned().unwrap_or_default();
    let mut page = OutPage {
        ctx,
        head: header(api::today(), &filter, &all, "out-of-service", &[]),
        form: views::filter_form("", "", "", &filter, &all, &kinds),
        lines: Vec::new(),
        restricted: Vec::new(),
    };
    if let Err(error) = parsed {
        page.head.problem = error.parts().1;
        return refused(page);
    }
    match fleet::out_of_service(&state.db, &filter).await {
        Ok(items) => page.lines = items.iter().map(views::out_line).collect(),
        Err(e) => return page_error(e.into()),
    }
    match fleet::restricted(&state.db, &filter).await {
        Ok(items) => page.restricted = items,
        Err(e) => return page_error(e.into()),
    }
    page.into_response()
}

#[derive(Template, WebTemplate)]
#[template(path = "reports/hazards.html")]
pub struct HazardPage {
    pub ctx: PageCtx,
    pub head: Header,
    pub form: FilterForm,
    pub pressures: Vec<PressureLine>,
    pub hoses: Vec<HoseLine>,
    pub trends: Vec<TrendLine>,
    pub hose_age_limit: String,
    pub within_days: i64,
}

/// The display units: `units=` if given, else the filtered site's, else metric.
fn page_units(params: &Params, filter: &FleetFilter, all: &[Site]) -> UnitSystem {
    let site_units = filter
        .site_id
        .and_then(|id| all.iter().find(|s| s.id == id))
        .map(|s| s.units.as_str());
    crate::api::paging::pick_units(params.units().ok().flatten(), site_units)
}

async fn hazard_page(State(state): State<AppState>, ctx: PageCtx, params: Params) -> Response {
    let (all, kinds) = match choices(&state).await {
        Ok(c) => c,
        Err(e) => return page_error(e),
    };
    let parsed = async {
        Ok::<_, AppError>(HazardQuery {
            as_of: api::as_of(&params)?,
            within_days: api::within_days(&params)?,
            filter: api::fleet_filter(&state, &params).await?,
        })
    }
    .await;
    let query = parsed.as_ref().cloned().unwrap_or_else(|_| HazardQuery {
        as_of: api::today(),
        within_days: DueQuery::DEFAULT_WITHIN_DAYS,
        filter: FleetFilter::default(),
    });
    let units = page_units(&params, &query.filter, &all);
    let pairs = [
        ("as_of", query.as_of.to_string()),
        ("within_days", query.within_days.to_string()),
        ("units", units.as_str().to_string()),
    ];
    let raw_days = params.get("within_days").unwrap_or("").to_string();
    let mut page = HazardPage {
        ctx,
        head: header(query.as_of, &query.filter, &all, "hazards", &pairs),
        form: views::filter_form(
            &query.as_of.to_string(),
            &raw_days,
            "",
            &query.filter,
            &all,
            &kinds,
        ),
        pressures: Vec::new(),
        hoses: Vec::new(),
        trends: Vec::new(),
        hose_age_limit: String::new(),
        within_days: query.within_days,
    };
    if let Err(error) = parsed {
        page.form.as_of = params.get("as_of").unwrap_or("").to_string();
        page.head.problem = error.parts().1;
        return refused(page);
    }
    let (found, settings) = match (
        hazards::hazards(&state.db, &query).await,
        hoses::settings(&state.db).await,
    ) {
        (Ok(f), Ok(s)) => (f, s),
        (Err(e), _) | (_, Err(e)) => return page_error(e.into()),
    };
    page.pressures = views::by_machine(
        found
            .pressures
            .iter()
            .map(|p| views::pressure_line(p, units))
            .collect(),
    );
    page.hoses = found.hoses.iter().map(views::hose_line).collect();
    page.trends = found
        .trends
        .iter()
        .map(|t| views::trend_line(t, units))
        .collect();
    page.hose_age_limit = settings
        .hose_age_limit_years
        .map(|y| format!("{y} years"))
        .unwrap_or_default();
    page.into_response()
}

#[derive(Template, WebTemplate)]
#[template(path = "reports/hose_age.html")]
pub struct HoseAgePage {
    pub ctx: PageCtx,
    pub head: Header,
    pub form: FilterForm,
    pub lines: Vec<HoseLine>,
    /// The shop's age limit in years, empty when none is set.
    pub age_limit: String,
}

async fn hose_age(State(state): State<AppState>, ctx: PageCtx, params: Params) -> Response {
    let (all, kinds) = match choices(&state).await {
        Ok(c) => c,
        Err(e) => return page_error(e),
    };
    let parsed = async {
        Ok::<_, AppError>((
            api::as_of(&params)?,
            api::fleet_filter(&state, &params).await?,
        ))
    }
    .await;
    let (as_of, filter) = parsed
        .as_ref()
        .cloned()
        .unwrap_or_else(|_| (api::today(), FleetFilter::default()));
    let pairs = [("as_of", as_of.to_string())];
    let mut page = HoseAgePage {
        ctx,
        head: header(as_of, &filter, &all, "hose-age", &pairs),
        form: views::filter_form(&as_of.to_string(), "", "", &filter, &all, &kinds),
        lines: Vec::new(),
        age_limit: String::new(),
    };
    if let Err(error) = parsed {
        page.form.as_of = params.get("as_of").unwrap_or("").to_string();
        page.head.problem = error.parts().1;
        return refused(page);
    }
    match hoses::hose_age(&state.db, &filter, as_of).await {
        Ok((items, settings)) => {
            page.lines = items.iter().map(views::hose_line).collect();
            page.age_limit = settings
                .hose_age_limit_years
                .map(|y| y.to_string())
                .unwrap_or_default();
        }
        Err(e) => return page_error(e.into()),
    }
    page.into_response()
}

/// `POST /reports/settings` (`hose_age_limit_years`, empty for none) from the hose-age page.
async fn save_settings(
    State(state): State<AppState>,
    actor: crate::auth::Actor,
    axum::Form(form): axum::Form<Vec<(String, String)>>,
) -> Response {
    let text = form
        .iter()
        .find(|(k, _)| k == "hose_age_limit_years")
        .map(|(_, v)| v.trim().to_string())
        .unwrap_or_default();
    let years = if text.is_empty() {
        None
    } else {
        match text.parse::<i32>().ok().filter(|y| (1..=100).contains(y)) {
            Some(y) => Some(y),
            None => {
                return page_error(AppError::field(
                    "hose_age_limit_years",
                    "out_of_range",
                    "the hose age limit must be a whole number of years from 1 to 100, or empty for none",
                ));
            }
        }
    };
    match hoses::set_hose_age_limit(&state.db, &actor.name, years).await {
        Ok(_) => Redirect::to("/reports/hose-age").into_response(),
        Err(e) => page_error(e.into()),
    }
}
