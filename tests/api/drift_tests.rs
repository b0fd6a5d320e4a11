//! Drift tests recorded against a registry cylinder (`/api/v1/cylinders/{id}/drift-tests`),
//! procedures, amendments, and the wear trend of `calc::trend`. The cylinders and readings
//! are invented test data; figures are checked against REFERENCES.md where named.

use crate::helpers::{TestApp, assert_field_error};
use crate::registry_fixtures::machine;
use axum::http::StatusCode;
use serde_json::{Map, Value, json};

/// A 100 mm bore, 70 mm rod, 800 mm stroke cylinder holding 50 kN that pushes its rod in;
/// returns (machine id, cylinder id).
pub async fn loaded_cylinder(app: &TestApp, unit: &str) -> (i64, i64) {
    let machine_id = machine(app, unit).await;
    let (status, body) = app
        .post_json(
            "/api/v1/cylinders",
            &json!({
                "machine_id": machine_id,
                "function": "boom lift",
                "bore": "100 mm",
                "rod": "70 mm",
                "stroke": "800 mm",
                "load_direction": "retract",
                "max_load": "50 kN",
            }),
        )
        .await;
    assert_eq!(status, StatusCode::CREATED, "cylinder: {body}");
    (machine_id, body["id"].as_i64().expect("cylinder id"))
}

/// Readings of a test: 3 mm in 10 minutes, oil steady at 45 degC, both ports read.
pub fn readings() -> Value {
    json!({
        "duration": "10 min",
        "drift": "3 mm",
        "oil_temperature_start": "45 degC",
        "oil_temperature_end": "45 degC",
        "cap_pressure_start": "63.7 bar",
        "cap_pressure_end": "63.5 bar",
        "rod_pressure_start": "0 bar",
        "rod_pressure_end": "0 bar",
        "limit": {"distance": "5 mm", "per": "10 min"},
    })
}

fn with(base: Value, extra: Value) -> Value {
    let mut map: Map<String, Value> = base.as_object().cloned().unwrap_or_default();
    for (k, v) in extra.as_object().cloned().unwrap_or_default() {
        map.insert(k, v);
    }
    Value::Object(map)
}

/// How many drift tests the app's database holds, and how many audit rows record them.
async fn stored_counts(app: &TestApp) -> (i64, i64) {
    let count = |sql: &'static str| async move {
        sqlx::query_scalar::<_, i64>(sql)
            .fetch_one(&app.db)
            .await
            .expect("count")
    };
    (
        count("SELECT COUNT(*) FROM drift_tests").await,
        count("SELECT COUNT(*) FROM audit_log WHERE entity = 'drift_test'").await,
    )
}

pub fn record(token: &str) -> Value {
    with(
        readings(),
        json!({"technician": "R. Okafor", "tested_at": "2025-03-14T09:30:00Z", "client_token": token}),
    )
}

