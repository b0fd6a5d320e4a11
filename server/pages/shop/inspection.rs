//! The inspection form at the machine (periodic or frequent) and the stored inspection. The
//! form posts to the API's reader (`api::inspections::prepare`); a fail takes the machine out
//! of service, a later pass puts it back.

use super::form::summary_lines;
use super::form::{Field, Fields, new_client_token};
use super::{load_machine, redirect_to};
use crate::api::inspections::{OUTCOMES, prepare, store};
use crate::app::AppState;
use crate::auth::Actor;
use crate::calc::quantity::UnitSystem;
use crate::db::inspections::{self, Inspection};
use crate::db::machines::Machine;
use crate::error::AppError;
use crate::pages::ctx::PageCtx;
use crate::pages::forms::{Posted, Values, refused};
use crate::pages::page_error;
use crate::pages::view::FieldErrors;
use askama::Template;
use askama_web::WebTemplate;
use axum::extract::{Path, Query, State};
use axum::http::StatusCode;
use axum::response::{IntoResponse, Response};
use serde::Deserialize;
use serde_json::{Map, Value, json};

/// The items on the form: (item word, outcome input, note input, label).
pub const ITEMS: [(&str, &str, &str, &str); 6] = [
    (
        "hoses",
        "item_hoses",
        "item_hoses_note",
        "Hoses and fittings",
    ),
    (
        "rod",
        "item_rod",
        "item_rod_note",
        "Cylinder rods (scoring, dents, corrosion)",
    ),
    (
        "seals",
        "item_seals",
        "item_seals_note",
        "Rod seals and wipers",
    ),
    (
        "mounts",
        "item_mounts",
        "item_mounts_note",
        "Mounts, pins and rod eyes",
    ),
    (
        "structure",
        "item_structure",
        "item_structure_note",
        "Structure and welds",
    ),
    (
        "external_leakage",
        "item_external_leakage",
        "item_external_leakage_note",
        "External leakage",
    ),
];

fn outcome_label(o: &str) -> &'static str {
    match o {
        "ok" => "OK",
        "attention" => "Needs attention",
        "fail" => "Fail",
        _ => "Not checked",
    }
}

/// One item's inputs.
#[derive(Clone, Debug)]
pub struct ItemInputs {
    pub label: &'static str,
    pub fields: Vec<Field>,
}

#[derive(Template, WebTemplate)]
#[template(path = "shop/inspection_form.html")]
pub struct InspectionFormPage {
    pub ctx: PageCtx,
    pub machine_id: i64,
    pub unit_number: String,
    pub kind: String,
    pub status: String,
    pub hour_meter: String,
    pub client_token: String,
    pub amends: String,
    pub head: Vec<Field>,
    pub items: Vec<ItemInputs>,
    pub outcome: Vec<Field>,
    pub summary: Vec<String>,
}

#[derive(Debug, Default, Deserialize)]
pub struct FormQuery {
    pub amends: Option<String>,
}

