//! The shop pages on a tablet: the drift-test and inspection forms (stored once, values kept
//! on a refused submit), the cylinder history with its chart, the labels with a QR code, and
//! finding a unit by its number. Invented test data.

use crate::drift_tests::{loaded_cylinder, record};
use crate::helpers::{TEST_PASSWORD, TestApp};
use crate::registry_fixtures::machine;
use axum::http::StatusCode;
use axum::http::header::LOCATION;
use loadhold::auth::Role;
use std::collections::HashSet;

/// The value of the hidden input `name` in a page.
pub fn hidden(page: &str, name: &str) -> String {
    let marker = format!("name=\"{name}\" value=\"");
    let at = page.find(&marker).map(|i| i + marker.len()).expect(name);
    page[at..].chars().take_while(|c| *c != '"').collect()
}

fn location(headers: &axum::http::HeaderMap) -> String {
    headers
        .get(LOCATION)
        .and_then(|v| v.to_str().ok())
        .unwrap_or("")
        .to_string()
}

async fn count(app: &TestApp, table: &str) -> i64 {
    let sql = match table {
        "drift_tests" => "SELECT COUNT(*) FROM drift_tests",
        _ => "SELECT COUNT(*) FROM inspections",
    };
    sqlx::query_scalar(sql)
        .fetch_one(&app.db)
        .await
        .expect("count")
}

pub fn drift_form<'a>(token: &'a str, duration: &'a str) -> Vec<(&'a str, &'a str)> {
    vec![
        ("client_token", token),
        ("procedure_id", ""),
        ("technician", "Sam Teller"),
        ("tested_at", "2025-03-14T09:30"),
        ("drift", "3"),
        ("drift_unit", "mm"),
        ("duration", duration),
        ("duration_unit", "s"),
        ("oil_temperature_start", "41"),
        ("oil_temperature_start_unit", "degC"),
        ("oil_temperature_end", "41"),
        ("oil_temperature_end_unit", "degC"),
        ("cap_pressure_start", "64"),
        ("cap_pressure_start_unit", "bar"),
        ("limit_distance", "5"),
        ("limit_distance_unit", "mm"),
        ("limit_per", "10"),
        ("limit_per_unit", "min"),
    ]
}

#[tokio::test]
async fn the_drift_test_form_stores_once_and_shows_the_analysis_on_the_spot() {
    let app = TestApp::session(Role::Admin).await;
    let (_, cylinder) = loaded_cylinder(&app, "HV-301").await;
    let form = format!("/shop/cylinders/{cylinder}/drift-test");
    let (status, _, page) = app.get_page(&form).await;
    assert_eq!(status, StatusCode::OK);
    assert!(
        page.contains("name=\"csrf\""),
        "the form carries the csrf field"
    );
    assert!(
        page.contains("data-timer-for=\"f-duration\""),
        "the stopwatch button"
    );
    assert!(
        page.contains("Never feel for leaks by hand"),
        "the usual cautions are on the form"
    );
    let token = hidden(&page, "client_token");
    assert!(token.len() >= 32, "a server-made client token: {token}");

    let fields = drift_form(&token, "600");
    let (status, headers, _) = app.post_form(&form, &fields).await;
    assert_eq!(status, StatusCode::SEE_OTHER);
    let first = location(&headers);
    assert!(first.starts_with("/shop/drift-tests/"), "{first}");

    // The same form sent again (a double tap, a retry on a weak signal) is stored once.
    let (status, headers, _) = app.post_form(&form, &fields).await;
    assert_eq!(status, StatusCode::SEE_OTHER);
    assert_eq!(location(&headers), format!("{first}?repeat=1"));
    assert_eq!(count(&app, "drift_tests").await, 1);

    let (status, _, shown) = app.get_page(&first).await;
    assert_eq!(status, StatusCode::OK);
    assert!(shown.contains("Sam Teller"), "signed by the technician");
    // The decision comes first, by word and shape; the limit's verdict follows in words.
    let decision = shown
        .find("<h2 id=\"verdict-title\">Decision</h2>")
        .expect("decision");
    let verdict = shown.find("Against the limit").expect("verdict in words");
    assert!(decision < verdict, "the decision comes before the verdict");
    assert!(
        ["Fit for service", "Restricted use", "Remove from service"]
            .iter()
            .any(|d| shown.contains(d)),
        "a decision in words"
    );
    assert!(shown.contains("class=\"shape\""), "and a shape");
    assert!(shown.contains("Within the limit"));
    assert!(
        shown.contains("<ol class=\"reasoning\"><li>"),
        "the reasoning is listed"
    );
    let (_, _, again) = app.get_page(&format!("{first}?repeat=1")).await;
    assert!(again.contains("Already saved"));

    let readings: String = sqlx::query_scalar("SELECT readings_json FROM drift_tests")
        .fetch_one(&app.db)
        .await
        .expect("readings");
    assert!(
        readings.contains("\"3 mm\""),
        "the unit chosen beside the input: {readings}"
    );
}

