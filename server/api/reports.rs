//! `/api/v1/reports/*`: the manager's lists (due, out of service, hazards, hose age) as JSON
//! or, with `format=csv`, as RFC 4180 CSV with a header row; and the shop's report settings.
//! Query parameters are checked here and every bad one is a 422 that names it.

use super::paging::Params;
use super::report_rows::{self, Table};
use crate::app::AppState;
use crate::auth::Actor;
use crate::calc::due::Window;
use crate::calc::quantity::UnitSystem;
use crate::db::reports::hazards::{self, HazardQuery};
use crate::db::reports::{self, DueQuery, FleetFilter, fleet, hoses};
use crate::error::{ApiResult, AppError};
use axum::Json;
use axum::Router;
use axum::extract::State;
use axum::http::header;
use axum::response::{IntoResponse, Response};
use axum::routing::get;
use serde_json::{Value, json};
use time::Date;

pub fn router() -> Router<AppState> {
    Router::new()
        .route("/api/v1/reports/due", get(due))
        .route("/api/v1/reports/out-of-service", get(out_of_service))
        .route("/api/v1/reports/hazards", get(hazard_list))
        .route("/api/v1/reports/hose-age", get(hose_age))
        .route(
            "/api/v1/reports/settings",
            get(settings).put(put_settings).patch(put_settings),
        )
}

/// Statuses a machine can stand in.
pub const STATUSES: &[&str] = &["in_service", "out_of_service"];
/// Longest look-ahead accepted, days (ten years).
pub const MAX_WITHIN_DAYS: i64 = 3660;

/// `json` or `csv`.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Format {
    Json,
    Csv,
}

/// `format=json|csv` (default JSON).
pub fn format(params: &Params) -> ApiResult<Format> {
    Ok(
        match params.choice("format", &["json", "csv"])?.as_deref() {
            Some("csv") => Format::Csv,
            _ => Format::Json,
        },
    )
}

pub use super::draft::today;

/// `as_of=YYYY-MM-DD`, default today (UTC).
pub fn as_of(params: &Params) -> ApiResult<Date> {
    match params.get("as_of") {
        None => Ok(today()),
        Some(text) => super::input::parse_date(text).ok_or_else(|| {
            AppError::field("as_of", "invalid_date", "must be a date written YYYY-MM-DD")
        }),
    }
}

/// `within_days=N` (0 to 3660, default 30).
pub fn within_days(params: &Params) -> ApiResult<i64> {
    match params.get("within_days") {
        None => Ok(DueQuery::DEFAULT_WITHIN_DAYS),
        Some(text) => text
            .parse::<i64>()
            .ok()
            .filter(|n| (0..=MAX_WITHIN_DAYS).contains(n))
            .ok_or_else(|| {
                AppError::field(
                    "within_days",
                    "out_of_range",
                    format!("must be a whole number of days from 0 to {MAX_WITHIN_DAYS}"),
                )
            }),
    }
}

/// `within_hours=H` (hours on the meter, a number from 0 to 100,000), if given.
pub fn within_hours(params: &Params) -> ApiResult<Option<f64>> {
    match params.get("within_hours") {
        None => Ok(None),
        Some(text) => text
            .parse::<f64>()
            .ok()
            .filter(|h| h.is_finite() && (0.0..=100_000.0).contains(h))
            .map(Some)
            .ok_or_else(|| {
                AppError::field(
                    "within_hours",
                    "out_of_range",
                    "must be a number of meter hours from 0 to 100000",
                )
            }),
    }
}

/// `site`, `kind` (machine kind) and `status`; an unknown site is refused, naming `site`.
pub async fn fleet_filter(state: &AppState, params: &Params) -> ApiResult<FleetFilter> {
    let site_id = params.id("site")?;
    if let Some(id) = site_id
        && crate::db::sites::find(&state.db, id).await?.is_none()
    {
        return Err(AppError::field(
            "site",
            "unknown",
            format!("there is no site {id}"),
        ));
    }
    Ok(FleetFilter {
        site_id,
        machine_kind: params.get("kind").map(super::machine_draft::normalise_kind),
        status: params.choice("status", STATUSES)?,
    })
}

