//! Gear sets counted in bulk by meeting in the middle, for the meet engine: when every pairing
//! of an allowed driver with an allowed driven gear of other teeth is a stage, a gear set of
//! `n` stages is a multiset of `n` drivers and one of `n` driven gears whose products make a
//! ratio within tolerance, less the pairs no pairing of which avoids a 1:1 stage (by Hall's
//! theorem: a tooth count carried `a` times by the drivers and `b` times by the driven gears
//! with `a + b > n`). Each side's multisets are listed by product, sorted; for each driver
//! product the driven products within tolerance form one run, found by binary search with the
//! exact test. It owns only this count; which problems it applies to is asked of it.

use super::space::SearchSpace;
use crate::numbers::rational::{Ratio, RelError};

/// Most multisets listed on one side (24 bytes each at most while they are sorted and
/// grouped; about 200 MB for both sides): beyond it the gear sets are not counted. Four stages
/// reach it at about 85 tooth counts a side.
pub const MOST_MULTISETS: u64 = 4_000_000;

/// The allowed teeth of each side, when every pairing of other teeth is a stage.
pub struct SetCounter {
    drivers: Vec<u32>,
    driven: Vec<u32>,
    target: Ratio,
    tolerance: Ratio,
}

impl SetCounter {
    /// Prepare for `space`, or `None` when some pairing of other teeth is not a stage (a
    /// per-stage ratio, distance or mesh limit), the gears come from stock or in several mesh
    /// groups, or a train check decides trains.
    pub fn new(space: &SearchSpace) -> Option<SetCounter> {
        let p = space.problem;
        if p.pool.from_stock
            || p.pool.groups.len() != 1
            || p.train_check.is_some()
            || p.equal_teeth_stages
            || space.needs_coaxial_fit()
        {
            return None;
        }
        let mut drivers: Vec<u32> = space.stages.iter().map(|s| s.driver_teeth).collect();
        let mut driven: Vec<u32> = space.stages.iter().map(|s| s.driven_teeth).collect();
        drivers.sort_unstable();
        drivers.dedup();
        driven.sort_unstable();
        driven.dedup();
        let both = drivers.iter().filter(|t| driven.binary_search(t).is_ok()).count();
        // The stages are a subset of these pairings; as many of them means all of them.
        if space.stages.len() != drivers.len() * driven.len() - both {
            return None;
        }
        Some(SetCounter { drivers, driven, target: p.target.ratio, tolerance: p.target.tolerance })
    }

    /// The gear sets of `n` stages, or `None` when a side has too many multisets to list.
    pub fn count(&self, n: usize) -> Option<u64> {
        let too_many = |k: usize| multiset_count(k as u64, n as u64) > MOST_MULTISETS;
        if too_many(self.drivers.len()) || too_many(self.driven.len()) {
            return None;
        }
        // Each side's multisets of 0 to n members, by product.
        let drivers: Vec<Vec<(u64, u64)>> = (0..=n).map(|k| products(&self.drivers, k)).collect();
        let driven: Vec<Vec<(u64, u64)>> = (0..=n).map(|k| products(&self.driven, k)).collect();
        let mut sets = self.pairs_within(&drivers[n], &driven[n], 1, 1) as i128;
        // Less the pairs that no pairing without a 1:1 stage turns into a train: t carried
        // exactly a times by the drivers and b times by the driven gears, a + b > n. The rest
        // of each side holds no t: those of r members, less those holding t again (r − 1
        // members times t), by inclusion–exclusion on both sides at once.
        for &t in self.drivers.iter().filter(|t| self.driven.binary_search(t).is_ok()) {
            let t = t as u64;
            for a in 1..=n {
                for b in (n + 1 - a)..=n {
                    let (r, s) = (n - a, n - b);
                    let (tq, tp) = (t.pow(a as u32), t.pow(b as u32));
                    let mut without = self.pairs_within(&drivers[r], &driven[s], tq, tp) as i128;
                    if r > 0 {
                        without -= self.pairs_within(&drivers[r - 1], &driven[s], tq * t, tp) as i128;
                    }
                    if s > 0 {
                        without -= self.pairs_within(&drivers[r], &driven[s - 1], tq, tp * t) as i128;
                    }
                    if r > 0 && s > 0 {
                        without += self.pairs_within(&drivers[r - 1], &driven[s - 1], tq * t, tp * t) as i128;
                    }
                    sets -= without;
                }
            }
        }
        u64::try_from(sets).ok()
    }

