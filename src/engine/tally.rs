//! The tally a search keeps while it runs: how many trains satisfied the problem, and the
//! best of them (a bounded top-K, or the Pareto front). Each worker keeps its own and the
//! driver merges them; the total order of the ranking makes the merge independent of the
//! thread count. It does not find or judge trains.

use crate::model::problem::Problem;
use crate::model::rank::{Candidate, ParetoFront, TopK};

/// What a search keeps while it runs.
pub(crate) enum Tally {
    Top(TopK),
    Front(ParetoFront),
}

impl Tally {
    pub(crate) fn new(problem: &Problem) -> Tally {
        if problem.pareto {
            Tally::Front(ParetoFront::default())
        } else {
            Tally::Top(TopK::new(problem.limit, &problem.rank))
        }
    }

    pub(crate) fn push(&mut self, c: Candidate) {
        match self {
            Tally::Top(t) => t.push(c),
            Tally::Front(f) => f.push(c),
        }
    }

    pub(crate) fn push_uncounted(&mut self, c: Candidate) {
        match self {
            Tally::Top(t) => t.push_uncounted(c),
            Tally::Front(f) => f.push_uncounted(c),
        }
    }

    pub(crate) fn add_count(&mut self, n: u64) {
        match self {
            Tally::Top(t) => t.add_count(n),
            Tally::Front(f) => f.add_count(n),
        }
    }

    pub(crate) fn could_accept(&self, best: &Candidate) -> bool {
        match self {
            Tally::Top(t) => t.could_accept(best),
            Tally::Front(f) => f.could_accept(best),
        }
    }

    pub(crate) fn merge(self, other: Tally) -> Tally {
        match (self, other) {
            (Tally::Top(a), Tally::Top(b)) => Tally::Top(a.merge(b)),
            (Tally::Front(a), Tally::Front(b)) => Tally::Front(a.merge(b)),
            _ => unreachable!("one search keeps one kind"),
        }
    }
}
