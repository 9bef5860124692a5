//! A small ordered set kept as a sorted vector.
//!
//! What a derived value depends on and what it assumed are sets of a handful of elements,
//! merged every time a rule fires. A B-tree allocates a node per set and pays for balance it
//! never needs at this size; a sorted vector merges in one pass and iterates in the same
//! (ascending) order, so results do not depend on which one is used.

#[derive(Debug, Clone, PartialEq, Eq, PartialOrd, Ord, Hash)]
pub struct SortedSet<T>(Vec<T>);

impl<T> Default for SortedSet<T> {
    fn default() -> Self {
        SortedSet(Vec::new())
    }
}

impl<T: Ord + Clone> SortedSet<T> {
    pub fn new() -> Self {
        SortedSet(Vec::new())
    }

    pub fn one(x: T) -> Self {
        SortedSet(vec![x])
    }

    /// Adds `x`; false if it was already there.
    pub fn insert(&mut self, x: T) -> bool {
        match self.0.binary_search(&x) {
            Ok(_) => false,
            Err(i) => {
                self.0.insert(i, x);
                true
            }
        }
    }

    pub fn remove(&mut self, x: &T) -> bool {
        match self.0.binary_search(x) {
            Ok(i) => {
                self.0.remove(i);
                true
            }
            Err(_) => false,
        }
    }

    pub fn contains(&self, x: &T) -> bool {
        self.0.binary_search(x).is_ok()
    }

    pub fn iter(&self) -> std::slice::Iter<'_, T> {
        self.0.iter()
    }

    pub fn len(&self) -> usize {
        self.0.len()
    }

    pub fn is_empty(&self) -> bool {
        self.0.is_empty()
    }

    pub fn retain(&mut self, f: impl FnMut(&T) -> bool) {
        self.0.retain(f);
    }

    /// Adds every element of `other` (one merge pass).
    pub fn merge(&mut self, other: &SortedSet<T>) {
        if other.0.is_empty() {
            return;
        }
        if self.0.is_empty() {
            self.0.clone_from(&other.0);
            return;
        }
        // Inputs of one rule mostly share their dependencies and assumptions: checking
        // costs no allocation, a union always one.
        if other.is_subset(self) {
            return;
        }
        *self = self.union(other);
    }

    /// The elements of both, in order.
    pub fn union(&self, other: &SortedSet<T>) -> SortedSet<T> {
        let mut out = Vec::with_capacity(self.0.len() + other.0.len());
        let (mut a, mut b) = (self.0.iter().peekable(), other.0.iter().peekable());
        loop {
            match (a.peek(), b.peek()) {
                (Some(x), Some(y)) => match x.cmp(y) {
                    std::cmp::Ordering::Less => out.extend(a.next().cloned()),
                    std::cmp::Ordering::Greater => out.extend(b.next().cloned()),
                    std::cmp::Ordering::Equal => {
                        out.extend(a.next().cloned());
                        b.next();
                    }
                },
                (Some(_), None) => out.extend(a.by_ref().cloned()),
                (None, Some(_)) => out.extend(b.by_ref().cloned()),
                (None, None) => break,
            }
        }
        SortedSet(out)
    }

    /// Whether every element of `self` is in `other`.
    pub fn is_subset(&self, other: &SortedSet<T>) -> bool {
        let mut rest = other.0.iter();
        self.0.iter().all(|x| rest.by_ref().any(|y| y == x))
    }
}

impl<T: Ord> FromIterator<T> for SortedSet<T> {
    fn from_iter<I: IntoIterator<Item = T>>(iter: I) -> Self {
        let mut v: Vec<T> = iter.into_iter().collect();
        v.sort();
        v.dedup();
        SortedSet(v)
    }
}

impl<'a, T> IntoIterator for &'a SortedSet<T> {
    type Item = &'a T;
    type IntoIter = std::slice::Iter<'a, T>;
    fn into_iter(self) -> Self::IntoIter {
        self.0.iter()
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use proptest::prelude::*;
    use std::collections::BTreeSet;

    proptest! {
        // The reference is the standard library's B-tree set: same elements, same order.
        #[test]
        fn behaves_like_a_btree_set(a in proptest::collection::vec(0u8..40, 0..12),
                                    b in proptest::collection::vec(0u8..40, 0..12),
                                    probe in 0u8..40) {
            let (sa, sb): (SortedSet<u8>, SortedSet<u8>) = (a.iter().copied().collect(), b.iter().copied().collect());
            let (ta, tb): (BTreeSet<u8>, BTreeSet<u8>) = (a.iter().copied().collect(), b.iter().copied().collect());
            let u: Vec<u8> = sa.union(&sb).iter().copied().collect();
            let tu: Vec<u8> = ta.union(&tb).copied().collect();
            prop_assert_eq!(u, tu);
            prop_assert_eq!(sa.is_subset(&sb), ta.is_subset(&tb));
            prop_assert_eq!(sa.contains(&probe), ta.contains(&probe));
            let mut m = sa.clone();
            m.merge(&sb);
            prop_assert_eq!(m.iter().copied().collect::<Vec<_>>(), ta.union(&tb).copied().collect::<Vec<_>>());
            let mut i = sa.clone();
            let mut ti = ta.clone();
            prop_assert_eq!(i.insert(probe), ti.insert(probe));
            prop_assert_eq!(i.remove(&probe), ti.remove(&probe));
            prop_assert_eq!(i.iter().copied().collect::<Vec<_>>(), ti.iter().copied().collect::<Vec<_>>());
        }
    }
}
