//! The calculation API (`/api/v1/calc/*`) and the `/calc` page, in-process.
//! Figures are checked against REFERENCES.md (sources named beside each check); the rest of
//! the figures are held against their references in the `calc` suite.

use crate::helpers::{TestApp, assert_field_error};
use axum::http::StatusCode;
use serde_json::{Value, json};

const PSI: f64 = 6_894.757_293_168;

fn close(actual: &Value, expected_si: f64, what: &str) {
    let si = actual["si"]
        .as_f64()
        .unwrap_or_else(|| panic!("{what}: no si in {actual}"));
    assert!(
        ((si - expected_si) / expected_si).abs() <= 0.005,
        "{what}: {si} vs {expected_si}"
    );
}

/// REFERENCES.md "Trade facts" (common practice): 10,000 lbf on a 10 in² piston with a 2 in²
/// rod: 1,000 psi held, 5,000 psi on a bypass, above a 3,000 psi line. Bore and rod here are
/// the diameters of those areas: sqrt(40/pi) = 3.5682 in and sqrt(8/pi) = 1.5958 in [C].
fn us_example() -> Value {
    json!({
        "bore": "3.568248 in",
        "rod": "1.595769 in",
        "stroke": {"value": 24, "unit": "in"},
        "load": "10000 lbf",
        "load_direction": "retract",
        "supply_pressure": "3000 psi",
        "flow": "15 gpm",
        "ratings": {"cap_line": "3000 psi", "rod_line": "3000 psi", "cylinder": "3000 psi"},
        "units": "us"
    })
}

#[tokio::test]
async fn cylinder_endpoint_answers_the_contract_in_us_units() {
    let app = TestApp::new().await;
    let (status, body) = app.post_json("/api/v1/calc/cylinder", &us_example()).await;
    assert_eq!(status, StatusCode::OK, "{body}");
    assert_eq!(body["areas"]["cap"]["unit"], "in2");
    assert!((body["areas"]["cap"]["value"].as_f64().unwrap() - 10.0).abs() < 0.05);
    assert!(
        (body["areas"]["ratio"].as_f64().unwrap() - 1.25).abs() < 0.01,
        "10 / 8 in²"
    );
    close(
        &body["holding"]["cap_pressure"],
        1000.0 * PSI,
        "holding pressure",
    );
    assert_eq!(body["holding"]["cap_pressure"]["unit"], "psi");
    assert_eq!(body["seal_bypass"]["outcome"], "intensifies");
    close(
        &body["seal_bypass"]["final_pressure"],
        5000.0 * PSI,
        "bypass pressure",
    );
    assert!(
        (body["seal_bypass"]["intensification_factor"]
            .as_f64()
            .unwrap()
            - 5.0)
            .abs()
            < 0.025
    );
    assert!(body["seal_bypass"]["settle_drift"]["si"].as_f64().unwrap() > 0.0);
    // REFERENCES.md "Flow and circuits": p_rod = p A_cap / A_annulus minus the pushing load
    // over A_annulus: (3000 x 10 - 10000) / 8 = 2500 psi [C].
    close(
        &body["rod_side_intensification"]["rod_pressure"],
        2500.0 * PSI,
        "rod-side pressure",
    );
    for key in [
        "extend",
        "retract",
        "regenerative_extend",
        "retract_return_flow",
    ] {
        assert!(
            body["speeds"][key]["si"].is_number(),
            "speeds.{key}: {body}"
        );
    }
    // Speed rule of thumb (common practice): 3.85 x 15 gpm / 10 in² = 5.775 in/s.
    assert!((body["speeds"]["extend"]["value"].as_f64().unwrap() - 5.775).abs() < 0.03);
    let checks = body["checks"].as_array().unwrap();
    let bypass_cap = checks
        .iter()
        .find(|c| c["component"] == "cap_line" && c["scenario"] == "seal_bypass")
        .expect("cap line against seal bypass");
    assert_eq!(bypass_cap["status"], "exceeds");
    for c in checks {
        for key in ["component", "scenario", "pressure", "rating", "status"] {
            assert!(!c[key].is_null(), "{key} in {c}");
        }
    }
    let cautions = body["cautions"].as_array().unwrap();
    assert!(
        cautions
            .iter()
            .any(|c| c.as_str().unwrap().contains("injection injury"))
    );
    assert!(
        body["hazards"]
            .as_array()
            .unwrap()
            .iter()
            .any(|h| h.as_str().unwrap().contains("5000 psi"))
    );
}

