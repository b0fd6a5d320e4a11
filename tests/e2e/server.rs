//! The real `loadhold` binary, started on 127.0.0.1 with a free port and its own SQLite file.

use crate::http::Http;
use std::net::{SocketAddr, TcpListener};
use std::path::{Path, PathBuf};
use std::process::{Child, Command, Stdio};
use std::sync::atomic::{AtomicU32, Ordering};
use std::time::{Duration, Instant};

static COUNTER: AtomicU32 = AtomicU32::new(0);

/// The path of the binary under test, built by cargo for this test run.
pub const BIN: &str = env!("CARGO_BIN_EXE_loadhold");

/// `target/` of this build (the test executable lives in `target/<profile>/deps/`).
pub fn target_dir() -> PathBuf {
    let exe = std::env::current_exe().expect("test executable path");
    exe.ancestors()
        .nth(3)
        .map(Path::to_path_buf)
        .unwrap_or_else(|| PathBuf::from("target"))
}

/// `target/e2e-artifacts/<name>/`: screenshots and server logs kept after the run.
pub fn artifacts(name: &str) -> PathBuf {
    let dir = target_dir().join("e2e-artifacts").join(name);
    let _ = std::fs::remove_dir_all(&dir);
    std::fs::create_dir_all(&dir).expect("artifact dir");
    dir
}

/// A fresh temporary folder, removed when dropped.
pub struct TempDir(pub PathBuf);

impl TempDir {
    pub fn new(tag: &str) -> TempDir {
        let n = COUNTER.fetch_add(1, Ordering::SeqCst);
        let dir =
            std::env::temp_dir().join(format!("loadhold-e2e-{tag}-{}-{n}", std::process::id()));
        let _ = std::fs::remove_dir_all(&dir);
        std::fs::create_dir_all(&dir).expect("temp dir");
        TempDir(dir)
    }

    pub fn path(&self) -> &Path {
        &self.0
    }
}

impl Drop for TempDir {
    fn drop(&mut self) {
        let _ = std::fs::remove_dir_all(&self.0);
    }
}

/// A port nobody listens on right now (the OS picks it; a clash is retried by `start`).
pub fn free_port() -> u16 {
    TcpListener::bind("127.0.0.1:0")
        .and_then(|l| l.local_addr())
        .map(|a| a.port())
        .expect("free port")
}

/// A running `loadhold serve`. Dropping it kills the process.
pub struct Server {
    child: Option<Child>,
    pub addr: SocketAddr,
    log: PathBuf,
}

impl Server {
    /// Starts `loadhold serve --db DB` on a free port and waits until `/healthz` answers 200.
    /// `log` receives the server's stdout and stderr.
    pub async fn start(db: &Path, log: &Path) -> Server {
        let mut last = String::new();
        for _attempt in 0..3 {
            let addr: SocketAddr = ([127, 0, 0, 1], free_port()).into();
            let out = std::fs::OpenOptions::new()
                .create(true)
                .append(true)
                .open(log)
                .expect("server log");
            let err = out.try_clone().expect("server log");
            let child = Command::new(BIN)
                .args(["serve", "--db"])
                .arg(db)
                .arg("--addr")
                .arg(addr.to_string())
                .env("LOADHOLD_LOG", "info,sqlx=warn")
                .stdin(Stdio::null())
                .stdout(out)
                .stderr(err)
                .spawn()
                .expect("spawn loadhold");
            let mut server = Server {
                child: Some(child),
                addr,
                log: log.to_path_buf(),
            };
            match server.wait_ready(Duration::from_secs(60)).await {
                Ok(()) => return server,
                Err(why) => last = why,
            }
        }
        panic!(
            "loadhold did not become ready: {last}\n--- server log ---\n{}",
            tail(log)
        );
    }

