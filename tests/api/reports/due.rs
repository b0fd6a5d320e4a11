//! `GET /api/v1/reports/due`: every kind of due item, by date and by hours, due soon, not due,
//! archived; filters; sorting; CSV; bad parameters.

use super::fleet::*;
use crate::helpers::{TestApp, assert_field_error};
use axum::http::StatusCode;
use serde_json::json;

/// Ids in the due fleet.
pub struct DueFleet {
    pub north: i64,
    pub river: i64,
    pub hv101: i64,
    pub hv102: i64,
    pub hv103: i64,
    pub hv104: i64,
    pub hv103_cylinder: i64,
    pub hose_soon: i64,
    pub failed_inspection: i64,
}

/// A fleet as of 2025-06-01 with a 30-day window (horizon 2025-07-01):
/// - HV-101 (North Yard, excavator): periodic every 365 d / 500 h, last 2025-05-01 minus a
///   year (2024-05-01 at 1000 h) -> due 2025-05-01, 31 days overdue by date; frequent every 30 d,
///   last 2025-05-20 at 1400 h -> due 2025-06-19, due soon. 1400 h < 1500 h: not over by hours.
/// - HV-102 (North Yard, loader): periodic every 365 d / 250 h, last 2025-01-10 at 2000 h, meter
///   2300 h read 2025-05-25 -> due at 2250 h, 50 h over (date 2026-01-10 not due): by hours.
/// - HV-103 (River Depot, telehandler): frequent every 30 d, last 2025-05-25 -> 2025-06-24, due
///   soon; a cylinder tested every 90 d, last 2025-01-15 -> 2025-04-15, 47 days overdue (15 +
///   31 + 1); a hose to replace by 2025-06-20 (due soon) and one by 2027-01-01 (not due).
/// - HV-104 (River Depot, loader): periodic 365 d passed 2025-04-01 (due 2026-04-01, not due);
///   frequent every 30 d failed 2025-04-01 -> due 2025-05-01, 31 days overdue, and out of service.
/// - HV-105 (North Yard): periodic every 30 d, last 2024-01-01 - long overdue, but archived.
/// - HV-107 (North Yard, loader): periodic every 1000 d / 500 h, last 2025-01-10 at 3000 h,
///   meter 3460 h read 2025-05-30: 40 h left, listed only with within_hours >= 40.
pub async fn due_fleet(app: &TestApp) -> DueFleet {
    let north = site(app, "North Yard").await;
    let river = site(app, "River Depot").await;
    let hv101 = machine(app, json!({"unit_number": "HV-101", "kind": "excavator", "site_id": north,
        "periodic_interval_days": 365, "periodic_interval_hours": 500, "frequent_interval_days": 30})).await;
    inspect(app, hv101, "periodic", "2024-05-01", Some(1000.0), "pass").await;
    inspect(app, hv101, "frequent", "2025-05-20", Some(1400.0), "pass").await;

    let hv102 = machine(
        app,
        json!({"unit_number": "HV-102", "kind": "loader", "site_id": north,
        "periodic_interval_days": 365, "periodic_interval_hours": 250,
        "hour_meter": 2300, "hour_meter_read_on": "2025-05-25"}),
    )
    .await;
    inspect(app, hv102, "periodic", "2025-01-10", Some(2000.0), "pass").await;

    let hv103 = machine(
        app,
        json!({"unit_number": "HV-103", "kind": "telehandler",
        "site_id": river, "frequent_interval_days": 30}),
    )
    .await;
    inspect(app, hv103, "frequent", "2025-05-25", None, "pass").await;
    let hv103_cylinder = cylinder(app, hv103, json!({"drift_test_interval_days": 90})).await;
    drift_test(app, hv103_cylinder, "2025-01-15T09:00:00Z", 0.5, 5.0).await;
    let hose_soon = hose(app, hv103, json!({"replace_by": "2025-06-20"})).await;
    hose(app, hv103, json!({"replace_by": "2027-01-01"})).await;

    let hv104 = machine(
        app,
        json!({"unit_number": "HV-104", "kind": "loader", "site_id": river,
        "periodic_interval_days": 365, "frequent_interval_days": 30}),
    )
    .await;
    inspect(app, hv104, "periodic", "2025-04-01", Some(800.0), "pass").await;
    let failed_inspection =
        inspect(app, hv104, "frequent", "2025-04-01", Some(800.0), "fail").await;

    let hv105 = machine(
        app,
        json!({"unit_number": "HV-105", "kind": "loader", "site_id": north,
        "periodic_interval_days": 30}),
    )
    .await;
    inspect(app, hv105, "periodic", "2024-01-01", None, "pass").await;
    archive(app, hv105).await;

    let hv107 = machine(
        app,
        json!({"unit_number": "HV-107", "kind": "loader", "site_id": north,
        "periodic_interval_days": 1000, "periodic_interval_hours": 500,
        "hour_meter": 3460, "hour_meter_read_on": "2025-05-30"}),
    )
    .await;
    inspect(app, hv107, "periodic", "2025-01-10", Some(3000.0), "pass").await;

    DueFleet {
        north,
        river,
        hv101,
        hv102,
        hv103,
        hv104,
        hv103_cylinder,
        hose_soon,
        failed_inspection,
    }
}

