//! Several order statistics of one column of sample keys at once: the three percentiles of a
//! Monte Carlo summary and the ranks either side of each that give their numerical precision.
//!
//! The ranks come in three tight clusters. A histogram of the keys (2,048 buckets over their
//! range, one pass) finds the buckets that hold the wanted ranks; a second pass gathers only
//! those buckets' keys, and the ranks are selected among them (in a summary of 10^4 samples,
//! a few hundred keys instead of the whole column partitioned several times). A bucket that
//! still holds many keys (a heavy tail stretches the range, so the body of the distribution
//! falls into a few buckets) is treated the same way over its own narrower range, at most
//! [`LEVELS`] times; below that, or for a short slice, the ranks are selected by partitioning
//! in the order [`SelectionPlan`] finds cheapest.

/// Buckets of one histogram: 2^11 counts of 4 bytes, 8 KiB, within the first-level cache.
const BUCKET_BITS: u32 = 11;
const BUCKETS: usize = 1 << BUCKET_BITS;
/// Slices shorter than this are partitioned directly: a histogram costs more there.
const SHORT: usize = 512;
/// Histogram levels at most; each narrows the range of the keys by 2^11.
const LEVELS: usize = 4;

/// Select the elements of the sorted, distinct `ranks` of `v` into `out` (one per rank).
/// `v` is reordered.
pub(super) fn select_ranks(v: &mut [i64], ranks: &[usize], out: &mut [i64]) {
    by_histogram(v, ranks, out, LEVELS);
}

fn by_histogram(v: &mut [i64], ranks: &[usize], out: &mut [i64], levels: usize) {
    if ranks.is_empty() || v.is_empty() {
        return;
    }
    if levels == 0 || v.len() < SHORT {
        SelectionPlan::new(v.len(), ranks).select(v, 0, 0, ranks.len(), ranks, out);
        return;
    }
    let (lo, hi) = v
        .iter()
        .fold((i64::MAX, i64::MIN), |(a, b), &k| (a.min(k), b.max(k)));
    // The distance between two keys fits in 64 bits without a sign.
    let span = hi.wrapping_sub(lo) as u64;
    if span == 0 {
        out.fill(lo);
        return;
    }
    let shift = (u64::BITS - span.leading_zeros()).saturating_sub(BUCKET_BITS);
    let bucket = |k: i64| ((k.wrapping_sub(lo) as u64) >> shift) as usize;
    let mut counts = [0u32; BUCKETS];
    for &k in v.iter() {
        if let Some(c) = counts.get_mut(bucket(k)) {
            *c += 1;
        }
    }
    // Each wanted bucket (in order), the keys before it, and the ranks it holds.
    let mut wanted: Vec<(usize, usize, std::ops::Range<usize>)> = Vec::new();
    let mut before = 0usize;
    let mut next = 0usize;
    for (b, &c) in counts.iter().enumerate() {
        let end = before + c as usize;
        let first = next;
        while ranks.get(next).is_some_and(|&r| r < end) {
            next += 1;
        }
        if next > first {
            wanted.push((b, before, first..next));
        }
        before = end;
        if next == ranks.len() {
            break;
        }
    }
    // Which wanted bucket each bucket is (0: none), and room for each one's keys.
    let mut slot = [0u8; BUCKETS];
    let mut gathered: Vec<Vec<i64>> = Vec::with_capacity(wanted.len());
    for (n, (b, _, _)) in wanted.iter().enumerate() {
        if let Some(s) = slot.get_mut(*b) {
            *s = (n + 1) as u8;
        }
        let size = counts.get(*b).copied().unwrap_or(0) as usize;
        gathered.push(Vec::with_capacity(size));
    }
    for &k in v.iter() {
        let s = slot.get(bucket(k)).copied().unwrap_or(0) as usize;
        if s > 0 {
            if let Some(g) = gathered.get_mut(s - 1) {
                g.push(k);
            }
        }
    }
    for ((_, before, range), keys) in wanted.into_iter().zip(&mut gathered) {
        let local: Vec<usize> = ranks
            .get(range.clone())
            .unwrap_or_default()
            .iter()
            .map(|r| r - before)
            .collect();
        if let Some(o) = out.get_mut(range) {
            by_histogram(keys, &local, o, levels - 1);
        }
    }
}

