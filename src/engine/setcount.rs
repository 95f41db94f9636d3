//! Gear sets counted in bulk by meeting in the middle, for the meet engine: when every pairing
//! of an allowed driver with an allowed driven gear of other teeth is a stage, a gear set of
//! `n` stages is a multiset of `n` drivers and one of `n` driven gears whose products make a
//! ratio within tolerance, less the pairs no pairing of which avoids a 1:1 stage (by Hall's
//! theorem: a tooth count carried `a` times by the drivers and `b` times by the driven gears
//! with `a + b > n`). Each side's multisets are listed as bare products (`u32` where the
//! largest fits, else `u64`), one entry a multiset, sorted; the pairs within tolerance are
//! counted by a monotone sweep of both lists (as the driver product rises, the window of driven
//! products within tolerance moves only forward) with the exact test at its edges, or, when
//! one list is much the shorter, by binary searches from it. It owns only this count; which
//! problems it applies to is asked of it.

use rayon::prelude::*;

use super::space::SearchSpace;
use crate::numbers::rational::{Ratio, RelError};

/// Most bytes the listed products may take, both sides and every size of multiset together
/// (sorting is in place, so this is the count's peak): beyond it the gear sets are not
/// counted. Four stages of 12..200 teeth take about 0.2 GiB (one list of 55 million `u32`
/// serving both sides); the budget reaches about 320 tooth counts a side.
pub const PRODUCT_BYTES_BUDGET: u64 = 1 << 30;

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

    /// The gear sets of `n` stages, or `None` when the products of a side's multisets would
    /// not fit [`PRODUCT_BYTES_BUDGET`] (or `u64`).
    pub fn count(&self, n: usize) -> Option<u64> {
        let largest = self.drivers.iter().chain(&self.driven).copied().max().unwrap_or(1) as u128;
        let largest_product = largest.checked_pow(n as u32)?;
        if largest_product <= u32::MAX as u128 {
            self.count_as::<u32>(n)
        } else if largest_product <= u64::MAX as u128 {
            self.count_as::<u64>(n)
        } else {
            None
        }
    }

    /// [`SetCounter::count`] with products held as `T`, which must hold the largest.
    fn count_as<T: Product>(&self, n: usize) -> Option<u64> {
        // One list serves both sides when they allow the same teeth.
        let shared = self.drivers == self.driven;
        let listed = |teeth: &[u32]| {
            (0..=n).fold(0u64, |all, k| all.saturating_add(multiset_count(teeth.len() as u64, k as u64)))
        };
        let mut entries = listed(&self.drivers);
        if !shared {
            entries = entries.saturating_add(listed(&self.driven));
        }
        if entries.saturating_mul(std::mem::size_of::<T>() as u64) > PRODUCT_BYTES_BUDGET {
            return None;
        }
        // Each side's multisets of 0 to n members, by product.
        let drivers: Vec<Vec<T>> = (0..=n).map(|k| products::<T>(&self.drivers, k)).collect();
        let driven_own: Vec<Vec<T>> =
            if shared { Vec::new() } else { (0..=n).map(|k| products::<T>(&self.driven, k)).collect() };
        let driven = if shared { &drivers } else { &driven_own };
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

    /// The pairs (driver product `q·Q`, driven product `p·P`) of the two sorted lists whose
    /// ratio `p·P / (q·Q)` is within tolerance. `p·P` and `q·Q` fit `u64` (products of at
    /// most `n` allowed teeth).
    fn pairs_within<T: Product>(&self, drivers: &[T], driven: &[T], q: u64, p: u64) -> u64 {
        let (short, long) = (drivers.len().min(driven.len()), drivers.len().max(driven.len()));
        // A binary search costs about log2(long) tests; a sweep about two a member of both.
        let log = (usize::BITS - long.leading_zeros()) as usize;
        if short.saturating_mul(log + 1) < short + long {
            self.pairs_by_search(drivers, driven, q, p)
        } else {
            self.pairs_by_sweep(drivers, driven, q, p)
        }
    }

    /// The tests of a driven product against a driver product, for multipliers `q` and `p`.
    fn edges(&self, q: u64, p: u64) -> Edges<'_> {
        let float = |r: Ratio| r.num() as f64 / r.den() as f64;
        let (target, tolerance) = (float(self.target), float(self.tolerance));
        let per_driver = q as f64 * target / p as f64;
        Edges {
            counter: self,
            q,
            p,
            low: per_driver * (1.0 - tolerance),
            high: per_driver * (1.0 + tolerance),
        }
    }

    /// Walk the shorter list, binary-search the window in the longer.
    fn pairs_by_search<T: Product>(&self, drivers: &[T], driven: &[T], q: u64, p: u64) -> u64 {
        let edges = self.edges(q, p);
        let mut total = 0u64;
        if drivers.len() <= driven.len() {
            // Along the driven list the ratio rises.
            for &w in drivers {
                let w = w.wide();
                let from = driven.partition_point(|x| edges.below(w, x.wide()));
                let to = from + driven[from..].partition_point(|x| !edges.above(w, x.wide()));
                total += (to - from) as u64;
            }
        } else {
            // Along the driver list the ratio falls.
            for &w in driven {
                let w = w.wide();
                let from = drivers.partition_point(|x| edges.above(x.wide(), w));
                let to = from + drivers[from..].partition_point(|x| !edges.below(x.wide(), w));
                total += (to - from) as u64;
            }
        }
        total
    }

    /// Sweep the driver list upwards in slices (one a thread); in each, the window of driven
    /// products within tolerance starts by binary search and then only moves forward.
    fn pairs_by_sweep<T: Product>(&self, drivers: &[T], driven: &[T], q: u64, p: u64) -> u64 {
        const SLICE: usize = 1 << 16;
        let edges = self.edges(q, p);
        drivers
            .par_chunks(SLICE)
            .map(|slice| {
                let first = slice[0].wide();
                let mut from = driven.partition_point(|x| edges.below(first, x.wide()));
                let mut to = from + driven[from..].partition_point(|x| !edges.above(first, x.wide()));
                let mut total = 0u64;
                let mut last = first;
                for &w in slice {
                    let w = w.wide();
                    if w != last {
                        while from < driven.len() && edges.below(w, driven[from].wide()) {
                            from += 1;
                        }
                        to = to.max(from);
                        while to < driven.len() && !edges.above(w, driven[to].wide()) {
                            to += 1;
                        }
                        last = w;
                    }
                    total += (to - from) as u64;
                }
                total
            })
            .sum()
    }
}

