#![allow(dead_code)]
//! A fresh application on its own SQLite file, driven in-process with `oneshot`.

use axum::Router;
use axum::body::Body;
use axum::http::{Request, StatusCode, header};
use http_body_util::BodyExt;
use loadhold::app::{AppState, app};
use loadhold::auth::{Actor, Role, tokens, users};
use loadhold::db::Db;
use serde_json::Value;
use std::path::PathBuf;
use std::sync::atomic::{AtomicU32, Ordering};
use tower::ServiceExt;

static COUNTER: AtomicU32 = AtomicU32::new(0);

/// A migrated database in a fresh temporary folder, and the app over it.
pub struct TestApp {
    pub db: Db,
    pub router: Router,
    pub dir: PathBuf,
    /// Headers added to every request: a bearer token, or a session cookie.
    pub auth: Vec<(String, String)>,
    /// The session's anti-forgery token when logged in with a cookie; `post_form` adds it.
    pub csrf: Option<String>,
}

/// The password every user made by the harness gets.
pub const TEST_PASSWORD: &str = "gauge-bleed-screw-41";

impl TestApp {
    /// A fresh app whose requests carry an admin bearer token (allowed everything, no CSRF).
    pub async fn new() -> TestApp {
        TestApp::with_role(Role::Admin).await
    }

    /// A fresh app whose requests carry a bearer token of `role`.
    pub async fn with_role(role: Role) -> TestApp {
        let mut app = TestApp::anonymous().await;
        let token = app.token(role).await;
        app.auth = vec![("authorization".into(), format!("Bearer {token}"))];
        app
    }

    /// A fresh app logged in through the login form as a new user of `role` (user name the
    /// role's name): requests carry the session cookie, forms the session's CSRF token.
    pub async fn session(role: Role) -> TestApp {
        let mut app = TestApp::anonymous().await;
        app.add_user(role.as_str(), role).await;
        let status = app.login(role.as_str(), TEST_PASSWORD).await;
        assert_eq!(status, StatusCode::SEE_OTHER, "login as {}", role.as_str());
        app
    }

    /// Makes a bearer token of `role` on this app's database and returns it.
    pub async fn token(&self, role: Role) -> String {
        let name = format!("test {}", role.as_str());
        let (_, token) = tokens::create(&self.db, &Actor::system(), &name, role)
            .await
            .expect("create token");
        token
    }

    /// Adds a user with `TEST_PASSWORD`; returns its id.
    pub async fn add_user(&self, username: &str, role: Role) -> i64 {
        users::create(
            &self.db,
            &Actor::system(),
            username,
            "",
            role,
            TEST_PASSWORD,
        )
        .await
        .expect("create user")
        .id
    }

    /// Logs in through `POST /login`; on success keeps the session cookie (replacing any other
    /// credential) and reads the CSRF token from a page. Returns the login's status.
    pub async fn login(&mut self, username: &str, password: &str) -> StatusCode {
        let saved = std::mem::take(&mut self.auth);
        self.csrf = None;
        let (status, headers, _) = self
            .post_form("/login", &[("username", username), ("password", password)])
            .await;
        let cookie = headers
            .get_all(header::SET_COOKIE)
            .iter()
            .filter_map(|v| v.to_str().ok())
            .find_map(|v| {
                v.split(';')
                    .next()
                    .filter(|c| c.starts_with("loadhold_session="))
            })
            .map(str::to_string);
        match cookie {
            Some(cookie) if status == StatusCode::SEE_OTHER => {
                self.auth = vec![("cookie".into(), cookie)];
                let (_, _, page) = self.get_page("/login").await;
                self.csrf = csrf_field(&page);
                assert!(
                    self.csrf.is_some(),
                    "a logged-in page carries the csrf field"
                );
            }
            _ => self.auth = saved,
        }
        status
    }

    /// Another client of the same app and database, with no credentials yet (a second person
    /// at another browser).
    pub fn client(&self) -> TestApp {
        let n = COUNTER.fetch_add(1, Ordering::SeqCst);
        TestApp {
            db: self.db.clone(),
            router: self.router.clone(),
            // Never created: dropping the client removes nothing of the shared app.
            dir: self.dir.join(format!("client-{n}")),
            auth: Vec::new(),
            csrf: None,
        }
    }

    /// A fresh app with no credentials at all.
    pub async fn anonymous() -> TestApp {
        let n = COUNTER.fetch_add(1, Ordering::SeqCst);
        let dir = std::env::temp_dir().join(format!("loadhold-test-{}-{n}", std::process::id()));
        let _ = std::fs::remove_dir_all(&dir);
        std::fs::create_dir_all(&dir).expect("temp dir");
        let db = loadhold::db::open(&dir.join("test.sqlite"))
            .await
            .expect("open db");
        // Labels' QR codes point at the configured public address (issue 14).
        let router = app(AppState::new(db.clone()).with_public_url(Some("https://loadhold.test/")));
        TestApp {
            db,
            router,
            dir,
            auth: Vec::new(),
            csrf: None,
        }
    }

    /// A request with this app's credentials (and, for a session, the CSRF header on writes
    /// other than forms).
    pub fn builder(&self, method: &str, path: &str) -> axum::http::request::Builder {
        let mut builder = Request::builder().method(method).uri(path);
        for (name, value) in &self.auth {
            builder = builder.header(name.as_str(), value.as_str());
        }
        builder
    }

