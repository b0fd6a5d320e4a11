//! `/api/v1/cylinders`: geometry in any unit, stored in SI; the merged record is checked.

use crate::helpers::{TestApp, assert_field_error};
use crate::registry_fixtures::{audit, cylinder, hose, ids, machine, site, walk};
use axum::http::StatusCode;
use serde_json::json;

/// The inch is 0.0254 m exactly (NIST SP 811).
const INCH: f64 = 0.0254;

fn close(a: f64, b: f64) -> bool {
    (a - b).abs() <= 1e-12 * b.abs().max(1.0)
}

#[tokio::test]
async fn a_cylinder_in_inches_is_stored_in_metres_and_shown_in_the_asked_units() {
    let app = TestApp::new().await;
    let m = machine(&app, "HV-TH-01").await;
    let (status, body) = app
        .post_json(
            "/api/v1/cylinders?units=us",
            &json!({
                "machine_id": m, "function": "boom lift, left",
                "bore": "4 in", "rod": {"value": 2, "unit": "in"}, "stroke": "610 mm",
                "load_direction": "retract", "max_load": "10000 lbf", "rated_pressure": "3000 psi",
                "tube_outside_diameter": "4.5 in", "tube_yield": "52 ksi",
                "end_condition": "pinned_pinned", "serial": "C-1", "notes": "resealed 2025",
                "drift_test_interval_days": 90,
            }),
        )
        .await;
    assert_eq!(status, StatusCode::CREATED, "{body}");
    let id = body["id"].as_i64().unwrap();
    assert!(close(body["bore"]["si"].as_f64().unwrap(), 4.0 * INCH));
    assert!(close(body["rod"]["si"].as_f64().unwrap(), 2.0 * INCH));
    assert!(close(body["stroke"]["si"].as_f64().unwrap(), 0.610));
    assert_eq!(body["bore"]["unit"], "in");
    assert!(close(body["bore"]["value"].as_f64().unwrap(), 4.0));
    // 10,000 lbf = 44,482.216152605 N (lbf = 4.4482216152605 N, NIST SP 811).
    assert!(close(
        body["max_load"]["si"].as_f64().unwrap(),
        44_482.216_152_605
    ));
    assert_eq!(body["load_direction"], "retract");
    assert_eq!(body["end_condition"], "pinned_pinned");
    assert_eq!(body["unit_number"], "HV-TH-01");

    let (_, metric) = app.get_json(&format!("/api/v1/cylinders/{id}")).await;
    assert_eq!(metric["bore"]["unit"], "mm");
    assert!(close(metric["bore"]["value"].as_f64().unwrap(), 101.6));
    assert_eq!(audit(&app, "cylinder", id).await[0].0, "create");
}

#[tokio::test]
async fn every_kind_of_bad_cylinder_input_names_its_field() {
    let app = TestApp::new().await;
    let m = machine(&app, "HV-01").await;
    let archived = machine(&app, "HV-OLD").await;
    app.post_json(&format!("/api/v1/machines/{archived}/archive"), &json!({}))
        .await;
    let good = json!({"machine_id": m, "bore": "100 mm", "rod": "56 mm", "stroke": "600 mm", "load_direction": "retract"});
    let cases: Vec<(&str, serde_json::Value)> = vec![
        ("rod", json!({"rod": "100 mm"})),
        ("rod", json!({"rod": "5 in"})),
        ("machine_id", json!({"machine_id": 999})),
        ("machine_id", json!({"machine_id": archived})),
        ("machine_id", json!({"machine_id": null})),
        ("bore", json!({"bore": 100})),
        ("bore", json!({"bore": "100 psi"})),
        ("bore", json!({"bore": "0 mm"})),
        ("bore", json!({"bore": "100 furlongs"})),
        ("bore", json!({"bore": "40 m"})),
        // Smaller than the engineering core analyses (a wrong unit, most likely).
        ("bore", json!({"bore": "0.08 mm", "rod": "0.05 mm"})),
        ("stroke", json!({"stroke": null})),
        ("load_direction", json!({"load_direction": "down"})),
        ("load_direction", json!({"load_direction": null})),
        ("max_load", json!({"max_load": "-3 kN"})),
        ("max_load", json!({"max_load": "3 bar"})),
        ("rated_pressure", json!({"rated_pressure": {"value": 210}})),
        (
            "tube_outside_diameter",
            json!({"tube_outside_diameter": "90 mm"}),
        ),
        ("end_condition", json!({"end_condition": "welded"})),
        (
            "drift_test_interval_days",
            json!({"drift_test_interval_days": 0}),
        ),
        ("notes", json!({"notes": "x".repeat(2001)})),
        ("colour", json!({"colour": "red"})),
    ];
    for (field, change) in cases {
        let mut body = good.clone();
        for (k, v) in change.as_object().unwrap() {
            body[k] = v.clone();
        }
        let (status, answer) = app.post_json("/api/v1/cylinders", &body).await;
        assert_field_error(status, &answer, StatusCode::UNPROCESSABLE_ENTITY, field);
    }
    let (_, list) = app.get_json("/api/v1/cylinders?archived=true").await;
    assert!(ids(&list).is_empty(), "no refused cylinder was stored");
}

