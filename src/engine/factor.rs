//! The factor engine, for exact targets: it counts every train that hits the ratio exactly
//! without visiting them, from the factorisations of the tooth products, and spells out only
//! the trains that could be listed.
//!
//! A train of `n` stages hits `p/q` (reduced) exactly when the product of its driven teeth is
//! `k·p` and that of its drivers `k·q` for some whole `k`. When the allowed stages are every
//! pairing of an allowed driver with an allowed driven gear of other teeth (no per-stage ratio,
//! distance or mesh limit), the ordered `n`-tuples of stages that hit the target number
//! `Σ_k F_driven(k·p) · F_driver(k·q)`, where `F(N)` counts the ordered ways to write `N` as a
//! product of `n` allowed tooth counts. Pairings of equal teeth (not stages) are taken out by
//! inclusion–exclusion, and ordered tuples become trains — multisets of stages — by Burnside's
//! lemma over the permutations of the `n` places: a permutation of cycle type λ fixes the
//! tuples that repeat one stage along each cycle, whose products are `∏ t_c^{l_c}`. The sum
//! runs over the `k` whose primes are all at most the largest tooth count, up to the largest
//! `k` the tooth range allows, by classes: a prime whose square passes every tooth count is
//! carried by one gear at most, and primes with the same multiples among the allowed teeth
//! (not dividing the target) can be swapped in every tooth count, so `k` that differ only in
//! which of such alike primes carry which exponents have equal terms. One `k` of each class is
//! counted, times the number of `k` in the class (see `FactorTables::k_classes`); the classes
//! are cut into parts that run in parallel. Every count is a whole number held exactly.
//!
//! Gear sets are counted on the same `k`: a gear set is a multiset of `n` driven teeth with
//! product `k·p` and one of `n` drivers with product `k·q` (Burnside's lemma on each side alone
//! counts them), less the pairs of multisets no pairing of which avoids a 1:1 stage. By Hall's
//! theorem a pairing without equal teeth exists exactly when no tooth count appears more than
//! `n` times among the drivers and driven gears together; at most one count can, and it divides
//! `k` (it divides both products, whose greatest common divisor is `k`), so the pairs left out
//! are counted tooth count by tooth count over the divisors of `k`, by how many of each side
//! carry it.
//!
//! Listing: any train of a given `k` has a size (sum of teeth) of at least
//! `n·(k·p)^{1/n} + n·(k·q)^{1/n}` and a largest gear of at least the `n`-th root of the larger
//! product; both grow with `k`. So `k` is walked upwards, each `k`'s trains are spelt out
//! (factorisations of `k·p` and `k·q` into `n` allowed tooth counts, and every distinct pairing
//! of them into stages) and judged like any engine's candidates, until no train of a larger `k`
//! could enter the listing. A `k` whose products have a prime factor larger than the listing
//! allows (a gear carrying a prime has at least that many teeth) is passed over unspelt.
//!
//! It applies to exact targets (tolerance 0) over gears to be cut in one module, with no
//! train-level check or extra key, up to four stages (six when no gear has more than
//! [`MAX_TEETH_FOR_SIX_STAGES`] teeth).

use std::collections::BTreeMap;

use rayon::prelude::*;

use super::kinds::{BulkEngine, BulkPlan};
use super::space::SearchSpace;
use super::tally::Tally;
use crate::model::pool::MAX_STAGES;
use crate::model::rank::Candidate;
use crate::numbers::rational::RelError;
use crate::numbers::smooth::{for_each_smooth, primes_up_to, Divisors, Factored, ToothSet};

/// Largest tooth count for which five- and six-stage trains are counted here: the table of
/// ordered triples has (teeth)³ entries, 66 MB at this bound.
pub const MAX_TEETH_FOR_SIX_STAGES: u32 = 255;

/// Most terms of Burnside's sum: cycle shapes of at most six places with some cycles taken
/// out number far fewer.
const MAX_TERMS: usize = 64;

/// Most classes of `k` in one part of the sum: parts are tasks for the parallel pool and ticks
/// of the progress bar.
const PART_SIZE: usize = 1 << 12;

/// How many values of `k` pass between two looks at the stop flag.
const CANCEL_EVERY: u32 = 1 << 10;

/// The factor engine.
pub struct Factor;

impl BulkEngine for Factor {
    fn name(&self) -> &'static str {
        "factor"
    }

    fn plan(&self, space: &SearchSpace, counts: &[usize]) -> Option<Box<dyn BulkPlan>> {
        let tables = FactorTables::new(space)?;
        let counts: Vec<usize> = counts.iter().copied().filter(|&n| tables.applies(n)).collect();
        (!counts.is_empty())
            .then(|| Box::new(FactorPlan { tables, counts, sums: Vec::new() }) as Box<dyn BulkPlan>)
    }
}

/// The factor engine's share of one search: one unit per stage count, whose Burnside sum is
/// cut into parts only when the unit is kept (cutting costs about a pass over the `k`).
struct FactorPlan {
    tables: FactorTables,
    counts: Vec<usize>,
    /// The sums of the units kept.
    sums: Vec<BurnsideSum>,
}

impl BulkPlan for FactorPlan {
    fn stage_counts(&self) -> &[usize] {
        &self.counts
    }

    fn cut(&mut self, _space: &SearchSpace, _n: usize) -> usize {
        1
    }

