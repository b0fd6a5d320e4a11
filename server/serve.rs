//! Serving the router on a TCP listener: one hyper HTTP/1.1 connection per client, with a
//! header-read timeout (a client that trickles its request headers is cut off instead of
//! holding a connection open for ever), the client's address for login throttling, and a
//! graceful shutdown that lets requests in flight finish.

use axum::Router;
use axum::extract::ConnectInfo;
use hyper::body::Incoming;
use hyper_util::rt::{TokioIo, TokioTimer};
use hyper_util::server::graceful::GracefulShutdown;
use std::future::Future;
use std::time::Duration;
use tokio::net::TcpListener;
use tower::ServiceExt;

/// A client must send its whole request head (request line and headers) within this time.
pub const HEADER_READ_TIMEOUT: Duration = Duration::from_secs(10);
/// After the shutdown signal, requests in flight get this long to finish.
const DRAIN: Duration = Duration::from_secs(30);

/// Serves `router` on `listener` until `shutdown` resolves, then drains open connections.
pub async fn run(listener: TcpListener, router: Router, shutdown: impl Future<Output = ()>) {
    let graceful = GracefulShutdown::new();
    tokio::pin!(shutdown);
    loop {
        let (stream, address) = tokio::select! {
            accepted = listener.accept() => match accepted {
                Ok(pair) => pair,
                Err(error) => {
                    // out of file descriptors and the like: wait a moment, keep serving
                    tracing::warn!(%error, "accept failed");
                    tokio::time::sleep(Duration::from_millis(50)).await;
                    continue;
                }
            },
            () = &mut shutdown => break,
        };
        let _ = stream.set_nodelay(true);
        let router = router.clone();
        let service = hyper::service::service_fn(move |mut request: hyper::Request<Incoming>| {
            request.extensions_mut().insert(ConnectInfo(address));
            router.clone().oneshot(request)
        });
        let connection = hyper::server::conn::http1::Builder::new()
            .timer(TokioTimer::new())
            .header_read_timeout(HEADER_READ_TIMEOUT)
            .serve_connection(TokioIo::new(stream), service);
        let connection = graceful.watch(connection);
        tokio::spawn(async move {
            if let Err(error) = connection.await {
                tracing::debug!(%error, "connection closed with an error");
            }
        });
    }
    drop(listener);
    if tokio::time::timeout(DRAIN, graceful.shutdown())
        .await
        .is_err()
    {
        tracing::warn!("connections still open after the drain time; closing them");
    }
}