const AS_OF: &str = "/api/v1/reports/due?as_of=2025-06-01";

#[tokio::test]
async fn the_due_list_holds_exactly_the_overdue_and_due_soon_items_furthest_overdue_first() {
    let app = TestApp::new().await;
    let f = due_fleet(&app).await;
    let list = items(&app, AS_OF).await;
    // Overdue: HV-103 drift test 47 days; HV-101 periodic and HV-104 frequent 31 days each
    // (tie: by unit number); HV-102 by hours: 2.22 h/day since 2025-01-10 (300 h in 135 days)
    // reaches 2250 h 112.5 days in, about 29.5 days before 2025-06-01 (142 days in).
    // Due soon: HV-101 frequent 2025-06-19 (18 days), HV-103 hose 06-20 (19), HV-103 frequent
    // 06-24 (23).
    assert_eq!(
        unit_kinds(&list),
        vec![
            pair("HV-103", "drift_test"),
            pair("HV-101", "periodic_inspection"),
            pair("HV-104", "frequent_inspection"),
            pair("HV-102", "periodic_inspection"),
            pair("HV-101", "frequent_inspection"),
            pair("HV-103", "hose_replacement"),
            pair("HV-103", "frequent_inspection"),
        ]
    );
    let overdue: Vec<bool> = list
        .iter()
        .map(|i| i["overdue"].as_bool().unwrap())
        .collect();
    assert_eq!(overdue, vec![true, true, true, true, false, false, false]);

    let drift = &list[0];
    assert_eq!(drift["machine_id"], f.hv103);
    assert_eq!(drift["cylinder_id"], f.hv103_cylinder);
    assert_eq!(drift["hose_id"], json!(null));
    assert_eq!(drift["due_on"], "2025-04-15");
    assert_eq!(drift["due_at_hours"], json!(null));
    assert_eq!(drift["basis"], "date");
    assert_eq!(drift["days_overdue"], 47);
    assert_eq!(drift["last_done_on"], "2025-01-15");

    let periodic = &list[1];
    assert_eq!(periodic["machine_id"], f.hv101);
    assert_eq!(periodic["due_on"], "2025-05-01");
    assert_eq!(periodic["due_at_hours"], 1500.0);
    assert_eq!(periodic["basis"], "date");
    assert_eq!(periodic["days_overdue"], 31);
    assert_eq!(periodic["site_id"], f.north);

    let by_hours = &list[3];
    assert_eq!(by_hours["machine_id"], f.hv102);
    assert_eq!(by_hours["basis"], "hours");
    assert_eq!(by_hours["due_at_hours"], 2250.0);
    assert_eq!(by_hours["hours_overdue"], 50.0);
    assert_eq!(by_hours["due_on"], "2026-01-10");
    assert_eq!(by_hours["hour_meter"], 2300.0);

    let hose = &list[5];
    assert_eq!(hose["hose_id"], f.hose_soon);
    assert_eq!(hose["due_on"], "2025-06-20");
    assert_eq!(hose["reason"], "replace_by");
    assert_eq!(hose["due_soon"], true);
    assert_eq!(list[6]["due_on"], "2025-06-24");
    for item in &list {
        for key in [
            "kind",
            "machine_id",
            "unit_number",
            "cylinder_id",
            "hose_id",
            "due_on",
            "due_at_hours",
            "overdue",
            "basis",
        ] {
            assert!(item.get(key).is_some(), "{key} missing in {item}");
        }
    }
}