/// The due list's question from the query string.
pub async fn due_query(state: &AppState, params: &Params) -> ApiResult<DueQuery> {
    Ok(DueQuery {
        as_of: as_of(params)?,
        window: Window {
            days: within_days(params)?,
            hours: within_hours(params)?,
        },
        filter: fleet_filter(state, params).await?,
    })
}

/// A CSV download: RFC 4180 (comma, CRLF line ends, quotes where needed), header row first;
/// cells that a spreadsheet would read as a formula start with an apostrophe (`csv_safe`).
pub fn csv_response(name: &str, as_of: Date, table: &Table) -> ApiResult<Response> {
    let mut writer = csv::WriterBuilder::new()
        .terminator(csv::Terminator::CRLF)
        .from_writer(Vec::new());
    writer
        .write_record(&table.header)
        .map_err(AppError::internal)?;
    for row in &table.rows {
        // every text cell, whoever typed it, is neutralised for spreadsheets
        let cells = row.iter().map(|c| super::csv_safe::cell(c).into_owned());
        writer.write_record(cells).map_err(AppError::internal)?;
    }
    let bytes = writer.into_inner().map_err(AppError::internal)?;
    let disposition = format!("attachment; filename=\"loadhold-{name}-{as_of}.csv\"");
    Ok((
        [
            (header::CONTENT_TYPE, "text/csv; charset=utf-8".to_string()),
            (header::CONTENT_DISPOSITION, disposition),
        ],
        bytes,
    )
        .into_response())
}

const DUE_PARAMS: &[&str] = &[
    "as_of",
    "within_days",
    "within_hours",
    "site",
    "kind",
    "status",
    "format",
];

/// `GET /api/v1/reports/due`: every item overdue or due within the window, furthest overdue
/// first, as `{"items": [...]}` or CSV.
async fn due(
    State(state): State<AppState>,
    actor: crate::auth::Actor,
    params: Params,
) -> ApiResult<Response> {
    params.deny_unknown(DUE_PARAMS)?;
    let fmt = format(&params)?;
    let mut query = due_query(&state, &params).await?;
    // A technician with a site reads that site's due list only.
    if actor.role == crate::auth::Role::Technician
        && let Some(uid) = actor.user_id
    {
        let site: Option<i64> =
            sqlx::query_scalar("SELECT site_id FROM users WHERE id = ? AND site_id IS NOT NULL")
                .bind(uid)
                .fetch_optional(&state.db)
                .await?;
        if let Some(site) = site {
            if query.filter.site_id.is_some_and(|asked| asked != site) {
                return Err(AppError::Forbidden(
                    "read another site's due list (your account works at another site)".into(),
                ));
            }
            query.filter.site_id = Some(site);
        }
    }
    let items = reports::due_list(&state.db, &query).await?;
    Ok(match fmt {
        Format::Csv => csv_response("due", query.as_of, &report_rows::due_table(&items))?,
        Format::Json => Json(json!({
            "items": items.iter().map(report_rows::due_json).collect::<Vec<_>>(),
        }))
        .into_response(),
    })
}

/// `GET /api/v1/reports/out-of-service`: which machines, why, since when, which record.
async fn out_of_service(State(state): State<AppState>, params: Params) -> ApiResult<Response> {
    params.deny_unknown(&["site", "kind", "format"])?;
    let fmt = format(&params)?;
    let filter = fleet_filter(&state, &params).await?;
    let items = fleet::out_of_service(&state.db, &filter).await?;
    let restricted = fleet::restricted(&state.db, &filter).await?;
    Ok(match fmt {
        Format::Csv => csv_response(
            "out-of-service",
            today(),
            &report_rows::out_of_service_table(&items),
        )?,
        Format::Json => Json(json!({
            "items": items.iter().map(report_rows::out_of_service_json).collect::<Vec<_>>(),
            "restricted": restricted.iter().map(report_rows::restricted_json).collect::<Vec<_>>(),
        }))
        .into_response(),
    })
}

