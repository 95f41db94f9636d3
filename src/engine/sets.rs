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
        let mut canonical = true;
        self.for_each_staged_pairing(&self.set_of.of(c), &mut |other| {
            if canonical && other < idx && rearranged(space, c, other).is_some() {
                canonical = false;
            }
        });
        canonical
    }

    /// Every arrangement of `c`'s gear set that satisfies the problem, best first by the
    /// problem's ranking (the best is `c` itself when `c` is the set's best).
    pub fn arrangements(&self, space: &SearchSpace, c: &Candidate) -> Vec<Candidate> {
        let mut all = Vec::new();
        self.for_each_staged_pairing(&self.set_of.of(c), &mut |idx| all.extend(rearranged(space, c, idx)));
        let keys = &space.problem.rank;
        all.sort_by(|a, b| compare(keys, a, b));
        all
    }
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
