//! Building small fleets through the API for the report tests.

use crate::helpers::TestApp;
use axum::http::StatusCode;
use serde_json::{Value, json};

/// Creates a site; returns its id.
pub async fn site(app: &TestApp, name: &str) -> i64 {
    let (status, body) = app
        .post_json("/api/v1/sites", &json!({"name": name, "units": "metric"}))
        .await;
    assert_eq!(status, StatusCode::CREATED, "site: {body}");
    body["id"].as_i64().expect("site id")
}

/// Registers a machine from `fields` (unit_number and kind at least); returns its id.
pub async fn machine(app: &TestApp, fields: Value) -> i64 {
    let (status, body) = app.post_json("/api/v1/machines", &fields).await;
    assert_eq!(status, StatusCode::CREATED, "machine: {body}");
    body["id"].as_i64().expect("machine id")
}

/// The machine's registration date, `YYYY-MM-DD`.
pub async fn registered_on(app: &TestApp, id: i64) -> String {
    let (status, body) = app.get_json(&format!("/api/v1/machines/{id}")).await;
    assert_eq!(status, StatusCode::OK, "{body}");
    body["created_at"].as_str().expect("created_at")[..10].to_string()
}

/// Records an inspection; returns its id.
pub async fn inspect(
    app: &TestApp,
    machine: i64,
    kind: &str,
    on: &str,
    hours: Option<f64>,
    result: &str,
) -> i64 {
    let mut body = json!({
        "kind": kind, "performed_on": on, "inspector": "R. Okafor", "result": result,
    });
    if let Some(h) = hours {
        body["hour_meter"] = json!(h);
    }
    if result == "fail" {
        body["deficiencies"] = json!("boom cylinder rod scored");
    }
    let (status, reply) = app
        .post_json(&format!("/api/v1/machines/{machine}/inspections"), &body)
        .await;
    assert_eq!(status, StatusCode::CREATED, "inspection: {reply}");
    reply["id"].as_i64().expect("inspection id")
}

/// Registers a cylinder on `machine` from extra `fields`; returns its id.
pub async fn cylinder(app: &TestApp, machine: i64, fields: Value) -> i64 {
    let mut body = json!({
        "machine_id": machine, "bore": "100 mm", "rod": "56 mm", "stroke": "600 mm",
        "load_direction": "retract", "max_load": "40 kN", "function": "boom lift",
    });
    for (k, v) in fields.as_object().expect("object") {
        body[k] = v.clone();
    }
    let (status, reply) = app.post_json("/api/v1/cylinders", &body).await;
    assert_eq!(status, StatusCode::CREATED, "cylinder: {reply}");
    reply["id"].as_i64().expect("cylinder id")
}

/// Registers a hose assembly on `machine` from `fields`; returns its id.
pub async fn hose(app: &TestApp, machine: i64, fields: Value) -> i64 {
    let mut body = json!({"machine_id": machine, "spec": "EN 853 2SN", "size": "-8"});
    for (k, v) in fields.as_object().expect("object") {
        body[k] = v.clone();
    }
    if body.get("cylinder_id").is_none() && body.get("circuit").is_none() {
        body["circuit"] = json!("pilot supply");
    }
    let (status, reply) = app.post_json("/api/v1/hoses", &body).await;
    assert_eq!(status, StatusCode::CREATED, "hose: {reply}");
    reply["id"].as_i64().expect("hose id")
}

/// Records a drift test of `drift_mm` over 10 minutes at steady oil temperature, against a
/// limit of `limit_mm` per 10 minutes.
pub async fn drift_test(app: &TestApp, cylinder: i64, at: &str, drift_mm: f64, limit_mm: f64) {
    let body = json!({
        "tested_at": at, "technician": "J. Marsh", "duration": "10 min",
        "drift": format!("{drift_mm} mm"),
        "oil_temperature_start": "45 degC", "oil_temperature_end": "45 degC",
        "limit": {"distance": format!("{limit_mm} mm"), "per": "10 min"},
    });
    let (status, reply) = app
        .post_json(&format!("/api/v1/cylinders/{cylinder}/drift-tests"), &body)
        .await;
    assert_eq!(status, StatusCode::CREATED, "drift test: {reply}");
}

