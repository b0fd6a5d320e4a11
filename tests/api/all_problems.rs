//! Issue 14: every problem of a request at once. The error JSON keeps `error` (the first
//! problem) and adds `errors: [{code, message, field}]`; the `/calc` page marks every bad field.

use crate::calc::{drift_body, us_example};
use crate::helpers::TestApp;
use crate::registry_fixtures::machine;
use axum::http::StatusCode;
use serde_json::{Value, json};

fn fields(reply: &Value) -> Vec<String> {
    reply["errors"]
        .as_array()
        .unwrap_or_else(|| panic!("no errors list: {reply}"))
        .iter()
        .map(|e| e["field"].as_str().unwrap_or("").to_string())
        .collect()
}

#[tokio::test]
async fn the_calculation_api_names_every_bad_field_and_keeps_the_first_as_error() {
    let app = TestApp::new().await;
    let mut body = us_example();
    body["bore"] = json!("4 furlong");
    body["stroke"] = json!(24);
    body["supply_pressure"] = json!("2,450 psi");
    body.as_object_mut().unwrap().remove("load");
    let (status, reply) = app.post_json("/api/v1/calc/cylinder", &body).await;
    assert_eq!(status, StatusCode::UNPROCESSABLE_ENTITY, "{reply}");
    let named = fields(&reply);
    for field in ["bore", "stroke", "load", "supply_pressure"] {
        assert!(named.contains(&field.to_string()), "{field} in {named:?}");
    }
    assert_eq!(named.len(), 4, "{reply}");
    // `error` stays exactly as before: the first problem, with code, message and field.
    assert_eq!(reply["error"], reply["errors"][0], "{reply}");
    assert_eq!(reply["error"]["field"], "bore");
    // The ambiguous comma names both readings.
    let pressure = reply["errors"]
        .as_array()
        .unwrap()
        .iter()
        .find(|e| e["field"] == "supply_pressure")
        .unwrap();
    let message = pressure["message"].as_str().unwrap();
    assert!(
        message.contains("2450") && message.contains("2.45"),
        "{message}"
    );
}

#[tokio::test]
async fn the_drift_test_api_names_every_bad_reading() {
    let app = TestApp::new().await;
    let mut body = drift_body();
    body["duration"] = json!("thirty min");
    body["oil_temperature_end"] = json!("44");
    let (status, reply) = app.post_json("/api/v1/calc/drift-test", &body).await;
    assert_eq!(status, StatusCode::UNPROCESSABLE_ENTITY, "{reply}");
    assert_eq!(fields(&reply), ["duration", "oil_temperature_end"]);
}

#[tokio::test]
async fn a_good_request_with_forgiving_spellings_is_answered() {
    let app = TestApp::new().await;
    let mut body = us_example();
    body["load"] = json!("10 000 lbs");
    body["stroke"] = json!("24 inches");
    body["flow"] = json!("15 GPM");
    let (status, reply) = app.post_json("/api/v1/calc/cylinder", &body).await;
    assert_eq!(status, StatusCode::OK, "{reply}");
}

#[tokio::test]
async fn a_single_problem_is_a_list_of_one() {
    let app = TestApp::new().await;
    let mut body = us_example();
    body["bore"] = json!("4 psi");
    let (status, reply) = app.post_json("/api/v1/calc/cylinder", &body).await;
    assert_eq!(status, StatusCode::UNPROCESSABLE_ENTITY);
    assert_eq!(fields(&reply), ["bore"]);
    assert_eq!(reply["error"], reply["errors"][0]);
    // A 404 carries the list too.
    let (status, reply) = app.get_json("/api/v1/machines/999999").await;
    assert_eq!(status, StatusCode::NOT_FOUND);
    assert_eq!(reply["errors"][0]["code"], "not_found", "{reply}");
}

#[tokio::test]
async fn the_registry_api_names_every_bad_field() {
    let app = TestApp::new().await;
    machine(&app, "HV-01").await;
    let body = json!({"kind": "excavator", "relief_pressure": "250 mm", "site_id": "north"});
    let (status, reply) = app.post_json("/api/v1/machines", &body).await;
    assert_eq!(status, StatusCode::UNPROCESSABLE_ENTITY, "{reply}");
    let named = fields(&reply);
    for field in ["unit_number", "relief_pressure", "site_id"] {
        assert!(named.contains(&field.to_string()), "{field} in {named:?}");
    }
    assert_eq!(reply["error"], reply["errors"][0]);
}

#[tokio::test]
async fn the_calculator_page_marks_every_bad_field_and_lists_each() {
    let app = TestApp::new().await;
    let (status, _, page) = app
        .get_page("/calc?bore=4&rod=2+in&stroke=ten+in&load=1000+lbf&load_direction=retract")
        .await;
    assert_eq!(status, StatusCode::UNPROCESSABLE_ENTITY);
    assert!(page.contains("id=\"err-bore\""), "error beside the bore");
    assert!(
        page.contains("id=\"err-stroke\""),
        "error beside the stroke"
    );
    assert!(
        page.contains("href=\"#c-bore\""),
        "summary links to the bore"
    );
    assert!(
        page.contains("href=\"#c-stroke\""),
        "summary links to the stroke"
    );
    assert!(
        page.contains("2 fields need a change"),
        "summary counts both"
    );
}
