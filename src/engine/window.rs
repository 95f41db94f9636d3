//! The window engine: the best trains of a near target over four to six stages, found without
//! counting them all, by walking one side's gears and factoring the other side's product in a
//! window that narrows as better trains are found.
//!
//! A train's ratio is P/Q, P the product of its driven teeth and Q that of its drivers. The
//! engine walks every multiset of `n` tooth counts of one side (the drivers when the target is
//! at least 1, so the side with the smaller product), pruned by what the other side's `n` gears
//! can reach. For each, the other side's product lies in a window around the target times the
//! walked product; every whole number in that window is factored into `n` tooth counts of the
//! other side (by trial division, ascending). Each pair of multisets so found is a gear set; its
//! pairings into stages are judged one by one, like any engine's candidates.
//!
//! The window is the tolerance at first. Once a unit of work holds the listing's K best (gear
//! sets, or trains), it narrows to the error of the K-th, so the window soon holds no whole
//! number for most walked products and the work falls to the walk itself. Every train within
//! the final window of its unit is met, and that window is at least the error of the K-th best
//! of the whole search, so the listing is the proven best; the trains farther out are not all
//! met, and the count is then a lower bound (the tally is told so). Each unit starts afresh,
//! so what it meets, and so the count, does not depend on the thread count.
//!
//! It serves a listing ranked by error first, with a limit and no Pareto front, over gears to
//! be cut in one mesh group; the lineup asks it only when the problem asks for a lower-bound
//! count ([`CountMode::LowerBound`]).

use std::sync::atomic::{AtomicU64, Ordering};
use std::time::{Duration, Instant};

use super::draws::Draws;
use super::kinds::{BulkEngine, BulkPlan};
use super::sets::SetTools;
use super::space::SearchSpace;
use super::tally::Tally;
use crate::model::gearset::GearSet;
use crate::model::pool::MAX_STAGES;
#[cfg(doc)]
use crate::model::problem::CountMode;
use crate::model::problem::Problem;
use crate::model::rank::RankKey;
use crate::numbers::smooth::primes_up_to;

/// The least stage count the engine takes: below it the meet engine counts every train as fast.
pub const MIN_STAGES: usize = 4;

/// Relative widening of the floating-point window: far above the rounding of the target times
/// a product of tooth counts (each exact below 2⁵³; about 2·10⁻¹⁶ together).
/// Whole numbers it lets in by excess are refused by the exact judge.
const FLOAT_MARGIN: f64 = 1e-14;

/// The window engine.
pub struct Window;

/// Does the window engine serve `n`-stage trains of `space`? (A coaxial train without a fixed
/// distance is fitted train by train, and the trains that do not fit are counted as they are
/// met: the sieve keeps that count whole.)
pub fn applies(space: &SearchSpace, n: usize) -> bool {
    (MIN_STAGES..=MAX_STAGES).contains(&n) && suits(space.problem) && !space.needs_coaxial_fit()
}

/// Could a lower-bound count of `problem` ([`CountMode::LowerBound`]) spare it counting some of
/// its trains: would the window engine take one of its stage counts? Asked before a long search,
/// to offer it.
pub fn would_serve(problem: &Problem) -> bool {
    let fitted = problem.mesh.as_ref().is_some_and(|m| m.coaxial && m.centre_distance_mm.is_none());
    problem.stage_counts().iter().any(|&n| n >= MIN_STAGES) && suits(problem) && !fitted
}

/// What the engine needs of a problem beyond its stage count.
fn suits(p: &Problem) -> bool {
    !p.pool.from_stock
        && p.pool.groups.len() == 1
        && !p.pareto
        && p.limit > 0
        && p.rank.first() == Some(&RankKey::Error)
        && !p.target.tolerance.is_zero()
}

