//! Readings that cannot be true are refused naming the field and the bound: an hour meter runs
//! forward and at most 24 h a calendar day (its definition: hours of running), records are not
//! dated before the fleet could hold the machine or after tomorrow, limits and durations are
//! above zero. Archived means archived: no tests on a cylinder of an archived machine.

use crate::helpers::{TestApp, assert_field_error};
use crate::reports::fleet;
use axum::http::StatusCode;
use serde_json::{Value, json};

fn inspection(on: &str, hours: Value) -> Value {
    json!({"kind": "periodic", "performed_on": on, "inspector": "D. Mensah", "result": "pass",
           "hour_meter": hours})
}

fn message(body: &Value) -> String {
    body["error"]["message"].as_str().unwrap_or("").to_string()
}

#[tokio::test]
async fn an_absurd_hour_meter_is_refused_and_cannot_hide_work_due_by_hours() {
    let app = TestApp::new().await;
    let m = fleet::machine(
        &app,
        json!({"unit_number": "HV-40", "kind": "aerial lift", "periodic_interval_hours": 500.0,
               "hour_meter": 4222.5, "hour_meter_read_on": "2026-03-01"}),
    )
    .await;
    let path = format!("/api/v1/machines/{m}/inspections");
    let (status, body) = app
        .post_json(&path, &inspection("2026-03-02", json!(1e308)))
        .await;
    assert_field_error(
        status,
        &body,
        StatusCode::UNPROCESSABLE_ENTITY,
        "hour_meter",
    );
    assert!(message(&body).contains("500000"), "names the bound: {body}");

    // 12 h after a reading of 4,222.5 h: below the last reading
    let (status, body) = app
        .post_json(&path, &inspection("2026-03-02", json!(12.0)))
        .await;
    assert_field_error(
        status,
        &body,
        StatusCode::UNPROCESSABLE_ENTITY,
        "hour_meter",
    );
    assert!(
        message(&body).contains("4222.5"),
        "names the last reading: {body}"
    );

    // one day later the meter can have run at most 2 x 24 h (the reading's own day and the
    // next): 4222.5 + 48 = 4270.5 h
    let (status, body) = app
        .post_json(&path, &inspection("2026-03-02", json!(4271.0)))
        .await;
    assert_field_error(
        status,
        &body,
        StatusCode::UNPROCESSABLE_ENTITY,
        "hour_meter",
    );
    assert!(message(&body).contains("4270.5"), "names the bound: {body}");
    let (status, body) = app
        .post_json(&path, &inspection("2026-03-02", json!(4270.0)))
        .await;
    assert_eq!(status, StatusCode::CREATED, "{body}");

    // a replaced meter starts again from a low reading, and the record says so
    let mut replaced = inspection("2026-03-03", json!(3.0));
    replaced["hour_meter_replaced"] = json!(true);
    let (status, body) = app.post_json(&path, &replaced).await;
    assert_eq!(status, StatusCode::CREATED, "{body}");
    assert_eq!(body["hour_meter_replaced"], true);
    let (_, machine) = app.get_json(&format!("/api/v1/machines/{m}")).await;
    assert_eq!(
        machine["hour_meter"], 3.0,
        "the new meter's reading is the machine's"
    );
}

#[tokio::test]
async fn dates_far_before_registration_or_after_tomorrow_are_refused() {
    let app = TestApp::new().await;
    let m = fleet::machine(&app, json!({"unit_number": "HV-41", "kind": "aerial lift"})).await;
    let path = format!("/api/v1/machines/{m}/inspections");
    for day in ["0000-01-01", "1900-06-01"] {
        let (status, body) = app.post_json(&path, &inspection(day, Value::Null)).await;
        assert_field_error(
            status,
            &body,
            StatusCode::UNPROCESSABLE_ENTITY,
            "performed_on",
        );
        assert!(
            message(&body).contains("-01-01"),
            "names the earliest day: {body}"
        );
    }
    let cylinder = fleet::cylinder(&app, m, json!({})).await;
    let body = json!({
        "tested_at": "1900-01-01T08:00:00Z", "technician": "J. Marsh", "duration": "10 min",
        "drift": "1 mm", "oil_temperature_start": "45 degC", "oil_temperature_end": "45 degC",
    });
    let (status, body) = app
        .post_json(&format!("/api/v1/cylinders/{cylinder}/drift-tests"), &body)
        .await;
    assert_field_error(status, &body, StatusCode::UNPROCESSABLE_ENTITY, "tested_at");
}

