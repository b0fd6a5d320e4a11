//! One source for hazards: on every cylinder of the demo fleet (invented data), the safety
//! figures of `GET /api/v1/cylinders/{id}/safety`, the cylinder page's safety panel, the
//! hazard list and the overview count name the same components above their ratings, at the
//! same worst scenario, with the same pressures. The shop pages state the worst hazard before
//! their forms. No value here comes from a reference: this checks that the places agree.

use crate::helpers::TestApp;
use axum::http::StatusCode;
use serde_json::Value;
use std::collections::BTreeMap;

fn si(v: &Value) -> f64 {
    v["si"].as_f64().expect("quantity")
}

#[tokio::test]
async fn the_safety_api_the_hazard_list_the_pages_and_the_overview_agree_on_the_demo_fleet() {
    let app = TestApp::new().await;
    loadhold::seed::load_demo(&app.db).await.expect("demo");
    let cylinders: Vec<i64> = sqlx::query_scalar("SELECT id FROM cylinders ORDER BY id")
        .fetch_all(&app.db)
        .await
        .unwrap();
    // (cylinder, component) -> (worst scenario, pressure) from the safety API.
    let mut from_safety: BTreeMap<(i64, String), (String, f64, f64)> = BTreeMap::new();
    let mut with_trapped_oil = 0;
    for id in &cylinders {
        let (status, s) = app
            .get_json(&format!("/api/v1/cylinders/{id}/safety"))
            .await;
        assert_eq!(status, StatusCode::OK, "cylinder {id}: {s}");
        assert!(s["cautions"].as_array().is_some_and(|c| c.len() >= 5));
        let checks = s["checks"].as_array().unwrap();
        let names: Vec<&str> = s["scenarios"]
            .as_array()
            .unwrap()
            .iter()
            .map(|x| x["name"].as_str().unwrap())
            .collect();
        assert!(names.contains(&"trapped_oil_heating"), "{names:?}");
        let mut over = false;
        for k in checks
            .iter()
            .filter(|k| k["status"] == "exceeds" && k["decides_status"] == true)
        {
            over = true;
            if k["scenario"] == "trapped_oil_heating" {
                with_trapped_oil += 1;
            }
            let key = (*id, k["component"].as_str().unwrap().to_string());
            let ratio = si(&k["pressure"]) / si(&k["rating"]);
            let entry = from_safety.entry(key).or_insert((String::new(), 0.0, 0.0));
            if ratio > entry.2 {
                *entry = (
                    k["scenario"].as_str().unwrap().to_string(),
                    si(&k["pressure"]),
                    ratio,
                );
            }
        }
        assert_eq!(
            s["decision"] != "fit_for_service",
            over,
            "a cylinder above a rating is never fit for service: {id}"
        );
        let (_, _, page) = app.get_page(&format!("/cylinders/{id}")).await;
        if over {
            assert!(
                page.contains("above"),
                "cylinder page {id} names the hazard"
            );
        }
        let (_, _, shop) = app.get_page(&format!("/shop/cylinders/{id}")).await;
        if over {
            let hazard = shop
                .find("Worst hazard")
                .expect("worst hazard on the shop page");
            let form = shop.find("/drift-test\"").expect("drift test button");
            assert!(
                hazard < form,
                "cylinder {id}: the hazard comes before the form"
            );
        }
    }
    assert!(!from_safety.is_empty(), "the demo fleet has hazards");

    let (status, list) = app.get_json("/api/v1/reports/hazards").await;
    assert_eq!(status, StatusCode::OK);
    let mut from_list: BTreeMap<(i64, String), (String, f64)> = BTreeMap::new();
    for p in list["pressures"].as_array().unwrap() {
        let key = (
            p["cylinder_id"].as_i64().unwrap(),
            p["component"].as_str().unwrap().to_string(),
        );
        let old = from_list.insert(
            key.clone(),
            (
                p["scenario"].as_str().unwrap().to_string(),
                si(&p["pressure"]),
            ),
        );
        assert!(old.is_none(), "one line per component: {key:?}");
    }
    assert_eq!(
        from_list.keys().collect::<Vec<_>>(),
        from_safety.keys().collect::<Vec<_>>(),
        "the same components"
    );
    for (key, (scenario, pressure)) in &from_list {
        let (s, p, _) = &from_safety[key];
        assert_eq!(scenario, s, "{key:?}: same worst scenario");
        assert!((pressure - p).abs() <= 1e-6 * p, "{key:?}: same pressure");
    }
    let trapped_in_list = list["pressures"]
        .as_array()
        .unwrap()
        .iter()
        .filter(|p| {
            p["scenarios_above"]
                .as_array()
                .is_some_and(|a| a.iter().any(|s| s == "trapped_oil_heating"))
        })
        .count();
    assert_eq!(
        trapped_in_list > 0,
        with_trapped_oil > 0,
        "trapped-oil warming is on the list when the safety figures have it"
    );

    let (status, csv_headers, csv) = app.get_page("/api/v1/reports/hazards?format=csv").await;
    assert_eq!(status, StatusCode::OK, "{csv_headers:?}");
    let pressure_rows = csv.lines().filter(|l| l.starts_with("pressure,")).count();
    assert_eq!(pressure_rows, from_list.len(), "the CSV has the same lines");

    let (_, _, overview) = app.get_page("/reports").await;
    let count = format!(
        "■</span> {}</span> pressures above a rating",
        from_list.len()
    );
    assert!(
        overview.contains(&count),
        "overview counts {}",
        from_list.len()
    );
}
