//! Random and mutated JSON bodies sent in-process to the calculation endpoints and to a
//! registry create: never a 5xx, every 4xx is our JSON error shape, and a 2xx calculation
//! carries no quantity whose SI value was lost (NaN and infinity serialise as `null`).

use crate::helpers::TestApp;
use axum::http::StatusCode;
use proptest::prelude::*;
use proptest::test_runner::{Config, TestCaseError, TestRunner};
use serde_json::{Map, Value, json};
use std::cell::Cell;

const CASES: u32 = 384;

/// Strings that sit near the edges of the quantity parser.
fn odd_quantity() -> impl Strategy<Value = String> {
    let units = prop::sample::select(vec![
        "in", "mm", "m", "cm", "ft", "bar", "psi", "MPa", "kPa", "ksi", "Pa", "GPa", "lbf", "N",
        "kN", "kip", "gpm", "L/min", "m3/s", "degC", "degF", "°C", "°F", "K", "s", "min", "h", "L",
        "gal", "in3", "cc", "1/K", "1/degC", "in2", "mm2", "", "IN", "inch", "psig", "µm", "mm mm",
        "/", "e", "%",
    ]);
    let numbers = prop_oneof![
        any::<f64>().prop_map(|v| v.to_string()),
        (-1e6f64..1e6).prop_map(|v| format!("{v}")),
        prop::sample::select(vec![
            "0", "-0", "1e308", "1e309", "-1e309", "NaN", "nan", "inf", "-inf", "infinity",
            "1e-320", "0x10", "1_000", "1,5", "١٢", "+4", ".5", "5.", "--4", "4e", "", " ",
        ])
        .prop_map(str::to_string),
    ];
    prop_oneof![
        (numbers.clone(), units.clone()).prop_map(|(n, u)| format!("{n} {u}")),
        (numbers, units).prop_map(|(n, u)| format!("{n}{u}")),
        ".{0,24}",
    ]
}

/// Any JSON value, biased toward the shapes a quantity field might receive.
fn any_json() -> impl Strategy<Value = Value> {
    let leaf = prop_oneof![
        Just(Value::Null),
        any::<bool>().prop_map(Value::Bool),
        any::<i64>().prop_map(|n| json!(n)),
        any::<f64>()
            .prop_map(|v| serde_json::Number::from_f64(v).map_or(Value::Null, Value::Number)),
        odd_quantity().prop_map(Value::String),
        (any::<f64>(), odd_quantity()).prop_map(|(v, u)| json!({"value": v, "unit": u})),
        (odd_quantity(), any::<bool>()).prop_map(|(u, b)| json!({"value": u, "unit": b})),
    ];
    leaf.prop_recursive(3, 24, 6, |inner| {
        prop_oneof![
            prop::collection::vec(inner.clone(), 0..4).prop_map(Value::Array),
            prop::collection::btree_map("[a-z_]{0,12}", inner, 0..4)
                .prop_map(|m| Value::Object(m.into_iter().collect())),
        ]
    })
}

fn valid_cylinder() -> Map<String, Value> {
    // Demo-style inputs (invented): a 4 in x 2 in x 24 in boom cylinder holding 10,000 lbf.
    let value = json!({
        "bore": "4 in", "rod": "2 in", "stroke": "24 in", "position": "12 in",
        "load": "10000 lbf", "load_direction": "retract", "bulk_modulus": "1.5 GPa",
        "supply_pressure": "3000 psi", "flow": "10 gpm", "cap_line_volume": "0.5 L",
        "rod_line_volume": "0.3 L", "tube_outside_diameter": "4.5 in",
        "ratings": {"cap_line": "3000 psi", "rod_line": "3000 psi", "cylinder": "3000 psi"},
        "units": "us"
    });
    value.as_object().cloned().unwrap_or_default()
}

