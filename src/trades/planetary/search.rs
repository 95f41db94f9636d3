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

use std::cmp::Ordering;

use rayon::prelude::*;

use crate::model::train::Direction;
use crate::numbers::rational::RelError;

use super::conditions::{
    carrier, check_design, mesh_defects, neighbour_gap, planet_meshes, positions, Design,
};
use super::{Arrangement, PlanetaryProblem, Teeth};

/// The outcome of a planetary search.
#[derive(Debug, Clone, PartialEq)]
pub struct PlanetaryOutcome {
    /// Every design meeting every condition.
    pub count: u64,
    /// The best of them, at most the problem's limit, best first.
    pub designs: Vec<Design>,
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

/// A count and the best entries seen, holding at most about twice the limit.
#[derive(Debug, Default)]
struct Tally {
    count: u64,
    best: Vec<Entry>,
}

impl Tally {
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
        self
    }
}

/// Runs the search: the exact count of designs meeting every condition and the best of them.
///
/// The count is of designs: a set of tooth counts with a planet count. Each listed design is
/// worked out in full by [`check_design`], the same judge that names what a rejected design
/// fails.
pub fn search(problem: &PlanetaryProblem) -> PlanetaryOutcome {
    let spec = problem.spec();
    let limit = spec.limit;
    let window = shift_window(spec.shift_sum.1, spec.carrier_offset_modules);
    let outer: Vec<u32> = match spec.arrangement {
        Arrangement::TwoRing => (spec.planet_teeth.lo..=spec.planet_teeth.hi).collect(),
        _ => (spec.sun_teeth.lo..=spec.sun_teeth.hi).collect(),
    };
    let tally = outer
        .into_par_iter()
        .map(|first| {
            let mut tally = Tally::default();
            visit(problem, first, window, &mut |teeth| judge(problem, teeth, &mut tally));
            tally
        })
        .reduce(Tally::default, |a, b| a.merge(b, limit));
    let mut best = tally.best;
    best.sort_by(rank);
    best.truncate(limit);
    PlanetaryOutcome {
        count: tally.count,
        designs: best.iter().filter_map(|e| check_design(problem, &e.teeth, e.planets).ok()).collect(),
    }
}

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
    let (planets, rings) = (spec.planet_teeth, spec.ring_teeth);
    let i = i64::from;
    match spec.arrangement {
        Arrangement::Simple { .. } => {
            let sun = first;
            for ring in rings.lo..=rings.hi {
                // s2 − s1 = (ring − planet) − (sun + planet) = ring − sun − 2·planet.
                let d = i(ring) - i(sun);
                let lo = (d - window + 1).div_euclid(2);
                let hi = (d + window).div_euclid(2);
                for planet in clipped(lo, hi, planets) {
                    found(Teeth::Simple { sun, planet, ring });
                }
            }
        }
        Arrangement::Stepped { .. } => {
            let sun = first;
            for p1 in planets.lo..=planets.hi {
                for p2 in planets.lo..=planets.hi {
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
            for p2 in planets.lo..=planets.hi {
                for r1 in rings.lo..=rings.hi {
                    // s2 − s1 = (r2 − p2) − (r1 − p1).
                    let centre = i(r1) - i(p1) + i(p2);
                    for r2 in clipped(centre - window, centre + window, rings) {
                        found(Teeth::TwoRing { planet: [p1, p2], ring: [r1, r2] });
                    }
                }
            }
        }
    }
}

/// Judges one set of tooth counts for every planet count, as [`check_design`] would, and
/// counts and keeps those that pass.
fn judge(problem: &PlanetaryProblem, teeth: Teeth, tally: &mut Tally) {
    let spec = problem.spec();
    let Some((num, den, direction)) = spec.arrangement.unreduced_ratio(&teeth) else {
        return;
    };
    let error = RelError::of(num, den, spec.ratio);
    if !error.within(spec.tolerance) || spec.direction.is_some_and(|d: Direction| d != direction) {
        return;
    }
    let Ok(carrier) = carrier(problem.system(), &teeth, spec.shift_sum, spec.carrier_offset_modules) else {
        return;
    };
    let mut meshes_run: Option<bool> = None;
    for planets in spec.planets.lo..=spec.planets.hi {
        let Ok(positions) = positions(&teeth, planets, spec.spacing) else {
            continue;
        };
        if neighbour_gap(&carrier, &positions, spec.tip_clearance_mm).is_err() {
            continue;
        }
        let runs = *meshes_run.get_or_insert_with(|| match &spec.mesh_limits {
            None => true,
            Some(limits) => {
                let meshes = planet_meshes(problem.system(), &teeth, &carrier);
                mesh_defects(&teeth, &meshes, limits).is_empty()
            }
        });
        if !runs {
            return;
        }
        tally.push(Entry { teeth, planets, error }, spec.limit);
    }
}
