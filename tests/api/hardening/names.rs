//! Look-alike unit numbers and site names: NFKC, trimmed, control and bidirectional-override
//! characters refused, uniqueness blind to case, separators and confusable characters (the
//! skeletons of Unicode Technical Standard #39), and the refusal names the registered unit.

use crate::helpers::{TestApp, assert_field_error};
use crate::reports::fleet;
use axum::http::StatusCode;
use serde_json::json;

#[tokio::test]
async fn look_alikes_of_a_registered_unit_are_refused_naming_it() {
    let app = TestApp::new().await;
    fleet::machine(
        &app,
        json!({"unit_number": "HV-SS-15", "kind": "aerial lift"}),
    )
    .await;
    let look_alikes = [
        "hv-ss-15",               // letter case
        "HV SS 15",               // other separators
        "HVSS15",                 // no separators
        "HV\u{2010}SS\u{2011}15", // Unicode hyphens
        "HV-SS-\u{FF11}\u{FF15}", // full-width digits (NFKC makes them 1 and 5)
        "\u{041D}V-SS-15",        // Cyrillic EN for the Latin H
        "HV-SS-l5",               // lower-case L for the digit one
    ];
    for unit in look_alikes {
        let (status, body) = app
            .post_json(
                "/api/v1/machines",
                &json!({"unit_number": unit, "kind": "aerial lift"}),
            )
            .await;
        assert_field_error(status, &body, StatusCode::CONFLICT, "unit_number");
        assert!(
            body["error"]["message"]
                .as_str()
                .unwrap_or("")
                .contains("\"HV-SS-15\""),
            "{unit:?} names the registered unit: {body}"
        );
    }
    for hidden in [
        "HV-SS-1\u{200B}6",
        "\u{202E}HV-SS-16",
        "HV-SS-16\u{2066}",
        "HV\u{7}-SS-16",
    ] {
        let (status, body) = app
            .post_json(
                "/api/v1/machines",
                &json!({"unit_number": hidden, "kind": "aerial lift"}),
            )
            .await;
        assert_field_error(
            status,
            &body,
            StatusCode::UNPROCESSABLE_ENTITY,
            "unit_number",
        );
    }
    // a clearly different unit is fine, and the stored text is NFKC and trimmed
    let (status, body) = app
        .post_json(
            "/api/v1/machines",
            &json!({"unit_number": "  HV-SS-\u{FF11}\u{FF16} ", "kind": "aerial lift",
                    "serial": "\u{FF21}7731"}),
        )
        .await;
    assert_eq!(status, StatusCode::CREATED, "{body}");
    assert_eq!(body["unit_number"], "HV-SS-16");
    assert_eq!(body["serial"], "A7731");
    // the unit search follows the same rule
    let (_, found) = app.get_json("/api/v1/machines?q=hvss15").await;
    let units: Vec<&str> = found["items"]
        .as_array()
        .map(|a| a.iter().filter_map(|m| m["unit_number"].as_str()).collect())
        .unwrap_or_default();
    assert_eq!(units, ["HV-SS-15"], "{found}");
}

#[tokio::test]
async fn look_alike_site_names_are_refused() {
    let app = TestApp::new().await;
    fleet::site(&app, "North Yard").await;
    for name in [
        "north yard",
        "North-Yard",
        "N\u{043E}rth Yard",
        "North Yard\u{200B}",
    ] {
        let (status, body) = app
            .post_json("/api/v1/sites", &json!({"name": name, "units": "metric"}))
            .await;
        assert!(
            status == StatusCode::CONFLICT || status == StatusCode::UNPROCESSABLE_ENTITY,
            "{name:?}: {status} {body}"
        );
        assert_eq!(body["error"]["field"], "name", "{body}");
    }
}
