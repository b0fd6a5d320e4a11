//! One fleet size, measured: seed a fresh database, start the server three times, then run
//! every phase against it and read its memory.

use crate::Options;
use crate::load::{self, Phase, Stats};
use crate::report::SizeResult;
use crate::server::{self, Server};
use crate::workloads;
use std::sync::Arc;
use std::sync::atomic::{AtomicU64, Ordering};
use std::time::{Duration, Instant};

fn ok_status(status: u16) -> bool {
    (200..300).contains(&status)
}

/// Checks the route with one request, then runs the phase; a wrong answer skips it.
async fn phase(
    o: &Options,
    srv: &Server,
    r: &mut SizeResult,
    p: Phase,
    make: load::MakeReq,
) -> Option<Stats> {
    if !o.wants(p.name) {
        return None;
    }
    let probe = make(usize::MAX >> 1, u64::MAX >> 1);
    let what = format!("{} {}", probe.method, probe.path);
    match load::once(srv.addr, probe).await {
        Ok((status, _)) if ok_status(status) => {}
        Ok((status, _)) => {
            r.problems.push(format!(
                "{}: {what} answered {status}; phase skipped",
                p.name
            ));
            return None;
        }
        Err(e) => {
            r.problems
                .push(format!("{}: {what} failed ({e}); phase skipped", p.name));
            return None;
        }
    }
    let stats = load::run(srv.addr, &p, make, ok_status).await;
    if stats.ok == 0 || !stats.unexpected.is_empty() || stats.errors > 0 {
        r.problems.push(format!(
            "{}: {} ok, other statuses {:?}, {} connection errors",
            p.name, stats.ok, stats.unexpected, stats.errors
        ));
    }
    println!(
        "  {:<16} {:>8.0} req/s  p50 {:>8.2} ms  p99 {:>8.2} ms  ({} requests, {} ok)",
        stats.name, stats.per_second, stats.p50_ms, stats.p99_ms, stats.requests, stats.ok
    );
    r.phases.insert(p.name.to_string(), stats.clone());
    Some(stats)
}