#[tokio::test]
async fn a_refused_form_keeps_every_value_and_marks_the_field() {
    let app = TestApp::session(Role::Admin).await;
    let (_, cylinder) = loaded_cylinder(&app, "HV-302").await;
    let form = format!("/shop/cylinders/{cylinder}/drift-test");
    let (_, _, page) = app.get_page(&form).await;
    let token = hidden(&page, "client_token");
    let mut fields = drift_form(&token, "soon");
    fields.push(("notes", "Boom <b>level</b>, bucket empty"));
    let (status, _, again) = app.post_form(&form, &fields).await;
    assert_eq!(status, StatusCode::UNPROCESSABLE_ENTITY);
    assert!(
        again.contains("id=\"err-duration\""),
        "the error beside the field"
    );
    assert!(again.contains("value=\"soon\""));
    assert!(again.contains("value=\"41\""));
    assert!(again.contains("value=\"Sam Teller\""));
    assert!(
        again.contains("Boom &#60;b&#62;level&#60;/b&#62;") || again.contains("Boom &lt;b&gt;")
    );
    assert_eq!(
        hidden(&again, "client_token"),
        token,
        "the same token, so a fix stores once"
    );
    assert_eq!(count(&app, "drift_tests").await, 0);

    // Corrected and sent again: stored.
    let fields = drift_form(&token, "600");
    let (status, _, _) = app.post_form(&form, &fields).await;
    assert_eq!(status, StatusCode::SEE_OTHER);
    assert_eq!(count(&app, "drift_tests").await, 1);
}

#[tokio::test]
async fn the_inspection_form_takes_the_machine_out_of_service_once() {
    let app = TestApp::session(Role::Admin).await;
    let id = machine(&app, "HV-303").await;
    let form = format!("/shop/machines/{id}/inspection");
    let (status, _, page) = app.get_page(&form).await;
    assert_eq!(status, StatusCode::OK);
    let token = hidden(&page, "client_token");
    let fields = [
        ("client_token", token.as_str()),
        ("kind", "frequent"),
        ("performed_on", "2025-06-02"),
        ("hour_meter", "2210"),
        ("inspector", "Sam Teller"),
        ("item_hoses", "fail"),
        ("item_hoses_note", "Cap-end hose chafed through the cover"),
        ("item_external_leakage", "attention"),
        ("leakage_class", "3"),
        ("result", "fail"),
        ("deficiencies", "Hose chafed; weeping at the rod gland"),
        ("corrective_action", "Replace the hose before use"),
    ];
    let (status, headers, _) = app.post_form(&form, &fields).await;
    assert_eq!(status, StatusCode::SEE_OTHER);
    let record = location(&headers);
    let (status, headers, _) = app.post_form(&form, &fields).await;
    assert_eq!(status, StatusCode::SEE_OTHER);
    assert_eq!(location(&headers), format!("{record}?repeat=1"));
    assert_eq!(count(&app, "inspections").await, 1);
    let (_, _, shown) = app.get_page(&record).await;
    assert!(shown.contains("took HV-303 out of service"), "{shown}");
    assert!(shown.contains("class 3"));
    let (_, m) = app.get_json(&format!("/api/v1/machines/{id}")).await;
    assert_eq!(m["status"], "out_of_service");
    let (_, _, shop) = app.get_page(&format!("/shop/machines/{id}")).await;
    assert!(shop.contains("tag-bad"), "out of service by word and shape");

    // A refused inspection keeps its values.
    let (_, _, page) = app.get_page(&form).await;
    let token = hidden(&page, "client_token");
    let bad = [
        ("client_token", token.as_str()),
        ("kind", "periodic"),
        ("performed_on", "2025-06-09"),
        ("hour_meter", "lots"),
        ("inspector", "Sam Teller"),
        ("result", "pass"),
        ("item_rod", "fail"),
        ("item_rod_note", "Scored 40 mm from the gland"),
    ];
    let (status, _, again) = app.post_form(&form, &bad).await;
    assert_eq!(status, StatusCode::UNPROCESSABLE_ENTITY);
    assert!(again.contains("id=\"err-hour_meter\""));
    assert!(
        again.contains("id=\"err-result\""),
        "a pass with a failed item is refused"
    );
    assert!(again.contains("value=\"Scored 40 mm from the gland\""));
    assert!(again.contains("value=\"lots\""));
}

