//! The tally a search keeps while it runs: how many trains satisfied the problem (and, for a
//! problem that lists gear sets, how many gear sets they make), and the best of them (a bounded
//! top-K, or the Pareto front, of trains or of gear sets). Each worker keeps its own and the
//! driver merges them; the total order of the ranking makes the merge independent of the
//! thread count. It does not find or judge trains: engines and the driver offer it candidates
//! the space has judged.

use crate::model::gearset::SetOf;
use crate::model::problem::Problem;
use crate::model::rank::{Candidate, ParetoFront, TopK};
use crate::numbers::rational::RelError;

/// The counts and the best trains of a search (or of one worker's share of it).
pub struct Tally {
    kept: Kept,
    sets: SetCount,
    /// False once an engine has left trains uncounted on purpose (a lower-bound count).
    counted_all: bool,
    /// Gear sets (or trains) met by an engine that narrows its window as it goes, with their
    /// trains, counted only once the search is over and only within the error of the K-th best
    /// ([`Tally::settle_met`]): what such an engine meets beyond it depends on the timing of
    /// the threads, what it meets within it does not.
    met: Vec<(RelError, u64)>,
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
        Tally { kept, sets, counted_all: true, met: Vec::new() }
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
        let mut met = self.met;
        met.extend(other.met);
        Tally { kept, sets, counted_all: self.counted_all && other.counted_all, met }
    }

    /// Note a gear set (or, for a listing of trains, a train) met with `trains` satisfying
    /// arrangements of error `error`, each already offered with [`Tally::push_uncounted`]; it
    /// is counted once the whole search is over (`settle_met`).
    pub fn add_met(&mut self, error: RelError, trains: u64) {
        self.met.push((error, trains));
    }

    /// Count what [`Tally::add_met`] noted that lies within the error of the K-th best kept
    /// (all of it when fewer are kept): every train within that error was met, whatever the
    /// threads did, so the count is the same on every run. What lies beyond it is dropped, and
    /// the count is then a lower bound. Called once, on the whole search's tally.
    pub(crate) fn settle_met(&mut self) {
        if self.met.is_empty() {
            return;
        }
        let bound = self.error_bound();
        for (error, trains) in std::mem::take(&mut self.met) {
            if bound.is_none_or(|b| error.cmp_abs(&b) != std::cmp::Ordering::Greater) {
                self.add_count(trains);
                self.add_sets(1);
            } else {
                self.counted_all = false;
            }
        }
    }

    /// Say that some trains (and their gear sets) satisfying the problem were not counted: the
    /// counts are then lower bounds. The listing must stay the proven best.
    pub fn count_not_all(&mut self) {
        self.counted_all = false;
    }

    /// True unless an engine left trains uncounted ([`Tally::count_not_all`]).
    pub(crate) fn counted_all(&self) -> bool {
        self.counted_all
    }

    /// For a top-K led by the error, once K are kept: the |error| of the K-th best (see
    /// [`TopK::error_bound`]); `None` before then, for a Pareto front, or when the error does
    /// not lead the ranking.
    pub fn error_bound(&mut self) -> Option<RelError> {
        match &mut self.kept {
            Kept::Top(t) => t.error_bound(),
            Kept::Front(_) => None,
        }
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
