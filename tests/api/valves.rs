//! Issue 12: the valves and the site's trapped-oil warming, through the calculation API and
//! the registry (stored, shown, refused naming the field, used by the safety panel).

use crate::helpers::{TestApp, assert_field_error};
use crate::registry_fixtures::machine;
use axum::http::StatusCode;
use serde_json::{Value, json};
use std::f64::consts::PI;

fn si(v: &Value) -> f64 {
    v["si"].as_f64().unwrap_or_else(|| panic!("no si in {v}"))
}

fn boom() -> Value {
    json!({
        "bore": "100 mm", "rod": "70 mm", "stroke": "1000 mm", "position": "500 mm",
        "load": "100 kN", "load_direction": "retract", "units": "metric",
    })
}

#[tokio::test]
async fn a_counterbalance_valve_in_the_request_caps_the_bypass_and_gives_its_pilot_pressure() {
    let app = TestApp::anonymous().await;
    let mut body = boom();
    body["holding_valve"] = json!("counterbalance");
    body["holding_valve_setting"] = json!("200 bar");
    body["holding_valve_pilot_ratio"] = json!(3);
    let (status, r) = app.post_json("/api/v1/calc/cylinder", &body).await;
    assert_eq!(status, StatusCode::OK, "{r}");
    assert_eq!(r["seal_bypass"]["outcome"], "creeps");
    assert!((si(&r["seal_bypass"]["final_pressure"]) - 200e5).abs() < 1.0);
    // REFERENCES.md last entry [C]: (p_set - F/A_cap) / (R + A_ann/A_cap).
    let (a_cap, a_rod) = (PI * 0.01 / 4.0, PI * 0.0049 / 4.0);
    let expected = (200e5 - 100e3 / a_cap) / (3.0 + (a_cap - a_rod) / a_cap);
    let got = si(&r["holding_valve"]["pilot_opening_pressure"]);
    assert!(
        ((got - expected) / expected).abs() < 0.005,
        "{got} vs {expected}"
    );
    assert_eq!(r["holding_valve"]["pilot_source"], "other_port");
    assert_eq!(r["valve_centre"]["rod"], "not_recorded");
    assert!(r["seal_bypass"]["settle_drift_one_percent_air"].is_null());
}

#[tokio::test]
async fn air_and_valve_centres_reach_the_answer_and_bad_ones_are_refused_by_name() {
    let app = TestApp::anonymous().await;
    let mut body = boom();
    body["entrained_air"] = json!(0.01);
    let (_, r) = app.post_json("/api/v1/calc/cylinder", &body).await;
    let with_air = si(&r["seal_bypass"]["settle_drift"]);
    let oil = si(&r["seal_bypass"]["settle_drift_oil_only"]);
    assert!(with_air > oil, "air adds room: {with_air} vs {oil}");
    assert_eq!(
        si(&r["seal_bypass"]["settle_drift_one_percent_air"]),
        with_air
    );
    for (field, value) in [
        ("entrained_air", json!(0.9)),
        ("cap_port_centre", json!("open")),
        ("holding_valve", json!("spool")),
        ("holding_valve_setting", json!("150 bar")),
    ] {
        let mut bad = boom();
        bad[field] = value;
        let (status, r) = app.post_json("/api/v1/calc/cylinder", &bad).await;
        assert_field_error(status, &r, StatusCode::UNPROCESSABLE_ENTITY, field);
    }
    let mut open = boom();
    open["rod_port_centre"] = json!("open_to_tank");
    let (_, r) = app.post_json("/api/v1/calc/cylinder", &open).await;
    assert_eq!(r["seal_bypass"]["outcome"], "sinks");
    assert_eq!(si(&r["trapped_oil_heating"]["rod_rise"]), 0.0);
}

