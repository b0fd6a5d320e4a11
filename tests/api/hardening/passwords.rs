//! Passwords: at least 12 characters, not among the 10,000 most common (the list the zxcvbn
//! crate ships), no control characters; people change their own on `/account`, giving the old.

use crate::helpers::{TEST_PASSWORD, TestApp};
use axum::http::StatusCode;
use loadhold::auth::Role;

#[tokio::test]
async fn short_common_and_control_character_passwords_are_refused_naming_the_field() {
    let admin = TestApp::session(Role::Admin).await;
    let refused = [
        ("password12", "at least 12"),
        ("1234567890", "at least 12"),
        ("          ", "at least 12"),
        // ranks within the first 10,000 of the list zxcvbn ships (checked in its source)
        ("qwerty123456", "most common"),
        ("LeaveMeAlone", "most common"),
        ("123qweasdzxc", "most common"),
        ("valve-\u{0}-bleed-screw", "control characters"),
        ("valve\tbleed-screw", "control characters"),
        ("            ", "more than one distinct"),
    ];
    for (n, (password, why)) in refused.iter().enumerate() {
        let name = format!("fitter{n}");
        let (status, _, page) = admin
            .post_form(
                "/admin/users",
                &[
                    ("username", &name),
                    ("role", "technician"),
                    ("password", password),
                ],
            )
            .await;
        assert_eq!(status, StatusCode::UNPROCESSABLE_ENTITY, "{password:?}");
        assert!(page.contains(why), "{password:?} refused because {why}");
    }
    let (status, _, _) = admin
        .post_form(
            "/admin/users",
            &[
                ("username", "fitter"),
                ("role", "technician"),
                ("password", "valve-bleed-screw-9"),
            ],
        )
        .await;
    assert_eq!(
        status,
        StatusCode::SEE_OTHER,
        "a long uncommon password is taken"
    );
}

#[tokio::test]
async fn a_user_changes_their_own_password_on_the_account_page_with_the_old_one() {
    let mut tech = TestApp::session(Role::Technician).await;
    let mut other_browser = tech.client();
    assert_eq!(
        other_browser.login("technician", TEST_PASSWORD).await,
        StatusCode::SEE_OTHER
    );
    let (status, _, page) = tech.get_page("/account").await;
    assert_eq!(status, StatusCode::OK);
    assert!(page.contains("name=\"old_password\""), "{page}");

    let change = |old: &'static str, new: &'static str| {
        [
            ("old_password", old),
            ("new_password", new),
            ("repeat_password", new),
        ]
    };
    let (status, _, page) = tech
        .post_form(
            "/account/password",
            &change("not-my-password-1", "rod-seal-wiper-77"),
        )
        .await;
    assert_eq!(status, StatusCode::UNPROCESSABLE_ENTITY, "{page}");
    assert!(page.contains("not your current password"), "{page}");
    let (status, _, page) = tech
        .post_form("/account/password", &change(TEST_PASSWORD, "qwerty123456"))
        .await;
    assert_eq!(status, StatusCode::UNPROCESSABLE_ENTITY);
    assert!(page.contains("most common"), "{page}");

    let (status, headers, page) = tech
        .post_form(
            "/account/password",
            &change(TEST_PASSWORD, "rod-seal-wiper-77"),
        )
        .await;
    assert_eq!(status, StatusCode::OK, "{page}");
    assert!(page.contains("Password changed"), "{page}");
    let cookie = headers["set-cookie"].to_str().unwrap_or("").to_string();
    assert!(
        cookie.starts_with("loadhold_session="),
        "this browser stays logged in"
    );
    let (status, _, _) = other_browser.get_page("/account").await;
    assert_eq!(status, StatusCode::SEE_OTHER, "the other session has ended");

    let mut again = tech.client();
    assert_eq!(
        again.login("technician", TEST_PASSWORD).await,
        StatusCode::UNAUTHORIZED
    );
    assert_eq!(
        again.login("technician", "rod-seal-wiper-77").await,
        StatusCode::SEE_OTHER
    );
    let changes: i64 = sqlx::query_scalar(
        "SELECT COUNT(*) FROM audit_log WHERE action = 'set_password' AND actor = 'technician'",
    )
    .fetch_one(&tech.db)
    .await
    .expect("audit");
    assert_eq!(changes, 1, "the change is audited");
    tech.csrf = None;
}
