//! The registry's add and edit forms: POST-redirect-GET, refused forms kept and marked.

use crate::helpers::TestApp;
use crate::registry_fixtures::machine;
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
async fn a_machine_added_through_the_form_redirects_to_its_page() {
    let app = TestApp::new().await;
    let (status, _, form) = app.get_page("/machines/new").await;
    assert_eq!(status, StatusCode::OK);
    assert!(
        form.contains("name=\"csrf\""),
        "the form carries the anti-forgery field"
    );
    assert!(form.contains("name=\"relief_pressure\""));
    let (status, headers, _) = app
        .post_form(
            "/machines",
            &[
                ("unit_number", "HV-SL-05"),
                ("kind", "scissor lift"),
                ("relief_pressure", "180 bar"),
                ("hour_meter", "1544"),
                ("periodic_interval_days", "180"),
                ("status", "in_service"),
                ("site_id", ""),
                ("serial", ""),
            ],
        )
        .await;
    assert_eq!(status, StatusCode::SEE_OTHER);
    let at = location(&headers);
    assert!(at.starts_with("/machines/"), "{at}");
    let (status, _, page) = app.get_page(&at).await;
    assert_eq!(status, StatusCode::OK);
    assert!(
        page.contains("HV-SL-05") && page.contains("180 bar") && page.contains("every 180 days")
    );
}

#[tokio::test]
async fn a_refused_form_keeps_every_value_and_marks_the_field() {
    let app = TestApp::new().await;
    machine(&app, "HV-01").await;
    let (status, _, page) = app
        .post_form(
            "/machines",
            &[
                ("unit_number", "HV-01"),
                ("kind", "loader"),
                ("description", "keep me"),
                ("relief_pressure", "250"),
                ("status", "in_service"),
            ],
        )
        .await;
    assert_eq!(status, StatusCode::UNPROCESSABLE_ENTITY);
    assert!(page.contains("value=\"keep me\""), "typed values are kept");
    assert!(page.contains("value=\"250\""));
    assert!(
        page.contains("id=\"err-relief_pressure\""),
        "error beside the field"
    );
    assert!(page.contains("aria-invalid=\"true\""));
    assert!(
        page.contains("a unit is required"),
        "the message says what to write"
    );

    let (status, _, page) = app
        .post_form(
            "/machines",
            &[
                ("unit_number", "HV-01"),
                ("kind", "loader"),
                ("status", "in_service"),
            ],
        )
        .await;
    assert_eq!(status, StatusCode::UNPROCESSABLE_ENTITY);
    assert!(
        page.contains("id=\"err-unit_number\""),
        "a duplicate unit number is shown on its field"
    );
}

