//! Accounts: the login page, sessions, logout, throttling, bearer tokens, the CLI, the demo logins.

use crate::helpers::{TEST_PASSWORD, TestApp, csrf_field, urlencode};
use axum::body::Body;
use axum::extract::ConnectInfo;
use axum::http::{Request, StatusCode, header};
use loadhold::auth::{Role, cookie, secret};
use std::net::SocketAddr;

fn location(headers: &axum::http::HeaderMap) -> String {
    headers
        .get(header::LOCATION)
        .and_then(|v| v.to_str().ok())
        .unwrap_or("")
        .to_string()
}

fn set_cookie(headers: &axum::http::HeaderMap) -> String {
    headers
        .get(header::SET_COOKIE)
        .and_then(|v| v.to_str().ok())
        .unwrap_or("")
        .to_string()
}

/// POSTs the login form from a given client address.
pub async fn login_from(
    app: &TestApp,
    address: &str,
    username: &str,
    password: &str,
) -> StatusCode {
    let body = format!(
        "username={}&password={}",
        urlencode(username),
        urlencode(password)
    );
    let addr: SocketAddr = address.parse().expect("address");
    let request = Request::builder()
        .method("POST")
        .uri("/login")
        .header(header::CONTENT_TYPE, "application/x-www-form-urlencoded")
        .extension(ConnectInfo(addr))
        .body(Body::from(body))
        .expect("request");
    app.send(request).await.0
}

