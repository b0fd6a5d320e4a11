//! The scale generator behind `loadhold seed-demo --scale N`: N invented machines with about
//! four cylinders and six hose assemblies each and five years of inspections and drift tests,
//! for benchmarks. Deterministic: the same N on the same day gives the same rows.
//!
//! Fast by construction: one thread makes the rows (the drift tests go through the
//! engineering core, the costly part) while the caller's task writes them as multi-row
//! prepared INSERTs on one connection, a few thousand machines per transaction, parents
//! before children (see `batch::Writer`). It writes straight into the tables: no audit rows
//! (the records are generated, not entered by anyone).

mod batch;
mod drift;
mod fleet;
mod history;
mod kinds;
mod machine;
mod rng;
mod tables;

use crate::db::Db;
use batch::{Table, Val, Writer};
use history::ProcedureSim;
use sqlx::{Connection, SqliteConnection};
use std::time::Instant;
use time::{Date, OffsetDateTime};

/// The generator's seed ("LOADHOLD" in ASCII).
pub const SEED: u64 = 0x4C4F_4144_484F_4C44;

/// Machines per message from the row-making thread.
const MESSAGE_MACHINES: u64 = 200;
/// Machines per transaction.
const TRANSACTION_MACHINES: u64 = 5_000;

/// Rows on their way to the writer, each with its table.
pub type Rows = Vec<(Table, Vec<Val>)>;

/// How many rows of each kind were made.
#[derive(Clone, Debug, Default, PartialEq)]
pub struct Counts {
    pub sites: u64,
    pub machines: u64,
    pub cylinders: u64,
    pub hoses: u64,
    pub inspections: u64,
    pub drift_tests: u64,
    /// Drift tests the engineering core refused (none expected; counted, never hidden).
    pub refused: u64,
}

/// The next id of each table.
#[derive(Clone, Debug)]
pub struct Ids {
    pub machine: i64,
    pub cylinder: i64,
    pub hose: i64,
    pub inspection: i64,
    pub drift: i64,
}

/// What a run made and how long it took.
#[derive(Clone, Debug)]
pub struct Summary {
    pub counts: Counts,
    pub as_of: Date,
    pub seconds: f64,
}

impl Summary {
    /// One line for the command line.
    pub fn line(&self) -> String {
        let c = &self.counts;
        let rows = c.sites + c.machines + c.cylinders + c.hoses + c.inspections + c.drift_tests;
        let mut text = format!(
            "generated {} machines on {} sites: {} cylinders, {} hose assemblies, {} inspections, \
             {} drift tests ({} rows) as of {} in {:.1} s ({:.0} rows/s)",
            c.machines,
            c.sites,
            c.cylinders,
            c.hoses,
            c.inspections,
            c.drift_tests,
            rows,
            self.as_of,
            self.seconds,
            rows as f64 / self.seconds.max(1e-9),
        );
        if c.refused > 0 {
            text.push_str(&format!(
                "; {} drift tests refused by the core and left out",
                c.refused
            ));
        }
        text
    }
}

/// `seed-demo --scale N`: generates N machines as of today (UTC) and returns the summary line.
pub async fn generate(db: &Db, n: u32) -> Result<String, String> {
    let today = OffsetDateTime::now_utc().date();
    generate_as_of(db, n, today).await.map(|s| s.line())
}

/// Generates N machines with five years of history ending on `today`, into a database with
/// no machines yet.
pub async fn generate_as_of(db: &Db, n: u32, today: Date) -> Result<Summary, String> {
    let started = Instant::now();
    if n == 0 {
        return Err("--scale must be at least 1 machine".into());
    }
    let db_error = |e: sqlx::Error| format!("database error while generating: {e}");
    let mut conn = db.acquire().await.map_err(db_error)?;
    let machines: i64 = sqlx::query_scalar("SELECT COUNT(*) FROM machines")
        .fetch_one(&mut *conn)
        .await
        .map_err(db_error)?;
    if machines > 0 {
        return Err(format!(
            "the database already holds {machines} machines; generate into a fresh file"
        ));
    }
    let first_site: i64 = sqlx::query_scalar("SELECT COALESCE(MAX(id), 0) + 1 FROM sites")
        .fetch_one(&mut *conn)
        .await
        .map_err(db_error)?;
    let first_procedure: i64 =
        sqlx::query_scalar("SELECT COALESCE(MAX(id), 0) + 1 FROM test_procedures")
            .fetch_one(&mut *conn)
            .await
            .map_err(db_error)?;
    let ctx = machine::Ctx {
        seed: SEED,
        today,
        sites: fleet::sites(SEED, fleet::site_count(n), first_site),
        procedures: procedures(first_procedure),
    };
    // A larger page cache for this connection while it loads (about 256 MB), back after.
    sqlx::query("PRAGMA cache_size = -262144")
        .execute(&mut *conn)
        .await
        .map_err(db_error)?;
    let result = load(&mut conn, ctx, u64::from(n)).await;
    let _ = sqlx::query("PRAGMA cache_size = -2000")
        .execute(&mut *conn)
        .await;
    let mut counts = result?;
    counts.sites = fleet::site_count(n) as u64;
    // Fold the write-ahead log into the database file so its size is the data's.
    sqlx::query("PRAGMA wal_checkpoint(TRUNCATE)")
        .execute(&mut *conn)
        .await
        .map_err(db_error)?;
    Ok(Summary {
        counts,
        as_of: today,
        seconds: started.elapsed().as_secs_f64(),
    })
}