impl BulkEngine for Window {
    fn name(&self) -> &'static str {
        "window"
    }

    fn plan(&self, space: &SearchSpace, counts: &[usize]) -> Option<Box<dyn BulkPlan>> {
        let counts: Vec<usize> = counts.iter().copied().filter(|&n| applies(space, n)).collect();
        if counts.is_empty() {
            return None;
        }
        let (drivers, driven) = Side::both(space)?;
        let target = space.problem.target.ratio.to_f64();
        let walk_drivers = target >= 1.0;
        let (walk, other, centre) = match walk_drivers {
            true => (drivers, driven, target),
            false => (driven, drivers, 1.0 / target),
        };
        let tolerance = space.problem.target.tolerance.to_f64();
        let shared_window = AtomicU64::new(tolerance.to_bits());
        Some(Box::new(WindowPlan {
            counts,
            walk,
            other,
            walk_drivers,
            centre,
            tolerance,
            tools: None,
            shared_window,
        }))
    }
}

/// The tooth counts one side of the stages may have, ascending, with the pool kind of each.
struct Side {
    teeth: Vec<u64>,
    kind: Vec<u32>,
    /// Each tooth count to the powers 0 to six, for bounds.
    powers: Vec<[f64; MAX_STAGES + 1]>,
    /// Each tooth count as a divisor.
    divisors: Vec<Divisor>,
    /// The odd primes up to the largest tooth count, as divisors.
    odd_primes: Vec<Divisor>,
}

impl Side {
    /// The drivers' and the driven gears' sides of the stage table; `None` when a tooth count
    /// stands for more than one kind on a side (the engine names gears by their teeth).
    fn both(space: &SearchSpace) -> Option<(Side, Side)> {
        let mut drivers: Vec<(u64, u32)> =
            space.stages.iter().map(|s| (s.driver_teeth as u64, s.driver)).collect();
        let mut driven: Vec<(u64, u32)> =
            space.stages.iter().map(|s| (s.driven_teeth as u64, s.driven)).collect();
        let side = |list: &mut Vec<(u64, u32)>| -> Option<Side> {
            list.sort_unstable();
            list.dedup();
            if list.windows(2).any(|w| w[0].0 == w[1].0) {
                return None;
            }
            let teeth: Vec<u64> = list.iter().map(|x| x.0).collect();
            let most = *teeth.last()? as u32;
            Some(Side {
                powers: teeth.iter().map(|&t| std::array::from_fn(|k| (t as f64).powi(k as i32))).collect(),
                divisors: teeth.iter().map(|&t| Divisor::new(t)).collect(),
                odd_primes: primes_up_to(most).into_iter().skip(1).map(|p| Divisor::new(p as u64)).collect(),
                kind: list.iter().map(|x| x.1).collect(),
                teeth,
            })
        };
        Some((side(&mut drivers)?, side(&mut driven)?))
    }

    /// The product of `n` of the largest tooth count (as `f64`, for bounds).
    fn most(&self, n: usize) -> f64 {
        self.powers.last().map_or(0.0, |p| p[n])
    }

    /// The product of `n` of the least tooth count.
    fn least(&self, n: usize) -> f64 {
        self.powers.first().map_or(0.0, |p| p[n])
    }

    /// Are all the prime factors of `x` at most the largest tooth count? (Else no product of
    /// this side's teeth makes it.)
    fn is_smooth(&self, x: u64) -> bool {
        let mut x = x >> x.trailing_zeros();
        for p in &self.odd_primes {
            if x == 1 {
                return true;
            }
            while let Some(q) = p.divide(x) {
                x = q;
            }
        }
        x == 1
    }
}

/// A divisor tested by multiplication rather than division: `t = 2^shift · odd`, and `t`
/// divides `x` exactly when the low `shift` bits of `x` are zero and `(x >> shift)` times the
/// inverse of `odd` modulo 2⁶⁴ is at most `(2⁶⁴ − 1) / odd` (that product is then the
/// quotient).
#[derive(Debug, Clone, Copy)]
struct Divisor {
    shift: u32,
    inverse: u64,
    most: u64,
}

impl Divisor {
    fn new(t: u64) -> Divisor {
        let shift = t.trailing_zeros();
        let odd = t >> shift;
        // Newton's iteration doubles the correct low bits: 3 (any odd number is its own
        // inverse modulo 8), 6, 12, 24, 48, 96.
        let mut inverse = odd;
        for _ in 0..5 {
            inverse = inverse.wrapping_mul(2u64.wrapping_sub(odd.wrapping_mul(inverse)));
        }
        Divisor { shift, inverse, most: u64::MAX / odd }
    }

