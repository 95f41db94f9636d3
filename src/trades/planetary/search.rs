//! The planetary search: every design within the problem's ranges that meets every condition
//! of [`super::conditions`], counted exactly, and the best listed.
//!
//! Ranking (smaller first): the ratio's relative error by magnitude, exactly; a low ratio before
//! a high one at equal magnitude; the size (the largest ring's teeth, so its reference diameter
//! at the one module); fewer planets; then the tooth counts in the order of [`Teeth`]. That is
//! a total order, so the listing is the same whatever the thread count.
//!
//! How it stays fast: the ratio is decided exactly from unreduced products before anything else;
//! coaxiality bounds how far the second mesh's doubled standard centre distance `s2` can be from
//! the first's `s1`, so the last tooth count is only tried in a window. At the carrier's
//! distance `a_w = m((s1 + s2)/4 + o)`, the mesh whose standard distance is the smaller is
//! pulled apart by `m·(|s2 − s1|/4 + o)`, and a tight mesh pulled apart by `Δa > 0` needs a
//! shift of at least `Δa/m` (`a_w − a ≤ m·Σx` for any shift, external or internal), so a
//! feasible design has `|s2 − s1| ≤ max(4·(hi − o), −4·o)` for the highest shift `hi` allowed.
//! Meshes are worked out once per set of tooth counts, and only
//! when some planet count passes the cheaper conditions. Rayon shares the outermost tooth count
//! among the threads; each keeps its own best, merged at the end.
//!
//! [`search_explained`] runs the same search without the window and counts every candidate
//! left out under the first condition it fails ([`LeftOut`]), for a designer asking why.

use std::cmp::Ordering;
use std::sync::atomic::{AtomicBool, AtomicU64, Ordering as AtomicOrdering};

use rayon::prelude::*;

use crate::engine::{Progress, RunOptions};
use crate::model::train::Direction;
use crate::numbers::rational::RelError;

use super::conditions::{
    carrier, check_design, mesh_defects, neighbour_gap, planet_meshes, positions, Condition, Design, Unmet,
};
use super::layout::Gear;
use super::willis::SpeedRatio;
use super::{Arrangement, PlanetaryProblem, Teeth};

/// The outcome of a planetary search.
#[derive(Debug, Clone, PartialEq)]
pub struct PlanetaryOutcome {
    /// Every design meeting every condition.
    pub count: u64,
    /// The best of them, at most the problem's limit, best first.
    pub designs: Vec<Design>,
    /// What was left out and why, when the search was asked to say ([`search_explained`]).
    pub left_out: Option<LeftOut>,
    /// False when the search was stopped before the end ([`search_with`]'s cancel flag): the
    /// count is then a lower bound and the designs the best of those seen.
    pub complete: bool,
}

/// The candidates a search left out, each counted once under the first condition it fails in
/// the order of [`Condition`] (ratio, direction, ring size, coaxiality, assembly, neighbour
/// clearance, meshes), the order [`check_design`] lists them in.
#[derive(Debug, Clone, PartialEq)]
pub struct LeftOut {
    /// Every candidate the ranges hold: each set of tooth counts with each planet count. It is
    /// the search's count plus every count of `conditions`.
    pub candidates: u64,
    /// The conditions that left candidates out, in the order judged; none with a count of 0.
    pub conditions: Vec<ConditionCount>,
}

/// How many candidates one condition left out, with the first of them.
#[derive(Debug, Clone, PartialEq)]
pub struct ConditionCount {
    /// The condition.
    pub condition: Condition,
    /// Candidates (sets of tooth counts with a planet count) it was the first to fail.
    pub count: u64,
    /// The first such candidate by tooth counts (in the order of [`Teeth`]), then planets.
    pub teeth: Teeth,
    /// Its planet count.
    pub planets: u32,
    /// Why it failed, with the numbers: [`check_design`]'s first complaint about it.
    pub unmet: Unmet,
}

/// A design as the search holds it: enough to rank it.
#[derive(Debug, Clone, Copy, PartialEq)]
struct Entry {
    teeth: Teeth,
    planets: u32,
    error: RelError,
}

fn rank(a: &Entry, b: &Entry) -> Ordering {
    a.error
        .cmp_abs(&b.error)
        .then_with(|| a.error.sign.cmp(&b.error.sign))
        .then_with(|| a.teeth.largest_ring().cmp(&b.teeth.largest_ring()))
        .then_with(|| a.planets.cmp(&b.planets))
        .then_with(|| a.teeth.cmp(&b.teeth))
}