    fn prepare(&mut self, space: &SearchSpace, n: usize, _unit: usize) -> u64 {
        let sum = self.tables.burnside_sum(n, true, space.problem.gear_sets);
        let ticks = sum.ticks();
        self.sums.push(sum);
        ticks
    }

    fn run(&self, space: &SearchSpace, n: usize, _unit: usize, tally: &mut Tally, tick: &(dyn Fn() + Sync)) {
        match self.sums.iter().find(|s| s.stages() == n) {
            Some(sum) => self.tables.run(space, sum, tally, tick),
            None => unreachable!("every unit kept is prepared before it runs"),
        }
    }

    /// A stage count is one unit, so the driver cannot sample it: the forecast asks here.
    fn forecast_counts(&self) -> &[usize] {
        &self.counts
    }

    fn forecast_seconds(&self, space: &SearchSpace, n: usize, budget: std::time::Duration) -> f64 {
        self.tables.forecast_seconds(&self.tables.burnside_sum(n, false, space.problem.gear_sets), budget)
    }
}

/// Everything the factor engine needs, prepared once per search.
pub struct FactorTables {
    driven: ToothSet,
    driver: ToothSet,
    /// Tooth counts allowed as both driver and driven: each makes one 1:1 pairing, which is not
    /// a stage.
    both: i128,
    /// The target's parts, factored; `None` when one has a prime above every tooth count on
    /// its side, so that no train hits it.
    parts: Option<(Factored, Factored)>,
    /// The primes `k` may have: those up to the smaller of the largest driver and driven.
    primes: Vec<u32>,
    /// The primes of `primes` whose square is at most the largest tooth count: a gear may carry
    /// any number of them.
    small: Vec<u32>,
    /// The other primes of `primes` that some gear on each side carries, in classes of primes
    /// that play alike (see [`prime_classes`]), each ascending, by least prime ascending.
    classes: Vec<Vec<u64>>,
    /// Stage-table index of each (driver, driven) pairing, at `driver·(hi_driven + 1) + driven`.
    index: Vec<u32>,
    module_mm: f64,
}

impl FactorTables {
    /// Prepare for `space`, or `None` when the engine does not apply to it.
    pub fn new(space: &SearchSpace) -> Option<FactorTables> {
        let problem = space.problem;
        let pool = &problem.pool;
        if !problem.target.tolerance.is_zero()
            || pool.from_stock
            || pool.groups.len() != 1
            || problem.train_check.is_some()
            || problem.extra_key.is_some()
            || problem.equal_teeth_stages
            || space.needs_coaxial_fit()
            || space.stages.is_empty()
        {
            return None;
        }
        let mut driven: Vec<u32> = space.stages.iter().map(|s| s.driven_teeth).collect();
        let mut driver: Vec<u32> = space.stages.iter().map(|s| s.driver_teeth).collect();
        driven.sort_unstable();
        driven.dedup();
        driver.sort_unstable();
        driver.dedup();
        let both = driver.iter().filter(|t| driven.binary_search(t).is_ok()).count();
        // The stages are a subset of the pairings of these drivers and driven gears with
        // different teeth; as many of them means all of them.
        if space.stages.len() != driven.len() * driver.len() - both {
            return None;
        }
        let hi_driven = *driven.last()? as usize;
        let hi_driver = *driver.last()? as usize;
        let six = problem.stages.hi >= 5 && hi_driven.max(hi_driver) <= MAX_TEETH_FOR_SIX_STAGES as usize;
        let mut index = vec![u32::MAX; (hi_driver + 1) * (hi_driven + 1)];
        for (i, s) in space.stages.iter().enumerate() {
            index[s.driver_teeth as usize * (hi_driven + 1) + s.driven_teeth as usize] = i as u32;
        }
        let ratio = problem.target.ratio;
        let parts = Factored::of(ratio.num(), &primes_up_to(hi_driven as u32))
            .zip(Factored::of(ratio.den(), &primes_up_to(hi_driver as u32)));
        let primes = primes_up_to(hi_driven.min(hi_driver) as u32);
        let widest = hi_driven.max(hi_driver) as u64;
        let small: Vec<u32> = primes.iter().copied().filter(|&r| r as u64 * r as u64 <= widest).collect();
        let pinned = (ratio.num(), ratio.den());
        let classes = prime_classes(&primes[small.len()..], &driven, &driver, pinned);
        let driven_set = ToothSet::new(&driven, six);
        // Most searches allow the same teeth on both sides: one set then serves both, and its
        // large table sits in the caches once.
        let driver_set = if driver == driven { driven_set.clone() } else { ToothSet::new(&driver, six) };
        Some(FactorTables {
            driven: driven_set,
            driver: driver_set,
            both: both as i128,
            parts,
            primes,
            small,
            classes,
            index,
            module_mm: pool.groups[0].module_mm,
        })
    }

    /// Can it take `n`-stage trains?
    pub fn applies(&self, n: usize) -> bool {
        (1..=MAX_STAGES).contains(&n) && self.driven.supports(n as u32) && self.driver.supports(n as u32)
    }

    /// Count the trains of `burnside` into `tally` and offer those that could be listed, calling
    /// `tick` once per part of the count and once for the listing.
    pub(crate) fn run(
        &self,
        space: &SearchSpace,
        burnside: &BurnsideSum,
        tally: &mut Tally,
        tick: &(dyn Fn() + Sync),
    ) {
        let Some((count, sets)) = self.count(space, burnside, tick) else { return };
        tally.add_count(count);
        match sets {
            Some(sets) => tally.add_sets(sets),
            None => tally.sets_not_counted(),
        }
        if count > 0 {
            self.list(space, burnside.n, tally);
        }
        tick();
    }