    /// `x / t` when `t` divides `x` (`x > 0`).
    fn divide(&self, x: u64) -> Option<u64> {
        if x.trailing_zeros() < self.shift {
            return None;
        }
        let q = (x >> self.shift).wrapping_mul(self.inverse);
        (q <= self.most).then_some(q)
    }
}

/// The window engine's share of one search.
struct WindowPlan {
    counts: Vec<usize>,
    /// The side walked and the side factored.
    walk: Side,
    other: Side,
    /// True when the walked side is the drivers'.
    walk_drivers: bool,
    /// The other side's product over the walked side's, at the target.
    centre: f64,
    /// The tolerance, relative.
    tolerance: f64,
    /// The stage of each pairing, built when the first stage count is cut.
    tools: Option<SetTools>,
    /// The narrowest window any unit has reached, as the bits of a positive `f64` (ordered as
    /// integers): every unit narrows to it as soon as it looks.
    shared_window: AtomicU64,
}

impl BulkPlan for WindowPlan {
    fn stage_counts(&self) -> &[usize] {
        &self.counts
    }

    /// One unit per first (least) tooth count of the walked side.
    fn cut(&mut self, space: &SearchSpace, _n: usize) -> usize {
        if self.tools.is_none() {
            self.tools = Some(SetTools::new(space));
        }
        self.walk.teeth.len()
    }

    fn run(&self, space: &SearchSpace, n: usize, unit: usize, tally: &mut Tally, tick: &(dyn Fn() + Sync)) {
        let Some(tools) = &self.tools else { return };
        let mut walk = Walk::new(self, space, tools, n, tally, self.tolerance);
        if walk.choices(0, 1, 0).contains(&unit) {
            walk.walked[0] = unit;
            walk.descend(1, self.walk.teeth[unit]);
        }
        if walk.window < self.tolerance {
            walk.tally.count_not_all();
        }
        tick();
    }

    fn forecast_counts(&self) -> &[usize] {
        &self.counts
    }

    fn forecast_splits(&self) -> bool {
        true
    }

    /// The walk of the multisets, sampled by random descents (Knuth's estimate of a search
    /// tree's size): each descent picks one member at random among those the bounds allow at
    /// each position but the last, weighs itself by the product of the numbers of choices, and
    /// times the real loop over the last member, with a window of nothing (the walk alone:
    /// what the narrowed window adds, the factoring of the few whole numbers left in it, is not
    /// counted, so this is a least figure).
    fn forecast_seconds(&self, space: &SearchSpace, n: usize, budget: Duration) -> f64 {
        /// Descents at most; past them the estimate is sharp enough.
        const MOST_DESCENTS: usize = 1 << 16;
        let start = Instant::now();
        let tools = SetTools::new(space);
        let mut scratch = Tally::new(space.problem, None);
        let mut walk = Walk::new(self, space, &tools, n, &mut scratch, 0.0);
        let mut draws = Draws::new();
        let (mut descents, mut weighted) = (0usize, 0.0f64);
        while descents == 0 || (descents < MOST_DESCENTS && start.elapsed() < budget) {
            descents += 1;
            let (mut weight, mut w, mut from) = (1.0f64, 1u64, 0usize);
            let mut k = 0;
            while k < n - 1 {
                let range = walk.choices(k, w, from);
                if range.is_empty() {
                    break;
                }
                let j = range.start + draws.pick(range.len());
                weight *= range.len() as f64;
                walk.walked[k] = j;
                w *= self.walk.teeth[j];
                from = j;
                k += 1;
            }
            if k < n - 1 {
                continue;
            }
            let timed = Instant::now();
            walk.descend(n - 1, w);
            weighted += weight * timed.elapsed().as_secs_f64();
        }
        weighted / descents as f64
    }
}

