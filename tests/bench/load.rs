//! The in-bench load generator: N keep-alive HTTP/1.1 connections over loopback, one tokio
//! task each, sending requests back to back until the phase's time (or request budget) is
//! spent. Latency is from just before the request is written to the last byte of the body.

use http_body_util::{BodyExt, Full};
use hyper::body::Bytes;
use hyper::client::conn::http1::{self, SendRequest};
use hyper::header::{AUTHORIZATION, CONTENT_TYPE, HOST};
use hyper::{Method, Request};
use hyper_util::rt::TokioIo;
use serde::{Deserialize, Serialize};
use std::collections::BTreeMap;
use std::net::SocketAddr;
use std::sync::Arc;
use std::sync::atomic::{AtomicU64, Ordering};
use std::time::{Duration, Instant};
use tokio::net::TcpStream;

/// One request to send.
#[derive(Clone, Debug)]
pub struct Req {
    pub method: Method,
    pub path: String,
    pub body: Option<Bytes>,
    pub bearer: Option<Arc<str>>,
}

impl Req {
    pub fn get(path: impl Into<String>) -> Req {
        Req {
            method: Method::GET,
            path: path.into(),
            body: None,
            bearer: None,
        }
    }

    pub fn post_json(path: impl Into<String>, body: impl Into<Bytes>) -> Req {
        Req {
            method: Method::POST,
            path: path.into(),
            body: Some(body.into()),
            bearer: None,
        }
    }

    pub fn bearer(mut self, token: &Arc<str>) -> Req {
        self.bearer = Some(token.clone());
        self
    }
}

/// Makes request number `seq` of connection `worker`.
pub type MakeReq = Arc<dyn Fn(usize, u64) -> Req + Send + Sync>;

/// How a phase runs.
#[derive(Clone, Debug)]
pub struct Phase {
    pub name: &'static str,
    pub connections: usize,
    /// Requests finishing before this are not counted (connections open, caches warm).
    pub warmup: Duration,
    pub measure: Duration,
    /// Stop after this many counted requests (for slow routes), if set.
    pub max_requests: Option<u64>,
    /// The server's process, to read the CPU time it spends in the counted window.
    pub server_pid: Option<u32>,
}

/// What a phase measured. Latencies in milliseconds.
#[derive(Clone, Debug, Default, Serialize, Deserialize)]
pub struct Stats {
    pub name: String,
    pub connections: usize,
    pub requests: u64,
    /// Responses whose status the phase expects (2xx unless said otherwise).
    pub ok: u64,
    /// Other responses, by status.
    pub unexpected: BTreeMap<u16, u64>,
    /// Connection or protocol failures.
    pub errors: u64,
    pub seconds: f64,
    pub per_second: f64,
    pub p50_ms: f64,
    pub p90_ms: f64,
    pub p99_ms: f64,
    pub max_ms: f64,
    pub mean_body_bytes: f64,
    /// Server CPU time (user + system) per counted request, microseconds.
    pub server_cpu_us_per_request: Option<f64>,
    /// The bench's own CPU time per counted request (the load generator), microseconds.
    pub client_cpu_us_per_request: Option<f64>,
    /// Server CPU seconds per wall second in the counted window (2.0 = both cores).
    pub server_cores_busy: Option<f64>,
}

/// CPU time (user + system) of a process so far, seconds; `None` for the bench itself.
pub fn cpu_seconds(pid: Option<u32>) -> Option<f64> {
    let path = match pid {
        Some(pid) => format!("/proc/{pid}/stat"),
        None => "/proc/self/stat".to_string(),
    };
    let stat = std::fs::read_to_string(path).ok()?;
    // Fields after the command name (which may hold spaces) start at field 3: state.
    let rest = stat.rsplit_once(')')?.1;
    let fields: Vec<&str> = rest.split_whitespace().collect();
    let utime: f64 = fields.get(11)?.parse().ok()?;
    let stime: f64 = fields.get(12)?.parse().ok()?;
    // USER_HZ is 100 on Linux.
    Some((utime + stime) / 100.0)
}