    /// The range of `k` for products of `factors` teeth on each side (empty when `lo > hi`).
    fn k_range(&self, factors: u32) -> (u64, u64) {
        let Some((p, q)) = &self.parts else { return (1, 0) };
        let pow = |x: u64| x.checked_pow(factors).unwrap_or(u64::MAX);
        let lo = pow(self.driven.lo()).div_ceil(p.value()).max(pow(self.driver.lo()).div_ceil(q.value()));
        let hi = (pow(self.driven.hi()) / p.value()).min(pow(self.driver.hi()) / q.value());
        (lo.max(1), hi)
    }

    /// Burnside's sum for the `n`-stage trains: its terms and, when `cut`, the parts
    /// of the sum over `k` (cutting costs about a pass over the `k`; a forecast needs no parts),
    /// with the sums that count gear sets when `sets`.
    pub fn burnside_sum(&self, n: usize, cut: bool, sets: bool) -> BurnsideSum {
        let mut constant = 0;
        let mut terms = Vec::new();
        for (powers, coef) in cycle_terms(n, self.both) {
            if powers.is_empty() {
                // No stage left: the empty product, which hits only the target 1.
                if self.parts.is_some_and(|(p, q)| p.value() == 1 && q.value() == 1) {
                    constant += coef;
                }
                continue;
            }
            let (k_lo, k_hi) = self.k_range(powers.iter().sum());
            if k_lo <= k_hi && self.parts.is_some() {
                let perms = (powers.iter().sum::<u32>() == n as u32)
                    .then(|| {
                        multiset_terms(n).into_iter().find(|(shape, _)| *shape == powers).map(|(_, c)| c)
                    })
                    .flatten();
                terms.push(Term { powers, coef, perms, k_lo, k_hi });
            }
        }
        let k_hi = terms.iter().map(|t| t.k_hi).max().unwrap_or(0);
        let keys = if terms.is_empty() || !cut { Vec::new() } else { self.k_classes(n, k_hi) };
        // Multisets of m teeth, m ≤ n, on one side: Burnside's lemma over the permutations of m.
        let multisets = sets.then(|| (0..=n).map(multiset_terms).collect());
        BurnsideSum { n, constant, terms, k_hi, keys, multisets }
    }

    /// One class of `k` for every way the primes of `k` can play, each with how many `k` up
    /// to `k_hi` it stands for: `(least k of the class, how many)`.
    ///
    /// A prime `r` with `r² >` every tooth count is carried by one gear at most, as `r·c` with
    /// `c < r`; two such primes with the same cofactors `c` on each side (and neither dividing
    /// the target) can be swapped in every tooth count without changing which are allowed, so
    /// swapping them in `k` changes no count of the sum. So what matters of `k` is its product
    /// of small primes and, class by class of [`prime_classes`], the exponents its primes of
    /// that class carry, not which primes carry them. A class of `k` fixes those; it stands for
    /// the ways to give the exponents to distinct primes of each class, and is stood for by the
    /// least `k` (largest exponents on least primes). A `k` of more than `n` such primes (with
    /// their exponents) needs more than `n` gears, and is left out; so is a class whose least
    /// `k` passes `k_hi` (every `k` of it does too).
    fn k_classes(&self, n: usize, k_hi: u64) -> Vec<(u64, u64)> {
        let mut smooth = vec![1u64];
        for &r in &self.small {
            for i in 0..smooth.len() {
                let mut x = smooth[i];
                while let Some(y) = x.checked_mul(r as u64).filter(|&y| y <= k_hi) {
                    smooth.push(y);
                    x = y;
                }
            }
        }
        smooth.sort_unstable();
        let mut out = Vec::new();
        let mut walk = ClassWalk { classes: &self.classes, smooth: &smooth, k_hi, out: &mut out };
        walk.take_classes(0, 1, 1, n as u32);
        out
    }

    /// Burnside's sum over one part of the classes of `k`, and the gear sets of that part when
    /// the sum counts them, or `None` when the search was stopped.
    pub fn part_sum(&self, space: &SearchSpace, burnside: &BurnsideSum, part: usize) -> Option<(i128, i128)> {
        let (mut sum, mut sets) = (0i128, 0i128);
        let mut lists = SideDivisors::default();
        let start = part * PART_SIZE;
        let chunk =
            &burnside.keys[start.min(burnside.keys.len())..(start + PART_SIZE).min(burnside.keys.len())];
        for (i, &(k, ways)) in chunk.iter().enumerate() {
            if i as u32 % CANCEL_EVERY == 0 && space.cancelled() {
                return None;
            }
            let Some(k) = Factored::of(k, &self.primes) else { continue };
            let (t, g) = self.k_sums(burnside, &k, &mut lists);
            sum += t * ways as i128;
            sets += g * ways as i128;
        }
        Some((sum, sets))
    }