#[tokio::test]
async fn a_drift_test_is_analysed_exactly_as_the_calculation_api_answers_and_stored() {
    let app = TestApp::new().await;
    let (_, cylinder) = loaded_cylinder(&app, "HV-101").await;
    let path = format!("/api/v1/cylinders/{cylinder}/drift-tests");
    let (status, stored) = app.post_json(&path, &record("t-001")).await;
    assert_eq!(status, StatusCode::CREATED, "{stored}");
    assert!(stored["id"].as_i64().is_some());
    assert_eq!(stored["technician"], "R. Okafor");
    assert_eq!(stored["tested_at"], "2025-03-14T09:30:00Z");
    assert!(
        stored["calc_version"]
            .as_str()
            .is_some_and(|v| !v.is_empty())
    );

    // The same readings with the cylinder's geometry and load, sent to the calculation API.
    let calc = with(
        readings(),
        json!({"bore": "100 mm", "rod": "70 mm", "stroke": "800 mm",
               "load": "50 kN", "load_direction": "retract", "units": "metric"}),
    );
    let (status, answer) = app.post_json("/api/v1/calc/drift-test", &calc).await;
    assert_eq!(status, StatusCode::OK, "{answer}");
    assert_eq!(
        stored["analysis"], answer,
        "stored analysis = calc API answer"
    );

    // The stored readings are the request as sent to the core: replayed, the same answer.
    let (status, replay) = app
        .post_json("/api/v1/calc/drift-test", &stored["readings"])
        .await;
    assert_eq!(status, StatusCode::OK, "{replay}");
    assert_eq!(replay, stored["analysis"]);

    // Oil steady: no thermal drift, so all 3 mm is leak drift; 3 mm per 10 min against a
    // 5 mm per 10 min limit passes ([C] from the inputs).
    assert_eq!(stored["verdict"], "pass");
    let scaled = stored["analysis"]["scaled_drift"]["si"]
        .as_f64()
        .expect("scaled");
    assert!((scaled - 0.003).abs() < 1e-9, "{scaled}");

    let (status, list) = app.get_json(&path).await;
    assert_eq!(status, StatusCode::OK);
    assert_eq!(list["items"].as_array().map(Vec::len), Some(1));
    assert_eq!(list["items"][0]["id"], stored["id"]);
    let (status, one) = app
        .get_json(&format!("/api/v1/drift-tests/{}", stored["id"]))
        .await;
    assert_eq!(status, StatusCode::OK);
    assert_eq!(one["analysis"], stored["analysis"]);
}

#[tokio::test]
async fn a_rising_rod_end_pressure_is_stored_as_a_piston_seal_bypass_with_its_hazard() {
    let app = TestApp::new().await;
    let (_, cylinder) = loaded_cylinder(&app, "HV-102").await;
    // Common practice (REFERENCES.md "Trade facts"): a passing piston seal with both ports
    // blocked lifts the rod end toward the holding end's pressure.
    let body = with(
        record("t-bypass"),
        json!({"drift": "1 mm", "rod_pressure_end": "60 bar", "cap_pressure_end": "120 bar"}),
    );
    let (status, stored) = app
        .post_json(&format!("/api/v1/cylinders/{cylinder}/drift-tests"), &body)
        .await;
    assert_eq!(status, StatusCode::CREATED, "{stored}");
    assert_eq!(stored["diagnosis"], "piston_seal_bypass", "{stored}");
    assert!(
        stored["analysis"]["hazards"]
            .as_array()
            .is_some_and(|h| !h.is_empty()),
        "a bypass names its hazard: {stored}"
    );
}

#[tokio::test]
async fn a_resubmitted_client_token_is_stored_once() {
    let app = TestApp::new().await;
    let (_, cylinder) = loaded_cylinder(&app, "HV-103").await;
    let path = format!("/api/v1/cylinders/{cylinder}/drift-tests");
    let (first, a) = app.post_json(&path, &record("same-token")).await;
    let (second, b) = app.post_json(&path, &record("same-token")).await;
    assert_eq!(first, StatusCode::CREATED, "{a}");
    assert_eq!(second, StatusCode::OK, "{b}");
    assert_eq!(a["id"], b["id"]);
    let (rows, audits) = stored_counts(&app).await;
    assert_eq!(rows, 1);
    assert_eq!(audits, 1, "one audit row for one record");

    // The same token on another cylinder is a conflict, not a silent reuse.
    let (_, other) = loaded_cylinder(&app, "HV-104").await;
    let (status, body) = app
        .post_json(
            &format!("/api/v1/cylinders/{other}/drift-tests"),
            &record("same-token"),
        )
        .await;
    assert_field_error(status, &body, StatusCode::CONFLICT, "client_token");
}

