//! The OpenAPI document against the server it describes: every JSON route in the router source
//! is in the spec and nothing else is; every request schema lists exactly the body fields and
//! query parameters the running server accepts (the server names them when it refuses a
//! stranger). schemathesis then checks the answers against the schemas (tests/run-all.sh).

use crate::http::Http;
use crate::server::{Server, TempDir, artifacts, cli, create_token};
use hyper::Method;
use serde_json::{Value, json};
use std::collections::BTreeSet;
use std::path::Path;

/// `(method, path)` of every `.route("/api/...", ...)` in `server/`, read from the source.
fn routes_in_source() -> BTreeSet<(String, String)> {
    let mut found = BTreeSet::new();
    let root = Path::new(env!("CARGO_MANIFEST_DIR")).join("server");
    let mut stack = vec![root];
    while let Some(dir) = stack.pop() {
        for entry in std::fs::read_dir(&dir).expect("read server/").flatten() {
            let path = entry.path();
            if path.is_dir() {
                stack.push(path);
            } else if path.extension().is_some_and(|e| e == "rs") {
                let source = std::fs::read_to_string(&path).expect("read source");
                for (method, route) in routes_in(&source, &path) {
                    found.insert((method, route));
                }
            }
        }
    }
    found
}

const METHODS: &[&str] = &[
    "get", "post", "put", "patch", "delete", "head", "options", "any",
];

fn routes_in(source: &str, file: &Path) -> Vec<(String, String)> {
    let mut out = Vec::new();
    let mut rest = source;
    while let Some(at) = rest.find(".route(") {
        let call = &rest[at + ".route(".len()..];
        let args = balanced(call);
        rest = &call[args.len()..];
        let trimmed = args.trim_start();
        let Some(literal) = trimmed.strip_prefix('"') else {
            // A path that is not a literal cannot be checked here: refuse it loudly for /api.
            assert!(
                !args.contains("api"),
                "{}: a route path must be a string literal: .route({args}",
                file.display()
            );
            continue;
        };
        let path = &literal[..literal.find('"').expect("closing quote")];
        if !path.starts_with("/api/") || path == "/api/{*rest}" {
            continue;
        }
        let handlers = &literal[path.len() + 1..];
        let mut methods = Vec::new();
        for (i, _) in handlers.char_indices() {
            let before = handlers[..i].chars().last();
            if before.is_some_and(|c| c.is_alphanumeric() || c == '_') {
                continue;
            }
            for m in METHODS {
                if handlers[i..].starts_with(&format!("{m}(")) {
                    methods.push(m.to_string());
                }
            }
        }
        assert!(
            !methods.is_empty(),
            "{}: no method for {path}",
            file.display()
        );
        for m in methods {
            assert_ne!(
                m,
                "any",
                "{}: {path} takes any method; the spec cannot say which",
                file.display()
            );
            out.push((m, path.to_string()));
        }
    }
    out
}

/// The text of a call's arguments up to its closing parenthesis (strings respected).
fn balanced(text: &str) -> &str {
    let mut depth = 1;
    let mut in_string = false;
    let mut escaped = false;
    for (i, c) in text.char_indices() {
        if in_string {
            match (escaped, c) {
                (true, _) => escaped = false,
                (false, '\\') => escaped = true,
                (false, '"') => in_string = false,
                _ => {}
            }
            continue;
        }
        match c {
            '"' => in_string = true,
            '(' => depth += 1,
            ')' => {
                depth -= 1;
                if depth == 0 {
                    return &text[..i];
                }
            }
            _ => {}
        }
    }
    text
}

fn operations(spec: &Value) -> BTreeSet<(String, String)> {
    let mut out = BTreeSet::new();
    for (path, item) in spec["paths"].as_object().expect("paths") {
        for method in item.as_object().expect("path item").keys() {
            if METHODS.contains(&method.as_str()) {
                out.insert((method.clone(), path.clone()));
            }
        }
    }
    out
}

