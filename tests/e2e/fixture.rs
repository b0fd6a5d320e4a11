//! A server on the invented demo fleet ("Harrow Vale Plant Hire"), with people made through the
//! real CLI: a technician, a manager, and an admin token for checking what the pages stored.

use crate::browser::Browser;
use crate::http::Http;
use crate::server::{Server, TempDir, add_user, artifacts, cli, create_token};
use std::path::PathBuf;

/// The password every person made here gets (test data).
pub const PASSWORD: &str = "bleed-the-cap-end-27";

pub struct Demo {
    pub server: Server,
    /// Admin bearer token: reads what the pages stored.
    pub admin: Http,
    pub out: PathBuf,
    _dir: TempDir,
}

impl Demo {
    pub async fn start(name: &str) -> Demo {
        let dir = TempDir::new(name);
        let out = artifacts(name);
        let db = dir.path().join("demo.sqlite");
        let db_arg = db.display().to_string();
        let (ok, stdout, stderr) = cli(&["seed-demo", "--db", &db_arg], None);
        assert!(ok, "seed-demo failed: {stdout}{stderr}");
        add_user(&db, "tech.rowan", "technician", PASSWORD);
        add_user(&db, "mgr.isla", "manager", PASSWORD);
        let token = create_token(&db, "e2e checks", "admin");
        let server = Server::start(&db, &out.join("server.log")).await;
        let admin = server.http().with_bearer(&token);
        Demo {
            server,
            admin,
            out,
            _dir: dir,
        }
    }

    pub fn url(&self, path: &str) -> String {
        format!("{}{path}", self.server.base())
    }

    /// Logs in through the login form, as a person would.
    pub async fn login(&self, browser: &mut Browser, username: &str) {
        browser.goto(&self.url("/login")).await;
        browser.fill("#username", username).await;
        browser.fill("#password", PASSWORD).await;
        browser.shot("login-form").await;
        browser
            .click("form[action='/login'] button[type='submit']")
            .await;
        let text = browser.page_text().await;
        assert!(
            browser.path().await != "/login",
            "still on the login page after logging in as {username}: {text}"
        );
    }
}