    /// The pairs (driver product `q·Q`, driven product `p·P`) of the two sorted lists (with
    /// multiplicities) whose ratio `p·P / (q·Q)` is within tolerance: the shorter list is walked,
    /// the window found in the longer by binary search with the exact test.
    fn pairs_within(&self, drivers: &[(u64, u64)], driven: &[(u64, u64)], q: u64, p: u64) -> u64 {
        let error = |dq: u64, dp: u64| RelError::of(p * dp, q * dq, self.target);
        let below = |e: &RelError| e.sign < 0 && !e.within(self.tolerance);
        let above = |e: &RelError| e.sign > 0 && !e.within(self.tolerance);
        let (walked, searched) =
            if drivers.len() <= driven.len() { (drivers, driven) } else { (driven, drivers) };
        // Prefix sums of the searched list's multiplicities.
        let mut before = Vec::with_capacity(searched.len() + 1);
        before.push(0u64);
        for &(_, c) in searched {
            before.push(before.last().copied().unwrap_or(0) + c);
        }
        let mut total = 0;
        for &(w, wc) in walked {
            // Along the searched list the ratio rises (driven searched) or falls (drivers
            // searched): the window is one run either way.
            let (from, to) = if drivers.len() <= driven.len() {
                let from = searched.partition_point(|&(x, _)| below(&error(w, x)));
                (from, from + searched[from..].partition_point(|&(x, _)| !above(&error(w, x))))
            } else {
                let from = searched.partition_point(|&(x, _)| above(&error(x, w)));
                (from, from + searched[from..].partition_point(|&(x, _)| !below(&error(x, w))))
            };
            total += wc * (before[to] - before[from]);
        }
        total
    }
}

/// The number of multisets of `k` from `s` things, C(s + k − 1, k), saturating.
fn multiset_count(s: u64, k: u64) -> u64 {
    (0..k).fold(1u64, |acc, i| acc.saturating_mul(s + i) / (i + 1))
}

/// The products of every multiset of `k` members of `teeth`, as (product, how many
/// multisets), sorted by product.
fn products(teeth: &[u32], k: usize) -> Vec<(u64, u64)> {
    let members: Vec<u64> = teeth.iter().map(|&t| t as u64).collect();
    let mut all = Vec::new();
    fn walk(members: &[u64], k: usize, from: usize, product: u64, out: &mut Vec<u64>) {
        if k == 0 {
            out.push(product);
            return;
        }
        for i in from..members.len() {
            walk(members, k - 1, i, product * members[i], out);
        }
    }
    walk(&members, k, 0, 1, &mut all);
    all.sort_unstable();
    let mut out: Vec<(u64, u64)> = Vec::new();
    for x in all {
        match out.last_mut() {
            Some((v, c)) if *v == x => *c += 1,
            _ => out.push((x, 1)),
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn multisets_are_counted_and_listed() {
        // C(s + k − 1, k): 3 things taken 2 with repeats make 6 multisets (common knowledge).
        assert_eq!(multiset_count(3, 2), 6);
        // 139 tooth counts taken 4: C(142, 4) = 142·141·140·139 / 24 = 16,234,505.
        assert_eq!(multiset_count(139, 4), 16_234_505);
        let p = products(&[2, 3, 4], 2);
        // 4, 6, 8, 9, 12, 16: 2·2, 2·3, 2·4, 3·3, 3·4, 4·4.
        assert_eq!(p, vec![(4, 1), (6, 1), (8, 1), (9, 1), (12, 1), (16, 1)]);
        assert_eq!(products(&[2, 4, 8], 2), vec![(4, 1), (8, 1), (16, 2), (32, 1), (64, 1)]);
        assert_eq!(products(&[5], 0), vec![(1, 1)]);
    }
}