#[tokio::test]
async fn a_limit_or_duration_of_zero_is_refused_naming_the_field() {
    let app = TestApp::new().await;
    let m = fleet::machine(&app, json!({"unit_number": "HV-42", "kind": "aerial lift"})).await;
    let cylinder = fleet::cylinder(&app, m, json!({})).await;
    let drift = |limit: Value, duration: &str| {
        json!({"tested_at": "2026-05-01T08:00:00Z", "technician": "J. Marsh",
               "duration": duration, "drift": "1 mm", "oil_temperature_start": "45 degC",
               "oil_temperature_end": "45 degC", "limit": limit})
    };
    let path = format!("/api/v1/cylinders/{cylinder}/drift-tests");
    let cases = [
        (
            drift(json!({"distance": "0 mm", "per": "10 min"}), "10 min"),
            "limit.distance",
        ),
        (
            drift(json!({"distance": "2 mm", "per": "0 min"}), "10 min"),
            "limit.per",
        ),
        (
            drift(json!({"distance": "2 mm", "per": "10 min"}), "0 s"),
            "duration",
        ),
    ];
    for (body, field) in cases {
        let (status, answer) = app.post_json(&path, &body).await;
        assert_field_error(status, &answer, StatusCode::UNPROCESSABLE_ENTITY, field);
    }
    let decay = json!({
        "pressurised_end": "cap", "duration": "10 min", "pressure_start": "200 bar",
        "pressure_end": "199 bar", "oil_temperature_start": "41 degC",
        "oil_temperature_end": "41 degC", "limit": {"pressure": "0 bar", "per": "10 min"},
        "technician": "R. Okafor", "tested_at": "2026-05-01T08:00:00Z",
    });
    let (status, answer) = app
        .post_json(&format!("/api/v1/cylinders/{cylinder}/decay-tests"), &decay)
        .await;
    assert_field_error(
        status,
        &answer,
        StatusCode::UNPROCESSABLE_ENTITY,
        "limit.pressure",
    );
}

#[tokio::test]
async fn tests_on_a_cylinder_of_an_archived_machine_are_refused_with_409() {
    let app = TestApp::new().await;
    let m = fleet::machine(&app, json!({"unit_number": "HV-43", "kind": "aerial lift"})).await;
    let cylinder = fleet::cylinder(&app, m, json!({})).await;
    fleet::archive(&app, m).await;
    let drift = json!({
        "tested_at": "2026-05-01T08:00:00Z", "technician": "J. Marsh", "duration": "10 min",
        "drift": "1 mm", "oil_temperature_start": "45 degC", "oil_temperature_end": "45 degC",
    });
    let (status, body) = app
        .post_json(&format!("/api/v1/cylinders/{cylinder}/drift-tests"), &drift)
        .await;
    assert_eq!(status, StatusCode::CONFLICT, "drift test: {body}");
    assert!(message(&body).contains("HV-43"), "{body}");
    let decay = json!({
        "pressurised_end": "cap", "duration": "10 min", "pressure_start": "200 bar",
        "pressure_end": "199 bar", "oil_temperature_start": "41 degC",
        "oil_temperature_end": "41 degC", "technician": "R. Okafor",
        "tested_at": "2026-05-01T08:00:00Z",
    });
    let (status, body) = app
        .post_json(&format!("/api/v1/cylinders/{cylinder}/decay-tests"), &decay)
        .await;
    assert_eq!(status, StatusCode::CONFLICT, "decay test: {body}");
}
