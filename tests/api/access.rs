//! Who may do what, over the API (bearer tokens) and the pages (session cookies); CSRF on
//! session forms; security headers.

use crate::helpers::TestApp;
use axum::body::Body;
use axum::http::{Method, StatusCode, header};
use loadhold::auth::Role;
use loadhold::auth::rules::{Access, access};
use serde_json::json;

fn site(name: &str) -> serde_json::Value {
    json!({"name": name, "units": "metric"})
}

fn allowed(status: StatusCode) -> bool {
    status != StatusCode::UNAUTHORIZED && status != StatusCode::FORBIDDEN
}

#[tokio::test]
async fn without_a_login_the_api_answers_401_json_and_pages_redirect_to_login() {
    let app = TestApp::anonymous().await;
    for path in [
        "/api/v1/machines",
        "/api/v1/sites",
        "/api/v1/reports/due",
        "/api/v1/no-such",
    ] {
        let request = app
            .builder("GET", path)
            .body(Body::empty())
            .expect("request");
        let (status, headers, body) = app.send(request).await;
        assert_eq!(status, StatusCode::UNAUTHORIZED, "{path}");
        assert!(headers.get(header::WWW_AUTHENTICATE).is_some(), "{path}");
        let body: serde_json::Value = serde_json::from_slice(&body).expect("json");
        assert_eq!(body["error"]["code"], "unauthorized", "{path}");
    }
    let (status, body) = app.post_json("/api/v1/sites", &site("North Yard")).await;
    assert_eq!(status, StatusCode::UNAUTHORIZED, "{body}");
    for (path, back) in [
        ("/machines", "/login?next=/machines"),
        (
            "/machines/3?tab=hoses",
            "/login?next=/machines/3%3Ftab%3Dhoses",
        ),
        ("/admin", "/login?next=/admin"),
        ("/", "/login?next=/"),
    ] {
        let (status, headers, _) = app.get_page(path).await;
        assert_eq!(status, StatusCode::SEE_OTHER, "{path}");
        assert_eq!(headers[header::LOCATION], back, "{path}");
    }
}

#[tokio::test]
async fn the_calculator_health_assets_and_login_need_no_login() {
    let app = TestApp::anonymous().await;
    for path in [
        "/healthz",
        "/static/app.css",
        "/static/app.js",
        "/login",
        "/calc",
    ] {
        let (status, _, _) = app.get_page(path).await;
        assert_eq!(status, StatusCode::OK, "{path}");
    }
    let (status, body) = app
        .post_json(
            "/api/v1/calc/cylinder",
            &json!({"bore": "4 in", "rod": "2 in", "stroke": "20 in", "load": "10000 lbf",
                    "load_direction": "retract"}),
        )
        .await;
    assert_eq!(status, StatusCode::OK, "{body}");
}

#[tokio::test]
async fn a_technician_reads_the_registry_and_enters_shop_records_but_edits_nothing() {
    let manager = TestApp::with_role(Role::Manager).await;
    let (status, created) = manager
        .post_json("/api/v1/sites", &site("North Yard"))
        .await;
    assert_eq!(status, StatusCode::CREATED, "{created}");
    let id = created["id"].as_i64().expect("id");

    let mut tech = manager.client();
    tech.auth = vec![(
        "authorization".into(),
        format!("Bearer {}", tech.token(Role::Technician).await),
    )];
    assert_eq!(tech.get_json("/api/v1/sites").await.0, StatusCode::OK);
    assert_eq!(
        tech.get_json(&format!("/api/v1/sites/{id}")).await.0,
        StatusCode::OK
    );
    assert_eq!(tech.get_json("/api/v1/machines").await.0, StatusCode::OK);

    let (status, body) = tech.post_json("/api/v1/sites", &site("South Yard")).await;
    assert_eq!(status, StatusCode::FORBIDDEN, "{body}");
    assert_eq!(body["error"]["code"], "forbidden");
    assert!(
        body["error"]["message"]
            .as_str()
            .is_some_and(|m| m.contains("edit the registry"))
    );
    let (status, _) = tech
        .patch_json(&format!("/api/v1/sites/{id}"), &site("Renamed"))
        .await;
    assert_eq!(status, StatusCode::FORBIDDEN);
    let (status, _) = tech
        .json("DELETE", &format!("/api/v1/sites/{id}"), None)
        .await;
    assert_eq!(status, StatusCode::FORBIDDEN);
    let (status, _) = tech
        .post_json(
            "/api/v1/machines",
            &json!({"unit_number": "EX-1", "kind": "excavator"}),
        )
        .await;
    assert_eq!(status, StatusCode::FORBIDDEN);
    // The due list is the shop's work list: technicians read it; the other reports and the
    // settings stay the managers'.
    assert_eq!(tech.get_json("/api/v1/reports/due").await.0, StatusCode::OK);
    assert_eq!(
        tech.get_json("/api/v1/reports/hazards").await.0,
        StatusCode::FORBIDDEN
    );

    // Shop records are the technician's to enter: the access layer lets them through.
    for path in [
        "/api/v1/cylinders/1/drift-tests",
        "/api/v1/machines/1/inspections",
    ] {
        let (status, body) = tech.post_json(path, &json!({})).await;
        assert!(allowed(status), "{path}: {status} {body}");
    }
    let (name,): (String,) = sqlx::query_as("SELECT name FROM sites WHERE id = ?")
        .bind(id)
        .fetch_one(&manager.db)
        .await
        .expect("site");
    assert_eq!(name, "North Yard", "nothing changed");
}