    /// Burnside's sum for one `k`: every term's ordered products on both sides; and the gear
    /// sets of that `k` when the sum counts them (0 otherwise): pairs of a multiset of driven
    /// teeth with product `k·p` and one of drivers with product `k·q` that some pairing without
    /// a 1:1 stage turns into a train. The multisets are counted from the same ordered products
    /// (the terms of the shapes of all `n` places), so counting gear sets adds little. The
    /// divisors of each side's product are listed once in `lists` for every shape.
    fn k_sums(&self, burnside: &BurnsideSum, k: &Factored, lists: &mut SideDivisors) -> (i128, i128) {
        let Some((p, q)) = &self.parts else { return (0, 0) };
        // k is within the largest term's bound, so the products fit.
        let (Some(driven), Some(driver)) = (k.mul(p), k.mul(q)) else { return (0, 0) };
        // The driven side first: when no term has driven tuples of this k, neither trains nor
        // sets need the drivers. (A term with stages taken out counts trains of another k, so
        // one term's zero says nothing of the others.)
        let mut driven_counts = [0u64; MAX_TERMS];
        let mut any_driven = false;
        for (a, t) in driven_counts.iter_mut().zip(&burnside.terms) {
            if (t.k_lo..=t.k_hi).contains(&k.value()) {
                *a = self.driven.ordered_products_in(&driven, &t.powers, &mut lists.driven);
                any_driven |= *a > 0;
            }
        }
        if !any_driven {
            return (0, 0);
        }
        let sets = burnside.multisets.is_some();
        let mut sum = 0;
        // Σ permutations · ordered products over the shapes of n, on each side.
        let (mut driven_sets, mut driver_sets) = (0i128, 0i128);
        for (&a, t) in driven_counts.iter().zip(&burnside.terms) {
            let whole = t.perms.filter(|_| sets && (t.k_lo..=t.k_hi).contains(&k.value()));
            if a == 0 && whole.is_none() {
                continue;
            }
            let b = self.driver.ordered_products_in(&driver, &t.powers, &mut lists.driver) as i128;
            sum += t.coef * a as i128 * b;
            if let Some(perms) = whole {
                driven_sets += perms * a as i128;
                driver_sets += perms * b;
            }
        }
        if driven_sets == 0 || driver_sets == 0 {
            return (sum, 0);
        }
        let orderings: i128 = (1..=burnside.n as i128).product();
        let sets = (driven_sets / orderings) * (driver_sets / orderings);
        (sum, sets - self.without_pairing(burnside, k, &driven, &driver))
    }

    /// The pairs of multisets (drivers with product `driver`, driven gears with product
    /// `driven`) that no pairing without a 1:1 stage turns into a train: by Hall's theorem,
    /// those where one tooth count is carried `a` times by the drivers and `b` times by the
    /// driven gears with `a + b > n`.
    fn without_pairing(
        &self,
        burnside: &BurnsideSum,
        k: &Factored,
        driven: &Factored,
        driver: &Factored,
    ) -> i128 {
        let Some(terms) = &burnside.multisets else { return 0 };
        if self.both == 0 {
            return 0;
        }
        let n = burnside.n;
        let mut out = 0;
        let Some((p, q)) = &self.parts else { return 0 };
        // t divides k, and t^(n+1) divides the product of both sides, k²·p·q: prime by prime,
        // t's exponent is at most the least of v(k) and (2·v(k) + v(p) + v(q)) / (n + 1). Most
        // k leave no room for a tooth count there, and are done at once.
        let exponent = |f: &Factored, r: u32| f.powers().find(|&(x, _)| x == r).map_or(0, |(_, e)| e as u32);
        let mut room = 1u64;
        for (r, e) in k.powers() {
            let e = e as u32;
            let most = e.min((2 * e + exponent(p, r) + exponent(q, r)) / (n as u32 + 1));
            room *= (r as u64).pow(most);
        }
        let lo = self.driven.lo().max(self.driver.lo());
        let hi = self.driven.hi().min(self.driver.hi()).min(room);
        if lo > hi {
            return 0;
        }
        let Some(room) = Factored::of(room, &self.primes) else { return 0 };
        room.for_each_divisor(lo, hi, &mut |t| {
            if !(self.driven.contains(t) && self.driver.contains(t)) {
                return;
            }
            // The most times t can be carried on each side: its power in the side's product.
            let most = |x: &Factored| {
                (1..=n).take_while(|&a| x.divided_by(t, a as u32).is_some()).last().unwrap_or(0)
            };
            let (most_driver, most_driven) = (most(driver), most(driven));
            if most_driver + most_driven <= n {
                return;
            }
            let mut with_b = [0i128; MAX_STAGES + 1];
            for (b, w) in with_b.iter_mut().enumerate().take(most_driven + 1).skip(n + 1 - most_driver) {
                *w = exactly(&self.driven, driven, t, b, n, terms);
            }
            for a in (n + 1 - most_driven)..=most_driver {
                let with_a = exactly(&self.driver, driver, t, a, n, terms);
                if with_a != 0 {
                    out += with_a * with_b[(n + 1 - a)..=most_driven].iter().sum::<i128>();
                }
            }
        });
        out
    }

