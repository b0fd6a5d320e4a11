//! Logins: throttling slows a guesser and locks only the account at the guessing address,
//! with a lock an admin clears (page or command) and a password reset clears; the login form
//! refuses a cross-site POST; logins, failures, logouts and unlocks are in the audit log.

use crate::accounts::login_from;
use crate::accounts_cli::loadhold;
use crate::helpers::{TEST_PASSWORD, TestApp};
use axum::body::Body;
use axum::http::{Request, StatusCode, header};
use loadhold::auth::Role;
use std::time::{Duration, Instant};

const GUESSER: &str = "10.0.0.5:4000";

/// Five wrong passwords for `user` from the guessing address; returns how long they took.
async fn lock(app: &TestApp, user: &str) -> Duration {
    let started = Instant::now();
    for _ in 0..5 {
        let status = login_from(app, GUESSER, user, "wrong-password-1").await;
        assert_eq!(status, StatusCode::UNAUTHORIZED);
    }
    assert_eq!(
        login_from(app, GUESSER, user, TEST_PASSWORD).await,
        StatusCode::TOO_MANY_REQUESTS,
        "locked at the guessing address"
    );
    started.elapsed()
}

#[tokio::test]
async fn a_lock_is_cleared_by_an_admin_on_the_page_by_the_command_and_by_a_new_password() {
    let mut admin = TestApp::session(Role::Admin).await;
    let id = admin.add_user("hollis", Role::Technician).await;
    // the third, fourth and fifth failures wait 0.25 s, 0.5 s and 1 s (each doubles)
    let took = lock(&admin, "hollis").await;
    assert!(
        took >= Duration::from_millis(1750),
        "the delay grows: {took:?}"
    );

    let (_, _, page) = admin.get_page("/admin").await;
    assert!(
        page.contains("locked from 10.0.0.5"),
        "the admin sees the lock"
    );
    assert!(
        page.contains(&format!("/admin/users/{id}/unlock")),
        "and can clear it"
    );
    let (status, headers, _) = admin
        .post_form(&format!("/admin/users/{id}/unlock"), &[])
        .await;
    assert_eq!(status, StatusCode::SEE_OTHER);
    assert_eq!(headers["location"], "/admin?done=unlocked");
    assert_eq!(
        login_from(&admin, GUESSER, "hollis", TEST_PASSWORD).await,
        StatusCode::SEE_OTHER
    );

    lock(&admin, "hollis").await;
    let db = admin.dir.join("test.sqlite").display().to_string();
    let (ok, out, err) = loadhold(&["user", "unlock", "hollis", "--db", &db], "");
    assert!(ok && out.contains("unlocked hollis"), "{out}{err}");
    assert_eq!(
        login_from(&admin, GUESSER, "hollis", TEST_PASSWORD).await,
        StatusCode::SEE_OTHER
    );

    lock(&admin, "hollis").await;
    let (status, _, page) = admin
        .post_form(&format!("/admin/users/{id}/password"), &[])
        .await;
    assert_eq!(status, StatusCode::OK);
    let at = page.find("class=\"secret\">").expect("password shown once") + 15;
    let new_password: String = page[at..].chars().take_while(|c| *c != '<').collect();
    assert_eq!(
        login_from(&admin, GUESSER, "hollis", &new_password).await,
        StatusCode::SEE_OTHER
    );

    let actions: Vec<String> = sqlx::query_scalar(
        "SELECT action FROM audit_log WHERE entity = 'user' AND entity_id = ? AND action = 'unlock'",
    )
    .bind(id)
    .fetch_all(&admin.db)
    .await
    .expect("audit");
    assert_eq!(actions.len(), 2, "page and command unlocks are audited");
    admin.csrf = None;
}