#[tokio::test]
async fn bad_drift_test_input_names_its_field() {
    let app = TestApp::new().await;
    let (_, cylinder) = loaded_cylinder(&app, "HV-105").await;
    let (_, other) = loaded_cylinder(&app, "HV-106").await;
    let path = format!("/api/v1/cylinders/{cylinder}/drift-tests");
    let (status, procedure) = app
        .post_json(
            "/api/v1/procedures",
            &json!({"name": "other cylinder's", "cylinder_id": other, "duration": "10 min"}),
        )
        .await;
    assert_eq!(status, StatusCode::CREATED, "{procedure}");
    let cases = [
        (json!({"duration": 600}), "duration"),
        (json!({"bore": "4 in"}), "bore"),
        (json!({"technician": null}), "technician"),
        (json!({"tested_at": "2999-01-01T00:00:00Z"}), "tested_at"),
        (json!({"tested_at": "last Tuesday"}), "tested_at"),
        (json!({"oil_temperature_end": "hot"}), "oil_temperature_end"),
        (json!({"procedure_id": procedure["id"]}), "procedure_id"),
        (json!({"amends": 999}), "amends"),
        (json!({"client_token": "has spaces in it"}), "client_token"),
        (json!({"drift": null}), "drift"),
        (json!({"load_direction": "sideways"}), "load_direction"),
    ];
    for (change, field) in cases {
        let body = with(record("t-bad"), change);
        let (status, answer) = app.post_json(&path, &body).await;
        let expected = StatusCode::UNPROCESSABLE_ENTITY;
        assert_field_error(status, &answer, expected, field);
    }
    let (status, _) = app
        .post_json("/api/v1/cylinders/9999/drift-tests", &record("t-x"))
        .await;
    assert_eq!(status, StatusCode::NOT_FOUND);
    let rows: i64 = sqlx::query_scalar("SELECT COUNT(*) FROM drift_tests")
        .fetch_one(&app.db)
        .await
        .expect("count");
    assert_eq!(rows, 0, "nothing stored from bad input");
}

#[tokio::test]
async fn a_procedure_sets_the_limit_by_oil_temperature_and_flags_a_test_outside_its_window() {
    let app = TestApp::new().await;
    let (_, cylinder) = loaded_cylinder(&app, "HV-107").await;
    let (status, p) = app
        .post_json(
            "/api/v1/procedures",
            &json!({
                "name": "Boom held level, bucket empty",
                "cylinder_id": cylinder,
                "hold_load": "empty bucket",
                "oil_temperature_min": "40 degC",
                "oil_temperature_max": "60 degC",
                "duration": "10 min",
                "limit": {"distance": "6 mm", "per": "10 min"},
                "limit_table": [
                    {"from": "20 degC", "distance": "4 mm", "per": "10 min"},
                    {"from": "50 degC", "distance": "8 mm", "per": "10 min"},
                ],
                "oil_expansion": "0.0007 1/degC",
            }),
        )
        .await;
    assert_eq!(status, StatusCode::CREATED, "{p}");
    let mut body = record("t-proc");
    let map = body.as_object_mut().expect("object");
    map.remove("limit");
    map.insert("procedure_id".into(), p["id"].clone());
    map.insert("oil_temperature_start".into(), json!("30 degC"));
    map.insert("oil_temperature_end".into(), json!("27 degC"));
    let (status, stored) = app
        .post_json(&format!("/api/v1/cylinders/{cylinder}/drift-tests"), &body)
        .await;
    assert_eq!(status, StatusCode::CREATED, "{stored}");
    // 30 degC falls in the table's band from 20 degC: 4 mm per 10 min.
    let limit = stored["analysis"]["limit"]["distance"]["si"].as_f64();
    assert!(limit.is_some_and(|l| (l - 0.004).abs() < 1e-12), "{stored}");
    let flags = stored["flags"].as_array().cloned().unwrap_or_default();
    assert!(
        flags.contains(&json!("oil_temperature_below_window")),
        "{flags:?}"
    );
    assert!(
        flags.contains(&json!("oil_temperature_changed")),
        "{flags:?}"
    );
    assert_eq!(stored["procedure_id"], p["id"]);
    // The procedure's expansion coefficient went into the request: cooling 3 K explains part
    // of the drift, so the leak drift is less than the measured 3 mm.
    let leak = stored["analysis"]["leak_drift"]["si"]
        .as_f64()
        .expect("leak");
    assert!(leak < 0.003, "{leak}");
}

