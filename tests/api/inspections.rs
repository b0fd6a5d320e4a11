//! Inspections of a machine (`/api/v1/machines/{id}/inspections`): a fail takes the machine
//! out of service in the same transaction and names itself as the cause; a later pass puts it
//! back; amendments keep both records. Invented test data.

use crate::helpers::{TestApp, assert_field_error};
use crate::registry_fixtures::machine;
use axum::http::StatusCode;
use serde_json::{Value, json};

pub fn inspection(result: &str, on: &str, token: &str) -> Value {
    let deficiencies = (result != "pass").then_some("Rod seal weeping on the boom lift cylinder");
    json!({
        "kind": "periodic",
        "performed_on": on,
        "hour_meter": 1520.5,
        "inspector": "D. Mensah",
        "result": result,
        "items": [
            {"item": "hoses", "outcome": "ok"},
            {"item": "external_leakage", "outcome": if result == "fail" { "fail" } else { "ok" },
             "leakage_class": if result == "fail" { 4 } else { 0 }},
        ],
        "deficiencies": deficiencies,
        "corrective_action": null,
        "client_token": token,
    })
}

async fn status_of(app: &TestApp, machine_id: i64) -> (String, Option<i64>, Value) {
    let (_, m) = app
        .get_json(&format!("/api/v1/machines/{machine_id}"))
        .await;
    let cause: Option<i64> =
        sqlx::query_scalar("SELECT out_of_service_inspection_id FROM machines WHERE id = ?")
            .bind(machine_id)
            .fetch_one(&app.db)
            .await
            .expect("cause");
    (m["status"].as_str().unwrap_or("").to_string(), cause, m)
}

#[tokio::test]
async fn a_failed_inspection_takes_the_machine_out_of_service_and_no_later_pass_clears_it() {
    let app = TestApp::new().await;
    let id = machine(&app, "HV-201").await;
    let path = format!("/api/v1/machines/{id}/inspections");
    let (status, failed) = app
        .post_json(&path, &inspection("fail", "2025-02-03", "i-1"))
        .await;
    assert_eq!(status, StatusCode::CREATED, "{failed}");
    let (state, cause, m) = status_of(&app, id).await;
    assert_eq!(state, "out_of_service");
    assert_eq!(cause, failed["id"].as_i64(), "the machine names the record");
    let reason = m["out_of_service_reason"].as_str().unwrap_or("");
    assert!(reason.contains(&format!("#{}", failed["id"])), "{reason}");
    assert_eq!(m["out_of_service_since"], "2025-02-03");

    // A pass dated before the failure does not clear it.
    let (status, _) = app
        .post_json(&path, &inspection("pass", "2025-01-20", "i-2"))
        .await;
    assert_eq!(status, StatusCode::CREATED);
    assert_eq!(status_of(&app, id).await.0, "out_of_service");

    // Nor does a later pass with deficiencies: only a manager's approval returns a machine
    // (tests/api/service_status.rs).
    let (status, _) = app
        .post_json(
            &path,
            &inspection("pass_with_deficiencies", "2025-02-10", "i-3"),
        )
        .await;
    assert_eq!(status, StatusCode::CREATED);
    let (state, cause, m) = status_of(&app, id).await;
    assert_eq!(state, "out_of_service");
    assert_eq!(cause, failed["id"].as_i64());

    let (_, list) = app.get_json(&path).await;
    assert_eq!(list["items"].as_array().map(Vec::len), Some(3));
    // The machine's hour meter followed the inspections.
    assert_eq!(m["hour_meter"], 1520.5);
}