#[tokio::test]
async fn the_lock_message_tells_the_truth() {
    let app = TestApp::anonymous().await;
    app.add_user("hollis", Role::Technician).await;
    lock(&app, "hollis").await;
    let request = Request::builder()
        .method("POST")
        .uri("/login")
        .header(header::CONTENT_TYPE, "application/x-www-form-urlencoded")
        .extension(axum::extract::ConnectInfo::<std::net::SocketAddr>(
            GUESSER.parse().expect("addr"),
        ))
        .body(Body::from(format!(
            "username=hollis&password={TEST_PASSWORD}"
        )))
        .expect("request");
    let (status, _, body) = app.send(request).await;
    let page = String::from_utf8_lossy(&body);
    assert_eq!(status, StatusCode::TOO_MANY_REQUESTS);
    assert!(page.contains("another device still works"), "{page}");
    assert!(page.contains("an admin can unlock"), "{page}");
}

async fn login_with(app: &TestApp, headers: &[(&str, &str)]) -> (StatusCode, String) {
    let mut builder = Request::builder()
        .method("POST")
        .uri("/login")
        .header(header::CONTENT_TYPE, "application/x-www-form-urlencoded");
    for (name, value) in headers {
        builder = builder.header(*name, *value);
    }
    let body = format!("username=hollis&password={TEST_PASSWORD}");
    let (status, headers, _) = app
        .send(builder.body(Body::from(body)).expect("request"))
        .await;
    let cookie = headers
        .get(header::SET_COOKIE)
        .and_then(|v| v.to_str().ok())
        .unwrap_or("")
        .to_string();
    (status, cookie)
}

#[tokio::test]
async fn a_cross_site_login_post_is_refused_and_sets_no_session() {
    let app = TestApp::anonymous().await;
    app.add_user("hollis", Role::Technician).await;
    let host = ("host", "loadhold.test:8080");
    let cross = [
        vec![host, ("origin", "http://attacker.example")],
        vec![host, ("origin", "null")],
        vec![host, ("referer", "http://attacker.example/form.html")],
        vec![
            host,
            ("sec-fetch-site", "cross-site"),
            ("origin", "http://loadhold.test:8080"),
        ],
    ];
    for headers in cross {
        let (status, cookie) = login_with(&app, &headers).await;
        assert_eq!(status, StatusCode::FORBIDDEN, "{headers:?}");
        assert!(!cookie.contains("loadhold_session=") || cookie.contains("loadhold_session=;"));
    }
    let same = [
        host,
        ("origin", "http://loadhold.test:8080"),
        ("sec-fetch-site", "same-origin"),
    ];
    let (status, cookie) = login_with(&app, &same).await;
    assert_eq!(status, StatusCode::SEE_OTHER);
    assert!(cookie.starts_with("loadhold_session="), "{cookie}");
}

#[tokio::test]
async fn logins_failed_logins_with_the_address_and_logouts_are_audited() {
    let mut app = TestApp::anonymous().await;
    let id = app.add_user("hollis", Role::Technician).await;
    login_from(&app, "198.51.100.7:3000", "hollis", "wrong-password-1").await;
    login_from(&app, "198.51.100.7:3000", "nobody-here", "wrong-password-1").await;
    assert_eq!(
        app.login("hollis", TEST_PASSWORD).await,
        StatusCode::SEE_OTHER
    );
    let (status, _, _) = app.post_form("/logout", &[]).await;
    assert_eq!(status, StatusCode::SEE_OTHER);
    let rows: Vec<(String, String, String, i64, String)> = sqlx::query_as(
        "SELECT actor, action, entity, entity_id, after_json FROM audit_log
         WHERE action IN ('login', 'login_failed', 'logout') ORDER BY id",
    )
    .fetch_all(&app.db)
    .await
    .expect("audit");
    let actions: Vec<&str> = rows.iter().map(|r| r.1.as_str()).collect();
    assert_eq!(
        actions,
        ["login_failed", "login_failed", "login", "logout"],
        "{rows:?}"
    );
    assert!(
        rows[0].4.contains("198.51.100.7") && rows[0].4.contains("hollis"),
        "{rows:?}"
    );
    assert!(rows[1].4.contains("nobody-here"), "{rows:?}");
    assert_eq!((rows[2].2.as_str(), rows[2].3), ("user", id));
    assert_eq!((rows[3].0.as_str(), rows[3].3), ("hollis", id));
}