#[tokio::test]
async fn an_amendment_keeps_both_records_with_who_and_when() {
    let app = TestApp::new().await;
    let (_, cylinder) = loaded_cylinder(&app, "HV-108").await;
    let path = format!("/api/v1/cylinders/{cylinder}/drift-tests");
    let (_, first) = app.post_json(&path, &record("t-a1")).await;
    let correction = with(
        record("t-a2"),
        json!({"drift": "7 mm", "amends": first["id"]}),
    );
    let (status, second) = app.post_json(&path, &correction).await;
    assert_eq!(status, StatusCode::CREATED, "{second}");
    assert_eq!(second["amends"], first["id"]);
    assert_eq!(second["verdict"], "fail", "7 mm against 5 mm");
    let (_, list) = app.get_json(&path).await;
    let items = list["items"].as_array().expect("items");
    assert_eq!(items.len(), 2, "both records stay");
    let old = items.iter().find(|i| i["id"] == first["id"]).expect("old");
    assert_eq!(old["amended_by"], second["id"]);
    assert_eq!(old["in_force"], false);
    assert_eq!(old["verdict"], "pass", "the old record is unchanged");
    for item in items {
        assert!(item["created_by"].as_str().is_some_and(|s| !s.is_empty()));
        assert!(item["created_at"].as_str().is_some_and(|s| s.len() >= 20));
    }
    // The chain stays a line: amending the old record again is refused.
    let again = with(record("t-a3"), json!({"amends": first["id"]}));
    let (status, body) = app.post_json(&path, &again).await;
    assert_field_error(status, &body, StatusCode::CONFLICT, "amends");
    let audits: Vec<String> =
        sqlx::query_scalar("SELECT action FROM audit_log WHERE entity = 'drift_test' ORDER BY id")
            .fetch_all(&app.db)
            .await
            .expect("audit");
    assert_eq!(audits, ["create", "amend"]);
}

#[tokio::test]
async fn a_pressure_decay_test_is_stored_as_the_calculation_api_answers() {
    let app = TestApp::new().await;
    let (_, cylinder) = loaded_cylinder(&app, "HV-109").await;
    let readings = json!({
        "pressurised_end": "cap",
        "duration": "10 min",
        "pressure_start": "200 bar",
        "pressure_end": "189.5 bar",
        "oil_temperature_start": "41 degC",
        "oil_temperature_end": "40 degC",
        "limit": {"pressure": "15 bar", "per": "10 min"},
    });
    let body = with(
        readings.clone(),
        json!({"technician": "R. Okafor", "tested_at": "2025-03-14T10:00:00Z", "client_token": "d-1"}),
    );
    let path = format!("/api/v1/cylinders/{cylinder}/decay-tests");
    let (status, stored) = app.post_json(&path, &body).await;
    assert_eq!(status, StatusCode::CREATED, "{stored}");
    let calc = with(
        readings,
        json!({"bore": "100 mm", "rod": "70 mm", "stroke": "800 mm",
               "load": "50 kN", "load_direction": "retract", "units": "metric"}),
    );
    let (status, answer) = app.post_json("/api/v1/calc/pressure-decay", &calc).await;
    assert_eq!(status, StatusCode::OK, "{answer}");
    assert_eq!(stored["analysis"], answer);
    // REFERENCES.md "Fluid properties" [C]: trapped oil changes about K x alpha per kelvin,
    // 1.5 GPa x 7e-4 = 10.5 bar per degC; cooling 1 K explains a drop of about 10.5 bar
    // (oil alone, no lines or tube given).
    let thermal = stored["analysis"]["thermal_change"]["si"]
        .as_f64()
        .expect("thermal");
    assert!(((thermal + 10.5e5) / 10.5e5).abs() < 0.01, "{thermal}");
    let (_, again) = app.post_json(&path, &body).await;
    assert_eq!(again["id"], stored["id"], "the token stores once");
    let (_, list) = app.get_json(&path).await;
    assert_eq!(list["items"].as_array().map(Vec::len), Some(1));
}

