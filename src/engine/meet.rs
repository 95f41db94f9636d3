//! The meet engine: meet-in-the-middle over distinct stage ratios, with trains counted in bulk.
//!
//! Many stages share one ratio (12→24, 13→26, …). The engine first folds the stage table into
//! its distinct ratios ("values"), each with the contiguous run of stages that make it. A train
//! of `n ≤ 4` stages is then a non-decreasing sequence of values whose product lies in the
//! window: single values for `n = 1`, a value and a binary-searched partner for `n = 2`, two
//! values and a binary-searched third for `n = 3`, and for `n = 4` a pair of values against a
//! table of all value pairs sorted by product, the window found by binary search. The canonical order (the last
//! value of the left part is at most the first of the right part) keeps each sequence once.
//!
//! A sequence within tolerance stands for every choice of stages from its values; they all share
//! the ratio, so they are counted at once by multiset combinations. They are only spelt out
//! (and judged one by one, like any engine's candidates) when the best of them could still enter
//! the listing. It applies to gears to be cut with no train-level check or extra key, where
//! every choice of stages is as valid as any other; anything else goes to the sieve. The gear
//! sets are counted apart, by the set counter, where every pairing of other teeth is a stage.

use rayon::prelude::*;

use super::kinds::{BulkEngine, BulkPlan};
use super::setcount::SetCounter;
use super::space::SearchSpace;
use super::tally::Tally;
use crate::model::pool::MAX_STAGES;
use crate::model::rank::Candidate;
use crate::numbers::rational::RelError;

/// Most memory the pair table may take, bytes; beyond it the sieve is used instead.
pub const PAIR_TABLE_BUDGET_BYTES: usize = 1 << 30;

/// Relative widening of the single-precision pair products, far above their rounding error.
const F32_MARGIN: f64 = 1e-6;

/// Distinct ratios of the left side handled per unit of work for `n ≤ 3`.
pub const VALUES_PER_UNIT: usize = 16;
/// Pairs of the left side handled per unit of work for `n = 4`.
pub const PAIRS_PER_UNIT: usize = 1 << 16;

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

/// A pair of values `a ≤ b` with its product in single precision.
#[derive(Clone, Copy)]
struct Pair {
    product: f32,
    a: u16,
    b: u16,
}

/// All value pairs `a ≤ b`, sorted by product.
pub struct PairTable {
    pairs: Vec<Pair>,
}

impl PairTable {
    /// Would the table for `d` distinct values fit the memory budget?
    pub fn fits(d: usize) -> bool {
        let n = d * (d + 1) / 2;
        d <= u16::MAX as usize && n.saturating_mul(std::mem::size_of::<Pair>()) <= PAIR_TABLE_BUDGET_BYTES
    }

    /// Build the table, or `None` when it would exceed the memory budget.
    pub fn new(values: &DistinctRatios) -> Option<PairTable> {
        let d = values.count();
        if !PairTable::fits(d) {
            return None;
        }
        let mut pairs: Vec<Pair> = (0..d)
            .into_par_iter()
            .flat_map_iter(|a| {
                let va = values.value[a];
                (a..d).map(move |b| Pair { product: (va * values.value[b]) as f32, a: a as u16, b: b as u16 })
            })
            .collect();
        pairs.par_sort_unstable_by(|x, y| {
            x.product.total_cmp(&y.product).then(x.a.cmp(&y.a)).then(x.b.cmp(&y.b))
        });
        Some(PairTable { pairs })
    }

    /// Number of pairs.
    pub fn len(&self) -> usize {
        self.pairs.len()
    }

    /// True when empty.
    pub fn is_empty(&self) -> bool {
        self.pairs.is_empty()
    }

    /// Index range of pairs whose product may lie in `[lo, hi]`.
    fn window(&self, lo: f64, hi: f64) -> std::ops::Range<usize> {
        let lo32 = (lo * (1.0 - F32_MARGIN)) as f32;
        let hi32 = (hi * (1.0 + F32_MARGIN)) as f32;
        let from = self.pairs.partition_point(|p| p.product < lo32);
        let to = from + self.pairs[from..].partition_point(|p| p.product <= hi32);
        from..to
    }
}

/// The meet engine.
pub struct Meet;

impl BulkEngine for Meet {
    fn name(&self) -> &'static str {
        "meet"
    }

    /// Four stages only when the pair table fits its memory budget.
    fn plan(&self, space: &SearchSpace, counts: &[usize]) -> Option<Box<dyn BulkPlan>> {
        let mut counts: Vec<usize> = counts.iter().copied().filter(|&n| applies(space, n)).collect();
        if counts.is_empty() {
            return None;
        }
        let ratios = DistinctRatios::new(space);
        counts.retain(|&n| n <= 3 || PairTable::fits(ratios.count()));
        let sets = if space.problem.gear_sets { SetCounter::new(space) } else { None };
        (!counts.is_empty())
            .then(|| Box::new(MeetPlan { counts, ratios, pairs: None, sets }) as Box<dyn BulkPlan>)
    }
}

/// The meet engine's share of one search.
struct MeetPlan {
    counts: Vec<usize>,
    ratios: DistinctRatios,
    /// Built when four stages are cut.
    pairs: Option<PairTable>,
    /// Counts the gear sets, when the search lists them and every pairing of other teeth is a
    /// stage.
    sets: Option<SetCounter>,
}

