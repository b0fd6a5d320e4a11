//! What every page needs to know about the request: who is logged in and the form token.
//! Every page view struct has a `ctx: PageCtx` field; every POST form includes
//! `{% call m::csrf(ctx) %}{% endcall %}` from macros.html.

use crate::auth::Actor;
use axum::extract::FromRequestParts;
use axum::http::request::Parts;
use std::convert::Infallible;

/// The CSRF token of the current session, placed in request extensions by the auth layer.
#[derive(Clone, Debug, Default)]
pub struct CsrfToken(pub String);

#[derive(Clone, Debug, Default)]
pub struct PageCtx {
    /// Name of the logged-in user, if any.
    pub user: Option<String>,
    /// `technician`, `manager` or `admin`; empty when nobody is logged in.
    pub role: String,
    /// The session's anti-forgery token for POST forms.
    pub csrf: String,
}

impl PageCtx {
    /// True when the logged-in role may edit the registry.
    pub fn can_edit(&self) -> bool {
        self.role == "manager" || self.role == "admin"
    }

    pub fn is_admin(&self) -> bool {
        self.role == "admin"
    }
}

impl<S: Send + Sync> FromRequestParts<S> for PageCtx {
    type Rejection = Infallible;

    async fn from_request_parts(parts: &mut Parts, _state: &S) -> Result<Self, Self::Rejection> {
        let actor = parts.extensions.get::<Actor>();
        Ok(PageCtx {
            user: actor
                .filter(|a| a.user_id.is_some())
                .map(|a| a.name.clone()),
            role: actor
                .map(|a| a.role.as_str().to_string())
                .unwrap_or_default(),
            csrf: parts
                .extensions
                .get::<CsrfToken>()
                .map(|t| t.0.clone())
                .unwrap_or_default(),
        })
    }
}