fn valid_drift_test() -> Map<String, Value> {
    let mut body = valid_cylinder();
    let extra = json!({
        "duration": "10 min", "drift": "3 mm", "oil_temperature_start": "55 degC",
        "oil_temperature_end": "50 degC", "cap_pressure_start": "80 bar",
        "cap_pressure_end": "78 bar", "rod_pressure_start": "5 bar", "rod_pressure_end": "6 bar",
        "oil_expansion": "0.0007 1/degC", "limit": {"distance": "5 mm", "per": "10 min"}
    });
    if let Value::Object(extra) = extra {
        body.extend(extra);
    }
    body
}

/// One change to a valid body: drop a field, replace a value, add a stranger, nest oddly.
#[derive(Clone, Debug)]
enum Mutation {
    Remove(prop::sample::Index),
    Replace(prop::sample::Index, Value),
    Insert(String, Value),
    ReplaceNested(prop::sample::Index, Value),
    /// Multiplies the number of a `"<number> <unit>"` field: explores the calculation's inputs
    /// (zero, tiny, huge, negative) while the body stays well formed.
    Rescale(prop::sample::Index, f64),
}

fn mutation() -> impl Strategy<Value = Mutation> {
    prop_oneof![
        any::<prop::sample::Index>().prop_map(Mutation::Remove),
        (any::<prop::sample::Index>(), any_json()).prop_map(|(i, v)| Mutation::Replace(i, v)),
        ("[a-z_]{1,12}", any_json()).prop_map(|(k, v)| Mutation::Insert(k, v)),
        (any::<prop::sample::Index>(), any_json()).prop_map(|(i, v)| Mutation::ReplaceNested(i, v)),
        (any::<prop::sample::Index>(), scale()).prop_map(|(i, f)| Mutation::Rescale(i, f)),
        (any::<prop::sample::Index>(), scale()).prop_map(|(i, f)| Mutation::Rescale(i, f)),
    ]
}

fn scale() -> impl Strategy<Value = f64> {
    prop_oneof![
        0.0f64..4.0,
        0.9f64..1.1,
        Just(0.0),
        Just(-1.0),
        Just(1e-9),
        Just(1e9),
        Just(1e300),
        Just(1e306),
        any::<f64>(),
    ]
}

fn mutate(mut body: Map<String, Value>, mutations: &[Mutation]) -> Value {
    for m in mutations {
        let keys: Vec<String> = body.keys().cloned().collect();
        if keys.is_empty() {
            break;
        }
        match m {
            Mutation::Remove(i) => {
                body.remove(&keys[i.index(keys.len())]);
            }
            Mutation::Replace(i, v) => {
                body.insert(keys[i.index(keys.len())].clone(), v.clone());
            }
            Mutation::Insert(k, v) => {
                body.insert(k.clone(), v.clone());
            }
            Mutation::Rescale(i, factor) => {
                let key = keys[i.index(keys.len())].clone();
                if let Some(Value::String(text)) = body.get(&key)
                    && let Some((number, unit)) = text.split_once(' ')
                    && let Ok(number) = number.parse::<f64>()
                {
                    let scaled = format!("{} {unit}", number * factor);
                    body.insert(key, Value::String(scaled));
                }
            }
            Mutation::ReplaceNested(i, v) => {
                let objects: Vec<String> = keys
                    .iter()
                    .filter(|k| body[k.as_str()].is_object())
                    .cloned()
                    .collect();
                if let Some(key) = objects.get(i.index(objects.len().max(1)))
                    && let Some(Value::Object(inner)) = body.get_mut(key)
                {
                    let inner_keys: Vec<String> = inner.keys().cloned().collect();
                    if !inner_keys.is_empty() {
                        inner.insert(inner_keys[i.index(inner_keys.len())].clone(), v.clone());
                    }
                }
            }
        }
    }
    Value::Object(body)
}

