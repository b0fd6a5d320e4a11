//! Crash safety: several clients write machines and drift tests through real HTTP, the server
//! is SIGKILLed in the middle, and every acknowledged (2xx) record must be there after a
//! restart on the same file, with `PRAGMA integrity_check` = ok.

use crate::http::Http;
use crate::server::{Server, TempDir, artifacts, create_token, migrate};
use crate::writers::{
    Kind, assert_prefixes, check_acknowledged, integrity_check, spawn, stored_keys, wait_for_acks,
};
use serde_json::json;
use std::sync::atomic::AtomicBool;
use std::sync::{Arc, Mutex};

/// A machine with one cylinder to hold drift tests; returns the cylinder's id.
pub async fn test_cylinder(http: &Http) -> i64 {
    let machine = http
        .post_json(
            "/api/v1/machines",
            &json!({"unit_number": "RIG-1", "kind": "boom lift"}),
        )
        .await
        .expect("machine");
    assert_eq!(machine.status, 201, "{}", machine.text());
    let cylinder = http
        .post_json(
            "/api/v1/cylinders",
            &json!({"machine_id": machine.json()["id"], "function": "Boom lift (test data)",
                    "bore": "100 mm", "rod": "56 mm", "stroke": "900 mm",
                    "load_direction": "retract", "max_load": "40 kN"}),
        )
        .await
        .expect("cylinder");
    assert_eq!(cylinder.status, 201, "{}", cylinder.text());
    cylinder.json()["id"].as_i64().expect("cylinder id")
}

/// Three machine writers and three drift-test writers.
pub fn mixed(cylinder_id: i64) -> Vec<Kind> {
    let drift = Kind::DriftTest { cylinder_id };
    vec![
        Kind::Machine,
        drift,
        Kind::Machine,
        drift,
        Kind::Machine,
        drift,
    ]
}

/// How many acknowledgements to wait for before the kill: varies from round to round so the
/// kill lands at different points of the request cycle.
fn kill_after(round: usize) -> usize {
    let jitter = std::time::SystemTime::now()
        .duration_since(std::time::UNIX_EPOCH)
        .map(|d| d.subsec_nanos() as usize % 50)
        .unwrap_or(0);
    60 + 40 * round + jitter
}

#[tokio::test(flavor = "multi_thread", worker_threads = 2)]
async fn every_acknowledged_record_survives_sigkills_mid_write() {
    let dir = TempDir::new("crash");
    let out = artifacts("crash_sigkill");
    let db = dir.path().join("fleet.sqlite");
    migrate(&db);
    let token = create_token(&db, "crash writers", "manager");
    let mut acked = Vec::new();
    let mut unanswered_kept = 0;
    let mut kinds = Vec::new();
    // Three crashes on the same file, each with six writers busy.
    for round in 0..3 {
        let mut server = Server::start(&db, &out.join(format!("server-{round}.log"))).await;
        let http = server.http().with_bearer(&token);
        if round == 0 {
            kinds = mixed(test_cylinder(&http).await);
        } else {
            check_acknowledged(&http, &acked, &format!("restart {round}")).await;
        }
        let ledger = Arc::new(Mutex::new(Default::default()));
        let stop = Arc::new(AtomicBool::new(false));
        let writers = spawn(&format!("r{round}"), &kinds, &http, &ledger, &stop);
        wait_for_acks(&ledger, kill_after(round), || server.log_tail()).await;
        server.kill();
        for writer in writers {
            writer.await.expect("writer task");
        }
        let ledger = std::mem::take(&mut *ledger.lock().expect("ledger"));
        assert!(
            ledger.unexpected.is_empty(),
            "non-2xx answers before the kill: {:?}",
            ledger.unexpected
        );
        assert!(
            ledger
                .acks
                .iter()
                .any(|a| matches!(a.kind, Kind::DriftTest { .. }))
                && ledger.acks.iter().any(|a| matches!(a.kind, Kind::Machine)),
            "both kinds of record were written in round {round}"
        );
        acked.extend(ledger.acks);
        // Right after the kill the file is sound, holds every acknowledged record, and each
        // writer's records are a gap-free prefix of what it sent.
        assert_eq!(
            integrity_check(&db).await,
            vec!["ok".to_string()],
            "round {round}"
        );
        let stored = stored_keys(&db).await;
        for ack in &acked {
            assert!(
                stored.contains(&ack.key),
                "round {round}: acknowledged {} is not in the file",
                ack.key
            );
        }
        assert_prefixes(&stored, &format!("after crash {round}"));
        unanswered_kept = stored.len() - acked.len();
    }
    let server = Server::start(&db, &out.join("server-final.log")).await;
    check_acknowledged(&server.http().with_bearer(&token), &acked, "final restart").await;
    eprintln!(
        "crash: {} acknowledged records over 3 SIGKILLs all kept; {unanswered_kept} writes in \
         flight at the kills were committed without an answer",
        acked.len()
    );
}