struct WorkerOut {
    latencies_us: Vec<u32>,
    ok: u64,
    unexpected: BTreeMap<u16, u64>,
    errors: u64,
    bytes: u64,
    last_done: Option<Instant>,
}

async fn connect(addr: SocketAddr) -> Result<SendRequest<Full<Bytes>>, String> {
    let stream = TcpStream::connect(addr).await.map_err(|e| e.to_string())?;
    stream.set_nodelay(true).map_err(|e| e.to_string())?;
    let (sender, conn) = http1::handshake(TokioIo::new(stream))
        .await
        .map_err(|e| e.to_string())?;
    tokio::spawn(async move {
        let _ = conn.await;
    });
    Ok(sender)
}

/// Sends one request on `sender`; returns the status and the body's length.
pub async fn send(sender: &mut SendRequest<Full<Bytes>>, req: Req) -> Result<(u16, usize), String> {
    let mut builder = Request::builder()
        .method(req.method)
        .uri(req.path)
        .header(HOST, "127.0.0.1");
    if req.body.is_some() {
        builder = builder.header(CONTENT_TYPE, "application/json");
    }
    if let Some(token) = &req.bearer {
        builder = builder.header(AUTHORIZATION, format!("Bearer {token}"));
    }
    let request = builder
        .body(Full::new(req.body.unwrap_or_default()))
        .map_err(|e| e.to_string())?;
    sender.ready().await.map_err(|e| e.to_string())?;
    let response = sender
        .send_request(request)
        .await
        .map_err(|e| e.to_string())?;
    let status = response.status().as_u16();
    let body = response
        .into_body()
        .collect()
        .await
        .map_err(|e| e.to_string())?
        .to_bytes();
    Ok((status, body.len()))
}

/// One request on a fresh connection (for checks outside a phase).
pub async fn once(addr: SocketAddr, req: Req) -> Result<(u16, usize), String> {
    let mut sender = connect(addr).await?;
    send(&mut sender, req).await
}

#[allow(clippy::too_many_arguments)]
async fn worker(
    addr: SocketAddr,
    id: usize,
    make: MakeReq,
    expect: fn(u16) -> bool,
    counted_from: Instant,
    end: Instant,
    budget: Arc<AtomicU64>,
    limited: bool,
) -> WorkerOut {
    let mut out = WorkerOut {
        latencies_us: Vec::new(),
        ok: 0,
        unexpected: BTreeMap::new(),
        errors: 0,
        bytes: 0,
        last_done: None,
    };
    let mut sender = None;
    let mut seq = 0;
    while Instant::now() < end {
        if limited && budget.load(Ordering::Relaxed) == 0 {
            break;
        }
        if sender.is_none() {
            match connect(addr).await {
                Ok(s) => sender = Some(s),
                Err(_) => {
                    out.errors += 1;
                    tokio::time::sleep(Duration::from_millis(10)).await;
                    continue;
                }
            }
        }
        let Some(s) = sender.as_mut() else { continue };
        let req = make(id, seq);
        seq += 1;
        let started = Instant::now();
        let result = send(s, req).await;
        let done = Instant::now();
        let counted = started >= counted_from;
        match result {
            Ok((status, bytes)) if counted => {
                let spent =
                    budget.fetch_update(Ordering::Relaxed, Ordering::Relaxed, |b| b.checked_sub(1));
                if limited && spent.is_err() {
                    break;
                }
                let micros = (done - started).as_micros().min(u128::from(u32::MAX)) as u32;
                out.latencies_us.push(micros);
                out.bytes += bytes as u64;
                out.last_done = Some(done);
                if expect(status) {
                    out.ok += 1;
                } else {
                    *out.unexpected.entry(status).or_default() += 1;
                }
            }
            Ok(_) => {}
            Err(_) => {
                if counted {
                    out.errors += 1;
                }
                sender = None;
            }
        }
    }
    out
}