    /// Forecast the seconds one thread needs for [`FactorTables::count`] on `burnside`: the
    /// classes of `k` are listed (as the count lists them), and the mean time of a class,
    /// timed on classes drawn from a fixed seed, is scaled to all of them; probing lasts about
    /// `budget`, or less once a few hundred probes agree that it is quick.
    pub fn forecast_seconds(&self, burnside: &BurnsideSum, budget: std::time::Duration) -> f64 {
        /// Below this many seconds (one thread) a count is quick, and the forecast need not be
        /// sharp: it is half the shortest forecast a command acts on (a note past 30 s), so an
        /// estimate from a few hundred probes that is off by half still leads to the same.
        const QUICK_S: f64 = 15.0;
        if burnside.terms.is_empty() {
            return 0.0;
        }
        let start = std::time::Instant::now();
        let keys = self.k_classes(burnside.n, burnside.k_hi);
        let listing = start.elapsed().as_secs_f64();
        if keys.is_empty() {
            return listing;
        }
        let mut seed = 0x9e37_79b9_7f4a_7c15u64;
        let (mut probes, mut spent) = (0usize, 0.0f64);
        let estimate = |probes: usize, spent: f64| listing + spent / probes as f64 * keys.len() as f64;
        while probes == 0
            || (probes < keys.len()
                && start.elapsed() < budget
                && (probes < 500 || estimate(probes, spent) > QUICK_S))
        {
            // xorshift64*: plenty for drawing classes.
            seed ^= seed >> 12;
            seed ^= seed << 25;
            seed ^= seed >> 27;
            let (k, _) = keys[(seed.wrapping_mul(0x2545_f491_4f6c_dd1d) % keys.len() as u64) as usize];
            let t = std::time::Instant::now();
            if let Some(k) = Factored::of(k, &self.primes) {
                std::hint::black_box(self.k_sums(burnside, &k, &mut SideDivisors::default()));
            }
            spent += t.elapsed().as_secs_f64();
            probes += 1;
        }
        estimate(probes, spent)
    }

    /// The number of trains of `burnside` that hit the target, with the number of gear sets
    /// when the sum counts them, or `None` when the search was stopped before it was known;
    /// `tick` is called after each part.
    pub fn count(
        &self,
        space: &SearchSpace,
        burnside: &BurnsideSum,
        tick: &(dyn Fn() + Sync),
    ) -> Option<(u64, Option<u64>)> {
        let n = burnside.n;
        // The parts differ in size, so each is its own task.
        let sums: Vec<Option<(i128, i128)>> = (0..burnside.keys.len().div_ceil(PART_SIZE))
            .into_par_iter()
            .with_max_len(1)
            .map(|i| {
                let sum = self.part_sum(space, burnside, i);
                tick();
                sum
            })
            .collect();
        let mut total = burnside.constant;
        let mut sets = 0i128;
        for s in sums {
            let (t, g) = s?;
            total += t;
            sets += g;
        }
        let orderings: i128 = (1..=n as i128).product();
        debug_assert_eq!(total % orderings, 0, "Burnside's sum is a multiple of n!");
        // Trains of at most six stages of at most 1000 teeth number far fewer than 2⁶⁴.
        let trains = u64::try_from(total / orderings).unwrap_or(u64::MAX);
        let sets = burnside.multisets.as_ref().map(|_| u64::try_from(sets).unwrap_or(u64::MAX));
        Some((trains, sets))
    }

    /// Offer the `n`-stage trains that could be listed, walking `k` upwards.
    fn list(&self, space: &SearchSpace, n: usize, tally: &mut Tally) {
        let Some((p, q)) = &self.parts else { return };
        let (k_lo, k_hi) = self.k_range(n as u32);
        let error = RelError::of(p.value(), q.value(), space.problem.target.ratio);
        let mut from = k_lo;
        let mut cap = k_lo.saturating_mul(16).max(1 << 12).min(k_hi);
        while from <= k_hi {
            // (k, its largest prime), ascending.
            let mut ks: Vec<(u64, u64)> = Vec::new();
            for_each_smooth(&self.primes, from, cap, &mut |k| {
                ks.push((k.value(), k.largest_prime()));
                true
            });
            ks.sort_unstable();
            for (k, k_prime) in ks {
                if space.cancelled() {
                    return;
                }
                let (driven, driver) = (k * p.value(), k * q.value());
                // Bounds that grow with k: once one fails, every larger k fails too.
                let rising = Candidate {
                    stages: [0; MAX_STAGES],
                    len: n as u8,
                    error,
                    size: least_sum(driven, n, self.driven.lo()) + least_sum(driver, n, self.driver.lo()),
                    span_mm: self.module_mm * ceil_root(driven, n).max(ceil_root(driver, n)) as f64,
                    extra: 0.0,
                };
                if !tally.could_accept(&rising) {
                    return;
                }
                // A gear that carries a prime factor has at least that many teeth.
                let largest = k_prime.max(p.largest_prime()).max(q.largest_prime());
                let bound =
                    Candidate { span_mm: rising.span_mm.max(self.module_mm * largest as f64), ..rising };
                if tally.could_accept(&bound) {
                    self.spell(space, n, driven, driver, bound, tally);
                }
            }
            from = cap + 1;
            cap = cap.saturating_mul(8).min(k_hi);
        }
    }

    /// Offer every train whose driven teeth multiply to `driven` and drivers to `driver`.
    fn spell(
        &self,
        space: &SearchSpace,
        n: usize,
        driven: u64,
        driver: u64,
        bound: Candidate,
        tally: &mut Tally,
    ) {
        let driven_sets = factorisations(&self.driven, driven, n);
        if driven_sets.is_empty() {
            return;
        }
        let driver_sets = factorisations(&self.driver, driver, n);
        for d in &driven_sets {
            for r in &driver_sets {
                let group = Candidate {
                    size: d[..n].iter().chain(&r[..n]).sum(),
                    span_mm: self.module_mm * d[..n].iter().chain(&r[..n]).max().copied().unwrap_or(0) as f64,
                    ..bound
                };
                // Every pairing of these gears has this size and span.
                if !tally.could_accept(&group) {
                    continue;
                }
                self.pairings(&d[..n], &r[..n], &mut |idx| {
                    if let Some(c) = space.judge(idx) {
                        tally.push_uncounted(c);
                    }
                });
            }
        }
    }