#[tokio::test]
async fn procedures_are_created_read_updated_and_archived_never_deleted() {
    let app = TestApp::new().await;
    let (_, cylinder) = loaded_cylinder(&app, "HV-110").await;
    let (status, p) = app
        .post_json(
            "/api/v1/procedures",
            &json!({"name": "Telehandler boom hold", "machine_kind": "Telehandler",
                    "duration": "10 min", "limit": {"distance": "8 mm", "per": "10 min"}}),
        )
        .await;
    assert_eq!(status, StatusCode::CREATED, "{p}");
    assert_eq!(
        p["machine_kind"], "telehandler",
        "kinds compare as the registry writes them"
    );
    let id = p["id"].as_i64().expect("id");
    let (status, changed) = app
        .patch_json(
            &format!("/api/v1/procedures/{id}"),
            &json!({"name": "Telehandler boom hold, rated load",
                    "limit_table": [{"from": "30 degC", "distance": "6 mm", "per": "10 min"}]}),
        )
        .await;
    assert_eq!(status, StatusCode::OK, "{changed}");
    assert_eq!(
        changed["limit"]["distance"]["si"], p["limit"]["distance"]["si"],
        "untouched"
    );
    assert_eq!(changed["limit_table"].as_array().map(Vec::len), Some(1));
    // The cylinder's machine is a telehandler: the shared procedure applies to it.
    let mut body = record("t-shared");
    body["procedure_id"] = json!(id);
    let (status, _) = app
        .post_json(&format!("/api/v1/cylinders/{cylinder}/drift-tests"), &body)
        .await;
    assert_eq!(status, StatusCode::CREATED);

    let (status, _) = app
        .patch_json(
            &format!("/api/v1/procedures/{id}"),
            &json!({"archived": true}),
        )
        .await;
    assert_eq!(status, StatusCode::OK);
    let (_, list) = app.get_json("/api/v1/procedures").await;
    assert_eq!(
        list["items"].as_array().map(Vec::len),
        Some(0),
        "archived leave the list"
    );
    let (_, all) = app
        .get_json("/api/v1/procedures?include_archived=true")
        .await;
    assert_eq!(all["items"][0]["id"], id, "and are kept");
    let (status, _) = app
        .json("DELETE", &format!("/api/v1/procedures/{id}"), None)
        .await;
    assert_eq!(status, StatusCode::METHOD_NOT_ALLOWED);
    let actions: Vec<String> = sqlx::query_scalar(
        "SELECT action FROM audit_log WHERE entity = 'test_procedure' ORDER BY id",
    )
    .fetch_all(&app.db)
    .await
    .expect("audit");
    assert_eq!(actions, ["create", "update", "archive"]);

    for (bad, field) in [
        (
            json!({"name": "x", "machine_kind": "telehandler", "cylinder_id": cylinder, "duration": "1 min"}),
            "machine_kind",
        ),
        (json!({"name": "x", "duration": "1 min"}), "cylinder_id"),
        (json!({"name": "x", "cylinder_id": cylinder}), "duration"),
        (
            json!({"name": "x", "cylinder_id": cylinder, "duration": "1 min", "limit_table": [
            {"from": "50 degC", "distance": "6 mm", "per": "10 min"},
            {"from": "30 degC", "distance": "4 mm", "per": "10 min"}]}),
            "limit_table[1].from",
        ),
        (
            json!({"name": "x", "cylinder_id": cylinder, "duration": "1 min", "kind": "squeeze"}),
            "kind",
        ),
        (
            json!({"name": "x", "cylinder_id": 9999, "duration": "1 min"}),
            "cylinder_id",
        ),
        (
            json!({"name": "x", "cylinder_id": cylinder, "duration": "1 min", "oil_temperature_min": "60 degC", "oil_temperature_max": "40 degC"}),
            "oil_temperature_max",
        ),
    ] {
        let (status, answer) = app.post_json("/api/v1/procedures", &bad).await;
        assert_field_error(status, &answer, StatusCode::UNPROCESSABLE_ENTITY, field);
    }
}

