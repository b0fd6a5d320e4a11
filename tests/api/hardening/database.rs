//! A database that cannot take writes is reported as such: `/healthz` tries a write (rolled
//! back) and answers 503; writes answer 503 with `Retry-After` and a message, never a generic
//! 500, while reads go on; a write lock held by another process is "busy", also 503.

use crate::helpers::TestApp;
use crate::reports::fleet;
use axum::http::StatusCode;
use loadhold::app::{AppState, app};
use serde_json::json;
use sqlx::sqlite::{SqliteConnectOptions, SqlitePoolOptions};
use std::str::FromStr;
use std::time::{Duration, Instant};

async fn health(app: &TestApp) -> (StatusCode, String, String) {
    let (status, headers, body) = app.get_page("/healthz").await;
    let retry = headers
        .get("retry-after")
        .and_then(|v| v.to_str().ok())
        .unwrap_or("")
        .to_string();
    (status, retry, body)
}

#[tokio::test]
async fn a_read_only_database_answers_503_on_health_writes_and_logins_and_still_reads() {
    let writable = TestApp::new().await;
    fleet::machine(
        &writable,
        json!({"unit_number": "HV-60", "kind": "aerial lift"}),
    )
    .await;
    assert_eq!(health(&writable).await.0, StatusCode::OK);
    let path = writable.dir.join("test.sqlite");
    let options = SqliteConnectOptions::from_str(&format!("sqlite://{}", path.display()))
        .expect("options")
        .read_only(true);
    let pool = SqlitePoolOptions::new()
        .connect_with(options)
        .await
        .expect("read-only pool");
    let read_only = TestApp {
        db: pool.clone(),
        router: app(AppState::new(pool)),
        dir: writable.dir.join("read-only-client"),
        auth: writable.auth.clone(),
        csrf: None,
    };
    let (status, retry, body) = health(&read_only).await;
    assert_eq!(status, StatusCode::SERVICE_UNAVAILABLE, "{body}");
    assert!(body.contains("cannot be written"), "{body}");
    assert!(!retry.is_empty(), "Retry-After is sent");

    let (status, list) = read_only.get_json("/api/v1/machines").await;
    assert_eq!(status, StatusCode::OK, "reads go on: {list}");
    let (status, body) = read_only
        .post_json(
            "/api/v1/sites",
            &json!({"name": "North yard", "units": "metric"}),
        )
        .await;
    assert_eq!(status, StatusCode::SERVICE_UNAVAILABLE, "{body}");
    assert_eq!(body["error"]["code"], "database_not_writable", "{body}");
    let mut person = read_only.client();
    person.auth.clear();
    let (status, _, page) = person
        .post_form(
            "/login",
            &[("username", "nobody-here"), ("password", "x-x-x-x-x-x-x")],
        )
        .await;
    assert_eq!(status, StatusCode::SERVICE_UNAVAILABLE, "{page}");
}

#[tokio::test]
async fn a_write_lock_held_by_another_process_answers_503_busy_with_retry_after() {
    let app = TestApp::new().await;
    let path = app.dir.join("test.sqlite");
    // another process's writer: its own connection holding the write lock
    let other = loadhold::db::connect(&path).await.expect("other pool");
    let mut holder = other.acquire().await.expect("connection");
    sqlx::query("BEGIN IMMEDIATE")
        .execute(&mut *holder)
        .await
        .expect("lock");

    let started = Instant::now();
    let mut probe = app.client();
    probe.auth.clear();
    let (status, retry, body) = health(&probe).await;
    assert_eq!(status, StatusCode::SERVICE_UNAVAILABLE, "{body}");
    assert!(body.contains("busy"), "{body}");
    assert_eq!(retry, "5");
    assert!(
        started.elapsed() < Duration::from_secs(6),
        "{:?}",
        started.elapsed()
    );

    let (status, body) = app
        .post_json(
            "/api/v1/sites",
            &json!({"name": "North yard", "units": "metric"}),
        )
        .await;
    assert_eq!(status, StatusCode::SERVICE_UNAVAILABLE, "{body}");
    assert_eq!(body["error"]["code"], "database_busy", "{body}");

    sqlx::query("ROLLBACK")
        .execute(&mut *holder)
        .await
        .expect("unlock");
    assert_eq!(health(&app).await.0, StatusCode::OK);
}