#[tokio::test]
async fn a_wider_window_adds_what_is_not_yet_due_and_hours_windows_add_the_meter_items() {
    let app = TestApp::new().await;
    due_fleet(&app).await;
    // 400 days reach 2026-07-06: HV-104 periodic (2026-04-01) and HV-102's date are inside,
    // HV-103's 2027 hose is not. HV-102 is already in the list (overdue by hours).
    let wide = unit_kinds(&items(&app, &format!("{AS_OF}&within_days=400")).await);
    assert!(
        wide.contains(&pair("HV-104", "periodic_inspection")),
        "{wide:?}"
    );
    assert_eq!(
        wide.iter().filter(|p| p.1 == "hose_replacement").count(),
        1,
        "{wide:?}"
    );
    assert!(
        !wide.iter().any(|p| p.0 == "HV-105"),
        "archived machines never show: {wide:?}"
    );

    let narrow = unit_kinds(&items(&app, &format!("{AS_OF}&within_days=0")).await);
    assert_eq!(narrow.len(), 4, "only the overdue items: {narrow:?}");

    // HV-107: due at 3500 h, meter 3460 h: within 40 h but not 39 h.
    let near = items(&app, &format!("{AS_OF}&within_hours=40")).await;
    let hv107: Vec<_> = near
        .iter()
        .filter(|i| i["unit_number"] == "HV-107")
        .collect();
    assert_eq!(hv107.len(), 1, "{near:?}");
    assert_eq!(hv107[0]["basis"], "hours");
    assert_eq!(hv107[0]["due_at_hours"], 3500.0);
    assert_eq!(hv107[0]["overdue"], false);
    assert_eq!(hv107[0]["due_soon"], true);
    let far = unit_kinds(&items(&app, &format!("{AS_OF}&within_hours=39")).await);
    assert!(!far.iter().any(|p| p.0 == "HV-107"), "{far:?}");
}

#[tokio::test]
async fn filters_by_site_machine_kind_and_status() {
    let app = TestApp::new().await;
    let f = due_fleet(&app).await;
    let river = unit_kinds(&items(&app, &format!("{AS_OF}&site={}", f.river)).await);
    assert_eq!(
        river,
        vec![
            pair("HV-103", "drift_test"),
            pair("HV-104", "frequent_inspection"),
            pair("HV-103", "hose_replacement"),
            pair("HV-103", "frequent_inspection"),
        ]
    );
    let loaders = unit_kinds(&items(&app, &format!("{AS_OF}&kind=loader")).await);
    assert_eq!(
        loaders,
        vec![
            pair("HV-104", "frequent_inspection"),
            pair("HV-102", "periodic_inspection")
        ]
    );
    let out = items(&app, &format!("{AS_OF}&status=out_of_service")).await;
    assert_eq!(
        unit_kinds(&out),
        vec![pair("HV-104", "frequent_inspection")]
    );
    assert_eq!(out[0]["machine_id"], f.hv104);
    let north_in =
        unit_kinds(&items(&app, &format!("{AS_OF}&site={}&status=in_service", f.north)).await);
    assert_eq!(north_in.len(), 3, "{north_in:?}");
    assert!(
        north_in.iter().all(|p| p.0 == "HV-101" || p.0 == "HV-102"),
        "{north_in:?}"
    );
}

#[tokio::test]
async fn the_csv_is_the_same_list_with_a_header_row() {
    let app = TestApp::new().await;
    due_fleet(&app).await;
    let json_list = items(&app, AS_OF).await;
    let (header, rows) = csv_rows(&app, &format!("{AS_OF}&format=csv")).await;
    for name in [
        "kind",
        "machine_id",
        "unit_number",
        "cylinder_id",
        "hose_id",
        "due_on",
        "due_at_hours",
        "overdue",
        "basis",
    ] {
        assert!(header.iter().any(|h| h == name), "{name} in {header:?}");
    }
    assert_eq!(rows.len(), json_list.len());
    for (row, item) in rows.iter().zip(&json_list) {
        assert_eq!(col(&header, row, "kind"), item["kind"]);
        assert_eq!(col(&header, row, "unit_number"), item["unit_number"]);
        assert_eq!(
            col(&header, row, "machine_id"),
            item["machine_id"].to_string()
        );
        assert_eq!(
            col(&header, row, "due_on"),
            item["due_on"].as_str().unwrap_or("")
        );
        assert_eq!(col(&header, row, "overdue"), item["overdue"].to_string());
        assert_eq!(col(&header, row, "basis"), item["basis"]);
        let hours = col(&header, row, "due_at_hours");
        match item["due_at_hours"].as_f64() {
            Some(h) => assert_eq!(hours.parse::<f64>().unwrap(), h),
            None => assert_eq!(hours, ""),
        }
        let cyl = col(&header, row, "cylinder_id");
        assert_eq!(
            cyl,
            item["cylinder_id"]
                .as_i64()
                .map(|c| c.to_string())
                .unwrap_or_default()
        );
    }
}

