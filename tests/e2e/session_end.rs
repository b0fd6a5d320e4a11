//! Issue 14, "a session end never loses a form": a technician fills the drift-test form, the
//! session ends (its cookie is gone, as after the 12-hour expiry), the form is sent, the login
//! page comes, and after logging in the technician is back on the same form with every value
//! and a message; sending it then stores the test.

use crate::browser::Browser;
use crate::fixture::{Demo, PASSWORD};

async fn value(b: &Browser, css: &str) -> String {
    b.find(css)
        .await
        .prop("value")
        .await
        .ok()
        .flatten()
        .unwrap_or_default()
}

#[tokio::test]
async fn a_form_sent_after_the_session_ended_comes_back_filled_after_login() {
    let demo = Demo::start("session_end").await;
    let cylinders = demo
        .admin
        .get("/api/v1/cylinders?limit=1")
        .await
        .expect("cylinders")
        .json();
    let cylinder = cylinders["items"][0]["id"].as_i64().expect("cylinder id");
    let form = format!("/shop/cylinders/{cylinder}/drift-test");
    let mut b = Browser::open(demo.out.clone(), 768, 1024).await;
    demo.login(&mut b, "tech.rowan").await;
    b.goto(&demo.url(&form)).await;
    b.quantity("duration", "10", "min").await;
    b.quantity("drift", "1.5", "mm").await;
    b.quantity("oil_temperature_start", "48", "degC").await;
    b.quantity("oil_temperature_end", "46", "degC").await;
    b.fill("#f-technician", "Rowan Tesh").await;
    b.shot("form-filled").await;

    // The session ends while the form is open.
    b.client
        .delete_cookie("loadhold_session")
        .await
        .expect("delete the session cookie");
    b.click("form.shop-form button[type='submit']").await;
    b.wait_for_path("/login").await;
    b.shot("login-after-expiry").await;
    b.fill("#username", "tech.rowan").await;
    b.fill("#password", PASSWORD).await;
    b.click("form[action='/login'] button[type='submit']").await;

    // Back on the same form, with the values and a message.
    b.wait_for_path(&form).await;
    b.find("p.restored").await;
    b.shot("form-restored").await;
    assert_eq!(value(&b, "#f-duration").await, "10");
    assert_eq!(value(&b, "#f-drift").await, "1.5");
    assert_eq!(value(&b, "#f-technician").await, "Rowan Tesh");
    assert_eq!(value(&b, "select[name='drift_unit']").await, "mm");
    assert_eq!(value(&b, "#f-oil_temperature_end").await, "46");
    let text = b.page_text().await;
    assert!(text.contains("session had ended"), "{text}");

    // Sending it now stores the test.
    b.click("form.shop-form button[type='submit']").await;
    b.wait_for_path("/shop/drift-tests/").await;
    b.shot("stored").await;
    // The record page forgets the kept values: the form opens empty again.
    b.goto(&demo.url(&form)).await;
    assert_eq!(value(&b, "#f-drift").await, "");
    assert!(b.find_all("p.restored").await.is_empty());
    b.close().await;
}
