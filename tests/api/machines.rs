//! `/api/v1/machines`: the fleet registry's machines.

use crate::helpers::{TestApp, assert_field_error};
use crate::registry_fixtures::{audit, cylinder, hose, ids, machine, machine_with, site};
use axum::http::StatusCode;
use serde_json::json;

/// psi in pascals: lbf/in² = 4.4482216152605 N / (0.0254 m)² (NIST SP 811).
const PSI: f64 = 4.4482216152605 / (0.0254 * 0.0254);

#[tokio::test]
async fn a_machine_needs_only_a_unit_number_and_a_kind() {
    let app = TestApp::new().await;
    let body = machine_with(
        &app,
        json!({"unit_number": "HV-01", "kind": "Scissor  Lift"}),
    )
    .await;
    assert!(body["id"].as_i64().is_some());
    assert_eq!(body["unit_number"], "HV-01");
    assert_eq!(
        body["kind"], "scissor lift",
        "kinds are kept in one spelling"
    );
    assert_eq!(body["status"], "in_service");
    assert!(body["site_id"].is_null());
    assert!(body["relief_pressure"].is_null());
    assert_eq!(body["units"], "metric");
    let created = body["created_at"].as_str().expect("created_at");
    assert!(created.ends_with('Z') && created.len() == 20, "{created}");
}

#[tokio::test]
async fn a_machine_is_shown_in_its_sites_units_unless_others_are_asked() {
    let app = TestApp::new().await;
    let port = site(&app, "Port Road", "us").await;
    let body = machine_with(
        &app,
        json!({
            "unit_number": "HV-TH-14", "kind": "telehandler", "site_id": port,
            "relief_pressure": "3500 psi", "hour_meter": 5120.5, "hour_meter_read_on": "2026-11-25",
            "periodic_interval_days": 365, "periodic_interval_hours": 500, "frequent_interval_days": 7,
            "serial": "TH-5561", "description": "10,000 lb telehandler",
        }),
    )
    .await;
    let id = body["id"].as_i64().expect("id");
    assert_eq!(body["units"], "us");
    assert_eq!(body["relief_pressure"]["unit"], "psi");
    assert!((body["relief_pressure"]["value"].as_f64().unwrap() - 3500.0).abs() < 1e-9);
    let si = body["relief_pressure"]["si"].as_f64().unwrap();
    assert!((si - 3500.0 * PSI).abs() < 1e-6, "{si}");
    assert_eq!(body["hour_meter"], 5120.5);
    assert_eq!(body["periodic_interval_hours"], 500.0);

    let (_, metric) = app
        .get_json(&format!("/api/v1/machines/{id}?units=metric"))
        .await;
    assert_eq!(metric["relief_pressure"]["unit"], "bar");
    // 3500 psi = 241.3 bar (1 bar = 1e5 Pa exactly, ISO 80000-4).
    let bar = metric["relief_pressure"]["value"].as_f64().unwrap();
    assert!((bar - 3500.0 * PSI / 1e5).abs() < 1e-9 && (bar - 241.3165).abs() < 1e-3);
}

