//! Gear sets: what a practitioner cuts or buys. A gear set is the multiset of driver gears and
//! the multiset of driven gears of a train, each gear a kind of the pool (tooth count in one
//! mesh group, so module and catalogue row are part of it); its arrangements are the distinct
//! ways of pairing every driver with one driven gear into stages. Every arrangement of a set
//! has the same ratio, size and largest gear; which pairings are stages, and which trains
//! pass a problem's checks, is the engine's business, not this file's.

use std::sync::Arc;

use crate::model::pool::MAX_STAGES;

/// One stage of a pairing: (driver kind, driven kind), indices into
/// [`crate::model::pool::Pool::gears`].
pub type KindPair = (u32, u32);

/// A gear set: the driver and driven gear kinds of a train, each list ascending by pool index.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash)]
pub struct GearSet {
    /// Driver gear kinds (indices into [`crate::model::pool::Pool::gears`]), ascending; only
    /// the first `len` are used.
    pub drivers: [u32; MAX_STAGES],
    /// Driven gear kinds, ascending; only the first `len` are used.
    pub driven: [u32; MAX_STAGES],
    /// Number of drivers (and of driven gears): the number of stages of any arrangement.
    pub len: u8,
}

impl GearSet {
    /// The gear set of a train given as (driver kind, driven kind) pairs.
    pub fn of_pairs(pairs: impl IntoIterator<Item = (u32, u32)>) -> GearSet {
        let mut set = GearSet { drivers: [0; MAX_STAGES], driven: [0; MAX_STAGES], len: 0 };
        for (a, b) in pairs {
            let i = set.len as usize;
            set.drivers[i] = a;
            set.driven[i] = b;
            set.len += 1;
        }
        let n = set.len as usize;
        set.drivers[..n].sort_unstable();
        set.driven[..n].sort_unstable();
        set
    }

    /// The driver kinds, ascending.
    pub fn driver_kinds(&self) -> &[u32] {
        &self.drivers[..self.len as usize]
    }

    /// The driven kinds, ascending.
    pub fn driven_kinds(&self) -> &[u32] {
        &self.driven[..self.len as usize]
    }

    /// Call `visit` once with every distinct pairing of the drivers with the driven gears, as
    /// (driver kind, driven kind) pairs (a multiset of stages is visited once, however many
    /// equal gears the set holds). Whether each pair is a stage is the caller's question.
    pub fn for_each_pairing(&self, visit: &mut dyn FnMut(&[KindPair])) {
        let n = self.len as usize;
        // The driven kinds with how many of each are left to pair.
        let mut left: Vec<(u32, u32)> = Vec::with_capacity(n);
        for &t in self.driven_kinds() {
            match left.last_mut() {
                Some((v, c)) if *v == t => *c += 1,
                _ => left.push((t, 1)),
            }
        }
        let mut pairs = [(0u32, 0u32); MAX_STAGES];
        let mut chosen = [0usize; MAX_STAGES];
        pair_from(self.driver_kinds(), 0, &mut left, &mut chosen, &mut pairs, visit);
    }

    /// The number of distinct pairings (an upper bound on the arrangements: some pairings may
    /// not be stages).
    pub fn pairing_count(&self) -> u64 {
        let mut n = 0;
        self.for_each_pairing(&mut |_| n += 1);
        n
    }
}

fn pair_from(
    drivers: &[u32],
    at: usize,
    left: &mut [(u32, u32)],
    chosen: &mut [usize; MAX_STAGES],
    pairs: &mut [(u32, u32); MAX_STAGES],
    visit: &mut dyn FnMut(&[KindPair]),
) {
    if at == drivers.len() {
        visit(&pairs[..at]);
        return;
    }
    for j in 0..left.len() {
        // Equal drivers take their driven gears in ascending order, so each multiset of pairs
        // comes once.
        if left[j].1 == 0 || (at > 0 && drivers[at] == drivers[at - 1] && j < chosen[at - 1]) {
            continue;
        }
        left[j].1 -= 1;
        chosen[at] = j;
        pairs[at] = (drivers[at], left[j].0);
        pair_from(drivers, at + 1, left, chosen, pairs, visit);
        left[j].1 += 1;
    }
}