/// Is `p·P / (q·Q)` below or above the target's tolerance band: decided by floats where the
/// driven product `P` is far from the band's edge (a relative margin of 10⁻⁹, far above the
/// rounding of a few products), exactly by cross-multiplication near it.
struct Edges<'a> {
    counter: &'a SetCounter,
    q: u64,
    p: u64,
    /// The band's edges for `P` per unit of `Q`, as floats.
    low: f64,
    high: f64,
}

impl Edges<'_> {
    /// The exact error of the pair.
    fn error(&self, dq: u64, dp: u64) -> RelError {
        RelError::of(self.p * dp, self.q * dq, self.counter.target)
    }

    /// Is driven product `dp` too small for driver product `dq`?
    fn below(&self, dq: u64, dp: u64) -> bool {
        self.outside(dq, dp, self.low, -1)
    }

    /// Is driven product `dp` too large for driver product `dq`?
    fn above(&self, dq: u64, dp: u64) -> bool {
        self.outside(dq, dp, self.high, 1)
    }

    /// Is the pair past the band's edge `edge_per_driver·dq` on the side `sign` (−1 below, +1
    /// above)? By floats away from the edge, exactly near it.
    fn outside(&self, dq: u64, dp: u64, edge_per_driver: f64, sign: i8) -> bool {
        let edge = dq as f64 * edge_per_driver;
        let margin = edge.abs() * 1e-9;
        let past = (dp as f64 - edge) * sign as f64;
        if past > margin {
            return true;
        }
        if past < -margin {
            return false;
        }
        let e = self.error(dq, dp);
        e.sign == sign && !e.within(self.counter.tolerance)
    }
}

/// A product of tooth counts as held in the sorted lists: `u32` where the largest fits, to
/// halve the memory and the sort, else `u64`.
trait Product: Copy + Ord + Send + Sync {
    /// `x` (at most the largest product, which fits).
    fn narrow(x: u64) -> Self;
    /// Back to `u64`.
    fn wide(self) -> u64;
}

impl Product for u32 {
    fn narrow(x: u64) -> u32 {
        x as u32
    }
    fn wide(self) -> u64 {
        self as u64
    }
}

impl Product for u64 {
    fn narrow(x: u64) -> u64 {
        x
    }
    fn wide(self) -> u64 {
        self
    }
}

/// The number of multisets of `k` from `s` things, C(s + k − 1, k), saturating.
fn multiset_count(s: u64, k: u64) -> u64 {
    (0..k).fold(1u64, |acc, i| acc.saturating_mul(s + i) / (i + 1))
}

