//! The report pages show the same lists, their filters and the time generated.

use super::due::due_fleet;
use super::lists::hazard_fleet;
use crate::helpers::TestApp;
use axum::http::StatusCode;
use loadhold::auth::Role;

#[tokio::test]
async fn the_due_page_shows_the_list_its_filters_and_a_csv_link() {
    let app = TestApp::new().await;
    let f = due_fleet(&app).await;
    let (status, _, page) = app
        .get_page(&format!(
            "/reports/due?as_of=2025-06-01&site={}&within_days=30",
            f.river
        ))
        .await;
    assert_eq!(status, StatusCode::OK, "{page}");
    let page = unescape(&page);
    for text in [
        "HV-103",
        "HV-104",
        "2025-04-15",
        "47 days overdue",
        "Drift test",
        "River Depot",
        "Generated",
        "As of</strong> 2025-06-01",
    ] {
        assert!(page.contains(text), "{text} on the page");
    }
    for absent in ["HV-101", "HV-102", "HV-105"] {
        assert!(!page.contains(absent), "{absent} filtered out");
    }
    // Status by word and shape.
    assert!(
        page.contains("■</span> overdue"),
        "overdue by word and shape"
    );
    assert!(
        page.contains("▲</span> due soon"),
        "due soon by word and shape"
    );
    let csv = format!(
        "/api/v1/reports/due?as_of=2025-06-01&within_days=30&site={}&format=csv",
        f.river
    );
    assert!(page.contains(&csv), "CSV link with the same filters: {csv}");
    assert!(page.contains("Download CSV"));

    let (status, _, bad) = app.get_page("/reports/due?as_of=tomorrow").await;
    assert_eq!(status, StatusCode::UNPROCESSABLE_ENTITY);
    assert!(
        bad.contains("YYYY-MM-DD") && bad.contains("value=\"tomorrow\""),
        "{bad}"
    );
}

#[tokio::test]
async fn the_other_report_pages_show_their_lists() {
    let app = TestApp::new().await;
    let f = due_fleet(&app).await;
    let (status, _, out) = app.get_page("/reports/out-of-service").await;
    assert_eq!(status, StatusCode::OK);
    assert!(
        out.contains("HV-104") && out.contains(&format!("inspection #{}", f.failed_inspection))
    );
    assert!(!out.contains("HV-101"));

    let (status, _, hoses) = app.get_page("/reports/hose-age?as_of=2025-06-01").await;
    assert_eq!(status, StatusCode::OK);
    assert!(hoses.contains(&format!("H{}", f.hose_soon)), "{hoses}");

    let (status, _, hazards) = app.get_page("/reports/hazards?as_of=2025-06-01").await;
    assert_eq!(status, StatusCode::OK);
    assert!(
        hazards.contains("Pressures above a rating") && hazards.contains("None found"),
        "this fleet has no pressure hazard"
    );

    let (status, _, overview) = app.get_page("/reports").await;
    assert_eq!(status, StatusCode::OK);
    for text in [
        "North Yard",
        "River Depot",
        "Machines by site and status",
        "Out of service",
    ] {
        assert!(overview.contains(text), "{text} on the overview");
    }
    let (_, _, css) = app.get_page("/static/reports.css").await;
    assert!(css.contains("@media print"), "print rules");
}

#[tokio::test]
async fn the_hazard_page_shows_each_hazard_with_the_cautions() {
    let app = TestApp::new().await;
    let h = hazard_fleet(&app).await;
    let (status, _, page) = app
        .get_page("/reports/hazards?as_of=2025-06-01&within_days=90")
        .await;
    assert_eq!(status, StatusCode::OK, "{page}");
    for text in [
        "Pressures above a rating",
        "HV-201",
        "mast lift",
        "a piston seal bypass",
        "HV-202",
        "rod-side intensification",
        &format!("H{}", h.expired_hose),
        "bucket tilt",
        "(estimate)",
        "Never feel for leaks by hand",
    ] {
        assert!(page.contains(text), "{text} on the hazard page");
    }
    assert!(
        !page.contains(&format!("H{} ", h.young_hose)),
        "an in-date hose is not a hazard"
    );
}

/// Page text with the HTML escapes of `&` undone, to compare links.
fn unescape(page: &str) -> String {
    page.replace("&#38;", "&").replace("&amp;", "&")
}

#[tokio::test]
async fn reports_are_for_managers_and_the_due_list_for_technicians_too() {
    let tech = TestApp::with_role(Role::Technician).await;
    let (status, _) = tech.get_json("/api/v1/reports/out-of-service").await;
    assert_eq!(status, StatusCode::FORBIDDEN);
    let (status, _) = tech.get_json("/api/v1/reports/due").await;
    assert_eq!(status, StatusCode::OK, "the shop's work list");
    let manager = TestApp::with_role(Role::Manager).await;
    let (status, body) = manager.get_json("/api/v1/reports/due").await;
    assert_eq!(status, StatusCode::OK, "{body}");
    assert_eq!(body, serde_json::json!({"items": []}));
}

#[tokio::test]
async fn a_manager_sets_the_hose_age_limit_from_the_hose_age_page() {
    let app = TestApp::session(Role::Manager).await;
    let (status, _, page) = app.get_page("/reports/hose-age").await;
    assert_eq!(status, StatusCode::OK);
    assert!(page.contains("The shop has set no age limit."), "{page}");
    assert!(
        page.contains("name=\"csrf\""),
        "the form carries the anti-forgery token"
    );

    let (status, headers, _) = app
        .post_form("/reports/settings", &[("hose_age_limit_years", "8")])
        .await;
    assert_eq!(status, StatusCode::SEE_OTHER);
    assert_eq!(headers["location"], "/reports/hose-age");
    let (_, _, page) = app.get_page("/reports/hose-age").await;
    assert!(page.contains("The shop's age limit is 8 years."), "{page}");

    let (status, _, page) = app
        .post_form("/reports/settings", &[("hose_age_limit_years", "0")])
        .await;
    assert_eq!(status, StatusCode::UNPROCESSABLE_ENTITY);
    assert!(page.contains("from 1 to 100"), "{page}");
    let (status, _, _) = app
        .post_form("/reports/settings", &[("hose_age_limit_years", "")])
        .await;
    assert_eq!(status, StatusCode::SEE_OTHER, "empty clears the limit");
    let (_, _, page) = app.get_page("/reports/hose-age").await;
    assert!(page.contains("The shop has set no age limit."));
}
