//! Real headless Chromium (Debian's `chromium` + `chromium-driver`) driven over WebDriver.
//! One browser at a time: two cores do not run two Chromiums and a server well.

use crate::server::{TempDir, free_port};
use fantoccini::{Client, ClientBuilder, Locator};
use hyper_util::client::legacy::connect::HttpConnector;
use serde_json::json;
use std::path::PathBuf;
use std::process::{Child, Command, Stdio};
use std::time::{Duration, Instant};
use tokio::sync::{Mutex, MutexGuard};

static ONE_BROWSER: Mutex<()> = Mutex::const_new(());

/// Finds a program on PATH, as `which` does.
pub fn which(program: &str) -> Option<PathBuf> {
    std::env::var_os("PATH").and_then(|paths| {
        std::env::split_paths(&paths)
            .map(|dir| dir.join(program))
            .find(|candidate| candidate.is_file())
    })
}

/// A chromedriver process and one browser session, with a screenshot folder.
pub struct Browser {
    pub client: Client,
    driver: Child,
    _profile: TempDir,
    shots: PathBuf,
    /// Where Chromium saves downloads.
    pub downloads: PathBuf,
    step: u32,
    _turn: MutexGuard<'static, ()>,
}

impl Browser {
    /// Starts chromedriver on a free port and opens a session whose viewport is
    /// `width` x `height` CSS pixels. Screenshots go to `shots`.
    pub async fn open(shots: PathBuf, width: u32, height: u32) -> Browser {
        let turn = ONE_BROWSER.lock().await;
        let chromium = which("chromium")
            .expect("Debian's chromium is not installed (tests/run-all.sh installs it)");
        let chromedriver = which("chromedriver")
            .expect("Debian's chromium-driver is not installed (tests/run-all.sh installs it)");
        let profile = TempDir::new("chromium-profile");
        let port = free_port();
        let log = shots.join("chromedriver.log");
        let driver = Command::new(chromedriver)
            .arg(format!("--port={port}"))
            .arg(format!("--log-path={}", log.display()))
            .stdin(Stdio::null())
            .stdout(Stdio::null())
            .stderr(Stdio::null())
            .spawn()
            .expect("spawn chromedriver");
        let downloads = shots.join("downloads");
        std::fs::create_dir_all(&downloads).expect("download dir");
        let capabilities = json!({
            "browserName": "chrome",
            "goog:chromeOptions": {
                "binary": chromium,
                "prefs": {
                    "download.default_directory": downloads,
                    "download.prompt_for_download": false,
                },
                "args": [
                    "--headless", "--no-sandbox", "--disable-gpu", "--disable-quic",
                    "--no-first-run", "--disable-background-networking",
                    "--disable-component-update", "--disable-sync",
                    "--hide-scrollbars", "--force-device-scale-factor=1",
                    format!("--window-size={width},{height}"),
                    format!("--user-data-dir={}", profile.path().display()),
                ]
            }
        });
        let serde_json::Value::Object(capabilities) = capabilities else {
            unreachable!("a JSON object literal")
        };
        let url = format!("http://127.0.0.1:{port}");
        let deadline = Instant::now() + Duration::from_secs(30);
        let client = loop {
            match ClientBuilder::new(HttpConnector::new())
                .capabilities(capabilities.clone())
                .connect(&url)
                .await
            {
                Ok(client) => break client,
                Err(error) if Instant::now() < deadline => {
                    let _ = error;
                    tokio::time::sleep(Duration::from_millis(200)).await;
                }
                Err(error) => panic!("cannot open a Chromium session via chromedriver: {error}"),
            }
        };
        let mut browser = Browser {
            client,
            driver,
            _profile: profile,
            downloads,
            shots,
            step: 0,
            _turn: turn,
        };
        browser.fit_viewport(width, height).await;
        browser
    }

    /// Resizes the window until the page's viewport (innerWidth x innerHeight) is exact.
    async fn fit_viewport(&mut self, width: u32, height: u32) {
        let (mut w, mut h) = (width, height);
        for _ in 0..3 {
            self.client
                .set_window_size(w, h)
                .await
                .expect("set window size");
            let inner = self
                .client
                .execute("return [window.innerWidth, window.innerHeight];", vec![])
                .await
                .expect("read viewport");
            let iw = inner[0].as_u64().unwrap_or(0) as i64;
            let ih = inner[1].as_u64().unwrap_or(0) as i64;
            if iw == width as i64 && ih == height as i64 {
                return;
            }
            w = (w as i64 + width as i64 - iw).max(100) as u32;
            h = (h as i64 + height as i64 - ih).max(100) as u32;
        }
        let inner = self
            .client
            .execute("return [window.innerWidth, window.innerHeight];", vec![])
            .await
            .expect("read viewport");
        panic!("viewport is {inner}, wanted [{width},{height}]");
    }