    /// Every distinct way to pair the driven gears `d` (ascending) with the drivers `r`
    /// (ascending) into stages, as sorted stage-table indices.
    fn pairings(&self, d: &[u32], r: &[u32], visit: &mut dyn FnMut(&[u32])) {
        let mut left: Vec<(u32, u32)> = Vec::with_capacity(r.len());
        for &t in r {
            match left.last_mut() {
                Some((v, c)) if *v == t => *c += 1,
                _ => left.push((t, 1)),
            }
        }
        let mut chosen = [0u32; MAX_STAGES];
        let mut idx = [0u32; MAX_STAGES];
        self.pair_from(d, 0, &mut left, &mut chosen, &mut idx, visit);
    }

    fn pair_from(
        &self,
        d: &[u32],
        at: usize,
        left: &mut [(u32, u32)],
        chosen: &mut [u32; MAX_STAGES],
        idx: &mut [u32; MAX_STAGES],
        visit: &mut dyn FnMut(&[u32]),
    ) {
        let n = d.len();
        if at == n {
            let mut sorted = *idx;
            sorted[..n].sort_unstable();
            visit(&sorted[..n]);
            return;
        }
        let width = self.driven.hi() as usize + 1;
        for j in 0..left.len() {
            let (r, c) = left[j];
            // Equal driven gears take their drivers in ascending order, so each multiset of
            // stages comes once.
            if c == 0 || r == d[at] || (at > 0 && d[at] == d[at - 1] && r < chosen[at - 1]) {
                continue;
            }
            let stage = self.index[r as usize * width + d[at] as usize];
            debug_assert_ne!(stage, u32::MAX, "every pairing of other teeth is a stage");
            left[j].1 -= 1;
            chosen[at] = r;
            idx[at] = stage;
            self.pair_from(d, at + 1, left, chosen, idx, visit);
            left[j].1 += 1;
        }
    }
}

/// The divisors of the driven and the driver product of one `k`, listed once for every shape.
#[derive(Default)]
struct SideDivisors {
    driven: Divisors,
    driver: Divisors,
}

/// One term of Burnside's sum: tuples constant on cycles of these lengths, with the range of
/// `k` their products allow.
struct Term {
    powers: Vec<u32>,
    coef: i128,
    /// For a shape of all `n` places (nothing taken out): how many permutations have it, the
    /// term's weight when the multisets of one side are counted.
    perms: Option<i128>,
    k_lo: u64,
    k_hi: u64,
}

/// The walk of [`FactorTables::k_classes`] over the classes of `k`.
struct ClassWalk<'a> {
    classes: &'a [Vec<u64>],
    /// The products of small primes up to `k_hi`, ascending.
    smooth: &'a [u64],
    k_hi: u64,
    out: &'a mut Vec<(u64, u64)>,
}

impl ClassWalk<'_> {
    /// Every class of `k` that takes its large primes from `classes[from..]` on top of `value`
    /// (which stands for `ways` choices of primes), with at most `left` more of them.
    fn take_classes(&mut self, from: usize, value: u64, ways: u64, left: u32) {
        let fits = self.smooth.partition_point(|&s| s <= self.k_hi / value);
        self.out.extend(self.smooth[..fits].iter().map(|&s| (value * s, ways)));
        if left == 0 {
            return;
        }
        for j in from..self.classes.len() {
            // Classes come least prime ascending: when one does not fit, no later one does.
            if value.checked_mul(self.classes[j][0]).is_none_or(|x| x > self.k_hi) {
                break;
            }
            let mut exps = [0u32; MAX_STAGES];
            self.within(j, 0, left, value, ways, left, &mut exps);
        }
    }

    /// Give the `i`-th prime of class `j` an exponent of at most `most` (exponents descending
    /// along the class), then go on within the class or to the next classes.
    #[allow(clippy::too_many_arguments)]
    fn within(
        &mut self,
        j: usize,
        i: usize,
        most: u32,
        value: u64,
        ways: u64,
        left: u32,
        exps: &mut [u32; MAX_STAGES],
    ) {
        let class = &self.classes[j];
        let r = class[i];
        let mut v = value;
        for e in 1..=most.min(left) {
            match v.checked_mul(r).filter(|&x| x <= self.k_hi) {
                Some(x) => v = x,
                None => return,
            }
            exps[i] = e;
            let chosen = &exps[..=i];
            self.take_classes(j + 1, v, ways * placements(class.len() as u64, chosen), left - e);
            if i + 1 < class.len() && i + 1 < MAX_STAGES {
                self.within(j, i + 1, e, v, ways, left - e, exps);
            }
        }
        exps[i] = 0;
    }
}

/// The ways to give the exponents `exps` (descending) to distinct primes of a class of `size`:
/// `size·(size − 1)⋯` for each exponent, over the orders of equal exponents.
fn placements(size: u64, exps: &[u32]) -> u64 {
    let mut ways = 1u64;
    let mut run = 0u64;
    for (i, &e) in exps.iter().enumerate() {
        ways *= size - i as u64;
        run = if i > 0 && exps[i - 1] == e { run + 1 } else { 1 };
        ways /= run;
    }
    ways
}