#[tokio::test]
async fn login_page_shows_a_form_with_username_and_password_fields() {
    let app = TestApp::anonymous().await;
    let (status, _, page) = app.get_page("/login?next=/machines").await;
    assert_eq!(status, StatusCode::OK);
    assert!(page.contains(r#"name="username""#), "{page}");
    assert!(page.contains(r#"name="password""#));
    assert!(page.contains(r#"type="password""#));
    assert!(
        page.contains(r#"name="next" value="/machines""#),
        "next kept in the form"
    );
}

#[tokio::test]
async fn a_right_password_starts_an_httponly_samesite_session_and_returns_to_next() {
    let app = TestApp::anonymous().await;
    app.add_user("hollis", Role::Technician).await;
    let (status, headers, _) = app
        .post_form(
            "/login",
            &[
                ("username", "Hollis"),
                ("password", TEST_PASSWORD),
                ("next", "/machines/7"),
            ],
        )
        .await;
    assert_eq!(status, StatusCode::SEE_OTHER);
    assert_eq!(location(&headers), "/machines/7");
    let cookie = set_cookie(&headers);
    assert!(cookie.starts_with("loadhold_session="), "{cookie}");
    assert!(cookie.contains("HttpOnly"), "{cookie}");
    assert!(cookie.contains("SameSite=Lax"), "{cookie}");
    assert!(cookie.contains("Path=/"), "{cookie}");
    assert!(cookie.contains("Max-Age=43200"), "12 h: {cookie}");
    assert!(
        !cookie.contains("Secure"),
        "not Secure unless configured: {cookie}"
    );
    // The database keeps only the SHA-256 of the cookie's token.
    let token = cookie["loadhold_session=".len()..]
        .split(';')
        .next()
        .unwrap_or("");
    assert_eq!(token.len(), 64);
    let stored: Vec<String> = sqlx::query_scalar("SELECT token_hash FROM sessions")
        .fetch_all(&app.db)
        .await
        .expect("sessions");
    assert_eq!(stored, vec![secret::token_hash(token)]);
    assert_ne!(stored[0], token);
}

#[test]
fn the_session_cookie_is_secure_when_the_server_is_behind_tls() {
    let value = cookie::session("abc", 60, true);
    assert!(value.ends_with("; Secure"), "{value}");
    assert!(!cookie::session("abc", 60, false).contains("Secure"));
    assert!(cookie::cleared(false).contains("Max-Age=0"));
}

#[tokio::test]
async fn a_wrong_password_and_an_unknown_user_get_the_same_refusal() {
    let app = TestApp::anonymous().await;
    app.add_user("hollis", Role::Technician).await;
    let wrong = app
        .post_form(
            "/login",
            &[("username", "hollis"), ("password", "not-the-password")],
        )
        .await;
    let unknown = app
        .post_form(
            "/login",
            &[("username", "nobody"), ("password", TEST_PASSWORD)],
        )
        .await;
    assert_eq!(wrong.0, StatusCode::UNAUTHORIZED);
    assert_eq!(unknown.0, StatusCode::UNAUTHORIZED);
    assert!(wrong.1.get(header::SET_COOKIE).is_none());
    let message = "That user name and password do not match an enabled account.";
    assert!(wrong.2.contains(message) && unknown.2.contains(message));
    assert!(
        wrong.2.contains(r#"value="hollis""#),
        "user name kept in the form"
    );
}

#[tokio::test]
async fn next_is_followed_only_to_local_paths() {
    let app = TestApp::anonymous().await;
    app.add_user("hollis", Role::Technician).await;
    for (next, expected) in [
        ("//evil.example/x", "/"),
        ("https://evil.example/", "/"),
        ("/\\evil.example", "/"),
        ("/login", "/"),
        // No `next`: a technician starts on the shop (issue 14).
        ("", "/shop"),
        ("/reports/due?site=2", "/reports/due?site=2"),
    ] {
        let (status, headers, _) = app
            .post_form_as_is(
                "/login",
                &[
                    ("username", "hollis"),
                    ("password", TEST_PASSWORD),
                    ("next", next),
                ],
            )
            .await;
        assert_eq!(status, StatusCode::SEE_OTHER, "next {next}");
        assert_eq!(location(&headers), expected, "next {next}");
    }
}

#[tokio::test]
async fn five_failures_lock_the_account_at_that_address_only() {
    let app = TestApp::anonymous().await;
    app.add_user("hollis", Role::Technician).await;
    app.add_user("marek", Role::Manager).await;
    for _ in 0..5 {
        let status = login_from(&app, "10.0.0.5:4000", "hollis", "wrong-password-1").await;
        assert_eq!(status, StatusCode::UNAUTHORIZED);
    }
    // From that address even the right password is refused now, without being checked.
    assert_eq!(
        login_from(&app, "10.0.0.5:4001", "hollis", TEST_PASSWORD).await,
        StatusCode::TOO_MANY_REQUESTS
    );
    // The owner's own device is not locked out (issue 15), nor another account there.
    let (status, _, page) = app
        .post_form(
            "/login",
            &[("username", "hollis"), ("password", TEST_PASSWORD)],
        )
        .await;
    assert_eq!(status, StatusCode::SEE_OTHER, "{page}");
    assert_eq!(
        login_from(&app, "10.0.0.5:4000", "marek", TEST_PASSWORD).await,
        StatusCode::SEE_OTHER
    );
}

#[tokio::test]
async fn a_success_resets_the_account_count() {
    let app = TestApp::anonymous().await;
    app.add_user("hollis", Role::Technician).await;
    for _ in 0..4 {
        login_from(&app, "10.0.0.5:4000", "hollis", "wrong-password-1").await;
    }
    assert_eq!(
        login_from(&app, "10.0.0.5:4000", "hollis", TEST_PASSWORD).await,
        StatusCode::SEE_OTHER
    );
    for _ in 0..4 {
        login_from(&app, "10.0.0.5:4000", "hollis", "wrong-password-1").await;
    }
    assert_eq!(
        login_from(&app, "10.0.0.5:4000", "hollis", TEST_PASSWORD).await,
        StatusCode::SEE_OTHER
    );
}

#[tokio::test]
async fn twenty_failures_from_one_address_slow_it_without_locking_its_users_out() {
    let app = TestApp::anonymous().await;
    app.add_user("hollis", Role::Technician).await;
    // twenty failed logins for other names from one address (a shop's shared tablets)
    for n in 0..20 {
        sqlx::query(
            "INSERT INTO login_attempts (at, username, address, succeeded)
             VALUES (?, ?, '192.0.2.9', 0)",
        )
        .bind(loadhold::auth::clock::now())
        .bind(format!("guess{n}"))
        .execute(&app.db)
        .await
        .expect("attempt");
    }
    let started = std::time::Instant::now();
    assert_eq!(
        login_from(&app, "192.0.2.9:5001", "hollis", TEST_PASSWORD).await,
        StatusCode::SEE_OTHER,
        "same address, other port: slowed, not locked out"
    );
    assert!(
        started.elapsed() >= loadhold::auth::throttle::MAX_DELAY,
        "the try from a busy address waited: {:?}",
        started.elapsed()
    );
    let started = std::time::Instant::now();
    assert_eq!(
        login_from(&app, "192.0.2.10:5000", "hollis", TEST_PASSWORD).await,
        StatusCode::SEE_OTHER
    );
    assert!(
        started.elapsed() < loadhold::auth::throttle::MAX_DELAY,
        "another address does not wait"
    );
}

#[tokio::test]
async fn passwords_are_stored_as_argon2id_phc_strings() {
    let app = TestApp::anonymous().await;
    app.add_user("hollis", Role::Technician).await;
    let hash: String =
        sqlx::query_scalar("SELECT password_hash FROM users WHERE username = 'hollis'")
            .fetch_one(&app.db)
            .await
            .expect("hash");
    assert!(
        hash.starts_with("$argon2id$v=19$m=19456,t=2,p=1$"),
        "{hash}"
    );
    assert!(!hash.contains(TEST_PASSWORD));
}

#[tokio::test]
async fn logout_ends_the_session_and_the_old_cookie_stops_working() {
    let app = TestApp::session(Role::Admin).await;
    assert_eq!(app.get_page("/admin").await.0, StatusCode::OK);
    let (status, headers, _) = app.post_form("/logout", &[]).await;
    assert_eq!(status, StatusCode::SEE_OTHER);
    assert_eq!(location(&headers), "/login");
    assert!(set_cookie(&headers).contains("Max-Age=0"), "cookie cleared");
    let (status, headers, _) = app.get_page("/admin").await;
    assert_eq!(status, StatusCode::SEE_OTHER);
    assert_eq!(location(&headers), "/login?next=/admin");
    let left: i64 = sqlx::query_scalar("SELECT COUNT(*) FROM sessions")
        .fetch_one(&app.db)
        .await
        .expect("sessions");
    assert_eq!(left, 0);
}

#[tokio::test]
async fn the_page_header_names_the_logged_in_user_and_offers_logout() {
    let app = TestApp::session(Role::Technician).await;
    let (_, _, page) = app.get_page("/login").await;
    assert!(page.contains("technician · technician"), "{page}");
    assert!(page.contains(r#"action="/logout""#));
    assert_eq!(csrf_field(&page), app.csrf);
}

#[tokio::test]
async fn a_disabled_user_can_no_longer_log_in_and_their_session_ends() {
    let admin = TestApp::session(Role::Admin).await;
    let id = admin.add_user("hollis", Role::Technician).await;
    let mut tech = admin.client();
    assert_eq!(
        tech.login("hollis", TEST_PASSWORD).await,
        StatusCode::SEE_OTHER
    );
    let (status, headers, _) = admin
        .post_form(&format!("/admin/users/{id}/disable"), &[])
        .await;
    assert_eq!(status, StatusCode::SEE_OTHER, "{headers:?}");
    assert_eq!(
        tech.get_page("/machines").await.0,
        StatusCode::SEE_OTHER,
        "sent to login"
    );
    assert_eq!(
        tech.login("hollis", TEST_PASSWORD).await,
        StatusCode::UNAUTHORIZED
    );
    // Enabled again, the same password works.
    admin
        .post_form(&format!("/admin/users/{id}/enable"), &[])
        .await;
    assert_eq!(
        tech.login("hollis", TEST_PASSWORD).await,
        StatusCode::SEE_OTHER
    );
}

#[tokio::test]
async fn a_token_made_on_the_admin_page_is_shown_once_works_and_can_be_revoked() {
    let admin = TestApp::session(Role::Admin).await;
    let (status, _, page) = admin
        .post_form(
            "/admin/tokens",
            &[("name", "telematics feed"), ("role", "technician")],
        )
        .await;
    assert_eq!(status, StatusCode::OK, "{page}");
    let at = page.find("lh_").expect("token on the page");
    let token: String = page[at..]
        .chars()
        .take_while(|c| c.is_ascii_alphanumeric() || *c == '_')
        .collect();
    assert_eq!(token.len(), 3 + 64);
    let (_, _, later) = admin.get_page("/admin").await;
    assert!(!later.contains(&token), "shown once only");
    assert!(later.contains(&token[..11]), "its prefix is listed");

    let mut client = admin.client();
    client.auth = vec![("authorization".into(), format!("Bearer {token}"))];
    assert_eq!(client.get_json("/api/v1/sites").await.0, StatusCode::OK);
    let used: Option<String> =
        sqlx::query_scalar("SELECT last_used_at FROM api_tokens WHERE name = 'telematics feed'")
            .fetch_one(&admin.db)
            .await
            .expect("token row");
    assert!(used.is_some(), "last use recorded");

    let id: i64 = sqlx::query_scalar("SELECT id FROM api_tokens WHERE name = 'telematics feed'")
        .fetch_one(&admin.db)
        .await
        .expect("token id");
    let (status, _, _) = admin
        .post_form(&format!("/admin/tokens/{id}/revoke"), &[])
        .await;
    assert_eq!(status, StatusCode::SEE_OTHER);
    let (status, body) = client.get_json("/api/v1/sites").await;
    assert_eq!(status, StatusCode::UNAUTHORIZED, "{body}");
    assert_eq!(body["error"]["code"], "unauthorized");
}

#[tokio::test]
async fn a_made_up_or_malformed_bearer_token_is_refused() {
    let mut app = TestApp::anonymous().await;
    for value in [
        "Bearer lh_0000",
        "Bearer ",
        "Basic YWRtaW46YWRtaW4=",
        "Bearer not-a-token",
    ] {
        app.auth = vec![("authorization".into(), value.into())];
        let (status, body) = app.get_json("/api/v1/machines").await;
        assert_eq!(status, StatusCode::UNAUTHORIZED, "{value}: {body}");
    }
}

#[tokio::test]
async fn logging_in_again_from_the_same_browser_replaces_its_session() {
    let app = TestApp::session(Role::Manager).await;
    let (status, _, _) = app
        .post_form(
            "/login",
            &[("username", "manager"), ("password", TEST_PASSWORD)],
        )
        .await;
    assert_eq!(status, StatusCode::SEE_OTHER);
    let live: i64 = sqlx::query_scalar("SELECT COUNT(*) FROM sessions")
        .fetch_one(&app.db)
        .await
        .expect("sessions");
    assert_eq!(live, 1, "the old session ended");
    assert_eq!(
        app.get_page("/machines").await.0,
        StatusCode::SEE_OTHER,
        "old cookie refused"
    );
}