/// A server on a demo fleet, an admin token, and the spec it serves.
async fn served() -> (TempDir, Server, Http, Value) {
    let dir = TempDir::new("openapi");
    let out = artifacts("openapi_contract");
    let db = dir.path().join("demo.sqlite");
    let db_arg = db.display().to_string();
    let (ok, stdout, stderr) = cli(&["seed-demo", "--db", &db_arg], None);
    assert!(ok, "seed-demo: {stdout}{stderr}");
    let token = create_token(&db, "openapi contract", "admin");
    let server = Server::start(&db, &out.join("server.log")).await;
    let http = server.http().with_bearer(&token);
    let reply = server
        .http()
        .get("/api/v1/openapi.json")
        .await
        .expect("GET spec");
    assert_eq!(reply.status, 200, "the spec is served without a login");
    assert!(
        reply
            .header("content-type")
            .is_some_and(|c| c.starts_with("application/json")),
        "{:?}",
        reply.headers
    );
    let spec = reply.json();
    // The demo has no procedure yet; one is needed for `/api/v1/procedures/{id}`.
    let procedures = http
        .get("/api/v1/procedures")
        .await
        .expect("procedures")
        .json();
    if procedures["items"]
        .as_array()
        .is_none_or(|items| items.is_empty())
    {
        let made = http
            .post_json(
                "/api/v1/procedures",
                &json!({"name": "Boom hold, 10 minutes (test data)", "machine_kind": "telehandler",
                        "duration": "10 min", "limit": {"distance": "5 mm", "per": "10 min"}}),
            )
            .await
            .expect("create procedure");
        assert_eq!(made.status, 201, "{}", made.text());
    }
    std::fs::write(out.join("openapi.json"), reply.text()).expect("keep the spec");
    (dir, server, http, spec)
}

#[tokio::test]
async fn the_spec_lists_every_json_route_of_the_router_and_nothing_else() {
    let (_dir, _server, _http, spec) = served().await;
    assert!(
        spec["openapi"]
            .as_str()
            .is_some_and(|v| v.starts_with("3.1")),
        "OpenAPI version: {}",
        spec["openapi"]
    );
    let in_source = routes_in_source();
    assert!(
        in_source.len() > 20,
        "found only {} routes in the source",
        in_source.len()
    );
    let in_spec = operations(&spec);
    let missing: Vec<_> = in_source.difference(&in_spec).collect();
    let extra: Vec<_> = in_spec.difference(&in_source).collect();
    assert!(
        missing.is_empty(),
        "routes with no operation in the spec: {missing:?}"
    );
    assert!(
        extra.is_empty(),
        "operations in the spec with no route: {extra:?}"
    );

    // Every reference points at a schema that exists.
    let text = spec.to_string();
    let schemas = spec["components"]["schemas"].as_object().expect("schemas");
    for piece in text.split("\"$ref\":\"#/components/schemas/").skip(1) {
        let name = &piece[..piece.find('"').expect("ref end")];
        assert!(schemas.contains_key(name), "dangling $ref to {name}");
    }
}

/// A concrete path for an operation: `{id}` becomes the id of a record that exists.
async fn concrete(http: &Http, path: &str) -> String {
    if !path.contains("{id}") {
        return path.to_string();
    }
    let collection = if path.starts_with("/api/v1/cylinders/") {
        "/api/v1/cylinders"
    } else if path.starts_with("/api/v1/machines/") {
        "/api/v1/machines"
    } else if path.starts_with("/api/v1/hoses/") {
        "/api/v1/hoses"
    } else if path.starts_with("/api/v1/sites/") {
        "/api/v1/sites"
    } else if path.starts_with("/api/v1/procedures/") {
        "/api/v1/procedures"
    } else if path.starts_with("/api/v1/drift-tests/") {
        "/api/v1/cylinders/1/drift-tests"
    } else if path.starts_with("/api/v1/decay-tests/") {
        "/api/v1/cylinders/1/decay-tests"
    } else if path.starts_with("/api/v1/inspections/") {
        "/api/v1/machines/1/inspections"
    } else {
        panic!("no collection known for {path}");
    };
    let list = http.get(collection).await.expect("list").json();
    let id = list["items"][0]["id"].as_i64().unwrap_or(1);
    path.replace("{id}", &id.to_string())
}

