//! The meet engine: meet-in-the-middle over distinct stage ratios, with trains counted in bulk.
//!
//! Many stages share one ratio (12→24, 13→26, …). The engine first folds the stage table into
//! its distinct ratios ("values"), each with the contiguous run of stages that make it. A train
//! of `n ≤ 6` stages is then a non-decreasing sequence of values whose product lies in the
//! window: single values for `n = 1`, a value and a binary-searched partner for `n = 2`, two
//! values and a binary-searched third for `n = 3`. For `n = 4` the first pair of values is
//! looped over and the last pair looked up in a table sorted by product; since `a ≤ b ≤ c ≤ d`
//! the last pair's product is at least √lo, so only those pairs are tabled (a tenth of all pairs
//! for a target near 30, which is what keeps four stages of 150 or 200 tooth counts in memory),
//! and the window of each first pair is found through an index of buckets of products. For
//! `n = 5` and `6` the first `n − 2` values are grown by loop, pruned by what the values still
//! to come can reach, and the last pair looked up the same way; the last pair holds the two
//! largest values, so its product is at least lo^(2/n) and each stage count has its own table.
//! The canonical order (the last value of the first part at most the first of the second) keeps
//! each sequence once.
//!
//! A sequence within tolerance stands for every choice of stages from its values; they all share
//! the ratio, so they are counted at once by multiset combinations. They are only spelt out
//! (and judged one by one, like any engine's candidates) when the best of them could still enter
//! the listing. That holds for gears to be cut in one mesh group with no train-level check,
//! extra key or coaxial fit, where every choice of stages is as valid as any other. Elsewhere
//! (gears on hand with their quantities, a trade's train check such as a reducer's housing or a
//! lathe's banjo, an extra ranking key, several mesh groups, a coaxial train) the engine still
//! finds the sequences inside the window in bulk, but spells out every choice of stages of each
//! and judges them one by one (`OneByOne`), as the sieve does at its leaves, counting gear sets
//! by their canonical arrangement. Searches with gears to buy stay with the sieve, which prunes
//! on the budget as it descends. The gear sets of bulk-counted searches are counted apart, by
//! the set counter, where every pairing of other teeth is a stage.

use std::time::{Duration, Instant};

use rayon::prelude::*;

use super::draws::Draws;
use super::kinds::{BulkEngine, BulkPlan};
use super::setcount::SetCounter;
use super::sets::SetTools;
use super::space::SearchSpace;
use super::tally::Tally;
use crate::model::pool::MAX_STAGES;
use crate::model::rank::{Candidate, RankKey};
use crate::numbers::rational::RelError;

/// Most memory the pair table may take, bytes; beyond it the sieve is used instead.
pub const PAIR_TABLE_BUDGET_BYTES: usize = 1 << 30;

/// Relative widening of the single-precision pair products: the product and the bound it is
/// compared with are each rounded to `f32` once (within 2⁻²⁴ ≈ 6·10⁻⁸), so this is about twice
/// what the two roundings can cost together.
const F32_MARGIN: f64 = 2.5e-7;

/// First values handled per unit of work for `n ≤ 3`.
pub const VALUES_PER_UNIT: usize = 16;
/// Units of work for `n = 4`: slices of the first pair's product, equal in its logarithm.
pub const PRODUCT_SLICES: usize = 512;

/// The distinct stage ratios of a search space.
pub struct DistinctRatios {
    /// Ratio as `f64`, ascending.
    pub value: Vec<f64>,
    /// Reduced driven / driver.
    pub num: Vec<u64>,
    /// Reduced denominator.
    pub den: Vec<u64>,
    /// First stage-table index with this ratio.
    pub start: Vec<u32>,
    /// Number of stages with this ratio.
    pub len: Vec<u32>,
    /// Least sum of teeth of a stage with this ratio.
    pub min_size: Vec<u32>,
    /// Least largest pitch diameter of a stage with this ratio, mm.
    pub min_span: Vec<f64>,
}