#[tokio::test]
async fn cylinder_endpoint_in_metric_with_a_pulling_load_runs_away() {
    let app = TestApp::new().await;
    let body = json!({
        "bore": "100 mm", "rod": "70 mm", "stroke": "1 m", "load": "0 kN",
        "load_direction": "extend", "supply_pressure": "200 bar"
    });
    let (status, body) = app.post_json("/api/v1/calc/cylinder", &body).await;
    assert_eq!(status, StatusCode::OK, "{body}");
    // REFERENCES.md "Flow and circuits" [C]: 100/70 mm at 200 bar gives 392 bar.
    close(
        &body["rod_side_intensification"]["rod_pressure"],
        392e5,
        "rod-side pressure",
    );
    assert_eq!(
        body["rod_side_intensification"]["rod_pressure"]["unit"],
        "bar"
    );
    // REFERENCES.md "Trade facts" (common practice): no final pressure, the cylinder runs out.
    assert_eq!(body["seal_bypass"]["outcome"], "runs_away");
    assert!(body["seal_bypass"]["final_pressure"].is_null());
    assert!(body["speeds"].is_null(), "no flow given");
}

fn drift_body() -> Value {
    json!({
        "bore": "100 mm", "rod": "70 mm", "stroke": "1000 mm", "load": "100 kN",
        "load_direction": "retract", "start_position": "500 mm", "end_position": "497.8 mm",
        "duration": "30 min", "oil_temperature_start": "50 degC", "oil_temperature_end": "44 degC",
        "limit": {"distance": "5 mm", "per": "10 min"}
    })
}

#[tokio::test]
async fn drift_test_endpoint_answers_the_contract() {
    let app = TestApp::new().await;
    let (status, body) = app
        .post_json("/api/v1/calc/drift-test", &drift_body())
        .await;
    assert_eq!(status, StatusCode::OK, "{body}");
    for key in [
        "drift_rate",
        "thermal_drift",
        "leak_drift",
        "leak_flow",
        "scaled_drift",
    ] {
        assert!(
            body[key]["si"].is_number() && body[key]["unit"].is_string(),
            "{key}: {body}"
        );
    }
    // Common practice: x = alpha (V/A) dT = 7e-4 x 0.5 m x 6 K = 2.1 mm of the 2.2 mm.
    let thermal = body["thermal_drift"]["si"].as_f64().unwrap();
    assert!((thermal - 2.1e-3).abs() < 0.03 * 2.1e-3, "{thermal}");
    assert_eq!(body["diagnosis"], "thermal_contraction");
    assert_eq!(
        body["verdict"], "pass",
        "2.2 mm in 30 min is 0.73 mm per 10 min"
    );
    assert!(
        body["reasoning"]
            .as_array()
            .unwrap()
            .iter()
            .any(|s| s.as_str().unwrap().contains("Oil cooled 6 degC"))
    );
    assert!(body["cautions"].as_array().is_some_and(|c| !c.is_empty()));
    assert!(body["hazards"].is_array());
}

#[tokio::test]
async fn drift_test_with_a_climbing_rod_end_is_a_bypass_with_the_pressure_named() {
    let app = TestApp::new().await;
    let mut body = drift_body();
    body["oil_temperature_end"] = json!("50 degC");
    body["cap_pressure_start"] = json!("127 bar");
    body["cap_pressure_end"] = json!("150 bar");
    body["rod_pressure_start"] = json!("0 bar");
    body["rod_pressure_end"] = json!("45 bar");
    body["ratings"] = json!({"cap_line": "210 bar"});
    let (status, body) = app.post_json("/api/v1/calc/drift-test", &body).await;
    assert_eq!(status, StatusCode::OK, "{body}");
    assert_eq!(body["diagnosis"], "piston_seal_bypass");
    // Force balance (common practice): 100 kN / 38.48 cm² = 259.8 bar, above 210 bar.
    let hazards = body["hazards"].to_string();
    assert!(
        hazards.contains("259.8 bar") && hazards.contains("above"),
        "{hazards}"
    );
}

