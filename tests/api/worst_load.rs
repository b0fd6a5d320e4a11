//! Issue 12, worst load and ratings everywhere: the lowest load on registry cylinders and
//! `min_load` in the calculation API, the 140/95 mm example on the safety panel and the hazard
//! list in both unit systems, and the relief setting as a limit where no rating is recorded.
//! (Vacuum readings and the tube are in `readings_and_strength`.)
//!
//! Expected values are written out from the force balance on the piston (REFERENCES.md "Flow
//! and circuits", common practice); the cylinders are invented test data.

use crate::calc::{PSI, close};
use crate::helpers::{TestApp, assert_field_error};
use crate::registry_fixtures::machine_with;
use axum::http::StatusCode;
use serde_json::{Value, json};

/// p_rod with no load = 250 bar x 140² / (140² - 95²) = 250 x 19600 / 10575 = 463.36 bar.
const NO_LOAD_ROD_SIDE: f64 = 250e5 * 19600.0 / 10575.0;
/// p_rod at 180 kN = (250e5 x pi/4 x 0.14² - 180e3) / (pi/4 x (0.14² - 0.095²)) = 246.63 bar.
const HEAVY_ROD_SIDE: f64 = 246.63e5;

fn find(list: &Value, pred: impl Fn(&Value) -> bool) -> &Value {
    list.as_array()
        .and_then(|items| items.iter().find(|i| pred(i)))
        .unwrap_or_else(|| panic!("not found in {list}"))
}

pub fn example(units: &str) -> Value {
    json!({
        "bore": "140 mm", "rod": "95 mm", "stroke": "1 m",
        "load": "180 kN", "min_load": "0 kN", "load_direction": "retract",
        "supply_pressure": "250 bar", "ratings": {"cylinder": "350 bar"}, "units": units
    })
}

#[tokio::test]
async fn the_calculation_api_takes_the_lightest_load_for_the_blocked_rod_end() {
    let app = TestApp::new().await;
    for units in ["metric", "us"] {
        let (status, body) = app
            .post_json("/api/v1/calc/cylinder", &example(units))
            .await;
        assert_eq!(status, StatusCode::OK, "{body}");
        let check = find(&body["checks"], |c| {
            c["component"] == "cylinder" && c["scenario"] == "rod_side_intensification"
        });
        close(&check["pressure"], NO_LOAD_ROD_SIDE, "rod side, no load");
        assert_eq!(check["status"], "exceeds");
        assert_eq!(check["load"]["si"], 0.0, "the load used is stated");
        close(
            &body["rod_side_intensification"]["rod_pressure"],
            NO_LOAD_ROD_SIDE,
            "rod-side figure",
        );
        assert_eq!(body["rod_side_intensification"]["load"]["si"], 0.0);
        assert_eq!(body["load_range"]["min_load"]["si"], 0.0);
        close(&body["load_range"]["load"], 180e3, "highest load");
        let scenario = find(&body["scenarios"], |s| {
            s["name"] == "rod_side_intensification"
        });
        close(
            &scenario["cap_load"],
            180e3,
            "cap end: a tie names the heavy load",
        );
        assert_eq!(scenario["rod_load"]["si"], 0.0);
        // The holding pressure stays at the heavy load: 180e3 / (pi/4 x 0.14²) = 116.93 bar.
        close(&body["holding"]["cap_pressure"], 116.93e5, "holding");
        if units == "us" {
            // 463.36 bar / 6894.757 Pa per psi = 6720.4 psi.
            assert_eq!(check["pressure"]["unit"], "psi");
            let psi = check["pressure"]["value"].as_f64().unwrap();
            assert!((psi - NO_LOAD_ROD_SIDE / PSI).abs() < 0.5, "{psi}");
            assert!((psi - 6720.4).abs() < 0.5, "{psi}");
        }
        assert!(
            body["cautions"]
                .as_array()
                .unwrap()
                .iter()
                .any(|c| c.as_str().unwrap().contains("rated pressure")),
            "{}",
            body["cautions"]
        );
    }
    // Without min_load the range is the load alone (the figure for that load, as before).
    let mut one = example("metric");
    one.as_object_mut().unwrap().remove("min_load");
    let (_, body) = app.post_json("/api/v1/calc/cylinder", &one).await;
    close(
        &body["rod_side_intensification"]["rod_pressure"],
        HEAVY_ROD_SIDE,
        "one load",
    );
    // ...and a note says what a lighter load would give (463.4 bar with no load).
    assert!(
        body["notes"]
            .as_array()
            .unwrap()
            .iter()
            .any(|n| n.as_str().unwrap().contains("up to 463.4 bar with no load")),
        "{}",
        body["notes"]
    );
    // A lowest load above the load is refused naming min_load.
    let mut bad = example("metric");
    bad["min_load"] = json!("200 kN");
    let (status, body) = app.post_json("/api/v1/calc/cylinder", &bad).await;
    assert_field_error(status, &body, StatusCode::UNPROCESSABLE_ENTITY, "min_load");
}