#[tokio::test]
async fn the_storage_layer_commits_with_a_full_fsync_in_wal_mode() {
    // A SIGKILL leaves the page cache intact, so the test above cannot see a dropped fsync;
    // this one checks the settings that make a commit durable against power loss.
    let dir = TempDir::new("durability");
    let pool = loadhold::db::connect(&dir.path().join("d.sqlite"))
        .await
        .expect("connect");
    let synchronous: i64 = sqlx::query_scalar("PRAGMA synchronous")
        .fetch_one(&pool)
        .await
        .expect("synchronous");
    let journal: String = sqlx::query_scalar("PRAGMA journal_mode")
        .fetch_one(&pool)
        .await
        .expect("journal_mode");
    pool.close().await;
    // SQLite's values: 0 OFF, 1 NORMAL, 2 FULL, 3 EXTRA (sqlite.org/pragma.html#pragma_synchronous).
    assert!(
        synchronous >= 2,
        "PRAGMA synchronous = {synchronous}, want FULL (2) or EXTRA (3)"
    );
    assert_eq!(journal, "wal");
}

#[tokio::test(flavor = "multi_thread", worker_threads = 2)]
async fn concurrent_edits_of_one_machine_are_all_answered_without_a_server_error() {
    // A read-then-write transaction that starts as a reader must not fail with "database is
    // locked" when another writer commits first: each edit must wait its turn instead.
    let dir = TempDir::new("edits");
    let out = artifacts("crash_concurrent_edits");
    let db = dir.path().join("fleet.sqlite");
    migrate(&db);
    let token = create_token(&db, "editors", "manager");
    let server = Server::start(&db, &out.join("server.log")).await;
    let http = server.http().with_bearer(&token);
    let made = http
        .post_json(
            "/api/v1/machines",
            &json!({"unit_number": "EDIT-1", "kind": "forklift"}),
        )
        .await
        .expect("create");
    assert_eq!(made.status, 201, "{}", made.text());
    let id = made.json()["id"].as_i64().expect("id");
    let mut editors = Vec::new();
    for client in 0..6 {
        let http = http.clone();
        editors.push(tokio::spawn(async move {
            let mut answers = Vec::new();
            for i in 0..25 {
                let body =
                    json!({"description": format!("edit {i} by client {client} (test data)")});
                let reply = http
                    .send(
                        hyper::Method::PATCH,
                        &format!("/api/v1/machines/{id}"),
                        Some("application/json"),
                        body.to_string().into_bytes(),
                    )
                    .await
                    .expect("PATCH");
                answers.push((reply.status, reply.text()));
            }
            answers
        }));
    }
    let mut failed = Vec::new();
    for editor in editors {
        for (status, text) in editor.await.expect("editor") {
            if status != 200 {
                failed.push(format!("{status}: {text}"));
            }
        }
    }
    assert!(
        failed.is_empty(),
        "{} of 150 concurrent edits failed, e.g. {:?}\n{}",
        failed.len(),
        failed.first(),
        server.log_tail()
    );
}
