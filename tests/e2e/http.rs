//! A small HTTP/1.1 client over real sockets (hyper-util, the client fantoccini is built on).

use http_body_util::{BodyExt, Full};
use hyper::body::Bytes;
use hyper::header::{HeaderMap, HeaderValue};
use hyper::{Method, Request};
use hyper_util::client::legacy::Client;
use hyper_util::client::legacy::connect::HttpConnector;
use hyper_util::rt::TokioExecutor;
use serde_json::Value;
use std::time::Duration;

/// One answer: status, headers, body bytes.
#[derive(Debug)]
pub struct Reply {
    pub status: u16,
    pub headers: HeaderMap,
    pub body: Vec<u8>,
}

impl Reply {
    /// The body as JSON (`Value::Null` when it is not JSON).
    pub fn json(&self) -> Value {
        serde_json::from_slice(&self.body).unwrap_or(Value::Null)
    }

    pub fn text(&self) -> String {
        String::from_utf8_lossy(&self.body).into_owned()
    }

    pub fn header(&self, name: &str) -> Option<&str> {
        self.headers.get(name).and_then(|v| v.to_str().ok())
    }
}

/// A client bound to one server's base URL, with headers added to every request.
#[derive(Clone)]
pub struct Http {
    client: Client<HttpConnector, Full<Bytes>>,
    base: String,
    pub headers: Vec<(String, String)>,
}

impl Http {
    pub fn new(base: &str) -> Http {
        let mut connector = HttpConnector::new();
        connector.set_connect_timeout(Some(Duration::from_secs(5)));
        Http {
            client: Client::builder(TokioExecutor::new()).build(connector),
            base: base.trim_end_matches('/').to_string(),
            headers: Vec::new(),
        }
    }

    /// Adds `Authorization: Bearer TOKEN` to every request.
    pub fn with_bearer(mut self, token: &str) -> Http {
        self.headers
            .push(("authorization".into(), format!("Bearer {token}")));
        self
    }

    /// Sends one request; a transport failure (refused, reset, timed out) is an `Err`.
    pub async fn send(
        &self,
        method: Method,
        path: &str,
        content_type: Option<&str>,
        body: Vec<u8>,
    ) -> Result<Reply, String> {
        let mut builder = Request::builder()
            .method(method)
            .uri(format!("{}{path}", self.base));
        for (name, value) in &self.headers {
            builder = builder.header(name.as_str(), value.as_str());
        }
        if let Some(ct) = content_type {
            builder = builder.header(
                "content-type",
                HeaderValue::from_str(ct).map_err(|e| e.to_string())?,
            );
        }
        let request = builder
            .body(Full::new(Bytes::from(body)))
            .map_err(|e| e.to_string())?;
        let exchange = async {
            let response = self
                .client
                .request(request)
                .await
                .map_err(|e| e.to_string())?;
            let status = response.status().as_u16();
            let headers = response.headers().clone();
            let body = response
                .into_body()
                .collect()
                .await
                .map_err(|e| e.to_string())?
                .to_bytes()
                .to_vec();
            Ok(Reply {
                status,
                headers,
                body,
            })
        };
        tokio::time::timeout(Duration::from_secs(60), exchange)
            .await
            .map_err(|_| "timed out after 60 s".to_string())?
    }

    pub async fn get(&self, path: &str) -> Result<Reply, String> {
        self.send(Method::GET, path, None, Vec::new()).await
    }

    pub async fn post_json(&self, path: &str, body: &Value) -> Result<Reply, String> {
        self.send(
            Method::POST,
            path,
            Some("application/json"),
            body.to_string().into_bytes(),
        )
        .await
    }
}
