//! Connections: accepting them, capping how many are open at once, and closing the ones
//! that stall, so slow or idle clients cannot hold the server's sockets (and with them
//! its open-file limit) until even the health check goes unanswered.
//!
//! - At most `max_connections` are open; one more is closed as it is accepted (and
//!   logged), never queued, so the process stays below its file limit.
//! - A client has `header_timeout` to send a request's headers; the same timer closes a
//!   kept-alive connection that sits idle between requests (hyper's header-read timeout
//!   starts when the connection waits for the next request).
//! - Request bodies have an idle timeout and a deadline (`router::app`).
//!
//! HTTP/1.1 only: the server sits behind a reverse proxy or on a LAN, and HTTP/2's
//! streams would need limits of their own.

use std::net::SocketAddr;
use std::sync::Arc;
use std::time::Duration;

use axum::Router;
use axum::extract::ConnectInfo;
use hyper::body::Incoming;
use hyper_util::rt::{TokioIo, TokioTimer};
use hyper_util::server::graceful::GracefulShutdown;
use hyper_util::service::TowerToHyperService;
use tokio::net::TcpListener;
use tokio::sync::Semaphore;
use tower::ServiceExt as _;

/// How long open requests get to finish once the server is told to stop.
const SHUTDOWN_GRACE: Duration = Duration::from_secs(10);

/// The limits on connections.
#[derive(Debug, Clone, Copy)]
pub struct ConnectionLimits {
    pub max_connections: usize,
    pub header_timeout: Duration,
}

/// Serves `router` on every connection `listener` accepts until `stop` completes, then
/// lets open requests finish (for at most [`SHUTDOWN_GRACE`]).
pub async fn serve_connections(
    listener: TcpListener,
    router: Router,
    limits: ConnectionLimits,
    stop: impl std::future::Future<Output = ()>,
) {
    let mut http = hyper::server::conn::http1::Builder::new();
    http.timer(TokioTimer::new()).header_read_timeout(limits.header_timeout).keep_alive(true);
    let open = Arc::new(Semaphore::new(limits.max_connections.max(1)));
    let graceful = GracefulShutdown::new();
    tokio::pin!(stop);
    loop {
        let (stream, remote) = tokio::select! {
            accepted = listener.accept() => match accepted {
                Ok(accepted) => accepted,
                Err(err) => {
                    accept_failed(err).await;
                    continue;
                }
            },
            () = &mut stop => break,
        };
        let Ok(turn) = open.clone().try_acquire_owned() else {
            tracing::warn!(%remote, most = limits.max_connections, "connection closed: the most allowed are open");
            continue;
        };
        let _ = stream.set_nodelay(true);
        let service = router.clone().map_request(move |mut request: axum::http::Request<Incoming>| {
            request.extensions_mut().insert(ConnectInfo::<SocketAddr>(remote));
            request
        });
        let connection = graceful.watch(http.serve_connection(TokioIo::new(stream), TowerToHyperService::new(service)));
        tokio::spawn(async move {
            let _turn = turn;
            if let Err(err) = connection.await {
                tracing::debug!(%remote, error = %err, "connection ended with an error");
            }
        });
    }
    drop(listener);
    if tokio::time::timeout(SHUTDOWN_GRACE, graceful.shutdown()).await.is_err() {
        tracing::warn!("stopping: some requests were still open after {} s", SHUTDOWN_GRACE.as_secs());
    }
}

/// A failed accept: a client that went away is nothing; anything else (such as the
/// process's file limit) is logged and waited out for a moment rather than spun on.
async fn accept_failed(err: std::io::Error) {
    use std::io::ErrorKind::{ConnectionAborted, ConnectionRefused, ConnectionReset};
    if matches!(err.kind(), ConnectionRefused | ConnectionAborted | ConnectionReset) {
        return;
    }
    tracing::error!(error = %err, "accepting a connection failed");
    tokio::time::sleep(Duration::from_millis(200)).await;
}