/// How a search names the gear set of a candidate: the (driver kind, driven kind) of every
/// stage of its stage table, shared by the tallies of one search.
#[derive(Clone)]
pub struct SetOf {
    kinds: Arc<Vec<(u32, u32)>>,
}

impl SetOf {
    /// From the (driver kind, driven kind) of each stage-table entry, in table order.
    pub fn new(kinds: Vec<(u32, u32)>) -> SetOf {
        SetOf { kinds: Arc::new(kinds) }
    }

    /// The gear set of a train given by its stage-table indices (a candidate's
    /// `stage_indices()`).
    pub fn of(&self, stages: &[u32]) -> GearSet {
        GearSet::of_pairs(stages.iter().map(|&i| self.kinds[i as usize]))
    }

    /// The (driver kind, driven kind) of stage `i`.
    pub fn stage(&self, i: u32) -> (u32, u32) {
        self.kinds[i as usize]
    }
}

impl std::fmt::Debug for SetOf {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        write!(f, "SetOf({} stages)", self.kinds.len())
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Every pairing by brute force: all permutations of the driven gears, as sorted multisets
    /// of pairs, deduplicated.
    fn brute(set: &GearSet) -> Vec<Vec<(u32, u32)>> {
        fn perms(v: &mut Vec<u32>, k: usize, out: &mut Vec<Vec<u32>>) {
            if k == v.len() {
                out.push(v.clone());
                return;
            }
            for i in k..v.len() {
                v.swap(k, i);
                perms(v, k + 1, out);
                v.swap(k, i);
            }
        }
        let mut all = Vec::new();
        perms(&mut set.driven_kinds().to_vec(), 0, &mut all);
        let mut out: Vec<Vec<(u32, u32)>> = all
            .into_iter()
            .map(|p| {
                let mut pairs: Vec<(u32, u32)> = set.driver_kinds().iter().copied().zip(p).collect();
                pairs.sort_unstable();
                pairs
            })
            .collect();
        out.sort();
        out.dedup();
        out
    }

    #[test]
    fn pairings_are_the_distinct_permutations() {
        let sets = [
            GearSet::of_pairs([(1, 5), (2, 6), (3, 7)]),
            GearSet::of_pairs([(1, 5), (1, 6), (3, 6)]),
            GearSet::of_pairs([(1, 5), (1, 5), (1, 6), (2, 6)]),
            GearSet::of_pairs([(4, 4), (4, 4)]),
            GearSet::of_pairs([(1, 9), (2, 8), (3, 7), (4, 6), (5, 5), (6, 4)]),
        ];
        for set in sets {
            let mut got = Vec::new();
            set.for_each_pairing(&mut |p| {
                let mut v = p.to_vec();
                v.sort_unstable();
                got.push(v);
            });
            let n = got.len();
            got.sort();
            got.dedup();
            assert_eq!(got.len(), n, "no pairing twice: {set:?}");
            assert_eq!(got, brute(&set), "{set:?}");
            assert_eq!(set.pairing_count(), n as u64);
        }
        // Three different drivers and driven gears pair in 3! = 6 ways; two equal drivers halve
        // that; six different of each make 6! = 720.
        assert_eq!(GearSet::of_pairs([(1, 5), (2, 6), (3, 7)]).pairing_count(), 6);
        assert_eq!(GearSet::of_pairs([(1, 5), (1, 6), (3, 7)]).pairing_count(), 3);
        assert_eq!(GearSet::of_pairs([(1, 9), (2, 8), (3, 7), (4, 6), (5, 5), (6, 4)]).pairing_count(), 720);
    }

    #[test]
    fn a_set_does_not_depend_on_the_pairing() {
        assert_eq!(GearSet::of_pairs([(1, 5), (2, 6)]), GearSet::of_pairs([(2, 5), (1, 6)]));
        assert_ne!(GearSet::of_pairs([(1, 5), (2, 6)]), GearSet::of_pairs([(5, 1), (2, 6)]));
    }
}