/// The order of the selections by partitioning: for the ranks `i..j` (indices into the
/// sorted ranks), the one to select first. Found by the interval dynamic programme of the
/// optimal binary search tree (Knuth 1971), with a selection's cost taken as the length of
/// the slice it partitions: the slice holding ranks `i..j` runs from just after rank
/// `i - 1` to rank `j`. A quickselect costs about the length of the slice it partitions,
/// so selecting each cluster's outer ranks first leaves its centre a short slice.
pub(super) struct SelectionPlan {
    k: usize,
    first: Vec<usize>,
    /// Elements partitioned in all (what the tests compare).
    #[cfg(test)]
    pub(super) cost: usize,
}

impl SelectionPlan {
    pub(super) fn new(len: usize, ranks: &[usize]) -> SelectionPlan {
        let k = ranks.len();
        let at = |i: usize, j: usize| i * (k + 1) + j;
        // cost[at(i, j)]: elements partitioned to select ranks i..j; 0 when i == j.
        let mut cost = vec![0usize; (k + 1) * (k + 1)];
        let mut first = vec![0usize; (k + 1) * (k + 1)];
        for width in 1..=k {
            for i in 0..=k - width {
                let j = i + width;
                let start = i
                    .checked_sub(1)
                    .and_then(|p| ranks.get(p))
                    .map_or(0, |r| r + 1);
                let end = ranks.get(j).copied().unwrap_or(len);
                let mut best = (usize::MAX, i);
                for t in i..j {
                    let c = cost.get(at(i, t)).copied().unwrap_or(0)
                        + cost.get(at(t + 1, j)).copied().unwrap_or(0);
                    if c < best.0 {
                        best = (c, t);
                    }
                }
                if let (Some(c), Some(f)) = (cost.get_mut(at(i, j)), first.get_mut(at(i, j))) {
                    *c = end.saturating_sub(start) + best.0;
                    *f = best.1;
                }
            }
        }
        SelectionPlan {
            k,
            first,
            #[cfg(test)]
            cost: cost.get(k).copied().unwrap_or(0),
        }
    }

