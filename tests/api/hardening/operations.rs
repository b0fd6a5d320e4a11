//! Operations: the account and backup commands never make a database out of a mistyped path;
//! a JSON body with a repeated key is refused naming the key; a used client token with another
//! body is a conflict naming the stored record.

use crate::accounts_cli::loadhold;
use crate::helpers::TestApp;
use crate::reports::fleet;
use axum::http::StatusCode;
use serde_json::{Value, json};

#[tokio::test]
async fn user_token_and_backup_commands_refuse_a_database_that_does_not_exist() {
    let app = TestApp::anonymous().await;
    let missing = app.dir.join("mistyped.sqlite");
    let path = missing.display().to_string();
    let out = app.dir.join("copy.sqlite").display().to_string();
    let runs: [&[&str]; 3] = [
        &["backup", "--db", &path, &out],
        &[
            "user",
            "add",
            "hollis",
            "--role",
            "technician",
            "--db",
            &path,
        ],
        &["token", "create", "feed", "--db", &path],
    ];
    for args in runs {
        let (ok, stdout, stderr) = loadhold(args, "piped-in-password-7\n");
        assert!(!ok, "{args:?} must fail: {stdout}{stderr}");
        assert!(stderr.contains("no database at"), "{args:?}: {stderr}");
        assert!(!stdout.contains("backup written"), "{stdout}");
        assert!(!missing.exists(), "{args:?} created {path}");
    }
    assert!(!app.dir.join("copy.sqlite").exists(), "no backup file made");
}

#[tokio::test]
async fn a_repeated_json_key_is_refused_naming_the_key_and_nothing_is_stored() {
    let app = TestApp::new().await;
    let m = fleet::machine(&app, json!({"unit_number": "HV-50", "kind": "aerial lift"})).await;
    let path = format!("/api/v1/machines/{m}/inspections");
    let body = r#"{"kind": "periodic", "performed_on": "2026-05-01", "inspector": "D. Mensah",
        "deficiencies": "boom cylinder rod scored", "result": "fail", "result": "pass"}"#;
    let (status, answer) = app.post_raw(&path, "application/json", body).await;
    assert_eq!(status, StatusCode::BAD_REQUEST, "{answer}");
    assert_eq!(answer["error"]["field"], "result", "{answer}");
    let (_, list) = app.get_json(&path).await;
    assert_eq!(list["items"].as_array().map(Vec::len), Some(0), "{list}");
    // nested objects too
    let body = r#"{"name": "Yard", "units": "metric", "x": {"a": 1, "a": 2}}"#;
    let (status, answer) = app
        .post_raw("/api/v1/sites", "application/json", body)
        .await;
    assert_eq!(status, StatusCode::BAD_REQUEST, "{answer}");
    assert_eq!(answer["error"]["field"], "a", "{answer}");
}

#[tokio::test]
async fn a_used_client_token_with_another_body_is_a_conflict_naming_the_stored_record() {
    let app = TestApp::new().await;
    let m = fleet::machine(&app, json!({"unit_number": "HV-51", "kind": "aerial lift"})).await;
    let path = format!("/api/v1/machines/{m}/inspections");
    let body = |result: &str| -> Value {
        json!({"kind": "periodic", "performed_on": "2026-05-01", "inspector": "D. Mensah",
               "result": result, "deficiencies": "boom cylinder rod scored",
               "client_token": "tab-7:0001"})
    };
    let (status, first) = app.post_json(&path, &body("fail")).await;
    assert_eq!(status, StatusCode::CREATED, "{first}");
    let (status, again) = app.post_json(&path, &body("fail")).await;
    assert_eq!(
        status,
        StatusCode::OK,
        "a retry finds the stored record: {again}"
    );
    assert_eq!(again["id"], first["id"]);
    let (status, other) = app.post_json(&path, &body("pass_with_deficiencies")).await;
    assert_eq!(status, StatusCode::CONFLICT, "{other}");
    assert_eq!(other["error"]["field"], "client_token");
    let message = other["error"]["message"].as_str().unwrap_or("");
    assert!(
        message.contains(&format!("inspection {}", first["id"])) && message.contains("result"),
        "names the stored record and the field: {message}"
    );
}
