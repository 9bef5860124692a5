//! Adaptive Monte Carlo: draw until the results are stable (JCGM 101:2008, the Monte Carlo
//! supplement to the GUM, 7.9).
//!
//! The supplement's procedure draws batches of M trials until twice the standard deviation
//! of each result (the estimate, its standard uncertainty and the interval ends) is within
//! the numerical tolerance of the digits reported: half a unit of the last of `n_dig`
//! significant digits of the standard uncertainty (7.9.2). Here the results are each derived
//! value's median and 16th and 84th percentiles, `n_dig` is 2 (the digits every output
//! shows), and the standard error of each comes from order statistics of all the samples
//! drawn so far ([`super::value::Precision`]) rather than from the scatter of batch means;
//! both estimate the same thing, and order statistics need no minimum batch count.
//!
//! The sample count doubles from 10^4 until every value is stable or the most allowed is
//! reached ([`ADAPTIVE_MOST`], or fewer for a system so large that memory bounds its
//! samples). Draws are streams of the same seeds, so the first `n` samples of a run of `2n`
//! are those of the run of `n`: each doubling adds a new batch of draws, and all of them
//! are used.

use super::*;

impl<'m> Derivation<'m> {
    pub(super) fn run_adaptive(
        sys: &'m System,
        options: &Options,
        lines: &'m sources::Lines,
    ) -> Derivation<'m> {
        let (most, _) = samples_for(sys, ADAPTIVE_MOST);
        let mut once = options.clone();
        once.adaptive = false;
        once.samples = options.samples.clamp(1, most);
        loop {
            let mut d = Derivation::run_once(sys, &once, lines);
            let unstable = d.unstable();
            if unstable.is_empty() || once.samples >= most {
                let n = d.options.samples;
                let words = if unstable.is_empty() {
                    format!(
                        "Monte Carlo drew {n} samples, until every derived value's median and \
                         16th-84th percentiles were stable to the second significant digit of \
                         its standard uncertainty (adaptive, JCGM 101:2008 7.9)"
                    )
                } else {
                    let names: Vec<String> =
                        unstable.iter().take(5).map(|k| d.key_name(*k)).collect();
                    format!(
                        "Monte Carlo stopped at {n} samples, the most drawn for this system, \
                         before every value was stable to the second significant digit of its \
                         standard uncertainty (adaptive, JCGM 101:2008 7.9); not yet stable: {}{}",
                        names.join(", "),
                        if unstable.len() > names.len() {
                            format!(" and {} more", unstable.len() - names.len())
                        } else {
                            String::new()
                        }
                    )
                };
                d.sample_note = Some(match d.sample_note.take() {
                    Some(fewer) => Arc::from(format!("{fewer}; {words}")),
                    None => Arc::from(words),
                });
                d.options.adaptive = true;
                return d;
            }
            once.samples = (once.samples * 2).min(most);
        }
    }

    /// The derived values whose median or interval ends the samples do not yet fix to
    /// the second significant digit of their standard uncertainty (half the 68 % interval's
    /// width), in key order.
    fn unstable(&self) -> Vec<Key> {
        let mut out: Vec<Key> = self
            .entries
            .iter()
            .filter(|(_, e)| e.origin.is_computed() && !e.value.grad.is_empty())
            .filter(|(_, e)| {
                e.value.sample_summary().is_some_and(|s| {
                    let u = (s.high - s.low) / 2.0;
                    !s.precision.is_some_and(|p| p.stable_for(u))
                })
            })
            .map(|(k, _)| *k)
            .collect();
        out.sort();
        out
    }
}
