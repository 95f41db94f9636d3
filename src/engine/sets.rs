//! Gear sets in a search space: the gear set of a candidate, its arrangements that satisfy the
//! problem (every pairing of its gears that is a stage, judged like any candidate), and its
//! canonical arrangement, the one a search counts the set by. The canonical arrangement is the
//! satisfying one with the smallest stage sequence, so each gear set is counted once, by
//! whichever unit of work finds that arrangement, whatever the thread count or shard. It owns
//! no ranking (the tally's stores keep one entry per set) and no bulk count (each bulk engine
//! counts its own sets or says it cannot).

use std::collections::HashMap;

use super::space::SearchSpace;
use crate::model::gearset::{GearSet, SetOf};
use crate::model::pool::MAX_STAGES;
use crate::model::rank::{compare, Candidate};

/// The gear-set view of one search space.
pub struct SetTools {
    /// The gear set of a candidate.
    pub set_of: SetOf,
    /// Stage-table index of each (driver kind, driven kind) pairing that is a stage.
    stage_of: HashMap<(u32, u32), u32>,
}

impl SetTools {
    /// Prepare for `space`.
    pub fn new(space: &SearchSpace) -> SetTools {
        let kinds: Vec<(u32, u32)> = space.stages.iter().map(|s| (s.driver, s.driven)).collect();
        let stage_of = kinds.iter().enumerate().map(|(i, &k)| (k, i as u32)).collect();
        SetTools { set_of: SetOf::new(kinds), stage_of }
    }

    /// Call `visit` with every pairing of `set` whose pairs are all stages, as sorted
    /// stage-table indices (not yet judged).
    fn for_each_staged_pairing(&self, set: &GearSet, visit: &mut dyn FnMut(&[u32])) {
        set.for_each_pairing(&mut |pairs| {
            let mut idx = [0u32; MAX_STAGES];
            for (slot, p) in idx.iter_mut().zip(pairs) {
                match self.stage_of.get(p) {
                    Some(&i) => *slot = i,
                    None => return,
                }
            }
            let idx = &mut idx[..pairs.len()];
            idx.sort_unstable();
            visit(idx);
        });
    }

    /// Is the satisfying train `c` its gear set's canonical arrangement: does no satisfying
    /// arrangement of the same gears come before it?
    pub fn is_canonical(&self, space: &SearchSpace, c: &Candidate) -> bool {
        let idx = c.stage_indices();
        if !space.needs_coaxial_fit() && space.problem.train_check.is_none() {
            // Every pairing into stages satisfies the problem as `c` does: the first one can be
            // built directly.
            let first = self.first_staged_pairing(&self.set_of.of(c.stage_indices()));
            return first.as_ref().is_some_and(|f| &f[..idx.len()] == idx);
        }
        let mut canonical = true;
        self.for_each_staged_pairing(&self.set_of.of(c.stage_indices()), &mut |other| {
            if canonical && other < idx && rearranged(space, c, other).is_some() {
                canonical = false;
            }
        });
        canonical
    }

    /// The pairing of `set` into stages whose sorted stage sequence comes first, built stage by
    /// stage: each time the pairing of least stage index that leaves the rest able to pair into
    /// stages. (Its least stage comes first in any pairing; a pair of lesser index left for later
    /// could have been taken first, so the sequence built is sorted and the least.)
    fn first_staged_pairing(&self, set: &GearSet) -> Option<[u32; MAX_STAGES]> {
        let n = set.len as usize;
        let (mut drivers, mut driven) = (set.drivers, set.driven);
        let mut out = [0u32; MAX_STAGES];
        for (step, slot) in out.iter_mut().enumerate().take(n) {
            let left = n - step;
            let mut best: Option<(u32, usize, usize)> = None;
            for i in 0..left {
                if i > 0 && drivers[i] == drivers[i - 1] {
                    continue;
                }
                for j in 0..left {
                    if j > 0 && driven[j] == driven[j - 1] {
                        continue;
                    }
                    let Some(&s) = self.stage_of.get(&(drivers[i], driven[j])) else { continue };
                    if best.is_some_and(|(b, _, _)| b <= s) {
                        continue;
                    }
                    let (d, r) = (without(&drivers[..left], i), without(&driven[..left], j));
                    if self.can_pair(&d[..left - 1], &r[..left - 1]) {
                        best = Some((s, i, j));
                    }
                }
            }
            let (s, i, j) = best?;
            *slot = s;
            drivers = without(&drivers[..left], i);
            driven = without(&driven[..left], j);
        }
        Some(out)
    }

    /// Can the drivers `d` and driven gears `r` (each ascending, as many) pair into stages?
    fn can_pair(&self, d: &[u32], r: &[u32]) -> bool {
        let Some((&first, rest)) = d.split_first() else { return true };
        (0..r.len()).any(|j| {
            (j == 0 || r[j] != r[j - 1])
                && self.stage_of.contains_key(&(first, r[j]))
                && self.can_pair(rest, &without(r, j)[..r.len() - 1])
        })
    }

    /// Every arrangement of `c`'s gear set that satisfies the problem, best first by the
    /// problem's ranking (the best is `c` itself when `c` is the set's best).
    pub fn arrangements(&self, space: &SearchSpace, c: &Candidate) -> Vec<Candidate> {
        let mut all = Vec::new();
        self.for_each_staged_pairing(&self.set_of.of(c.stage_indices()), &mut |idx| {
            all.extend(rearranged(space, c, idx))
        });
        let keys = &space.problem.rank;
        all.sort_by(|a, b| compare(keys, a, b));
        all
    }
}

/// `list` without its member at `at`, in order, in a fixed array.
fn without(list: &[u32], at: usize) -> [u32; MAX_STAGES] {
    let mut out = [0u32; MAX_STAGES];
    let mut n = 0;
    for (k, &x) in list.iter().enumerate() {
        if k != at {
            out[n] = x;
            n += 1;
        }
    }
    out
}

/// The verdict on `idx`, an arrangement of the gears of the satisfying train `c`, as
/// [`SearchSpace::judge`] would give it. The ratio, the gears used (so the stock they need), the
/// size and the largest gear are those of `c`; what an arrangement can change is whether its
/// stages fit one centre distance, the train checks and the extra key. Judged here rather than by
/// `judge` so that looking at arrangements adds nothing to the search's own count of trains
/// left out.
fn rearranged(space: &SearchSpace, c: &Candidate, idx: &[u32]) -> Option<Candidate> {
    let mut stages = [0u32; MAX_STAGES];
    stages[..idx.len()].copy_from_slice(idx);
    let mut other = Candidate { stages, ..*c };
    if other.stages == c.stages {
        return Some(*c);
    }
    if space.needs_coaxial_fit() && space.coaxial_meshes(idx).is_none() {
        return None;
    }
    let problem = space.problem;
    if problem.train_check.is_some() || problem.extra_key.is_some() {
        let train = space.train(&other);
        if let Some(check) = &problem.train_check {
            if !(check.0)(&train) {
                return None;
            }
        }
        if let Some(k) = &problem.extra_key {
            other.extra = (k.key)(&train);
        }
    }
    Some(other)
}