#[tokio::test]
async fn the_cylinder_history_charts_the_leak_drift_with_its_limit_and_an_estimate() {
    let app = TestApp::new().await;
    let (_, cylinder) = loaded_cylinder(&app, "HV-304").await;
    let path = format!("/api/v1/cylinders/{cylinder}/drift-tests");
    for (i, (on, drift)) in [
        ("2024-01-10", "1.0 mm"),
        ("2024-04-10", "1.6 mm"),
        ("2024-07-10", "2.3 mm"),
        ("2024-10-10", "2.9 mm"),
    ]
    .iter()
    .enumerate()
    {
        let mut body = record(&format!("h-{i}"));
        body["tested_at"] = (*on).into();
        body["drift"] = (*drift).into();
        let (status, answer) = app.post_json(&path, &body).await;
        assert_eq!(status, StatusCode::CREATED, "{answer}");
    }
    let (status, _, page) = app.get_page(&format!("/shop/cylinders/{cylinder}")).await;
    assert_eq!(status, StatusCode::OK);
    assert!(
        page.contains("<svg class=\"chart\""),
        "a server-rendered chart"
    );
    assert!(page.contains("class=\"limit-line\""), "the limit line");
    assert!(page.contains("class=\"trend-line\""), "the trend");
    assert!(
        page.contains("Estimate:"),
        "the projection is labelled an estimate"
    );
    assert_eq!(page.matches("<circle").count(), 4, "one mark per test");
    assert!(page.contains("limit 5 mm"));
    // The registry's cylinder page carries the same history.
    let (status, _, registry) = app.get_page(&format!("/cylinders/{cylinder}")).await;
    assert_eq!(status, StatusCode::OK);
    assert!(
        registry.contains("<svg class=\"chart\""),
        "history on /cylinders/{{id}}"
    );
    assert!(registry.contains("Drift-test history"));
}

/// The dark modules of a QR path `M{x} {y}h1v1h-1z...`.
fn modules(path: &str) -> HashSet<(usize, usize)> {
    path.split('M')
        .filter(|p| !p.is_empty())
        .filter_map(|p| {
            let xy = p.split('h').next()?;
            let mut parts = xy.split(' ');
            Some((parts.next()?.parse().ok()?, parts.next()?.parse().ok()?))
        })
        .collect()
}

fn attribute(page: &str, marker: &str) -> String {
    let at = page.find(marker).map(|i| i + marker.len()).expect(marker);
    page[at..].chars().take_while(|c| *c != '"').collect()
}