    pub async fn goto(&self, url: &str) {
        self.client
            .goto(url)
            .await
            .unwrap_or_else(|e| panic!("open {url}: {e}"));
    }

    /// Saves a PNG of what the user sees now as `NN-name.png`.
    pub async fn shot(&mut self, name: &str) {
        self.step += 1;
        let png = self.client.screenshot().await.expect("screenshot");
        assert!(png.starts_with(b"\x89PNG"), "screenshot is not a PNG");
        let path = self.shots.join(format!("{:02}-{name}.png", self.step));
        std::fs::write(&path, png).expect("write screenshot");
    }

    /// The first element matching a CSS selector, waiting up to 10 s for it to appear.
    pub async fn find(&self, css: &str) -> fantoccini::elements::Element {
        self.client
            .wait()
            .at_most(Duration::from_secs(10))
            .for_element(Locator::Css(css))
            .await
            .unwrap_or_else(|e| panic!("no element {css}: {e}"))
    }

    /// Every element matching a CSS selector, now.
    pub async fn find_all(&self, css: &str) -> Vec<fantoccini::elements::Element> {
        self.client
            .find_all(Locator::Css(css))
            .await
            .unwrap_or_default()
    }

    /// Clears a field and types into it, as a person would.
    pub async fn fill(&self, css: &str, text: &str) {
        let field = self.find(css).await;
        field
            .clear()
            .await
            .unwrap_or_else(|e| panic!("clear {css}: {e}"));
        field
            .send_keys(text)
            .await
            .unwrap_or_else(|e| panic!("type into {css}: {e}"));
    }

    pub async fn click(&self, css: &str) {
        self.find(css)
            .await
            .click()
            .await
            .unwrap_or_else(|e| panic!("click {css}: {e}"));
    }

    /// Picks an option of a `<select>` by its value.
    pub async fn select(&self, css: &str, value: &str) {
        self.find(css)
            .await
            .select_by_value(value)
            .await
            .unwrap_or_else(|e| panic!("select {value} in {css}: {e}"));
    }

    /// The visible text of the whole page.
    pub async fn page_text(&self) -> String {
        self.find("body").await.text().await.unwrap_or_default()
    }

    pub async fn path(&self) -> String {
        self.client
            .current_url()
            .await
            .map(|u| u.path().to_string())
            .unwrap_or_default()
    }

    /// Waits up to 10 s for the address to reach a path starting with `prefix`.
    pub async fn wait_for_path(&self, prefix: &str) -> String {
        let deadline = Instant::now() + Duration::from_secs(10);
        loop {
            let path = self.path().await;
            if path.starts_with(prefix) {
                return path;
            }
            assert!(
                Instant::now() < deadline,
                "still at {path}, expected {prefix}..."
            );
            tokio::time::sleep(Duration::from_millis(50)).await;
        }
    }

    /// True when the page fits the viewport's width (no sideways scrolling).
    pub async fn fits_width(&self) -> (bool, String) {
        let sizes = self
            .client
            .execute(
                "return [document.documentElement.scrollWidth, window.innerWidth];",
                vec![],
            )
            .await
            .expect("page width");
        let fits = sizes[0].as_u64() <= sizes[1].as_u64();
        (fits, sizes.to_string())
    }

    /// Types into a quantity input and picks its unit (`{name}_unit` beside it).
    pub async fn quantity(&self, name: &str, number: &str, unit: &str) {
        self.fill(&format!("#f-{name}"), number).await;
        self.select(&format!("select[name='{name}_unit']"), unit)
            .await;
    }

    /// Ends the session and chromedriver.
    pub async fn close(mut self) {
        let _ = self.client.clone().close().await;
        let _ = self.driver.kill();
        let _ = self.driver.wait();
    }
}

impl Drop for Browser {
    fn drop(&mut self) {
        let _ = self.driver.kill();
        let _ = self.driver.wait();
    }
}
