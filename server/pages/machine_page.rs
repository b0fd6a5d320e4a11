//! A machine's page: facts, status, intervals, its cylinders (with the worst status of each
//! one's safety checks) and its hoses (with replace-by dates).

use super::ctx::PageCtx;
use super::{page_error, safety};
use crate::api::draft::{date_text, today};
use crate::api::paging::{Params, path_id, pick_units};
use crate::app::AppState;
use crate::calc::quantity::{Dimension, UnitSystem};
use crate::db::cylinders::{self, Cylinder};
use crate::db::hoses::{self, Hose};
use crate::db::machines::{self as store};
use crate::error::AppError;
use crate::pages::view::q;
use askama::Template;
use askama_web::WebTemplate;
use axum::extract::{Path, State};
use axum::response::{IntoResponse, Response};

/// A replace-by date within this many days is shown as due soon.
pub const DUE_SOON_DAYS: i64 = 30;

pub struct CylinderLine {
    pub id: i64,
    pub function: String,
    pub size: String,
    pub load_direction: &'static str,
    pub rated: String,
    pub hoses: i64,
    pub safety: &'static str,
}

pub struct HoseLine {
    pub id: i64,
    pub place: String,
    pub cylinder_id: Option<i64>,
    pub cylinder: String,
    pub spec: String,
    pub size: String,
    pub working_pressure: String,
    pub made_in: String,
    pub installed_on: String,
    pub replace_by: String,
    /// Empty, `due_soon` or `past_replace_by`.
    pub replace_state: &'static str,
}

#[derive(Template, WebTemplate)]
#[template(path = "machines/show.html")]
pub struct MachinePage {
    pub ctx: PageCtx,
    pub id: i64,
    pub unit_number: String,
    pub kind: String,
    pub description: String,
    pub serial: String,
    pub site: String,
    pub status: String,
    pub out_of_service_reason: String,
    pub out_of_service_since: String,
    pub relief: String,
    pub hour_meter: String,
    pub periodic: String,
    pub frequent: String,
    pub registered_on: String,
    pub archived_at: String,
    pub units: &'static str,
    pub cylinders: Vec<CylinderLine>,
    pub hoses: Vec<HoseLine>,
    /// What is due on the machine, its cylinders and hoses (filled by the reports work).
    pub due: Vec<super::report_views::DueLine>,
    /// Service status: open restrictions, causes and their retests, the status history.
    pub service: super::service_view::ServicePanel,
}

/// What a cylinder does (`Boom lift`), else `Cylinder <id>`.
pub fn function_text(c: &Cylinder) -> String {
    c.function
        .clone()
        .unwrap_or_else(|| format!("Cylinder {}", c.id))
}

/// `bore × rod × stroke` in the display units, e.g. `100 × 56 × 600 mm`.
pub fn size_text(c: &Cylinder, units: UnitSystem) -> String {
    let value = |si: f64| {
        let shown = crate::calc::quantity::show(si, Dimension::Length, units);
        crate::calc::quantity::significant(shown.value, 4)
    };
    format!(
        "{} × {} × {} {}",
        value(c.bore_m),
        value(c.rod_m),
        value(c.stroke_m),
        crate::calc::quantity::display_unit(Dimension::Length, units)
    )
}

/// What the load direction means, in words.
pub fn direction_words(direction: &str) -> &'static str {
    match direction {
        "retract" => "pushes the rod in (held by the cap end)",
        _ => "pulls the rod out (held by the rod end)",
    }
}

/// `past_replace_by` when the date has passed, `due_soon` within 30 days, else empty.
pub fn replace_state(replace_by: Option<&str>) -> &'static str {
    let Some(date) = replace_by.and_then(crate::api::input::parse_date) else {
        return "";
    };
    let now = today();
    if date < now {
        "past_replace_by"
    } else if (date - now).whole_days() <= DUE_SOON_DAYS {
        "due_soon"
    } else {
        ""
    }
}

