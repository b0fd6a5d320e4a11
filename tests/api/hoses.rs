//! `/api/v1/hoses`: hose assemblies on a cylinder port or a named circuit.

use crate::helpers::{TestApp, assert_field_error};
use crate::registry_fixtures::{audit, cylinder, hose, ids, machine, site, walk};
use axum::http::StatusCode;
use serde_json::json;

/// psi in pascals (lbf/in², NIST SP 811).
const PSI: f64 = 4.4482216152605 / (0.0254 * 0.0254);

#[tokio::test]
async fn a_hose_on_a_cylinder_port_takes_its_machine_from_the_cylinder() {
    let app = TestApp::new().await;
    let port = site(&app, "Port Road", "us").await;
    let m = machine(&app, "HV-BL-12").await;
    app.patch_json(&format!("/api/v1/machines/{m}"), &json!({"site_id": port}))
        .await;
    let c = cylinder(&app, m).await;
    let (status, body) = app
        .post_json(
            "/api/v1/hoses",
            &json!({
                "cylinder_id": c, "port": "cap", "spec": "SAE 100R2AT", "size": "-8",
                "inside_diameter": "0.5 in", "length": "48 in", "working_pressure": "3500 psi",
                "made_in": "2024-q2", "installed_on": "2024-07-01", "replace_by": "2030-07-01",
            }),
        )
        .await;
    assert_eq!(status, StatusCode::CREATED, "{body}");
    assert_eq!(body["machine_id"], m);
    assert_eq!(body["made_in"], "2024-Q2", "one spelling of the quarter");
    assert_eq!(body["units"], "us", "the site's units");
    assert_eq!(body["working_pressure"]["unit"], "psi");
    let si = body["working_pressure"]["si"].as_f64().unwrap();
    assert!((si - 3500.0 * PSI).abs() < 1e-6);
    let id = body["id"].as_i64().unwrap();
    assert_eq!(audit(&app, "hose", id).await[0].0, "create");
}

#[tokio::test]
async fn a_circuit_hose_needs_the_machine_and_the_circuit_name() {
    let app = TestApp::new().await;
    let m = machine(&app, "HV-01").await;
    let (status, body) = app
        .post_json(
            "/api/v1/hoses",
            &json!({"machine_id": m, "circuit": "pump to valve", "spec": "EN 853 2SN", "size": "DN12", "working_pressure": "275 bar"}),
        )
        .await;
    assert_eq!(status, StatusCode::CREATED, "{body}");
    assert!(body["cylinder_id"].is_null() && body["port"].is_null());
    assert_eq!(body["working_pressure"]["unit"], "bar");
}

#[tokio::test]
async fn every_kind_of_bad_hose_input_names_its_field() {
    let app = TestApp::new().await;
    let a = machine(&app, "HV-A").await;
    let b = machine(&app, "HV-B").await;
    let ca = cylinder(&app, a).await;
    let cb = cylinder(&app, b).await;
    let cases = [
        ("port", json!({"machine_id": a, "cylinder_id": ca})),
        ("port", json!({"cylinder_id": ca, "port": "side"})),
        ("cylinder_id", json!({"machine_id": a, "port": "cap"})),
        ("circuit", json!({"machine_id": a})),
        ("machine_id", json!({"circuit": "pump line"})),
        (
            "machine_id",
            json!({"machine_id": 404, "circuit": "pump line"}),
        ),
        (
            "cylinder_id",
            json!({"machine_id": a, "cylinder_id": cb, "port": "rod"}),
        ),
        ("cylinder_id", json!({"cylinder_id": 404, "port": "rod"})),
        (
            "working_pressure",
            json!({"cylinder_id": ca, "port": "cap", "working_pressure": 3000}),
        ),
        (
            "working_pressure",
            json!({"cylinder_id": ca, "port": "cap", "working_pressure": "3000 in"}),
        ),
        (
            "length",
            json!({"cylinder_id": ca, "port": "cap", "length": "0 mm"}),
        ),
        (
            "made_in",
            json!({"cylinder_id": ca, "port": "cap", "made_in": "2024-Q5"}),
        ),
        (
            "made_in",
            json!({"cylinder_id": ca, "port": "cap", "made_in": "June 2024"}),
        ),
        (
            "installed_on",
            json!({"cylinder_id": ca, "port": "cap", "installed_on": "2024-13-01"}),
        ),
        (
            "installed_on",
            json!({"cylinder_id": ca, "port": "cap", "made_in": "2024-Q3", "installed_on": "2024-06-30"}),
        ),
        (
            "replace_by",
            json!({"cylinder_id": ca, "port": "cap", "installed_on": "2024-06-30", "replace_by": "2024-01-01"}),
        ),
        (
            "size",
            json!({"cylinder_id": ca, "port": "cap", "size": "x".repeat(21)}),
        ),
        (
            "colour",
            json!({"cylinder_id": ca, "port": "cap", "colour": "black"}),
        ),
    ];
    for (field, body) in cases {
        let (status, answer) = app.post_json("/api/v1/hoses", &body).await;
        assert_field_error(status, &answer, StatusCode::UNPROCESSABLE_ENTITY, field);
    }
    let (_, list) = app.get_json("/api/v1/hoses?archived=true").await;
    assert!(ids(&list).is_empty(), "no refused hose was stored");
}

