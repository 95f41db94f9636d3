//! The tally a search keeps while it runs: how many trains satisfied the problem, and the
//! best of them (a bounded top-K, or the Pareto front). Each worker keeps its own and the
//! driver merges them; the total order of the ranking makes the merge independent of the
//! thread count. It does not find or judge trains: engines and the driver offer it candidates
//! the space has judged.

use crate::model::problem::Problem;
use crate::model::rank::{Candidate, ParetoFront, TopK};

/// The counts and the best trains of a search (or of one worker's share of it).
pub struct Tally {
    kept: Kept,
}

/// What is kept besides the count: the best K by the ranking, or the Pareto front.
enum Kept {
    Top(TopK),
    Front(ParetoFront),
}

impl Tally {
    /// An empty tally of the kind `problem` asks for.
    pub(crate) fn new(problem: &Problem) -> Tally {
        let kept = if problem.pareto {
            Kept::Front(ParetoFront::default())
        } else {
            Kept::Top(TopK::new(problem.limit, &problem.rank))
        };
        Tally { kept }
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
        Tally { kept }
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
