//! `GET /api/v1/hose-ratings` and the hose form's suggestion. Expected values from
//! REFERENCES.md's hose table [M]: SAE 100R2AT -8 is 3500 psi, EN 853 2SN -8 (DN12) 275 bar.

use crate::helpers::{TestApp, assert_field_error};
use crate::registry_fixtures::{machine, site};
use axum::http::StatusCode;
use loadhold::auth::Role;

#[tokio::test]
async fn a_technician_reads_one_rating_with_its_standard_and_mark() {
    let app = TestApp::with_role(Role::Technician).await;
    let (status, body) = app
        .get_json("/api/v1/hose-ratings?spec=SAE%20100R2AT&size=-8&units=us")
        .await;
    assert_eq!(status, StatusCode::OK, "{body}");
    let items = body["items"].as_array().expect("items");
    assert_eq!(items.len(), 1, "{body}");
    let row = &items[0];
    assert_eq!(row["spec"], "SAE 100R2AT");
    assert_eq!(row["standard"], "SAE J517");
    assert_eq!(row["source"], "from memory");
    assert_eq!(row["size"], "-8");
    assert_eq!(row["table_value"]["value"], 3500.0);
    assert_eq!(row["table_value"]["unit"], "psi");
    // 3500 psi x 6894.757293168 Pa/psi (REFERENCES.md "Units") = 24.1316505 MPa.
    let si = row["max_working_pressure"]["si"].as_f64().expect("si");
    assert!((si - 3500.0 * 6894.757293168).abs() < 1e-3, "{si}");
    assert_eq!(row["max_working_pressure"]["unit"], "psi");
    assert!(body["caution"].as_str().unwrap().contains("layline"));
}

#[tokio::test]
async fn the_whole_table_a_dn_size_and_bad_or_unknown_input() {
    let app = TestApp::new().await;
    let (status, all) = app.get_json("/api/v1/hose-ratings").await;
    assert_eq!(status, StatusCode::OK);
    // REFERENCES.md: 9 sizes each for 100R1AT, 1SN, 100R2AT, 2SN; 8 for 100R12; 5 for 100R13.
    assert_eq!(all["items"].as_array().unwrap().len(), 9 * 4 + 8 + 5);

    let (_, dn) = app
        .get_json("/api/v1/hose-ratings?spec=EN%20853%202SN&size=DN12")
        .await;
    assert_eq!(dn["items"][0]["table_value"]["value"], 275.0, "{dn}");

    let (status, body) = app.get_json("/api/v1/hose-ratings?size=huge").await;
    assert_field_error(status, &body, StatusCode::UNPROCESSABLE_ENTITY, "size");
    let (status, body) = app.get_json("/api/v1/hose-ratings?colour=red").await;
    assert_field_error(status, &body, StatusCode::UNPROCESSABLE_ENTITY, "colour");

    let (status, none) = app
        .get_json("/api/v1/hose-ratings?spec=EN%20856%204SP")
        .await;
    assert_eq!(status, StatusCode::OK);
    assert!(none["items"].as_array().unwrap().is_empty());
    assert!(none["note"].as_str().unwrap().contains("layline"), "{none}");

    let anonymous = TestApp::anonymous().await;
    let (status, _) = anonymous.get_json("/api/v1/hose-ratings").await;
    assert_eq!(status, StatusCode::UNAUTHORIZED);
}

#[tokio::test]
async fn the_hose_form_suggests_the_table_value_and_the_entered_value_wins() {
    let app = TestApp::new().await;
    let _ = site(&app, "Harbour Depot", "metric").await;
    let m = machine(&app, "HX-17").await;
    let (status, body) = app
        .post_json(
            "/api/v1/hoses",
            &serde_json::json!({"machine_id": m, "circuit": "pump to valve", "spec": "EN 853 2SN",
                "size": "-8", "working_pressure": "250 bar"}),
        )
        .await;
    assert_eq!(status, StatusCode::CREATED, "{body}");
    let id = body["id"].as_i64().unwrap();
    let (status, _, page) = app.get_page(&format!("/hoses/{id}/edit")).await;
    assert_eq!(status, StatusCode::OK);
    assert!(
        page.contains("Suggested default for EN 853 2SN size -8: 275 bar")
            && page.contains("from memory")
            && page.contains("layline"),
        "the suggestion names its value, source and the layline"
    );
    assert!(
        page.contains("value=\"250 bar\""),
        "the shop's entered value stays in the field"
    );
    let (_, stored) = app.get_json(&format!("/api/v1/hoses/{id}")).await;
    assert!((stored["working_pressure"]["si"].as_f64().unwrap() - 250e5).abs() < 1e-6);
}
