//! Issue 12, inputs and strength: vacuum readings down to -1 atm (API and the shop form), the
//! tube's Tresca stress and the E and nu given, and every new calculation field refusing bad
//! input by name. Expected values from the Lamé solution with Tresca (REFERENCES.md "Added
//! 2026-12-02") and the force balance on the piston; the cylinders are invented test data.

use crate::calc::close;
use crate::helpers::{TestApp, assert_field_error};
use crate::worst_load::example;
use axum::http::StatusCode;
use serde_json::{Value, json};

#[tokio::test]
async fn the_tube_answer_carries_the_tresca_stress_that_is_checked() {
    // Bore 100 mm, OD 121 mm (a = 50 mm, b = 60.5 mm), checked at the answer's highest
    // pressure p: Tresca = 2 p b² / (b² - a²), hoop = p (a² + b²) / (b² - a²) (Lamé).
    let app = TestApp::new().await;
    let (status, body) = app
        .post_json(
            "/api/v1/calc/cylinder",
            &json!({"bore": "100 mm", "rod": "56 mm", "stroke": "500 mm", "load": "100 kN",
                    "load_direction": "retract", "tube_outside_diameter": "121 mm",
                    "tube_yield": "355 MPa", "tube_youngs_modulus": "200 GPa",
                    "tube_poisson_ratio": 0.29, "rod_yield": "490 MPa"}),
        )
        .await;
    assert_eq!(status, StatusCode::OK, "{body}");
    let tube = &body["tube"];
    let p = tube["pressure"]["si"].as_f64().unwrap();
    let (a2, b2) = (0.05f64 * 0.05, 0.0605f64 * 0.0605);
    close(
        &tube["equivalent_stress"],
        2.0 * p * b2 / (b2 - a2),
        "Tresca",
    );
    close(&tube["hoop_stress"], p * (a2 + b2) / (b2 - a2), "hoop kept");
    assert_eq!(tube["criterion"], "tresca");
    close(&tube["youngs_modulus"], 200e9, "the tube modulus given");
    assert_eq!(tube["poisson_ratio"], 0.29);
    // The highest pressure is the bypass: 100 kN / (pi/4 x 0.056²) = 406.0 bar; Tresca
    // 2 x 40.60 MPa x 3.15471 = 256.2 MPa, above 355/2 = 177.5 MPa.
    close(&tube["pressure"], 406.0e5, "bypass pressure");
    assert_eq!(tube["status"], "exceeds");
    assert_eq!(body["buckling"]["rod_yield_assumed"], false);
    assert_eq!(body["buckling"]["length_assumed"], true);
    assert!(
        body["buckling"]["length_basis"]
            .as_str()
            .unwrap()
            .contains("twice the stroke")
    );
    // Poisson's ratio out of range, or a tube modulus without the tube, name the field.
    for (field, body) in [
        (
            "tube_poisson_ratio",
            json!({"bore": "100 mm", "rod": "56 mm", "stroke": "500 mm", "load": "1 kN",
                   "load_direction": "retract", "tube_outside_diameter": "121 mm",
                   "tube_poisson_ratio": 0.7}),
        ),
        (
            "tube_youngs_modulus",
            json!({"bore": "100 mm", "rod": "56 mm", "stroke": "500 mm", "load": "1 kN",
                   "load_direction": "retract", "tube_youngs_modulus": "200 GPa"}),
        ),
        (
            "rod_yield",
            json!({"bore": "100 mm", "rod": "56 mm", "stroke": "500 mm", "load": "1 kN",
                   "load_direction": "retract", "rod_yield": "-5 MPa"}),
        ),
    ] {
        let (status, answer) = app.post_json("/api/v1/calc/cylinder", &body).await;
        assert_field_error(status, &answer, StatusCode::UNPROCESSABLE_ENTITY, field);
    }
}

fn drift_readings(cap_end: &str) -> Value {
    json!({
        "bore": "100 mm", "rod": "70 mm", "stroke": "800 mm", "load": "30 kN",
        "load_direction": "extend", "duration": "10 min", "drift": "4 mm",
        "oil_temperature_start": "40 degC", "oil_temperature_end": "40 degC",
        "cap_pressure_start": "0 bar", "cap_pressure_end": cap_end,
        "rod_pressure_start": "74.9 bar", "rod_pressure_end": "60 bar",
        "limit": {"distance": "5 mm", "per": "10 min"}
    })
}

