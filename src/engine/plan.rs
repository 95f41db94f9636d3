//! Units of work and shards: which engine takes which stage count of a problem, the units
//! each stage count is cut into (in one fixed order, which makes shards and streams
//! deterministic), and the part of them a shard keeps. It runs nothing.

use super::lineup::EngineChoice;
use super::space::SearchSpace;
use super::{factor, meet};
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
    pub fn parse(text: &str, flag: &str) -> crate::Result<Shard> {
        let bad = || {
            crate::Error::flag(flag, format!("\"{text}\" is not a part; wanted I/N with 1 ≤ I ≤ N, e.g. 3/8"))
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

/// The units of work of a search, in their deterministic order, after sharding.
pub(super) fn units(problem: &Problem, space: &SearchSpace, shard: Option<Shard>) -> Vec<(usize, usize)> {
    // The unit-by-unit plan: with the sieve every stage count is cut into (n, first) units.
    let (units, _) = plan(problem, space, EngineChoice::Sieve, shard);
    units
        .into_iter()
        .filter_map(|u| if let WorkUnit::Visit(n, f) = u { Some((n, f)) } else { None })
        .collect()
}

fn in_shard(k: usize, shard: Option<Shard>) -> bool {
    shard.is_none_or(|s| k as u64 % s.count as u64 == (s.index - 1) as u64)
}

/// A unit of work of either kind of engine.
#[derive(Debug, Clone, Copy)]
pub(super) enum WorkUnit {
    /// All trains of `n` stages starting with stage `first`, enumerated by an [`StageEngine`].
    Visit(usize, usize),
    /// A run of the meet engine.
    Meet(meet::MeetUnit),
    /// All trains of `n` stages, counted and listed by the factor engine.
    Factor(usize),
}

/// The distinct ratios and pair table, when the meet engine takes part.
pub(super) struct MeetData {
    pub(super) values: meet::DistinctRatios,
    pub(super) pairs: Option<meet::PairTable>,
}

/// What the bulk engines prepared for a search.
pub(super) struct EngineData {
    pub(super) meet: Option<MeetData>,
    pub(super) factor: Option<factor::FactorTables>,
    /// The factor engine's work, one per stage count it takes.
    pub(super) works: Vec<factor::BurnsideSum>,
}

impl EngineData {
    pub(super) fn work(&self, n: usize) -> Option<&factor::BurnsideSum> {
        self.works.iter().find(|w| w.stages() == n)
    }

    /// Progress ticks of a unit: one, or the factor engine's parts and listing.
    pub(super) fn ticks(&self, unit: &WorkUnit) -> u64 {
        match unit {
            WorkUnit::Factor(n) => self.work(*n).map_or(1, factor::BurnsideSum::ticks),
            _ => 1,
        }
    }
}

/// The stage counts the factor engine takes, and its tables (exact targets only).
pub(super) fn factor_plan(
    problem: &Problem,
    space: &SearchSpace,
    engine: EngineChoice,
) -> (Vec<usize>, Option<factor::FactorTables>) {
    let factor = (engine == EngineChoice::Auto).then(|| factor::FactorTables::new(space)).flatten();
    let counts = match &factor {
        Some(f) => problem.stage_counts().into_iter().filter(|&n| f.applies(n)).collect(),
        None => Vec::new(),
    };
    (counts, factor)
}

/// Decide which engine takes which stage count and list the units, in a deterministic order,
/// after sharding.
pub(super) fn plan(
    problem: &Problem,
    space: &SearchSpace,
    engine: EngineChoice,
    shard: Option<Shard>,
) -> (Vec<WorkUnit>, EngineData) {
    let counts = problem.stage_counts();
    let (factor_counts, factor) = factor_plan(problem, space, engine);
    let meet_counts = meet_counts(problem, space, engine, &factor_counts);
    let meet = (!meet_counts.is_empty()).then(|| {
        let values = meet::DistinctRatios::new(space);
        let pairs = meet_counts.contains(&4).then(|| meet::PairTable::new(&values)).flatten();
        MeetData { values, pairs }
    });
    let mut all = Vec::new();
    for n in counts {
        let by_meet =
            meet.as_ref().is_some_and(|d| meet_counts.contains(&n) && (n <= 3 || d.pairs.is_some()));
        match (&meet, by_meet) {
            _ if factor_counts.contains(&n) => all.push(WorkUnit::Factor(n)),
            (Some(d), true) => {
                all.extend(meet::units(n, &d.values, d.pairs.as_ref()).into_iter().map(WorkUnit::Meet))
            }
            _ => all.extend((0..space.stages.len()).map(|f| WorkUnit::Visit(n, f))),
        }
    }
    let units: Vec<WorkUnit> =
        all.into_iter().enumerate().filter(|(k, _)| in_shard(*k, shard)).map(|(_, u)| u).collect();
    let works = match &factor {
        Some(f) => units
            .iter()
            .filter_map(|u| if let WorkUnit::Factor(n) = u { Some(f.burnside_sum(*n, true)) } else { None })
            .collect(),
        None => Vec::new(),
    };
    (units, EngineData { meet, factor, works })
}

/// The stage counts the meet engine may take (four only if its pair table could be built),
/// leaving out those the factor engine takes.
pub(super) fn meet_counts(
    problem: &Problem,
    space: &SearchSpace,
    engine: EngineChoice,
    by_factor: &[usize],
) -> Vec<usize> {
    if engine != EngineChoice::Auto {
        return Vec::new();
    }
    problem
        .stage_counts()
        .into_iter()
        .filter(|&n| !by_factor.contains(&n) && meet::applies(space, n))
        .collect()
}
