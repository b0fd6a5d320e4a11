//! The harness itself: the binary starts, answers, and a browser can see its pages.

use crate::browser::Browser;
use crate::server::{Server, TempDir, artifacts};

#[tokio::test]
async fn the_binary_serves_health_and_a_json_404_over_real_sockets() {
    let dir = TempDir::new("smoke");
    let out = artifacts("smoke_http");
    let server = Server::start(&dir.path().join("db.sqlite"), &out.join("server.log")).await;
    let http = server.http();
    let health = http.get("/healthz").await.expect("healthz");
    assert_eq!(health.status, 200);
    assert_eq!(health.text(), "ok");
    let missing = http.get("/api/v1/no-such-route").await.expect("404");
    assert_eq!(missing.status, 404);
    assert_eq!(missing.json()["error"]["code"], "not_found", "{}", missing.text());
}

#[tokio::test]
async fn a_tablet_sized_chromium_renders_the_site_layout() {
    let dir = TempDir::new("smoke-browser");
    let out = artifacts("smoke_browser");
    let server = Server::start(&dir.path().join("db.sqlite"), &out.join("server.log")).await;
    let mut browser = Browser::open(out.clone(), 768, 1024).await;
    browser.goto(&format!("{}/no-such-page", server.base())).await;
    let text = browser.page_text().await;
    browser.shot("not-found-page").await;
    assert!(text.contains("Not found"), "page text: {text}");
    let width = browser
        .client
        .execute("return document.documentElement.clientWidth;", vec![])
        .await
        .expect("clientWidth");
    assert_eq!(width, 768, "viewport width");
    browser.close().await;
    drop(server);
}