/// A count and the best entries seen, holding at most about twice the limit; and, when
/// explaining, the candidates seen and those left out by condition.
#[derive(Debug, Default)]
struct Tally {
    count: u64,
    best: Vec<Entry>,
    explain: bool,
    candidates: u64,
    left_out: Vec<ConditionCount>,
}

impl Tally {
    fn new(explain: bool) -> Tally {
        Tally { explain, ..Tally::default() }
    }

    /// Counts `count` candidates of `teeth` left out by the condition of `unmet`, keeping the
    /// first (`unmet` is only worked out when it is).
    fn leave_out(&mut self, teeth: Teeth, planets: u32, count: u64, unmet: impl FnOnce() -> Unmet) {
        if !self.explain || count == 0 {
            return;
        }
        let unmet = unmet();
        let condition = unmet.condition();
        match self.left_out.iter_mut().find(|c| c.condition == condition) {
            Some(c) => {
                c.count += count;
                if (teeth, planets) < (c.teeth, c.planets) {
                    (c.teeth, c.planets, c.unmet) = (teeth, planets, unmet);
                }
            }
            None => self.left_out.push(ConditionCount { condition, count, teeth, planets, unmet }),
        }
    }

    fn push(&mut self, entry: Entry, limit: usize) {
        self.count += 1;
        if limit == 0 {
            return;
        }
        self.best.push(entry);
        if self.best.len() >= 2 * limit.max(16) {
            self.shrink(limit);
        }
    }

    fn shrink(&mut self, limit: usize) {
        self.best.sort_by(rank);
        self.best.truncate(limit);
    }

    fn merge(mut self, other: Tally, limit: usize) -> Tally {
        self.count += other.count;
        self.best.extend(other.best);
        self.shrink(limit);
        self.explain |= other.explain;
        self.candidates += other.candidates;
        for c in other.left_out {
            self.leave_out(c.teeth, c.planets, c.count, || c.unmet);
        }
        self
    }
}

/// Runs the search: the exact count of designs meeting every condition and the best of them.
///
/// The count is of designs: a set of tooth counts with a planet count. Each listed design is
/// worked out in full by [`check_design`], the same judge that names what a rejected design
/// fails.
pub fn search(problem: &PlanetaryProblem) -> PlanetaryOutcome {
    run(problem, false, &RunOptions::default())
}

/// [`search`], and every candidate in the ranges that it leaves out counted under the first
/// condition it fails ([`PlanetaryOutcome::left_out`]). Slower: every set of tooth counts in
/// the ranges is judged, not only those the coaxiality window lets through.
pub fn search_explained(problem: &PlanetaryProblem) -> PlanetaryOutcome {
    run(problem, true, &RunOptions::default())
}

/// [`search`] (or, with `explain`, [`search_explained`]) reporting progress and heeding a
/// cancel flag through `options`: a unit of work is one tooth count of the outermost gear (the
/// sun, or a two-ring train's first planet gear). When the flag is set the units not yet begun
/// are skipped and the outcome is marked incomplete. `options.shard` is not used.
pub fn search_with(problem: &PlanetaryProblem, explain: bool, options: &RunOptions) -> PlanetaryOutcome {
    run(problem, explain, options)
}

fn run(problem: &PlanetaryProblem, explain: bool, options: &RunOptions) -> PlanetaryOutcome {
    let spec = problem.spec();
    let limit = spec.limit;
    // Explaining, no window: every set is judged, and those the window would have skipped
    // are counted under the condition they fail.
    let window =
        if explain { UNBOUNDED } else { shift_window(spec.shift_sum.1, spec.carrier_offset_modules) };
    let outer = match spec.arrangement {
        Arrangement::TwoRing => spec.range_of(Gear::PlanetRing),
        _ => spec.sun_teeth,
    };
    let outer: Vec<u32> = (outer.lo..=outer.hi).collect();
    let total = outer.len() as u64;
    let done = AtomicU64::new(0);
    let stopped = AtomicBool::new(false);
    let tally = outer
        .into_par_iter()
        .map(|first| {
            let mut tally = Tally::new(explain);
            if options.cancel.is_some_and(|c| c.load(AtomicOrdering::Relaxed)) {
                stopped.store(true, AtomicOrdering::Relaxed);
                return tally;
            }
            visit(problem, first, window, &mut |teeth| judge(problem, teeth, &mut tally));
            let done = done.fetch_add(1, AtomicOrdering::Relaxed) + 1;
            if let Some(progress) = options.progress {
                progress(Progress { done, total });
            }
            tally
        })
        .reduce(|| Tally::new(explain), |a, b| a.merge(b, limit));
    let mut best = tally.best;
    best.sort_by(rank);
    best.truncate(limit);
    let mut conditions = tally.left_out;
    conditions.sort_by_key(|c| c.condition);
    PlanetaryOutcome {
        count: tally.count,
        designs: best.iter().filter_map(|e| check_design(problem, &e.teeth, e.planets).ok()).collect(),
        left_out: explain.then_some(LeftOut { candidates: tally.candidates, conditions }),
        complete: !stopped.load(AtomicOrdering::Relaxed),
    }
}