#[tokio::test]
async fn every_kind_of_bad_machine_input_names_its_field() {
    let app = TestApp::new().await;
    machine(&app, "HV-01").await;
    let base = || json!({"unit_number": "HV-02", "kind": "excavator"});
    let cases = [
        (
            "unit_number",
            json!({"kind": "excavator"}),
            StatusCode::UNPROCESSABLE_ENTITY,
        ),
        (
            "kind",
            json!({"unit_number": "HV-02"}),
            StatusCode::UNPROCESSABLE_ENTITY,
        ),
        (
            "unit_number",
            json!({"unit_number": "HV-01", "kind": "loader"}),
            StatusCode::CONFLICT,
        ),
        (
            "site_id",
            json!({"site_id": 42}),
            StatusCode::UNPROCESSABLE_ENTITY,
        ),
        (
            "site_id",
            json!({"site_id": "north"}),
            StatusCode::UNPROCESSABLE_ENTITY,
        ),
        (
            "relief_pressure",
            json!({"relief_pressure": 250}),
            StatusCode::UNPROCESSABLE_ENTITY,
        ),
        (
            "relief_pressure",
            json!({"relief_pressure": "250 mm"}),
            StatusCode::UNPROCESSABLE_ENTITY,
        ),
        (
            "relief_pressure",
            json!({"relief_pressure": "-5 bar"}),
            StatusCode::UNPROCESSABLE_ENTITY,
        ),
        (
            "relief_pressure",
            json!({"relief_pressure": "0 bar"}),
            StatusCode::UNPROCESSABLE_ENTITY,
        ),
        (
            "status",
            json!({"status": "broken"}),
            StatusCode::UNPROCESSABLE_ENTITY,
        ),
        (
            "out_of_service_reason",
            json!({"status": "out_of_service"}),
            StatusCode::UNPROCESSABLE_ENTITY,
        ),
        (
            "out_of_service_reason",
            json!({"out_of_service_reason": "leak"}),
            StatusCode::UNPROCESSABLE_ENTITY,
        ),
        (
            "hour_meter",
            json!({"hour_meter": "4200 h"}),
            StatusCode::UNPROCESSABLE_ENTITY,
        ),
        (
            "hour_meter",
            json!({"hour_meter": -1}),
            StatusCode::UNPROCESSABLE_ENTITY,
        ),
        (
            "hour_meter_read_on",
            json!({"hour_meter": 10, "hour_meter_read_on": "24/11/2026"}),
            StatusCode::UNPROCESSABLE_ENTITY,
        ),
        (
            "hour_meter_read_on",
            json!({"hour_meter": 10, "hour_meter_read_on": "2999-01-01"}),
            StatusCode::UNPROCESSABLE_ENTITY,
        ),
        (
            "hour_meter_read_on",
            json!({"hour_meter_read_on": "2026-01-01"}),
            StatusCode::UNPROCESSABLE_ENTITY,
        ),
        (
            "periodic_interval_days",
            json!({"periodic_interval_days": 0}),
            StatusCode::UNPROCESSABLE_ENTITY,
        ),
        (
            "periodic_interval_days",
            json!({"periodic_interval_days": 30.5}),
            StatusCode::UNPROCESSABLE_ENTITY,
        ),
        (
            "periodic_interval_hours",
            json!({"periodic_interval_hours": 0}),
            StatusCode::UNPROCESSABLE_ENTITY,
        ),
        (
            "frequent_interval_days",
            json!({"frequent_interval_days": 400}),
            StatusCode::UNPROCESSABLE_ENTITY,
        ),
        (
            "description",
            json!({"description": ["a"]}),
            StatusCode::UNPROCESSABLE_ENTITY,
        ),
        (
            "archived",
            json!({"archived": true}),
            StatusCode::UNPROCESSABLE_ENTITY,
        ),
        (
            "colour",
            json!({"colour": "yellow"}),
            StatusCode::UNPROCESSABLE_ENTITY,
        ),
        (
            "units",
            json!({"units": "imperial"}),
            StatusCode::UNPROCESSABLE_ENTITY,
        ),
    ];
    for (field, extra, expected) in cases {
        let mut body = base();
        for (k, v) in extra.as_object().unwrap() {
            body[k] = v.clone();
        }
        if field == "unit_number" && expected == StatusCode::UNPROCESSABLE_ENTITY {
            body.as_object_mut().unwrap().remove("unit_number");
        }
        if field == "kind" {
            body.as_object_mut().unwrap().remove("kind");
        }
        let (status, answer) = app.post_json("/api/v1/machines", &body).await;
        assert_field_error(status, &answer, expected, field);
    }
    let (_, list) = app.get_json("/api/v1/machines").await;
    assert_eq!(ids(&list).len(), 1, "no refused machine was stored");
}

#[tokio::test]
async fn a_patch_changes_only_what_it_sends_and_null_clears() {
    let app = TestApp::new().await;
    let body = machine_with(
        &app,
        json!({"unit_number": "HV-03", "kind": "excavator", "serial": "EX-1", "relief_pressure": "280 bar"}),
    )
    .await;
    let id = body["id"].as_i64().unwrap();
    let path = format!("/api/v1/machines/{id}");
    let (status, patched) = app
        .patch_json(
            &path,
            &json!({"serial": null, "description": "8 t midi excavator"}),
        )
        .await;
    assert_eq!(status, StatusCode::OK, "{patched}");
    assert!(patched["serial"].is_null());
    assert_eq!(patched["description"], "8 t midi excavator");
    assert_eq!(patched["relief_pressure"], body["relief_pressure"]);

    let (status, answer) = app.patch_json(&path, &json!({"unit_number": null})).await;
    assert_field_error(
        status,
        &answer,
        StatusCode::UNPROCESSABLE_ENTITY,
        "unit_number",
    );

    let (status, out) = app
        .patch_json(
            &path,
            &json!({"status": "out_of_service", "out_of_service_reason": "boom drifts"}),
        )
        .await;
    assert_eq!(status, StatusCode::OK, "{out}");
    assert_eq!(out["out_of_service_reason"], "boom drifts");
    assert!(
        out["out_of_service_since"].as_str().is_some(),
        "defaults to today"
    );
    let (_, back) = app
        .patch_json(&path, &json!({"status": "in_service"}))
        .await;
    assert!(back["out_of_service_reason"].is_null() && back["out_of_service_since"].is_null());

    machine(&app, "HV-04").await;
    let (status, answer) = app
        .patch_json(&path, &json!({"unit_number": "HV-04"}))
        .await;
    assert_field_error(status, &answer, StatusCode::CONFLICT, "unit_number");
    let (status, _) = app
        .patch_json("/api/v1/machines/9999", &json!({"serial": "x"}))
        .await;
    assert_eq!(status, StatusCode::NOT_FOUND);

    let actions: Vec<String> = audit(&app, "machine", id)
        .await
        .into_iter()
        .map(|r| r.0)
        .collect();
    assert_eq!(
        actions,
        ["create", "update", "update", "update"],
        "refused changes leave no row"
    );
}

