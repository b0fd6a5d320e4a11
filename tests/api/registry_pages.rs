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
        .post_json("/api/v1/hoses", &json!({"machine_id": m, "circuit": evil, "spec": evil}))
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
        assert!(!page.contains("<script>alert"), "{path} shows raw user script");
        assert!(!page.contains("<b>1</b>"), "{path} shows raw user markup");
    }
    let (_, _, page) = app.get_page(&format!("/machines/{m}")).await;
    assert!(page.contains("&#60;script&#62;") || page.contains("&lt;script&gt;"), "escaped text is shown");
}

#[tokio::test]
async fn the_fleet_list_searches_and_filters() {
    let app = TestApp::new().await;
    let north = site(&app, "North Yard", "metric").await;
    machine_with(&app, json!({"unit_number": "HV-TH-01", "kind": "telehandler", "site_id": north})).await;
    machine_with(&app, json!({"unit_number": "HV-EX-02", "kind": "excavator",
        "status": "out_of_service", "out_of_service_reason": "boom drifts"})).await;
    let (status, _, page) = app.get_page("/machines").await;
    assert_eq!(status, StatusCode::OK);
    assert!(page.contains("HV-TH-01") && page.contains("HV-EX-02"));
    assert!(page.contains("out of service"), "status shown by word");
    let (_, _, page) = app.get_page("/machines?q=ex-02").await;
    assert!(page.contains("HV-EX-02") && !page.contains("HV-TH-01"));
    let (_, _, page) = app.get_page(&format!("/machines?site={north}")).await;
    assert!(page.contains("HV-TH-01") && !page.contains("HV-EX-02"));
    let (_, _, page) = app.get_page("/machines?status=out_of_service&kind=excavator").await;
    assert!(page.contains("HV-EX-02") && !page.contains("HV-TH-01"));
    let (status, _, page) = app.get_page("/machines?status=broken").await;
    assert_eq!(status, StatusCode::OK, "a bad filter is explained, not a failure");
    assert!(page.contains("must be one of"));
}

#[tokio::test]
async fn a_machine_added_through_the_form_redirects_to_its_page() {
    let app = TestApp::new().await;
    let (status, _, form) = app.get_page("/machines/new").await;
    assert_eq!(status, StatusCode::OK);
    assert!(form.contains("name=\"csrf\""), "the form carries the anti-forgery field");
    assert!(form.contains("name=\"relief_pressure\""));
    let (status, headers, _) = app
        .post_form(
            "/machines",
            &[("unit_number", "HV-SL-05"), ("kind", "scissor lift"), ("relief_pressure", "180 bar"),
              ("hour_meter", "1544"), ("periodic_interval_days", "180"), ("status", "in_service"),
              ("site_id", ""), ("serial", "")],
        )
        .await;
    assert_eq!(status, StatusCode::SEE_OTHER);
    let at = location(&headers);
    assert!(at.starts_with("/machines/"), "{at}");
    let (status, _, page) = app.get_page(&at).await;
    assert_eq!(status, StatusCode::OK);
    assert!(page.contains("HV-SL-05") && page.contains("180 bar") && page.contains("every 180 days"));
}

#[tokio::test]
async fn a_refused_form_keeps_every_value_and_marks_the_field() {
    let app = TestApp::new().await;
    machine(&app, "HV-01").await;
    let (status, _, page) = app
        .post_form(
            "/machines",
            &[("unit_number", "HV-01"), ("kind", "loader"), ("description", "keep me"),
              ("relief_pressure", "250"), ("status", "in_service")],
        )
        .await;
    assert_eq!(status, StatusCode::UNPROCESSABLE_ENTITY);
    assert!(page.contains("value=\"keep me\""), "typed values are kept");
    assert!(page.contains("value=\"250\""));
    assert!(page.contains("id=\"err-relief_pressure\""), "error beside the field");
    assert!(page.contains("aria-invalid=\"true\""));
    assert!(page.contains("a unit is required"), "the message says what to write");

    let (status, _, page) = app
        .post_form("/machines", &[("unit_number", "HV-01"), ("kind", "loader"), ("status", "in_service")])
        .await;
    assert_eq!(status, StatusCode::UNPROCESSABLE_ENTITY);
    assert!(page.contains("id=\"err-unit_number\""), "a duplicate unit number is shown on its field");
}

