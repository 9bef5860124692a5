//! The Syzygy language server, started as `syz lsp` (stdio).
//!
//! A thin front end over the core: [`documents`] keeps open buffers as immutable snapshots,
//! [`project`] finds and reads the `syzygy.toml` of each (the core parses and layers it),
//! [`catalogue`] runs the core's checks between the files of the workspace folders,
//! [`server`] converts protocol requests into calls of `syzygy::ide` and back, [`convert`]
//! maps core data to protocol types, and [`transport`] filters stdin for the quirks of
//! tower-lsp 0.20. No language or physics logic lives here.

#![cfg_attr(test, allow(clippy::unwrap_used, clippy::indexing_slicing))]

pub mod capabilities;
pub mod catalogue;
pub mod convert;
pub mod documents;
pub mod gate;
pub mod project;
pub mod server;
pub mod transport;

use std::sync::atomic::Ordering;
use std::sync::Arc;
use tower_lsp::{LspService, Server};

/// Serve the protocol on stdin and stdout until `exit` or end of input. Returns the process
/// exit code: 0 after a `shutdown` request, 1 otherwise (as the protocol asks).
pub fn run_stdio() -> u8 {
    let runtime = match tokio::runtime::Builder::new_multi_thread()
        .worker_threads(2)
        .enable_all()
        .build()
    {
        Ok(rt) => rt,
        Err(e) => {
            eprintln!("syz lsp: cannot start the async runtime: {e}");
            return 2;
        }
    };
    let seen = Arc::new(transport::Seen::default());
    let seen2 = seen.clone();
    runtime.block_on(async move {
        let (to_server, from_filter) = tokio::io::duplex(1 << 16);
        let filter = tokio::spawn(transport::filter(tokio::io::stdin(), to_server, seen2));
        let (service, socket) = LspService::new(server::Backend::new);
        Server::new(from_filter, tokio::io::stdout(), socket)
            .serve(service)
            .await;
        filter.abort();
    });
    // The blocking thread that reads stdin may still be waiting; do not wait for it.
    runtime.shutdown_background();
    u8::from(!seen.shutdown.load(Ordering::SeqCst))
}
