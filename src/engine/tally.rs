//! The tally a search keeps while it runs: how many trains satisfied the problem (and, for a
//! problem that lists gear sets, how many gear sets they make), and the best of them (a bounded
//! top-K, or the Pareto front, of trains or of gear sets). Each worker keeps its own and the
//! driver merges them; the total order of the ranking makes the merge independent of the
//! thread count. It does not find or judge trains: engines and the driver offer it candidates
//! the space has judged.

use crate::model::gearset::SetOf;
use crate::model::problem::Problem;
use crate::model::rank::{Candidate, ParetoFront, TopK};

/// The counts and the best trains of a search (or of one worker's share of it).
pub struct Tally {
    kept: Kept,
    sets: SetCount,
}

/// The count of gear sets a tally keeps.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub(crate) enum SetCount {
    /// The problem lists trains; gear sets are not counted.
    Off,
    /// Gear sets counted so far.
    Counted(u64),
    /// An engine counted trains in bulk without counting their gear sets.
    Unknown,
}

impl SetCount {
    /// The count, when known.
    pub(crate) fn known(self) -> Option<u64> {
        match self {
            SetCount::Counted(n) => Some(n),
            _ => None,
        }
    }
}

/// What is kept besides the count: the best K by the ranking, or the Pareto front.
enum Kept {
    Top(TopK),
    Front(ParetoFront),
}

impl Tally {
    /// An empty tally of the kind `problem` asks for; `sets` names the gear set of a candidate
    /// when the problem lists gear sets.
    pub(crate) fn new(problem: &Problem, sets: Option<&SetOf>) -> Tally {
        let kept = match (problem.pareto, sets) {
            (true, None) => Kept::Front(ParetoFront::default()),
            (true, Some(s)) => Kept::Front(ParetoFront::by_set(&problem.rank, s.clone())),
            (false, None) => Kept::Top(TopK::new(problem.limit, &problem.rank)),
            (false, Some(s)) => Kept::Top(TopK::by_set(problem.limit, &problem.rank, s.clone())),
        };
        let sets = if sets.is_some() { SetCount::Counted(0) } else { SetCount::Off };
        Tally { kept, sets }
    }

    /// Does this tally count gear sets?
    pub fn counts_sets(&self) -> bool {
        self.sets != SetCount::Off
    }

    /// Count `n` gear sets that satisfy the problem (each counted once in the whole search, by
    /// whichever engine finds its canonical arrangement).
    pub fn add_sets(&mut self, n: u64) {
        if let SetCount::Counted(c) = &mut self.sets {
            *c += n;
        }
    }

    /// Say that trains were counted whose gear sets were not: the search's count of gear sets
    /// is then unknown.
    pub fn sets_not_counted(&mut self) {
        if self.sets != SetCount::Off {
            self.sets = SetCount::Unknown;
        }
    }

    /// Count one train that satisfies the problem, and keep it if it ranks among the best.
    pub fn push(&mut self, c: Candidate) {
        match &mut self.kept {
            Kept::Top(t) => t.push(c),
            Kept::Front(f) => f.push(c),
        }
    }

    /// Keep a train already counted with [`Tally::add_count`] if it ranks among the best.
    pub fn push_uncounted(&mut self, c: Candidate) {
        match &mut self.kept {
            Kept::Top(t) => t.push_uncounted(c),
            Kept::Front(f) => f.push_uncounted(c),
        }
    }

    /// Count `n` trains that satisfy the problem at once, without offering them.
    pub fn add_count(&mut self, n: u64) {
        match &mut self.kept {
            Kept::Top(t) => t.add_count(n),
            Kept::Front(f) => f.add_count(n),
        }
    }

    /// Could a train no better than `best` on every ranking key still be kept? A bulk engine
    /// asks with a bound no better than any train it stands for before spelling them out.
    pub fn could_accept(&self, best: &Candidate) -> bool {
        match &self.kept {
            Kept::Top(t) => t.could_accept(best),
            Kept::Front(f) => f.could_accept(best),
        }
    }

    /// Combine two workers' tallies of one search.
    pub(crate) fn merge(self, other: Tally) -> Tally {
        let kept = match (self.kept, other.kept) {
            (Kept::Top(a), Kept::Top(b)) => Kept::Top(a.merge(b)),
            (Kept::Front(a), Kept::Front(b)) => Kept::Front(a.merge(b)),
            _ => unreachable!("one search keeps one kind"),
        };
        let sets = match (self.sets, other.sets) {
            (SetCount::Counted(a), SetCount::Counted(b)) => SetCount::Counted(a + b),
            (SetCount::Off, SetCount::Off) => SetCount::Off,
            _ => SetCount::Unknown,
        };
        Tally { kept, sets }
    }

    /// The count of gear sets.
    pub(crate) fn set_count(&self) -> SetCount {
        self.sets
    }

    /// The count, the kept trains best first, and for a Pareto search the size of the whole
    /// front. The front is cut to the problem's limit unless `whole_front` (a part of a split
    /// search lists its whole front: the merge needs it to be exact).
    pub(crate) fn into_ranked(
        self,
        problem: &Problem,
        whole_front: bool,
    ) -> (u64, Vec<Candidate>, Option<usize>) {
        match self.kept {
            Kept::Top(t) => {
                let (n, b) = t.into_sorted();
                (n, b, None)
            }
            Kept::Front(f) => {
                let (n, mut b) = f.into_sorted(&problem.rank);
                let size = b.len();
                if problem.limit > 0 && !whole_front {
                    b.truncate(problem.limit);
                }
                (n, b, Some(size))
            }
        }
    }
}
