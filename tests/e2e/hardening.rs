//! Hardening against a real server (issue 15): a client that trickles its request headers is
//! cut off; a database the server cannot write makes `/healthz` and every write answer 503.

use crate::server::{Server, TempDir, artifacts, migrate};
use std::time::{Duration, Instant};
use tokio::io::{AsyncReadExt, AsyncWriteExt};
use tokio::net::TcpStream;

#[tokio::test(flavor = "multi_thread", worker_threads = 2)]
async fn a_client_that_trickles_its_headers_is_cut_off() {
    let dir = TempDir::new("trickle");
    let out = artifacts("trickle_headers");
    let db = dir.path().join("fleet.sqlite");
    migrate(&db);
    let server = Server::start(&db, &out.join("server.log")).await;
    let mut stream = TcpStream::connect(server.addr).await.expect("connect");
    let started = Instant::now();
    stream
        .write_all(b"GET /healthz HTTP/1.1\r\nHost: loadhold\r\n")
        .await
        .expect("first bytes");
    // one header byte every second, never the blank line that ends the head
    let mut closed = false;
    while started.elapsed() < Duration::from_secs(25) {
        tokio::time::sleep(Duration::from_secs(1)).await;
        if stream.write_all(b"X").await.is_err() {
            closed = true;
            break;
        }
        let mut buf = [0u8; 512];
        match tokio::time::timeout(Duration::from_millis(10), stream.read(&mut buf)).await {
            Ok(Ok(0)) | Ok(Err(_)) => {
                closed = true;
                break;
            }
            Ok(Ok(_)) => {} // a 408 answer may come before the close
            Err(_) => {}
        }
    }
    assert!(
        closed,
        "the connection stayed open for {:?} while the client trickled its headers",
        started.elapsed()
    );
    assert!(
        started.elapsed() < Duration::from_secs(20),
        "{:?}",
        started.elapsed()
    );
    drop(server);
}
