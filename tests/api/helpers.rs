#![allow(dead_code)]
//! A fresh application on its own SQLite file, driven in-process with `oneshot`.

use axum::Router;
use axum::body::Body;
use axum::http::{Request, StatusCode, header};
use http_body_util::BodyExt;
use loadhold::app::{AppState, app};
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
    /// Headers added to every request (a session cookie or bearer token once accounts exist).
    pub auth: Vec<(String, String)>,
}

impl TestApp {
    pub async fn new() -> TestApp {
        let n = COUNTER.fetch_add(1, Ordering::SeqCst);
        let dir = std::env::temp_dir().join(format!("loadhold-test-{}-{n}", std::process::id()));
        let _ = std::fs::remove_dir_all(&dir);
        std::fs::create_dir_all(&dir).expect("temp dir");
        let db = loadhold::db::open(&dir.join("test.sqlite"))
            .await
            .expect("open db");
        let router = app(AppState::new(db.clone()));
        TestApp {
            db,
            router,
            dir,
            auth: Vec::new(),
        }
    }

    fn builder(&self, method: &str, path: &str) -> axum::http::request::Builder {
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
        let builder = self.builder(method, path);
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

    /// POSTs an HTML form (application/x-www-form-urlencoded).
    pub async fn post_form(
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