impl DistinctRatios {
    /// Fold the stage table into its distinct ratios.
    pub fn new(space: &SearchSpace) -> DistinctRatios {
        let mut v = DistinctRatios {
            value: Vec::new(),
            num: Vec::new(),
            den: Vec::new(),
            start: Vec::new(),
            len: Vec::new(),
            min_size: Vec::new(),
            min_span: Vec::new(),
        };
        let pool = &space.problem.pool;
        for (i, s) in space.stages.iter().enumerate() {
            let same = v.value.len().checked_sub(1).is_some_and(|last| {
                let first = &space.stages[v.start[last] as usize];
                s.driven_teeth as u64 * first.driver_teeth as u64
                    == first.driven_teeth as u64 * s.driver_teeth as u64
            });
            let size = s.driver_teeth + s.driven_teeth;
            let span = pool.module_of(s.driver as usize) * s.driver_teeth.max(s.driven_teeth) as f64;
            if same {
                let last = v.value.len() - 1;
                v.len[last] += 1;
                v.min_size[last] = v.min_size[last].min(size);
                v.min_span[last] = v.min_span[last].min(span);
            } else {
                let g = crate::numbers::rational::gcd(s.driven_teeth as u128, s.driver_teeth as u128) as u64;
                v.value.push(s.value);
                v.num.push(s.driven_teeth as u64 / g);
                v.den.push(s.driver_teeth as u64 / g);
                v.start.push(i as u32);
                v.len.push(1);
                v.min_size.push(size);
                v.min_span.push(span);
            }
        }
        v
    }

    /// Number of distinct ratios.
    pub fn count(&self) -> usize {
        self.value.len()
    }
}

/// The pairs of values `c ≤ d` that can end a four-stage train, sorted by product. The two
/// values of a train's first pair are each at most those of its last pair, so the last pair's
/// product is at least the first's and at least √lo; and at most hi over the least value
/// squared. Only those pairs are kept (about a tenth of all pairs for a target near 30), each as
/// one `u64`: the bits of the product in single precision (positive, so ordered as integers),
/// then `c` and `d` as 16 bits each. Sorting the keys sorts by product, then `c`, then `d`.
pub struct PairTable {
    keys: Vec<u64>,
    /// Where each bucket of keys starts (and, last, the number of keys): a key's bucket is its
    /// product's bits above `least_bits`, shifted right by `shift`, so that a bucket holds two
    /// keys on average and a window is found with one look-up instead of a binary search over
    /// the whole table.
    index: Vec<u32>,
    least_bits: u32,
    shift: u32,
}

impl PairTable {
    /// The products the last pair of an `n`-stage train may have for the window `[lo, hi]`,
    /// widened for the rounding to single precision. The last pair holds the two largest of
    /// the `n` values, so its product is at least the train's to the power `2/n`; the other
    /// `n − 2` values are each at least the least value.
    fn bounds(values: &DistinctRatios, lo: f64, hi: f64, n: usize) -> (f64, f64) {
        let least = values.value.first().copied().unwrap_or(1.0);
        let floor = lo.powf(2.0 / n as f64);
        (floor * (1.0 - F32_MARGIN), hi / least.powi(n as i32 - 2) * (1.0 + F32_MARGIN))
    }

    /// The last value `d ≥ c` of each pair `(c, d)` the table keeps, as a range of value ids.
    fn partners(values: &DistinctRatios, c: usize, floor: f64, ceiling: f64) -> std::ops::Range<usize> {
        let v = &values.value;
        let from = c + v[c..].partition_point(|&x| v[c] * x < floor);
        from..from.max(c + v[c..].partition_point(|&x| v[c] * x <= ceiling))
    }

    /// The number of pairs the table of `n`-stage trains for the window `[lo, hi]` would hold.
    pub fn size(values: &DistinctRatios, lo: f64, hi: f64, n: usize) -> usize {
        let (floor, ceiling) = PairTable::bounds(values, lo, hi, n);
        (0..values.count()).map(|c| PairTable::partners(values, c, floor, ceiling).len()).sum()
    }

    /// Would the table of `n`-stage trains for the window `[lo, hi]` fit the memory budget?
    pub fn fits(values: &DistinctRatios, lo: f64, hi: f64, n: usize) -> bool {
        values.count() <= 1 << 16
            && PairTable::size(values, lo, hi, n).saturating_mul(std::mem::size_of::<u64>())
                <= PAIR_TABLE_BUDGET_BYTES
    }

