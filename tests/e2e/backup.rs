//! `loadhold backup --db PATH OUT` taken while clients write: each copy opens, passes
//! `PRAGMA integrity_check`, holds every record acknowledged before it began, and holds a
//! consistent prefix of each writer's records.

use crate::crash::{mixed, test_cylinder};
use crate::server::{Server, TempDir, artifacts, cli, create_token, migrate};
use crate::writers::{
    Ack, ack_count, assert_prefixes, integrity_check, spawn, stored_keys, wait_for_acks,
};
use std::sync::atomic::{AtomicBool, Ordering};
use std::sync::{Arc, Mutex};

#[tokio::test(flavor = "multi_thread", worker_threads = 2)]
async fn a_backup_taken_under_write_load_is_sound_and_holds_a_consistent_prefix() {
    let dir = TempDir::new("backup");
    let out = artifacts("backup_under_load");
    let db = dir.path().join("fleet.sqlite");
    migrate(&db);
    let token = create_token(&db, "backup writers", "manager");
    let server = Server::start(&db, &out.join("server.log")).await;
    let http = server.http().with_bearer(&token);
    let kinds = mixed(test_cylinder(&http).await);
    let ledger = Arc::new(Mutex::new(Default::default()));
    let stop = Arc::new(AtomicBool::new(false));
    let writers = spawn("b", &kinds, &http, &ledger, &stop);

    for round in 0..3 {
        wait_for_acks(&ledger, 40 * (round + 1), || server.log_tail()).await;
        let before: Vec<Ack> = ledger.lock().expect("ledger").acks.clone();
        let copy = dir.path().join(format!("backup-{round}.sqlite"));
        let (db_arg, copy_arg) = (db.display().to_string(), copy.display().to_string());
        let (ok, stdout, stderr) =
            tokio::task::spawn_blocking(move || cli(&["backup", "--db", &db_arg, &copy_arg], None))
                .await
                .expect("backup task");
        assert!(ok, "loadhold backup failed: {stdout}{stderr}");
        assert!(
            ack_count(&ledger) > before.len(),
            "the writers kept writing while backup {round} ran"
        );
        assert_eq!(
            integrity_check(&copy).await,
            vec!["ok".to_string()],
            "backup {round}"
        );
        let stored = stored_keys(&copy).await;
        for ack in &before {
            assert!(
                stored.contains(&ack.key),
                "backup {round} lacks {}, acknowledged before it began",
                ack.key
            );
        }
        assert_prefixes(&stored, &format!("in backup {round}"));
    }
    stop.store(true, Ordering::SeqCst);
    for writer in writers {
        writer.await.expect("writer task");
    }
    let unexpected = ledger.lock().expect("ledger").unexpected.clone();
    assert!(
        unexpected.is_empty(),
        "non-2xx answers under load: {unexpected:?}"
    );

    // A backup to an existing file name is refused rather than overwriting it.
    let existing = dir.path().join("backup-0.sqlite");
    let before = std::fs::read(&existing).expect("backup 0");
    let (ok, _, _) = cli(
        &[
            "backup",
            "--db",
            &db.display().to_string(),
            &existing.display().to_string(),
        ],
        None,
    );
    assert!(!ok, "backup over an existing file must fail");
    assert_eq!(
        std::fs::read(&existing).expect("backup 0"),
        before,
        "backup 0 untouched"
    );
    drop(server);
}