/// Drift tests sent at once share transactions (`db::group_commit`). Each is still answered
/// on its own: every token is stored once with one audit row, a resubmission inside the same
/// burst gets the stored record, and tests refused for their own reasons inside the group (a
/// token already used on another cylinder, an amendment of a test that does not exist) or
/// before it (an archived cylinder) are refused without taking the others down.
#[tokio::test(flavor = "multi_thread", worker_threads = 2)]
async fn drift_tests_sent_at_once_are_each_stored_once_and_answered_on_their_own() {
    use axum::body::Body;
    use http_body_util::BodyExt;
    use tower::ServiceExt;

    let app = TestApp::new().await;
    let (_, live) = loaded_cylinder(&app, "HV-401").await;
    let (_, gone) = loaded_cylinder(&app, "HV-402").await;
    let (status, body) = app
        .patch_json(
            &format!("/api/v1/cylinders/{gone}"),
            &json!({"archived": true}),
        )
        .await;
    assert_eq!(status, StatusCode::OK, "archive: {body}");
    let (_, other) = loaded_cylinder(&app, "HV-403").await;
    let (status, body) = app
        .post_json(
            &format!("/api/v1/cylinders/{other}/drift-tests"),
            &record("taken"),
        )
        .await;
    assert_eq!(status, StatusCode::CREATED, "{body}");

    // 20 tokens on the live cylinder, g-0 and g-1 sent three times each; two on the archived.
    let mut sends: Vec<(i64, String)> = (0..20).map(|n| (live, format!("g-{n}"))).collect();
    for n in [0, 1, 0, 1] {
        sends.push((live, format!("g-{n}")));
    }
    sends.push((gone, "a-0".into()));
    sends.push((gone, "a-1".into()));
    sends.push((live, "taken".into()));
    sends.push((live, "amends-nothing".into()));
    let mut tasks = Vec::new();
    for (cylinder, token) in sends {
        let mut body = record(&token);
        if token == "amends-nothing" {
            body["amends"] = json!(999_999);
        }
        let request = app
            .builder("POST", &format!("/api/v1/cylinders/{cylinder}/drift-tests"))
            .header("content-type", "application/json")
            .body(Body::from(body.to_string()))
            .expect("request");
        let router = app.router.clone();
        tasks.push(tokio::spawn(async move {
            let response = router.oneshot(request).await.expect("infallible");
            let status = response.status();
            let bytes = response
                .into_body()
                .collect()
                .await
                .expect("body")
                .to_bytes();
            let body: Value = serde_json::from_slice(&bytes).expect("json");
            (cylinder, token, status, body)
        }));
    }
    let mut ids: std::collections::BTreeMap<String, (i64, Vec<StatusCode>)> = Default::default();
    for task in tasks {
        let (cylinder, token, status, body) = task.await.expect("task");
        if cylinder == gone {
            assert_field_error(status, &body, StatusCode::CONFLICT, "cylinder");
            continue;
        }
        if token == "taken" {
            assert_field_error(status, &body, StatusCode::CONFLICT, "client_token");
            continue;
        }
        if token == "amends-nothing" {
            assert_field_error(status, &body, StatusCode::UNPROCESSABLE_ENTITY, "amends");
            continue;
        }
        assert!(
            status == StatusCode::CREATED || status == StatusCode::OK,
            "{token}: {status} {body}"
        );
        let id = body["id"].as_i64().expect("id");
        let entry = ids.entry(token.clone()).or_insert((id, Vec::new()));
        assert_eq!(entry.0, id, "{token} answered with two different records");
        entry.1.push(status);
    }
    assert_eq!(ids.len(), 20);
    for (token, (_, statuses)) in &ids {
        let created = statuses
            .iter()
            .filter(|s| **s == StatusCode::CREATED)
            .count();
        assert_eq!(created, 1, "{token}: {statuses:?}");
    }
    let (rows, audits) = stored_counts(&app).await;
    assert_eq!(rows, 21, "the 20 of the burst and the one sent before it");
    assert_eq!(audits, 21, "one audit row per stored test");
}