    /// Build the table of `n`-stage trains (`n ≥ 4`) for the window `[lo, hi]`, or `None`
    /// when it would exceed the budget.
    pub fn new(values: &DistinctRatios, lo: f64, hi: f64, n: usize) -> Option<PairTable> {
        if !PairTable::fits(values, lo, hi, n) {
            return None;
        }
        let (floor, ceiling) = PairTable::bounds(values, lo, hi, n);
        let v = &values.value;
        let mut keys = Vec::with_capacity(PairTable::size(values, lo, hi, n));
        for c in 0..values.count() {
            for d in PairTable::partners(values, c, floor, ceiling) {
                let product = (v[c] * v[d]) as f32;
                keys.push((product.to_bits() as u64) << 32 | (c as u64) << 16 | d as u64);
            }
        }
        keys.par_sort_unstable();
        let product_bits = |k: u64| (k >> 32) as u32;
        let least_bits = keys.first().map_or(0, |&k| product_bits(k));
        let spread = keys.last().map_or(0, |&k| product_bits(k) - least_bits);
        let mut shift = 0;
        while shift < 31 && (spread >> shift) as usize > keys.len() / 2 {
            shift += 1;
        }
        let mut index = vec![0u32; (spread >> shift) as usize + 2];
        for &k in &keys {
            index[((product_bits(k) - least_bits) >> shift) as usize + 1] += 1;
        }
        for b in 1..index.len() {
            index[b] += index[b - 1];
        }
        Some(PairTable { keys, index, least_bits, shift })
    }

    /// Number of pairs.
    pub fn len(&self) -> usize {
        self.keys.len()
    }

    /// True when empty.
    pub fn is_empty(&self) -> bool {
        self.keys.is_empty()
    }

    /// The first key of a product at least `lo` (widened): its bucket from the index, then a
    /// binary search inside the bucket.
    fn first_from(&self, lo: f64) -> usize {
        let bits = ((lo * (1.0 - F32_MARGIN)) as f32).to_bits();
        let Some(past) = bits.checked_sub(self.least_bits) else { return 0 };
        let bucket = (past >> self.shift) as usize;
        if bucket + 1 >= self.index.len() {
            return self.keys.len();
        }
        let (from, to) = (self.index[bucket] as usize, self.index[bucket + 1] as usize);
        let key = (bits as u64) << 32;
        from + self.keys[from..to].partition_point(|&k| k < key)
    }

    /// The largest key of a product at most `hi` (widened).
    fn last_key(hi: f64) -> u64 {
        (((hi * (1.0 + F32_MARGIN)) as f32).to_bits() as u64) << 32 | 0xFFFF_FFFF
    }
}

/// The meet engine.
pub struct Meet;

impl BulkEngine for Meet {
    fn name(&self) -> &'static str {
        "meet"
    }

    /// Four to six stages only when their pair table fits its memory budget.
    fn plan(&self, space: &SearchSpace, counts: &[usize]) -> Option<Box<dyn BulkPlan>> {
        let mut counts: Vec<usize> = counts.iter().copied().filter(|&n| applies(space, n)).collect();
        if counts.is_empty() {
            return None;
        }
        let ratios = DistinctRatios::new(space);
        counts.retain(|&n| n <= 3 || PairTable::fits(&ratios, space.lo, space.hi, n));
        let one_by_one = (!counts_in_bulk(space)).then(|| OneByOne::new(space));
        let sets = match (&one_by_one, space.problem.gear_sets) {
            (None, true) => SetCounter::new(space),
            _ => None,
        };
        let pairs = std::array::from_fn(|_| None);
        (!counts.is_empty())
            .then(|| Box::new(MeetPlan { counts, ratios, pairs, sets, one_by_one }) as Box<dyn BulkPlan>)
    }
}

/// The meet engine's share of one search.
struct MeetPlan {
    counts: Vec<usize>,
    ratios: DistinctRatios,
    /// The pair table of each stage count from four up, built when that count is cut.
    pairs: [Option<PairTable>; MAX_STAGES + 1],
    /// Counts the gear sets, when the search lists them, its trains are counted in bulk and
    /// every pairing of other teeth is a stage.
    sets: Option<SetCounter>,
    /// Set when the choices of stages of a sequence must be judged one by one.
    one_by_one: Option<OneByOne>,
}

/// Trains judged one by one, for a search where the choices of stages of one value sequence
/// need not all satisfy it (gears on hand, a train check, a coaxial fit) or need not rank alike
/// (an extra key, several mesh groups). Each choice is judged by [`SearchSpace::judge`] and
/// counted if it satisfies; a gear set is counted by its canonical arrangement, as in a stage
/// engine's run.
struct OneByOne {
    /// The gear-set view, when the search lists gear sets.
    sets: Option<SetTools>,
}

impl OneByOne {
    fn new(space: &SearchSpace) -> OneByOne {
        OneByOne { sets: space.problem.gear_sets.then(|| SetTools::new(space)) }
    }
}

impl BulkPlan for MeetPlan {
    fn stage_counts(&self) -> &[usize] {
        &self.counts
    }

