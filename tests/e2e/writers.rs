//! Clients that write records through real HTTP one after another, keeping a ledger of what
//! the server acknowledged; and read-only looks into the SQLite file they wrote to.

use crate::http::Http;
use serde_json::{Value, json};
use sqlx::sqlite::SqliteConnectOptions;
use sqlx::{ConnectOptions, Connection};
use std::collections::{BTreeMap, BTreeSet};
use std::path::Path;
use std::sync::atomic::{AtomicBool, Ordering};
use std::sync::{Arc, Mutex};
use std::time::{Duration, Instant};

/// What a writer writes.
#[derive(Clone, Copy, Debug)]
pub enum Kind {
    /// `POST /api/v1/machines`, keyed by unit number.
    Machine,
    /// `POST /api/v1/cylinders/{id}/drift-tests`, keyed by client token.
    DriftTest { cylinder_id: i64 },
}

impl Kind {
    fn post(self, key: &str) -> (String, Value) {
        match self {
            Kind::Machine => (
                "/api/v1/machines".into(),
                json!({"unit_number": key, "kind": "scissor lift",
                       "description": "crash-safety writer (test data)"}),
            ),
            Kind::DriftTest { cylinder_id } => (
                format!("/api/v1/cylinders/{cylinder_id}/drift-tests"),
                json!({"client_token": key, "technician": "crash writer (test data)",
                       "duration": "10 min", "drift": "1.2 mm",
                       "oil_temperature_start": "45 degC", "oil_temperature_end": "44 degC",
                       "limit": {"distance": "5 mm", "per": "10 min"}}),
            ),
        }
    }

    /// Where an acknowledged record reads back, and the field holding its key.
    pub fn read_back(self, id: i64) -> (String, &'static str) {
        match self {
            Kind::Machine => (format!("/api/v1/machines/{id}"), "unit_number"),
            Kind::DriftTest { .. } => (format!("/api/v1/drift-tests/{id}"), "client_token"),
        }
    }
}

/// A record the server acknowledged with 2xx.
#[derive(Clone, Debug)]
pub struct Ack {
    pub kind: Kind,
    pub id: i64,
    pub key: String,
}

/// What the writers saw: acknowledgements, and any answer that was neither 2xx nor a
/// dropped connection (those are bugs: a busy database must not surface as an error).
#[derive(Default)]
pub struct Ledger {
    pub acks: Vec<Ack>,
    pub unexpected: Vec<String>,
}

pub type Shared = Arc<Mutex<Ledger>>;

/// `CRASH-<writer>-<seq>`: the key of a writer's `seq`th record.
pub fn key(writer: &str, seq: usize) -> String {
    format!("CRASH-{writer}-{seq:05}")
}

/// One client: posts records one after another until told to stop or the server is gone.
pub async fn writer(http: Http, kind: Kind, name: String, ledger: Shared, stop: Arc<AtomicBool>) {
    for seq in 0.. {
        if stop.load(Ordering::SeqCst) {
            return;
        }
        let key = key(&name, seq);
        let (path, body) = kind.post(&key);
        match http.post_json(&path, &body).await {
            Ok(reply) if (200..300).contains(&reply.status) => {
                let mut ledger = ledger.lock().expect("ledger");
                match reply.json()["id"].as_i64() {
                    Some(id) => ledger.acks.push(Ack { kind, id, key }),
                    None => ledger
                        .unexpected
                        .push(format!("2xx without an id: {}", reply.text())),
                }
            }
            Ok(reply) => {
                let mut ledger = ledger.lock().expect("ledger");
                ledger
                    .unexpected
                    .push(format!("{} for {key}: {}", reply.status, reply.text()));
                return;
            }
            // The server is gone (killed mid-request): this client stops.
            Err(_) => return,
        }
    }
}

/// Starts one writer per kind given, named `<prefix>c<n>`.
pub fn spawn(
    prefix: &str,
    kinds: &[Kind],
    http: &Http,
    ledger: &Shared,
    stop: &Arc<AtomicBool>,
) -> Vec<tokio::task::JoinHandle<()>> {
    kinds
        .iter()
        .enumerate()
        .map(|(n, kind)| {
            tokio::spawn(writer(
                http.clone(),
                *kind,
                format!("{prefix}c{n}"),
                ledger.clone(),
                stop.clone(),
            ))
        })
        .collect()
}

