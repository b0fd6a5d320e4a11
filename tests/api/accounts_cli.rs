//! The account commands: `loadhold user add`, `loadhold token create`, and the demo logins.

use crate::helpers::TestApp;
use axum::http::StatusCode;
use loadhold::auth::secret;

pub fn loadhold(args: &[&str], stdin: &str) -> (bool, String, String) {
    use std::io::Write;
    use std::process::{Command, Stdio};
    let mut child = Command::new(env!("CARGO_BIN_EXE_loadhold"))
        .args(args)
        .env("LOADHOLD_LOG", "error")
        .stdin(Stdio::piped())
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .expect("run loadhold");
    child
        .stdin
        .take()
        .expect("stdin")
        .write_all(stdin.as_bytes())
        .expect("write stdin");
    let out = child.wait_with_output().expect("wait");
    (
        out.status.success(),
        String::from_utf8_lossy(&out.stdout).into_owned(),
        String::from_utf8_lossy(&out.stderr).into_owned(),
    )
}

#[tokio::test]
async fn cli_user_add_takes_the_password_from_stdin_or_prints_a_generated_one() {
    let app = TestApp::anonymous().await;
    let db = app.dir.join("test.sqlite").display().to_string();
    let (ok, out, err) = loadhold(
        &["user", "add", "hollis", "--role", "technician", "--db", &db],
        "piped-in-password-7\n",
    );
    assert!(ok, "{out}{err}");
    assert!(
        !out.contains("piped-in-password-7"),
        "a given password is not echoed"
    );
    let mut client = app.client();
    assert_eq!(
        client.login("hollis", "piped-in-password-7").await,
        StatusCode::SEE_OTHER
    );

    let (ok, out, err) = loadhold(
        &["user", "add", "marek", "--role", "manager", "--db", &db],
        "",
    );
    assert!(ok, "{out}{err}");
    let line = out
        .lines()
        .find(|l| l.starts_with("password"))
        .expect("generated password printed");
    let generated = line.rsplit(' ').next().unwrap_or("");
    assert_eq!(generated.len(), 19, "{line}");
    assert_eq!(
        client.login("marek", generated).await,
        StatusCode::SEE_OTHER
    );

    let (ok, _, err) = loadhold(&["user", "add", "x1", "--role", "boss", "--db", &db], "");
    assert!(!ok && err.contains("technician, manager or admin"), "{err}");
    let (ok, _, err) = loadhold(
        &["user", "add", "shorty", "--role", "admin", "--db", &db],
        "short\n",
    );
    assert!(!ok && err.contains("at least 12"), "{err}");
}

#[tokio::test]
async fn cli_token_create_prints_a_token_once_that_works_with_its_role() {
    let app = TestApp::anonymous().await;
    let db = app.dir.join("test.sqlite").display().to_string();
    let (ok, out, err) = loadhold(&["token", "create", "yard feed", "--db", &db], "");
    assert!(ok, "{out}{err}");
    let token = out.trim();
    assert!(token.starts_with("lh_"), "{out}");
    assert!(err.contains("shown once"), "{err}");
    let mut client = app.client();
    client.auth = vec![("authorization".into(), format!("Bearer {token}"))];
    assert_eq!(client.get_json("/api/v1/machines").await.0, StatusCode::OK);
    let (status, _) = client
        .post_json(
            "/api/v1/sites",
            &serde_json::json!({"name": "X", "units": "us"}),
        )
        .await;
    assert_eq!(
        status,
        StatusCode::FORBIDDEN,
        "the default role is technician"
    );
    let stored: String = sqlx::query_scalar("SELECT token_hash FROM api_tokens")
        .fetch_one(&app.db)
        .await
        .expect("row");
    assert_eq!(stored, secret::token_hash(token));
}

#[tokio::test]
async fn the_demo_prints_logins_that_work_for_each_role() {
    let app = TestApp::anonymous().await;
    let printed = loadhold::auth::demo::create_demo_users(&app.db)
        .await
        .expect("demo users");
    let again = loadhold::auth::demo::create_demo_users(&app.db)
        .await
        .expect("idempotent");
    assert_eq!(printed, again);
    let mut seen = 0;
    for line in printed.lines().filter(|l| l.contains(" user ")) {
        let words: Vec<&str> = line.split_whitespace().collect();
        let (role, user, password) = (words[0], words[2], words[4]);
        let mut client = app.client();
        assert_eq!(
            client.login(user, password).await,
            StatusCode::SEE_OTHER,
            "{line}"
        );
        let (_, _, page) = client.get_page("/login").await;
        assert!(page.contains(&format!("· {role}</span>")), "{role}: {page}");
        seen += 1;
    }
    assert_eq!(seen, 3, "{printed}");
}
