//! `GET /api/v1/machines`: filters and keyset pages.

use crate::helpers::{TestApp, assert_field_error};
use crate::registry_fixtures::{ids, machine, machine_with, site, walk};
use axum::http::StatusCode;
use serde_json::json;

#[tokio::test]
async fn the_fleet_list_filters_by_site_status_kind_and_text() {
    let app = TestApp::new().await;
    let north = site(&app, "North", "metric").await;
    let quarry = site(&app, "Quarry", "metric").await;
    let a = machine_with(
        &app,
        json!({"unit_number": "HV-TH-01", "kind": "telehandler", "site_id": north}),
    )
    .await["id"]
        .as_i64()
        .unwrap();
    let b = machine_with(&app, json!({"unit_number": "HV-EX-02", "kind": "excavator", "site_id": quarry, "description": "100% electric mini digger"})).await["id"].as_i64().unwrap();
    let c = machine_with(&app, json!({"unit_number": "HV-TH-03", "kind": "telehandler", "site_id": quarry,
        "status": "out_of_service", "out_of_service_reason": "lift cylinder drifting", "serial": "ZX-77"})).await["id"].as_i64().unwrap();
    for (query, expected) in [
        (format!("site={north}"), vec![a]),
        (format!("site={quarry}"), vec![b, c]),
        ("status=out_of_service".into(), vec![c]),
        ("status=in_service".into(), vec![a, b]),
        ("kind=Telehandler".into(), vec![a, c]),
        ("q=hv-th".into(), vec![a, c]),
        ("q=zx-7".into(), vec![c]),
        ("q=100%25".into(), vec![b]),
        ("q=0%25".into(), vec![b]),
        ("q=_X".into(), vec![]),
        (format!("site={quarry}&kind=telehandler"), vec![c]),
    ] {
        let (status, body) = app.get_json(&format!("/api/v1/machines?{query}")).await;
        assert_eq!(status, StatusCode::OK, "{query}: {body}");
        assert_eq!(ids(&body), expected, "{query}");
    }
    for (query, field) in [
        ("status=broken", "status"),
        ("site=x", "site"),
        ("limit=0", "limit"),
        ("cursor=z", "cursor"),
        ("colour=red", "colour"),
        ("units=si", "units"),
    ] {
        let (status, body) = app.get_json(&format!("/api/v1/machines?{query}")).await;
        assert_field_error(status, &body, StatusCode::UNPROCESSABLE_ENTITY, field);
    }
}

#[tokio::test]
async fn machines_page_through_in_one_order_without_repeats() {
    let app = TestApp::new().await;
    let mut made = Vec::new();
    for n in 0..7 {
        made.push(machine(&app, &format!("HV-{n:02}")).await);
    }
    let (seen, pages) = walk(&app, "/api/v1/machines", 3).await;
    assert_eq!(seen, made);
    assert_eq!(pages, 3);
    let (seen, pages) = walk(&app, "/api/v1/machines?kind=telehandler", 7).await;
    assert_eq!(
        (seen.len(), pages),
        (7, 1),
        "an exact page has no next cursor"
    );
}
