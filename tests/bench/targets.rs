//! The targets of the speed-and-scale issue, each judged met or missed on the fleet size it
//! names (or the largest size run), with the reason.

use crate::load::Stats;
use crate::report::SizeResult;
use serde::Serialize;

/// A target with its verdict.
#[derive(Clone, Debug, Serialize)]
pub struct Target {
    pub name: &'static str,
    pub wanted: &'static str,
    pub measured: String,
    /// `None` when it could not be judged (size not run, route missing).
    pub met: Option<bool>,
    pub reason: String,
}

fn at(results: &[SizeResult], n: u32) -> Option<&SizeResult> {
    results.iter().find(|r| r.machines == n)
}

fn largest(results: &[SizeResult]) -> Option<&SizeResult> {
    results.iter().max_by_key(|r| r.machines)
}

/// Server CPU per request, e.g. `85 us`.
fn cpu(s: &Stats) -> String {
    s.server_cpu_us_per_request
        .map_or("not read".into(), |us| format!("{us:.0} us"))
}

fn not_judged(name: &'static str, wanted: &'static str, why: String) -> Target {
    Target {
        name,
        wanted,
        measured: "—".into(),
        met: None,
        reason: why,
    }
}

fn ran(results: &[SizeResult]) -> String {
    let sizes: Vec<String> = results.iter().map(|r| r.machines.to_string()).collect();
    format!("sizes run: {}", sizes.join(", "))
}

/// A report's HTTP p99 against the same storage call run straight on the file: met within 3x.
fn over_raw(
    name: &'static str,
    wanted: &'static str,
    size: Option<&SizeResult>,
    (http, raw): (&str, &str),
    reason: impl Fn(&SizeResult, &Stats) -> String,
    why_not: String,
) -> Target {
    match size.and_then(|r| Some((r, r.phase(http)?, r.phase(raw)?))) {
        Some((r, http, raw)) => {
            let ratio = http.p99_ms / raw.p99_ms.max(1e-6);
            Target {
                name,
                wanted,
                measured: format!(
                    "{ratio:.2}x (p99 {:.1} vs {:.1} ms at {} machines)",
                    http.p99_ms, raw.p99_ms, r.machines
                ),
                met: Some(ratio <= 3.0),
                reason: reason(r, http),
            }
        }
        None => not_judged(name, wanted, why_not),
    }
}