    /// Select ranks `i..j` from `v`, the slice of the whole that starts at rank `offset`.
    /// Depth is at most the number of ranks (nine in a summary).
    fn select(
        &self,
        v: &mut [i64],
        offset: usize,
        i: usize,
        j: usize,
        ranks: &[usize],
        out: &mut [i64],
    ) {
        if i >= j || v.is_empty() {
            return;
        }
        let t = self.first.get(i * (self.k + 1) + j).copied().unwrap_or(i);
        let Some(&rank) = ranks.get(t) else {
            return;
        };
        let r = rank.saturating_sub(offset).min(v.len() - 1);
        let (left, x, right) = v.select_nth_unstable(r);
        if let Some(o) = out.get_mut(t) {
            *o = *x;
        }
        self.select(left, offset, i, t, ranks, out);
        self.select(right, offset + r + 1, t + 1, j, ranks, out);
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use rand::{Rng, SeedableRng};
    use rand_chacha::ChaCha8Rng;

    /// The ranks of `ranks` of `data`, by sorting (the reference).
    fn sorted_at(data: &[i64], ranks: &[usize]) -> Vec<i64> {
        let mut sorted = data.to_vec();
        sorted.sort_unstable();
        ranks.iter().map(|&r| sorted[r]).collect()
    }

    fn selected(data: &[i64], ranks: &[usize]) -> Vec<i64> {
        let mut v = data.to_vec();
        let mut out = vec![0i64; ranks.len()];
        select_ranks(&mut v, ranks, &mut out);
        out
    }

    #[test]
    fn histogram_selection_finds_what_a_sort_finds_on_hard_columns() {
        let mut rng = ChaCha8Rng::seed_from_u64(29);
        let n = 10_000usize;
        let summary = [1549, 1586, 1623, 4950, 5000, 5050, 8376, 8413, 8450];
        let columns: Vec<(&str, Vec<i64>)> = vec![
            ("uniform", (0..n).map(|_| rng.gen()).collect()),
            ("narrow", (0..n).map(|_| rng.gen_range(-3..3)).collect()),
            ("constant", vec![42; n]),
            // Both ends of the key range: the span needs all 64 bits.
            (
                "extremes",
                (0..n)
                    .map(|i| {
                        if i % 2 == 0 {
                            i64::MIN
                        } else {
                            i64::MAX - i as i64
                        }
                    })
                    .collect(),
            ),
            // A heavy tail: the body in one bucket of the first histogram, past every level.
            (
                "heavy tail",
                (0..n)
                    .map(|i| {
                        if i % 500 == 0 {
                            i64::MAX / 3
                        } else {
                            rng.gen_range(0..1000)
                        }
                    })
                    .collect(),
            ),
            // Keys of normal samples (floats in their order), with ties.
            (
                "normal",
                (0..n)
                    .map(|i| {
                        super::super::value::order_key(
                            (i % 97) as f64 * 1e-3 - 0.05 + rng.gen::<f64>(),
                        )
                    })
                    .collect(),
            ),
        ];
        for (name, data) in &columns {
            for ranks in [summary.to_vec(), vec![0, n - 1], vec![n / 2], vec![]] {
                assert_eq!(
                    selected(data, &ranks),
                    sorted_at(data, &ranks),
                    "{name} {ranks:?}"
                );
            }
        }
    }

    #[test]
    fn planned_selection_finds_what_a_sort_finds() {
        // Several order statistics selected in the planned order are those of the sorted
        // array, for rank sets with clusters, ends, a single rank and none.
        let mut rng = ChaCha8Rng::seed_from_u64(11);
        for len in [1usize, 2, 3, 10, 97, 1000, 10_000] {
            let data: Vec<i64> = (0..len).map(|_| rng.gen_range(-50..50)).collect();
            let last = len - 1;
            let sets: Vec<Vec<usize>> = vec![
                vec![],
                vec![last / 2],
                vec![0, last],
                vec![0, 1, last / 3, last / 2, last],
                (0..len).step_by((len / 9).max(1)).collect(),
            ];
            for set in sets {
                let mut ranks = set;
                ranks.retain(|&r| r < len);
                ranks.sort_unstable();
                ranks.dedup();
                assert_eq!(
                    selected(&data, &ranks),
                    sorted_at(&data, &ranks),
                    "len {len}, ranks {ranks:?}"
                );
            }
        }
    }

    #[test]
    fn selection_plan_partitions_the_fewest_elements() {
        // The nine ranks of a summary of 10^4 samples. Every order of selection, tried
        // by brute force (4,862 of them), partitions at least as many elements as the plan;
        // always halving the list of ranks partitions 34,957.
        let ranks = [1549, 1586, 1623, 4950, 5000, 5050, 8376, 8413, 8450];
        fn brute(start: usize, end: usize, ranks: &[usize]) -> usize {
            if ranks.is_empty() {
                return 0;
            }
            (0..ranks.len())
                .map(|t| {
                    let r = ranks[t];
                    end - start + brute(start, r, &ranks[..t]) + brute(r + 1, end, &ranks[t + 1..])
                })
                .min()
                .unwrap()
        }
        fn halving(start: usize, end: usize, ranks: &[usize]) -> usize {
            if ranks.is_empty() {
                return 0;
            }
            let t = ranks.len() / 2;
            let r = ranks[t];
            end - start + halving(start, r, &ranks[..t]) + halving(r + 1, end, &ranks[t + 1..])
        }
        let plan = SelectionPlan::new(10_000, &ranks);
        assert_eq!(plan.cost, brute(0, 10_000, &ranks));
        assert_eq!(halving(0, 10_000, &ranks), 34_957);
        assert!(plan.cost < 27_000, "{}", plan.cost);
    }
}