    fn cut(&mut self, space: &SearchSpace, n: usize) -> usize {
        if n >= 4 && self.pairs[n].is_none() {
            self.pairs[n] = PairTable::new(&self.ratios, space.lo, space.hi, n);
        }
        match n {
            4 => PRODUCT_SLICES,
            5.. => self.ratios.count(),
            _ => self.ratios.count().div_ceil(VALUES_PER_UNIT),
        }
    }

    fn run(&self, space: &SearchSpace, n: usize, unit: usize, tally: &mut Tally, tick: &(dyn Fn() + Sync)) {
        let pairs = self.pairs.get(n).and_then(Option::as_ref);
        let run = MeetRun::new(space, &self.ratios, pairs, self.one_by_one.as_ref());
        if n == 4 {
            run.first_pairs(unit, tally);
        } else if n >= 5 {
            run.prefixes(n, unit, tally);
        } else {
            let (len, step) = (self.ratios.count(), VALUES_PER_UNIT);
            run.first_values(n, unit * step, ((unit + 1) * step).min(len), tally);
        }
        // The gear sets of n stages are counted whole by the first unit (so once in a split
        // search), or one by one with their trains; without either they are not counted at all.
        match &self.sets {
            _ if self.one_by_one.is_some() => {}
            Some(counter) if unit == 0 => match counter.count(n) {
                Some(sets) => tally.add_sets(sets),
                None => tally.sets_not_counted(),
            },
            Some(_) => {}
            None => tally.sets_not_counted(),
        }
        tick();
    }

    /// Five and six stages: their prefixes are many more than their units, and a unit's cost
    /// falls steeply with its first value, so the table alone does not bound it. Judging one by
    /// one, four stages too: every train inside the tolerance is then built and judged, which
    /// no table bounds (a loose tolerance lets billions through).
    fn forecast_counts(&self) -> &[usize] {
        let from = if self.one_by_one.is_some() { 4 } else { 5 };
        &self.counts[self.counts.partition_point(|&n| n < from)..]
    }

    fn forecast_splits(&self) -> bool {
        true
    }

    /// The table is built (and its time counted), then the prefixes are sampled by random
    /// descents (Knuth's estimate of a search tree's size): each descent picks one value at
    /// random among those allowed at each position down to the last but one of the prefix,
    /// weighs itself by the product of the numbers of choices, and times the real work under
    /// it (the last value of the prefix by loop, its look-ups in the table, the trains met,
    /// into a scratch tally). The weighted mean time over the descents, an unbiased estimate of
    /// the whole walk, is added to the table's. Four stages descend the same way (a prefix of
    /// two values). Once the estimate after many descents is a few seconds, it stops: nothing
    /// is announced or refused below that.
    fn forecast_seconds(&self, space: &SearchSpace, n: usize, budget: Duration) -> f64 {
        /// Descents at most; past them the estimate is sharp enough.
        const MOST_DESCENTS: usize = 1 << 16;
        /// Descents before an estimate may end the forecast early.
        const FEWEST_DESCENTS: usize = 256;
        /// An estimate below this, after the fewest descents, ends the forecast.
        const QUICK_SECONDS: f64 = 5.0;
        let start = Instant::now();
        let Some(table) = PairTable::new(&self.ratios, space.lo, space.hi, n) else { return 0.0 };
        let built = start.elapsed().as_secs_f64();
        let run = MeetRun::new(space, &self.ratios, Some(&table), self.one_by_one.as_ref());
        let v = &self.ratios.value;
        let firsts = v.partition_point(|&x| x.powi(n as i32) <= space.hi * (1.0 + F32_MARGIN));
        if firsts == 0 {
            return built;
        }
        let mut tally = Tally::new(space.problem, None);
        let mut draws = Draws::new();
        let (mut descents, mut weighted) = (0usize, 0.0f64);
        while descents == 0 || (descents < MOST_DESCENTS && start.elapsed() < budget) {
            if descents >= FEWEST_DESCENTS && built + weighted / (descents as f64) < QUICK_SECONDS {
                break;
            }
            descents += 1;
            let mut seq = [0usize; MAX_STAGES];
            seq[0] = draws.pick(firsts);
            let (mut weight, mut product) = (firsts as f64, v[seq[0]]);
            let mut k = 1;
            // Down to the last but one value of the prefix (five and six stages), or to the
            // whole prefix of two (four stages, where the last but one is the first).
            let depth = (n - 3).max(2);
            while k < depth {
                let (from, to) = run.next_values(n, k, product, seq[k - 1]);
                if from == to {
                    break;
                }
                seq[k] = from + draws.pick(to - from);
                weight *= (to - from) as f64;
                product *= v[seq[k]];
                k += 1;
            }
            if k < depth {
                continue;
            }
            let timed = Instant::now();
            run.grow(n, k, product, &mut seq, &table, &mut tally);
            weighted += weight * timed.elapsed().as_secs_f64();
        }
        built + weighted / descents as f64
    }
}