fn method(name: &str) -> Method {
    Method::from_bytes(name.to_uppercase().as_bytes()).expect("method")
}

/// The list after `prefix` in an error message: `"...: a, b, c"`.
fn named_list(message: &str, prefix: &str) -> Option<BTreeSet<String>> {
    let at = message.find(prefix)? + prefix.len();
    Some(
        message[at..]
            .split(',')
            .map(|s| s.trim().to_string())
            .filter(|s| !s.is_empty())
            .collect(),
    )
}

fn resolve<'a>(spec: &'a Value, schema: &'a Value) -> &'a Value {
    match schema["$ref"].as_str() {
        Some(r) => &spec["components"]["schemas"][r.trim_start_matches("#/components/schemas/")],
        None => schema,
    }
}

#[tokio::test]
async fn every_request_schema_names_exactly_the_fields_and_parameters_the_server_accepts() {
    let (_dir, _server, http, spec) = served().await;
    let mut problems = Vec::new();
    for (verb, path) in operations(&spec) {
        let op = &spec["paths"][&path][&verb];
        let url = concrete(&http, &path).await;
        let has_body = op["requestBody"].is_object();

        // Body fields: a stranger is refused with the list of accepted fields.
        if has_body {
            let schema = resolve(
                &spec,
                &op["requestBody"]["content"]["application/json"]["schema"],
            );
            let documented: BTreeSet<String> = schema["properties"]
                .as_object()
                .map(|p| p.keys().cloned().collect())
                .unwrap_or_default();
            let reply = http
                .send(
                    method(&verb),
                    &url,
                    Some("application/json"),
                    json!({"zz_probe": 1}).to_string().into_bytes(),
                )
                .await
                .expect("probe body");
            let body = reply.json();
            let accepted = body["error"]["message"]
                .as_str()
                .and_then(|m| named_list(m, "accepted fields are: "));
            match accepted {
                Some(accepted) if body["error"]["field"] == "zz_probe" => {
                    if accepted != documented {
                        problems.push(format!(
                            "{verb} {path}: server accepts {:?} but the spec documents {:?}",
                            accepted.difference(&documented).collect::<Vec<_>>(),
                            documented.difference(&accepted).collect::<Vec<_>>()
                        ));
                    }
                }
                _ => problems.push(format!(
                    "{verb} {path}: an unknown body field was not refused by name: {} {}",
                    reply.status,
                    reply.text()
                )),
            }
            if schema["additionalProperties"] != false {
                problems.push(format!("{verb} {path}: the request schema must be closed"));
            }
        }

        // Query parameters: a stranger is refused with the list of accepted parameters, or
        // (for a handler that reads none) the spec documents none.
        let documented: BTreeSet<String> = op["parameters"]
            .as_array()
            .map(|ps| {
                ps.iter()
                    .filter(|p| p["in"] == "query")
                    .filter_map(|p| p["name"].as_str().map(str::to_string))
                    .collect()
            })
            .unwrap_or_default();
        let probe_url = format!("{url}?zz_probe=1");
        let (content_type, probe_body) = if has_body {
            (Some("application/json"), b"{}".to_vec())
        } else {
            (None, Vec::new())
        };
        let reply = http
            .send(method(&verb), &probe_url, content_type, probe_body)
            .await
            .expect("probe query");
        let body = reply.json();
        let refused_by_name = body["error"]["field"] == "zz_probe";
        let accepted = if refused_by_name {
            body["error"]["message"]
                .as_str()
                .and_then(|m| named_list(m, "accepted: "))
                .unwrap_or_default()
        } else {
            BTreeSet::new()
        };
        if accepted != documented {
            problems.push(format!(
                "{verb} {path}: server accepts query {accepted:?}, spec documents {documented:?} ({})",
                reply.status
            ));
        }
    }
    assert!(
        problems.is_empty(),
        "spec and server disagree:\n{}",
        problems.join("\n")
    );
}
