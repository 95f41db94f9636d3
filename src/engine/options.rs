//! How to run a search and what it reports: [`RunOptions`] (progress callback, stop flag,
//! shard), [`Progress`] and [`Outcome`]. Plain data shared by the driver, the stream and their
//! callers; what to search is the [`crate::model::problem::Problem`], not these.

use std::sync::atomic::AtomicBool;

use super::plan::Shard;
use super::space::Rejection;
use crate::model::train::Train;

/// Progress of a running search, in units of work.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Progress {
    /// Units finished.
    pub done: u64,
    /// Units in all.
    pub total: u64,
}

/// How to run a search (not what to search).
#[derive(Default)]
pub struct RunOptions<'a> {
    /// Called from worker threads after each unit of work.
    pub progress: Option<&'a (dyn Fn(Progress) + Sync)>,
    /// When set to true, the search stops at the next unit and reports what it has.
    pub cancel: Option<&'a AtomicBool>,
    /// Search only this part of the space.
    pub shard: Option<Shard>,
    /// For a problem that lists gear sets: also give every other arrangement of each listed set.
    pub list_arrangements: bool,
}

/// What a search found.
#[derive(Debug, Clone, PartialEq)]
pub struct Outcome {
    /// Trains satisfying every constraint (a lower bound when `complete` is false).
    pub count: u64,
    /// The gear sets those trains are made of, for a problem that lists gear sets; `None` when
    /// the problem lists trains or an engine counted trains in bulk without their sets.
    pub gear_set_count: Option<u64>,
    /// The best trains, best first, at most `problem.limit` (for a Pareto search, the front's
    /// first `limit` in rank order).
    pub trains: Vec<Train>,
    /// For a problem that lists gear sets, one entry per listed train (its set): the set's
    /// arrangements; empty when the problem lists trains.
    pub arrangements: Vec<SetArrangements>,
    /// Size of the Pareto front (of gear sets, for a problem that lists them), for a Pareto
    /// search.
    pub pareto_size: Option<usize>,
    /// False when an engine left trains uncounted on purpose, the problem asking only for a
    /// lower-bound count ([`crate::model::problem::CountMode::LowerBound`]): `count` and
    /// `gear_set_count` are then lower bounds, while the listing is still the proven best.
    pub counted_all: bool,
    /// False when the search was interrupted.
    pub complete: bool,
    /// Stages allowed by the per-stage limits (the size of the stage table).
    pub stage_options: usize,
    /// What the mesh checks left out, for an explanation (empty without geometry rules).
    pub rejected: Vec<Rejection>,
}

/// The arrangements of one listed gear set.
#[derive(Debug, Clone, PartialEq)]
pub struct SetArrangements {
    /// How many arrangements of the set satisfy the problem (the listed train among them).
    pub count: u64,
    /// The others, best first, when they were asked for ([`RunOptions::list_arrangements`]).
    pub others: Vec<Train>,
}
