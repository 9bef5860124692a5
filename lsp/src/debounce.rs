//! How long diagnostics wait after a change: half the document's last analysis time.

use std::collections::HashMap;
use std::sync::Mutex;
use std::time::Duration;
use tower_lsp::lsp_types::Url;

/// How long diagnostics wait for more typing before they are computed, given how long an
/// analysis of the document has been taking: half of it, between 1 and 50 ms. A change that
/// comes within that time replaces the one waiting, so a burst of changes (a paste, fast
/// typing on a large file) costs one analysis; a small file, analysed in a millisecond or
/// two, is not kept waiting for a fixed delay.
pub fn debounce_for(analysis: Duration) -> Duration {
    (analysis / 2).clamp(Duration::from_millis(1), Duration::from_millis(50))
}

/// How long the last analysis of each document took (a document not analysed yet is
/// assumed to take 20 ms): the last time rather than a mean, because an edit that re-derives
/// one system costs a hundredth of the first analysis of a large file, and the delay should
/// follow at once.
#[derive(Default)]
pub struct AnalysisTimes(Mutex<HashMap<Url, Duration>>);

impl AnalysisTimes {
    pub fn get(&self, uri: &Url) -> Duration {
        let times = self.0.lock().unwrap_or_else(|e| e.into_inner());
        times.get(uri).copied().unwrap_or(Duration::from_millis(20))
    }

    pub fn record(&self, uri: &Url, took: Duration) {
        let mut times = self.0.lock().unwrap_or_else(|e| e.into_inner());
        times.insert(uri.clone(), took);
    }

    pub fn forget(&self, uri: &Url) {
        let mut times = self.0.lock().unwrap_or_else(|e| e.into_inner());
        times.remove(uri);
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_debounce_follows_the_analysis_time() {
        let ms = Duration::from_millis;
        assert_eq!(debounce_for(ms(10)), ms(5));
        assert_eq!(debounce_for(Duration::from_micros(300)), ms(1));
        assert_eq!(debounce_for(ms(400)), ms(50));
        let times = AnalysisTimes::default();
        let (a, b) = (
            Url::parse("file:///a.syz").unwrap(),
            Url::parse("file:///b.syz").unwrap(),
        );
        assert_eq!(times.get(&a), ms(20));
        times.record(&a, ms(900));
        times.record(&b, ms(2));
        times.record(&a, ms(8));
        assert_eq!((times.get(&a), times.get(&b)), (ms(8), ms(2)));
        times.forget(&a);
        assert_eq!(times.get(&a), ms(20));
    }
}