/// A window wider than any two tooth ranges can differ by.
const UNBOUNDED: i64 = 1 << 40;

/// How far, in doubled standard centre distances, the two meshes may differ when no mesh may
/// take a shift above `hi` modules and the carrier is `offset` modules beyond midway:
/// `max(4·(hi − offset), −4·offset)`, rounded out by one for safety (the exact judge decides).
fn shift_window(hi: f64, offset: f64) -> i64 {
    let bound = (4.0 * (hi - offset)).max(-4.0 * offset);
    // The cap keeps a huge allowance from overflowing; it is beyond any tooth range.
    (bound.min(10_000.0).ceil() as i64 + 1).max(0)
}

/// Whole numbers within `lo..=hi` and the range `range`.
fn clipped(lo: i64, hi: i64, range: crate::numbers::range::IntRange) -> std::ops::RangeInclusive<u32> {
    // `range.lo` is at least 3, so `lo` is positive and `lo − 1` marks an empty range.
    let lo = lo.max(i64::from(range.lo)).min(i64::from(u32::MAX));
    let hi = hi.min(i64::from(range.hi)).max(lo - 1);
    (lo as u32)..=(hi as u32)
}

/// Calls `found` with every set of tooth counts whose outermost count is `first` that lies in
/// the ranges, and whose two meshes' doubled standard centre distances differ by at most
/// `window`.
fn visit(problem: &PlanetaryProblem, first: u32, window: i64, found: &mut dyn FnMut(Teeth)) {
    let spec = problem.spec();
    let rings = spec.ring_teeth;
    let i = i64::from;
    match spec.arrangement {
        Arrangement::Simple { .. } => {
            let sun = first;
            for ring in rings.lo..=rings.hi {
                // s2 − s1 = (ring − planet) − (sun + planet) = ring − sun − 2·planet.
                let d = i(ring) - i(sun);
                let lo = (d - window + 1).div_euclid(2);
                let hi = (d + window).div_euclid(2);
                for planet in clipped(lo, hi, spec.planet_teeth) {
                    found(Teeth::Simple { sun, planet, ring });
                }
            }
        }
        Arrangement::Stepped { .. } => {
            let sun = first;
            let (firsts, seconds) = (spec.range_of(Gear::PlanetSun), spec.range_of(Gear::PlanetRing));
            for p1 in firsts.lo..=firsts.hi {
                for p2 in seconds.lo..=seconds.hi {
                    // s2 − s1 = (ring − p2) − (sun + p1).
                    let centre = i(sun) + i(p1) + i(p2);
                    for ring in clipped(centre - window, centre + window, rings) {
                        found(Teeth::Stepped { sun, planet: [p1, p2], ring });
                    }
                }
            }
        }
        Arrangement::TwoRing => {
            let p1 = first;
            let (seconds, outputs) = (spec.range_of(Gear::PlanetRing2), spec.range_of(Gear::Ring2));
            for p2 in seconds.lo..=seconds.hi {
                for r1 in rings.lo..=rings.hi {
                    // s2 − s1 = (r2 − p2) − (r1 − p1).
                    let centre = i(r1) - i(p1) + i(p2);
                    for r2 in clipped(centre - window, centre + window, outputs) {
                        found(Teeth::TwoRing { planet: [p1, p2], ring: [r1, r2] });
                    }
                }
            }
        }
    }
}

