//! The calculation API (`/api/v1/calc/*`), in-process (the page is in `calc_page`).
//! Figures are checked against REFERENCES.md (sources named beside each check); the rest of
//! the figures are held against their references in the `calc` suite.

use crate::helpers::TestApp;
use axum::http::StatusCode;
use serde_json::{Value, json};

pub const PSI: f64 = 6_894.757_293_168;

pub fn close(actual: &Value, expected_si: f64, what: &str) {
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
pub fn us_example() -> Value {
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

pub fn drift_body() -> Value {
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
