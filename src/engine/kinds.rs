//! The two kinds of engine, as the planner and the driver see them.
//!
//! A [`StageEngine`] proposes candidate stage sequences one unit of work at a time (a stage
//! count and a first stage) and the driver judges each; it takes every stage count left to
//! it, and it is what streaming runs and what the forecast samples. A [`BulkEngine`] takes
//! whole stage counts of the problems it suits and counts their trains without visiting each:
//! it cuts its own units of work ([`BulkPlan`]), reports counts through the [`Tally`], spells
//! out only the trains that could still be listed (each judged by [`SearchSpace::judge`], so
//! no engine decides a train on its own), and estimates what it cannot cut into units.
//!
//! This file owns the traits, not the engines (one file each beside it) nor the order in which
//! a search asks them (the lineup).

use std::time::Duration;

use super::space::SearchSpace;
use super::tally::Tally;

/// An engine that proposes candidate stage sequences, one unit of work at a time.
pub trait StageEngine: Sync {
    /// The engine's name.
    fn name(&self) -> &'static str;

    /// Call `visit` with every non-decreasing sequence of `n` stage indices starting with
    /// `first` that might satisfy the problem. Visiting extra sequences is allowed (the driver
    /// judges each exactly); missing one that satisfies is a bug.
    fn visit_unit(&self, space: &SearchSpace, n: usize, first: usize, visit: &mut dyn FnMut(&[u32]));
}

/// An engine that counts the trains of whole stage counts in bulk.
pub trait BulkEngine: Sync {
    /// The engine's name.
    fn name(&self) -> &'static str;

    /// Take those of `counts` (stage counts, ascending, that no engine before this one in the
    /// lineup took) that it can count for `space`; `None` when it takes none. A forecast asks
    /// too, so deciding must be cheap: tables only a run needs wait for [`BulkPlan::cut`].
    fn plan(&self, space: &SearchSpace, counts: &[usize]) -> Option<Box<dyn BulkPlan>>;
}

/// A bulk engine's share of one search: the stage counts it took and what it prepared for
/// them.
pub trait BulkPlan: Sync {
    /// The stage counts it took, ascending.
    fn stage_counts(&self) -> &[usize];

    /// Cut the `n`-stage trains into units of work, building the tables running them needs,
    /// and say how many units. Called once for each stage count taken, in ascending order.
    fn cut(&mut self, space: &SearchSpace, n: usize) -> usize;

    /// Make unit `unit` of the `n`-stage trains ready to run and say how many progress ticks
    /// it reports. Called once for each unit the run keeps (all, or a shard's share), in
    /// plan order, after every [`BulkPlan::cut`] and before any unit runs.
    fn prepare(&mut self, _space: &SearchSpace, _n: usize, _unit: usize) -> u64 {
        1
    }

    /// Run unit `unit` of the `n`-stage trains: count its trains into `tally`
    /// ([`Tally::add_count`]), push those that could still be listed, judged by
    /// [`SearchSpace::judge`], with [`Tally::push_uncounted`], and call `tick` as many times as
    /// [`BulkPlan::prepare`] said. A long unit looks at [`SearchSpace::cancelled`] as it goes.
    fn run(&self, space: &SearchSpace, n: usize, unit: usize, tally: &mut Tally, tick: &(dyn Fn() + Sync));

    /// The stage counts whose cost a forecast must ask this plan for, because their work is
    /// not cut into units the forecast could sample; none when the cost is bounded by tables
    /// built while planning.
    fn forecast_counts(&self) -> &[usize] {
        &[]
    }

    /// True when the work of [`BulkPlan::forecast_counts`] is cut into many units, so that a
    /// split search (a shard) splits it; false when each stage count is one unit.
    fn forecast_splits(&self) -> bool {
        false
    }

    /// Seconds one thread needs for the `n`-stage trains (one of
    /// [`BulkPlan::forecast_counts`]), estimated in about `budget`.
    fn forecast_seconds(&self, _space: &SearchSpace, _n: usize, _budget: Duration) -> f64 {
        0.0
    }
}