/// Judges one set of tooth counts for every planet count, as [`check_design`] would, and
/// counts and keeps those that pass; when explaining, counts those that fail by the first
/// condition they fail.
fn judge(problem: &PlanetaryProblem, teeth: Teeth, tally: &mut Tally) {
    let spec = problem.spec();
    let (lo, mut hi) = (spec.planets.lo, spec.planets.hi);
    if tally.explain {
        tally.candidates += u64::from(hi - lo + 1);
    }
    if let Some(stock) = problem.stock() {
        // More planets need more of each planet gear, so the counts the stock can furnish are
        // the lowest ones.
        let furnished = (lo..=hi).rev().find(|&n| stock.holds(&teeth, n));
        let first_short = furnished.map_or(lo, |n| n + 1);
        if first_short <= hi {
            let short = u64::from(hi - first_short + 1);
            tally.leave_out(teeth, first_short, short, || {
                stock.shortfalls(&teeth, first_short).into_iter().next().unwrap_or(Unmet::NoRatio)
            });
        }
        match furnished {
            Some(n) => hi = n,
            None => return,
        }
    }
    let every = u64::from(hi - lo + 1);
    let Some((num, den, direction)) = spec.arrangement.unreduced_ratio(&teeth) else {
        tally.leave_out(teeth, lo, every, || Unmet::NoRatio);
        return;
    };
    let error = RelError::of(num, den, spec.ratio);
    if !error.within(spec.tolerance) {
        tally.leave_out(teeth, lo, every, || match SpeedRatio::new(num.into(), den.into(), direction) {
            // The error of the reduced ratio, as check_design words it, to the last bit.
            Some(ratio) => {
                let error = RelError::of(ratio.magnitude.num(), ratio.magnitude.den(), spec.ratio);
                Unmet::Ratio { ratio, error: error.to_f64() }
            }
            None => Unmet::NoRatio,
        });
        return;
    }
    if let Some(wanted) = spec.direction.filter(|&d: &Direction| d != direction) {
        tally.leave_out(teeth, lo, every, || Unmet::Direction { wanted });
        return;
    }
    let carrier = match carrier(
        problem.system(),
        &teeth,
        spec.shift_sum,
        spec.carrier_offset_modules,
        problem.stock().is_some(),
    ) {
        Ok(carrier) => carrier,
        Err(unmet) => {
            tally.leave_out(teeth, lo, every, || unmet);
            return;
        }
    };
    // The meshes are worked out once per set of tooth counts, when a planet count first gets
    // that far: `Ok` when they pass (or are not checked), else the first defect.
    let mut meshes_run: Option<Result<(), Unmet>> = None;
    for planets in lo..=hi {
        let positions = match positions(&teeth, planets, spec.spacing) {
            Ok(p) => p,
            Err(unmet) => {
                tally.leave_out(teeth, planets, 1, || unmet);
                continue;
            }
        };
        if let Err(unmet) = neighbour_gap(&carrier, &positions, spec.tip_clearance_mm) {
            tally.leave_out(teeth, planets, 1, || unmet);
            continue;
        }
        let runs = meshes_run.get_or_insert_with(|| match &spec.mesh_limits {
            None => Ok(()),
            Some(limits) => {
                let meshes = planet_meshes(problem.system(), &teeth, &carrier);
                mesh_defects(&teeth, &meshes, limits).into_iter().next().map_or(Ok(()), Err)
            }
        });
        match runs {
            Ok(()) => tally.push(Entry { teeth, planets, error }, spec.limit),
            Err(unmet) => {
                if !tally.explain {
                    // No later planet count can pass either.
                    return;
                }
                let unmet = unmet.clone();
                tally.leave_out(teeth, planets, 1, || unmet);
            }
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::numbers::rational::Ratio;
    use crate::trades::planetary::PlanetarySpec;
    use std::sync::Mutex;

    fn problem() -> PlanetaryProblem {
        PlanetaryProblem::new(PlanetarySpec::reduction(Ratio::integer(5))).unwrap()
    }

    #[test]
    fn progress_counts_every_sun_once_and_the_result_is_unchanged() {
        let p = problem();
        let seen = Mutex::new(Vec::new());
        let report = |pr: Progress| seen.lock().unwrap().push(pr);
        let with = search_with(&p, false, &RunOptions { progress: Some(&report), ..RunOptions::default() });
        let plain = search(&p);
        assert_eq!((with.count, &with.designs, with.complete), (plain.count, &plain.designs, true));
        let seen = seen.into_inner().unwrap();
        // The default suns are 12..60: 49 units, each reported once, the last at 49 of 49.
        assert_eq!(seen.len(), 49);
        assert!(seen.iter().all(|pr| pr.total == 49));
        assert_eq!(seen.iter().map(|pr| pr.done).max(), Some(49));
    }

    #[test]
    fn a_cancelled_search_says_it_is_incomplete() {
        let stop = AtomicBool::new(true);
        let o = search_with(&problem(), false, &RunOptions { cancel: Some(&stop), ..RunOptions::default() });
        assert!(!o.complete);
        assert_eq!(o.count, 0);
        assert!(search(&problem()).count > 0);
    }
}