#[tokio::test]
async fn an_archived_machine_is_kept_but_left_out_of_lists() {
    let app = TestApp::new().await;
    let keep = machine(&app, "HV-KEEP").await;
    let gone = machine(&app, "HV-GONE").await;
    let deleted = machine(&app, "HV-DEL").await;
    let (status, body) = app
        .post_json(&format!("/api/v1/machines/{gone}/archive"), &json!({}))
        .await;
    assert_eq!(status, StatusCode::OK, "{body}");
    assert_eq!(body["archived"], true);
    let (status, body) = app
        .json("DELETE", &format!("/api/v1/machines/{deleted}"), None)
        .await;
    assert_eq!(status, StatusCode::OK, "DELETE archives: {body}");
    assert_eq!(body["archived"], true);

    let (_, list) = app.get_json("/api/v1/machines").await;
    assert_eq!(ids(&list), vec![keep]);
    let (_, all) = app.get_json("/api/v1/machines?archived=true").await;
    assert_eq!(ids(&all), vec![keep, gone, deleted]);
    let (status, one) = app.get_json(&format!("/api/v1/machines/{deleted}")).await;
    assert_eq!(
        (status, one["archived"].clone()),
        (StatusCode::OK, json!(true))
    );
    let rows: i64 = sqlx::query_scalar("SELECT COUNT(*) FROM machines")
        .fetch_one(&app.db)
        .await
        .unwrap();
    assert_eq!(rows, 3, "nothing is deleted");
    let log = audit(&app, "machine", deleted).await;
    assert_eq!(log.last().unwrap().0, "archive");
    assert!(log.last().unwrap().1["archived_at"].is_null());
    assert!(log.last().unwrap().2["archived_at"].is_string());

    let (status, restored) = app
        .patch_json(
            &format!("/api/v1/machines/{gone}"),
            &json!({"archived": false}),
        )
        .await;
    assert_eq!(
        (status, restored["archived"].clone()),
        (StatusCode::OK, json!(false))
    );
    let (status, _) = app
        .post_json("/api/v1/machines/777/archive", &json!({}))
        .await;
    assert_eq!(status, StatusCode::NOT_FOUND);
}

#[tokio::test]
async fn a_machine_lists_its_own_cylinders_and_hoses() {
    let app = TestApp::new().await;
    let a = machine(&app, "HV-A").await;
    let b = machine(&app, "HV-B").await;
    let ca = cylinder(&app, a).await;
    let cb = cylinder(&app, b).await;
    let ha = hose(&app, ca, "cap", "3500 psi").await;
    hose(&app, cb, "rod", "3500 psi").await;
    let (status, body) = app
        .get_json(&format!("/api/v1/machines/{a}/cylinders"))
        .await;
    assert_eq!(status, StatusCode::OK);
    assert_eq!(ids(&body), vec![ca]);
    let (_, body) = app.get_json(&format!("/api/v1/machines/{a}/hoses")).await;
    assert_eq!(ids(&body), vec![ha]);
    let (_, machine) = app.get_json(&format!("/api/v1/machines/{a}")).await;
    assert_eq!(
        (
            machine["cylinder_count"].clone(),
            machine["hose_count"].clone()
        ),
        (json!(1), json!(1))
    );
    let (status, _) = app.get_json("/api/v1/machines/555/cylinders").await;
    assert_eq!(status, StatusCode::NOT_FOUND);
}