#[tokio::test]
async fn a_label_carries_a_qr_code_of_the_record_page() {
    let app = TestApp::new().await;
    let (machine_id, cylinder) = loaded_cylinder(&app, "HV-305").await;
    let (status, _, page) = app.get_page(&format!("/cylinders/{cylinder}/label")).await;
    assert_eq!(status, StatusCode::OK);
    assert!(page.contains("HV-305"));
    assert!(page.contains("Bore 100 mm"), "{page}");
    assert!(
        page.contains(&format!("/cylinders/{cylinder}</p>")),
        "the address in words"
    );
    assert!(page.contains("<svg class=\"qr-code\""));
    let view = attribute(
        &page,
        "class=\"qr-code\" xmlns=\"http://www.w3.org/2000/svg\" viewBox=\"0 0 ",
    );
    let size: usize = view
        .split(' ')
        .next()
        .and_then(|s| s.parse().ok())
        .expect("size");
    // ISO/IEC 18004: a version-v symbol is 17 + 4v modules wide; 4 modules of quiet zone on
    // each side.
    let side = size - 8;
    assert!(side >= 21 && (side - 17).is_multiple_of(4), "side {side}");
    let path = attribute(&page, "<path d=\"");
    let dark = modules(&path);
    // ISO/IEC 18004 finder pattern in three corners: a dark 7x7 ring, a light ring, a dark
    // 3x3 centre.
    for (cx, cy) in [(4, 4), (4 + side - 7, 4), (4, 4 + side - 7)] {
        for dy in 0..7 {
            for dx in 0..7 {
                let ring = dx == 0 || dy == 0 || dx == 6 || dy == 6;
                let centre = (2..=4).contains(&dx) && (2..=4).contains(&dy);
                let expected = ring || centre;
                assert_eq!(
                    dark.contains(&(cx + dx, cy + dy)),
                    expected,
                    "finder module ({dx}, {dy}) at ({cx}, {cy})"
                );
            }
        }
    }
    let (status, _, page) = app.get_page(&format!("/machines/{machine_id}/label")).await;
    assert_eq!(status, StatusCode::OK);
    assert!(page.contains(&format!("/machines/{machine_id}</p>")));
    assert!(page.contains("<svg class=\"qr-code\""));
}

#[tokio::test]
async fn the_shop_finds_a_unit_by_its_number() {
    let app = TestApp::new().await;
    let a = machine(&app, "HV-401").await;
    machine(&app, "HV-402").await;
    let (status, headers, _) = app.get_page("/shop?q=hv-401").await;
    assert_eq!(
        status,
        StatusCode::SEE_OTHER,
        "an exact number opens the unit"
    );
    assert_eq!(location(&headers), format!("/shop/machines/{a}"));
    let (status, _, page) = app.get_page("/shop?q=HV-40").await;
    assert_eq!(status, StatusCode::OK);
    assert!(page.contains("HV-401") && page.contains("HV-402"));
    let (_, _, none) = app.get_page("/shop?q=ZZ-9").await;
    assert!(none.contains("No unit matches"));
}

#[tokio::test]
async fn a_technician_records_a_test_signed_with_their_login_name() {
    let admin = TestApp::new().await;
    let (_, cylinder) = loaded_cylinder(&admin, "HV-306").await;
    admin.add_user("tech1", Role::Technician).await;
    let mut tech = admin.client();
    assert_eq!(
        tech.login("tech1", TEST_PASSWORD).await,
        StatusCode::SEE_OTHER
    );
    let form = format!("/shop/cylinders/{cylinder}/drift-test");
    let (status, _, page) = tech.get_page(&form).await;
    assert_eq!(status, StatusCode::OK);
    let token = hidden(&page, "client_token");
    let mut fields = drift_form(&token, "600");
    fields.retain(|(k, _)| *k != "technician");
    let (status, headers, _) = tech.post_form(&form, &fields).await;
    assert_eq!(
        status,
        StatusCode::SEE_OTHER,
        "a technician may enter shop records"
    );
    let (_, _, shown) = tech.get_page(&location(&headers)).await;
    assert!(
        shown.contains("Signed by the account <strong>tech1</strong>"),
        "{shown}"
    );
}
