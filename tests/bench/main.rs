//! The Loadhold benchmark: for each fleet size, a freshly generated database, the real server
//! binary on loopback, and an in-bench load generator; writes `REPORT.md` and `report.json`.
//!
//! ```text
//! cargo bench --bench loadhold-bench -- --sizes 1000,10000,100000   # full run, release build
//! cargo test --bench loadhold-bench -- --smoke                      # CI: seconds, debug build
//! ```
//! Options: `--sizes N,N`, `--seconds S` (measured time per phase, default 5), `--smoke`,
//! `--out DIR` (default `tests/bench`; `target/bench-smoke` with `--smoke`), `--data DIR`
//! (databases, default `target/bench-data`; `$CARGO_TARGET_DIR` is honoured), `--keep`
//! (keep the databases), `--bin PATH`; for profiling, `--reuse` (an existing database of the
//! size, kept) and `--only PHASE,PHASE`; `--render` writes `REPORT.md` again from
//! `report.json` and `ANALYSIS.md` without measuring.
//! Smoke mode fails (exit 1) only when a phase could not run or a route answered wrongly;
//! timings are never judged there.

mod load;
mod measure;
mod report;
mod server;
mod targets;
mod workloads;

use report::{Host, SizeResult};
use std::path::PathBuf;
use std::process::ExitCode;
use std::time::Duration;

/// How the numbers are made, for the report.
pub const METHOD: &str = "## Method

- `loadhold seed-demo --scale N` makes the fleet (about 4 cylinders and 6 hose assemblies per
  machine, five years of inspections and drift tests, every drift test analysed by the
  engineering core) in a fresh SQLite file; the seed time is the command's wall time.
- The server is the real binary (`serve`), started three times; start-up is spawn to the
  first 200 from `/healthz`, polled every millisecond. Memory is `VmRSS` from
  `/proc/PID/status`: idle one second after start-up, peak sampled every 50 ms during the
  phases, and two seconds after the last phase.
- Load: one tokio task per keep-alive HTTP/1.1 connection (hyper), requests back to back, a
  warm-up not counted, then a fixed time. Latency is request start to the last byte. The load
  generator runs on one thread of the same two cores as the server.
- Bare route: `GET /static/icon.svg` (compiled-in bytes, no database). `/healthz` is also
  measured; it runs `SELECT 1` through the pool, so it is not bare.
- Due report: `GET /api/v1/reports/due` (default window, today) with a manager-or-better bearer
  token, one client, sequential; against `loadhold::db::reports::due_list` called on the same
  file from the bench process (the same SQL and due-date code, no HTTP, no JSON).
