#![allow(dead_code)]
//! Small invented registry records for the registry tests (test data, not reference values).

use crate::helpers::TestApp;
use axum::http::StatusCode;
use serde_json::{Value, json};

/// Creates a site; returns its id.
pub async fn site(app: &TestApp, name: &str, units: &str) -> i64 {
    let (status, body) = app
        .post_json("/api/v1/sites", &json!({"name": name, "units": units}))
        .await;
    assert_eq!(status, StatusCode::CREATED, "site: {body}");
    body["id"].as_i64().expect("site id")
}

/// Creates a machine from `body`; returns the answer.
pub async fn machine_with(app: &TestApp, body: Value) -> Value {
    let (status, answer) = app.post_json("/api/v1/machines", &body).await;
    assert_eq!(status, StatusCode::CREATED, "machine: {answer}");
    answer
}

/// Creates a telehandler with only the required fields; returns its id.
pub async fn machine(app: &TestApp, unit_number: &str) -> i64 {
    machine_with(
        app,
        json!({"unit_number": unit_number, "kind": "telehandler"}),
    )
    .await["id"]
        .as_i64()
        .expect("machine id")
}

/// Creates a 4 in x 2 in x 24 in cylinder holding a load that pushes its rod in.
pub async fn cylinder(app: &TestApp, machine_id: i64) -> i64 {
    let (status, body) = app
        .post_json(
            "/api/v1/cylinders",
            &json!({
                "machine_id": machine_id,
                "function": "boom lift",
                "bore": "4 in",
                "rod": "2 in",
                "stroke": "24 in",
                "load_direction": "retract",
            }),
        )
        .await;
    assert_eq!(status, StatusCode::CREATED, "cylinder: {body}");
    body["id"].as_i64().expect("cylinder id")
}

/// Creates a hose on a cylinder port; returns its id.
pub async fn hose(app: &TestApp, cylinder_id: i64, port: &str, rating: &str) -> i64 {
    let (status, body) = app
        .post_json(
            "/api/v1/hoses",
            &json!({
                "cylinder_id": cylinder_id,
                "port": port,
                "spec": "SAE 100R2AT",
                "size": "-8",
                "working_pressure": rating,
            }),
        )
        .await;
    assert_eq!(status, StatusCode::CREATED, "hose: {body}");
    body["id"].as_i64().expect("hose id")
}

/// The audit rows of one record: (action, before, after), oldest first.
pub async fn audit(app: &TestApp, entity: &str, id: i64) -> Vec<(String, Value, Value)> {
    let rows: Vec<(String, Option<String>, Option<String>)> = sqlx::query_as(
        "SELECT action, before_json, after_json FROM audit_log
         WHERE entity = ? AND entity_id = ? ORDER BY id",
    )
    .bind(entity)
    .bind(id)
    .fetch_all(&app.db)
    .await
    .expect("audit rows");
    let parse =
        |t: Option<String>| t.map_or(Value::Null, |t| serde_json::from_str(&t).expect("json"));
    rows.into_iter()
        .map(|(action, before, after)| (action, parse(before), parse(after)))
        .collect()
}

/// The ids of a list answer's items.
pub fn ids(body: &Value) -> Vec<i64> {
    body["items"]
        .as_array()
        .expect("items")
        .iter()
        .map(|item| item["id"].as_i64().expect("id"))
        .collect()
}

/// Walks every page of a list with `limit`, returning all ids in order and the page count.
pub async fn walk(app: &TestApp, path: &str, limit: u32) -> (Vec<i64>, usize) {
    let mut all = Vec::new();
    let mut pages = 0;
    let mut cursor: Option<String> = None;
    let sep = if path.contains('?') { '&' } else { '?' };
    loop {
        let url = match &cursor {
            None => format!("{path}{sep}limit={limit}"),
            Some(c) => format!("{path}{sep}limit={limit}&cursor={c}"),
        };
        let (status, body) = app.get_json(&url).await;
        assert_eq!(status, StatusCode::OK, "{url}: {body}");
        pages += 1;
        all.extend(ids(&body));
        match body["next_cursor"].as_str() {
            Some(next) => cursor = Some(next.to_string()),
            None => {
                assert!(body["next_cursor"].is_null(), "{body}");
                break;
            }
        }
        assert!(pages < 100, "pagination does not end");
    }
    (all, pages)
}