/// A crane with a relief setting (and a site, if given); returns its id.
async fn crane(app: &TestApp, unit: &str, relief: &str, site: Option<i64>) -> i64 {
    machine_with(
        app,
        json!({"unit_number": unit, "kind": "crane", "relief_pressure": relief, "site_id": site}),
    )
    .await["id"]
        .as_i64()
        .unwrap()
}

/// A machine with a 250 bar relief setting and the 140/95 mm cylinder on it (180 kN highest
/// load pushing the rod in, rated 350 bar, no lowest load recorded); returns the cylinder id.
async fn registry_example(app: &TestApp, units: &str) -> i64 {
    let site = crate::registry_fixtures::site(app, &format!("Yard {units}"), units).await;
    let m = crane(app, &format!("HV-140-{units}"), "250 bar", Some(site)).await;
    let (status, c) = app
        .post_json(
            "/api/v1/cylinders",
            &json!({"machine_id": m, "function": "main boom", "bore": "140 mm", "rod": "95 mm",
                    "stroke": "1200 mm", "load_direction": "retract", "max_load": "180 kN",
                    "rated_pressure": "350 bar"}),
        )
        .await;
    assert_eq!(status, StatusCode::CREATED, "{c}");
    c["id"].as_i64().unwrap()
}

#[tokio::test]
async fn the_safety_panel_and_hazard_list_show_463_bar_for_the_140_95_example() {
    let app = TestApp::new().await;
    let c = registry_example(&app, "metric").await;
    let (status, _, page) = app.get_page(&format!("/cylinders/{c}")).await;
    assert_eq!(status, StatusCode::OK);
    assert!(page.contains("463.4 bar"), "the blocked rod end at no load");
    assert!(!page.contains("246.6 bar"), "not the heavy-load figure");
    assert!(page.contains("no lowest load recorded"));
    assert!(page.contains("at a load of 0 kN"));
    let (_, hazards) = app
        .get_json("/api/v1/reports/hazards?as_of=2026-01-01")
        .await;
    let item = find(&hazards["pressures"], |p| {
        p["cylinder_id"] == c && p["scenario"] == "rod_side_intensification"
    });
    assert_eq!(item["component"], "cylinder");
    close(&item["pressure"], NO_LOAD_ROD_SIDE, "hazard list");
    close(&item["rating"], 350e5, "rating");
    assert_eq!(item["load"]["si"], 0.0);
    // A recorded lowest load of 100 kN: (384,845 - 100,000) / 8.3056e-3 = 342.96 bar, still
    // on the list but lower.
    let (status, body) = app
        .patch_json(
            &format!("/api/v1/cylinders/{c}"),
            &json!({"min_load": "100 kN"}),
        )
        .await;
    assert_eq!(status, StatusCode::OK, "{body}");
    close(&body["min_load"], 100e3, "stored lowest load");
    let (_, hazards) = app
        .get_json("/api/v1/reports/hazards?as_of=2026-01-01")
        .await;
    let items: Vec<&Value> = hazards["pressures"]
        .as_array()
        .unwrap()
        .iter()
        .filter(|p| p["cylinder_id"] == c && p["scenario"] == "rod_side_intensification")
        .collect();
    assert!(items.is_empty(), "342.96 bar is within 350 bar: {items:?}");
    let (_, _, page) = app.get_page(&format!("/cylinders/{c}")).await;
    assert!(page.contains("343 bar"), "rod side at 100 kN");
    assert!(page.contains("recorded lowest load"));
}