/// `GET /api/v1/reports/hazards`: pressures above ratings, hoses past replace-by or age, drift
/// trends reaching their limit within the window; with the usual cautions.
async fn hazard_list(State(state): State<AppState>, params: Params) -> ApiResult<Response> {
    params.deny_unknown(&[
        "as_of",
        "within_days",
        "site",
        "kind",
        "status",
        "format",
        "units",
    ])?;
    let fmt = format(&params)?;
    let units = params.units()?.unwrap_or(UnitSystem::Metric);
    let query = HazardQuery {
        as_of: as_of(&params)?,
        within_days: within_days(&params)?,
        filter: fleet_filter(&state, &params).await?,
    };
    let found = hazards::hazards(&state.db, &query).await?;
    Ok(match fmt {
        Format::Csv => csv_response(
            "hazards",
            query.as_of,
            &report_rows::hazard_table(&found, units),
        )?,
        Format::Json => Json(report_rows::hazards_json(&found, query.as_of, units)).into_response(),
    })
}

/// `GET /api/v1/reports/hose-age`: every hose, oldest first.
async fn hose_age(State(state): State<AppState>, params: Params) -> ApiResult<Response> {
    params.deny_unknown(&["as_of", "site", "kind", "status", "format"])?;
    let fmt = format(&params)?;
    let as_of = as_of(&params)?;
    let filter = fleet_filter(&state, &params).await?;
    let (items, settings) = hoses::hose_age(&state.db, &filter, as_of).await?;
    Ok(match fmt {
        Format::Csv => csv_response("hose-age", as_of, &report_rows::hose_age_table(&items))?,
        Format::Json => Json(json!({
            "as_of": as_of.to_string(),
            "hose_age_limit_years": settings.hose_age_limit_years,
            "items": items.iter().map(report_rows::hose_age_json).collect::<Vec<_>>(),
        }))
        .into_response(),
    })
}

fn settings_json(s: &hoses::Settings) -> Value {
    json!({
        "hose_age_limit_years": s.hose_age_limit_years,
        "updated_at": s.updated_at,
        "updated_by": s.updated_by,
    })
}

/// `GET /api/v1/reports/settings`.
async fn settings(State(state): State<AppState>, params: Params) -> ApiResult<Json<Value>> {
    params.deny_unknown(&[])?;
    Ok(Json(settings_json(&hoses::settings(&state.db).await?)))
}

/// `PUT /api/v1/reports/settings` `{"hose_age_limit_years": N | null}` (1 to 100 years).
async fn put_settings(
    State(state): State<AppState>,
    actor: Actor,
    params: Params,
    super::input::Body(body): super::input::Body,
) -> ApiResult<Json<Value>> {
    params.deny_unknown(&[])?;
    let fields = super::input::Fields::new(&body);
    fields.deny_unknown(&["hose_age_limit_years"])?;
    if !body.contains_key("hose_age_limit_years") {
        return Err(AppError::field(
            "hose_age_limit_years",
            "required",
            "give a whole number of years from 1 to 100, or null for no age limit",
        ));
    }
    let years = fields.opt_integer("hose_age_limit_years", 1, 100)?;
    let saved = hoses::set_hose_age_limit(&state.db, &actor.name, years.map(|y| y as i32)).await?;
    Ok(Json(settings_json(&saved)))
}

/// The `due` field of `GET /api/v1/machines/{id}`: everything due on the machine (its
/// inspections, its cylinders' drift tests, its hoses) as of today, most overdue first.
pub async fn machine_due(state: &AppState, machine_id: i64) -> ApiResult<Value> {
    let items = reports::due_for_machine(&state.db, machine_id, today()).await?;
    Ok(Value::Array(
        items.iter().map(report_rows::due_json).collect(),
    ))
}

/// The `due` field of `GET /api/v1/cylinders/{id}`: its drift test and its hoses, as of today.
pub async fn cylinder_due(state: &AppState, cylinder_id: i64) -> ApiResult<Value> {
    let items = reports::due_for_cylinder(&state.db, cylinder_id, today()).await?;
    Ok(Value::Array(
        items.iter().map(report_rows::due_json).collect(),
    ))
}
