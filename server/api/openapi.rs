//! `GET /api/v1/openapi.json`: the OpenAPI 3.1 document of every JSON route, built with
//! utoipa's types. The handlers read their bodies field by field (`api::input`), so the
//! schemas are written here, one module per area; the e2e suite keeps them honest: every
//! route in the router source must be here and nothing else, every request schema's fields
//! must be exactly those the server accepts, and schemathesis checks the answers against it.

use crate::app::AppState;
use axum::Router;
use axum::http::header;
use axum::response::IntoResponse;
use axum::routing::get;
use dsl::S;
use std::sync::OnceLock;
use utoipa::openapi::path::{
    HttpMethod, Operation, OperationBuilder, ParameterBuilder, ParameterIn,
};
use utoipa::openapi::request_body::RequestBodyBuilder;
use utoipa::openapi::security::{HttpAuthScheme, HttpBuilder, SecurityRequirement, SecurityScheme};
use utoipa::openapi::{
    ComponentsBuilder, ContentBuilder, InfoBuilder, OpenApi, OpenApiBuilder, PathItem, Paths,
    Required, ResponseBuilder, ResponsesBuilder,
};

mod calc;
mod calc_schemas;
pub mod dsl;
mod onboarding;
mod registry;
mod registry_schemas;
mod reports;
mod service;
mod shop;
mod shop_schemas;

pub fn router() -> Router<AppState> {
    Router::new().route("/api/v1/openapi.json", get(serve))
}

async fn serve() -> impl IntoResponse {
    static JSON: OnceLock<String> = OnceLock::new();
    let body = JSON.get_or_init(|| document().to_json().unwrap_or_else(|_| "{}".into()));
    ([(header::CONTENT_TYPE, "application/json")], body.clone())
}

/// One operation of the API, described as a table: method, path, inputs, answers.
pub struct Op {
    pub method: HttpMethod,
    pub path: &'static str,
    tag: &'static str,
    summary: &'static str,
    public: bool,
    query: Vec<(&'static str, S, &'static str)>,
    body: Option<S>,
    ok: Vec<(u16, &'static str, S)>,
    errors: Vec<u16>,
    csv: bool,
}

impl Op {
    fn new(method: HttpMethod, path: &'static str, tag: &'static str, summary: &'static str) -> Op {
        Op {
            method,
            path,
            tag,
            summary,
            public: false,
            query: Vec::new(),
            body: None,
            ok: Vec::new(),
            errors: Vec::new(),
            csv: false,
        }
    }
    pub fn get(path: &'static str, tag: &'static str, summary: &'static str) -> Op {
        Op::new(HttpMethod::Get, path, tag, summary)
    }
    pub fn post(path: &'static str, tag: &'static str, summary: &'static str) -> Op {
        Op::new(HttpMethod::Post, path, tag, summary)
    }
    pub fn patch(path: &'static str, tag: &'static str, summary: &'static str) -> Op {
        Op::new(HttpMethod::Patch, path, tag, summary)
    }
    pub fn put(path: &'static str, tag: &'static str, summary: &'static str) -> Op {
        Op::new(HttpMethod::Put, path, tag, summary)
    }
    pub fn delete(path: &'static str, tag: &'static str, summary: &'static str) -> Op {
        Op::new(HttpMethod::Delete, path, tag, summary)
    }
    /// No login needed.
    pub fn public(mut self) -> Op {
        self.public = true;
        self
    }
    pub fn query(mut self, name: &'static str, schema: S, about: &'static str) -> Op {
        self.query.push((name, schema, about));
        self
    }
    /// The JSON body; the server refuses a missing or wrong content type (415).
    pub fn body(mut self, schema: S) -> Op {
        self.body = Some(schema);
        self.errors.extend([400, 413, 415]);
        self
    }
    pub fn ok(mut self, status: u16, about: &'static str, schema: S) -> Op {
        self.ok.push((status, about, schema));
        self
    }
    /// Error answers this operation can give besides the usual ones.
    pub fn errors(mut self, statuses: &[u16]) -> Op {
        self.errors.extend(statuses);
        self
    }
    /// `format=csv` gives the same list as `text/csv`.
    pub fn csv(mut self) -> Op {
        self.csv = true;
        self
    }