#[tokio::test]
async fn an_unchanged_edit_form_keeps_stored_figures_exactly() {
    let app = TestApp::new().await;
    let m = machine(&app, "HV-02").await;
    // 3000 psi shown in bar on a metric page is 206.843 bar, a rounded figure.
    app.patch_json(&format!("/api/v1/machines/{m}"), &json!({"relief_pressure": "3000 psi"})).await;
    let before: f64 = sqlx::query_scalar("SELECT relief_pressure_pa FROM machines WHERE id = ?")
        .bind(m)
        .fetch_one(&app.db)
        .await
        .unwrap();
    let (_, _, form) = app.get_page(&format!("/machines/{m}/edit")).await;
    assert!(form.contains("value=\"206.843 bar\""), "prefilled in the site's units");
    let (status, headers, _) = app
        .post_form(
            &format!("/machines/{m}/edit"),
            &[("unit_number", "HV-02"), ("kind", "telehandler"), ("relief_pressure", "206.843 bar"),
              ("description", "now described"), ("status", "in_service")],
        )
        .await;
    assert_eq!(status, StatusCode::SEE_OTHER);
    assert_eq!(location(&headers), format!("/machines/{m}"));
    let (after, description): (f64, String) =
        sqlx::query_as("SELECT relief_pressure_pa, description FROM machines WHERE id = ?")
            .bind(m)
            .fetch_one(&app.db)
            .await
            .unwrap();
    assert_eq!(after, before, "a figure left as shown is not rounded");
    assert_eq!(description, "now described");
}

#[tokio::test]
async fn the_cylinder_page_shows_seal_bypass_against_each_rating_with_cautions() {
    let app = TestApp::new().await;
    let port = site(&app, "Port Road", "us").await;
    let m = machine_with(&app, json!({"unit_number": "HV-BL-12", "kind": "boom lift", "site_id": port,
        "relief_pressure": "3000 psi"})).await["id"].as_i64().unwrap();
    // Common practice (REFERENCES.md "Trade facts"): 10,000 lbf on a 10 in² piston holds at
    // 1,000 psi; with a 2 in² rod a piston seal bypass brings both ends to 5,000 psi.
    // Diameters for those areas: sqrt(4 x 10 / pi) and sqrt(4 x 2 / pi) inches.
    let bore = format!("{} in", (40.0 / std::f64::consts::PI).sqrt());
    let rod = format!("{} in", (8.0 / std::f64::consts::PI).sqrt());
    let (status, c) = app
        .post_json("/api/v1/cylinders", &json!({"machine_id": m, "function": "lower boom lift",
            "bore": bore, "rod": rod, "stroke": "28 in", "load_direction": "retract",
            "max_load": "10000 lbf", "rated_pressure": "6000 psi"}))
        .await;
    assert_eq!(status, StatusCode::CREATED, "{c}");
    let c = c["id"].as_i64().unwrap();
    hose(&app, c, "cap", "3000 psi").await;
    let (status, _, page) = app.get_page(&format!("/cylinders/{c}")).await;
    assert_eq!(status, StatusCode::OK);
    assert!(page.contains("1000 psi"), "holding pressure in the site's units");
    assert!(page.contains("5000 psi"), "seal-bypass pressure");
    assert!(page.contains("3000 psi"), "the hose's rating");
    assert!(page.contains("exceeds"), "the hose below the bypass pressure is flagged by word");
    assert!(page.contains("Never feel for a leak") || page.contains("Never feel for leaks"), "cautions shown");
    let (_, _, metric) = app.get_page(&format!("/cylinders/{c}?units=metric")).await;
    // 5000 psi = 344.7 bar (psi = 6894.757 Pa, NIST SP 811).
    assert!(metric.contains("344.7 bar"), "figures in metric on request");
    let (_, _, machine_page) = app.get_page(&format!("/machines/{m}")).await;
    assert!(machine_page.contains("lower boom lift") && machine_page.contains("exceeds"));
}