#[tokio::test]
async fn a_registry_cylinder_keeps_its_valves_and_its_site_warming_reaches_the_panel() {
    let app = TestApp::new().await;
    let (status, site) = app
        .post_json(
            "/api/v1/sites",
            &json!({"name": "Sun Yard", "trapped_oil_warming": "25 K"}),
        )
        .await;
    assert_eq!(status, StatusCode::CREATED, "{site}");
    assert_eq!(site["trapped_oil_warming_basis"], "recorded");
    let m = machine(&app, "HV-SUN-1").await;
    app.patch_json(
        &format!("/api/v1/machines/{m}"),
        &json!({"site_id": site["id"]}),
    )
    .await;
    let (status, c) = app
        .post_json(
            "/api/v1/cylinders",
            &json!({
                "machine_id": m, "bore": "100 mm", "rod": "70 mm", "stroke": "1000 mm",
                "load_direction": "retract", "max_load": "100 kN",
                "holding_valve": "counterbalance", "holding_valve_setting": "170 bar",
                "holding_valve_pilot_ratio": 3.5, "rod_port_centre": "blocked",
            }),
        )
        .await;
    assert_eq!(status, StatusCode::CREATED, "{c}");
    assert_eq!(c["holding_valve"], "counterbalance");
    assert!((si(&c["holding_valve_setting"]) - 170e5).abs() < 1e-6);
    assert_eq!(c["rod_port_centre"], "blocked");
    let id = c["id"].as_i64().unwrap();
    // A setting without a counterbalance valve is refused naming it.
    let (status, r) = app
        .patch_json(
            &format!("/api/v1/cylinders/{id}"),
            &json!({"holding_valve": "pilot_check"}),
        )
        .await;
    assert_field_error(
        status,
        &r,
        StatusCode::UNPROCESSABLE_ENTITY,
        "holding_valve_setting",
    );
    let (status, r) = app
        .patch_json(
            &format!("/api/v1/cylinders/{id}"),
            &json!({"cap_port_centre": "open_to_tank", "holding_valve": null, "holding_valve_setting": null, "holding_valve_pilot_ratio": null}),
        )
        .await;
    assert_field_error(
        status,
        &r,
        StatusCode::UNPROCESSABLE_ENTITY,
        "cap_port_centre",
    );
    // The page's safety panel: the valve's relief shows in the hazards.
    let (status, _, page) = app.get_page(&format!("/cylinders/{id}")).await;
    assert_eq!(status, StatusCode::OK);
    assert!(page.contains("counterbalance valve"), "{page}");
    // The site's 25 K (not the 10 K default) warms the trapped oil up to the valve's setting.
    assert!(page.contains("Warming by 25"), "{page}");
}

#[tokio::test]
async fn the_free_piston_heating_holds_in_us_units() {
    // REFERENCES.md "Added 2026-12-02" check case [C] with US inputs: 4 in bore, 2 in rod,
    // 24 in stroke at 12 in, 18 degF of warming (10 K, NIST SP 811: 5/9 K per degF), oil
    // defaults 1.5 GPa and 7e-4 per K (REFERENCES.md "Fluid properties", from memory):
    // dp_rod = K alpha dT (1 + A_rod / (A_cap (L - x)/x + A_ann)); x = L/2.
    let app = TestApp::anonymous().await;
    let (status, r) = app
        .post_json(
            "/api/v1/calc/cylinder",
            &json!({
                "bore": "4 in", "rod": "2 in", "stroke": "24 in", "position": "12 in",
                "load": "10000 lbf", "load_direction": "retract", "units": "us",
                "temperature_rise": "18 degF",
            }),
        )
        .await;
    assert_eq!(status, StatusCode::OK, "{r}");
    let inch: f64 = 0.0254;
    let a_cap = PI * (4.0 * inch).powi(2) / 4.0;
    let a_rod = PI * (2.0 * inch).powi(2) / 4.0;
    let rod = 1.5e9 * 7e-4 * 10.0 * (1.0 + a_rod / (a_cap + (a_cap - a_rod)));
    let got = si(&r["trapped_oil_heating"]["rod_rise"]);
    assert!(((got - rod) / rod).abs() < 0.005, "{got} vs {rod}");
    assert_eq!(r["trapped_oil_heating"]["rod_rise"]["unit"], "psi");
}