#[tokio::test]
async fn a_manager_edits_the_registry_and_pulls_reports_but_cannot_administer() {
    let manager = TestApp::with_role(Role::Manager).await;
    let (status, created) = manager
        .post_json("/api/v1/sites", &site("North Yard"))
        .await;
    assert_eq!(status, StatusCode::CREATED);
    let id = created["id"].as_i64().expect("id");
    let (status, body) = manager
        .patch_json(
            &format!("/api/v1/sites/{id}"),
            &json!({"name": "North Depot"}),
        )
        .await;
    assert_eq!(status, StatusCode::OK, "{body}");
    let (status, body) = manager.get_json("/api/v1/reports/due").await;
    assert!(allowed(status), "{status} {body}");
    let (status, _, page) = manager.get_page("/admin").await;
    assert_eq!(status, StatusCode::FORBIDDEN);
    assert!(page.contains("may not manage users"), "{page}");
    assert_eq!(
        manager.get_page("/admin/audit").await.0,
        StatusCode::FORBIDDEN
    );
    let (status, _, _) = manager
        .post_form("/admin/tokens", &[("name", "x"), ("role", "admin")])
        .await;
    assert_eq!(
        status,
        StatusCode::FORBIDDEN,
        "a manager cannot mint an admin token"
    );
}

#[tokio::test]
async fn pages_follow_the_same_roles_for_a_technician_session() {
    let tech = TestApp::session(Role::Technician).await;
    assert_eq!(tech.get_page("/machines").await.0, StatusCode::OK);
    let (status, _, page) = tech.get_page("/machines/new").await;
    assert_eq!(status, StatusCode::FORBIDDEN);
    assert!(
        page.contains("Your role (technician) may not edit the registry"),
        "{page}"
    );
    assert!(
        page.contains("technician · technician"),
        "the refusal page still shows who is logged in"
    );
    let (status, _, _) = tech
        .post_form(
            "/machines",
            &[("unit_number", "EX-9"), ("kind", "excavator")],
        )
        .await;
    assert_eq!(status, StatusCode::FORBIDDEN);
    assert_eq!(tech.get_page("/reports/due").await.0, StatusCode::FORBIDDEN);
    assert_eq!(tech.get_page("/admin").await.0, StatusCode::FORBIDDEN);
    let count: i64 = sqlx::query_scalar("SELECT COUNT(*) FROM machines")
        .fetch_one(&tech.db)
        .await
        .expect("count");
    assert_eq!(count, 0);
}

#[tokio::test]
async fn a_manager_session_reaches_the_registry_forms() {
    let manager = TestApp::session(Role::Manager).await;
    let (status, _, page) = manager.get_page("/machines/new").await;
    assert_eq!(status, StatusCode::OK, "{page}");
    let (status, _, page) = manager
        .post_form(
            "/machines",
            &[("unit_number", "EX-9"), ("kind", "excavator")],
        )
        .await;
    assert!(allowed(status), "{status}: {page}");
    let (status, _, _) = manager.get_page("/admin").await;
    assert_eq!(status, StatusCode::FORBIDDEN);
}

#[tokio::test]
async fn an_admin_session_reaches_the_admin_pages() {
    let admin = TestApp::session(Role::Admin).await;
    let (status, _, page) = admin.get_page("/admin").await;
    assert_eq!(status, StatusCode::OK);
    assert!(
        page.contains("admin (you)") || page.contains("(you)"),
        "{page}"
    );
    assert_eq!(admin.get_page("/admin/audit").await.0, StatusCode::OK);
}

#[tokio::test]
async fn a_session_form_without_its_csrf_token_is_refused() {
    let admin = TestApp::session(Role::Admin).await;
    let fields = [("name", "forged"), ("role", "admin")];
    let (status, _, page) = admin.post_form_as_is("/admin/tokens", &fields).await;
    assert_eq!(status, StatusCode::FORBIDDEN);
    assert!(page.contains("anti-forgery token"), "{page}");
    let wrong = [("name", "forged"), ("role", "admin"), ("csrf", "0123abcd")];
    assert_eq!(
        admin.post_form_as_is("/admin/tokens", &wrong).await.0,
        StatusCode::FORBIDDEN
    );
    let tokens: i64 = sqlx::query_scalar("SELECT COUNT(*) FROM api_tokens")
        .fetch_one(&admin.db)
        .await
        .expect("count");
    assert_eq!(tokens, 0, "nothing made by a forged form");
    // Logout is a form too.
    assert_eq!(
        admin.post_form_as_is("/logout", &[]).await.0,
        StatusCode::FORBIDDEN
    );
    // With the token the same form goes through.
    assert_eq!(
        admin.post_form("/admin/tokens", &fields).await.0,
        StatusCode::OK
    );
}