- Pages: `/cylinders/{id}` on random cylinders, `/machines` (first page), `/machines?site=ID`
  and `/machines?q=DIGITS` (the tablet's unit search), 32 clients, bearer token.
- Writes: `POST /api/v1/cylinders/{id}/drift-tests` on random cylinders, 16 clients, each with
  its own client token (every one stored: analysis, row and audit row in one transaction).";

pub struct Options {
    pub sizes: Vec<u32>,
    pub smoke: bool,
    pub out: PathBuf,
    pub data: PathBuf,
    pub bin: PathBuf,
    pub keep: bool,
    /// Use an existing database of the size instead of seeding one (profiling runs).
    pub reuse: bool,
    /// Run only these phases (profiling runs); `None`: all.
    pub only: Option<Vec<String>>,
    pub warmup: Duration,
    pub measure: Duration,
    pub due_requests: u64,
    pub command: String,
    /// Render `REPORT.md` again from `report.json` and `ANALYSIS.md`, measuring nothing.
    pub render: bool,
}

fn options() -> Result<Options, String> {
    let root = PathBuf::from(env!("CARGO_MANIFEST_DIR"));
    let target = std::env::var_os("CARGO_TARGET_DIR")
        .map(PathBuf::from)
        .unwrap_or_else(|| root.join("target"));
    let args: Vec<String> = std::env::args()
        .skip(1)
        .filter(|a| a != "--bench")
        .collect();
    let mut o = Options {
        sizes: vec![1_000, 10_000, 100_000],
        smoke: false,
        out: root.join("tests/bench"),
        data: target.join("bench-data"),
        bin: server::default_binary(),
        keep: false,
        reuse: false,
        only: None,
        warmup: Duration::from_secs(1),
        measure: Duration::from_secs(5),
        due_requests: 30,
        render: false,
        command: format!("loadhold-bench {}", args.join(" "))
            .trim()
            .to_string(),
    };
    let mut out_given = false;
    let mut it = args.iter();
    while let Some(arg) = it.next() {
        let mut value = || {
            it.next()
                .cloned()
                .ok_or_else(|| format!("{arg} needs a value"))
        };
        match arg.as_str() {
            "--smoke" => o.smoke = true,
            "--render" => o.render = true,
            "--keep" => o.keep = true,
            "--reuse" => {
                o.reuse = true;
                o.keep = true;
            }
            "--only" => o.only = Some(value()?.split(',').map(|s| s.trim().to_string()).collect()),
            "--sizes" => {
                o.sizes = value()?
                    .split(',')
                    .map(|s| s.trim().parse::<u32>().map_err(|_| format!("bad size {s}")))
                    .collect::<Result<_, _>>()?
            }
            "--seconds" => {
                let s: f64 = value()?.parse().map_err(|_| "bad --seconds".to_string())?;
                o.measure = Duration::from_secs_f64(s.max(0.1));
            }
            "--out" => {
                o.out = PathBuf::from(value()?);
                out_given = true;
            }
            "--data" => o.data = PathBuf::from(value()?),
            "--bin" => o.bin = PathBuf::from(value()?),
            other => return Err(format!("unknown option {other} (see tests/bench/main.rs)")),
        }
    }
    if o.smoke {
        if !args.iter().any(|a| a == "--sizes") {
            o.sizes = vec![200];
        }
        o.warmup = Duration::from_millis(200);
        o.measure = Duration::from_millis(700);
        o.due_requests = 3;
        if !out_given {
            o.out = target.join("bench-smoke");
        }
    }
    Ok(o)
}

impl Options {
    /// True when phase `name` is to run.
    pub fn wants(&self, name: &str) -> bool {
        self.only
            .as_ref()
            .is_none_or(|names| names.iter().any(|n| n == name))
    }
}

fn host(o: &Options) -> Host {
    let cpuinfo = std::fs::read_to_string("/proc/cpuinfo").unwrap_or_default();
    let meminfo = std::fs::read_to_string("/proc/meminfo").unwrap_or_default();
    Host {
        cpus: std::thread::available_parallelism().map_or(1, |n| n.get()),
        cpu_model: cpuinfo
            .lines()
            .find(|l| l.starts_with("model name"))
            .and_then(|l| l.split(':').nth(1))
            .map_or("unknown CPU".into(), |s| s.trim().to_string()),
        kernel: std::fs::read_to_string("/proc/sys/kernel/osrelease")
            .map_or("?".into(), |s| s.trim().to_string()),
        memory_kb: meminfo
            .lines()
            .find(|l| l.starts_with("MemTotal:"))
            .and_then(|l| l.split_whitespace().nth(1))
            .and_then(|v| v.parse().ok())
            .unwrap_or(0),
        build: if o.bin.components().any(|c| c.as_os_str() == "release") {
            "release".into()
        } else {
            "debug".into()
        },
        binary: o.bin.display().to_string(),
        command: o.command.clone(),
        generated_at: time::OffsetDateTime::now_utc()
            .replace_nanosecond(0)
            .ok()
            .and_then(|t| {
                t.format(&time::format_description::well_known::Rfc3339)
                    .ok()
            })
            .unwrap_or_default(),
    }
}

fn main() -> ExitCode {
    let o = match options() {
        Ok(o) => o,
        Err(e) => {
            eprintln!("loadhold-bench: {e}");
            return ExitCode::FAILURE;
        }
    };
    let (host, results, failed) = if o.render {
        match report::read(&o.out) {
            Ok((host, results)) => (host, results, false),
            Err(e) => {
                eprintln!("loadhold-bench: --render: {e}");
                return ExitCode::FAILURE;
            }
        }
    } else {
        match run(&o) {
            Ok(done) => done,
            Err(e) => {
                eprintln!("loadhold-bench: {e}");
                return ExitCode::FAILURE;
            }
        }
    };
    let analysis = std::fs::read_to_string(o.out.join("ANALYSIS.md")).ok();
    match report::write(&o.out, &host, &results, analysis.as_deref()) {
        Ok(targets) => {
            for t in &targets {
                let verdict = match t.met {
                    Some(true) => "met",
                    Some(false) => "MISSED",
                    None => "not judged",
                };
                println!("{:<26} {:<11} {}", t.name, verdict, t.measured);
            }
            println!("report: {}", o.out.join("REPORT.md").display());
        }
        Err(e) => {
            eprintln!("loadhold-bench: cannot write the report: {e}");
            return ExitCode::FAILURE;
        }
    }
    if o.smoke && failed {
        eprintln!("loadhold-bench: smoke run found problems (see the report's \"Not measured\")");
        return ExitCode::FAILURE;
    }
    ExitCode::SUCCESS
}

/// Measures every size; returns the host, the results and whether any phase had a problem.
fn run(o: &Options) -> Result<(Host, Vec<SizeResult>, bool), String> {
    if !o.bin.exists() {
        return Err(format!(
            "no server binary at {}; run cargo build --release",
            o.bin.display()
        ));
    }
    let runtime = tokio::runtime::Builder::new_current_thread()
        .enable_all()
        .build()
        .map_err(|e| format!("cannot start tokio: {e}"))?;
    let host = host(o);
    println!(
        "loadhold-bench: {} build, sizes {:?}, report in {}",
        host.build,
        o.sizes,
        o.out.display()
    );
    let mut results = Vec::new();
    let mut failed = false;
    for &n in &o.sizes {
        match runtime.block_on(measure::measure(o, n)) {
            Ok(r) => {
                failed |= !r.problems.is_empty();
                results.push(r);
            }
            Err(e) => {
                eprintln!("loadhold-bench: {n} machines: {e}");
                failed = true;
                results.push(SizeResult {
                    machines: n,
                    problems: vec![e],
                    ..SizeResult::default()
                });
            }
        }
    }
    Ok((host, results, failed))
}
