//! The registry's pages: fleet list, machine and cylinder pages, add and edit forms.

use crate::helpers::TestApp;
use crate::registry_fixtures::{hose, machine, machine_with, site};
use axum::http::{StatusCode, header};
use serde_json::json;

fn location(headers: &axum::http::HeaderMap) -> String {
    headers
        .get(header::LOCATION)
        .and_then(|v| v.to_str().ok())
        .unwrap_or_default()
        .to_string()
}

#[tokio::test]
async fn user_text_is_escaped_on_every_registry_page() {
    let app = TestApp::new().await;
    let evil = "<script>alert(1)</script>";
    let north = site(&app, evil, "metric").await;
    let body = machine_with(
        &app,
        json!({"unit_number": "HV-<b>1</b>", "kind": "telehandler", "description": evil, "site_id": north}),
    )
    .await;
    let m = body["id"].as_i64().unwrap();
    let (status, c) = app
        .post_json(
            "/api/v1/cylinders",
            &json!({"machine_id": m, "function": evil, "bore": "4 in", "rod": "2 in", "stroke": "24 in",
                    "load_direction": "retract", "notes": evil}),
        )
        .await;
    assert_eq!(status, StatusCode::CREATED);
    let c = c["id"].as_i64().unwrap();
    let (status, _) = app
        .post_json(
            "/api/v1/hoses",
            &json!({"machine_id": m, "circuit": evil, "spec": evil}),
        )
        .await;
    assert_eq!(status, StatusCode::CREATED);
    for path in [
        "/machines".to_string(),
        format!("/machines?q={}", "%3Cscript%3E"),
        format!("/machines/{m}"),
        format!("/machines/{m}/edit"),
        format!("/cylinders/{c}"),
        format!("/cylinders/{c}/edit"),
        "/sites".to_string(),
    ] {
        let (status, _, page) = app.get_page(&path).await;
        assert_eq!(status, StatusCode::OK, "{path}");
        assert!(
            !page.contains("<script>alert"),
            "{path} shows raw user script"
        );
        assert!(!page.contains("<b>1</b>"), "{path} shows raw user markup");
    }
    let (_, _, page) = app.get_page(&format!("/machines/{m}")).await;
    assert!(
        page.contains("&#60;script&#62;") || page.contains("&lt;script&gt;"),
        "escaped text is shown"
    );
}

#[tokio::test]
async fn the_fleet_list_searches_and_filters() {
    let app = TestApp::new().await;
    let north = site(&app, "North Yard", "metric").await;
    machine_with(
        &app,
        json!({"unit_number": "HV-TH-01", "kind": "telehandler", "site_id": north}),
    )
    .await;
    machine_with(
        &app,
        json!({"unit_number": "HV-EX-02", "kind": "excavator",
        "status": "out_of_service", "out_of_service_reason": "boom drifts"}),
    )
    .await;
    let (status, _, page) = app.get_page("/machines").await;
    assert_eq!(status, StatusCode::OK);
    assert!(page.contains("HV-TH-01") && page.contains("HV-EX-02"));
    assert!(page.contains("out of service"), "status shown by word");
    let (_, _, page) = app.get_page("/machines?q=ex-02").await;
    assert!(page.contains("HV-EX-02") && !page.contains("HV-TH-01"));
    let (_, _, page) = app.get_page(&format!("/machines?site={north}")).await;
    assert!(page.contains("HV-TH-01") && !page.contains("HV-EX-02"));
    let (_, _, page) = app
        .get_page("/machines?status=out_of_service&kind=excavator")
        .await;
    assert!(page.contains("HV-EX-02") && !page.contains("HV-TH-01"));
    let (status, _, page) = app.get_page("/machines?status=broken").await;
    assert_eq!(
        status,
        StatusCode::OK,
        "a bad filter is explained, not a failure"
    );
    assert!(page.contains("must be one of"));
}