#[tokio::test]
async fn a_hose_patch_validates_the_merged_record_and_archive_keeps_it() {
    let app = TestApp::new().await;
    let m = machine(&app, "HV-01").await;
    let c = cylinder(&app, m).await;
    let id = hose(&app, c, "cap", "3500 psi").await;
    let path = format!("/api/v1/hoses/{id}");
    let (status, body) = app.patch_json(&path, &json!({"cylinder_id": null})).await;
    assert_field_error(
        status,
        &body,
        StatusCode::UNPROCESSABLE_ENTITY,
        "cylinder_id",
    );
    let (status, body) = app
        .patch_json(
            &path,
            &json!({"cylinder_id": null, "port": null, "circuit": "return line"}),
        )
        .await;
    assert_eq!(status, StatusCode::OK, "{body}");
    assert_eq!(body["circuit"], "return line");
    let (status, body) = app.patch_json(&path, &json!({"port": "rod"})).await;
    assert_field_error(
        status,
        &body,
        StatusCode::UNPROCESSABLE_ENTITY,
        "cylinder_id",
    );
    let (status, body) = app.post_json(&format!("{path}/archive"), &json!({})).await;
    assert_eq!(
        (status, body["archived"].clone()),
        (StatusCode::OK, json!(true))
    );
    let (_, list) = app.get_json("/api/v1/hoses").await;
    assert!(ids(&list).is_empty());
    let (_, all) = app.get_json("/api/v1/hoses?archived=true").await;
    assert_eq!(ids(&all), vec![id]);
    let (status, _) = app.json("DELETE", "/api/v1/hoses/999", None).await;
    assert_eq!(status, StatusCode::NOT_FOUND);
    let actions: Vec<String> = audit(&app, "hose", id)
        .await
        .into_iter()
        .map(|r| r.0)
        .collect();
    assert_eq!(actions, ["create", "update", "archive"]);
}

#[tokio::test]
async fn hoses_filter_by_machine_cylinder_and_text_and_page_through() {
    let app = TestApp::new().await;
    let a = machine(&app, "HV-A").await;
    let b = machine(&app, "HV-B").await;
    let ca = cylinder(&app, a).await;
    let cb = cylinder(&app, b).await;
    let mut on_a = Vec::new();
    for port in ["cap", "rod", "cap", "rod"] {
        on_a.push(hose(&app, ca, port, "3500 psi").await);
    }
    let on_b = hose(&app, cb, "cap", "3500 psi").await;
    let (seen, pages) = walk(&app, &format!("/api/v1/hoses?machine={a}"), 3).await;
    assert_eq!((seen, pages), (on_a.clone(), 2));
    let (_, body) = app.get_json(&format!("/api/v1/hoses?cylinder={cb}")).await;
    assert_eq!(ids(&body), vec![on_b]);
    let (_, body) = app.get_json("/api/v1/hoses?q=hv-b").await;
    assert_eq!(ids(&body), vec![on_b]);
    let (_, body) = app.get_json("/api/v1/hoses?q=100r2").await;
    assert_eq!(ids(&body).len(), 5);
}