/// Binomial coefficient for small arguments.
fn choose(n: u64, k: u64) -> u64 {
    (0..k).fold(1u64, |acc, i| acc * (n - i) / (i + 1))
}

/// How far a float can stray from the exact figure it stands for, relative: far above the
/// rounding of a product of six values (about 10⁻¹⁵), far below any tolerance worth asking.
const EXACT_MARGIN: f64 = 1e-9;

/// Everything a unit needs.
struct MeetRun<'a, 's> {
    space: &'a SearchSpace<'s>,
    ratios: &'a DistinctRatios,
    /// The pair table of the stage count run, needed from `n = 4` up.
    pairs: Option<&'a PairTable>,
    /// The target ratio in floating point.
    ratio: f64,
    /// Products strictly inside this window are within tolerance without the exact test.
    surely_within: (f64, f64),
    /// True when the listing is a top-K ranked by error first: then a sequence whose error is
    /// surely larger than that of one the tally already refused cannot be listed either (the
    /// tally's bound only tightens), and is counted without being judged.
    error_first: bool,
    /// The least float |error| of a sequence the tally refused (infinite before any).
    refused_from: std::cell::Cell<f64>,
    /// Set when every choice of stages is judged and counted one by one.
    one_by_one: Option<&'a OneByOne>,
}

impl<'a, 's> MeetRun<'a, 's> {
    fn new(
        space: &'a SearchSpace<'s>,
        ratios: &'a DistinctRatios,
        pairs: Option<&'a PairTable>,
        one_by_one: Option<&'a OneByOne>,
    ) -> Self {
        let p = space.problem;
        let (ratio, tolerance) = (p.target.ratio.to_f64(), p.target.tolerance.to_f64());
        let surely_within = (
            ratio * (1.0 - tolerance) * (1.0 + EXACT_MARGIN),
            ratio * (1.0 + tolerance) * (1.0 - EXACT_MARGIN),
        );
        let error_first = !p.pareto && p.rank.first() == Some(&RankKey::Error);
        MeetRun {
            space,
            ratios,
            pairs,
            ratio,
            surely_within,
            error_first,
            refused_from: std::cell::Cell::new(f64::INFINITY),
            one_by_one,
        }
    }
}

impl MeetRun<'_, '_> {
    /// Every value sequence of `n` stages whose first value is one of `from..to`.
    // The loop variables are value ids that go into the sequence, not just positions in `v`.
    #[allow(clippy::needless_range_loop)]
    fn first_values(&self, n: usize, from: usize, to: usize, tally: &mut Tally) {
        let v = &self.ratios.value;
        let (lo, hi) = (self.space.lo, self.space.hi);
        match n {
            1 => {
                for a in from..to {
                    if (lo..=hi).contains(&v[a]) {
                        self.accept(&[a], v[a], tally);
                    }
                }
            }
            2 => {
                for a in from..to {
                    if v[a] * v[a] > hi {
                        break;
                    }
                    let from = a + v[a..].partition_point(|&x| x * v[a] < lo);
                    for b in from..v.len() {
                        if v[a] * v[b] > hi {
                            break;
                        }
                        self.accept(&[a, b], v[a] * v[b], tally);
                    }
                }
            }
            3 => {
                // Three is cheap enough without the pair table: the middle value by loop, the
                // last by binary search, as the sieve does, but over distinct values.
                let vmax = v.last().copied().unwrap_or(0.0);
                for a in from..to {
                    if v[a].powi(3) > hi {
                        break;
                    }
                    let from_b = a + v[a..].partition_point(|&x| v[a] * x * vmax < lo);
                    for b in from_b..v.len() {
                        let ab = v[a] * v[b];
                        if ab * v[b] > hi {
                            break;
                        }
                        let from_c = b + v[b..].partition_point(|&x| ab * x < lo);
                        for c in from_c..v.len() {
                            if ab * v[c] > hi {
                                break;
                            }
                            self.accept(&[a, b, c], ab * v[c], tally);
                        }
                    }
                }
            }
            _ => unreachable!("the meet engine takes 1 to 3 stages by first value"),
        }
    }