#[tokio::test]
async fn an_unchanged_edit_form_keeps_stored_figures_exactly() {
    let app = TestApp::new().await;
    let m = machine(&app, "HV-02").await;
    // 3000 psi shown in bar on a metric page is 206.843 bar, a rounded figure.
    app.patch_json(
        &format!("/api/v1/machines/{m}"),
        &json!({"relief_pressure": "3000 psi"}),
    )
    .await;
    let before: f64 = sqlx::query_scalar("SELECT relief_pressure_pa FROM machines WHERE id = ?")
        .bind(m)
        .fetch_one(&app.db)
        .await
        .unwrap();
    let (_, _, form) = app.get_page(&format!("/machines/{m}/edit")).await;
    assert!(
        form.contains("value=\"206.843 bar\""),
        "prefilled in the site's units"
    );
    let (status, headers, _) = app
        .post_form(
            &format!("/machines/{m}/edit"),
            &[
                ("unit_number", "HV-02"),
                ("kind", "telehandler"),
                ("relief_pressure", "206.843 bar"),
                ("description", "now described"),
                ("status", "in_service"),
            ],
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
async fn cylinders_and_hoses_are_added_and_edited_through_forms() {
    let app = TestApp::new().await;
    let m = machine(&app, "HV-EX-03").await;
    let (status, _, form) = app.get_page(&format!("/machines/{m}/cylinders/new")).await;
    assert_eq!(status, StatusCode::OK);
    assert!(form.contains("name=\"bore\"") && form.contains("name=\"csrf\""));
    let (status, _, page) = app
        .post_form(
            &format!("/machines/{m}/cylinders/new"),
            &[
                ("function", "bucket"),
                ("bore", "80 mm"),
                ("rod", "90 mm"),
                ("stroke", "700 mm"),
                ("load_direction", "retract"),
            ],
        )
        .await;
    assert_eq!(status, StatusCode::UNPROCESSABLE_ENTITY);
    assert!(page.contains("id=\"err-rod\"") && page.contains("value=\"90 mm\""));
    let (status, headers, _) = app
        .post_form(
            &format!("/machines/{m}/cylinders/new"),
            &[
                ("function", "bucket"),
                ("bore", "80 mm"),
                ("rod", "45 mm"),
                ("stroke", "700 mm"),
                ("load_direction", "retract"),
                ("end_condition", ""),
            ],
        )
        .await;
    assert_eq!(status, StatusCode::SEE_OTHER);
    let at = location(&headers);
    let c: i64 = at
        .trim_start_matches("/cylinders/")
        .parse()
        .expect("cylinder id");
    let (status, headers, _) = app
        .post_form(
            &format!("/cylinders/{c}/edit"),
            &[
                ("function", "bucket"),
                ("bore", "80 mm"),
                ("rod", "45 mm"),
                ("stroke", "720 mm"),
                ("load_direction", "retract"),
            ],
        )
        .await;
    assert_eq!(
        (status, location(&headers)),
        (StatusCode::SEE_OTHER, at.clone())
    );
    let (_, body) = app.get_json(&format!("/api/v1/cylinders/{c}")).await;
    assert!((body["stroke"]["si"].as_f64().unwrap() - 0.72).abs() < 1e-12);

    let (status, headers, _) = app
        .post_form(
            &format!("/machines/{m}/hoses/new"),
            &[
                ("cylinder_id", &c.to_string()),
                ("port", "rod"),
                ("spec", "EN 853 2SN"),
                ("size", "DN12"),
                ("working_pressure", "275 bar"),
                ("replace_by", "2020-01-01"),
            ],
        )
        .await;
    assert_eq!(
        (status, location(&headers)),
        (StatusCode::SEE_OTHER, format!("/machines/{m}"))
    );
    let (_, _, page) = app.get_page(&format!("/machines/{m}")).await;
    assert!(
        page.contains("EN 853 2SN") && page.contains("past replace by"),
        "a hose past its date is flagged by word"
    );
    let (status, _, page) = app
        .post_form(
            &format!("/machines/{m}/hoses/new"),
            &[("port", "cap"), ("spec", "SAE 100R1AT")],
        )
        .await;
    assert_eq!(status, StatusCode::UNPROCESSABLE_ENTITY);
    assert!(page.contains("id=\"err-cylinder_id\"") && page.contains("value=\"SAE 100R1AT\""));
}

#[tokio::test]
async fn sites_are_added_from_the_sites_page() {
    let app = TestApp::new().await;
    let (status, headers, _) = app
        .post_form(
            "/sites",
            &[("name", "Quarry Lane Depot"), ("units", "metric")],
        )
        .await;
    assert_eq!(
        (status, location(&headers)),
        (StatusCode::SEE_OTHER, "/sites".to_string())
    );
    let (_, _, page) = app.get_page("/sites").await;
    assert!(page.contains("Quarry Lane Depot"));
    let (status, _, page) = app
        .post_form(
            "/sites",
            &[("name", "Quarry Lane Depot"), ("units", "metric")],
        )
        .await;
    assert_eq!(status, StatusCode::UNPROCESSABLE_ENTITY);
    assert!(page.contains("id=\"err-name\""));
}
