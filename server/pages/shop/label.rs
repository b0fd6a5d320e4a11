//! Printable labels for a machine and a cylinder: unit number, function, bore/rod/stroke and
//! a QR code of the record page's absolute address, so a tablet's camera opens the record.

use super::qr::{self, QrSvg};
use super::{load_cylinder, load_machine};
use crate::api::paging::pick_units;
use crate::app::AppState;
use crate::calc::quantity::{Dimension, UnitSystem};
use crate::pages::ctx::PageCtx;
use crate::pages::machine_page::direction_words;
use crate::pages::machine_page::function_text;
use crate::pages::view::q;
use askama::Template;
use askama_web::WebTemplate;
use axum::extract::{Path, State};
use axum::response::{IntoResponse, Response};

#[derive(Template, WebTemplate)]
#[template(path = "shop/label.html")]
pub struct LabelPage {
    pub ctx: PageCtx,
    pub unit_number: String,
    /// The cylinder's function, or the machine's kind and description.
    pub heading: String,
    pub lines: Vec<String>,
    pub address: String,
    pub qr: Option<QrSvg>,
    /// False when no public address is configured (then no QR code, and a note says why).
    pub configured: bool,
    pub back: String,
}

/// The absolute address of a record page (`path` starts with `/`) at the configured public
/// address, or `None` when none is configured: the request's `Host` header is never used (a
/// label printed from `localhost` or a spoofed host would send every scan elsewhere).
pub fn record_address(public_url: Option<&str>, path: &str) -> Option<String> {
    public_url.map(|base| format!("{base}{path}"))
}

/// The label's address line and QR code for a record page.
fn address_and_code(state: &AppState, path: &str) -> (String, Option<QrSvg>) {
    match record_address(state.public_url.as_deref(), path) {
        Some(address) => {
            let code = qr::encode(&address);
            (address, code)
        }
        None => (path.to_string(), None),
    }
}

fn sizes(bore: f64, rod: f64, stroke: f64, units: UnitSystem) -> Vec<String> {
    let l = |si: f64| q(Some(si), Dimension::Length, units);
    vec![format!(
        "Bore {} · rod {} · stroke {}",
        l(bore),
        l(rod),
        l(stroke)
    )]
}

/// `GET /machines/{id}/label`.
pub async fn machine(
    State(state): State<AppState>,
    ctx: PageCtx,
    Path(id): Path<String>,
) -> Response {
    let m = match load_machine(&state, &id).await {
        Ok(m) => m,
        Err(page) => return page,
    };
    let (address, code) = address_and_code(&state, &format!("/machines/{}", m.id));
    let mut lines = Vec::new();
    if let Some(d) = &m.description {
        lines.push(d.clone());
    }
    if let Some(s) = &m.serial {
        lines.push(format!("Serial {s}"));
    }
    if let Some(site) = &m.site_name {
        lines.push(site.clone());
    }
    LabelPage {
        ctx,
        unit_number: m.unit_number.clone(),
        heading: m.kind.clone(),
        lines,
        qr: code,
        configured: state.public_url.is_some(),
        address,
        back: format!("/machines/{}", m.id),
    }
    .into_response()
}

/// `GET /cylinders/{id}/label`.
pub async fn cylinder(
    State(state): State<AppState>,
    ctx: PageCtx,
    Path(id): Path<String>,
) -> Response {
    let (c, _) = match load_cylinder(&state, &id).await {
        Ok(pair) => pair,
        Err(page) => return page,
    };
    let units = pick_units(None, c.site_units.as_deref());
    let (address, code) = address_and_code(&state, &format!("/cylinders/{}", c.id));
    let mut lines = sizes(c.bore_m, c.rod_m, c.stroke_m, units);
    lines.push(format!("Load {}", direction_words(&c.load_direction)));
    if let Some(s) = &c.serial {
        lines.push(format!("Serial {s}"));
    }
    LabelPage {
        ctx,
        unit_number: c.unit_number.clone(),
        heading: function_text(&c),
        lines,
        qr: code,
        configured: state.public_url.is_some(),
        address,
        back: format!("/cylinders/{}", c.id),
    }
    .into_response()
}