/// Two databases in one process (two apps here) each keep their own queue of drift tests: a
/// group is always committed to the database its writes were sent to, even when both apps
/// have a cylinder with the same id and write at the same moment.
#[tokio::test(flavor = "multi_thread", worker_threads = 2)]
async fn drift_tests_for_two_databases_in_one_process_stay_in_their_own() {
    use axum::body::Body;
    use tower::ServiceExt;

    let a = TestApp::new().await;
    let b = TestApp::new().await;
    let (_, on_a) = loaded_cylinder(&a, "HV-501").await;
    let (_, on_b) = loaded_cylinder(&b, "HV-501").await;
    assert_eq!(on_a, on_b, "the same cylinder id in both databases");
    let path = format!("/api/v1/cylinders/{on_a}/drift-tests");
    let mut tasks = Vec::new();
    for n in 0..30 {
        let (app, name) = if n % 2 == 0 { (&a, "a") } else { (&b, "b") };
        let token = format!("{name}-{n}");
        let request = app
            .builder("POST", &path)
            .header("content-type", "application/json")
            .body(Body::from(record(&token).to_string()))
            .expect("request");
        let router = app.router.clone();
        tasks.push(tokio::spawn(async move {
            let status = router.oneshot(request).await.expect("infallible").status();
            (token, status)
        }));
    }
    for task in tasks {
        let (token, status) = task.await.expect("task");
        assert_eq!(status, StatusCode::CREATED, "{token}");
    }
    for (app, name) in [(&a, "a"), (&b, "b")] {
        let tokens: Vec<String> =
            sqlx::query_scalar("SELECT client_token FROM drift_tests ORDER BY client_token")
                .fetch_all(&app.db)
                .await
                .expect("tokens");
        assert_eq!(tokens.len(), 15, "{name}: {tokens:?}");
        assert!(
            tokens.iter().all(|t| t.starts_with(&format!("{name}-"))),
            "{name} holds another database's tests: {tokens:?}"
        );
    }
}

#[tokio::test]
async fn a_limit_table_row_at_or_below_absolute_zero_is_refused_naming_the_row() {
    // 0 K is absolute zero (SI definition of the kelvin); no oil is there, and the stored
    // table would break its own check. Found by the contract fuzzer as a 500.
    let app = TestApp::new().await;
    let (status, p) = app
        .post_json(
            "/api/v1/procedures",
            &json!({"name": "Cold check", "machine_kind": "loader", "duration": "10 min",
                    "limit": {"distance": "8 mm", "per": "10 min"}}),
        )
        .await;
    assert_eq!(status, StatusCode::CREATED, "{p}");
    let id = p["id"].as_i64().expect("id");
    for from in ["0 K", "-300 degC"] {
        let (status, body) = app
            .patch_json(
                &format!("/api/v1/procedures/{id}"),
                &json!({"limit_table": [{"from": from, "distance": "0 m", "per": "1 h"}]}),
            )
            .await;
        assert_eq!(status, StatusCode::UNPROCESSABLE_ENTITY, "{from}: {body}");
        assert_eq!(body["error"]["field"], "limit_table[0].from", "{body}");
    }
}
