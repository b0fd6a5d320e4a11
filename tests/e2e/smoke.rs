//! The harness and the public pages: the binary starts and answers over real sockets, and a
//! tablet-sized Chromium uses the calculator, which needs no login.

use crate::browser::Browser;
use crate::server::{Server, TempDir, artifacts, create_token, migrate};

#[tokio::test]
async fn the_binary_serves_health_a_login_wall_and_json_errors_over_real_sockets() {
    let dir = TempDir::new("smoke");
    let out = artifacts("smoke_http");
    let db = dir.path().join("db.sqlite");
    migrate(&db);
    let token = create_token(&db, "smoke", "technician");
    let server = Server::start(&db, &out.join("server.log")).await;
    let http = server.http();
    let health = http.get("/healthz").await.expect("healthz");
    assert_eq!((health.status, health.text().as_str()), (200, "ok"));
    let refused = http.get("/api/v1/machines").await.expect("no login");
    assert_eq!(refused.status, 401, "{}", refused.text());
    assert_eq!(refused.json()["error"]["code"], "unauthorized");
    let missing = http
        .with_bearer(&token)
        .get("/api/v1/no-such-route")
        .await
        .expect("404");
    assert_eq!(missing.status, 404, "{}", missing.text());
    assert_eq!(missing.json()["error"]["code"], "not_found");
}

#[tokio::test]
async fn the_calculator_shows_the_seal_bypass_pressure_against_the_line_rating_on_a_tablet() {
    let dir = TempDir::new("smoke-calc");
    let out = artifacts("calc_page");
    let server = Server::start(&dir.path().join("db.sqlite"), &out.join("server.log")).await;
    let mut b = Browser::open(out.clone(), 768, 1024).await;
    b.goto(&format!("{}/calc", server.base())).await;
    b.find("#c-bore").await;
    b.shot("calculator-empty").await;
    b.select("#c-units", "us").await;
    b.fill("#c-bore", "4 in").await;
    b.fill("#c-rod", "2 in").await;
    b.fill("#c-stroke", "24 in").await;
    b.fill("#c-load", "10000 lbf").await;
    b.select("#c-load_direction", "retract").await;
    b.fill("#c-ratings\\.cap_line", "3000 psi").await;
    b.fill("#c-ratings\\.rod_line", "3000 psi").await;
    b.shot("calculator-filled").await;
    b.click("form[action='/calc'] button[type='submit']").await;
    b.wait_for_path("/calc").await;
    b.find(".hazard").await;
    b.shot("calculator-result").await;
    let (fits, sizes) = b.fits_width().await;
    assert!(
        fits,
        "the calculator scrolls sideways on a 768 px tablet: {sizes}"
    );
    let text = b.page_text().await;
    // Common practice (../shared/REFERENCES.md, trade facts): with the piston seal passing
    // and both ports blocked, a load pushing the rod in puts load / rod area on both ends:
    // 10,000 lbf / (pi x (2 in / 2)^2) = 3183.1 psi, above a 3000 psi line rating.
    assert!(
        text.contains("3183 psi"),
        "bypass pressure on the page: {text}"
    );
    assert!(
        text.contains("above its rating of 3000 psi"),
        "the rating check is shown"
    );
    let lower = text.to_lowercase();
    for caution in ["support", "relieve", "lockout", "injection"] {
        assert!(
            lower.contains(caution),
            "the usual cautions ({caution}) stand beside the hazard"
        );
    }
    b.close().await;
}
