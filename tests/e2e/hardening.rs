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

#[tokio::test(flavor = "multi_thread", worker_threads = 2)]
async fn a_user_name_cannot_forge_a_log_line_or_send_terminal_codes() {
    let dir = TempDir::new("logs");
    let out = artifacts("log_escaping");
    let db = dir.path().join("fleet.sqlite");
    migrate(&db);
    let log = out.join("server.log");
    let server = Server::start(&db, &log).await;
    // a line break, a forged log line and a terminal colour code in the user name
    let body = "username=mallory%0A2026-01-01T00:00:00Z%20INFO%20FORGED%20admin%20login\
                %1B%5B31m&password=not-the-password-1";
    let reply = server
        .http()
        .send(
            hyper::Method::POST,
            "/login",
            Some("application/x-www-form-urlencoded"),
            body.as_bytes().to_vec(),
        )
        .await
        .expect("login");
    assert_eq!(reply.status, 401);
    drop(server);
    let text = std::fs::read_to_string(&log).expect("server log");
    assert!(text.contains("mallory"), "the refusal is logged: {text}");
    assert!(
        !text
            .lines()
            .any(|l| l.contains("FORGED") && !l.contains("mallory")),
        "a log line was forged:\n{text}"
    );
    assert!(
        !text.contains('\u{1b}'),
        "a terminal escape code reached the log:\n{text}"
    );
    assert!(
        text.contains("\\n") && text.contains("\\u{1b}"),
        "shown escaped:\n{text}"
    );
}
