//! Every token acts for an owner account: it stops when the owner is disabled or demoted below
//! it, and at its expiry; the list shows owner, role, created, last used and expiry; making a
//! token and its first use each day are audited.

use crate::accounts_cli::loadhold;
use crate::helpers::{TEST_PASSWORD, TestApp};
use axum::http::StatusCode;
use loadhold::auth::{Actor, Role, tokens};

fn bearer(app: &TestApp, token: &str) -> TestApp {
    let mut client = app.client();
    client.auth = vec![("authorization".into(), format!("Bearer {token}"))];
    client
}

/// Makes a token on the admin page as the logged-in admin; returns the token.
async fn page_token(admin: &TestApp, name: &str, role: &str) -> String {
    let (status, _, page) = admin
        .post_form("/admin/tokens", &[("name", name), ("role", role)])
        .await;
    assert_eq!(status, StatusCode::OK, "{page}");
    let at = page.find("class=\"secret\">").expect("token shown once") + 15;
    page[at..].chars().take_while(|c| *c != '<').collect()
}

#[tokio::test]
async fn a_page_made_token_stops_when_its_maker_is_disabled_or_demoted() {
    let admin = TestApp::session(Role::Admin).await;
    let ops = admin.add_user("ops", Role::Admin).await;
    let lead = admin.add_user("lead", Role::Admin).await;
    let mut as_ops = admin.client();
    assert_eq!(
        as_ops.login("ops", TEST_PASSWORD).await,
        StatusCode::SEE_OTHER
    );
    let ops_token = page_token(&as_ops, "yard feed", "admin").await;
    let mut as_lead = admin.client();
    assert_eq!(
        as_lead.login("lead", TEST_PASSWORD).await,
        StatusCode::SEE_OTHER
    );
    let lead_admin = page_token(&as_lead, "lead admin", "admin").await;
    let lead_manager = page_token(&as_lead, "lead reports", "manager").await;
    for token in [&ops_token, &lead_admin, &lead_manager] {
        assert_eq!(
            bearer(&admin, token).get_json("/api/v1/machines").await.0,
            StatusCode::OK
        );
    }
    let (_, _, page) = admin.get_page("/admin").await;
    assert!(
        page.contains(">ops</td>") && page.contains("no expiry"),
        "owner shown: {page}"
    );

    let (status, _, _) = admin
        .post_form(&format!("/admin/users/{ops}/disable"), &[])
        .await;
    assert_eq!(status, StatusCode::SEE_OTHER);
    let (status, _) = bearer(&admin, &ops_token)
        .get_json("/api/v1/machines")
        .await;
    assert_eq!(
        status,
        StatusCode::UNAUTHORIZED,
        "the disabled owner's token stops"
    );

    let (status, _, _) = admin
        .post_form(&format!("/admin/users/{lead}/role"), &[("role", "manager")])
        .await;
    assert_eq!(status, StatusCode::SEE_OTHER);
    let (status, _) = bearer(&admin, &lead_admin)
        .get_json("/api/v1/machines")
        .await;
    assert_eq!(
        status,
        StatusCode::UNAUTHORIZED,
        "a token above its demoted owner stops"
    );
    let (status, _) = bearer(&admin, &lead_manager)
        .get_json("/api/v1/machines")
        .await;
    assert_eq!(
        status,
        StatusCode::OK,
        "a token within the owner's new role goes on"
    );
}

#[tokio::test]
async fn the_command_line_token_takes_an_owner_no_higher_role_and_an_expiry() {
    let app = TestApp::anonymous().await;
    app.add_user("hollis", Role::Technician).await;
    let db = app.dir.join("test.sqlite").display().to_string();
    let (ok, _, err) = loadhold(
        &[
            "token", "create", "feed", "--owner", "hollis", "--role", "admin", "--db", &db,
        ],
        "",
    );
    assert!(!ok && err.contains("cannot be above its owner"), "{err}");
    let (ok, _, err) = loadhold(
        &[
            "token",
            "create",
            "feed",
            "--owner",
            "hollis",
            "--expires",
            "2020-01-01",
            "--db",
            &db,
        ],
        "",
    );
    assert!(!ok && err.contains("in the future"), "{err}");
    let (ok, out, err) = loadhold(
        &["token", "create", "feed", "--owner", "hollis", "--db", &db],
        "",
    );
    assert!(ok && err.contains("owned by hollis"), "{out}{err}");
    let token = out.trim().to_string();
    assert_eq!(
        bearer(&app, &token).get_json("/api/v1/machines").await.0,
        StatusCode::OK
    );
    let (ok, out, err) = loadhold(&["user", "disable", "hollis", "--db", &db], "");
    assert!(ok, "{out}{err}");
    assert_eq!(
        bearer(&app, &token).get_json("/api/v1/machines").await.0,
        StatusCode::UNAUTHORIZED
    );
    // without --owner the old command goes on working: the service account owns the token
    let (ok, out, err) = loadhold(
        &["token", "create", "bench", "--role", "admin", "--db", &db],
        "",
    );
    assert!(ok && err.contains("owned by cli-tokens"), "{out}{err}");
}

#[tokio::test]
async fn an_expired_token_is_refused() {
    let app = TestApp::anonymous().await;
    let owner = app.add_user("hollis", Role::Manager).await;
    let tomorrow = loadhold::auth::clock::from_now(time::Duration::days(1));
    let (stored, token) = tokens::create_owned(
        &app.db,
        &Actor::system(),
        "feed",
        Role::Manager,
        owner,
        Some(&tomorrow),
    )
    .await
    .expect("token");
    assert_eq!(
        bearer(&app, &token).get_json("/api/v1/machines").await.0,
        StatusCode::OK
    );
    sqlx::query("UPDATE api_tokens SET expires_at = ? WHERE id = ?")
        .bind(loadhold::auth::clock::from_now(-time::Duration::minutes(1)))
        .bind(stored.id)
        .execute(&app.db)
        .await
        .expect("expire");
    assert_eq!(
        bearer(&app, &token).get_json("/api/v1/machines").await.0,
        StatusCode::UNAUTHORIZED
    );
}

#[tokio::test]
async fn token_creation_and_its_first_use_each_day_are_audited() {
    let app = TestApp::with_role(Role::Manager).await;
    for _ in 0..3 {
        assert_eq!(app.get_json("/api/v1/machines").await.0, StatusCode::OK);
    }
    let actions: Vec<String> =
        sqlx::query_scalar("SELECT action FROM audit_log WHERE entity = 'api_token' ORDER BY id")
            .fetch_all(&app.db)
            .await
            .expect("audit");
    assert_eq!(
        actions,
        ["create", "use"],
        "one use row per day, not per request"
    );
}
