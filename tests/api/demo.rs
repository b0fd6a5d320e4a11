//! The demo fleet (invented data) loads through the registry's own checks.

use crate::helpers::TestApp;
use axum::http::StatusCode;

async fn count(app: &TestApp, sql: &'static str) -> i64 {
    sqlx::query_scalar(sql).fetch_one(&app.db).await.expect(sql)
}

#[tokio::test]
async fn the_demo_fleet_loads_into_an_empty_database() {
    let app = TestApp::new().await;
    let summary = loadhold::seed::load_demo(&app.db)
        .await
        .expect("demo loads");
    assert!(
        summary.starts_with("Harrow Vale Plant Hire: 3 sites, 16 machines, 40 cylinders"),
        "{summary}"
    );
    assert_eq!(count(&app, "SELECT COUNT(*) FROM sites").await, 3);
    assert!(count(&app, "SELECT COUNT(DISTINCT kind) FROM machines").await >= 6);
    assert_eq!(count(&app, "SELECT COUNT(*) FROM machines").await, 16);
    assert_eq!(count(&app, "SELECT COUNT(*) FROM cylinders").await, 40);
    assert!(count(&app, "SELECT COUNT(*) FROM hoses").await >= 60);
    assert!(
        count(
            &app,
            "SELECT COUNT(*) FROM hoses WHERE replace_by < '2026-01-01'"
        )
        .await
            > 0
    );
    assert!(
        count(
            &app,
            "SELECT COUNT(*) FROM machines WHERE status = 'out_of_service'"
        )
        .await
            > 0
    );
    let below = loadhold::seed::hoses_below_bypass(&app.db)
        .await
        .expect("count");
    assert!(
        below > 0,
        "some hoses are rated below their cylinder's seal-bypass pressure"
    );
    let audit = count(
        &app,
        "SELECT COUNT(*) FROM audit_log WHERE actor = 'demo loader'",
    )
    .await;
    let records = count(&app, "SELECT (SELECT COUNT(*) FROM sites) + (SELECT COUNT(*) FROM machines) + (SELECT COUNT(*) FROM cylinders) + (SELECT COUNT(*) FROM hoses)").await;
    assert_eq!(audit, records, "every demo record has its audit row");

    let again = loadhold::seed::load_demo(&app.db).await;
    assert!(again.is_err(), "a second load is refused, not doubled");
    assert_eq!(count(&app, "SELECT COUNT(*) FROM machines").await, 16);
}

#[tokio::test]
async fn every_demo_machine_and_cylinder_page_renders() {
    let app = TestApp::new().await;
    loadhold::seed::load_demo(&app.db)
        .await
        .expect("demo loads");
    let machines: Vec<i64> = sqlx::query_scalar("SELECT id FROM machines")
        .fetch_all(&app.db)
        .await
        .unwrap();
    for id in machines {
        let (status, _, _) = app.get_page(&format!("/machines/{id}")).await;
        assert_eq!(status, StatusCode::OK, "machine {id}");
    }
    let cylinders: Vec<i64> = sqlx::query_scalar("SELECT id FROM cylinders")
        .fetch_all(&app.db)
        .await
        .unwrap();
    for id in cylinders {
        let (status, _, page) = app.get_page(&format!("/cylinders/{id}")).await;
        assert_eq!(status, StatusCode::OK, "cylinder {id}");
        assert!(
            page.contains("Pressures this cylinder can produce"),
            "cylinder {id}"
        );
    }
    let (_, _, list) = app.get_page("/machines").await;
    assert!(list.contains("HV-TH-01") && list.contains("HV-SS-16"));
}