/// Burnside's sum over `k` that counts one stage count's trains, cut into parts (see
/// [`FactorTables::burnside_sum`]).
pub struct BurnsideSum {
    n: usize,
    constant: i128,
    terms: Vec<Term>,
    k_hi: u64,
    /// The classes of `k` the sum visits: (least `k` of the class, how many `k` it stands for).
    keys: Vec<(u64, u64)>,
    /// For counting gear sets: Burnside's terms for multisets of `m` teeth, `m` = 0 to `n`.
    multisets: Option<Vec<MultisetTerms>>,
}

impl BurnsideSum {
    /// The stage count.
    pub fn stages(&self) -> usize {
        self.n
    }

    /// Progress ticks of a run: one per part and one for the listing.
    pub fn ticks(&self) -> u64 {
        self.keys.len().div_ceil(PART_SIZE) as u64 + 1
    }
}

/// Burnside's terms for multisets of some number of members: (cycle shape, permutations).
type MultisetTerms = Vec<(Vec<u32>, i128)>;

/// Burnside's terms for multisets of `m` members: for each cycle shape of the permutations of
/// `m` places (powers descending), how many permutations have it.
fn multiset_terms(m: usize) -> MultisetTerms {
    let factorial = |m: u32| (1..=m as i128).product::<i128>();
    partitions(m as u32, m as u32)
        .into_iter()
        .map(|shape| {
            let mut runs: Vec<(u32, u32)> = Vec::new();
            for &l in &shape {
                match runs.last_mut() {
                    Some((len, c)) if *len == l => *c += 1,
                    _ => runs.push((l, 1)),
                }
            }
            let perms = factorial(m as u32)
                / runs.iter().map(|&(l, c)| (l as i128).pow(c) * factorial(c)).product::<i128>();
            (shape, perms)
        })
        .collect()
}

/// The multisets of `m` members of `set` with product `x`, by Burnside's lemma with `terms[m]`.
fn multisets(set: &ToothSet, x: &Factored, m: usize, terms: &[MultisetTerms]) -> i128 {
    if m == 0 {
        return (x.value() == 1) as i128;
    }
    let sum: i128 =
        terms[m].iter().map(|(powers, perms)| perms * set.ordered_products(x, powers) as i128).sum();
    sum / (1..=m as i128).product::<i128>()
}

/// The multisets of `n` members of `set` with product `x` that hold the member `t` exactly `a`
/// times: those of `n − a` with product `x / t^a`, less those of them that hold `t` again.
fn exactly(set: &ToothSet, x: &Factored, t: u64, a: usize, n: usize, terms: &[MultisetTerms]) -> i128 {
    let Some(rest) = x.divided_by(t, a as u32) else { return 0 };
    let at_least = multisets(set, &rest, n - a, terms);
    let more = match (n > a).then(|| rest.divided_by(t, 1)).flatten() {
        Some(r) => multisets(set, &r, n - a - 1, terms),
        None => 0,
    };
    at_least - more
}

/// The factorisations of `n` into `m` members of `set`, each ascending (a multiset of teeth).
fn factorisations(set: &ToothSet, n: u64, m: usize) -> Vec<[u32; MAX_STAGES]> {
    let mut out = Vec::new();
    let mut cur = [0u32; MAX_STAGES];
    factorisations_from(set, n, m, 0, set.lo(), &mut cur, &mut out);
    out
}

fn factorisations_from(
    set: &ToothSet,
    n: u64,
    m: usize,
    at: usize,
    min: u64,
    cur: &mut [u32; MAX_STAGES],
    out: &mut Vec<[u32; MAX_STAGES]>,
) {
    if at + 1 == m {
        if n >= min && set.contains(n) {
            cur[at] = n as u32;
            out.push(*cur);
        }
        return;
    }
    let rest = (m - at) as u32;
    let mut t = min;
    while t <= set.hi() && t.checked_pow(rest).is_some_and(|x| x <= n) {
        if n % t == 0 && set.contains(t) {
            cur[at] = t as u32;
            factorisations_from(set, n / t, m, at + 1, t, cur, out);
        }
        t += 1;
    }
}

/// The least sum of `m` whole numbers of at least `lo` whose product is `n`, bounded below:
/// at least `m·lo`, and at least `m·n^(1/m)` (the arithmetic mean is at least the geometric).
fn least_sum(n: u64, m: usize, lo: u64) -> u32 {
    let am_gm = m as f64 * (n as f64).powf(1.0 / m as f64);
    // Shave the float a little so rounding can only lower the bound.
    let bound = (am_gm * (1.0 - 1e-12)).ceil() as u64;
    bound.max(m as u64 * lo) as u32
}

/// The least `r` with `r^m ≥ n`.
fn ceil_root(n: u64, m: usize) -> u64 {
    let mut r = (n as f64).powf(1.0 / m as f64).round() as u64;
    let reaches = |r: u64| (r as u128).pow(m as u32) >= n as u128;
    while r > 1 && reaches(r - 1) {
        r -= 1;
    }
    while !reaches(r) {
        r += 1;
    }
    r
}

