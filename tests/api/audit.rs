//! The audit log: every change with who, when, before and after, visible to admins only.

use crate::helpers::{TEST_PASSWORD, TestApp};
use axum::http::StatusCode;
use loadhold::auth::Role;
use serde_json::{Value, json};

/// The audit rows of one kind of record, oldest first: (actor, action, before, after).
async fn rows(app: &TestApp, entity: &str) -> Vec<(String, String, Value, Value)> {
    let raw: Vec<(String, String, Option<String>, Option<String>)> = sqlx::query_as(
        "SELECT actor, action, before_json, after_json FROM audit_log WHERE entity = ? ORDER BY id",
    )
    .bind(entity)
    .fetch_all(&app.db)
    .await
    .expect("audit rows");
    let parse =
        |t: Option<String>| t.map_or(Value::Null, |t| serde_json::from_str(&t).expect("json"));
    raw.into_iter()
        .map(|(actor, action, b, a)| (actor, action, parse(b), parse(a)))
        .collect()
}

#[tokio::test]
async fn registry_changes_are_logged_with_the_token_that_made_them() {
    let manager = TestApp::with_role(Role::Manager).await;
    let (status, created) = manager
        .post_json(
            "/api/v1/sites",
            &json!({"name": "North Yard", "units": "metric"}),
        )
        .await;
    assert_eq!(status, StatusCode::CREATED, "{created}");
    let id = created["id"].as_i64().expect("id");
    let (status, _) = manager
        .patch_json(
            &format!("/api/v1/sites/{id}"),
            &json!({"name": "North Depot"}),
        )
        .await;
    assert_eq!(status, StatusCode::OK);
    let log = rows(&manager, "site").await;
    assert_eq!(log.len(), 2, "{log:?}");
    assert_eq!(log[0].0, "token test manager");
    assert_eq!(log[0].1, "create");
    assert_eq!(log[0].2, Value::Null);
    assert_eq!(log[0].3["name"], "North Yard");
    assert_eq!(log[1].1, "update");
    assert_eq!(log[1].2["name"], "North Yard");
    assert_eq!(log[1].3["name"], "North Depot");
}

#[tokio::test]
async fn a_session_user_is_named_in_the_log_by_their_display_name() {
    let admin = TestApp::new().await;
    admin.add_user("rcole", Role::Manager).await;
    sqlx::query("UPDATE users SET display_name = 'Rhiannon Cole' WHERE username = 'rcole'")
        .execute(&admin.db)
        .await
        .expect("rename");
    let mut manager = admin.client();
    assert_eq!(
        manager.login("rcole", TEST_PASSWORD).await,
        StatusCode::SEE_OTHER
    );
    let (status, _) = manager
        .post_json(
            "/api/v1/sites",
            &json!({"name": "Quarry Road", "units": "us"}),
        )
        .await;
    assert_eq!(status, StatusCode::CREATED);
    let log = rows(&admin, "site").await;
    assert_eq!(log[0].0, "Rhiannon Cole");
}