    /// Sends a request and returns status, headers and body bytes.
    pub async fn send(
        &self,
        request: Request<Body>,
    ) -> (StatusCode, axum::http::HeaderMap, Vec<u8>) {
        let response = self
            .router
            .clone()
            .oneshot(request)
            .await
            .expect("infallible");
        let status = response.status();
        let headers = response.headers().clone();
        let bytes = response
            .into_body()
            .collect()
            .await
            .expect("body")
            .to_bytes()
            .to_vec();
        (status, headers, bytes)
    }

    pub async fn json(
        &self,
        method: &str,
        path: &str,
        body: Option<&Value>,
    ) -> (StatusCode, Value) {
        let mut builder = self.builder(method, path);
        if let (Some(csrf), false) = (&self.csrf, method == "GET") {
            builder = builder.header("x-csrf-token", csrf.as_str());
        }
        let request = match body {
            Some(body) => builder
                .header(header::CONTENT_TYPE, "application/json")
                .body(Body::from(body.to_string())),
            None => builder.body(Body::empty()),
        }
        .expect("request");
        let (status, _, bytes) = self.send(request).await;
        let value = if bytes.is_empty() {
            Value::Null
        } else {
            serde_json::from_slice(&bytes)
                .unwrap_or_else(|_| Value::String(String::from_utf8_lossy(&bytes).into()))
        };
        (status, value)
    }

    pub async fn get_json(&self, path: &str) -> (StatusCode, Value) {
        self.json("GET", path, None).await
    }

    pub async fn post_json(&self, path: &str, body: &Value) -> (StatusCode, Value) {
        self.json("POST", path, Some(body)).await
    }

    pub async fn patch_json(&self, path: &str, body: &Value) -> (StatusCode, Value) {
        self.json("PATCH", path, Some(body)).await
    }

    /// Sends a raw body with a given content type (for malformed-input tests).
    pub async fn post_raw(
        &self,
        path: &str,
        content_type: &str,
        body: &str,
    ) -> (StatusCode, Value) {
        let request = self
            .builder("POST", path)
            .header(header::CONTENT_TYPE, content_type)
            .body(Body::from(body.to_string()))
            .expect("request");
        let (status, _, bytes) = self.send(request).await;
        (
            status,
            serde_json::from_slice(&bytes).unwrap_or(Value::Null),
        )
    }

    /// GETs a page; returns status, headers and the body as text.
    pub async fn get_page(&self, path: &str) -> (StatusCode, axum::http::HeaderMap, String) {
        let request = self
            .builder("GET", path)
            .body(Body::empty())
            .expect("request");
        let (status, headers, bytes) = self.send(request).await;
        (
            status,
            headers,
            String::from_utf8_lossy(&bytes).into_owned(),
        )
    }

    /// POSTs an HTML form (application/x-www-form-urlencoded). When logged in with a session,
    /// the session's `csrf` field is added unless the form already has one.
    pub async fn post_form(
        &self,
        path: &str,
        fields: &[(&str, &str)],
    ) -> (StatusCode, axum::http::HeaderMap, String) {
        let mut fields = fields.to_vec();
        if let Some(csrf) = &self.csrf
            && !fields.iter().any(|(k, _)| *k == "csrf")
        {
            fields.push(("csrf", csrf.as_str()));
        }
        self.post_form_as_is(path, &fields).await
    }

    /// POSTs a form exactly as given (no CSRF field added).
    pub async fn post_form_as_is(
        &self,
        path: &str,
        fields: &[(&str, &str)],
    ) -> (StatusCode, axum::http::HeaderMap, String) {
        let body = fields
            .iter()
            .map(|(k, v)| format!("{}={}", urlencode(k), urlencode(v)))
            .collect::<Vec<_>>()
            .join("&");
        let request = self
            .builder("POST", path)
            .header(header::CONTENT_TYPE, "application/x-www-form-urlencoded")
            .body(Body::from(body))
            .expect("request");
        let (status, headers, bytes) = self.send(request).await;
        (
            status,
            headers,
            String::from_utf8_lossy(&bytes).into_owned(),
        )
    }
}

impl Drop for TestApp {
    fn drop(&mut self) {
        let _ = std::fs::remove_dir_all(&self.dir);
    }
}

/// The value of the first `name="csrf"` hidden field in a page.
pub fn csrf_field(page: &str) -> Option<String> {
    let at = page.find("name=\"csrf\" value=\"")? + "name=\"csrf\" value=\"".len();
    let value: String = page[at..].chars().take_while(|c| *c != '"').collect();
    Some(value).filter(|v| !v.is_empty())
}

/// Percent-encodes a form value.
pub fn urlencode(text: &str) -> String {
    let mut out = String::new();
    for byte in text.bytes() {
        match byte {
            b'A'..=b'Z' | b'a'..=b'z' | b'0'..=b'9' | b'-' | b'_' | b'.' | b'~' => {
                out.push(byte as char)
            }
            b' ' => out.push('+'),
            _ => out.push_str(&format!("%{byte:02X}")),
        }
    }
    out
}

/// Asserts a JSON error of the given status that names `field`.
pub fn assert_field_error(status: StatusCode, body: &Value, expected: StatusCode, field: &str) {
    assert_eq!(status, expected, "status for {field}: {body}");
    assert_eq!(
        body["error"]["field"], field,
        "error should name {field}: {body}"
    );
    assert!(
        body["error"]["message"]
            .as_str()
            .is_some_and(|m| !m.is_empty()),
        "message: {body}"
    );
}