pub async fn measure(o: &Options, n: u32) -> Result<SizeResult, String> {
    std::fs::create_dir_all(&o.data).map_err(|e| e.to_string())?;
    let db = o.data.join(format!("loadhold-bench-{n}.sqlite"));
    let mut r = SizeResult {
        machines: n,
        ..SizeResult::default()
    };
    r.load_average.push(server::load_average());
    let (seconds, line) = if o.reuse && db.exists() {
        println!("== {n} machines: reusing {}", db.display());
        (
            0.0,
            format!("reused {} (not seeded in this run)", db.display()),
        )
    } else {
        println!("== {n} machines: seeding {}", db.display());
        server::seed(&o.bin, &db, n)?
    };
    println!("  {line} ({seconds:.1} s)");
    r.seed_seconds = seconds;
    r.seed_summary = line;
    r.database_bytes = server::database_bytes(&db);
    r.bytes_per_machine = r.database_bytes as f64 / f64::from(n);
    let admin: Arc<str> = server::token(&o.bin, &db, "bench-admin", "admin")?.into();
    let tech: Arc<str> = server::token(&o.bin, &db, "bench-technician", "technician")?.into();

    let pool = loadhold::db::connect(&db)
        .await
        .map_err(|e| e.to_string())?;
    let cylinders: i64 = sqlx::query_scalar("SELECT COALESCE(MAX(id), 0) FROM cylinders")
        .fetch_one(&pool)
        .await
        .map_err(|e| e.to_string())?;
    let sites: Vec<i64> = sqlx::query_scalar("SELECT id FROM sites ORDER BY id")
        .fetch_all(&pool)
        .await
        .map_err(|e| e.to_string())?;
    let fleet = workloads::Fleet {
        machines: n,
        cylinders,
        sites,
    };

    let log = o.data.join(format!("server-{n}.log"));
    let mut srv = None;
    for _ in 0..3 {
        if let Some(mut old) = srv.take() {
            Server::stop(&mut old);
        }
        let (s, took) = Server::start(&o.bin, &db, &log)?;
        r.startup_ms.push(took.as_secs_f64() * 1000.0);
        srv = Some(s);
    }
    let mut sorted = r.startup_ms.clone();
    sorted.sort_by(f64::total_cmp);
    r.startup_median_ms = sorted[sorted.len() / 2];
    let srv = srv.ok_or("no server")?;
    tokio::time::sleep(Duration::from_secs(1)).await;
    r.rss_idle_kb = srv.rss_kb().unwrap_or(0);
    println!(
        "  start-up {:?} ms, idle RSS {} kB",
        r.startup_ms, r.rss_idle_kb
    );

    let peak = Arc::new(AtomicU64::new(r.rss_idle_kb));
    let sampler = {
        let (peak, pid) = (peak.clone(), srv.pid);
        tokio::spawn(async move {
            loop {
                if let Some(kb) = server::rss_kb(pid) {
                    peak.fetch_max(kb, Ordering::Relaxed);
                }
                tokio::time::sleep(Duration::from_millis(50)).await;
            }
        })
    };
    let ph = |name, connections| Phase {
        name,
        connections,
        warmup: o.warmup,
        measure: o.measure,
        max_requests: None,
        server_pid: Some(srv.pid),
    };
    let bare = phase(
        o,
        &srv,
        &mut r,
        ph("bare_static", 64),
        workloads::static_route(),
    )
    .await;
    phase(o, &srv, &mut r, ph("healthz", 64), workloads::healthz()).await;
    let calc = phase(o, &srv, &mut r, ph("calc", 64), workloads::calc()).await;
    if let (Some(c), Some(b)) = (&calc, &bare) {
        r.calc_over_bare = Some(c.per_second / b.per_second);
    }

    let due_phase = Phase {
        name: "due_http",
        connections: 1,
        warmup: Duration::ZERO,
        measure: o.measure.max(Duration::from_secs(2)) * 4,
        max_requests: Some(o.due_requests),
        server_pid: Some(srv.pid),
    };
    let due = phase(o, &srv, &mut r, due_phase, workloads::due(admin.clone())).await;
    if o.wants("due_raw") {
        let samples = due.as_ref().map_or(o.due_requests, |d| d.requests.max(3));
        due_raw(&pool, samples, &mut r).await?;
        if let (Some(d), Some(raw)) = (&due, r.phase("due_raw")) {
            r.due_http_over_raw_p99 = Some(d.p99_ms / raw.p99_ms.max(1e-6));
        }
    }

    let by_site = phase(
        o,
        &srv,
        &mut r,
        ph("due_site", 1),
        workloads::due_site(&fleet, admin.clone()),
    )
    .await;
    if o.wants("due_site_raw") {
        due_site_raw(&pool, &fleet.sites, o.measure, &mut r).await?;
        if let (Some(d), Some(raw)) = (&by_site, r.phase("due_site_raw")) {
            r.due_site_http_over_raw_p99 = Some(d.p99_ms / raw.p99_ms.max(1e-6));
        }
    }

    phase(
        o,
        &srv,
        &mut r,
        ph("cylinder_page", 32),
        workloads::cylinder_page(&fleet, admin.clone()),
    )
    .await;
    phase(
        o,
        &srv,
        &mut r,
        ph("fleet_page", 32),
        workloads::fleet_page(admin.clone()),
    )
    .await;
    phase(
        o,
        &srv,
        &mut r,
        ph("fleet_page_site", 32),
        workloads::fleet_page_site(&fleet, admin.clone()),
    )
    .await;
    phase(
        o,
        &srv,
        &mut r,
        ph("fleet_search", 32),
        workloads::fleet_search(&fleet, admin.clone()),
    )
    .await;
    let before_writes = server::database_bytes(&db);
    let run_id = time::OffsetDateTime::now_utc().unix_timestamp() as u64;
    let writes = phase(
        o,
        &srv,
        &mut r,
        ph("drift_writes", 16),
        workloads::drift_write(&fleet, tech.clone(), run_id),
    )
    .await;

    tokio::time::sleep(Duration::from_secs(2)).await;
    sampler.abort();
    r.rss_peak_kb = peak.load(Ordering::Relaxed);
    r.rss_after_load_kb = srv.rss_kb().unwrap_or(0);
    let mut srv = srv;
    srv.stop();
    pool.close().await;
    r.database_bytes_after_writes = server::database_bytes(&db);
    if let Some(w) = writes.filter(|w| w.ok > 0) {
        let grown = r.database_bytes_after_writes.saturating_sub(before_writes);
        r.bytes_per_written_test = Some(grown as f64 / w.ok as f64);
    }
    println!(
        "  peak RSS {} kB, after load {} kB",
        r.rss_peak_kb, r.rss_after_load_kb
    );
    r.load_average.push(server::load_average());
    if !o.keep {
        server::remove_database(&db);
    }
    Ok(r)
}