impl MeetPlan {
    /// Left-side entries for `n` stages (values for `n ≤ 3`, pairs for `n = 4`), and how many
    /// a unit takes.
    fn left_side(&self, n: usize) -> (usize, usize) {
        if n == 4 {
            (self.pairs.as_ref().map_or(0, PairTable::len), PAIRS_PER_UNIT)
        } else {
            (self.ratios.count(), VALUES_PER_UNIT)
        }
    }
}

impl BulkPlan for MeetPlan {
    fn stage_counts(&self) -> &[usize] {
        &self.counts
    }

    fn cut(&mut self, _space: &SearchSpace, n: usize) -> usize {
        if n == 4 && self.pairs.is_none() {
            self.pairs = PairTable::new(&self.ratios);
        }
        let (len, step) = self.left_side(n);
        len.div_ceil(step)
    }

    fn run(&self, space: &SearchSpace, n: usize, unit: usize, tally: &mut Tally, tick: &(dyn Fn() + Sync)) {
        let (len, step) = self.left_side(n);
        let run = MeetRun { space, ratios: &self.ratios, pairs: self.pairs.as_ref() };
        run.left_entries(n, unit * step, ((unit + 1) * step).min(len), tally);
        // The gear sets of n stages are counted whole by the first unit (so once in a split
        // search); without a counter they are not counted at all.
        match &self.sets {
            Some(counter) if unit == 0 => match counter.count(n) {
                Some(sets) => tally.add_sets(sets),
                None => tally.sets_not_counted(),
            },
            Some(_) => {}
            None => tally.sets_not_counted(),
        }
        tick();
    }
}

/// Binomial coefficient for small arguments.
fn choose(n: u64, k: u64) -> u64 {
    (0..k).fold(1u64, |acc, i| acc * (n - i) / (i + 1))
}

/// Everything a unit needs.
struct MeetRun<'a, 's> {
    space: &'a SearchSpace<'s>,
    ratios: &'a DistinctRatios,
    /// Needed for `n = 4`.
    pairs: Option<&'a PairTable>,
}

impl MeetRun<'_, '_> {
    /// Every value sequence of `n` stages whose left side is one of the entries `from..to`.
    // The loop variables are value ids that go into the sequence, not just positions in `v`.
    #[allow(clippy::needless_range_loop)]
    fn left_entries(&self, n: usize, from: usize, to: usize, tally: &mut Tally) {
        let v = &self.ratios.value;
        let (lo, hi) = (self.space.lo, self.space.hi);
        match n {
            1 => {
                for a in from..to {
                    if (lo..=hi).contains(&v[a]) {
                        self.accept(&[a], tally);
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
                        self.accept(&[a, b], tally);
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
                            self.accept(&[a, b, c], tally);
                        }
                    }
                }
            }
            4 => {
                let Some(pairs) = self.pairs else { return };
                let root = hi.sqrt() * (1.0 + F32_MARGIN);
                for left in &pairs.pairs[from..to] {
                    let (a, b) = (left.a as usize, left.b as usize);
                    let pl = v[a] * v[b];
                    if pl > root {
                        break;
                    }
                    for p in &pairs.pairs[pairs.window(lo / pl, hi / pl)] {
                        let (c, d) = (p.a as usize, p.b as usize);
                        if c >= b && (lo..=hi).contains(&(pl * v[c] * v[d])) {
                            self.accept(&[a, b, c, d], tally);
                        }
                    }
                }
            }
            _ => unreachable!("the meet engine takes 1 to 4 stages"),
        }
    }

    /// A value sequence inside the float window: decide it exactly, count its trains, and spell
    /// them out if the best could be listed.
    fn accept(&self, seq: &[usize], tally: &mut Tally) {
        let vals = self.ratios;
        let (mut p, mut q) = (1u64, 1u64);
        for &x in seq {
            p *= vals.num[x];
            q *= vals.den[x];
        }
        let target = &self.space.problem.target;
        let error = RelError::of(p, q, target.ratio);
        if !error.within(target.tolerance) {
            return;
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
        let count: u64 =
            runs.iter().map(|&(x, k)| choose(vals.len[x] as u64 + k as u64 - 1, k as u64)).product();
        tally.add_count(count);
        let best = Candidate {
            stages: [0; MAX_STAGES],
            len: seq.len() as u8,
            error,
            size: runs.iter().map(|&(x, k)| k * vals.min_size[x]).sum(),
            span_mm: runs.iter().map(|&(x, _)| vals.min_span[x]).fold(0.0, f64::max),
            extra: 0.0,
        };
        if !tally.could_accept(&best) {
            return;
        }
        let mut idx = [0u32; MAX_STAGES];
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
                tally.push_uncounted(c);
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

/// Can the meet engine take `n`-stage trains of this space?
pub fn applies(space: &SearchSpace, n: usize) -> bool {
    let p = space.problem;
    (1..=4).contains(&n)
        && !p.pool.from_stock
        && p.train_check.is_none()
        && p.extra_key.is_none()
        && p.pool.groups.len() == 1
        && !space.needs_coaxial_fit()
}
