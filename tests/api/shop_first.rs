//! Issue 14, "the shop first": a technician lands on the shop after login (an explicit `next`
//! wins), the unit search ignores case and separators, and labels' QR codes use the configured
//! public address, never the request's Host header.

use crate::drift_tests::loaded_cylinder;
use crate::helpers::{TEST_PASSWORD, TestApp};
use crate::registry_fixtures::machine;
use axum::http::{StatusCode, header};
use loadhold::auth::Role;
use loadhold::pages::shop::label::record_address;

async fn login_to(app: &TestApp, username: &str, next: Option<&str>) -> String {
    let mut form = vec![("username", username), ("password", TEST_PASSWORD)];
    if let Some(next) = next {
        form.push(("next", next));
    }
    let (status, headers, page) = app.post_form_as_is("/login", &form).await;
    assert_eq!(status, StatusCode::SEE_OTHER, "{page}");
    headers[header::LOCATION].to_str().unwrap().to_string()
}

#[tokio::test]
async fn a_technician_lands_on_the_shop_unless_a_page_was_asked() {
    let app = TestApp::new().await;
    app.add_user("tess", Role::Technician).await;
    app.add_user("mona", Role::Manager).await;
    let anonymous = app.client();
    assert_eq!(login_to(&anonymous, "tess", None).await, "/shop");
    // The login form as shown with no `next` sends an empty one.
    assert_eq!(login_to(&anonymous, "tess", Some("")).await, "/shop");
    assert_eq!(
        login_to(&anonymous, "tess", Some("/machines?q=x")).await,
        "/machines?q=x"
    );
    // An explicit start page is respected too.
    assert_eq!(login_to(&anonymous, "tess", Some("/")).await, "/");
    assert_eq!(login_to(&anonymous, "mona", None).await, "/");
    // The login page asked with no `next` carries none (so the role decides).
    let (_, _, page) = anonymous.get_page("/login").await;
    assert!(page.contains("name=\"next\" value=\"\""), "{page}");
}

#[tokio::test]
async fn the_unit_search_ignores_case_and_separators() {
    let app = TestApp::new().await;
    let wanted = machine(&app, "HV-TH-14").await;
    machine(&app, "HV-TH-15").await;
    machine(&app, "XL 140").await;
    for query in ["th14", "TH-14", "th 14", "V-TH14"] {
        let (status, _, page) = app
            .get_page(&format!("/shop?q={}", query.replace(' ', "+")))
            .await;
        assert_eq!(status, StatusCode::OK, "{query}");
        assert!(page.contains("HV-TH-14"), "{query} finds HV-TH-14");
        assert!(!page.contains("HV-TH-15"), "{query} leaves HV-TH-15 out");
    }
    // The whole number with other separators goes straight to the machine.
    for query in ["hvth14", "hv_th_14", "HV TH 14"] {
        let (status, headers, _) = app
            .get_page(&format!("/shop?q={}", query.replace(' ', "+")))
            .await;
        assert_eq!(status, StatusCode::SEE_OTHER, "{query}");
        assert_eq!(
            headers[header::LOCATION],
            format!("/shop/machines/{wanted}").as_str()
        );
    }
    // The fleet list's search shares the rule.
    let (_, body) = app.get_json("/api/v1/machines?q=th-14").await;
    let found: Vec<&str> = body["items"]
        .as_array()
        .unwrap()
        .iter()
        .filter_map(|m| m["unit_number"].as_str())
        .collect();
    assert_eq!(found, ["HV-TH-14"], "{body}");
}

#[tokio::test]
async fn a_label_points_at_the_public_address_whatever_host_was_asked() {
    let app = TestApp::new().await;
    let (_, cylinder) = loaded_cylinder(&app, "HV-501").await;
    let request = app
        .builder("GET", &format!("/cylinders/{cylinder}/label"))
        .header(header::HOST, "attacker.example")
        .body(axum::body::Body::empty())
        .unwrap();
    let (status, _, bytes) = app.send(request).await;
    let page = String::from_utf8_lossy(&bytes);
    assert_eq!(status, StatusCode::OK);
    assert!(
        page.contains(&format!("https://loadhold.test/cylinders/{cylinder}</p>")),
        "{page}"
    );
    assert!(!page.contains("attacker.example"));
    assert!(page.contains("<svg class=\"qr-code\""));
    assert!(page.contains("data-print"), "a print button");
    // No public address configured: no address is made up.
    assert_eq!(record_address(None, "/cylinders/1"), None);
}