pub fn ack_count(ledger: &Shared) -> usize {
    ledger.lock().expect("ledger").acks.len()
}

/// Waits until `at_least` records are acknowledged; fails on any unexpected answer.
pub async fn wait_for_acks(ledger: &Shared, at_least: usize, log: impl Fn() -> String) {
    let deadline = Instant::now() + Duration::from_secs(120);
    while ack_count(ledger) < at_least {
        let unexpected = ledger.lock().expect("ledger").unexpected.clone();
        assert!(
            unexpected.is_empty(),
            "writes failed: {unexpected:?}\n{}",
            log()
        );
        assert!(
            Instant::now() < deadline,
            "only {} acknowledged writes in 120 s\n{}",
            ack_count(ledger),
            log()
        );
        tokio::time::sleep(Duration::from_millis(2)).await;
    }
}

async fn open_read_only(path: &Path) -> sqlx::SqliteConnection {
    SqliteConnectOptions::new()
        .filename(path)
        .read_only(true)
        .connect()
        .await
        .unwrap_or_else(|e| panic!("open {}: {e}", path.display()))
}

/// `PRAGMA integrity_check` of a SQLite file, opened read-only.
pub async fn integrity_check(path: &Path) -> Vec<String> {
    let mut conn = open_read_only(path).await;
    let rows: Vec<String> = sqlx::query_scalar("PRAGMA integrity_check")
        .fetch_all(&mut conn)
        .await
        .expect("integrity_check");
    let _ = conn.close().await;
    rows
}

/// Every crash-test key stored in a SQLite file (machines' unit numbers, drift tests' tokens).
pub async fn stored_keys(path: &Path) -> BTreeSet<String> {
    let mut conn = open_read_only(path).await;
    let mut keys: BTreeSet<String> = sqlx::query_scalar::<_, String>(
        "SELECT unit_number FROM machines WHERE unit_number LIKE 'CRASH-%'",
    )
    .fetch_all(&mut conn)
    .await
    .expect("read machines")
    .into_iter()
    .collect();
    keys.extend(
        sqlx::query_scalar::<_, String>(
            "SELECT client_token FROM drift_tests WHERE client_token LIKE 'CRASH-%'",
        )
        .fetch_all(&mut conn)
        .await
        .expect("read drift tests"),
    );
    let _ = conn.close().await;
    keys
}

/// Every writer's stored records are 0..n with no gap (a writer sends its next record only
/// once the previous one was answered, so a gap is a lost acknowledged write).
pub fn assert_prefixes(stored: &BTreeSet<String>, when: &str) {
    let mut by_writer: BTreeMap<&str, Vec<usize>> = BTreeMap::new();
    for key in stored {
        let mut parts = key.trim_start_matches("CRASH-").split('-');
        let writer = parts.next().expect("writer");
        let seq = parts.next().and_then(|s| s.parse().ok()).expect("seq");
        by_writer.entry(writer).or_default().push(seq);
    }
    for (writer, mut seqs) in by_writer {
        seqs.sort_unstable();
        let expected: Vec<usize> = (0..seqs.len()).collect();
        assert_eq!(
            seqs, expected,
            "writer {writer}'s records {when} have a gap"
        );
    }
}

/// Every acknowledged record reads back through the API with its key.
pub async fn check_acknowledged(http: &Http, acked: &[Ack], when: &str) {
    let mut missing = Vec::new();
    for ack in acked {
        let (path, field) = ack.kind.read_back(ack.id);
        let reply = http.get(&path).await.expect("GET after restart");
        if reply.status != 200 || reply.json()[field] != ack.key.as_str() {
            missing.push(format!("{} ({path}): {}", ack.key, reply.status));
        }
    }
    assert!(
        missing.is_empty(),
        "{when}: {} of {} acknowledged records lost: {missing:?}",
        missing.len(),
        acked.len()
    );
}
