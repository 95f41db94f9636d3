//! Gear sets in a search space: the gear set of a candidate, its arrangements that satisfy the
//! problem (every pairing of its gears that is a stage, judged like any candidate), and its
//! canonical arrangement, the one a search counts the set by. The canonical arrangement is the
//! satisfying one with the smallest stage sequence, so each gear set is counted once, by
//! whichever unit of work finds that arrangement, whatever the thread count or shard. It owns
//! no ranking (the tally's stores keep one entry per set) and no bulk count (each bulk engine
//! counts its own sets or says it cannot).
//!
//! Every train a stage engine finds is tested, so the test must cost little beside finding it:
//! pairings are looked up in a dense table of drivers by driven gears, and the canonical test
//! walks the train's own stages, trying only pairings of lesser stage index.

use super::space::SearchSpace;
use crate::model::gearset::{GearSet, SetOf};
use crate::model::pool::MAX_STAGES;
use crate::model::rank::{compare, Candidate};

/// The gear-set view of one search space.
pub struct SetTools {
    /// The gear set of a candidate.
    pub set_of: SetOf,
    /// Stage-table index of each (driver kind, driven kind) pairing that is a stage.
    stage_of: StageTable,
}

impl SetTools {
    /// Prepare for `space`.
    pub fn new(space: &SearchSpace) -> SetTools {
        let kinds: Vec<(u32, u32)> = space.stages.iter().map(|s| (s.driver, s.driven)).collect();
        let stage_of = StageTable::new(&kinds);
        SetTools { set_of: SetOf::new(kinds), stage_of }
    }