    fn build(self) -> Operation {
        let mut errors = self.errors.clone();
        errors.push(422);
        if self.path.contains('{') {
            errors.push(404);
        }
        if !self.public {
            errors.extend([401, 403]);
        }
        errors.sort_unstable();
        errors.dedup();
        let mut op = OperationBuilder::new()
            .tag(self.tag)
            .summary(Some(self.summary))
            .operation_id(Some(operation_id(&self.method, self.path)));
        for name in path_params(self.path) {
            op = op.parameter(
                ParameterBuilder::new()
                    .name(name)
                    .parameter_in(ParameterIn::Path)
                    .required(Required::True)
                    .schema(Some(dsl::id())),
            );
        }
        for (name, schema, about) in self.query {
            op = op.parameter(
                ParameterBuilder::new()
                    .name(name)
                    .parameter_in(ParameterIn::Query)
                    .required(Required::False)
                    .description(Some(about))
                    .schema(Some(dsl::or_blank(schema))),
            );
        }
        if let Some(body) = self.body {
            op = op.request_body(Some(
                RequestBodyBuilder::new()
                    .required(Some(Required::True))
                    .content(
                        "application/json",
                        ContentBuilder::new().schema(Some(body)).build(),
                    )
                    .build(),
            ));
        }
        let mut responses = ResponsesBuilder::new();
        for (status, about, schema) in self.ok {
            let mut response = ResponseBuilder::new().description(about).content(
                "application/json",
                ContentBuilder::new().schema(Some(schema)).build(),
            );
            if self.csv {
                response = response.content(
                    "text/csv",
                    ContentBuilder::new().schema(Some(dsl::string())).build(),
                );
            }
            responses = responses.response(status.to_string(), response.build());
        }
        for status in errors {
            responses = responses.response(
                status.to_string(),
                ResponseBuilder::new()
                    .description(error_words(status))
                    .content(
                        "application/json",
                        ContentBuilder::new()
                            .schema(Some(dsl::reference("Error")))
                            .build(),
                    )
                    .build(),
            );
        }
        op = op.responses(responses.build());
        if !self.public {
            op = op.security(SecurityRequirement::new("bearer", Vec::<String>::new()));
        }
        op.build()
    }
}

fn path_params(path: &str) -> Vec<&str> {
    path.split('/')
        .filter_map(|s| s.strip_prefix('{').and_then(|s| s.strip_suffix('}')))
        .collect()
}

fn operation_id(method: &HttpMethod, path: &str) -> String {
    let verb = method_name(method);
    let rest: Vec<String> = path
        .trim_start_matches("/api/v1/")
        .split('/')
        .map(|s| s.trim_matches(|c| c == '{' || c == '}').replace('-', "_"))
        .collect();
    format!("{verb}_{}", rest.join("_"))
}

/// The method in lower case, as OpenAPI writes it.
pub fn method_name(method: &HttpMethod) -> &'static str {
    match method {
        HttpMethod::Get => "get",
        HttpMethod::Post => "post",
        HttpMethod::Put => "put",
        HttpMethod::Patch => "patch",
        HttpMethod::Delete => "delete",
        HttpMethod::Head => "head",
        HttpMethod::Options => "options",
        HttpMethod::Trace => "trace",
    }
}

fn error_words(status: u16) -> &'static str {
    match status {
        400 => "The body or query string is not readable (invalid JSON, not an object).",
        401 => "No login: send a bearer token (or a session cookie).",
        403 => "The caller's role may not do this.",
        404 => "No such record.",
        409 => "The request clashes with stored data (a duplicate, an archived record).",
        413 => "The body is larger than the server accepts.",
        415 => "The body is not sent as application/json.",
        422 => "A field or parameter was refused; `error.field` names it.",
        _ => "Error.",
    }
}

/// Every operation of the JSON API.
pub fn operations() -> Vec<Op> {
    let mut ops = vec![
        Op::get("/api/v1/openapi.json", "meta", "This document.")
            .public()
            .ok(
                200,
                "The OpenAPI 3.1 document.",
                dsl::object(vec![], &["openapi", "paths"]),
            ),
    ];
    ops.extend(calc::operations());
    ops.extend(registry::operations());
    ops.extend(shop::operations());
    ops.extend(reports::operations());
    ops.extend(service::operations());
    ops.extend(onboarding::operations());
    ops
}

/// The whole document.
pub fn document() -> OpenApi {
    let mut paths = Paths::new();
    for op in operations() {
        let (method, path) = (op.method.clone(), op.path);
        let item = PathItem::new(method, op.build());
        match paths.paths.get_mut(path) {
            Some(existing) => existing.merge_operations(item),
            None => {
                paths.paths.insert(path.to_string(), item);
            }
        }
    }
    let mut components = ComponentsBuilder::new().security_scheme(
        "bearer",
        SecurityScheme::Http(HttpBuilder::new().scheme(HttpAuthScheme::Bearer).build()),
    );
    for (name, schema) in schemas() {
        components = components.schema(name, schema);
    }
    OpenApiBuilder::new()
        .info(
            InfoBuilder::new()
                .title("Loadhold API")
                .version(env!("CARGO_PKG_VERSION"))
                .description(Some(
                    "Registry and engineering core for a fleet's hydraulic cylinders and hoses. \
                     Every quantity in a request carries its unit; every quantity in an answer is \
                     {si, value, unit}. Results are engineering estimates: support or lower the \
                     load before opening any port, relieve trapped pressure, never feel for leaks \
                     by hand, follow lockout practice, and defer to the manufacturer, local codes \
                     and qualified persons.",
                ))
                .build(),
        )
        .paths(paths)
        .components(Some(components.build()))
        .build()
}

/// One problem: `{code, message, field}`.
fn problem() -> S {
    use dsl::*;
    object(
        vec![
            ("code", required_text(80)),
            ("message", required_text(4000)),
            ("field", nullable(string())),
        ],
        &["code", "message", "field"],
    )
}

/// Named schemas shared by several operations.
fn schemas() -> Vec<(&'static str, S)> {
    use dsl::*;
    vec![
        (
            "Error",
            object(
                vec![
                    ("error", problem()),
                    // Every problem found (the first is `error`), so a form can mark each field.
                    ("errors", array(problem())),
                ],
                &["error", "errors"],
            ),
        ),
        (
            "Quantity",
            object(
                vec![("si", number()), ("value", number()), ("unit", string())],
                &["si", "value", "unit"],
            ),
        ),
    ]
    .into_iter()
    .chain(calc_schemas::schemas())
    .chain(registry_schemas::schemas())
    .chain(shop_schemas::schemas())
    .chain(reports::schemas())
    .collect()
}