    /// Every four-stage value sequence whose first pair's product lies in slice `slice`. The
    /// first pairs `a ≤ b` of the slice (pruned by the order `a ≤ b ≤ c ≤ d`: `a·b³ ≤ hi`) are
    /// listed and sorted by product, so that their windows in the table of last pairs come in
    /// order and each look-up finds the table's memory warm from the one before; the window is
    /// found through the table's index and scanned while its products can still fit.
    fn first_pairs(&self, slice: usize, tally: &mut Tally) {
        let Some(pairs) = self.pairs else { return };
        let v = &self.ratios.value;
        let (lo, hi) = (self.space.lo, self.space.hi);
        let (Some(&least), Some(&vmax)) = (v.first(), v.last()) else { return };
        let widen = 1.0 + F32_MARGIN;
        // The slices cut [least², √hi] (every first pair's product: a·b ≤ √(a·b³) ≤ √hi)
        // evenly in the logarithm; the first and last reach out to 0 and infinity, so each
        // pair falls in exactly one slice whatever the rounding.
        let (from_product, to_product) = (least * least, (hi * widen).sqrt().max(least * least));
        let bound = |k: usize| match k {
            0 => 0.0,
            k if k >= PRODUCT_SLICES => f64::INFINITY,
            k => from_product * (to_product / from_product).powf(k as f64 / PRODUCT_SLICES as f64),
        };
        let (below, above) = (bound(slice), bound(slice + 1));
        let mut firsts: Vec<u64> = Vec::new();
        for a in 0..v.len() {
            if v[a].powi(4) > hi * widen || v[a] * v[a] >= above {
                break;
            }
            let va = v[a];
            let from = a + v[a..].partition_point(|&x| va * x < below || va * x * vmax * vmax * widen < lo);
            let to = a + v[a..].partition_point(|&x| va * x < above && va * x * x * x <= hi * widen);
            for (b, &vb) in v.iter().enumerate().take(to).skip(from) {
                firsts.push((((va * vb) as f32).to_bits() as u64) << 32 | (a as u64) << 16 | b as u64);
            }
        }
        firsts.sort_unstable();
        for key in firsts {
            let (a, b) = ((key >> 16) as u16 as usize, key as u16 as usize);
            let pl = v[a] * v[b];
            let last = PairTable::last_key(hi / pl);
            for &key in &pairs.keys[pairs.first_from(lo / pl)..] {
                if key > last {
                    break;
                }
                let (c, d) = ((key >> 16) as u16 as usize, key as u16 as usize);
                let product = pl * v[c] * v[d];
                if c >= b && (lo..=hi).contains(&product) {
                    self.accept(&[a, b, c, d], product, tally);
                }
            }
        }
    }

    /// Every `n`-stage value sequence (`n ≥ 5`) whose first value is `a`. The prefixes of
    /// `n − 2` values are grown in non-decreasing order, pruned as they grow: with `x` the
    /// value just chosen and `r` values still to come, the prefix's product times `x^r` must not
    /// pass `hi` and times `vmax^r` must reach `lo`. Each complete prefix's window in the table
    /// of last pairs is scanned for pairs `(c, d)` whose `c` is at least the prefix's last
    /// value. Prefixes that differ only in their last value come in ascending product, so their
    /// windows sweep the table in order (no sorting needed to keep its memory warm).
    fn prefixes(&self, n: usize, a: usize, tally: &mut Tally) {
        let Some(pairs) = self.pairs else { return };
        let v = &self.ratios.value;
        if a >= v.len() || v[a].powi(n as i32) > self.space.hi * (1.0 + F32_MARGIN) {
            return;
        }
        let mut seq = [0usize; MAX_STAGES];
        seq[0] = a;
        let (from, to) = self.next_values(n, 1, v[a], a);
        for b in from..to {
            if self.space.cancelled() {
                return;
            }
            seq[1] = b;
            self.grow(n, 2, v[a] * v[b], &mut seq, pairs, tally);
        }
    }

    /// The value ids that may stand at position `k` of an `n`-stage sequence after a prefix of
    /// product `product` whose last value is `last`.
    fn next_values(&self, n: usize, k: usize, product: f64, last: usize) -> (usize, usize) {
        let v = &self.ratios.value;
        let widen = 1.0 + F32_MARGIN;
        let (lo, hi) = (self.space.lo / widen, self.space.hi * widen);
        let vmax = v.last().copied().unwrap_or(0.0);
        let rest = (n - k - 1) as i32;
        let from = last + v[last..].partition_point(|&x| product * x * vmax.powi(rest) < lo);
        let to = last + v[last..].partition_point(|&x| product * x.powi(rest + 1) <= hi);
        (from, to.max(from))
    }