#[tokio::test]
async fn account_changes_are_logged_and_never_hold_a_secret() {
    let admin = TestApp::session(Role::Admin).await;
    let (status, _, page) = admin
        .post_form(
            "/admin/users",
            &[
                ("username", "hollis"),
                ("display_name", "Hollis Tran"),
                ("role", "technician"),
                ("password", "a-long-enough-password"),
            ],
        )
        .await;
    assert_eq!(status, StatusCode::SEE_OTHER, "{page}");
    let id: i64 = sqlx::query_scalar("SELECT id FROM users WHERE username = 'hollis'")
        .fetch_one(&admin.db)
        .await
        .expect("user");
    admin
        .post_form(&format!("/admin/users/{id}/role"), &[("role", "manager")])
        .await;
    admin
        .post_form(&format!("/admin/users/{id}/disable"), &[])
        .await;
    let (_, _, page) = admin
        .post_form("/admin/tokens", &[("name", "feed"), ("role", "manager")])
        .await;
    let token_id: i64 = sqlx::query_scalar("SELECT id FROM api_tokens WHERE name = 'feed'")
        .fetch_one(&admin.db)
        .await
        .expect("token");
    admin
        .post_form(&format!("/admin/tokens/{token_id}/revoke"), &[])
        .await;

    let users = rows(&admin, "user").await;
    let mine: Vec<_> = users
        .iter()
        .filter(|r| r.3["username"] == "hollis")
        .collect();
    let actions: Vec<&str> = mine.iter().map(|r| r.1.as_str()).collect();
    assert_eq!(actions, ["create", "update", "disable"]);
    assert!(
        mine.iter().all(|r| r.0 == "admin"),
        "by the logged-in admin: {mine:?}"
    );
    assert_eq!(mine[1].2["role"], "technician");
    assert_eq!(mine[1].3["role"], "manager");
    assert_eq!(mine[2].2["disabled_at"], Value::Null);
    assert!(mine[2].3["disabled_at"].is_string());

    let tokens = rows(&admin, "api_token").await;
    let actions: Vec<&str> = tokens.iter().map(|r| r.1.as_str()).collect();
    assert_eq!(actions, ["create", "revoke"]);
    assert!(tokens[1].3["revoked_at"].is_string());

    let at = page.find("lh_").expect("token shown");
    let token: String = page[at..]
        .chars()
        .take_while(|c| c.is_ascii_alphanumeric() || *c == '_')
        .collect();
    let all: Vec<String> = sqlx::query_scalar(
        "SELECT COALESCE(before_json, '') || COALESCE(after_json, '') FROM audit_log",
    )
    .fetch_all(&admin.db)
    .await
    .expect("log");
    for text in all {
        assert!(
            !text.contains(&token)
                && !text.contains("password_hash")
                && !text.contains("a-long-enough-password"),
            "{text}"
        );
    }
}

#[tokio::test]
async fn the_admin_audit_page_shows_who_when_and_each_field_before_and_after() {
    let admin = TestApp::session(Role::Admin).await;
    let manager = admin.client();
    let mut manager = manager;
    manager.auth = vec![(
        "authorization".into(),
        format!("Bearer {}", manager.token(Role::Manager).await),
    )];
    let (_, created) = manager
        .post_json(
            "/api/v1/sites",
            &json!({"name": "North Yard", "units": "metric"}),
        )
        .await;
    let id = created["id"].as_i64().expect("id");
    manager
        .patch_json(
            &format!("/api/v1/sites/{id}"),
            &json!({"name": "North <Depot>"}),
        )
        .await;
    let (status, _, page) = admin
        .get_page(&format!("/admin/audit?entity=site&entity_id={id}"))
        .await;
    assert_eq!(status, StatusCode::OK);
    assert!(page.contains("token test manager"), "who: {page}");
    assert!(
        page.contains(">update<") && page.contains(">create<"),
        "what"
    );
    assert!(page.contains("North Yard"), "before");
    assert!(page.contains("North &#60;Depot&#62;"), "after, escaped");
    let year = &loadhold::db::now_rfc3339()[..4];
    assert!(page.contains(&format!("{year}-")), "when");
    // Filtering by another kind of record hides these rows.
    let (_, _, other) = admin.get_page("/admin/audit?entity=machine").await;
    assert!(!other.contains("North Yard"));
    // Only admins see the log.
    let (status, _) = manager.get_json("/admin/audit").await;
    assert_eq!(status, StatusCode::FORBIDDEN);
}

#[tokio::test]
async fn the_last_admin_cannot_be_demoted_or_disabled() {
    let admin = TestApp::session(Role::Admin).await;
    let id: i64 = sqlx::query_scalar("SELECT id FROM users WHERE username = 'admin'")
        .fetch_one(&admin.db)
        .await
        .expect("admin");
    let (status, _, page) = admin
        .post_form(&format!("/admin/users/{id}/role"), &[("role", "manager")])
        .await;
    assert_eq!(status, StatusCode::UNPROCESSABLE_ENTITY);
    assert!(page.contains("last enabled admin"), "{page}");
    let (status, _, _) = admin
        .post_form(&format!("/admin/users/{id}/disable"), &[])
        .await;
    assert_eq!(status, StatusCode::UNPROCESSABLE_ENTITY);
    let role: String = sqlx::query_scalar("SELECT role FROM users WHERE id = ?")
        .bind(id)
        .fetch_one(&admin.db)
        .await
        .expect("role");
    assert_eq!(role, "admin");
}
