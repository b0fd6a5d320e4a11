//! The bench's results: per fleet size, the targets judged met or missed with the reason, and
//! the report written as markdown (`REPORT.md`) and JSON (`report.json`).

use crate::load::Stats;
use crate::targets::{self, Target};
use serde::{Deserialize, Serialize};
use std::collections::BTreeMap;
use std::fmt::Write as _;
use std::path::Path;

/// Everything measured at one fleet size.
#[derive(Clone, Debug, Default, Serialize, Deserialize)]
pub struct SizeResult {
    pub machines: u32,
    pub seed_seconds: f64,
    pub seed_summary: String,
    pub database_bytes: u64,
    pub bytes_per_machine: f64,
    /// Spawn to first healthy `/healthz`, each start, ms.
    pub startup_ms: Vec<f64>,
    pub startup_median_ms: f64,
    pub rss_idle_kb: u64,
    pub rss_peak_kb: u64,
    pub rss_after_load_kb: u64,
    pub phases: BTreeMap<String, Stats>,
    /// Items in the due list (the storage call's answer).
    pub due_items: usize,
    pub calc_over_bare: Option<f64>,
    /// HTTP p99 over storage-call p99 for the due report.
    pub due_http_over_raw_p99: Option<f64>,
    /// The same for the due list of one site.
    #[serde(default)]
    pub due_site_http_over_raw_p99: Option<f64>,
    pub database_bytes_after_writes: u64,
    /// Growth of the database per drift test written through the API (row, audit row, indexes).
    pub bytes_per_written_test: Option<f64>,
    /// Routes missing, phases skipped, anything that kept a figure from being measured.
    pub problems: Vec<String>,
    /// The machine's 1-minute load average when the size's measuring began and ended (other
    /// work on the machine shows here).
    #[serde(default)]
    pub load_average: Vec<f64>,
}

impl SizeResult {
    pub fn phase(&self, name: &str) -> Option<&Stats> {
        self.phases.get(name).filter(|s| s.requests > 0)
    }
}

/// The machine the report was made on.
#[derive(Clone, Debug, Serialize, Deserialize)]
pub struct Host {
    pub cpus: usize,
    pub cpu_model: String,
    pub kernel: String,
    pub memory_kb: u64,
    pub build: String,
    pub binary: String,
    pub command: String,
    pub generated_at: String,
}

#[derive(Serialize)]
struct Json<'a> {
    host: &'a Host,
    targets: &'a [Target],
    sizes: &'a [SizeResult],
}

fn opt(v: Option<f64>, places: usize) -> String {
    v.map_or("—".into(), |v| format!("{v:.places$}"))
}

fn ms(s: Option<&Stats>) -> String {
    s.map_or("—".into(), |s| {
        format!("{:.2} / {:.2}", s.p50_ms, s.p99_ms)
    })
}

fn rps(s: Option<&Stats>) -> String {
    s.map_or("—".into(), |s| {
        format!("{:.0}", s.ok as f64 / s.seconds.max(1e-9))
    })
}