/// The checks every answer must pass.
fn check_answer(
    path: &str,
    sent: &str,
    status: StatusCode,
    body: &Value,
) -> Result<(), TestCaseError> {
    prop_assert!(
        !status.is_server_error(),
        "{path} answered {status} to {sent}: {body}"
    );
    if status.is_client_error() {
        let error = &body["error"];
        prop_assert!(
            error["code"].as_str().is_some_and(|c| !c.is_empty()),
            "{path} {status}: no error.code for {sent}: {body}"
        );
        prop_assert!(
            error["message"].as_str().is_some_and(|m| !m.is_empty()),
            "{path} {status}: no error.message for {sent}: {body}"
        );
        prop_assert!(
            error["field"].is_null() || error["field"].is_string(),
            "{path} {status}: error.field must be a string or null: {body}"
        );
        if status == StatusCode::UNPROCESSABLE_ENTITY {
            // The name of the offending field: empty only when that key itself was "".
            prop_assert!(
                error["field"].is_string(),
                "{path} 422 must name the field, for {sent}: {body}"
            );
        }
    } else if status.is_success() {
        prop_assert!(
            body.is_object(),
            "{path} {status}: body is not an object: {body}"
        );
        check_quantities(path, sent, body)?;
    }
    Ok(())
}

/// Every `{"si", "value", "unit"}` quantity in a response carries finite numbers.
fn check_quantities(path: &str, sent: &str, value: &Value) -> Result<(), TestCaseError> {
    match value {
        Value::Object(map) => {
            if map.contains_key("si") {
                for part in ["si", "value"] {
                    prop_assert!(
                        map[part].as_f64().is_some_and(f64::is_finite),
                        "{path}: a quantity lost its {part} for {sent}: {value}"
                    );
                }
            }
            for inner in map.values() {
                check_quantities(path, sent, inner)?;
            }
        }
        Value::Array(items) => {
            for inner in items {
                check_quantities(path, sent, inner)?;
            }
        }
        _ => {}
    }
    Ok(())
}

/// Runs `CASES` generated bodies against one route of one fresh app. `min_accepted` is the
/// share of cases that must be answered 2xx, so a run that never reaches the calculation or
/// the store (everything refused at the door) fails instead of passing vacuously.
fn fuzz_route(path: &'static str, strategy: impl Strategy<Value = Value>, min_accepted: f64) {
    fuzz_route_after(path, strategy, min_accepted, &[]);
}

/// As [`fuzz_route`], after posting `setup` bodies (`(path, body)`, each must answer 201).
fn fuzz_route_after(
    path: &'static str,
    strategy: impl Strategy<Value = Value>,
    min_accepted: f64,
    setup: &[(&str, Value)],
) {
    let runtime = tokio::runtime::Builder::new_current_thread()
        .enable_all()
        .build()
        .expect("runtime");
    let app = runtime.block_on(TestApp::new());
    for (setup_path, body) in setup {
        let (status, answer) = runtime.block_on(app.post_json(setup_path, body));
        assert_eq!(status, StatusCode::CREATED, "setup {setup_path}: {answer}");
    }
    let mut runner = TestRunner::new(Config {
        cases: CASES,
        failure_persistence: None,
        ..Config::default()
    });
    let (accepted, total) = (Cell::new(0u32), Cell::new(0u32));
    let result = runner.run(&strategy, |body| {
        let sent = body.to_string();
        let (status, answer) = runtime.block_on(app.post_json(path, &body));
        total.set(total.get() + 1);
        if status.is_success() {
            accepted.set(accepted.get() + 1);
        }
        check_answer(path, &sent, status, &answer)
    });
    if let Err(failure) = result {
        panic!("{path}: {failure}");
    }
    let share = f64::from(accepted.get()) / f64::from(total.get().max(1));
    eprintln!(
        "{path}: {} of {} generated bodies accepted",
        accepted.get(),
        total.get()
    );
    assert!(
        share >= min_accepted,
        "{path}: only {} of {} generated bodies were accepted; the fuzzer is not reaching the handler",
        accepted.get(),
        total.get()
    );
}