fn page(ctx: PageCtx, m: &Machine, values: &Values, errors: &FieldErrors) -> InspectionFormPage {
    let units = UnitSystem::Metric;
    let opts = |pairs: &[(&str, &str)]| -> Vec<(String, String)> {
        pairs
            .iter()
            .map(|(v, l)| (v.to_string(), l.to_string()))
            .collect()
    };
    let mut head = Fields::new(values, errors, units);
    head.radio(
        "kind",
        "Kind of inspection",
        opts(&[("periodic", "Periodic"), ("frequent", "Frequent")]),
    )
    .required = true;
    head.date("performed_on", "Date").required = true;
    head.number("hour_meter", "Hour meter reading (h)").hint =
        "The hours shown on the machine's meter today.".into();
    head.text("inspector", "Inspector (signs the record)")
        .required = true;
    let outcomes: Vec<(String, String)> = OUTCOMES
        .iter()
        .map(|o| (o.to_string(), outcome_label(o).to_string()))
        .collect();
    let items = ITEMS
        .iter()
        .map(|(item, outcome, note, label)| {
            let mut f = Fields::new(values, errors, units);
            f.radio(outcome, "Outcome", outcomes.clone());
            if *item == "external_leakage" {
                f.select(
                    "leakage_class",
                    "Leakage class (ISO/TR 11340, 0 to 5)",
                    opts(&[
                        ("", "not graded"),
                        ("0", "0: no moisture"),
                        ("1", "1"),
                        ("2", "2"),
                        ("3", "3"),
                        ("4", "4"),
                        ("5", "5: a measurable stream"),
                    ]),
                );
            }
            f.text(note, "Note");
            ItemInputs {
                label,
                fields: f.finish(),
            }
        })
        .collect();
    let mut outcome = Fields::new(values, errors, units);
    outcome
        .radio(
            "result",
            "Result",
            opts(&[
                ("pass", "Pass"),
                ("pass_with_deficiencies", "Pass with deficiencies"),
                ("fail", "Fail: take out of service"),
            ]),
        )
        .required = true;
    outcome.textarea("deficiencies", "Deficiencies found");
    outcome.textarea("corrective_action", "Corrective action");
    InspectionFormPage {
        ctx,
        machine_id: m.id,
        unit_number: m.unit_number.clone(),
        kind: m.kind.clone(),
        status: m.status.clone(),
        hour_meter: match (m.hour_meter_h, &m.hour_meter_read_on) {
            (Some(h), Some(on)) => format!("last reading {h} h on {on}"),
            (Some(h), None) => format!("last reading {h} h"),
            _ => "no reading recorded".into(),
        },
        client_token: values.get("client_token").cloned().unwrap_or_default(),
        amends: values.get("amends").cloned().unwrap_or_default(),
        head: head.finish(),
        items,
        outcome: outcome.finish(),
        summary: summary_lines(errors),
    }
}

fn first_values(ctx: &PageCtx, amending: Option<&Inspection>) -> Values {
    let mut v = Values::new();
    v.insert("client_token".into(), new_client_token());
    v.insert(
        "performed_on".into(),
        crate::api::draft::date_text(crate::api::draft::today()),
    );
    for (_, outcome, _, _) in ITEMS {
        v.insert(outcome.into(), "not_checked".into());
    }
    if let Some(user) = &ctx.user {
        v.insert("inspector".into(), user.clone());
    }
    let Some(i) = amending else {
        return v;
    };
    v.insert("amends".into(), i.id.to_string());
    v.insert("kind".into(), i.kind.clone());
    v.insert("performed_on".into(), i.performed_on.clone());
    v.insert("inspector".into(), i.inspector.clone());
    v.insert("result".into(), i.result.clone());
    if let Some(h) = i.hour_meter_h {
        v.insert("hour_meter".into(), h.to_string());
    }
    for (key, text) in [
        ("deficiencies", &i.deficiencies),
        ("corrective_action", &i.corrective_action),
    ] {
        if let Some(t) = text {
            v.insert(key.into(), t.clone());
        }
    }
    let stored: Vec<Value> = serde_json::from_str(&i.items_json).unwrap_or_default();
    for s in stored {
        if let Some((_, outcome, note, _)) = ITEMS.iter().find(|(item, ..)| s["item"] == *item) {
            if let Some(o) = s["outcome"].as_str() {
                v.insert((*outcome).into(), o.into());
            }
            if let Some(n) = s["note"].as_str() {
                v.insert((*note).into(), n.into());
            }
            if let Some(c) = s["leakage_class"].as_i64() {
                v.insert("leakage_class".into(), c.to_string());
            }
        }
    }
    v
}