#[tokio::test]
async fn correcting_a_fail_into_a_pass_keeps_both_records_and_never_returns_the_machine() {
    let app = TestApp::new().await;
    let id = machine(&app, "HV-202").await;
    let path = format!("/api/v1/machines/{id}/inspections");
    let (_, failed) = app
        .post_json(&path, &inspection("fail", "2025-03-01", "c-1"))
        .await;
    let mut fix = inspection("pass", "2025-03-01", "c-2");
    fix["amends"] = failed["id"].clone();
    let (status, fixed) = app.post_json(&path, &fix).await;
    assert_eq!(status, StatusCode::CREATED, "{fixed}");
    assert_eq!(fixed["amends"], failed["id"]);
    assert_eq!(status_of(&app, id).await.0, "out_of_service");
    let (_, one) = app
        .get_json(&format!("/api/v1/inspections/{}", failed["id"]))
        .await;
    assert_eq!(one["result"], "fail", "the old record is kept as it was");
    assert_eq!(one["amended_by"], fixed["id"]);
    assert_eq!(one["in_force"], false);
    assert!(one["created_by"].as_str().is_some_and(|s| !s.is_empty()));
    assert!(one["created_at"].as_str().is_some_and(|s| !s.is_empty()));
}

#[tokio::test]
async fn a_resubmitted_inspection_is_stored_once_and_fails_once() {
    let app = TestApp::new().await;
    let id = machine(&app, "HV-203").await;
    let path = format!("/api/v1/machines/{id}/inspections");
    let body = inspection("fail", "2025-04-02", "dup");
    let (a, first) = app.post_json(&path, &body).await;
    let (b, second) = app.post_json(&path, &body).await;
    assert_eq!((a, b), (StatusCode::CREATED, StatusCode::OK));
    assert_eq!(first["id"], second["id"]);
    let rows: i64 = sqlx::query_scalar("SELECT COUNT(*) FROM inspections")
        .fetch_one(&app.db)
        .await
        .expect("count");
    assert_eq!(rows, 1);
    let status_changes: i64 = sqlx::query_scalar(
        "SELECT COUNT(*) FROM audit_log WHERE entity = 'machine' AND action = 'update'",
    )
    .fetch_one(&app.db)
    .await
    .expect("count");
    assert_eq!(
        status_changes, 2,
        "the status and the hour meter, once each"
    );
}

#[tokio::test]
async fn bad_inspection_input_names_its_field() {
    let app = TestApp::new().await;
    let id = machine(&app, "HV-204").await;
    let path = format!("/api/v1/machines/{id}/inspections");
    let cases = [
        (json!({"kind": "yearly"}), "kind"),
        (json!({"performed_on": "2999-01-01"}), "performed_on"),
        (json!({"performed_on": "03/04/2025"}), "performed_on"),
        (json!({"hour_meter": -3}), "hour_meter"),
        (json!({"result": "ok"}), "result"),
        (json!({"inspector": null}), "inspector"),
        (
            json!({"items": [{"item": "rod", "outcome": "fine"}]}),
            "items[0].outcome",
        ),
        (
            json!({"items": [{"item": "external_leakage", "outcome": "ok", "leakage_class": 7}]}),
            "items[0].leakage_class",
        ),
        (json!({"items": "all good"}), "items"),
        (
            json!({"deficiencies": null, "result": "fail"}),
            "deficiencies",
        ),
        (
            json!({"result": "pass", "items": [{"item": "rod", "outcome": "fail"}]}),
            "result",
        ),
        (json!({"colour": "red"}), "colour"),
    ];
    for (change, field) in cases {
        let mut body = inspection("pass_with_deficiencies", "2025-05-05", "bad");
        for (k, v) in change.as_object().cloned().unwrap_or_default() {
            body[k] = v;
        }
        let (status, answer) = app.post_json(&path, &body).await;
        assert_field_error(status, &answer, StatusCode::UNPROCESSABLE_ENTITY, field);
    }
    let (status, _) = app
        .post_json(
            "/api/v1/machines/9999/inspections",
            &inspection("pass", "2025-05-05", "x"),
        )
        .await;
    assert_eq!(status, StatusCode::NOT_FOUND);
    assert_eq!(status_of(&app, id).await.0, "in_service");
}
