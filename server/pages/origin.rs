//! Is a form sent from this site? The login form has no session yet, so no anti-forgery token
//! of its own: it checks where the browser says the request comes from instead. Browsers send
//! `Sec-Fetch-Site` and `Origin` with every cross-site POST; a request without either is not
//! a browser's cross-site form (a script or a test client) and is let through.

use axum::http::HeaderMap;
use axum::http::header::{HOST, ORIGIN, REFERER};

/// True unless the request's `Sec-Fetch-Site`, `Origin` or `Referer` names another site than
/// the `Host` it was sent to.
pub fn same_origin(headers: &HeaderMap) -> bool {
    let text = |name| headers.get(name).and_then(|v| v.to_str().ok());
    if let Some(site) = text("sec-fetch-site")
        && !matches!(site, "same-origin" | "none")
    {
        return false;
    }
    let Some(host) = text(HOST.as_str()) else {
        return text(ORIGIN.as_str()).is_none();
    };
    let from = text(ORIGIN.as_str()).or(text(REFERER.as_str()));
    match from {
        None => true,
        Some(url) => authority(url).is_some_and(|a| a.eq_ignore_ascii_case(host)),
    }
}

/// The `host[:port]` of an absolute `http` or `https` URL; `None` for `null` and the rest.
fn authority(url: &str) -> Option<&str> {
    let rest = url
        .strip_prefix("http://")
        .or_else(|| url.strip_prefix("https://"))?;
    let end = rest.find(['/', '?', '#']).unwrap_or(rest.len());
    Some(&rest[..end]).filter(|a| !a.is_empty())
}
