//! `/admin/audit`: the audit log for admins: who changed what and when, with each field's value
//! before and after.

use super::super::ctx::PageCtx;
use crate::app::AppState;
use crate::auth::audit_list::{self, Filter};
use crate::db::audit::Entry;
use askama::Template;
use askama_web::WebTemplate;
use axum::Router;
use axum::extract::{Query, State};
use axum::response::{IntoResponse, Response};
use axum::routing::get;
use serde::Deserialize;
use serde_json::{Map, Value};

pub fn router() -> Router<AppState> {
    Router::new().route("/admin/audit", get(show))
}

/// One field of a record in one change.
pub struct FieldChange {
    pub field: String,
    pub before: String,
    pub after: String,
}

/// One audit row as shown.
pub struct EntryView {
    pub id: i64,
    pub at: String,
    pub actor: String,
    pub action: String,
    pub entity: String,
    pub entity_id: i64,
    /// Fields whose value differs between before and after (all fields for a create).
    pub changes: Vec<FieldChange>,
    /// Fields that stayed the same.
    pub unchanged: Vec<FieldChange>,
}

#[derive(Template, WebTemplate)]
#[template(path = "admin/audit.html")]
pub struct AuditPage {
    pub ctx: PageCtx,
    pub entries: Vec<EntryView>,
    pub entities: Vec<String>,
    /// The filter as typed, echoed into the form.
    pub entity: String,
    pub entity_id: String,
    pub actor: String,
    /// Query string of the next (older) page, empty when this is the last.
    pub next_query: String,
}

#[derive(Deserialize, Default)]
struct AuditQuery {
    #[serde(default)]
    entity: String,
    #[serde(default)]
    entity_id: String,
    #[serde(default)]
    actor: String,
    #[serde(default)]
    before: String,
}

/// A JSON value as a person reads it: text without quotes, `—` for null or absent.
fn shown(value: Option<&Value>) -> String {
    match value {
        None | Some(Value::Null) => "—".to_string(),
        Some(Value::String(text)) => text.clone(),
        Some(other) => other.to_string(),
    }
}

fn object(json: &Option<String>) -> Option<Map<String, Value>> {
    let parsed: Value = serde_json::from_str(json.as_deref()?).ok()?;
    match parsed {
        Value::Object(map) => Some(map),
        other => Some(Map::from_iter([("value".to_string(), other)])),
    }
}

/// Splits a row's before and after into changed and unchanged fields.
pub fn view(entry: Entry) -> EntryView {
    let before = object(&entry.before_json);
    let after = object(&entry.after_json);
    let mut fields: Vec<String> = Vec::new();
    for map in [&after, &before].into_iter().flatten() {
        for key in map.keys() {
            if !fields.contains(key) {
                fields.push(key.clone());
            }
        }
    }
    let (mut changes, mut unchanged) = (Vec::new(), Vec::new());
    for field in fields {
        let b = before.as_ref().and_then(|m| m.get(&field));
        let a = after.as_ref().and_then(|m| m.get(&field));
        let changed = b != a;
        let row = FieldChange {
            before: if before.is_some() {
                shown(b)
            } else {
                String::new()
            },
            after: if after.is_some() {
                shown(a)
            } else {
                String::new()
            },
            field,
        };
        if changed {
            changes.push(row)
        } else {
            unchanged.push(row)
        }
    }
    EntryView {
        id: entry.id,
        at: entry.at,
        actor: entry.actor,
        action: entry.action,
        entity: entry.entity,
        entity_id: entry.entity_id,
        changes,
        unchanged,
    }
}

async fn show(
    State(state): State<AppState>,
    ctx: PageCtx,
    Query(query): Query<AuditQuery>,
) -> Response {
    let filter = Filter {
        entity: query.entity.clone(),
        entity_id: query.entity_id.trim().parse().ok(),
        actor: query.actor.clone(),
        before_id: query.before.trim().parse().ok(),
    };
    let listed = audit_list::list(&state.db, &filter).await;
    let entities = audit_list::entities(&state.db).await;
    let ((rows, next), entities) = match (listed, entities) {
        (Ok(listed), Ok(entities)) => (listed, entities),
        (Err(error), _) | (_, Err(error)) => {
            return super::super::page_error(crate::error::AppError::internal(error));
        }
    };
    let enc = crate::auth::middleware::urlencode;
    let next_query = next
        .map(|id| {
            format!(
                "entity={}&entity_id={}&actor={}&before={id}",
                enc(&query.entity),
                enc(&query.entity_id),
                enc(&query.actor)
            )
        })
        .unwrap_or_default();
    AuditPage {
        ctx,
        entries: rows.into_iter().map(view).collect(),
        entities,
        entity: query.entity,
        entity_id: query.entity_id,
        actor: query.actor,
        next_query,
    }
    .into_response()
}