#[tokio::test]
async fn vacuum_readings_down_to_one_atmosphere_are_accepted_and_below_refused() {
    let app = TestApp::new().await;
    // A pulling load with a passing seal drains the cap end: -0.9 bar gauge is a reading.
    let (status, body) = app
        .post_json("/api/v1/calc/drift-test", &drift_readings("-0.9 bar"))
        .await;
    assert_eq!(status, StatusCode::OK, "{body}");
    assert!(body["diagnosis"].is_string(), "{body}");
    // -1 atm exactly (101,325 Pa) is absolute zero: accepted; -1.2 bar is refused by name.
    let (status, body) = app
        .post_json("/api/v1/calc/drift-test", &drift_readings("-101325 Pa"))
        .await;
    assert_eq!(status, StatusCode::OK, "{body}");
    let (status, body) = app
        .post_json("/api/v1/calc/drift-test", &drift_readings("-1.2 bar"))
        .await;
    assert_field_error(
        status,
        &body,
        StatusCode::UNPROCESSABLE_ENTITY,
        "cap_pressure_end",
    );
    // Pressure decay: -14.69 psi (-101.28 kPa) accepted, -15 psi (-103.4 kPa) refused.
    let decay = |other_end: &str| {
        json!({"bore": "100 mm", "rod": "70 mm", "stroke": "800 mm", "pressurised_end": "cap",
               "duration": "10 min", "pressure_start": "150 bar", "pressure_end": "148 bar",
               "oil_temperature_start": "40 degC", "oil_temperature_end": "40 degC",
               "other_pressure_start": "0 bar", "other_pressure_end": other_end})
    };
    let (status, body) = app
        .post_json("/api/v1/calc/pressure-decay", &decay("-14.69 psi"))
        .await;
    assert_eq!(status, StatusCode::OK, "{body}");
    let (status, body) = app
        .post_json("/api/v1/calc/pressure-decay", &decay("-15 psi"))
        .await;
    assert_field_error(
        status,
        &body,
        StatusCode::UNPROCESSABLE_ENTITY,
        "other_pressure_end",
    );
    // A stored drift test on a registry cylinder takes the vacuum reading too.
    let m = crate::registry_fixtures::machine(&app, "HV-VAC-1").await;
    let (_, c) = app
        .post_json(
            "/api/v1/cylinders",
            &json!({"machine_id": m, "bore": "100 mm", "rod": "70 mm", "stroke": "800 mm",
                    "load_direction": "extend", "max_load": "30 kN"}),
        )
        .await;
    let mut record = drift_readings("-0.8 bar");
    let r = record.as_object_mut().unwrap();
    for key in ["bore", "rod", "stroke", "load", "load_direction"] {
        r.remove(key);
    }
    r.insert("technician".into(), json!("R. Okafor"));
    let path = format!("/api/v1/cylinders/{}/drift-tests", c["id"]);
    let (status, stored) = app.post_json(&path, &record).await;
    assert_eq!(status, StatusCode::CREATED, "{stored}");
    record["cap_pressure_end"] = json!("-2 bar");
    let (status, body) = app.post_json(&path, &record).await;
    assert_field_error(
        status,
        &body,
        StatusCode::UNPROCESSABLE_ENTITY,
        "cap_pressure_end",
    );
}

#[tokio::test]
async fn every_new_calculation_field_refuses_bad_input_by_name() {
    let app = TestApp::new().await;
    let base = example("metric");
    for (field, value) in [
        ("min_load", json!("-1 kN")),
        ("min_load", json!(5)),
        ("min_load", json!("5 bar")),
        ("min_load", json!("181 kN")),
        ("rod_yield", json!("0.1 MPa")),
        ("rod_yield", json!("NaN MPa")),
        ("rod_youngs_modulus", json!("1 MPa")),
        ("rod_poisson_ratio", json!(0.5)),
        ("rod_poisson_ratio", json!("0.3 bar")),
        ("tube_poisson_ratio", json!(0.3)),
        ("buckling_length", json!("0 m")),
    ] {
        let mut body = base.clone();
        body[field] = value;
        let (status, reply) = app.post_json("/api/v1/calc/cylinder", &body).await;
        assert_field_error(status, &reply, StatusCode::UNPROCESSABLE_ENTITY, field);
    }
}

#[tokio::test]
async fn the_shop_drift_form_takes_a_vacuum_reading_and_refuses_one_below_vacuum() {
    use crate::shop_pages::{drift_form, hidden};
    let app = TestApp::session(loadhold::auth::Role::Admin).await;
    let (_, cylinder) = crate::drift_tests::loaded_cylinder(&app, "HV-VAC-2").await;
    let form = format!("/shop/cylinders/{cylinder}/drift-test");
    let (_, _, page) = app.get_page(&form).await;
    let token = hidden(&page, "client_token");
    // -1.5 bar gauge is below absolute zero (-1.01325 bar): refused beside the field.
    let mut fields = drift_form(&token, "600");
    fields.extend([
        ("rod_pressure_end", "-1.5"),
        ("rod_pressure_end_unit", "bar"),
    ]);
    let (status, _, again) = app.post_form(&form, &fields).await;
    assert_eq!(status, StatusCode::UNPROCESSABLE_ENTITY);
    assert!(
        again.contains("id=\"err-rod_pressure_end\""),
        "beside the field"
    );
    // -0.4 bar is a reading: stored.
    let mut fields = drift_form(&token, "600");
    fields.extend([
        ("rod_pressure_end", "-0.4"),
        ("rod_pressure_end_unit", "bar"),
    ]);
    let (status, _, _) = app.post_form(&form, &fields).await;
    assert_eq!(status, StatusCode::SEE_OTHER);
}
