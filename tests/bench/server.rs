//! The real `loadhold` binary as the bench drives it: seeding a database, creating a token,
//! starting the server on a free loopback port, timing it to its first healthy `/healthz`,
//! reading its resident memory, and stopping it.

use std::io::{Read, Write};
use std::net::{SocketAddr, TcpListener, TcpStream};
use std::path::{Path, PathBuf};
use std::process::{Child, Command, Stdio};
use std::time::{Duration, Instant};

/// A running server.
pub struct Server {
    child: Child,
    pub pid: u32,
    pub addr: SocketAddr,
}

/// A port free on 127.0.0.1 right now.
fn free_port() -> Result<u16, String> {
    let listener = TcpListener::bind("127.0.0.1:0").map_err(|e| e.to_string())?;
    Ok(listener.local_addr().map_err(|e| e.to_string())?.port())
}

/// Runs `bin args...` to completion; returns its standard output, or its error output.
fn run(bin: &Path, args: &[&str]) -> Result<String, String> {
    let out = Command::new(bin)
        .args(args)
        .env("LOADHOLD_LOG", "warn")
        .stdin(Stdio::null())
        .output()
        .map_err(|e| format!("cannot run {}: {e}", bin.display()))?;
    if out.status.success() {
        Ok(String::from_utf8_lossy(&out.stdout).trim().to_string())
    } else {
        Err(format!(
            "{} {} failed: {}{}",
            bin.display(),
            args.join(" "),
            String::from_utf8_lossy(&out.stderr).trim(),
            String::from_utf8_lossy(&out.stdout).trim()
        ))
    }
}

/// Removes a database and its WAL files.
pub fn remove_database(db: &Path) {
    for suffix in ["", "-wal", "-shm"] {
        let _ = std::fs::remove_file(format!("{}{suffix}", db.display()));
    }
}

/// Bytes of the database file and its WAL.
pub fn database_bytes(db: &Path) -> u64 {
    ["", "-wal"]
        .iter()
        .filter_map(|s| std::fs::metadata(format!("{}{s}", db.display())).ok())
        .map(|m| m.len())
        .sum()
}

/// `loadhold seed-demo --db DB --scale N` on a fresh file: its wall time and summary line.
pub fn seed(bin: &Path, db: &Path, n: u32) -> Result<(f64, String), String> {
    remove_database(db);
    let started = Instant::now();
    let db_text = db.display().to_string();
    let line = run(
        bin,
        &["seed-demo", "--db", &db_text, "--scale", &n.to_string()],
    )?;
    Ok((started.elapsed().as_secs_f64(), line))
}

/// `loadhold token create NAME --role ROLE`: the token printed.
pub fn token(bin: &Path, db: &Path, name: &str, role: &str) -> Result<String, String> {
    let db_text = db.display().to_string();
    let out = run(
        bin,
        &["token", "create", name, "--db", &db_text, "--role", role],
    )?;
    out.split_whitespace()
        .last()
        .filter(|t| t.len() >= 24)
        .map(str::to_string)
        .ok_or_else(|| format!("token create printed no token: {out}"))
}

/// True when `GET /healthz` answers 200 (one short-lived connection).
fn healthy(addr: SocketAddr) -> bool {
    let Ok(mut stream) = TcpStream::connect_timeout(&addr, Duration::from_millis(200)) else {
        return false;
    };
    let _ = stream.set_read_timeout(Some(Duration::from_secs(2)));
    if stream
        .write_all(b"GET /healthz HTTP/1.1\r\nHost: 127.0.0.1\r\nConnection: close\r\n\r\n")
        .is_err()
    {
        return false;
    }
    let mut head = [0u8; 12];
    stream.read_exact(&mut head).is_ok() && head.starts_with(b"HTTP/1.1 200")
}

impl Server {
    /// Starts `bin serve` on a free port; returns it with the time from spawn to the first
    /// healthy `/healthz` (polled every millisecond, each poll a fresh connection).
    pub fn start(bin: &Path, db: &Path, log: &Path) -> Result<(Server, Duration), String> {
        let port = free_port()?;
        let addr: SocketAddr = ([127, 0, 0, 1], port).into();
        let log_file = std::fs::File::create(log).map_err(|e| e.to_string())?;
        let err_file = log_file.try_clone().map_err(|e| e.to_string())?;
        let started = Instant::now();
        let child = Command::new(bin)
            .args(["serve", "--db"])
            .arg(db)
            .args(["--addr", &addr.to_string()])
            .env("LOADHOLD_LOG", "warn")
            .stdin(Stdio::null())
            .stdout(log_file)
            .stderr(err_file)
            .spawn()
            .map_err(|e| format!("cannot start {}: {e}", bin.display()))?;
        let pid = child.id();
        let mut server = Server { child, pid, addr };
        loop {
            if healthy(addr) {
                return Ok((server, started.elapsed()));
            }
            if let Ok(Some(status)) = server.child.try_wait() {
                return Err(format!(
                    "the server exited ({status}); see {}",
                    log.display()
                ));
            }
            if started.elapsed() > Duration::from_secs(120) {
                server.stop();
                return Err("the server did not become healthy within 120 s".into());
            }
            std::thread::sleep(Duration::from_millis(1));
        }
    }

    /// Resident memory now, kB (`VmRSS` in /proc/PID/status).
    pub fn rss_kb(&self) -> Option<u64> {
        rss_kb(self.pid)
    }

    /// SIGTERM (graceful shutdown), then a hard kill after 15 s.
    pub fn stop(&mut self) {
        let _ = Command::new("kill")
            .args(["-TERM", &self.pid.to_string()])
            .status();
        let deadline = Instant::now() + Duration::from_secs(15);
        while Instant::now() < deadline {
            if let Ok(Some(_)) = self.child.try_wait() {
                return;
            }
            std::thread::sleep(Duration::from_millis(20));
        }
        let _ = self.child.kill();
        let _ = self.child.wait();
    }
}

impl Drop for Server {
    fn drop(&mut self) {
        if let Ok(None) = self.child.try_wait() {
            self.stop();
        }
    }
}

/// The 1-minute load average (`/proc/loadavg`), 0 when unreadable.
pub fn load_average() -> f64 {
    std::fs::read_to_string("/proc/loadavg")
        .ok()
        .and_then(|s| s.split_whitespace().next()?.parse().ok())
        .unwrap_or(0.0)
}

/// `VmRSS` of a process, kB.
pub fn rss_kb(pid: u32) -> Option<u64> {
    let status = std::fs::read_to_string(format!("/proc/{pid}/status")).ok()?;
    status
        .lines()
        .find(|l| l.starts_with("VmRSS:"))?
        .split_whitespace()
        .nth(1)?
        .parse()
        .ok()
}

/// The binary the bench drives: the one cargo built with this bench (release under
/// `cargo bench`, debug under `cargo test --bench`), or `--bin PATH`.
pub fn default_binary() -> PathBuf {
    PathBuf::from(env!("CARGO_BIN_EXE_loadhold"))
}