/// Records a pressure-decay test at `at`: 1 bar lost in 10 minutes at steady oil temperature,
/// against 15 bar per 10 minutes.
pub async fn decay_test(app: &TestApp, cylinder: i64, at: &str) {
    let body = json!({
        "pressurised_end": "cap", "duration": "10 min",
        "pressure_start": "200 bar", "pressure_end": "199 bar",
        "oil_temperature_start": "41 degC", "oil_temperature_end": "41 degC",
        "limit": {"pressure": "15 bar", "per": "10 min"},
        "technician": "R. Okafor", "tested_at": at,
    });
    let (status, reply) = app
        .post_json(&format!("/api/v1/cylinders/{cylinder}/decay-tests"), &body)
        .await;
    assert_eq!(status, StatusCode::CREATED, "decay test: {reply}");
}

/// Sets the shop's hose age limit; returns the settings as answered.
pub async fn set_hose_age_limit(app: &TestApp, years: i64) -> Value {
    let (status, set) = app
        .json(
            "PUT",
            "/api/v1/reports/settings",
            Some(&json!({"hose_age_limit_years": years})),
        )
        .await;
    assert_eq!(status, StatusCode::OK, "{set}");
    set
}

/// Archives a machine (it leaves every report).
pub async fn archive(app: &TestApp, machine: i64) {
    let (status, reply) = app
        .post_json(&format!("/api/v1/machines/{machine}/archive"), &json!({}))
        .await;
    assert_eq!(status, StatusCode::OK, "archive: {reply}");
}

/// The `items` of a report, asserting a 200.
pub async fn items(app: &TestApp, path: &str) -> Vec<Value> {
    let (status, body) = app.get_json(path).await;
    assert_eq!(status, StatusCode::OK, "{path}: {body}");
    body["items"].as_array().expect("items").clone()
}

/// `(unit_number, kind)` of each due item, in order.
pub fn unit_kinds(items: &[Value]) -> Vec<(String, String)> {
    items
        .iter()
        .map(|i| {
            (
                i["unit_number"].as_str().unwrap_or("").to_string(),
                i["kind"].as_str().unwrap_or("").to_string(),
            )
        })
        .collect()
}

pub fn pair(unit: &str, kind: &str) -> (String, String) {
    (unit.to_string(), kind.to_string())
}

/// GETs a CSV report: checks the content type and parses it with the `csv` crate into the
/// header and the records.
pub async fn csv_rows(app: &TestApp, path: &str) -> (Vec<String>, Vec<Vec<String>>) {
    let (status, headers, body) = app.get_page(path).await;
    assert_eq!(status, StatusCode::OK, "{path}: {body}");
    let content_type = headers
        .get("content-type")
        .and_then(|v| v.to_str().ok())
        .unwrap_or("");
    assert!(
        content_type.starts_with("text/csv"),
        "content type {content_type}"
    );
    assert!(body.contains("\r\n"), "RFC 4180 lines end in CRLF");
    let mut reader = csv::ReaderBuilder::new()
        .has_headers(true)
        .from_reader(body.as_bytes());
    let header = reader
        .headers()
        .expect("header row")
        .iter()
        .map(str::to_string)
        .collect();
    let rows = reader
        .records()
        .map(|r| r.expect("record").iter().map(str::to_string).collect())
        .collect();
    (header, rows)
}

/// The cell of column `name` in `row`.
pub fn col<'a>(header: &[String], row: &'a [String], name: &str) -> &'a str {
    let i = header
        .iter()
        .position(|h| h == name)
        .unwrap_or_else(|| panic!("no column {name} in {header:?}"));
    &row[i]
}
