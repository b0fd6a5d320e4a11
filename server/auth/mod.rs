//! Who is acting, and who may. Handlers take an `Actor` and pass it to storage so every
//! change is recorded with its author. The middleware in `middleware` fills it in from a
//! session cookie or a bearer token and applies the access table in `rules`.
//!
//! Storage modules (`users`, `sessions`, `tokens`, `throttle`, `audit_list`) know nothing of
//! HTTP; `middleware` and `cookie` are the HTTP side; `cli` and `demo` serve the command line.

use axum::extract::FromRequestParts;
use axum::http::request::Parts;
use std::convert::Infallible;

pub mod audit_list;
pub mod cli;
pub mod clock;
pub mod cookie;
pub mod demo;
pub mod events;
pub mod login;
pub mod middleware;
pub mod password;
pub mod rules;
pub mod secret;
pub mod sessions;
pub mod throttle;
pub mod tokens;
pub mod users;

/// The content security policy of every response: no inline script, nothing from elsewhere.
pub const CONTENT_SECURITY_POLICY: &str = "default-src 'self'; script-src 'self'; \
    style-src 'self'; img-src 'self' data:; frame-ancestors 'none'; form-action 'self'; \
    base-uri 'none'";

/// The roles of the service department, from least to most trusted.
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord)]
pub enum Role {
    Technician,
    Manager,
    Admin,
}

impl Role {
    pub fn as_str(self) -> &'static str {
        match self {
            Role::Technician => "technician",
            Role::Manager => "manager",
            Role::Admin => "admin",
        }
    }

    pub fn parse(text: &str) -> Option<Role> {
        match text {
            "technician" => Some(Role::Technician),
            "manager" => Some(Role::Manager),
            "admin" => Some(Role::Admin),
            _ => None,
        }
    }
}

/// The person or integration behind a request.
#[derive(Clone, Debug)]
pub struct Actor {
    pub user_id: Option<i64>,
    /// Display name recorded in the audit log and on signed records.
    pub name: String,
    pub role: Role,
}

impl Actor {
    /// The actor for changes made by the server itself (migrations, demo loader, CLI).
    pub fn system() -> Actor {
        Actor {
            user_id: None,
            name: "system".into(),
            role: Role::Admin,
        }
    }
}

impl<S: Send + Sync> FromRequestParts<S> for Actor {
    type Rejection = Infallible;

    async fn from_request_parts(parts: &mut Parts, _state: &S) -> Result<Self, Self::Rejection> {
        Ok(parts
            .extensions
            .get::<Actor>()
            .cloned()
            .unwrap_or_else(Actor::system))
    }
}
