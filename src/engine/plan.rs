//! Units of work and shards. For each stage count of a problem, in ascending order, the
//! planner asks the bulk engines of the lineup in turn whether they take it, and leaves the
//! rest to the lineup's stage engine ([`assign`]); then it cuts every stage count into units of
//! work in one fixed order (a bulk engine's units, or one per first stage), keeps a shard's
//! share of them, and has the bulk engines prepare the units kept ([`plan`]). The fixed order
//! is what makes shards disjoint and streams deterministic. It runs no unit and judges no
//! train.

use super::kinds::{BulkPlan, StageEngine};
use super::lineup::Lineup;
use super::space::SearchSpace;
use crate::model::problem::Problem;

/// One part of a search split `count` ways: part `index` (1-based) gets every unit of work whose
/// position in the deterministic unit list is `index − 1` modulo `count`. The parts are
/// disjoint and together cover the whole search.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Shard {
    /// Which part, `1 ≤ index ≤ count`.
    pub index: u32,
    /// How many parts.
    pub count: u32,
}

impl Shard {
    /// Parse `I/N`.
    pub fn parse(text: &str) -> crate::error::Result<Shard> {
        let bad = || {
            crate::error::Error::value(
                crate::error::Quantity::Shard,
                format!("\"{text}\" is not a part; wanted I/N with 1 ≤ I ≤ N, e.g. 3/8"),
            )
        };
        let (i, n) = text.trim().split_once('/').ok_or_else(bad)?;
        let (index, count): (u32, u32) =
            (i.trim().parse().map_err(|_| bad())?, n.trim().parse().map_err(|_| bad())?);
        if index == 0 || index > count {
            return Err(bad());
        }
        Ok(Shard { index, count })
    }
}

impl std::fmt::Display for Shard {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        write!(f, "{}/{}", self.index, self.count)
    }
}

/// A unit of work: what one task of the driver runs.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub(crate) enum WorkUnit {
    /// The `stages`-stage trains whose first stage is `first`, proposed by the stage engine.
    Proposed { stages: usize, first: usize },
    /// Unit `unit` of the `stages`-stage trains of the bulk engine planned at
    /// [`Plan::bulk`]`[engine]`.
    Bulk { engine: usize, stages: usize, unit: usize },
}

/// Who takes which stage count of a search, before anything is cut into units.
pub(crate) struct Assignment {
    /// The plans of the bulk engines that took stage counts, in lineup order.
    pub(crate) bulk: Vec<Box<dyn BulkPlan>>,
    /// The engine for the stage counts left.
    pub(crate) stage: &'static dyn StageEngine,
    /// The stage counts left to it, ascending.
    pub(crate) stage_counts: Vec<usize>,
}

/// Ask the lineup's bulk engines in order which stage counts they take; the stage engine
/// gets the rest. Cheap enough for a forecast: no bulk engine builds its run's tables here.
pub(crate) fn assign(problem: &Problem, space: &SearchSpace, lineup: Lineup) -> Assignment {
    let mut left = problem.stage_counts();
    let mut bulk: Vec<Box<dyn BulkPlan>> = Vec::new();
    for engine in lineup.bulk {
        if left.is_empty() {
            break;
        }
        if let Some(plan) = engine.plan(space, &left) {
            left.retain(|n| !plan.stage_counts().contains(n));
            bulk.push(plan);
        }
    }
    Assignment { bulk, stage: lineup.stage, stage_counts: left }
}

/// A search cut into units of work, ready to run.
pub(crate) struct Plan {
    /// The units this run keeps, in plan order.
    pub(crate) units: Vec<WorkUnit>,
    /// Progress ticks the units report in all.
    pub(crate) ticks: u64,
    /// The engine of the [`WorkUnit::Proposed`] units.
    pub(crate) stage: &'static dyn StageEngine,
    /// The bulk engines' plans, which [`WorkUnit::Bulk`] units index.
    pub(crate) bulk: Vec<Box<dyn BulkPlan>>,
}

/// Assign the stage counts, cut each into units in a fixed order (stage counts ascending),
/// keep the shard's share and prepare what is kept.
pub(crate) fn plan(problem: &Problem, space: &SearchSpace, lineup: Lineup, shard: Option<Shard>) -> Plan {
    let Assignment { mut bulk, stage, .. } = assign(problem, space, lineup);
    let mut all = Vec::new();
    for n in problem.stage_counts() {
        match bulk.iter().position(|b| b.stage_counts().contains(&n)) {
            Some(engine) => {
                let units = bulk[engine].cut(space, n);
                all.extend((0..units).map(|unit| WorkUnit::Bulk { engine, stages: n, unit }));
            }
            None => all.extend((0..space.stages.len()).map(|first| WorkUnit::Proposed { stages: n, first })),
        }
    }
    let units: Vec<WorkUnit> =
        all.into_iter().enumerate().filter(|(k, _)| in_shard(*k, shard)).map(|(_, u)| u).collect();
    let mut ticks = 0;
    for unit in &units {
        ticks += match *unit {
            WorkUnit::Proposed { .. } => 1,
            WorkUnit::Bulk { engine, stages, unit } => bulk[engine].prepare(space, stages, unit),
        };
    }
    Plan { units, ticks, stage, bulk }
}

/// The units of `stage` alone over every stage count, as (stage count, first stage), after
/// sharding: what a stream runs, in the order of a plan without bulk engines.
pub(crate) fn proposed_units(
    problem: &Problem,
    space: &SearchSpace,
    stage: &'static dyn StageEngine,
    shard: Option<Shard>,
) -> Vec<(usize, usize)> {
    let plan = plan(problem, space, Lineup { bulk: &[], stage }, shard);
    plan.units
        .into_iter()
        .filter_map(|u| match u {
            WorkUnit::Proposed { stages, first } => Some((stages, first)),
            WorkUnit::Bulk { .. } => None,
        })
        .collect()
}

fn in_shard(k: usize, shard: Option<Shard>) -> bool {
    shard.is_none_or(|s| k as u64 % s.count as u64 == (s.index - 1) as u64)
}