/// The posted form as the API's JSON body.
pub fn body_of(values: &Values) -> Map<String, Value> {
    let mut map = Map::new();
    let text = |name: &str| values.get(name).map(|t| t.trim()).filter(|t| !t.is_empty());
    for name in [
        "kind",
        "performed_on",
        "inspector",
        "result",
        "deficiencies",
        "corrective_action",
        "client_token",
    ] {
        if let Some(t) = text(name) {
            map.insert(name.into(), Value::String(t.into()));
        }
    }
    if let Some(t) = text("hour_meter") {
        let v = t.parse::<f64>().ok().and_then(serde_json::Number::from_f64);
        map.insert(
            "hour_meter".into(),
            v.map_or(Value::String(t.into()), Value::Number),
        );
    }
    if let Some(t) = text("amends") {
        map.insert(
            "amends".into(),
            t.parse::<i64>()
                .map_or(Value::String(t.into()), Value::from),
        );
    }
    let items: Vec<Value> = ITEMS
        .iter()
        .map(|(item, outcome, note, _)| {
            let class = (*item == "external_leakage")
                .then(|| text("leakage_class").and_then(|c| c.parse::<i64>().ok()))
                .flatten();
            json!({
                "item": item,
                "outcome": text(outcome).unwrap_or("not_checked"),
                "leakage_class": class,
                "note": text(note),
            })
        })
        .collect();
    map.insert("items".into(), Value::Array(items));
    map
}

/// Names the form's inputs in errors about `items[i]...`.
fn form_field(error: AppError) -> AppError {
    match error {
        AppError::Invalid {
            status,
            code,
            field: Some(field),
            message,
        } if field.starts_with("items[") => {
            let index: Option<usize> = field
                .strip_prefix("items[")
                .and_then(|rest| rest.split(']').next())
                .and_then(|n| n.parse().ok());
            let mapped = index
                .and_then(|i| ITEMS.get(i))
                .map(|(_, outcome, note, _)| {
                    if field.ends_with(".note") {
                        note.to_string()
                    } else if field.ends_with(".leakage_class") {
                        "leakage_class".to_string()
                    } else {
                        outcome.to_string()
                    }
                });
            AppError::Invalid {
                status,
                code,
                field: Some(mapped.unwrap_or(field)),
                message,
            }
        }
        other => other,
    }
}

/// `GET /shop/machines/{id}/inspection`.
pub async fn show_form(
    State(state): State<AppState>,
    ctx: PageCtx,
    Path(id): Path<String>,
    Query(query): Query<FormQuery>,
) -> Response {
    let m = match load_machine(&state, &id).await {
        Ok(m) => m,
        Err(page) => return page,
    };
    let amending = match query.amends.as_deref().and_then(|a| a.parse::<i64>().ok()) {
        Some(a) => match inspections::find(&state.db, a).await {
            Ok(Some(i)) if i.machine_id == m.id => Some(i),
            Ok(_) => {
                return page_error(AppError::not_found(format!(
                    "inspection {a} of this machine"
                )));
            }
            Err(e) => return page_error(e.into()),
        },
        None => None,
    };
    let values = first_values(&ctx, amending.as_ref());
    page(ctx, &m, &values, &FieldErrors::default()).into_response()
}

/// `POST /shop/machines/{id}/inspection`.
pub async fn submit(
    State(state): State<AppState>,
    ctx: PageCtx,
    actor: Actor,
    Path(id): Path<String>,
    posted: Posted,
) -> Response {
    let m = match load_machine(&state, &id).await {
        Ok(m) => m,
        Err(page) => return page,
    };
    let values = posted.values();
    let body = body_of(&values);
    let outcome = match prepare(&m, &body, ctx.user.as_deref()) {
        Ok(new) => store(&state.db, &actor, &new).await.map_err(|e| vec![e]),
        Err(problems) => Err(problems),
    };
    match outcome {
        Ok(stored) => redirect_to(
            &format!("/shop/inspections/{}", stored.record().id),
            !stored.is_new(),
        ),
        Err(problems) => {
            let errors = match refused(problems.into_iter().map(form_field).collect()) {
                Ok(errors) => errors,
                Err(page) => return *page,
            };
            (
                StatusCode::UNPROCESSABLE_ENTITY,
                page(ctx, &m, &values, &errors),
            )
                .into_response()
        }
    }
}