/// The markdown report.
pub fn markdown(
    host: &Host,
    targets: &[Target],
    results: &[SizeResult],
    analysis: Option<&str>,
) -> String {
    let mut md = String::new();
    let _ = writeln!(md, "# Loadhold benchmark report\n");
    let _ = writeln!(
        md,
        "Made by `{}` on {} ({} CPUs, {:.1} GB RAM, Linux {}), {} build of `{}`, at {}. \
         The server and the load generator share the same cores; every request goes over \
         loopback. Timings here are measurements of this machine, never asserted in tests.\n",
        host.command,
        host.cpu_model,
        host.cpus,
        host.memory_kb as f64 / 1024.0 / 1024.0,
        host.kernel,
        host.build,
        host.binary,
        host.generated_at
    );
    let _ = writeln!(
        md,
        "## Targets\n\n| target | wanted | measured | result | why |\n|---|---|---|---|---|"
    );
    for t in targets {
        let verdict = match t.met {
            Some(true) => "met",
            Some(false) => "**missed**",
            None => "not judged",
        };
        let _ = writeln!(
            md,
            "| {} | {} | {} | {} | {} |",
            t.name, t.wanted, t.measured, verdict, t.reason
        );
    }
    let _ = writeln!(md, "\n## Cost curve: size, start-up and memory\n");
    let _ = writeln!(
        md,
        "| machines | seed s | DB MB | KB per machine | start-up ms (median) | RSS idle MB | RSS peak MB | RSS after load MB | bytes per API-written test | load average at start / end |\n|---|---|---|---|---|---|---|---|---|---|"
    );
    for r in results {
        let _ = writeln!(
            md,
            "| {} | {:.1} | {:.1} | {:.1} | {:.0} | {:.1} | {:.1} | {:.1} | {} | {} |",
            r.machines,
            r.seed_seconds,
            r.database_bytes as f64 / 1e6,
            r.bytes_per_machine / 1e3,
            r.startup_median_ms,
            r.rss_idle_kb as f64 / 1024.0,
            r.rss_peak_kb as f64 / 1024.0,
            r.rss_after_load_kb as f64 / 1024.0,
            r.bytes_per_written_test
                .map_or("—".into(), |b| format!("{b:.0}")),
            r.load_average
                .iter()
                .map(|l| format!("{l:.2}"))
                .collect::<Vec<_>>()
                .join(" / "),
        );
    }
    let _ = writeln!(md, "\n## Cost curve: throughput and latency\n");
    let _ = writeln!(
        md,
        "Latency columns are p50 / p99 in ms. Bare route: `GET /static/icon.svg` (no database); `/healthz` runs `SELECT 1` on the pool.\n"
    );
    let _ = writeln!(
        md,
        "| machines | bare req/s | /healthz req/s | calc req/s | calc / bare | calc ms | due HTTP ms | due raw ms | due p99 HTTP / raw | due items | due one site HTTP ms | due one site raw ms | cylinder page ms | fleet list ms | fleet by site ms | unit search ms | drift writes/s | drift write ms |\n|---|---|---|---|---|---|---|---|---|---|---|---|---|---|---|---|---|---|"
    );
    for r in results {
        let _ = writeln!(
            md,
            "| {} | {} | {} | {} | {} | {} | {} | {} | {} | {} | {} | {} | {} | {} | {} | {} | {} | {} |",
            r.machines,
            rps(r.phase("bare_static")),
            rps(r.phase("healthz")),
            rps(r.phase("calc")),
            r.calc_over_bare.map_or("—".into(), |v| format!("{v:.2}")),
            ms(r.phase("calc")),
            ms(r.phase("due_http")),
            ms(r.phase("due_raw")),
            r.due_http_over_raw_p99
                .map_or("—".into(), |v| format!("{v:.2}")),
            r.due_items,
            ms(r.phase("due_site")),
            ms(r.phase("due_site_raw")),
            ms(r.phase("cylinder_page")),
            ms(r.phase("fleet_page")),
            ms(r.phase("fleet_page_site")),
            ms(r.phase("fleet_search")),
            rps(r.phase("drift_writes")),
            ms(r.phase("drift_writes")),
        );
    }
    let _ = writeln!(
        md,
        "\n## Every phase\n\n| machines | phase | connections | requests | ok | other statuses | errors | s | req/s | p50 | p90 | p99 | max ms | body bytes | server CPU us/req | server cores busy | bench CPU us/req |\n|---|---|---|---|---|---|---|---|---|---|---|---|---|---|---|---|---|"
    );
    for r in results {
        for s in r.phases.values() {
            let _ = writeln!(
                md,
                "| {} | {} | {} | {} | {} | {:?} | {} | {:.1} | {:.0} | {:.2} | {:.2} | {:.2} | {:.2} | {:.0} | {} | {} | {} |",
                r.machines,
                s.name,
                s.connections,
                s.requests,
                s.ok,
                s.unexpected,
                s.errors,
                s.seconds,
                s.per_second,
                s.p50_ms,
                s.p90_ms,
                s.p99_ms,
                s.max_ms,
                s.mean_body_bytes,
                opt(s.server_cpu_us_per_request, 0),
                opt(s.server_cores_busy, 2),
                opt(s.client_cpu_us_per_request, 0),
            );
        }
    }
    let _ = writeln!(md, "\n## Seeding\n");
    for r in results {
        let _ = writeln!(md, "- {} machines: {}", r.machines, r.seed_summary);
    }
    let problems: Vec<String> = results
        .iter()
        .flat_map(|r| {
            r.problems
                .iter()
                .map(move |p| format!("- {} machines: {p}", r.machines))
        })
        .collect();
    if !problems.is_empty() {
        let _ = writeln!(md, "\n## Not measured\n\n{}", problems.join("\n"));
    }
    let _ = writeln!(md, "\n{}", crate::METHOD);
    if let Some(text) = analysis {
        let _ = writeln!(md, "\n{}", text.trim_end());
    }
    md
}

/// The host and sizes of a `report.json` written before (to render the report again after
/// `ANALYSIS.md` changes, without measuring).
pub fn read(dir: &Path) -> Result<(Host, Vec<SizeResult>), String> {
    #[derive(Deserialize)]
    struct Saved {
        host: Host,
        sizes: Vec<SizeResult>,
    }
    let path = dir.join("report.json");
    let text = std::fs::read_to_string(&path).map_err(|e| format!("{}: {e}", path.display()))?;
    let saved: Saved =
        serde_json::from_str(&text).map_err(|e| format!("{}: {e}", path.display()))?;
    Ok((saved.host, saved.sizes))
}

/// Writes `REPORT.md` and `report.json` into `dir`.
pub fn write(
    dir: &Path,
    host: &Host,
    results: &[SizeResult],
    analysis: Option<&str>,
) -> Result<Vec<Target>, String> {
    std::fs::create_dir_all(dir).map_err(|e| format!("cannot create {}: {e}", dir.display()))?;
    let targets = targets::judge(results);
    let md = markdown(host, &targets, results, analysis);
    std::fs::write(dir.join("REPORT.md"), md).map_err(|e| e.to_string())?;
    let json = serde_json::to_string_pretty(&Json {
        host,
        targets: &targets,
        sizes: results,
    })
    .map_err(|e| e.to_string())?;
    std::fs::write(dir.join("report.json"), json + "\n").map_err(|e| e.to_string())?;
    Ok(targets)
}