/// Judges each target on the size it names (or the largest size run).
pub fn judge(results: &[SizeResult]) -> Vec<Target> {
    let mut out = Vec::new();
    let big = largest(results);

    let wanted = ">= 0.8 x bare route throughput (64 connections)";
    out.push(
        match big.and_then(|r| Some((r, r.phase("calc")?, r.phase("bare_static")?))) {
            Some((r, calc, bare)) => {
                let ratio = calc.per_second / bare.per_second;
                let met = ratio >= 0.8;
                Target {
                    name: "calc API throughput",
                    wanted,
                    measured: format!(
                        "{ratio:.2} ({:.0} vs {:.0} req/s at {} machines)",
                        calc.per_second, bare.per_second, r.machines
                    ),
                    met: Some(met),
                    reason: format!(
                        "server CPU per request: calc {}, bare route {}{}",
                        cpu(calc),
                        cpu(bare),
                        if met {
                            ""
                        } else {
                            "; the calculation and its JSON answer bound it (see Analysis)"
                        }
                    ),
                }
            }
            None => not_judged(
                "calc API throughput",
                wanted,
                "calc or bare phase not measured".into(),
            ),
        },
    );

    let wanted = "p99 < 50 ms at 100,000 machines";
    out.push(match at(results, 100_000).and_then(|r| Some((r, r.phase("due_http")?))) {
        Some((r, due)) => {
            let raw = r.phase("due_raw");
            Target {
                name: "due report latency",
                wanted,
                measured: format!("p99 {:.1} ms ({} samples, {} items, {:.1} MB)", due.p99_ms, due.requests, r.due_items, due.mean_body_bytes / 1e6),
                met: Some(due.p99_ms < 50.0),
                reason: match raw {
                    Some(raw) => format!(
                        "the storage call alone (SQL and due dates, no HTTP) takes p99 {:.1} ms for the whole fleet",
                        raw.p99_ms
                    ),
                    None => "storage call not measured".into(),
                } + &format!(
                    "; the answer lists every item of the fleet due within 30 days ({} items)",
                    r.due_items
                ),
            }
        }
        None => not_judged("due report latency", wanted, ran(results)),
    });

    let due_size = at(results, 100_000).or(big);
    out.push(over_raw(
        "due report vs raw query",
        "HTTP p99 <= 3 x the same query run straight on the file",
        due_size,
        ("due_http", "due_raw"),
        |r, http| {
            format!(
                "HTTP adds the token check, JSON of {} items ({:.1} MB) and the transfer",
                r.due_items,
                http.mean_body_bytes / 1e6
            )
        },
        ran(results),
    ));

    let wanted = "p99 < 50 ms at 100,000 machines, the due list of one site (1 client)";
    out.push(
        match at(results, 100_000).and_then(|r| Some((r, r.phase("due_site")?))) {
            Some((r, due)) => Target {
                name: "due report latency, one site",
                wanted,
                measured: format!(
                    "p99 {:.1} ms, p50 {:.1} ms ({} requests, {:.0} kB each)",
                    due.p99_ms,
                    due.p50_ms,
                    due.requests,
                    due.mean_body_bytes / 1e3
                ),
                met: Some(due.p99_ms < 50.0),
                reason: format!(
                    "server CPU per report {}; the storage call alone takes p99 {}",
                    cpu(due),
                    r.phase("due_site_raw")
                        .map_or("not measured".into(), |raw| format!("{:.1} ms", raw.p99_ms))
                ),
            },
            None => not_judged("due report latency, one site", wanted, ran(results)),
        },
    );

    out.push(over_raw(
        "due report vs raw query, one site",
        "HTTP p99 <= 3 x the same query run straight on the file, one site",
        due_size,
        ("due_site", "due_site_raw"),
        |_, _| "HTTP adds the token check, the site check, the JSON and the transfer".into(),
        ran(results),
    ));

    let wanted = "p99 < 10 ms at 10,000 machines (32 clients)";
    out.push(
        match at(results, 10_000).and_then(|r| r.phase("cylinder_page")) {
            Some(page) => Target {
                name: "cylinder page",
                wanted,
                measured: format!(
                    "p99 {:.1} ms, p50 {:.1} ms, {:.0} pages/s",
                    page.p99_ms, page.p50_ms, page.per_second
                ),
                met: Some(page.p99_ms < 10.0),
                reason: format!(
                    "server CPU per page {}; with 32 clients queued on 2 cores, p99 is about 16 pages' worth of CPU",
                    cpu(page)
                ),
            },
            None => not_judged("cylinder page", wanted, ran(results)),
        },
    );

    let wanted = ">= 1000 drift-test writes/s (16 clients)";
    out.push(match big.and_then(|r| Some((r, r.phase("drift_writes")?))) {
        Some((r, w)) => {
            let rate = w.ok as f64 / w.seconds.max(1e-9);
            Target {
                name: "drift-test writes",
                wanted,
                measured: format!("{rate:.0} writes/s, p99 {:.1} ms at {} machines", w.p99_ms, r.machines),
                met: Some(rate >= 1000.0),
                reason: format!(
                    "each write: token check, cylinder and hoses read, core analysis, one transaction (row + audit row, fsync on commit); server CPU per write {}, {} cores busy{}",
                    cpu(w),
                    w.server_cores_busy.map_or("?".into(), |c| format!("{c:.2}")),
                    if w.unexpected.is_empty() {
                        String::new()
                    } else {
                        format!("; refused writes by status: {:?}", w.unexpected)
                    }
                ),
            }
        }
        None => not_judged("drift-test writes", wanted, ran(results)),
    });

    let wanted = "< 40 MB resident, idle";
    out.push(match big {
        Some(r) if r.rss_idle_kb > 0 => Target {
            name: "idle memory",
            wanted,
            measured: format!(
                "{:.1} MB at {} machines (peak under load {:.1} MB, after load {:.1} MB)",
                r.rss_idle_kb as f64 / 1024.0,
                r.machines,
                r.rss_peak_kb as f64 / 1024.0,
                r.rss_after_load_kb as f64 / 1024.0
            ),
            met: Some((r.rss_idle_kb as f64) < 40.0 * 1024.0),
            reason: "VmRSS one second after the first healthy /healthz".into(),
        },
        _ => not_judged("idle memory", wanted, ran(results)),
    });

    let wanted = "< 300 ms to first healthy /healthz at 100,000 machines";
    out.push(
        match at(results, 100_000).filter(|r| !r.startup_ms.is_empty()) {
            Some(r) => Target {
                name: "start-up",
                wanted,
                measured: format!(
                    "median {:.0} ms of {:?}",
                    r.startup_median_ms,
                    r.startup_ms.iter().map(|v| v.round()).collect::<Vec<_>>()
                ),
                met: Some(r.startup_median_ms < 300.0),
                reason: "spawn to the first 200 from /healthz (migrations checked, pool opened)"
                    .into(),
            },
            None => not_judged("start-up", wanted, ran(results)),
        },
    );
    out
}