    async fn wait_ready(&mut self, within: Duration) -> Result<(), String> {
        let http = Http::new(&self.base());
        let deadline = Instant::now() + within;
        loop {
            if let Some(child) = self.child.as_mut()
                && let Ok(Some(status)) = child.try_wait()
            {
                self.child = None;
                return Err(format!("exited early with {status}"));
            }
            if let Ok(reply) = http.get("/healthz").await
                && reply.status == 200
            {
                return Ok(());
            }
            if Instant::now() > deadline {
                self.kill();
                return Err("no 200 from /healthz in time".into());
            }
            tokio::time::sleep(Duration::from_millis(50)).await;
        }
    }

    /// `http://127.0.0.1:PORT`
    pub fn base(&self) -> String {
        format!("http://{}", self.addr)
    }

    /// A client for this server.
    pub fn http(&self) -> Http {
        Http::new(&self.base())
    }

    /// SIGKILL: no shutdown handler runs, nothing is flushed by the server.
    pub fn kill(&mut self) {
        if let Some(mut child) = self.child.take() {
            let _ = child.kill();
            let _ = child.wait();
        }
    }

    /// The server's log so far, for failure messages.
    pub fn log_tail(&self) -> String {
        tail(&self.log)
    }
}

impl Drop for Server {
    fn drop(&mut self) {
        self.kill();
    }
}

fn tail(path: &Path) -> String {
    let text = std::fs::read_to_string(path).unwrap_or_default();
    let lines: Vec<&str> = text.lines().collect();
    lines[lines.len().saturating_sub(40)..].join("\n")
}

/// Runs the `loadhold` CLI with arguments and optional stdin; returns (success, stdout, stderr).
pub fn cli(args: &[&str], stdin: Option<&str>) -> (bool, String, String) {
    use std::io::Write;
    let mut child = Command::new(BIN)
        .args(args)
        .env("LOADHOLD_LOG", "warn")
        .stdin(Stdio::piped())
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .expect("spawn loadhold cli");
    // Standard input is closed after the text (or at once), so a reader sees its end.
    if let Some(mut pipe) = child.stdin.take()
        && let Some(text) = stdin
    {
        let _ = pipe.write_all(text.as_bytes());
    }
    let output = child.wait_with_output().expect("loadhold cli output");
    (
        output.status.success(),
        String::from_utf8_lossy(&output.stdout).into_owned(),
        String::from_utf8_lossy(&output.stderr).into_owned(),
    )
}

/// Creates an API bearer token of `role` in the database at `db` with the real CLI
/// (`loadhold token create NAME --role ROLE --db PATH`) and returns it.
pub fn create_token(db: &Path, name: &str, role: &str) -> String {
    let db_arg = db.display().to_string();
    let (ok, stdout, stderr) = cli(
        &["token", "create", name, "--role", role, "--db", &db_arg],
        None,
    );
    assert!(ok, "loadhold token create failed: {stdout}{stderr}");
    let token = stdout
        .trim()
        .lines()
        .last()
        .unwrap_or("")
        .trim()
        .to_string();
    assert!(token.len() >= 20, "no token printed: {stdout:?} {stderr:?}");
    token
}

/// Adds a user with the real CLI (`loadhold user add NAME --role ROLE --db PATH`, password on
/// standard input).
pub fn add_user(db: &Path, name: &str, role: &str, password: &str) {
    let db_arg = db.display().to_string();
    let (ok, stdout, stderr) = cli(
        &["user", "add", name, "--role", role, "--db", &db_arg],
        Some(&format!("{password}\n")),
    );
    assert!(ok, "loadhold user add failed: {stdout}{stderr}");
}

/// Applies the migrations to a fresh file with `loadhold migrate`, so the CLI can add users
/// and tokens before the server first starts.
pub fn migrate(db: &Path) {
    let db_arg = db.display().to_string();
    let (ok, stdout, stderr) = cli(&["migrate", "--db", &db_arg], None);
    assert!(ok, "loadhold migrate failed: {stdout}{stderr}");
}
