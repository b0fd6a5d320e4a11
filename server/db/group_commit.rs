//! Group commit for the busiest writes (drift tests from many tablets at once). A writer
//! queues its work and asks for the write lock; whoever holds the lock next runs everything
//! queued in one `BEGIN IMMEDIATE ... COMMIT`, so one fsync serves the whole group, then
//! answers each writer. Nothing is answered before its group's commit: a crash loses only
//! writes that were never acknowledged.
//!
//! A queued piece of work must leave no trace when it fails for its own reasons (a record not
//! found, a conflict): it checks before it writes, as the record stores do. A database error
//! fails the whole group; every writer in it gets the error and nothing of the group is kept.

use super::Db;
use crate::db::write::WriteError;
use sqlx::SqliteConnection;
use std::collections::HashMap;
use std::future::Future;
use std::path::PathBuf;
use std::pin::Pin;
use std::sync::{Arc, Mutex};
use tokio::sync::oneshot;

/// Tells a writer how its group ended: committed, or why not.
type Deliver = Box<dyn FnOnce(Result<(), &str>) + Send>;

/// Queued work, type-erased. `None`: a database error, already answered to its writer.
type Job = Box<
    dyn for<'c> FnOnce(
            &'c mut SqliteConnection,
        ) -> Pin<Box<dyn Future<Output = Option<Deliver>> + Send + 'c>>
        + Send,
>;

/// One database file's write lock and its queue of work for the next group.
#[derive(Default)]
pub(crate) struct Writer {
    pub(crate) lock: Arc<tokio::sync::Mutex<()>>,
    queue: Mutex<Vec<Job>>,
}

static WRITERS: Mutex<Option<HashMap<PathBuf, Arc<Writer>>>> = Mutex::new(None);

/// The writer of `db`'s file (the same for every pool opened on it in this process), so that
/// work queued for one database never runs in another's transaction.
pub(crate) fn writer(db: &Db) -> Arc<Writer> {
    // the file name as the pool was opened with it: no file-system call on the write path (a
    // second spelling of the same file would get a lock of its own, and then meet SQLite's
    // busy timeout as another process would)
    let path = db.connect_options().get_filename().to_path_buf();
    let mut all = WRITERS.lock().unwrap_or_else(|e| e.into_inner());
    all.get_or_insert_with(HashMap::new)
        .entry(path)
        .or_default()
        .clone()
}

/// Runs `work` inside a shared write transaction and answers once that transaction is
/// committed. The work runs on a task of its own, so a caller that goes away (a dropped
/// connection, the request timeout) cannot cut a group short.
pub async fn write<T, F>(db: &Db, work: F) -> Result<T, WriteError>
where
    T: Send + 'static,
    F: for<'c> FnOnce(
            &'c mut SqliteConnection,
        ) -> Pin<Box<dyn Future<Output = Result<T, WriteError>> + Send + 'c>>
        + Send
        + 'static,
{
    let (send, answer) = oneshot::channel::<Result<T, WriteError>>();
    let job: Job = Box::new(move |conn| {
        Box::pin(async move {
            match work(conn).await {
                Err(WriteError::Db(e)) => {
                    let _ = send.send(Err(WriteError::Db(e)));
                    None
                }
                result => Some(Box::new(move |committed: Result<(), &str>| {
                    let _ = send.send(match committed {
                        Ok(()) => result,
                        Err(why) => Err(WriteError::Db(sqlx::Error::Protocol(why.to_string()))),
                    });
                }) as Deliver),
            }
        })
    });
    let writer = writer(db);
    writer
        .queue
        .lock()
        .unwrap_or_else(|e| e.into_inner())
        .push(job);
    tokio::spawn(drain(db.clone(), writer));
    answer.await.unwrap_or_else(|_| {
        Err(WriteError::Db(sqlx::Error::Protocol(
            "the write could not be started; nothing was stored".into(),
        )))
    })
}

/// Takes the write lock and runs whatever is queued (possibly nothing: an earlier holder may
/// have run this writer's work already) as one transaction.
async fn drain(db: Db, writer: Arc<Writer>) {
    let _write = writer.lock.lock().await;
    let jobs = std::mem::take(&mut *writer.queue.lock().unwrap_or_else(|e| e.into_inner()));
    if jobs.is_empty() {
        return;
    }
    let mut tx = match db.begin_with("BEGIN IMMEDIATE").await {
        Ok(tx) => tx,
        Err(e) => {
            // dropping the jobs answers each writer that nothing was stored
            tracing::error!(error = %e, "group commit: could not begin");
            return;
        }
    };
    let mut delivers = Vec::with_capacity(jobs.len());
    let mut failed = false;
    // after a failure the jobs left are dropped unrun: each writer is told nothing was stored
    for job in jobs {
        match job(&mut tx).await {
            Some(deliver) => delivers.push(deliver),
            None => {
                failed = true;
                break;
            }
        }
    }
    let outcome = if failed {
        let _ = tx.rollback().await;
        Err("another write of its group hit a database error; nothing was stored")
    } else {
        match tx.commit().await {
            Ok(()) => Ok(()),
            Err(e) => {
                tracing::error!(error = %e, "group commit: commit failed");
                Err("the database could not commit; nothing was stored")
            }
        }
    };
    for deliver in delivers {
        deliver(outcome);
    }
}