/// Raw bytes that are not always JSON, with and without the JSON content type.
fn fuzz_raw(path: &'static str) {
    let runtime = tokio::runtime::Builder::new_current_thread()
        .enable_all()
        .build()
        .expect("runtime");
    let app = runtime.block_on(TestApp::new());
    let bodies = prop_oneof![
        ".{0,64}",
        any_json().prop_map(|v| {
            let text = v.to_string();
            let cut = text.len() / 2;
            text.chars().take(cut).collect::<String>()
        }),
        Just("[]".to_string()),
        Just("\"4 in\"".to_string()),
        Just("{\"bore\": \"4 in\", \"bore\": \"5 in\"}".to_string()),
    ];
    let content_types = prop::sample::select(vec![
        "application/json",
        "application/json; charset=utf-8",
        "text/plain",
        "application/x-www-form-urlencoded",
        "",
    ]);
    let mut runner = TestRunner::new(Config {
        cases: CASES,
        failure_persistence: None,
        ..Config::default()
    });
    let result = runner.run(&(bodies, content_types), |(body, content_type)| {
        let (status, answer) = runtime.block_on(app.post_raw(path, content_type, &body));
        check_answer(path, &format!("{content_type}: {body}"), status, &answer)
    });
    if let Err(failure) = result {
        panic!("{path}: {failure}");
    }
}

fn mutated(valid: fn() -> Map<String, Value>) -> impl Strategy<Value = Value> {
    prop::collection::vec(mutation(), 1..4).prop_map(move |m| mutate(valid(), &m))
}

#[test]
fn cylinder_calc_survives_mutated_bodies() {
    fuzz_route("/api/v1/calc/cylinder", mutated(valid_cylinder), 0.05);
}

#[test]
fn cylinder_calc_survives_arbitrary_json() {
    fuzz_route("/api/v1/calc/cylinder", any_json(), 0.0);
}

#[test]
fn drift_test_calc_survives_mutated_bodies() {
    fuzz_route("/api/v1/calc/drift-test", mutated(valid_drift_test), 0.05);
}

#[test]
fn drift_test_calc_survives_arbitrary_json() {
    fuzz_route("/api/v1/calc/drift-test", any_json(), 0.0);
}

#[test]
fn calc_endpoints_survive_raw_bytes() {
    fuzz_raw("/api/v1/calc/cylinder");
    fuzz_raw("/api/v1/calc/drift-test");
}

fn valid_machine() -> Map<String, Value> {
    let value = json!({
        "unit_number": "HV-FZ-01", "kind": "telehandler", "description": "fuzz target",
        "serial": "SN-1", "status": "in_service", "relief_pressure": "250 bar",
        "hour_meter": 1200.5, "hour_meter_read_on": "2025-03-01",
        "periodic_interval_days": 365, "periodic_interval_hours": 500,
        "frequent_interval_days": 30
    });
    value.as_object().cloned().unwrap_or_default()
}

#[test]
fn machine_create_survives_mutated_bodies() {
    // A fresh unit number per case, so that acceptance is not cut short by duplicates (409).
    let bodies = ("[A-Z0-9]{8}", prop::collection::vec(mutation(), 1..4)).prop_map(|(unit, m)| {
        let mut base = valid_machine();
        base.insert("unit_number".into(), Value::String(format!("FZ-{unit}")));
        mutate(base, &m)
    });
    fuzz_route("/api/v1/machines", bodies, 0.05);
}

#[test]
fn machine_create_survives_raw_bytes() {
    fuzz_raw("/api/v1/machines");
}

fn valid_hose() -> Map<String, Value> {
    let value = json!({
        "machine_id": 1, "spec": "SAE 100R2AT", "size": "-12",
        "inside_diameter": "19 mm", "length": "1.2 m", "working_pressure": "250 bar",
        "made_in": "2024-Q2", "installed_on": "2024-06-01", "replace_by": "2030-06-01",
        "circuit": "boom lift, cap end (fuzz target)"
    });
    value.as_object().cloned().unwrap_or_default()
}

#[test]
fn hose_create_survives_mutated_bodies() {
    fuzz_route_after(
        "/api/v1/hoses",
        mutated(valid_hose),
        0.05,
        &[(
            "/api/v1/machines",
            json!({"unit_number": "HV-FZ-H", "kind": "excavator"}),
        )],
    );
}