/// The `q` quantile of sorted latencies, ms (nearest rank).
fn quantile(sorted_us: &[u32], q: f64) -> f64 {
    if sorted_us.is_empty() {
        return 0.0;
    }
    let rank = ((q * sorted_us.len() as f64).ceil() as usize).clamp(1, sorted_us.len());
    f64::from(sorted_us[rank - 1]) / 1000.0
}

/// Latency figures of a list of samples (microseconds), for timings taken outside HTTP.
pub fn summarise(name: &str, mut samples_us: Vec<u32>, seconds: f64) -> Stats {
    samples_us.sort_unstable();
    let n = samples_us.len() as u64;
    Stats {
        name: name.to_string(),
        connections: 1,
        requests: n,
        ok: n,
        seconds,
        per_second: n as f64 / seconds.max(1e-9),
        p50_ms: quantile(&samples_us, 0.50),
        p90_ms: quantile(&samples_us, 0.90),
        p99_ms: quantile(&samples_us, 0.99),
        max_ms: samples_us.last().map_or(0.0, |v| f64::from(*v) / 1000.0),
        ..Stats::default()
    }
}

/// Runs a phase: `connections` workers for `warmup + measure`, counting what finishes after
/// the warm-up.
pub async fn run(addr: SocketAddr, phase: &Phase, make: MakeReq, expect: fn(u16) -> bool) -> Stats {
    let start = Instant::now();
    let counted_from = start + phase.warmup;
    let end = counted_from + phase.measure;
    let budget = Arc::new(AtomicU64::new(phase.max_requests.unwrap_or(u64::MAX)));
    let pid = phase.server_pid;
    let cpu_start = tokio::spawn(async move {
        tokio::time::sleep_until(counted_from.into()).await;
        (cpu_seconds(pid), cpu_seconds(None), Instant::now())
    });
    let handles: Vec<_> = (0..phase.connections)
        .map(|id| {
            tokio::spawn(worker(
                addr,
                id,
                make.clone(),
                expect,
                counted_from,
                end,
                budget.clone(),
                phase.max_requests.is_some(),
            ))
        })
        .collect();
    let mut latencies = Vec::new();
    let mut stats = Stats {
        name: phase.name.to_string(),
        connections: phase.connections,
        ..Stats::default()
    };
    let mut bytes = 0;
    let mut last = counted_from;
    for handle in handles {
        let Ok(out) = handle.await else {
            stats.errors += 1;
            continue;
        };
        latencies.extend(out.latencies_us);
        stats.ok += out.ok;
        stats.errors += out.errors;
        bytes += out.bytes;
        for (status, count) in out.unexpected {
            *stats.unexpected.entry(status).or_default() += count;
        }
        if let Some(done) = out.last_done {
            last = last.max(done);
        }
    }
    let (server_cpu, client_cpu) = (cpu_seconds(pid), cpu_seconds(None));
    let joined = Instant::now();
    latencies.sort_unstable();
    stats.requests = latencies.len() as u64;
    if let Ok((s0, c0, t0)) = cpu_start.await {
        let n = stats.requests.max(1) as f64;
        if let (Some(s0), Some(s1)) = (s0, server_cpu) {
            stats.server_cpu_us_per_request = Some((s1 - s0) * 1e6 / n);
            stats.server_cores_busy = Some((s1 - s0) / (joined - t0).as_secs_f64().max(1e-9));
        }
        if let (Some(c0), Some(c1)) = (c0, client_cpu) {
            stats.client_cpu_us_per_request = Some((c1 - c0) * 1e6 / n);
        }
    }
    stats.seconds = (last - counted_from).as_secs_f64();
    stats.per_second = stats.requests as f64 / stats.seconds.max(1e-9);
    stats.p50_ms = quantile(&latencies, 0.50);
    stats.p90_ms = quantile(&latencies, 0.90);
    stats.p99_ms = quantile(&latencies, 0.99);
    stats.max_ms = latencies.last().map_or(0.0, |v| f64::from(*v) / 1000.0);
    stats.mean_body_bytes = bytes as f64 / (stats.requests.max(1) as f64);
    stats
}