    /// Call `visit` with every pairing of `set` whose pairs are all stages, as sorted
    /// stage-table indices (not yet judged).
    pub(crate) fn for_each_staged_pairing(&self, set: &GearSet, visit: &mut dyn FnMut(&[u32])) {
        set.for_each_pairing(&mut |pairs| {
            let mut idx = [0u32; MAX_STAGES];
            for (slot, p) in idx.iter_mut().zip(pairs) {
                match self.stage_of.get(p.0, p.1) {
                    Some(i) => *slot = i,
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
            // Every pairing into stages satisfies the problem as `c` does: `c` is canonical when
            // it is the first staged pairing of its gears.
            return self.is_first_staged_pairing(idx);
        }
        let mut canonical = true;
        self.for_each_staged_pairing(&self.set_of.of(c.stage_indices()), &mut |other| {
            if canonical && other < idx && rearranged(space, c, other).is_some() {
                canonical = false;
            }
        });
        canonical
    }

    /// Is the sorted stage sequence `idx` the first of the pairings of its gears into stages?
    /// The first is built stage by stage, each time taking the pairing of least stage index
    /// that leaves the rest able to pair into stages. (Its least stage comes first in any
    /// pairing; a pair of lesser index left for later could have been taken first, so the
    /// sequence built is sorted and the least.) `idx` itself leaves its own rest pairable, so
    /// the first takes `idx`'s stage at each step unless a pairing of lesser index also does:
    /// only those are tried, and the walk stays on `idx`'s own gears.
    fn is_first_staged_pairing(&self, idx: &[u32]) -> bool {
        let n = idx.len();
        let (mut drivers, mut driven) = ([0u32; MAX_STAGES], [0u32; MAX_STAGES]);
        // The gears of `idx`, each side ascending: a few members, sorted by insertion.
        for (k, &s) in idx.iter().enumerate() {
            let (a, b) = self.set_of.stage(s);
            insert_sorted(&mut drivers[..=k], a);
            insert_sorted(&mut driven[..=k], b);
        }
        for (step, &own) in idx.iter().enumerate() {
            let left = n - step;
            let (own_driver, own_driven) = self.set_of.stage(own);
            for i in 0..left {
                if i > 0 && drivers[i] == drivers[i - 1] {
                    continue;
                }
                let row = self.stage_of.row(drivers[i]);
                for j in 0..left {
                    if j > 0 && driven[j] == driven[j - 1] {
                        continue;
                    }
                    let Some(s) = StageTable::at(row, driven[j]) else { continue };
                    if s < own
                        && self.can_pair(
                            &without(&drivers[..left], i)[..left - 1],
                            &without(&driven[..left], j)[..left - 1],
                        )
                    {
                        return false;
                    }
                }
            }
            let (Some(i), Some(j)) = (
                drivers[..left].iter().position(|&d| d == own_driver),
                driven[..left].iter().position(|&r| r == own_driven),
            ) else {
                return false;
            };
            drivers = without(&drivers[..left], i);
            driven = without(&driven[..left], j);
        }
        true
    }

    /// Can the drivers `d` and driven gears `r` (each ascending, as many) pair into stages?
    fn can_pair(&self, d: &[u32], r: &[u32]) -> bool {
        let Some((&first, rest)) = d.split_first() else { return true };
        (0..r.len()).any(|j| {
            (j == 0 || r[j] != r[j - 1])
                && self.stage_of.get(first, r[j]).is_some()
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

/// The stage-table index of every (driver kind, driven kind) pairing, dense: a row per kind
/// that drives some stage, a column per kind that is driven in some stage. Four bytes a
/// pairing of a driver with a driven gear, little beside the stage table itself, and a lookup
/// is two loads rather than a hash.
struct StageTable {
    /// Row of each pool kind as a driver, or `NONE`.
    row_of: Vec<u32>,
    /// Column of each pool kind as a driven gear, or `NONE`.
    column_of: Vec<u32>,
    /// Columns per row.
    width: usize,
    /// Stage index of each (row, column), or `NONE`.
    cells: Vec<u32>,
}

/// No row, column or stage.
const NONE: u32 = u32::MAX;

impl StageTable {
    fn new(kinds: &[(u32, u32)]) -> StageTable {
        let len = kinds.iter().map(|&(a, b)| a.max(b) as usize + 1).max().unwrap_or(0);
        let (mut row_of, mut column_of) = (vec![NONE; len], vec![NONE; len]);
        let (mut rows, mut width) = (0u32, 0u32);
        for &(a, b) in kinds {
            if row_of[a as usize] == NONE {
                row_of[a as usize] = rows;
                rows += 1;
            }
            if column_of[b as usize] == NONE {
                column_of[b as usize] = width;
                width += 1;
            }
        }
        let width = width as usize;
        let mut cells = vec![NONE; rows as usize * width];
        for (i, &(a, b)) in kinds.iter().enumerate() {
            cells[row_of[a as usize] as usize * width + column_of[b as usize] as usize] = i as u32;
        }
        StageTable { row_of, column_of, width, cells }
    }

    /// The stage index of driver kind `a` with driven kind `b`, if that pairing is a stage.
    fn get(&self, a: u32, b: u32) -> Option<u32> {
        Self::at(self.row(a), b)
    }

    /// The row of driver kind `a`: the cells and the column of each kind (empty when `a`
    /// drives no stage).
    fn row(&self, a: u32) -> Row<'_> {
        match self.row_of.get(a as usize) {
            Some(&r) if r != NONE => {
                let from = r as usize * self.width;
                Row { cells: &self.cells[from..from + self.width], column_of: &self.column_of }
            }
            _ => Row { cells: &[], column_of: &self.column_of },
        }
    }

    /// The stage index of the pairing of `row`'s driver with driven kind `b`, if a stage.
    fn at(row: Row<'_>, b: u32) -> Option<u32> {
        let c = *row.column_of.get(b as usize)?;
        row.cells.get(c as usize).copied().filter(|&s| s != NONE)
    }
}

/// One driver's row of a [`StageTable`].
#[derive(Clone, Copy)]
struct Row<'a> {
    cells: &'a [u32],
    column_of: &'a [u32],
}

/// Put `x` in the last place of `list` and move it down to keep `list` ascending (the rest of
/// it is).
fn insert_sorted(list: &mut [u32], x: u32) {
    let mut at = list.len() - 1;
    while at > 0 && list[at - 1] > x {
        list[at] = list[at - 1];
        at -= 1;
    }
    list[at] = x;
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
