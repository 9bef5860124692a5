//! When diagnostics are computed after a change: at once, one analysis of a document at a
//! time.
//!
//! A change whose document has no analysis running is analysed straight away, with no delay
//! waiting for more typing. Changes that come while an analysis runs wait for it to end, and
//! then only the newest of them is analysed (the others find they were overtaken and stop),
//! so a burst of changes (a paste, fast typing on a large file) costs at most two analyses:
//! the one running when it began and the newest change's. A fixed or adaptive delay did the
//! same coalescing but kept every single keystroke waiting for it.

use std::collections::HashMap;
use std::sync::{Arc, Mutex};
use tower_lsp::lsp_types::Url;

/// One gate per open document: holding it is running that document's analysis.
#[derive(Default)]
pub struct Gates(Mutex<HashMap<Url, Arc<tokio::sync::Mutex<()>>>>);

impl Gates {
    /// The document's gate (the same one for every caller until the document is closed).
    /// tokio's mutex is fair: waiters get it in the order they asked, so the newest change
    /// is the last to pass and finds itself current.
    pub fn of(&self, uri: &Url) -> Arc<tokio::sync::Mutex<()>> {
        let mut gates = self.0.lock().unwrap_or_else(|e| e.into_inner());
        gates.entry(uri.clone()).or_default().clone()
    }

    /// Forget a closed document's gate (an analysis still holding it finishes undisturbed).
    pub fn forget(&self, uri: &Url) {
        let mut gates = self.0.lock().unwrap_or_else(|e| e.into_inner());
        gates.remove(uri);
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use std::sync::atomic::{AtomicU64, Ordering};

    /// A document's changes pass one at a time and only the newest waiting one is analysed;
    /// another document's gate is not held up by the first.
    #[tokio::test(flavor = "multi_thread", worker_threads = 2)]
    async fn changes_pass_one_at_a_time_and_only_the_newest_waiting_is_analysed() {
        let gates = Arc::new(Gates::default());
        let a = Url::parse("file:///a.syz").unwrap();
        let b = Url::parse("file:///b.syz").unwrap();
        assert!(Arc::ptr_eq(&gates.of(&a), &gates.of(&a)));
        // Generation 1 is being analysed (its gate held) while 2, 3 and 4 arrive.
        let current = Arc::new(AtomicU64::new(1));
        let running = gates.of(&a).lock_owned().await;
        let analysed = Arc::new(Mutex::new(Vec::new()));
        let mut waiting = Vec::new();
        for generation in 2..=4u64 {
            current.store(generation, Ordering::SeqCst);
            let (gate, current, analysed) = (gates.of(&a), current.clone(), analysed.clone());
            waiting.push(tokio::spawn(async move {
                let _held = gate.lock().await;
                if current.load(Ordering::SeqCst) == generation {
                    analysed.lock().unwrap().push(generation);
                }
            }));
            tokio::task::yield_now().await;
        }
        // Another document is not held up.
        assert!(gates.of(&b).try_lock().is_ok());
        assert!(
            analysed.lock().unwrap().is_empty(),
            "nothing passes while 1 runs"
        );
        drop(running);
        for w in waiting {
            w.await.unwrap();
        }
        assert_eq!(*analysed.lock().unwrap(), vec![4]);
        let before = gates.of(&a);
        gates.forget(&a);
        assert!(
            !Arc::ptr_eq(&before, &gates.of(&a)),
            "a closed document's gate is let go"
        );
    }
}