/// The due list straight from the storage layer on the same file (`samples` timed calls after
/// one warm-up call, as the HTTP phase's route check warmed the server).
async fn due_raw(pool: &loadhold::db::Db, samples: u64, r: &mut SizeResult) -> Result<(), String> {
    let query = loadhold::db::reports::DueQuery::new(time::OffsetDateTime::now_utc().date());
    let mut raw = Vec::new();
    let started = Instant::now();
    for i in 0..=samples {
        let t = Instant::now();
        let items = loadhold::db::reports::due_list(pool, &query)
            .await
            .map_err(|e| format!("due_list: {e}"))?;
        if i == 0 {
            r.due_items = items.len();
            if r.machines <= 10_000 {
                same_as_unfiltered(pool, &query, &items).await?;
            }
            continue;
        }
        raw.push(t.elapsed().as_micros().min(u128::from(u32::MAX)) as u32);
    }
    let raw = load::summarise("due_raw", raw, started.elapsed().as_secs_f64());
    println!(
        "  {:<16} p50 {:>8.2} ms  p99 {:>8.2} ms  ({} items)",
        raw.name, raw.p50_ms, raw.p99_ms, r.due_items
    );
    r.phases.insert("due_raw".into(), raw);
    Ok(())
}

/// The due list of one site straight from the storage layer, site after site (the HTTP
/// phase's order), for `measure` of wall time after one warm-up call.
async fn due_site_raw(
    pool: &loadhold::db::Db,
    sites: &[i64],
    measure: Duration,
    r: &mut SizeResult,
) -> Result<(), String> {
    let mut query = loadhold::db::reports::DueQuery::new(time::OffsetDateTime::now_utc().date());
    let mut raw = Vec::new();
    let started = Instant::now();
    let mut seq = 0u64;
    while seq == 0 || started.elapsed() < measure {
        query.filter.site_id = Some(workloads::site_of(sites, 5, 0, seq));
        let t = Instant::now();
        loadhold::db::reports::due_list(pool, &query)
            .await
            .map_err(|e| format!("due_list by site: {e}"))?;
        if seq > 0 {
            raw.push(t.elapsed().as_micros().min(u128::from(u32::MAX)) as u32);
        }
        seq += 1;
    }
    let raw = load::summarise("due_site_raw", raw, started.elapsed().as_secs_f64());
    println!(
        "  {:<16} p50 {:>8.2} ms  p99 {:>8.2} ms",
        raw.name, raw.p50_ms, raw.p99_ms
    );
    r.phases.insert("due_site_raw".into(), raw);
    Ok(())
}

/// The due list leaves out in SQL what cannot be due by its last day; on a generated fleet it
/// must equal every item of the fleet decided by `calc::due`, filtered and sorted the same way.
async fn same_as_unfiltered(
    pool: &loadhold::db::Db,
    query: &loadhold::db::reports::DueQuery,
    listed: &[loadhold::db::reports::DueItem],
) -> Result<(), String> {
    use loadhold::db::reports;
    let mut every: Vec<reports::DueItem> = reports::all_due(pool, query)
        .await
        .map_err(|e| format!("all_due: {e}"))?
        .into_iter()
        .filter(|i| i.due.is_listed())
        .collect();
    reports::sort(&mut every);
    if every.as_slice() != listed {
        let missing = every.iter().filter(|i| !listed.contains(i)).count();
        let extra = listed.iter().filter(|i| !every.contains(i)).count();
        return Err(format!(
            "the due list ({} items) differs from the whole fleet decided item by item \
             ({} items): {missing} missing, {extra} extra",
            listed.len(),
            every.len()
        ));
    }
    println!(
        "  due list checked against every item of the fleet: {} items, same",
        listed.len()
    );
    Ok(())
}