/// The product of every multiset of `k` members of `teeth`, one entry a multiset, sorted.
/// Long lists are sorted in two steps: the products are counted into buckets by their leading
/// bits, listed again straight into their buckets, and each bucket is sorted on its own (in
/// parallel, each small enough to stay in cache).
fn products<T: Product>(teeth: &[u32], k: usize) -> Vec<T> {
    const BUCKET_BITS: u32 = 16;
    let members: Vec<u64> = teeth.iter().map(|&t| t as u64).collect();
    let len = multiset_count(members.len() as u64, k as u64) as usize;
    let largest = members.iter().copied().max().unwrap_or(1).pow(k as u32);
    let shift = (u64::BITS - largest.leading_zeros()).saturating_sub(BUCKET_BITS);
    if len < 1 << BUCKET_BITS || shift == 0 {
        let mut all = Vec::with_capacity(len);
        each_product(&members, k, 0, 1, &mut |x| all.push(T::narrow(x)));
        all.sort_unstable();
        return all;
    }
    let mut starts = vec![0usize; (largest >> shift) as usize + 2];
    each_product(&members, k, 0, 1, &mut |x| starts[(x >> shift) as usize + 1] += 1);
    for b in 1..starts.len() {
        starts[b] += starts[b - 1];
    }
    let mut all = vec![T::narrow(0); len];
    let mut next = starts.clone();
    each_product(&members, k, 0, 1, &mut |x| {
        let slot = &mut next[(x >> shift) as usize];
        all[*slot] = T::narrow(x);
        *slot += 1;
    });
    let mut buckets = Vec::with_capacity(starts.len());
    let mut rest = &mut all[..];
    for pair in starts.windows(2) {
        let (bucket, tail) = rest.split_at_mut(pair[1] - pair[0]);
        buckets.push(bucket);
        rest = tail;
    }
    buckets.par_iter_mut().with_min_len(64).for_each(|b| b.sort_unstable());
    all
}