/// Burnside's sum for multisets of `n` stages, with the 1:1 pairings taken out: the signed
/// coefficient of each cycle shape (powers descending; empty for the term with no stage left),
/// where `both` is the number of tooth counts allowed on both sides. The trains number
/// `Σ coef · Σ_k F(k·p; powers) · F(k·q; powers) / n!`.
fn cycle_terms(n: usize, both: i128) -> Vec<(Vec<u32>, i128)> {
    let factorial = |m: u32| (1..=m as i128).product::<i128>();
    let binomial = |m: u32, k: u32| factorial(m) / factorial(k) / factorial(m - k);
    let mut terms: BTreeMap<Vec<u32>, i128> = BTreeMap::new();
    for shape in partitions(n as u32, n as u32) {
        // (cycle length, how many cycles of it)
        let mut runs: Vec<(u32, u32)> = Vec::new();
        for &l in &shape {
            match runs.last_mut() {
                Some((len, c)) if *len == l => *c += 1,
                _ => runs.push((l, 1)),
            }
        }
        let permutations = factorial(n as u32)
            / runs.iter().map(|&(l, c)| (l as i128).pow(c) * factorial(c)).product::<i128>();
        // Inclusion–exclusion: cycles whose one stage is a 1:1 pairing, `taken[j]` of run j.
        let mut taken = vec![0u32; runs.len()];
        loop {
            let mut coef = permutations;
            let mut powers = Vec::new();
            let mut removed = 0;
            for (&(l, c), &t) in runs.iter().zip(&taken) {
                coef *= binomial(c, t);
                removed += t;
                powers.extend(std::iter::repeat_n(l, (c - t) as usize));
            }
            coef *= (-both).pow(removed);
            *terms.entry(powers).or_default() += coef;
            // Next choice of `taken`, like an odometer.
            let mut j = 0;
            while j < runs.len() && taken[j] == runs[j].1 {
                taken[j] = 0;
                j += 1;
            }
            if j == runs.len() {
                break;
            }
            taken[j] += 1;
        }
    }
    terms.into_iter().filter(|(_, c)| *c != 0).collect()
}

/// The classes of the `large` primes (each with a square above every tooth count, so carried by
/// one gear at most, as `r·c` with `c < r`): primes with the same cofactors `c` among the
/// `driven` teeth and among the `driver` teeth play alike, unless one divides a part of the
/// target (`pinned`), which is a class alone. A prime no gear on one side carries divides no
/// `k` of a train (`k` divides both products) and is left out. The primes of each class,
/// each ascending, by least prime ascending.
fn prime_classes(large: &[u32], driven: &[u32], driver: &[u32], pinned: (u64, u64)) -> Vec<Vec<u64>> {
    let cofactors =
        |r: u32, side: &[u32]| -> Vec<u32> { side.iter().filter(|&&t| t % r == 0).map(|&t| t / r).collect() };
    let mut classes: BTreeMap<(Vec<u32>, Vec<u32>, u32), Vec<u64>> = BTreeMap::new();
    for &r in large {
        let (on_driven, on_driver) = (cofactors(r, driven), cofactors(r, driver));
        if on_driven.is_empty() || on_driver.is_empty() {
            continue;
        }
        let alone = if pinned.0 % r as u64 == 0 || pinned.1 % r as u64 == 0 { r } else { 0 };
        classes.entry((on_driven, on_driver, alone)).or_default().push(r as u64);
    }
    let mut out: Vec<Vec<u64>> = classes.into_values().collect();
    out.sort_unstable();
    out
}

/// The partitions of `n` into parts of at most `max`, each descending.
fn partitions(n: u32, max: u32) -> Vec<Vec<u32>> {
    if n == 0 {
        return vec![Vec::new()];
    }
    let mut out = Vec::new();
    for first in (1..=max.min(n)).rev() {
        for rest in partitions(n - first, first) {
            let mut shape = vec![first];
            shape.extend(rest);
            out.push(shape);
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn partitions_of_small_numbers() {
        // p(n) for n = 1..6: 1, 2, 3, 5, 7, 11 (common knowledge).
        let counts: Vec<usize> = (1..=6).map(|n| partitions(n, n).len()).collect();
        assert_eq!(counts, vec![1, 2, 3, 5, 7, 11]);
        assert_eq!(partitions(4, 4), vec![vec![4], vec![3, 1], vec![2, 2], vec![2, 1, 1], vec![1, 1, 1, 1]]);
    }

    #[test]
    fn burnside_without_exclusions_counts_multisets() {
        // With nothing excluded and every product allowed, Σ coef · s^(cycles) / n! is the
        // number of multisets of n from s things, C(s + n − 1, n).
        for n in 1..=6usize {
            for s in 1..=7i128 {
                let terms = cycle_terms(n, 0);
                let sum: i128 = terms.iter().map(|(p, c)| c * s.pow(p.len() as u32)).sum();
                let n_fact: i128 = (1..=n as i128).product();
                let want: i128 = (0..n as i128).map(|i| s + i).product::<i128>() / n_fact;
                assert_eq!(sum / n_fact, want, "n {n}, s {s}");
                assert_eq!(sum % n_fact, 0);
            }
        }
    }

    #[test]
    fn least_sum_and_root_are_lower_bounds() {
        assert_eq!(ceil_root(1000, 3), 10);
        assert_eq!(ceil_root(1001, 3), 11);
        assert_eq!(ceil_root(1, 4), 1);
        assert_eq!(ceil_root(200u64.pow(4), 4), 200);
        // 12·12·12·12: the bound is reached exactly.
        assert_eq!(least_sum(12u64.pow(4), 4, 1), 48);
        assert_eq!(least_sum(127 * 12 * 12 * 12, 4, 12), 87);
        assert!(least_sum(127 * 12 * 12 * 12, 4, 12) <= 127 + 36);
        assert_eq!(least_sum(6, 2, 12), 24, "never below m·lo");
    }
}