#[tokio::test]
async fn a_machine_never_inspected_is_due_from_the_day_it_was_registered() {
    let app = TestApp::new().await;
    let id = machine(
        &app,
        json!({"unit_number": "HV-110", "kind": "lift",
        "frequent_interval_days": 7}),
    )
    .await;
    let registered = registered_on(&app, id).await;
    let reg = loadhold::calc::due::parse_day(&registered).unwrap();
    let day = |n: i64| loadhold::calc::due::add_days(reg, n).unwrap().to_string();
    // Never inspected: due on the registration day R itself (the rule), overdue from
    // R + 1, whatever the interval.
    let late = items(&app, &format!("/api/v1/reports/due?as_of={}", day(1))).await;
    assert_eq!(
        unit_kinds(&late),
        vec![pair("HV-110", "frequent_inspection")]
    );
    assert_eq!(late[0]["due_on"], registered.get(..10).unwrap());
    assert_eq!(late[0]["basis"], "date");
    assert_eq!(late[0]["overdue"], true);
    assert_eq!(late[0]["days_overdue"], 1);
    assert_eq!(late[0]["last_done_on"], json!(null));
    // As of R it is due that day: listed, not yet overdue.
    let today = items(
        &app,
        &format!("/api/v1/reports/due?as_of={}&within_days=0", day(0)),
    )
    .await;
    assert_eq!(today.len(), 1, "{today:?}");
    assert_eq!(today[0]["overdue"], false);
    // The day before R (a back-dated query) nothing is listed within a zero window.
    let before = items(
        &app,
        &format!("/api/v1/reports/due?as_of={}&within_days=0", day(-1)),
    )
    .await;
    assert!(before.is_empty(), "{before:?}");
    let _ = day(7);
}

#[tokio::test]
async fn bad_parameters_are_refused_naming_the_parameter() {
    let app = TestApp::new().await;
    for (query, field) in [
        ("as_of=2025-13-01", "as_of"),
        ("as_of=June", "as_of"),
        ("within_days=-1", "within_days"),
        ("within_days=ten", "within_days"),
        ("within_hours=-5", "within_hours"),
        ("within_hours=NaN", "within_hours"),
        ("site=abc", "site"),
        ("site=999", "site"),
        ("status=broken", "status"),
        ("format=xml", "format"),
        ("colour=red", "colour"),
    ] {
        let (status, body) = app.get_json(&format!("/api/v1/reports/due?{query}")).await;
        assert_field_error(status, &body, StatusCode::UNPROCESSABLE_ENTITY, field);
    }
}