/// Call `visit` with the product of every multiset of `k` members of `members[from..]`, times
/// `product`.
fn each_product(members: &[u64], k: usize, from: usize, product: u64, visit: &mut dyn FnMut(u64)) {
    if k == 0 {
        visit(product);
        return;
    }
    if k == 1 {
        for &m in &members[from..] {
            visit(product * m);
        }
        return;
    }
    for i in from..members.len() {
        each_product(members, k - 1, i, product * members[i], visit);
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use proptest::prelude::*;

    #[test]
    fn multisets_are_counted_and_listed() {
        // C(s + k − 1, k): 3 things taken 2 with repeats make 6 multisets (common knowledge).
        assert_eq!(multiset_count(3, 2), 6);
        // 139 tooth counts taken 4: C(142, 4) = 142·141·140·139 / 24 = 16,234,505.
        assert_eq!(multiset_count(139, 4), 16_234_505);
        // 4, 6, 8, 9, 12, 16: 2·2, 2·3, 2·4, 3·3, 3·4, 4·4.
        assert_eq!(products::<u32>(&[2, 3, 4], 2), vec![4, 6, 8, 9, 12, 16]);
        assert_eq!(products::<u64>(&[2, 4, 8], 2), vec![4, 8, 16, 16, 32, 64]);
        assert_eq!(products::<u32>(&[5], 0), vec![1]);
    }

    #[test]
    fn long_lists_are_sorted_through_buckets() {
        // 49 tooth counts taken 4: C(52, 4) = 270,725 multisets, past the plain sort.
        let teeth: Vec<u32> = (12..=60).collect();
        let listed = products::<u32>(&teeth, 4);
        let mut plain = Vec::new();
        each_product(&teeth.iter().map(|&t| t as u64).collect::<Vec<_>>(), 4, 0, 1, &mut |x| plain.push(x));
        plain.sort_unstable();
        assert_eq!(listed.len(), 270_725);
        assert_eq!(listed.iter().map(|&x| x as u64).collect::<Vec<_>>(), plain);
        assert_eq!(products::<u64>(&teeth, 4).into_iter().map(|x| x as u32).collect::<Vec<_>>(), listed);
    }

    fn counter(drivers: &[u32], driven: &[u32], target: (u64, u64), tol_ppm: u64) -> SetCounter {
        let mut drivers = drivers.to_vec();
        let mut driven = driven.to_vec();
        for side in [&mut drivers, &mut driven] {
            side.sort_unstable();
            side.dedup();
        }
        SetCounter {
            drivers,
            driven,
            target: Ratio::new(target.0 as u128, target.1 as u128).unwrap(),
            tolerance: Ratio::new(tol_ppm as u128, 1_000_000).unwrap(),
        }
    }

    /// Every multiset of `k` members of `teeth`, each sorted.
    fn multisets(teeth: &[u32], k: usize) -> Vec<Vec<u32>> {
        if k == 0 {
            return vec![Vec::new()];
        }
        let mut out = Vec::new();
        for (i, &t) in teeth.iter().enumerate() {
            for mut rest in multisets(&teeth[i..], k - 1) {
                rest.insert(0, t);
                out.push(rest);
            }
        }
        out
    }

    /// Some ordering of `driven` meets `drivers` with no 1:1 stage: tried one by one.
    fn pairs_without_one_to_one(drivers: &[u32], driven: &mut Vec<u32>, from: usize) -> bool {
        if from == driven.len() {
            return drivers.iter().zip(driven.iter()).all(|(a, b)| a != b);
        }
        for i in from..driven.len() {
            driven.swap(from, i);
            let ok = drivers[from] != driven[from] && pairs_without_one_to_one(drivers, driven, from + 1);
            driven.swap(from, i);
            if ok {
                return true;
            }
        }
        false
    }

    /// The brute force: every multiset pair, its ratio tested exactly, its pairings tried.
    fn by_hand(c: &SetCounter, n: usize) -> u64 {
        let mut sets = 0;
        for a in multisets(&c.drivers, n) {
            let q: u64 = a.iter().map(|&t| t as u64).product();
            for b in multisets(&c.driven, n) {
                let p: u64 = b.iter().map(|&t| t as u64).product();
                if RelError::of(p, q, c.target).within(c.tolerance)
                    && pairs_without_one_to_one(&a, &mut b.clone(), 0)
                {
                    sets += 1;
                }
            }
        }
        sets
    }

    #[test]
    fn five_stages_with_one_to_one_pairings_left_out() {
        // Ratio 1 over the same teeth both sides: every multiset meets itself, and those whose
        // commonest tooth fills more than half the places cannot avoid a 1:1 stage.
        let c = counter(&[10, 11, 12, 13, 14, 15], &[10, 11, 12, 13, 14, 15], (1, 1), 0);
        let sets = c.count(5);
        assert_eq!(sets, Some(by_hand(&c, 5)));
        assert!(sets.unwrap() > 0);
        assert_eq!(c.count_as::<u64>(5), sets);
    }

    proptest! {
        #![proptest_config(ProptestConfig { cases: 60, ..ProptestConfig::default() })]

        /// Both widths of product, for one to five stages, against the brute force; the
        /// targets are ratios of tooth products so that hits and 1:1 pairings are common.
        #[test]
        fn counts_equal_the_brute_force(
            lo in 6u32..20,
            widths in (1u32..6, 1u32..6),
            shift in 0u32..3,
            n in 1usize..=5,
            target in ((6u64..20, 6u64..20), (6u64..20, 6u64..20)),
            tol_ppm in prop_oneof![Just(0u64), 1u64..50_000],
        ) {
            let drivers: Vec<u32> = (lo..lo + widths.0).collect();
            let driven: Vec<u32> = (lo + shift..lo + shift + widths.1).collect();
            let ((a, b), (d, e)) = target;
            let c = counter(&drivers, &driven, (a * b, d * e), tol_ppm);
            let want = by_hand(&c, n);
            prop_assert_eq!(c.count(n), Some(want));
            prop_assert_eq!(c.count_as::<u32>(n), Some(want));
            prop_assert_eq!(c.count_as::<u64>(n), Some(want));
        }

        /// The sweep and the binary searches find the same pairs, either list the shorter.
        #[test]
        fn the_sweep_equals_the_searches(
            mut drivers in prop::collection::vec(1u32..5000, 1..400),
            mut driven in prop::collection::vec(1u32..5000, 1..400),
            q in 1u64..5, p in 1u64..5,
            target in (1u64..40, 1u64..40),
            tol_ppm in prop_oneof![Just(0u64), 1u64..200_000],
        ) {
            drivers.sort_unstable();
            driven.sort_unstable();
            let c = counter(&[1], &[1], target, tol_ppm);
            let mut want = 0;
            for &x in &drivers {
                for &y in &driven {
                    want += RelError::of(p * y as u64, q * x as u64, c.target).within(c.tolerance) as u64;
                }
            }
            prop_assert_eq!(c.pairs_by_sweep(&drivers, &driven, q, p), want);
            prop_assert_eq!(c.pairs_by_search(&drivers, &driven, q, p), want);
            prop_assert_eq!(c.pairs_within(&drivers, &driven, q, p), want);
        }
    }
}