#[tokio::test]
async fn the_cylinder_page_shows_seal_bypass_against_each_rating_with_cautions() {
    let app = TestApp::new().await;
    let port = site(&app, "Port Road", "us").await;
    let m = machine_with(
        &app,
        json!({"unit_number": "HV-BL-12", "kind": "boom lift", "site_id": port,
        "relief_pressure": "3000 psi"}),
    )
    .await["id"]
        .as_i64()
        .unwrap();
    // Common practice (REFERENCES.md "Trade facts"): 10,000 lbf on a 10 in² piston holds at
    // 1,000 psi; with a 2 in² rod a piston seal bypass brings both ends to 5,000 psi.
    // Diameters for those areas: sqrt(4 x 10 / pi) and sqrt(4 x 2 / pi) inches.
    let bore = format!("{} in", (40.0 / std::f64::consts::PI).sqrt());
    let rod = format!("{} in", (8.0 / std::f64::consts::PI).sqrt());
    let (status, c) = app
        .post_json(
            "/api/v1/cylinders",
            &json!({"machine_id": m, "function": "lower boom lift",
            "bore": bore, "rod": rod, "stroke": "28 in", "load_direction": "retract",
            "max_load": "10000 lbf", "rated_pressure": "6000 psi"}),
        )
        .await;
    assert_eq!(status, StatusCode::CREATED, "{c}");
    let c = c["id"].as_i64().unwrap();
    hose(&app, c, "cap", "3000 psi").await;
    let (status, _, page) = app.get_page(&format!("/cylinders/{c}")).await;
    assert_eq!(status, StatusCode::OK);
    assert!(
        page.contains("1000 psi"),
        "holding pressure in the site's units"
    );
    assert!(page.contains("5000 psi"), "seal-bypass pressure");
    assert!(page.contains("3000 psi"), "the hose's rating");
    assert!(
        page.contains("exceeds"),
        "the hose below the bypass pressure is flagged by word"
    );
    assert!(
        page.contains("Never feel for a leak") || page.contains("Never feel for leaks"),
        "cautions shown"
    );
    let (_, _, metric) = app.get_page(&format!("/cylinders/{c}?units=metric")).await;
    // 5000 psi = 344.7 bar (psi = 6894.757 Pa, NIST SP 811).
    assert!(metric.contains("344.7 bar"), "figures in metric on request");
    let (_, _, machine_page) = app.get_page(&format!("/machines/{m}")).await;
    assert!(machine_page.contains("lower boom lift") && machine_page.contains("exceeds"));
}

#[tokio::test]
async fn archiving_from_the_machine_page_keeps_the_record() {
    let app = TestApp::new().await;
    let m = machine(&app, "HV-TT-09").await;
    let (status, headers, _) = app.post_form(&format!("/machines/{m}/archive"), &[]).await;
    assert_eq!(
        (status, location(&headers)),
        (StatusCode::SEE_OTHER, format!("/machines/{m}"))
    );
    let (status, _, page) = app.get_page(&format!("/machines/{m}")).await;
    assert_eq!(status, StatusCode::OK);
    assert!(page.contains("archived"));
    let (_, _, list) = app.get_page("/machines").await;
    assert!(!list.contains("HV-TT-09"));
    let (_, _, list) = app.get_page("/machines?archived=true").await;
    assert!(list.contains("HV-TT-09"));
}

#[tokio::test]
async fn unknown_registry_pages_are_404_pages() {
    let app = TestApp::new().await;
    for path in [
        "/machines/999",
        "/machines/abc",
        "/cylinders/999",
        "/cylinders/1/edit",
        "/hoses/5/edit",
        "/sites/9/edit",
    ] {
        let (status, _, page) = app.get_page(path).await;
        assert_eq!(status, StatusCode::NOT_FOUND, "{path}");
        assert!(page.contains("<html"), "{path} is a page");
    }
}

