//! Every class of bad input to the calculation API: a 4xx JSON error naming the field,
//! never a 500.

use crate::calc::{drift_body, us_example};
use crate::helpers::{TestApp, assert_field_error};
use axum::http::StatusCode;
use serde_json::{Value, json};

async fn refused(app: &TestApp, path: &str, body: Value, field: &str) {
    let (status, reply) = app.post_json(path, &body).await;
    assert_field_error(status, &reply, StatusCode::UNPROCESSABLE_ENTITY, field);
}

fn with(mut body: Value, key: &str, value: Value) -> Value {
    body[key] = value;
    body
}

#[tokio::test]
async fn every_class_of_bad_quantity_is_a_422_naming_the_field() {
    let app = TestApp::new().await;
    let path = "/api/v1/calc/cylinder";
    let base = us_example();
    refused(&app, path, with(base.clone(), "bore", json!(4)), "bore").await; // bare number
    refused(
        &app,
        path,
        with(base.clone(), "bore", json!("4 furlong")),
        "bore",
    )
    .await; // unknown unit
    refused(
        &app,
        path,
        with(base.clone(), "bore", json!("4 psi")),
        "bore",
    )
    .await; // wrong kind
    refused(
        &app,
        path,
        with(base.clone(), "bore", json!("NaN in")),
        "bore",
    )
    .await;
    refused(
        &app,
        path,
        with(base.clone(), "bore", json!("inf in")),
        "bore",
    )
    .await;
    refused(
        &app,
        path,
        with(base.clone(), "bore", json!("1e999 in")),
        "bore",
    )
    .await;
    refused(
        &app,
        path,
        with(base.clone(), "bore", json!("-4 in")),
        "bore",
    )
    .await; // negative size
    refused(
        &app,
        path,
        with(base.clone(), "bore", json!({"value": "4", "unit": "in"})),
        "bore",
    )
    .await;
    refused(&app, path, with(base.clone(), "rod", json!("4 in")), "rod").await; // rod >= bore
    refused(
        &app,
        path,
        with(base.clone(), "position", json!("30 in")),
        "position",
    )
    .await; // past the stroke
    refused(
        &app,
        path,
        with(base.clone(), "load_direction", json!("sideways")),
        "load_direction",
    )
    .await;
    refused(
        &app,
        path,
        with(base.clone(), "ratings", json!({"cap_line": 3000})),
        "ratings.cap_line",
    )
    .await;
    refused(
        &app,
        path,
        with(base.clone(), "ratings", json!({"cap_line": "3000 gpm"})),
        "ratings.cap_line",
    )
    .await;
    refused(
        &app,
        path,
        with(base.clone(), "ratings", json!({"cap_lien": "3000 psi"})),
        "ratings.cap_lien",
    )
    .await;
    refused(
        &app,
        path,
        with(base.clone(), "pilot_ratio", json!("four")),
        "pilot_ratio",
    )
    .await;
    refused(
        &app,
        path,
        with(base.clone(), "bulk_modulus", json!("0 Pa")),
        "bulk_modulus",
    )
    .await;
    refused(
        &app,
        path,
        with(base.clone(), "units", json!("imperial")),
        "units",
    )
    .await;
    refused(
        &app,
        path,
        with(base.clone(), "colour", json!("red")),
        "colour",
    )
    .await; // unknown field
    let mut missing = base.clone();
    missing.as_object_mut().unwrap().remove("stroke");
    refused(&app, path, missing, "stroke").await;
}

#[tokio::test]
async fn bad_drift_readings_are_422_naming_the_field() {
    let app = TestApp::new().await;
    let path = "/api/v1/calc/drift-test";
    let base = drift_body();
    refused(
        &app,
        path,
        with(base.clone(), "duration", json!("30")),
        "duration",
    )
    .await;
    refused(
        &app,
        path,
        with(base.clone(), "oil_temperature_end", json!("44 psi")),
        "oil_temperature_end",
    )
    .await;
    refused(
        &app,
        path,
        with(base.clone(), "oil_temperature_end", json!("-500 degC")),
        "oil_temperature_end",
    )
    .await;
    refused(
        &app,
        path,
        with(base.clone(), "end_position", json!("2 m")),
        "end_position",
    )
    .await;
    refused(
        &app,
        path,
        with(base.clone(), "drift", json!("2 mm")),
        "drift",
    )
    .await; // both forms given
    refused(
        &app,
        path,
        with(
            base.clone(),
            "limit",
            json!({"distance": "5 mm", "per": "10 furlongs"}),
        ),
        "limit.per",
    )
    .await;
    refused(
        &app,
        path,
        with(base.clone(), "limit", json!({"distance": "5 mm"})),
        "limit.per",
    )
    .await;
    refused(
        &app,
        path,
        with(base.clone(), "cap_pressure_start", json!("NaN bar")),
        "cap_pressure_start",
    )
    .await;
    let mut missing = base.clone();
    missing
        .as_object_mut()
        .unwrap()
        .remove("oil_temperature_start");
    refused(&app, path, missing, "oil_temperature_start").await;
}

#[tokio::test]
async fn unreadable_bodies_are_4xx_json_errors_never_500() {
    let app = TestApp::new().await;
    for path in [
        "/api/v1/calc/cylinder",
        "/api/v1/calc/drift-test",
        "/api/v1/calc/pressure-decay",
    ] {
        let (status, body) = app.post_raw(path, "application/json", "{not json").await;
        assert_eq!(status, StatusCode::BAD_REQUEST, "{path}: {body}");
        assert!(body["error"]["code"].is_string());
        let (status, _) = app.post_raw(path, "application/json", "[1, 2]").await;
        assert_eq!(status, StatusCode::BAD_REQUEST);
        let (status, body) = app.post_raw(path, "text/plain", "bore=4in").await;
        assert!(status.is_client_error(), "{path}: {status} {body}");
        let (status, body) = app.post_json(path, &json!({})).await;
        assert_eq!(status, StatusCode::UNPROCESSABLE_ENTITY, "{path}: {body}");
    }
}