#[tokio::test]
async fn cylinders_and_hoses_are_added_and_edited_through_forms() {
    let app = TestApp::new().await;
    let m = machine(&app, "HV-EX-03").await;
    let (status, _, form) = app.get_page(&format!("/machines/{m}/cylinders/new")).await;
    assert_eq!(status, StatusCode::OK);
    assert!(form.contains("name=\"bore\"") && form.contains("name=\"csrf\""));
    let (status, _, page) = app
        .post_form(&format!("/machines/{m}/cylinders/new"),
            &[("function", "bucket"), ("bore", "80 mm"), ("rod", "90 mm"), ("stroke", "700 mm"), ("load_direction", "retract")])
        .await;
    assert_eq!(status, StatusCode::UNPROCESSABLE_ENTITY);
    assert!(page.contains("id=\"err-rod\"") && page.contains("value=\"90 mm\""));
    let (status, headers, _) = app
        .post_form(&format!("/machines/{m}/cylinders/new"),
            &[("function", "bucket"), ("bore", "80 mm"), ("rod", "45 mm"), ("stroke", "700 mm"), ("load_direction", "retract"), ("end_condition", "")])
        .await;
    assert_eq!(status, StatusCode::SEE_OTHER);
    let at = location(&headers);
    let c: i64 = at.trim_start_matches("/cylinders/").parse().expect("cylinder id");
    let (status, headers, _) = app
        .post_form(&format!("/cylinders/{c}/edit"),
            &[("function", "bucket"), ("bore", "80 mm"), ("rod", "45 mm"), ("stroke", "720 mm"), ("load_direction", "retract")])
        .await;
    assert_eq!((status, location(&headers)), (StatusCode::SEE_OTHER, at.clone()));
    let (_, body) = app.get_json(&format!("/api/v1/cylinders/{c}")).await;
    assert!((body["stroke"]["si"].as_f64().unwrap() - 0.72).abs() < 1e-12);

    let (status, headers, _) = app
        .post_form(&format!("/machines/{m}/hoses/new"),
            &[("cylinder_id", &c.to_string()), ("port", "rod"), ("spec", "EN 853 2SN"), ("size", "DN12"), ("working_pressure", "275 bar"), ("replace_by", "2020-01-01")])
        .await;
    assert_eq!((status, location(&headers)), (StatusCode::SEE_OTHER, format!("/machines/{m}")));
    let (_, _, page) = app.get_page(&format!("/machines/{m}")).await;
    assert!(page.contains("EN 853 2SN") && page.contains("past replace by"), "a hose past its date is flagged by word");
    let (status, _, page) = app
        .post_form(&format!("/machines/{m}/hoses/new"), &[("port", "cap"), ("spec", "SAE 100R1AT")])
        .await;
    assert_eq!(status, StatusCode::UNPROCESSABLE_ENTITY);
    assert!(page.contains("id=\"err-cylinder_id\"") && page.contains("value=\"SAE 100R1AT\""));
}

#[tokio::test]
async fn archiving_from_the_machine_page_keeps_the_record() {
    let app = TestApp::new().await;
    let m = machine(&app, "HV-TT-09").await;
    let (status, headers, _) = app.post_form(&format!("/machines/{m}/archive"), &[]).await;
    assert_eq!((status, location(&headers)), (StatusCode::SEE_OTHER, format!("/machines/{m}")));
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
    for path in ["/machines/999", "/machines/abc", "/cylinders/999", "/cylinders/1/edit", "/hoses/5/edit", "/sites/9/edit"] {
        let (status, _, page) = app.get_page(path).await;
        assert_eq!(status, StatusCode::NOT_FOUND, "{path}");
        assert!(page.contains("<html"), "{path} is a page");
    }
}

#[tokio::test]
async fn sites_are_added_from_the_sites_page() {
    let app = TestApp::new().await;
    let (status, headers, _) = app.post_form("/sites", &[("name", "Quarry Lane Depot"), ("units", "metric")]).await;
    assert_eq!((status, location(&headers)), (StatusCode::SEE_OTHER, "/sites".to_string()));
    let (_, _, page) = app.get_page("/sites").await;
    assert!(page.contains("Quarry Lane Depot"));
    let (status, _, page) = app.post_form("/sites", &[("name", "Quarry Lane Depot"), ("units", "metric")]).await;
    assert_eq!(status, StatusCode::UNPROCESSABLE_ENTITY);
    assert!(page.contains("id=\"err-name\""));
}