/// One unit's walk: the walked side's multiset so far, the window and the trains met.
struct Walk<'a, 's> {
    plan: &'a WindowPlan,
    space: &'a SearchSpace<'s>,
    tools: &'a SetTools,
    n: usize,
    /// The worker's tally: its K-th best narrows the window.
    tally: &'a mut Tally,
    /// Positions in the walked side's teeth of the multiset so far, ascending.
    walked: [usize; MAX_STAGES],
    /// Positions in the other side's teeth of the factors so far, ascending.
    factors: [usize; MAX_STAGES],
    /// The relative error a train must not pass to be listed: the tolerance, then the K-th best.
    window: f64,
    /// Bounds on the walked product for the other side to reach the target.
    most_walked: f64,
    least_walked: f64,
}

impl<'a, 's> Walk<'a, 's> {
    /// A walk of `n`-stage trains into `tally`, the window at first `window`.
    fn new(
        plan: &'a WindowPlan,
        space: &'a SearchSpace<'s>,
        tools: &'a SetTools,
        n: usize,
        tally: &'a mut Tally,
        window: f64,
    ) -> Self {
        let (centre, tolerance) = (plan.centre, plan.tolerance);
        Walk {
            plan,
            space,
            tools,
            n,
            tally,
            walked: [0; MAX_STAGES],
            factors: [0; MAX_STAGES],
            window,
            most_walked: plan.other.most(n) / (centre * (1.0 - tolerance)) * (1.0 + FLOAT_MARGIN),
            least_walked: plan.other.least(n) / (centre * (1.0 + 2.0 * tolerance)) * (1.0 - FLOAT_MARGIN),
        }
    }
}

impl Walk<'_, '_> {
    /// The positions the walked side's member `k` may take (the first `k` chosen, their
    /// product `w`, the last at position `from`): the least product from there on must not pass
    /// what the other side can reach, and the largest must reach what it needs. Both bounds
    /// move one way with the member, so the positions allowed are one run.
    fn choices(&self, k: usize, w: u64, from: usize) -> std::ops::Range<usize> {
        let left = self.n - k;
        let side = &self.plan.walk;
        let w = w as f64;
        let end = from + side.powers[from..].partition_point(|p| w * p[left] <= self.most_walked);
        let start = from
            + side.powers[from..end]
                .partition_point(|p| w * p[1] * self.plan.walk.most(left - 1) < self.least_walked);
        start..end
    }

    /// Add the walked side's member `k` on (the first `k` are chosen, their product `w`).
    fn descend(&mut self, k: usize, w: u64) {
        if k == self.n {
            self.leaf(w);
            return;
        }
        for j in self.choices(k, w, self.walked[k - 1]) {
            if self.space.cancelled() {
                return;
            }
            self.walked[k] = j;
            self.descend(k + 1, w * self.plan.walk.teeth[j]);
        }
    }

    /// Factor every whole number of the window around the walked product `w`.
    fn leaf(&mut self, w: u64) {
        self.window = self.window.min(f64::from_bits(self.plan.shared_window.load(Ordering::Relaxed)));
        let c = self.plan.centre * w as f64;
        let mut o = 1u64;
        loop {
            // The window narrows as trains are met: its ends are worked out again each time.
            let (lo, hi) = self.ends(c);
            o = o.max(lo);
            if o > hi {
                return;
            }
            self.factor(0, o, 0);
            o += 1;
        }
    }

    /// The whole numbers the other side's product may be, around `c`: |e| ≤ window about
    /// either side's product is (1 ± window)·c, or c/(1 ∓ window), within c·window·(1 + 2·window).
    fn ends(&self, c: f64) -> (u64, u64) {
        let half = c * (self.window * (1.0 + 2.0 * self.window) + FLOAT_MARGIN);
        ((c - half).ceil().max(1.0) as u64, (c + half).floor().max(0.0) as u64)
    }

    /// Narrow the window to the worker's K-th best, once it holds K, and tell the other units.
    fn narrow(&mut self) {
        if let Some(e) = self.tally.error_bound() {
            let e = e.to_f64().abs();
            if e < self.window {
                self.window = e;
                self.plan.shared_window.fetch_min(e.to_bits(), Ordering::Relaxed);
            }
        }
    }