#[tokio::test]
async fn a_session_json_write_needs_the_csrf_header() {
    let manager = TestApp::session(Role::Manager).await;
    let request = manager
        .builder("POST", "/api/v1/sites")
        .header(header::CONTENT_TYPE, "application/json")
        .body(Body::from(site("North Yard").to_string()))
        .expect("request");
    let (status, _, body) = manager.send(request).await;
    assert_eq!(status, StatusCode::FORBIDDEN);
    let body: serde_json::Value = serde_json::from_slice(&body).expect("json");
    assert_eq!(body["error"]["field"], "csrf");
    // The helper sends X-CSRF-Token for a session: accepted.
    assert_eq!(
        manager
            .post_json("/api/v1/sites", &site("North Yard"))
            .await
            .0,
        StatusCode::CREATED
    );
}

#[tokio::test]
async fn bearer_token_requests_need_no_csrf_token() {
    let admin = TestApp::new().await;
    let (status, _, page) = admin
        .post_form_as_is("/admin/tokens", &[("name", "ci"), ("role", "technician")])
        .await;
    assert_eq!(status, StatusCode::OK, "{page}");
}

#[tokio::test]
async fn every_response_carries_the_security_headers() {
    let app = TestApp::anonymous().await;
    let csp = "default-src 'self'; script-src 'self'; style-src 'self'; img-src 'self' data:; \
               frame-ancestors 'none'; form-action 'self'; base-uri 'none'";
    for path in [
        "/login",
        "/healthz",
        "/static/app.css",
        "/api/v1/machines",
        "/machines",
    ] {
        let (_, headers, _) = app.get_page(path).await;
        assert_eq!(headers[header::CONTENT_SECURITY_POLICY], csp, "{path}");
        assert_eq!(headers[header::X_CONTENT_TYPE_OPTIONS], "nosniff", "{path}");
        assert_eq!(headers[header::X_FRAME_OPTIONS], "DENY", "{path}");
        assert_eq!(headers[header::REFERRER_POLICY], "same-origin", "{path}");
    }
    let tech = TestApp::session(Role::Technician).await;
    let (_, headers, _) = tech.get_page("/machines").await;
    assert_eq!(
        headers[header::CACHE_CONTROL],
        "no-store",
        "pages behind a login are not cached"
    );
}

#[test]
fn the_access_table_reads_as_the_roles_are_described() {
    let tech = |what| Access::AtLeast(Role::Technician, what);
    let get = Method::GET;
    let post = Method::POST;
    assert_eq!(access(&get, "/calc"), Access::Public);
    assert_eq!(access(&post, "/api/v1/calc/drift-test"), Access::Public);
    assert_eq!(access(&get, "/api/v1/openapi.json"), Access::Public);
    assert_ne!(access(&post, "/api/v1/openapi.json"), Access::Public);
    assert_ne!(
        access(&get, "/calculator"),
        Access::Public,
        "segments, not string prefixes"
    );
    assert_ne!(
        access(&get, "/static/../admin"),
        Access::Public,
        "dot segments are never public"
    );
    assert_eq!(access(&get, "/machines/4"), tech("read the registry"));
    assert_eq!(
        access(&post, "/api/v1/cylinders/12/drift-tests"),
        tech("enter shop records")
    );
    assert_eq!(
        access(&post, "/machines/4/inspections/new"),
        tech("enter shop records")
    );
    for (method, path, role) in [
        (&post, "/api/v1/machines", Role::Manager),
        (&Method::PATCH, "/api/v1/cylinders/3", Role::Manager),
        (&Method::DELETE, "/api/v1/hoses/3", Role::Manager),
        (&post, "/api/v1/procedures", Role::Manager),
        (&get, "/machines/4/edit", Role::Manager),
        (&get, "/machines/4/cylinders/new", Role::Manager),
        (&get, "/reports/due", Role::Manager),
        (&get, "/api/v1/reports/due", Role::Technician),
        (&get, "/api/v1/reports/hazards", Role::Manager),
        (&Method::PUT, "/api/v1/reports/settings", Role::Manager),
        (&post, "/api/v1/machines/4/return-to-service", Role::Manager),
        (&post, "/machines/4/return-to-service", Role::Manager),
        (&get, "/admin/audit", Role::Admin),
        (&post, "/admin/users", Role::Admin),
    ] {
        match access(method, path) {
            Access::AtLeast(needed, _) => assert_eq!(needed, role, "{method} {path}"),
            Access::Public => panic!("{method} {path} must not be public"),
        }
    }
}
