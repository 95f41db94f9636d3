//! A search problem, valid by construction: the target, the gear pool, how many stages, the
//! per-stage limits, the required direction, how to rank and how many to list. The command line
//! builds one of these; the engines only read it.

use std::fmt;
use std::sync::Arc;

use crate::error::{Error, Result};
use crate::pool::{Pool, MAX_STAGES};
use crate::range::{FloatRange, IntRange, RatioRange};
use crate::rank::RankKey;
use crate::target::Target;
use crate::train::{Direction, Train};

/// A train-level requirement beyond the ratio and the per-stage limits (a lathe's banjo
/// geometry, a coaxial clock train…). Called only for trains already within tolerance and
/// stock; `true` keeps the train. Must be a pure function of the train so results stay
/// deterministic.
#[derive(Clone)]
pub struct TrainCheck(pub Arc<dyn Fn(&Train) -> bool + Send + Sync>);

impl TrainCheck {
    /// Wrap a predicate.
    pub fn new(f: impl Fn(&Train) -> bool + Send + Sync + 'static) -> TrainCheck {
        TrainCheck(Arc::new(f))
    }
}

impl fmt::Debug for TrainCheck {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str("TrainCheck(..)")
    }
}

impl PartialEq for TrainCheck {
    fn eq(&self, other: &Self) -> bool {
        Arc::ptr_eq(&self.0, &other.0)
    }
}

/// Limits every stage must meet.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct StageLimits {
    /// Allowed driver tooth counts (e.g. clock pinions of 6..12 leaves).
    pub driver_teeth: Option<IntRange>,
    /// Allowed driven tooth counts.
    pub driven_teeth: Option<IntRange>,
    /// Allowed stage ratio, driven / driver.
    pub stage_ratio: Option<RatioRange>,
    /// Allowed standard centre distance of each stage, mm.
    pub centre_distance_mm: Option<FloatRange>,
}

/// A validated search problem.
#[derive(Debug, Clone, PartialEq)]
pub struct Problem {
    /// What ratio, how close.
    pub target: Target,
    /// Which gears.
    pub pool: Pool,
    /// Stage counts allowed, inclusive, within `1..=MAX_STAGES`.
    pub stages: IntRange,
    /// Per-stage limits.
    pub limits: StageLimits,
    /// Required output direction, if any.
    pub direction: Option<Direction>,
    /// Ranking keys, most important first; never empty.
    pub rank: Vec<RankKey>,
    /// How many trains to list (all are counted).
    pub limit: usize,
    /// Extra train-level requirement, if any (set after [`Problem::new`]).
    pub train_check: Option<TrainCheck>,
}

impl Problem {
    /// Check the parts against each other.
    pub fn new(
        target: Target,
        pool: Pool,
        stages: IntRange,
        limits: StageLimits,
        direction: Option<Direction>,
        rank: Vec<RankKey>,
        limit: usize,
    ) -> Result<Problem> {
        if stages.lo < 1 || stages.hi as usize > MAX_STAGES {
            return Err(Error::flag(
                "--stages",
                format!("stages must lie within 1..{MAX_STAGES}"),
            ));
        }
        if rank.is_empty() {
            return Err(Error::flag(
                "--rank",
                "give at least one key of error, meshes, size, span",
            ));
        }
        let p = Problem {
            target,
            pool,
            stages,
            limits,
            direction,
            rank,
            limit,
            train_check: None,
        };
        if p.stage_counts().is_empty() {
            return Err(Error::flag(
                "--direction",
                format!(
                    "no stage count in {} turns the output the {} way: each external mesh reverses it, so \
                     same needs an even number of stages and opposite an odd number",
                    p.stages,
                    direction.map_or("", |d| d.as_str())
                ),
            ));
        }
        Ok(p)
    }

    /// The stage counts searched, ascending, after the direction requirement.
    pub fn stage_counts(&self) -> Vec<usize> {
        (self.stages.lo as usize..=self.stages.hi as usize)
            .filter(|&n| {
                self.direction
                    .is_none_or(|d| Direction::after_meshes(n) == d)
            })
            .collect()
    }
}