    /// Extend the prefix `seq[..k]` (of product `product`) to `n − 2` values and meet each
    /// complete prefix with its last pairs from the table.
    fn grow(
        &self,
        n: usize,
        k: usize,
        product: f64,
        seq: &mut [usize; MAX_STAGES],
        pairs: &PairTable,
        tally: &mut Tally,
    ) {
        let v = &self.ratios.value;
        let (lo, hi) = (self.space.lo, self.space.hi);
        if k == n - 2 {
            // The same window walk as four stages', written out on purpose: a shared iterator
            // (slice, take_while, map) measured 1.34 times slower on five stages of 12..60.
            let last = PairTable::last_key(hi / product);
            for &key in &pairs.keys[pairs.first_from(lo / product)..] {
                if key > last {
                    break;
                }
                let (c, d) = ((key >> 16) as u16 as usize, key as u16 as usize);
                let whole = product * v[c] * v[d];
                if c >= seq[k - 1] && (lo..=hi).contains(&whole) {
                    seq[k] = c;
                    seq[k + 1] = d;
                    self.accept(&seq[..n], whole, tally);
                }
            }
            return;
        }
        let (from, to) = self.next_values(n, k, product, seq[k - 1]);
        for (x, &vx) in v.iter().enumerate().take(to).skip(from) {
            seq[k] = x;
            self.grow(n, k + 1, product * vx, seq, pairs, tally);
        }
    }

    /// A value sequence inside the float window (`product` its values' product in floating
    /// point): decide it exactly, count its trains, and spell them out if the best could be
    /// listed. The exact test is skipped only where the float is surely inside the tolerance,
    /// and the listing's test only where the error surely exceeds one already refused.
    fn accept(&self, seq: &[usize], product: f64, tally: &mut Tally) {
        let vals = self.ratios;
        let exact = || {
            let (mut p, mut q) = (1u64, 1u64);
            for &x in seq {
                p *= vals.num[x];
                q *= vals.den[x];
            }
            RelError::of(p, q, self.space.problem.target.ratio)
        };
        let (inner_lo, inner_hi) = self.surely_within;
        let mut error = None;
        if !(product > inner_lo && product < inner_hi) {
            let e = exact();
            if !e.within(self.space.problem.target.tolerance) {
                return;
            }
            error = Some(e);
        }
        // Runs of equal values: (value, uses).
        let mut runs: [(usize, u32); MAX_STAGES] = [(0, 0); MAX_STAGES];
        let mut nruns = 0;
        for &x in seq {
            if nruns > 0 && runs[nruns - 1].0 == x {
                runs[nruns - 1].1 += 1;
            } else {
                runs[nruns] = (x, 1);
                nruns += 1;
            }
        }
        let runs = &runs[..nruns];
        let mut idx = [0u32; MAX_STAGES];
        if self.one_by_one.is_some() {
            self.spell(runs, 0, 0, &mut idx, seq.len(), tally);
            return;
        }
        let count: u64 =
            runs.iter().map(|&(x, k)| choose(vals.len[x] as u64 + k as u64 - 1, k as u64)).product();
        tally.add_count(count);
        let float_error = (product - self.ratio).abs() / self.ratio;
        if self.error_first && float_error > self.refused_from.get() + EXACT_MARGIN * 1e-3 {
            return;
        }
        let best = Candidate {
            stages: [0; MAX_STAGES],
            len: seq.len() as u8,
            error: error.unwrap_or_else(exact),
            size: runs.iter().map(|&(x, k)| k * vals.min_size[x]).sum(),
            span_mm: runs.iter().map(|&(x, _)| vals.min_span[x]).fold(0.0, f64::max),
            extra: 0.0,
        };
        if !tally.could_accept(&best) {
            if self.error_first {
                self.refused_from.set(self.refused_from.get().min(float_error));
            }
            return;
        }
        self.spell(runs, 0, 0, &mut idx, seq.len(), tally);
    }

    /// Every choice of stages for `runs[r..]`, filling `idx` from position `at`.
    fn spell(
        &self,
        runs: &[(usize, u32)],
        r: usize,
        at: usize,
        idx: &mut [u32; MAX_STAGES],
        n: usize,
        tally: &mut Tally,
    ) {
        if r == runs.len() {
            if let Some(c) = self.space.judge(&idx[..n]) {
                match self.one_by_one {
                    None => tally.push_uncounted(c),
                    Some(each) => {
                        tally.push(c);
                        if each.sets.as_ref().is_some_and(|s| s.is_canonical(self.space, &c)) {
                            tally.add_sets(1);
                        }
                    }
                }
            }
            return;
        }
        let (x, k) = runs[r];
        let (start, len) = (self.ratios.start[x], self.ratios.len[x]);
        self.spell_run(runs, r, at, start, start + len, k, idx, n, tally);
    }

