//! The `/calc` page, in-process: a GET form that works without JavaScript, the same
//! results as the calculation API in US and metric units, errors beside their fields.

use crate::helpers::TestApp;
use axum::http::StatusCode;

#[tokio::test]
async fn calc_page_shows_the_form_without_javascript() {
    let app = TestApp::new().await;
    let (status, _, page) = app.get_page("/calc").await;
    assert_eq!(status, StatusCode::OK);
    assert!(page.contains("<form method=\"get\" action=\"/calc\""));
    assert!(page.contains("name=\"bore\"") && page.contains("name=\"ratings.cap_line\""));
    assert!(!page.contains("Hazard:"));
}

#[tokio::test]
async fn calc_page_shows_the_same_results_in_us_and_metric_units() {
    let app = TestApp::new().await;
    let query = "/calc?units=us&bore=3.568248+in&rod=1.595769+in&stroke=24+in&load=10000+lbf&load_direction=retract&ratings.cap_line=3000+psi";
    let (status, _, page) = app.get_page(query).await;
    assert_eq!(status, StatusCode::OK, "{page}");
    assert!(page.contains("5000 psi"), "bypass pressure in psi");
    assert!(
        page.contains("Hazard:") && page.contains("injection injury"),
        "cautions beside the hazard"
    );
    assert!(page.contains("exceeds"));
    // Metric: 5000 psi = 344.7 bar [C].
    let (status, _, page) = app
        .get_page(&query.replace("units=us", "units=metric"))
        .await;
    assert_eq!(status, StatusCode::OK);
    assert!(page.contains("344.7 bar"), "bypass pressure in bar");
}

#[tokio::test]
async fn calc_page_shows_a_drift_analysis() {
    let app = TestApp::new().await;
    let query = "/calc?bore=100+mm&rod=70+mm&stroke=1000+mm&load=100+kN&load_direction=retract&duration=30+min&drift=2.2+mm&oil_temperature_start=50+degC&oil_temperature_end=44+degC";
    let (status, _, page) = app.get_page(query).await;
    assert_eq!(status, StatusCode::OK, "{page}");
    assert!(page.contains("thermal contraction"));
    assert!(page.contains("Oil cooled 6 degC"));
}

#[tokio::test]
async fn calc_page_puts_the_error_beside_the_field() {
    let app = TestApp::new().await;
    let (status, _, page) = app
        .get_page("/calc?bore=4&rod=2+in&stroke=24+in&load=1000+lbf")
        .await;
    assert_eq!(status, StatusCode::UNPROCESSABLE_ENTITY);
    assert!(
        page.contains("id=\"err-bore\""),
        "error beside the bore input"
    );
    assert!(page.contains("value=\"4\""), "the typed value is kept");
    let (status, _, page) = app.get_page("/calc?bore=4+in&rod=2+in&stroke=24+in&load=1000+lbf&load_direction=retract&decay.pressurised_end=cap&decay.duration=ten").await;
    assert_eq!(status, StatusCode::UNPROCESSABLE_ENTITY);
    assert!(
        page.contains("id=\"err-decay.duration\""),
        "error beside the decay input"
    );
}
