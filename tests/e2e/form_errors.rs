//! A refused form shows each error beside its field, keeps every value typed, and says so at
//! the top: the registry's machine form (manager) and the tablet's drift-test form (technician).

use crate::browser::Browser;
use crate::fixture::Demo;

/// The error of `name` is shown, says something, and sits in the same field box as its input,
/// just below it.
async fn error_beside(b: &Browser, field_box: &str, name: &str) -> String {
    let error = b.find(&format!("#err-{name}")).await;
    assert!(
        error.is_displayed().await.unwrap_or(false),
        "the error of {name} is hidden"
    );
    let text = error.text().await.unwrap_or_default();
    assert!(
        text.trim().len() > 5,
        "the error of {name} says nothing: {text:?}"
    );
    let input = b.find(&format!("#f-{name}")).await;
    assert_eq!(
        input.attr("aria-invalid").await.ok().flatten().as_deref(),
        Some("true"),
        "{name} is marked invalid for screen readers"
    );
    let described = input
        .attr("aria-describedby")
        .await
        .ok()
        .flatten()
        .unwrap_or_default();
    assert!(
        described.contains(&format!("err-{name}")),
        "{name} points to its error"
    );
    // Same box, and the error right under the input (not in a list at the top of the page).
    let boxed = b
        .find_all(&format!("{field_box}.has-error #f-{name}"))
        .await
        .len()
        + b.find_all(&format!("{field_box}.has-error #err-{name}"))
            .await
            .len();
    assert_eq!(
        boxed, 2,
        "{name}'s input and error share a field box marked has-error"
    );
    let (_, input_y, _, input_h) = input.rectangle().await.expect("input box");
    let (_, error_y, _, _) = error.rectangle().await.expect("error box");
    assert!(
        error_y >= input_y && error_y - (input_y + input_h) < 80.0,
        "{name}'s error is not just below its input ({input_y}+{input_h} vs {error_y})"
    );
    text
}

#[tokio::test]
async fn the_machine_form_shows_each_error_beside_its_field_and_keeps_the_values() {
    let demo = Demo::start("form_errors_machine").await;
    let taken = demo
        .admin
        .get("/api/v1/machines?limit=1")
        .await
        .expect("machines")
        .json();
    let taken = taken["items"][0]["unit_number"]
        .as_str()
        .expect("a unit")
        .to_string();
    let mut b = Browser::open(demo.out.clone(), 768, 1024).await;
    demo.login(&mut b, "mgr.isla").await;
    b.goto(&demo.url("/machines/new")).await;
    b.shot("new-machine-form").await;
    b.fill("#f-unit_number", &taken).await;
    b.fill("#f-kind", "compact track loader").await;
    b.fill("#f-relief_pressure", "very high").await;
    b.fill("#f-hour_meter", "-12").await;
    b.click("form.record-form button[type='submit']").await;
    b.find(".form-errors").await;
    b.shot("new-machine-refused").await;
    let relief = error_beside(&b, ".field", "relief_pressure").await;
    let hours = error_beside(&b, ".field", "hour_meter").await;
    b.find("#err-relief_pressure").await;
    assert_ne!(relief, hours, "each field has its own message");
    // Everything typed is still there.
    for (name, typed) in [
        ("unit_number", taken.as_str()),
        ("kind", "compact track loader"),
        ("relief_pressure", "very high"),
        ("hour_meter", "-12"),
    ] {
        let value = b
            .find(&format!("#f-{name}"))
            .await
            .prop("value")
            .await
            .ok()
            .flatten();
        assert_eq!(value.as_deref(), Some(typed), "{name} kept its value");
    }
    // Fix the two, leave the duplicate unit number: now that is the one refused, beside it.
    b.fill("#f-relief_pressure", "250 bar").await;
    b.fill("#f-hour_meter", "12").await;
    b.click("form.record-form button[type='submit']").await;
    b.find(".form-errors").await;
    b.shot("duplicate-unit-refused").await;
    assert!(
        b.find_all("#err-relief_pressure").await.is_empty(),
        "a fixed field is clean"
    );
    error_beside(&b, ".field", "unit_number").await;
    let machines = demo
        .admin
        .get("/api/v1/machines?kind=compact%20track%20loader")
        .await
        .expect("machines")
        .json();
    assert_eq!(
        machines["items"].as_array().map(Vec::len),
        Some(0),
        "nothing was stored"
    );
    b.close().await;
}

#[tokio::test]
async fn the_drift_test_form_shows_each_error_beside_its_field_on_a_tablet() {
    let demo = Demo::start("form_errors_drift").await;
    let cylinders = demo
        .admin
        .get("/api/v1/cylinders?limit=1")
        .await
        .expect("cylinders")
        .json();
    let id = cylinders["items"][0]["id"].as_i64().expect("a cylinder");
    let mut b = Browser::open(demo.out.clone(), 768, 1024).await;
    demo.login(&mut b, "tech.rowan").await;
    b.goto(&demo.url(&format!("/shop/cylinders/{id}/drift-test")))
        .await;
    // No duration, an oil temperature that is not a number, a drift that is.
    b.quantity("drift", "2", "mm").await;
    b.quantity("oil_temperature_start", "50", "degC").await;
    b.quantity("oil_temperature_end", "warm", "degC").await;
    b.fill("#f-technician", "Rowan Tesh").await;
    b.click("form.shop-form button[type='submit']").await;
    b.find(".form-errors").await;
    b.shot("drift-form-refused").await;
    error_beside(&b, ".shop-field", "duration").await;
    error_beside(&b, ".shop-field", "oil_temperature_end").await;
    let (fits, sizes) = b.fits_width().await;
    assert!(
        fits,
        "the refused form scrolls sideways on a 768 px tablet: {sizes}"
    );
    for (name, typed) in [
        ("drift", "2"),
        ("oil_temperature_start", "50"),
        ("oil_temperature_end", "warm"),
    ] {
        let value = b
            .find(&format!("#f-{name}"))
            .await
            .prop("value")
            .await
            .ok()
            .flatten();
        assert_eq!(value.as_deref(), Some(typed), "{name} kept its value");
    }
    let tests = demo
        .admin
        .get(&format!("/api/v1/cylinders/{id}/drift-tests"))
        .await
        .expect("tests")
        .json();
    assert!(
        tests["items"]
            .as_array()
            .expect("items")
            .iter()
            .all(|t| t["technician"] != "Rowan Tesh"),
        "a refused form stores nothing"
    );
    b.close().await;
}