#[tokio::test]
async fn rod_buckling_is_checked_only_where_the_mounting_is_recorded() {
    let app = TestApp::new().await;
    let m = machine(&app, "HV-PR-06").await;
    // REFERENCES.md "Rod buckling" [C]: d = 40 mm, L = 1000 mm, E = 210 GPa, K = 1 (pinned at
    // both ends) gives 260.45 kN; over the core's default factor of 3, 86.82 kN. The core takes
    // the free length as twice the stroke, so a 500 mm stroke gives L = 1000 mm.
    let (status, c) = app
        .post_json(
            "/api/v1/cylinders",
            &json!({"machine_id": m, "bore": "80 mm", "rod": "40 mm",
            "stroke": "500 mm", "load_direction": "retract", "max_load": "20 kN",
            "end_condition": "pinned_pinned"}),
        )
        .await;
    assert_eq!(status, StatusCode::CREATED, "{c}");
    let c = c["id"].as_i64().unwrap();
    let (_, _, page) = app.get_page(&format!("/cylinders/{c}?units=metric")).await;
    assert!(
        page.contains("Euler with K = 1, 86.82 kN"),
        "Euler allowable shown"
    );
    // Beside it the Johnson parabola (standard machine-design texts, e.g. Shigley, from
    // memory): r = d/4 = 10 mm, K L / r = 100, below sqrt(2 pi² E / sigma_y) = 108.1 with the
    // default 355 MPa yield, so sigma_cr = 355 - (355/(2 pi))² x 100² / 210000 = 202.99 MPa,
    // x 1256.6 mm² = 255.08 kN, over 3 = 85.03 kN: the lower allowable governs.
    assert!(page.contains("against an allowable 85.03 kN"), "governing");
    assert!(
        page.contains("assumed: twice the stroke"),
        "length said as assumed"
    );
    assert!(page.contains("355 MPa (assumed"), "yield said as assumed");
    // The free length recorded: 0.8 m, K L / r = 80: sigma_cr = 355 - 3.1922e15 x 6400 /
    // 2.1e11 = 257.71 MPa, x 1256.6 mm² = 323.85 kN, over 3 = 107.95 kN.
    app.patch_json(
        &format!("/api/v1/cylinders/{c}"),
        &json!({"buckling_length": "800 mm"}),
    )
    .await;
    let (_, _, page) = app.get_page(&format!("/cylinders/{c}?units=metric")).await;
    assert!(
        page.contains("against an allowable 108 kN"),
        "recorded length"
    );
    assert!(!page.contains("assumed: twice the stroke"));
    app.patch_json(
        &format!("/api/v1/cylinders/{c}"),
        &json!({"end_condition": null}),
    )
    .await;
    let (_, _, page) = app.get_page(&format!("/cylinders/{c}")).await;
    assert!(page.contains("not checked: record the mounting"));
    assert!(!page.contains("86.82 kN"));
}

#[tokio::test]
async fn edit_controls_are_shown_only_to_roles_that_may_edit() {
    let admin = TestApp::new().await;
    let m = machine(&admin, "HV-EX-11").await;
    let mut tech = admin.client();
    tech.add_user("tess", loadhold::auth::Role::Technician)
        .await;
    assert_eq!(
        tech.login("tess", crate::helpers::TEST_PASSWORD).await,
        StatusCode::SEE_OTHER
    );
    let (status, _, page) = tech.get_page(&format!("/machines/{m}")).await;
    assert_eq!(status, StatusCode::OK);
    assert!(page.contains("HV-EX-11"));
    assert!(
        !page.contains(&format!("/machines/{m}/edit")),
        "no edit link for a technician"
    );
    assert!(!page.contains("Add a cylinder"));
    let (_, _, list) = tech.get_page("/machines").await;
    assert!(!list.contains("/machines/new"));
    let (_, _, page) = admin.get_page(&format!("/machines/{m}")).await;
    assert!(page.contains(&format!("/machines/{m}/edit")) && page.contains("Add a cylinder"));
}