/// The due list leaves out, in SQL, the hoses that cannot be due by its last day (a coarse
/// text comparison on `replace_by`, `made_in` and `installed_on`), then decides each hose
/// exactly. The hoses below sit on either side of that day. Dates worked by hand on the
/// calendar: as of 2025-06-01 with 30 days the last day is 2025-07-01 (120 days: 2025-09-29);
/// with a 6-year age limit a hose is due on the day it was made (first day of its quarter)
/// or, without that, installed, plus 6 years.
#[tokio::test]
async fn hoses_are_listed_exactly_up_to_the_last_day_of_the_window() {
    let app = TestApp::new().await;
    let unit = machine(&app, json!({"unit_number": "HV-301", "kind": "crane"})).await;
    let made = |q: &str| json!({"made_in": q});
    let soon_by_age = hose(&app, unit, made("2019-Q3")).await; // 2025-07-01: the last day
    let later_by_age = hose(&app, unit, made("2019-Q4")).await; // 2025-10-01
    let over_by_age = hose(&app, unit, made("2018-Q1")).await; // 2024-01-01: overdue
    let soon_installed = hose(&app, unit, json!({"installed_on": "2019-06-15"})).await; // 2025-06-15
    let day_after_installed = hose(&app, unit, json!({"installed_on": "2019-07-02"})).await; // 2025-07-02
    let soon_replace_by = hose(
        &app,
        unit,
        json!({"made_in": "2024-Q1", "replace_by": "2025-07-01"}),
    )
    .await;
    let day_after_replace_by = hose(
        &app,
        unit,
        json!({"made_in": "2024-Q1", "replace_by": "2025-07-02"}),
    )
    .await;
    hose(&app, unit, json!({})).await; // no date at all: never due

    let hose_ids = |list: Vec<serde_json::Value>| {
        let mut ids: Vec<i64> = list
            .iter()
            .filter(|i| i["kind"] == "hose_replacement")
            .map(|i| i["hose_id"].as_i64().unwrap())
            .collect();
        ids.sort();
        ids
    };
    // No age limit: only the replace-by date counts.
    assert_eq!(hose_ids(items(&app, AS_OF).await), vec![soon_replace_by]);

    set_hose_age_limit(&app, 6).await;
    let mut want = vec![soon_by_age, over_by_age, soon_installed, soon_replace_by];
    want.sort();
    assert_eq!(hose_ids(items(&app, AS_OF).await), want);

    let wider = format!("{AS_OF}&within_days=120");
    want.extend([day_after_installed, day_after_replace_by]);
    want.sort();
    assert_eq!(hose_ids(items(&app, &wider).await), want);
    assert!(!want.contains(&later_by_age));
}

/// The due list leaves out, in SQL, the cylinders whose last hold test (drift or pressure
/// decay, whichever is later) keeps them clear of its last day, interval by interval, then
/// decides each exactly. Dates worked by hand on the calendar: as of 2025-06-01 with 30 days
/// the last day is 2025-07-01.
#[tokio::test]
async fn cylinders_are_listed_exactly_up_to_the_last_day_of_the_window() {
    let app = TestApp::new().await;
    let unit = machine(&app, json!({"unit_number": "HV-311", "kind": "crane"})).await;
    let every = |days: i64| json!({"drift_test_interval_days": days});
    let on_last_day = cylinder(&app, unit, every(90)).await; // 04-02 + 90 d = 07-01
    drift_test(&app, on_last_day, "2025-04-02T10:00:00Z", 0.5, 5.0).await;
    let day_after = cylinder(&app, unit, every(90)).await; // 04-03 + 90 d = 07-02
    drift_test(&app, day_after, "2025-04-03T07:00:00Z", 0.5, 5.0).await;
    let monthly = cylinder(&app, unit, every(30)).await; // 05-31 + 30 d = 06-30
    drift_test(&app, monthly, "2025-05-31T16:00:00Z", 0.5, 5.0).await;
    // Drift-tested 2025-03-01 (due 04-30, overdue) but decay-tested 2025-05-15: due 07-14.
    let decay_later = cylinder(&app, unit, every(60)).await;
    drift_test(&app, decay_later, "2025-03-01T09:00:00Z", 0.5, 5.0).await;
    decay_test(&app, decay_later, "2025-05-15T10:00:00Z").await;
    // Drift-tested 2025-03-01 with a decay test after the report's day: still overdue.
    let decay_after_as_of = cylinder(&app, unit, every(60)).await;
    drift_test(&app, decay_after_as_of, "2025-03-01T09:00:00Z", 0.5, 5.0).await;
    decay_test(&app, decay_after_as_of, "2025-06-02T10:00:00Z").await;

    let listed: Vec<(i64, String)> = items(&app, AS_OF)
        .await
        .iter()
        .filter(|i| i["kind"] == "drift_test")
        .map(|i| {
            let id = i["cylinder_id"].as_i64().unwrap();
            (id, i["due_on"].as_str().unwrap().to_string())
        })
        .collect();
    let mut want = vec![
        (decay_after_as_of, "2025-04-30".to_string()),
        (monthly, "2025-06-30".to_string()),
        (on_last_day, "2025-07-01".to_string()),
    ];
    want.sort();
    let mut got = listed.clone();
    got.sort();
    assert_eq!(
        got, want,
        "left out: {day_after} (07-02), {decay_later} (07-14)"
    );
}