#[tokio::test]
async fn the_140_95_example_on_a_site_in_us_units() {
    let app = TestApp::new().await;
    let c = registry_example(&app, "us").await;
    // 463.36 bar = 6720.4 psi; the rating 350 bar = 5076.3 psi.
    let (_, _, page) = app.get_page(&format!("/cylinders/{c}")).await;
    assert!(page.contains("6720 psi"), "US units on a US site");
    let (_, hazards) = app
        .get_json("/api/v1/reports/hazards?as_of=2026-01-01&units=us")
        .await;
    let item = find(&hazards["pressures"], |p| {
        p["cylinder_id"] == c && p["scenario"] == "rod_side_intensification"
    });
    assert_eq!(item["pressure"]["unit"], "psi");
    let psi = item["pressure"]["value"].as_f64().unwrap();
    assert!((psi - 6720.4).abs() < 0.5, "{psi}");
    assert_eq!(item["load"]["unit"], "lbf");
}

#[tokio::test]
async fn registry_cylinders_keep_their_lowest_load_free_length_and_rod_yield() {
    let app = TestApp::new().await;
    let m = crate::registry_fixtures::machine(&app, "HV-LR-01").await;
    let (status, c) = app
        .post_json(
            "/api/v1/cylinders",
            &json!({"machine_id": m, "bore": "100 mm", "rod": "56 mm", "stroke": "600 mm",
                    "load_direction": "retract", "max_load": "40 kN", "min_load": "8 kN",
                    "buckling_length": "1.4 m", "rod_yield": "490 MPa"}),
        )
        .await;
    assert_eq!(status, StatusCode::CREATED, "{c}");
    close(&c["min_load"], 8e3, "min_load");
    close(&c["buckling_length"], 1.4, "buckling_length");
    close(&c["rod_yield"], 490e6, "rod_yield");
    let id = c["id"].as_i64().unwrap();
    let (_, read) = app.get_json(&format!("/api/v1/cylinders/{id}")).await;
    close(&read["min_load"], 8e3, "read back");
    let (status, body) = app
        .patch_json(
            &format!("/api/v1/cylinders/{id}"),
            &json!({"min_load": "50 kN"}),
        )
        .await;
    assert_field_error(status, &body, StatusCode::UNPROCESSABLE_ENTITY, "min_load");
    let (status, body) = app
        .patch_json(
            &format!("/api/v1/cylinders/{id}"),
            &json!({"min_load": null, "buckling_length": null}),
        )
        .await;
    assert_eq!(status, StatusCode::OK, "{body}");
    assert!(body["min_load"].is_null() && body["buckling_length"].is_null());
    let (status, body) = app
        .post_json(
            "/api/v1/cylinders",
            &json!({"machine_id": m, "bore": "100 mm", "rod": "56 mm", "stroke": "600 mm",
                    "load_direction": "retract", "buckling_length": "-1 m"}),
        )
        .await;
    assert_field_error(
        status,
        &body,
        StatusCode::UNPROCESSABLE_ENTITY,
        "buckling_length",
    );
}

