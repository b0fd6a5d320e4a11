//! `/api/v1/sites`: create, read, list, update; errors name the field.

use crate::helpers::{TestApp, assert_field_error};
use crate::registry_fixtures::{audit, site, walk};
use axum::http::StatusCode;
use serde_json::json;

#[tokio::test]
async fn a_site_is_created_read_listed_and_renamed() {
    let app = TestApp::new().await;
    let (status, created) = app
        .post_json(
            "/api/v1/sites",
            &json!({"name": "North Yard", "units": "us"}),
        )
        .await;
    assert_eq!(status, StatusCode::CREATED, "{created}");
    let id = created["id"].as_i64().expect("id");
    assert_eq!(created["name"], "North Yard");
    assert_eq!(created["units"], "us");
    assert_eq!(created["archived"], false);

    let (status, read) = app.get_json(&format!("/api/v1/sites/{id}")).await;
    assert_eq!(status, StatusCode::OK);
    assert_eq!(read, created);

    let (status, updated) = app
        .patch_json(&format!("/api/v1/sites/{id}"), &json!({"units": "metric"}))
        .await;
    assert_eq!(status, StatusCode::OK, "{updated}");
    assert_eq!(updated["units"], "metric");
    assert_eq!(
        updated["name"], "North Yard",
        "a PATCH keeps what it does not send"
    );

    let (status, list) = app.get_json("/api/v1/sites").await;
    assert_eq!(status, StatusCode::OK);
    assert_eq!(list["items"][0]["id"], id);
    assert!(list["next_cursor"].is_null());

    let log = audit(&app, "site", id).await;
    let actions: Vec<&str> = log.iter().map(|(a, _, _)| a.as_str()).collect();
    assert_eq!(actions, ["create", "update"]);
    assert_eq!(log[1].1["units"], "us");
    assert_eq!(log[1].2["units"], "metric");
}

#[tokio::test]
async fn a_site_without_a_name_or_with_unknown_units_is_refused_naming_the_field() {
    let app = TestApp::new().await;
    let (status, body) = app
        .post_json("/api/v1/sites", &json!({"units": "metric"}))
        .await;
    assert_field_error(status, &body, StatusCode::UNPROCESSABLE_ENTITY, "name");
    let (status, body) = app
        .post_json(
            "/api/v1/sites",
            &json!({"name": "Yard", "units": "imperial"}),
        )
        .await;
    assert_field_error(status, &body, StatusCode::UNPROCESSABLE_ENTITY, "units");
    let (status, body) = app
        .post_json("/api/v1/sites", &json!({"name": "Yard", "colour": "blue"}))
        .await;
    assert_field_error(status, &body, StatusCode::UNPROCESSABLE_ENTITY, "colour");
    let (status, body) = app.post_json("/api/v1/sites", &json!({"name": 7})).await;
    assert_field_error(status, &body, StatusCode::UNPROCESSABLE_ENTITY, "name");
}

#[tokio::test]
async fn a_second_site_of_the_same_name_is_a_conflict() {
    let app = TestApp::new().await;
    let first = site(&app, "Quarry Lane", "metric").await;
    let (status, body) = app
        .post_json("/api/v1/sites", &json!({"name": "Quarry Lane"}))
        .await;
    assert_field_error(status, &body, StatusCode::CONFLICT, "name");
    let other = site(&app, "Port Road", "us").await;
    let (status, body) = app
        .patch_json(
            &format!("/api/v1/sites/{other}"),
            &json!({"name": "Quarry Lane"}),
        )
        .await;
    assert_field_error(status, &body, StatusCode::CONFLICT, "name");
    assert_ne!(first, other);
}

#[tokio::test]
async fn unreadable_bodies_are_4xx_never_500() {
    let app = TestApp::new().await;
    let (status, _) = app
        .post_raw("/api/v1/sites", "application/json", "{not json")
        .await;
    assert_eq!(status, StatusCode::BAD_REQUEST);
    let (status, _) = app
        .post_raw("/api/v1/sites", "application/json", "[1, 2]")
        .await;
    assert_eq!(status, StatusCode::BAD_REQUEST);
    let (status, _) = app
        .post_raw("/api/v1/sites", "text/plain", "name=Yard")
        .await;
    assert_eq!(status, StatusCode::UNSUPPORTED_MEDIA_TYPE);
}

#[tokio::test]
async fn an_unknown_site_is_404_and_a_bad_page_request_is_422() {
    let app = TestApp::new().await;
    let (status, _) = app.get_json("/api/v1/sites/999").await;
    assert_eq!(status, StatusCode::NOT_FOUND);
    let (status, _) = app.get_json("/api/v1/sites/north").await;
    assert_eq!(status, StatusCode::NOT_FOUND);
    let (status, _) = app
        .patch_json("/api/v1/sites/999", &json!({"name": "x"}))
        .await;
    assert_eq!(status, StatusCode::NOT_FOUND);
    for (query, field) in [
        ("limit=0", "limit"),
        ("limit=201", "limit"),
        ("limit=ten", "limit"),
        ("cursor=-4", "cursor"),
        ("cursor=abc", "cursor"),
        ("sort=name", "sort"),
    ] {
        let (status, body) = app.get_json(&format!("/api/v1/sites?{query}")).await;
        assert_field_error(status, &body, StatusCode::UNPROCESSABLE_ENTITY, field);
    }
}

#[tokio::test]
async fn sites_page_through_without_repeats() {
    let app = TestApp::new().await;
    let mut made = Vec::new();
    for n in 0..5 {
        made.push(site(&app, &format!("Yard {n}"), "metric").await);
    }
    let (seen, pages) = walk(&app, "/api/v1/sites", 2).await;
    assert_eq!(seen, made);
    assert_eq!(pages, 3);
}
