use crate::helpers::TestApp;
use axum::http::StatusCode;

#[tokio::test]
async fn healthz_answers_once_the_database_is_ready() {
    let app = TestApp::new().await;
    let (status, _, body) = app.get_page("/healthz").await;
    assert_eq!(status, StatusCode::OK);
    assert_eq!(body, "ok");
}

#[tokio::test]
async fn unknown_api_route_is_a_json_404() {
    let app = TestApp::new().await;
    let (status, body) = app.get_json("/api/v1/no-such-thing").await;
    assert_eq!(status, StatusCode::NOT_FOUND);
    assert_eq!(body["error"]["code"], "not_found");
}

#[tokio::test]
async fn migrations_apply_to_an_empty_database() {
    let app = TestApp::new().await;
    let applied: i64 =
        sqlx::query_scalar("SELECT COUNT(*) FROM _sqlx_migrations WHERE success = 1")
            .fetch_one(&app.db)
            .await
            .expect("migration table");
    let files = std::fs::read_dir(concat!(env!("CARGO_MANIFEST_DIR"), "/migrations"))
        .expect("migrations dir")
        .filter(|e| {
            e.as_ref()
                .is_ok_and(|e| e.path().extension().is_some_and(|x| x == "sql"))
        })
        .count();
    assert_eq!(applied as usize, files, "every migration file applied");
}