    /// Non-decreasing choices of `k` stages from `from..end` for one run, then the next run.
    #[allow(clippy::too_many_arguments)]
    fn spell_run(
        &self,
        runs: &[(usize, u32)],
        r: usize,
        at: usize,
        from: u32,
        end: u32,
        k: u32,
        idx: &mut [u32; MAX_STAGES],
        n: usize,
        tally: &mut Tally,
    ) {
        if k == 0 {
            self.spell(runs, r + 1, at, idx, n, tally);
            return;
        }
        for s in from..end {
            idx[at] = s;
            self.spell_run(runs, r, at + 1, s, end, k - 1, idx, n, tally);
        }
    }
}

/// Can the meet engine take `n`-stage trains of this space? Not with gears to buy, where the
/// sieve prunes on the budget as it descends; and where trains are judged one by one, only
/// from four stages up: up to three the sieve's leaves are the same trains, met a third
/// faster (a three-stage reducer at its default tolerance, measured side by side).
pub fn applies(space: &SearchSpace, n: usize) -> bool {
    (1..=MAX_STAGES).contains(&n) && space.budget.is_none() && (n >= 4 || counts_in_bulk(space))
}

/// Does every choice of stages of a value sequence satisfy the problem, and rank as the best of
/// them bounds it, so that a sequence's trains can be counted at once?
pub fn counts_in_bulk(space: &SearchSpace) -> bool {
    let p = space.problem;
    !p.pool.from_stock
        && p.train_check.is_none()
        && p.extra_key.is_none()
        && p.pool.groups.len() == 1
        && !space.needs_coaxial_fit()
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Ratios a/b of 12..40 teeth, folded into distinct values by hand.
    fn values() -> DistinctRatios {
        let mut all: Vec<(u64, u64)> = Vec::new();
        for p in 12..=40u64 {
            for q in 12..=40u64 {
                let g = crate::numbers::rational::gcd(p as u128, q as u128) as u64;
                if p != q {
                    all.push((p / g, q / g));
                }
            }
        }
        all.sort_by(|x, y| (x.0 * y.1).cmp(&(y.0 * x.1)));
        all.dedup();
        let n = all.len();
        DistinctRatios {
            value: all.iter().map(|&(p, q)| p as f64 / q as f64).collect(),
            num: all.iter().map(|&(p, _)| p).collect(),
            den: all.iter().map(|&(_, q)| q).collect(),
            start: (0..n as u32).collect(),
            len: vec![1; n],
            min_size: vec![0; n],
            min_span: vec![0.0; n],
        }
    }

    #[test]
    fn the_table_keeps_exactly_the_last_pairs_that_can_fit_and_finds_every_window() {
        let v = values();
        for (lo, hi, n) in [(7.9, 8.1, 4), (0.2, 0.21, 5), (1.0, 1.0, 6), (20.0, 30.0, 4), (20.0, 30.0, 6)] {
            let table = PairTable::new(&v, lo, hi, n).expect("a small table fits");
            assert_eq!(table.len(), PairTable::size(&v, lo, hi, n));
            let (floor, ceiling) = PairTable::bounds(&v, lo, hi, n);
            let mut wanted: Vec<(usize, usize)> = Vec::new();
            for c in 0..v.count() {
                for d in c..v.count() {
                    let product = v.value[c] * v.value[d];
                    if product >= floor && product <= ceiling {
                        wanted.push((c, d));
                    }
                }
            }
            let mut kept: Vec<(usize, usize)> =
                table.keys.iter().map(|&k| ((k >> 16) as u16 as usize, k as u16 as usize)).collect();
            assert!(table.keys.windows(2).all(|w| w[0] < w[1]), "sorted, no repeats");
            kept.sort_unstable();
            assert_eq!(kept, wanted, "window {lo}..{hi}, {n} stages");
            // Every look-up through the index agrees with a binary search of the whole table.
            for step in 0..2000 {
                let x = 0.01 * 1.005f64.powi(step);
                let key = (((x * (1.0 - F32_MARGIN)) as f32).to_bits() as u64) << 32;
                assert_eq!(table.first_from(x), table.keys.partition_point(|&k| k < key), "{x}");
            }
        }
    }
}