#[tokio::test]
async fn a_blocked_rod_end_far_above_the_relief_setting_with_no_rating_is_a_hazard() {
    // 100/70 mm, 200 kN pulling the rod out, 20 bar relief, nothing rated: rod side
    // (20e5 x 7.854e-3 + 200e3) / 4.0055e-3 = 538.5 bar, 26.93 times the relief setting.
    let app = TestApp::new().await;
    let (status, body) = app
        .post_json(
            "/api/v1/calc/cylinder",
            &json!({"bore": "100 mm", "rod": "70 mm", "stroke": "1 m", "load": "200 kN",
                    "load_direction": "extend", "supply_pressure": "20 bar"}),
        )
        .await;
    assert_eq!(status, StatusCode::OK, "{body}");
    let check = find(&body["checks"], |c| {
        c["component"] == "relief_setting"
            && c["exposure"] == "rod"
            && c["scenario"] == "rod_side_intensification"
    });
    close(&check["pressure"], 538.5e5, "rod side");
    assert_eq!(check["status"], "exceeds");
    let hazards = body["hazards"].as_array().unwrap();
    assert!(
        hazards.len() >= 2,
        "more than the run-away warning: {hazards:?}"
    );
    assert!(
        hazards
            .iter()
            .any(|h| h.as_str().unwrap().contains("538.5 bar (26.93 times")),
        "{hazards:?}"
    );
    let cautions = body["cautions"].as_array().unwrap();
    for words in [
        "relief valve cannot limit",
        "rated pressure",
        "injection injury",
    ] {
        assert!(
            cautions.iter().any(|c| c.as_str().unwrap().contains(words)),
            "{words}: {cautions:?}"
        );
    }
    let notes = body["notes"].as_array().unwrap();
    assert_eq!(notes.len(), 2, "{notes:?}");
    assert!(
        notes
            .iter()
            .all(|n| n.as_str().unwrap().contains("cannot be checked"))
    );
}

#[tokio::test]
async fn an_unrated_end_above_the_relief_setting_is_on_the_hazard_list_and_the_panel() {
    // 100/70 mm, 200 kN pulling the rod out, machine relief 20 bar, nothing rated: the rod
    // end reaches (20e5 x 7.854e-3 + 200e3) / 4.0055e-3 = 538.5 bar with the rod port blocked
    // (force balance), and no rating can check it; the relief setting is what is left.
    let app = TestApp::new().await;
    let m = crane(&app, "HV-PULL-7", "20 bar", None).await;
    let (status, c) = app
        .post_json(
            "/api/v1/cylinders",
            &json!({"machine_id": m, "bore": "100 mm", "rod": "70 mm", "stroke": "1 m",
                    "load_direction": "extend", "max_load": "200 kN"}),
        )
        .await;
    assert_eq!(status, StatusCode::CREATED, "{c}");
    let c = c["id"].as_i64().unwrap();
    let (_, hazards) = app
        .get_json("/api/v1/reports/hazards?as_of=2026-01-01")
        .await;
    // One line per component (here the rod end's relief setting) at its worst scenario; the
    // rod-side scenario is among those above it, and the worst is at least its 538.5 bar.
    let item = find(&hazards["pressures"], |p| {
        p["cylinder_id"] == c && p["component"] == "relief_setting" && p["exposure"] == "rod"
    });
    assert!(
        item["scenarios_above"]
            .as_array()
            .unwrap()
            .iter()
            .any(|s| s == "rod_side_intensification"),
        "{item}"
    );
    assert!(
        item["pressure"]["si"].as_f64().unwrap() >= 538.5e5 * 0.995,
        "{item}"
    );
    close(&item["rating"], 20e5, "against the relief setting");
    close(&item["load"], 200e3, "at the heaviest pulling load");
    let (_, _, page) = app.get_page(&format!("/cylinders/{c}")).await;
    assert!(page.contains("Cannot be checked:"), "the panel says so");
    assert!(page.contains("No ratings recorded."));
    assert!(page.contains("Relief setting, rod end"));
    assert!(page.contains("538.5 bar"));
    let (_, _, list) = app.get_page("/reports/hazards?as_of=2026-01-01").await;
    assert!(list.contains("Relief setting, rod end (no rating recorded)"));
}
