//! The due dates on the registry's machine and cylinder resources and on the machine page.

use super::fleet::*;
use crate::helpers::TestApp;
use axum::http::StatusCode;
use serde_json::{Value, json};

fn kinds(due: &Value) -> Vec<&str> {
    due.as_array()
        .expect("a due array")
        .iter()
        .map(|i| i["kind"].as_str().unwrap())
        .collect()
}

#[tokio::test]
async fn machine_and_cylinder_resources_carry_their_due_dates() {
    let app = TestApp::new().await;
    let m = machine(
        &app,
        json!({"unit_number": "HV-301", "kind": "excavator",
        "frequent_interval_days": 30}),
    )
    .await;
    // [C] 2024-03-01 + 30 days = 2024-03-31; a drift test every 60 days from 2024-02-01 is
    // due 2024-04-01 (29 days of February 2024, 31 of March). Both dates are past whatever day
    // this runs, so both are overdue.
    inspect(&app, m, "frequent", "2024-03-01", Some(120.0), "pass").await;
    let c = cylinder(&app, m, json!({"drift_test_interval_days": 60})).await;
    drift_test(&app, c, "2024-02-01T10:00:00Z", 0.4, 5.0).await;
    let other = cylinder(&app, m, json!({"function": "arm"})).await;

    let (status, body) = app.get_json(&format!("/api/v1/machines/{m}")).await;
    assert_eq!(status, StatusCode::OK, "{body}");
    // 2024-03-31 is one day further past than 2024-04-01: it comes first.
    assert_eq!(
        kinds(&body["due"]),
        vec!["frequent_inspection", "drift_test"],
        "{body}"
    );
    let drift = &body["due"][1];
    assert_eq!(drift["cylinder_id"], c);
    assert_eq!(drift["due_on"], "2024-04-01");
    assert_eq!(drift["overdue"], true);
    let frequent = &body["due"][0];
    assert_eq!(frequent["due_on"], "2024-03-31");
    assert_eq!(frequent["basis"], "date");
    assert_eq!(frequent["last_done_on"], "2024-03-01");

    let (status, body) = app.get_json(&format!("/api/v1/cylinders/{c}")).await;
    assert_eq!(status, StatusCode::OK, "{body}");
    assert_eq!(kinds(&body["due"]), vec!["drift_test"]);
    assert_eq!(body["due"][0]["due_on"], "2024-04-01");
    let (_, body) = app.get_json(&format!("/api/v1/cylinders/{other}")).await;
    assert_eq!(body["due"], json!([]), "no interval, nothing due");

    let (status, _, page) = app.get_page(&format!("/machines/{m}")).await;
    assert_eq!(status, StatusCode::OK);
    for text in [
        "Next due",
        "2024-03-31",
        "2024-04-01",
        "Frequent inspection",
        "Drift test",
    ] {
        assert!(page.contains(text), "{text} on the machine page");
    }
}