#[tokio::test]
async fn a_patch_is_checked_against_the_stored_geometry() {
    let app = TestApp::new().await;
    let m = machine(&app, "HV-01").await;
    let id = cylinder(&app, m).await; // 4 in x 2 in x 24 in
    let path = format!("/api/v1/cylinders/{id}");
    let (status, body) = app.patch_json(&path, &json!({"rod": "4.5 in"})).await;
    assert_field_error(status, &body, StatusCode::UNPROCESSABLE_ENTITY, "rod");
    let (status, body) = app.patch_json(&path, &json!({"bore": "1.5 in"})).await;
    assert_field_error(status, &body, StatusCode::UNPROCESSABLE_ENTITY, "rod");
    let (status, body) = app.patch_json(&path, &json!({"bore": null})).await;
    assert_field_error(status, &body, StatusCode::UNPROCESSABLE_ENTITY, "bore");
    let (status, body) = app
        .patch_json(
            &path,
            &json!({"rod": "2.5 in", "max_load": "40 kN", "function": null}),
        )
        .await;
    assert_eq!(status, StatusCode::OK, "{body}");
    assert!(close(body["rod"]["si"].as_f64().unwrap(), 2.5 * INCH));
    assert!(
        close(body["bore"]["si"].as_f64().unwrap(), 4.0 * INCH),
        "bore kept exactly"
    );
    assert!(body["function"].is_null());
    let log = audit(&app, "cylinder", id).await;
    assert_eq!(log.len(), 2, "refused patches leave no audit row");
    assert!(close(log[1].1["rod_m"].as_f64().unwrap(), 2.0 * INCH));
    assert!(close(log[1].2["rod_m"].as_f64().unwrap(), 2.5 * INCH));
}

#[tokio::test]
async fn a_cylinder_moves_machine_only_without_hoses() {
    let app = TestApp::new().await;
    let a = machine(&app, "HV-A").await;
    let b = machine(&app, "HV-B").await;
    let free = cylinder(&app, a).await;
    let fitted = cylinder(&app, a).await;
    hose(&app, fitted, "cap", "3000 psi").await;
    let (status, body) = app
        .patch_json(
            &format!("/api/v1/cylinders/{free}"),
            &json!({"machine_id": b}),
        )
        .await;
    assert_eq!(
        (status, body["machine_id"].clone()),
        (StatusCode::OK, json!(b))
    );
    let (status, body) = app
        .patch_json(
            &format!("/api/v1/cylinders/{fitted}"),
            &json!({"machine_id": b}),
        )
        .await;
    assert_field_error(status, &body, StatusCode::CONFLICT, "machine_id");
}

#[tokio::test]
async fn archived_cylinders_and_those_of_archived_machines_leave_the_list() {
    let app = TestApp::new().await;
    let north = site(&app, "North", "metric").await;
    let a = machine(&app, "HV-A").await;
    app.patch_json(&format!("/api/v1/machines/{a}"), &json!({"site_id": north}))
        .await;
    let b = machine(&app, "HV-B").await;
    let c1 = cylinder(&app, a).await;
    let c2 = cylinder(&app, a).await;
    let c3 = cylinder(&app, b).await;
    let (status, body) = app
        .json("DELETE", &format!("/api/v1/cylinders/{c2}"), None)
        .await;
    assert_eq!(
        (status, body["archived"].clone()),
        (StatusCode::OK, json!(true))
    );
    app.post_json(&format!("/api/v1/machines/{b}/archive"), &json!({}))
        .await;
    let (_, list) = app.get_json("/api/v1/cylinders").await;
    assert_eq!(ids(&list), vec![c1]);
    let (_, all) = app.get_json("/api/v1/cylinders?archived=true").await;
    assert_eq!(ids(&all), vec![c1, c2, c3]);
    let (_, by_site) = app
        .get_json(&format!("/api/v1/cylinders?site={north}&archived=1"))
        .await;
    assert_eq!(ids(&by_site), vec![c1, c2]);
    let (_, by_text) = app.get_json("/api/v1/cylinders?q=BOOM&machine=").await;
    assert_eq!(ids(&by_text), vec![c1]);
    let (status, one) = app.get_json(&format!("/api/v1/cylinders/{c2}")).await;
    assert_eq!(
        (status, one["archived"].clone()),
        (StatusCode::OK, json!(true))
    );
    let (status, _) = app
        .post_json("/api/v1/cylinders/999/archive", &json!({}))
        .await;
    assert_eq!(status, StatusCode::NOT_FOUND);
}

#[tokio::test]
async fn cylinders_page_through_without_repeats() {
    let app = TestApp::new().await;
    let m = machine(&app, "HV-01").await;
    let mut made = Vec::new();
    for _ in 0..5 {
        made.push(cylinder(&app, m).await);
    }
    let (seen, pages) = walk(&app, &format!("/api/v1/cylinders?machine={m}"), 2).await;
    assert_eq!((seen, pages), (made, 3));
}