    /// Factor `o` into the other side's members `k..n`, each at least the member at `from`.
    fn factor(&mut self, k: usize, o: u64, from: usize) {
        let side = &self.plan.other;
        let teeth = &side.teeth;
        let left = self.n - k;
        if k == 0 && !side.is_smooth(o) {
            return;
        }
        if left == 1 {
            if let Ok(j) = teeth[from..].binary_search(&o) {
                self.factors[k] = from + j;
                self.gear_set();
            }
            return;
        }
        // The rest must be reached by `left − 1` members at most the largest: `t ≥ o / most`.
        let least = o as f64 / self.plan.other.most(left - 1);
        let start = from + teeth[from..].partition_point(|&t| (t as f64) < least * (1.0 - FLOAT_MARGIN));
        for j in start..teeth.len() {
            if side.powers[j][left] > o as f64 * (1.0 + FLOAT_MARGIN) {
                break;
            }
            if let Some(rest) = side.divisors[j].divide(o) {
                self.factors[k] = j;
                self.factor(k + 1, rest, j);
            }
        }
    }

    /// Judge every pairing into stages of the gear set found (walked members and factors).
    fn gear_set(&mut self) {
        let n = self.n;
        let (walk, other) = (&self.plan.walk, &self.plan.other);
        let walked = self.walked[..n].iter().map(|&j| walk.kind[j]);
        let factored = self.factors[..n].iter().map(|&j| other.kind[j]);
        let set = match self.plan.walk_drivers {
            true => GearSet::of_pairs(walked.zip(factored)),
            false => GearSet::of_pairs(factored.zip(walked)),
        };
        let (space, tally) = (self.space, &mut *self.tally);
        let (mut trains, mut error) = (0u64, None);
        let by_train = !space.problem.gear_sets;
        self.tools.for_each_staged_pairing(&set, &mut |idx| {
            if let Some(c) = space.judge(idx) {
                tally.push_uncounted(c);
                trains += 1;
                error = Some(c.error);
                if by_train {
                    tally.add_met(c.error, 1);
                }
            }
        });
        if let (Some(error), false) = (error, by_train) {
            tally.add_met(error, trains);
        }
        if trains > 0 {
            self.narrow();
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_divisor_by_multiplication_agrees_with_the_remainder() {
        let mut x = 0x2545_f491_4f6c_dd1du64;
        for t in 1..=400u64 {
            let d = Divisor::new(t);
            for k in 0..200u64 {
                // Multiples, their neighbours, and large numbers near the top of the range.
                x ^= x << 13;
                x ^= x >> 7;
                x ^= x << 17;
                for v in [t * (k + 1), t * (k + 1) + 1, t * (k + 1) - 1, x.max(1), u64::MAX - k] {
                    if v == 0 {
                        continue;
                    }
                    let want = (v % t == 0).then(|| v / t);
                    assert_eq!(d.divide(v), want, "{v} / {t}");
                }
            }
        }
    }

    #[test]
    fn smoothness_is_having_no_prime_factor_above_the_largest_tooth() {
        let side = |most: u64| Side {
            teeth: vec![most],
            kind: vec![0],
            powers: vec![[0.0; MAX_STAGES + 1]],
            divisors: vec![Divisor::new(most)],
            odd_primes: primes_up_to(most as u32)
                .into_iter()
                .skip(1)
                .map(|p| Divisor::new(p as u64))
                .collect(),
        };
        let largest_prime = |mut v: u64| {
            let (mut p, mut big) = (2, 1);
            while p * p <= v {
                while v % p == 0 {
                    v /= p;
                    big = p;
                }
                p += 1;
            }
            big.max(v)
        };
        for most in [12u64, 40, 80, 127] {
            let s = side(most);
            for v in (1..20_000u64).chain([2u64.pow(40) * 3 * 79, 127 * 113 * 1024, 131 * 2]) {
                assert_eq!(s.is_smooth(v), largest_prime(v) <= most, "{v} over teeth up to {most}");
            }
        }
    }
}