#[tokio::test]
async fn pressure_decay_endpoint_explains_cooling() {
    let app = TestApp::new().await;
    let body = json!({
        "bore": "100 mm", "rod": "70 mm", "stroke": "1 m",
        "pressurised_end": "cap", "duration": "10 min",
        "pressure_start": "200 bar", "pressure_end": "179.5 bar",
        "oil_temperature_start": "40 degC", "oil_temperature_end": "38 degC"
    });
    let (status, body) = app.post_json("/api/v1/calc/pressure-decay", &body).await;
    assert_eq!(status, StatusCode::OK, "{body}");
    // REFERENCES.md [C]: 1.5 GPa x 7e-4 = 10.5 bar per degC, so 2 degC explains 21 bar.
    close(&body["thermal_change"], -21e5, "thermal change");
    assert_eq!(body["diagnosis"], "thermal_contraction");
}

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

#[tokio::test]
async fn calc_page_shows_the_form_without_javascript() {
    let app = TestApp::new().await;
    let (status, _, page) = app.get_page("/calc").await;
    assert_eq!(status, StatusCode::OK);
    assert!(page.contains("<form method=\"get\" action=\"/calc\""));
    assert!(page.contains("name=\"bore\"") && page.contains("name=\"ratings.cap_line\""));
    assert!(!page.contains("Hazard:"));
}

#[tokio::test]
async fn calc_page_shows_the_same_results_in_us_and_metric_units() {
    let app = TestApp::new().await;
    let query = "/calc?units=us&bore=3.568248+in&rod=1.595769+in&stroke=24+in&load=10000+lbf&load_direction=retract&ratings.cap_line=3000+psi";
    let (status, _, page) = app.get_page(query).await;
    assert_eq!(status, StatusCode::OK, "{page}");
    assert!(page.contains("5000 psi"), "bypass pressure in psi");
    assert!(
        page.contains("Hazard:") && page.contains("injection injury"),
        "cautions beside the hazard"
    );
    assert!(page.contains("exceeds"));
    // Metric: 5000 psi = 344.7 bar [C].
    let (status, _, page) = app
        .get_page(&query.replace("units=us", "units=metric"))
        .await;
    assert_eq!(status, StatusCode::OK);
    assert!(page.contains("344.7 bar"), "bypass pressure in bar");
}

#[tokio::test]
async fn calc_page_shows_a_drift_analysis() {
    let app = TestApp::new().await;
    let query = "/calc?bore=100+mm&rod=70+mm&stroke=1000+mm&load=100+kN&load_direction=retract&duration=30+min&drift=2.2+mm&oil_temperature_start=50+degC&oil_temperature_end=44+degC";
    let (status, _, page) = app.get_page(query).await;
    assert_eq!(status, StatusCode::OK, "{page}");
    assert!(page.contains("thermal contraction"));
    assert!(page.contains("Oil cooled 6 degC"));
}

#[tokio::test]
async fn calc_page_puts_the_error_beside_the_field() {
    let app = TestApp::new().await;
    let (status, _, page) = app
        .get_page("/calc?bore=4&rod=2+in&stroke=24+in&load=1000+lbf")
        .await;
    assert_eq!(status, StatusCode::UNPROCESSABLE_ENTITY);
    assert!(
        page.contains("id=\"err-bore\""),
        "error beside the bore input"
    );
    assert!(page.contains("value=\"4\""), "the typed value is kept");
    let (status, _, page) = app.get_page("/calc?bore=4+in&rod=2+in&stroke=24+in&load=1000+lbf&load_direction=retract&decay.pressurised_end=cap&decay.duration=ten").await;
    assert_eq!(status, StatusCode::UNPROCESSABLE_ENTITY);
    assert!(
        page.contains("id=\"err-decay.duration\""),
        "error beside the decay input"
    );
}