/// One hose as a table line, in `units`.
pub fn hose_line(h: &Hose, units: UnitSystem) -> HoseLine {
    HoseLine {
        id: h.id,
        place: h.place(),
        cylinder_id: h.cylinder_id,
        cylinder: h.cylinder_function.clone().unwrap_or_default(),
        spec: h.spec.clone().unwrap_or_default(),
        size: h.size.clone().unwrap_or_default(),
        working_pressure: q(h.working_pressure_pa, Dimension::Pressure, units),
        made_in: h.made_in.clone().unwrap_or_default(),
        installed_on: h.installed_on.clone().unwrap_or_default(),
        replace_by: h.replace_by.clone().unwrap_or_default(),
        replace_state: replace_state(h.replace_by.as_deref()),
    }
}

/// `GET /machines/{id}`; `?units=us|metric` overrides the site's units.
pub async fn show(
    State(state): State<AppState>,
    ctx: PageCtx,
    Path(id): Path<String>,
    params: Params,
) -> Response {
    let id = match path_id(&id, "machine") {
        Ok(id) => id,
        Err(e) => return page_error(e),
    };
    let loaded = async {
        let machine = store::find(&state.db, id)
            .await?
            .ok_or_else(|| AppError::not_found(format!("machine {id}")))?;
        let cylinders = cylinders::of_machine(&state.db, id).await?;
        let hoses = hoses::of_machine(&state.db, id).await?;
        Ok::<_, AppError>((machine, cylinders, hoses))
    }
    .await;
    let (m, cylinder_rows, hose_rows) = match loaded {
        Ok(loaded) => loaded,
        Err(e) => return page_error(e),
    };
    // reports: what is due, as of today
    let due = match crate::db::reports::due_for_machine(&state.db, id, today()).await {
        Ok(items) => items.iter().map(super::report_views::due_line).collect(),
        Err(e) => return page_error(e.into()),
    };
    let service = match super::service_view::machine_panel(&state.db, id).await {
        Ok(panel) => panel,
        Err(e) => return page_error(e.into()),
    };
    let units = pick_units(params.units().ok().flatten(), m.site_units.as_deref());
    let cylinders = cylinder_rows
        .iter()
        .map(|c| {
            let fitted: Vec<&Hose> = hose_rows
                .iter()
                .filter(|h| h.cylinder_id == Some(c.id))
                .collect();
            CylinderLine {
                id: c.id,
                function: function_text(c),
                size: size_text(c, units),
                load_direction: direction_words(&c.load_direction),
                rated: q(c.rated_pressure_pa, Dimension::Pressure, units),
                hoses: c.hose_count,
                safety: safety::worst_status(c, &fitted),
            }
        })
        .collect();
    let every = |days: Option<i64>, hours: Option<f64>| -> String {
        match (days, hours) {
            (Some(d), Some(h)) => format!("every {d} days or {h} hours, whichever comes first"),
            (Some(d), None) => format!("every {d} days"),
            (None, Some(h)) => format!("every {h} hours"),
            (None, None) => "no interval set".into(),
        }
    };
    MachinePage {
        ctx,
        id: m.id,
        unit_number: m.unit_number.clone(),
        kind: m.kind.clone(),
        description: m.description.clone().unwrap_or_default(),
        serial: m.serial.clone().unwrap_or_default(),
        site: m.site_name.clone().unwrap_or_default(),
        status: m.status.clone(),
        out_of_service_reason: m.out_of_service_reason.clone().unwrap_or_default(),
        out_of_service_since: m.out_of_service_since.clone().unwrap_or_default(),
        relief: q(m.relief_pressure_pa, Dimension::Pressure, units),
        hour_meter: match (m.hour_meter_h, &m.hour_meter_read_on) {
            (Some(h), Some(on)) => format!("{h} h, read on {on}"),
            (Some(h), None) => format!("{h} h"),
            _ => "—".into(),
        },
        periodic: every(m.periodic_interval_days, m.periodic_interval_hours),
        frequent: every(m.frequent_interval_days, None),
        registered_on: m.created_at.get(..10).unwrap_or(&m.created_at).to_string(),
        archived_at: m.archived_at.clone().unwrap_or_default(),
        units: units.as_str(),
        cylinders,
        hoses: hose_rows.iter().map(|h| hose_line(h, units)).collect(),
        due,
        service,
    }
    .into_response()
}

/// Today's date as text (for templates that print when a page was made).
pub fn today_text() -> String {
    date_text(today())
}