/// One message from the row-making thread: how many machines, their rows (parents first), and
/// the (machine, failed inspection) links to set once the inspections are written.
type Message = (u64, Rows, Vec<(i64, i64)>);

/// Writes the sites and procedures, then the machines as the row-making thread sends them.
async fn load(conn: &mut SqliteConnection, ctx: machine::Ctx, n: u64) -> Result<Counts, String> {
    let db_error = |e: sqlx::Error| format!("database error while generating: {e}");
    let mut writer = Writer::new(&tables::ORDER);
    let mut tx = conn.begin_with("BEGIN IMMEDIATE").await.map_err(db_error)?;
    let opened = stamp_of(ctx.today - fleet::days(5 * 365 + 100));
    for site in &ctx.sites {
        let row = vec![
            site.id.into(),
            site.name.clone().into(),
            site.units.into(),
            opened.clone().into(),
            opened.clone().into(),
        ];
        writer
            .push(&mut tx, tables::SITES, row)
            .await
            .map_err(db_error)?;
    }
    for (plan, p) in kinds::KINDS.iter().zip(&ctx.procedures) {
        writer
            .push(&mut tx, tables::PROCEDURES, procedure_row(plan, p, &opened))
            .await
            .map_err(db_error)?;
    }
    writer.flush(&mut tx).await.map_err(db_error)?;

    let (sender, mut receiver) = tokio::sync::mpsc::channel::<Message>(4);
    let maker = std::thread::spawn(move || {
        let mut ids = Ids {
            machine: 1,
            cylinder: 1,
            hose: 1,
            inspection: 1,
            drift: 1,
        };
        let mut counts = Counts::default();
        let mut index = 0;
        while index < n {
            let end = (index + MESSAGE_MACHINES).min(n);
            let mut rows = Rows::new();
            let mut links = Vec::new();
            for i in index..end {
                machine::machine(&ctx, i, &mut ids, &mut rows, &mut links, &mut counts);
            }
            if sender.blocking_send((end - index, rows, links)).is_err() {
                break;
            }
            index = end;
        }
        counts
    });

    let mut since_commit = 0;
    while let Some((machines, rows, links)) = receiver.recv().await {
        for (table, row) in rows {
            writer.push(&mut tx, table, row).await.map_err(db_error)?;
        }
        writer.flush(&mut tx).await.map_err(db_error)?;
        for (machine, inspection) in links {
            sqlx::query("UPDATE machines SET out_of_service_inspection_id = ? WHERE id = ?")
                .bind(inspection)
                .bind(machine)
                .execute(&mut *tx)
                .await
                .map_err(db_error)?;
        }
        since_commit += machines;
        if since_commit >= TRANSACTION_MACHINES {
            tx.commit().await.map_err(db_error)?;
            tx = conn.begin_with("BEGIN IMMEDIATE").await.map_err(db_error)?;
            since_commit = 0;
        }
    }
    tx.commit().await.map_err(db_error)?;
    maker
        .join()
        .map_err(|_| "the row-making thread stopped unexpectedly".to_string())
}

fn stamp_of(day: Date) -> String {
    fleet::stamp(day, 8, 0)
}

/// One drift procedure per machine kind: 10 minutes held at rated load, the kind's limit per
/// 10 minutes, oil between 40 and 60 degC, mineral oil's expansion (invented procedures).
fn procedures(first_id: i64) -> Vec<ProcedureSim> {
    kinds::KINDS
        .iter()
        .enumerate()
        .map(|(i, plan)| ProcedureSim {
            id: first_id + i as i64,
            limit_distance: plan.limit_mm / 1000.0,
            per: 600.0,
            duration: 600.0,
            oil_min_k: 313.15,
            oil_max_k: 333.15,
            expansion: 7e-4,
        })
        .collect()
}

fn procedure_row(plan: &kinds::KindPlan, p: &ProcedureSim, created: &str) -> Vec<Val> {
    vec![
        p.id.into(),
        "drift".into(),
        format!("{} hold test", plan.kind).into(),
        plan.kind.into(),
        "rated load".into(),
        "cylinder at mid-stroke, engine off, valve centred".into(),
        "rod exposed length, chalk mark to the gland face".into(),
        p.oil_min_k.into(),
        p.oil_max_k.into(),
        p.duration.into(),
        p.limit_distance.into(),
        p.per.into(),
        p.expansion.into(),
        created.into(),
        "scale-generator".into(),
        created.into(),
    ]
}
