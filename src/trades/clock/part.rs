//! One part of a clock train between two arbors whose speeds are fixed: the great wheel to the
//! centre arbor of a going train, the pin wheel to the locking arbor of a striking train. Each
//! part is its own exact search (wheels driving pinions), so an arbor the clock needs at a given
//! speed (the centre arbor at one turn an hour, the locking arbor at one turn a blow) is held
//! there by construction. Owns the part's search and its result; the arbor names are the
//! caller's.

use super::{clock_problem, Arrangement};
use crate::engine::{search, RunOptions};
use crate::error::Result;
use crate::geometry::MeshLimits;
use crate::model::pool::Pool;
use crate::model::problem::{MeshRules, Problem, StageLimits, ToothForm};
use crate::model::train::Train;
use crate::numbers::range::IntRange;
use crate::numbers::rational::Ratio;
use crate::numbers::target::Target;

/// How the meshes of a clock train are checked: each wheel and pinion at its own standard
/// centre distance.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct MeshCheck {
    /// The tooth form.
    pub tooth_form: ToothForm,
    /// Least contact ratio of a mesh.
    pub min_contact_ratio: f64,
}

impl MeshCheck {
    /// The mesh rules of a clock train checked so.
    pub fn rules(self) -> MeshRules {
        MeshRules {
            tooth_form: self.tooth_form,
            limits: MeshLimits { min_contact_ratio: self.min_contact_ratio, ..MeshLimits::default() },
            ..MeshRules::default()
        }
    }
}

/// A part of a train to search: from one arbor to another, wheels driving pinions (or, for a
/// count wheel, a pinion driving a wheel).
#[derive(Debug, Clone, PartialEq)]
pub struct Part {
    /// The arbors from the driving one to the driven one, by their place (as many as the most
    /// stages allowed, plus one); a shorter train takes the first and the last ones it needs
    /// from [`Part::arbor_names`].
    pub arbors: Vec<String>,
    /// Turns of the driving arbor per turn of the driven one (below 1: a speed-up).
    pub ratio: Ratio,
    /// Teeth allowed for the drivers (the wheels, in a train that speeds up).
    pub drivers: IntRange,
    /// Teeth allowed for the driven gears (the pinions, in a train that speeds up).
    pub driven: IntRange,
    /// Stage counts.
    pub stages: IntRange,
}

impl Part {
    /// The names of the arbors of a train of `stages` stages: the first, as many of the middle
    /// ones as it has, and the last.
    pub fn arbor_names(&self, stages: usize) -> Vec<String> {
        let n = self.arbors.len();
        let mut v = vec![self.arbors[0].clone()];
        v.extend(self.arbors[1..n - 1].iter().take(stages.saturating_sub(1)).cloned());
        v.push(self.arbors[n - 1].clone());
        v
    }

    /// The search problem of this part.
    pub fn problem(&self, pool: &Pool, meshes: Option<MeshCheck>, limit: usize) -> Result<Problem> {
        let target = Target::exact(self.ratio.to_string(), self.ratio, Ratio::integer(0));
        let limits = StageLimits {
            driver_teeth: Some(self.drivers),
            driven_teeth: Some(self.driven),
            ..StageLimits::default()
        };
        let p = clock_problem(target, pool.clone(), self.stages, limits, limit)?;
        match meshes {
            None => Ok(p),
            Some(m) => p.with_mesh_rules(m.rules()),
        }
    }

    /// Search this part.
    pub fn plan(
        &self,
        pool: &Pool,
        meshes: Option<MeshCheck>,
        limit: usize,
        options: &RunOptions,
    ) -> Result<PartPlan> {
        let problem = self.problem(pool, meshes, limit)?;
        let found = search(&problem, crate::trades::ENGINE, options);
        let cycloidal = meshes.is_some_and(|m| m.tooth_form == ToothForm::Cycloidal);
        let arranged = |train: &Train| -> Result<Arrangement> {
            let pairs = if cycloidal { super::cycloidal_pairs(train)? } else { Vec::new() };
            Ok(Arrangement { train: train.clone(), cycloidal: pairs })
        };
        let pairs = if cycloidal {
            found.trains.iter().map(super::cycloidal_pairs).collect::<Result<Vec<_>>>()?
        } else {
            Vec::new()
        };
        let others = found
            .arrangements
            .iter()
            .map(|a| a.others.iter().map(arranged).collect::<Result<Vec<_>>>())
            .collect::<Result<Vec<_>>>()?;
        Ok(PartPlan {
            part: self.clone(),
            problem,
            count: found.count,
            gear_set_count: found.gear_set_count,
            complete: found.complete,
            arrangements: found.arrangements.iter().map(|a| a.count).collect(),
            others,
            trains: found.trains,
            cycloidal: pairs,
        })
    }
}

/// The result of one part's search.
#[derive(Debug, Clone, PartialEq)]
pub struct PartPlan {
    /// What was searched.
    pub part: Part,
    /// The problem searched.
    pub problem: Problem,
    /// Trains meeting every constraint.
    pub count: u64,
    /// The gear sets those trains are made of; `None` when they were not counted.
    pub gear_set_count: Option<u64>,
    /// False when interrupted.
    pub complete: bool,
    /// The best gear sets, each by its first arrangement in stage order, stages from the
    /// driving arbor.
    pub trains: Vec<Train>,
    /// Each listed set's number of arrangements (its listed train among them).
    pub arrangements: Vec<u64>,
    /// Each listed set's other arrangements, in stage order, when every arrangement was asked
    /// for ([`crate::engine::RunOptions::list_arrangements`]); else empty lists.
    pub others: Vec<Vec<Arrangement>>,
    /// Each train's cycloidal pairs, when checked in that form.
    pub cycloidal: Vec<Vec<crate::geometry::CycloidalMesh>>,
}

impl PartPlan {
    /// The cycloidal pairs of train `k`, empty when not checked in that form.
    pub fn pairs(&self, k: usize) -> &[crate::geometry::CycloidalMesh] {
        self.cycloidal.get(k).map_or(&[][..], |v| &v[..])
    }

    /// The number of arrangements of listed set `k`.
    pub fn arrangements_of(&self, k: usize) -> u64 {
        self.arrangements.get(k).copied().unwrap_or(1)
    }

    /// The other arrangements of listed set `k`, empty when they were not asked for.
    pub fn others_of(&self, k: usize) -> &[Arrangement] {
        self.others.get(k).map_or(&[][..], |v| &v[..])
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn arbors_are_named_by_their_place() {
        let part = Part {
            arbors: ["great wheel", "intermediate", "centre"].map(String::from).to_vec(),
            ratio: Ratio::new(1, 12).unwrap(),
            drivers: IntRange { lo: 30, hi: 130 },
            driven: IntRange { lo: 6, hi: 16 },
            stages: IntRange { lo: 1, hi: 2 },
        };
        assert_eq!(part.arbor_names(1), ["great wheel", "centre"]);
        assert_eq!(part.arbor_names(2), ["great wheel", "intermediate", "centre"]);
    }

    #[test]
    fn the_great_wheel_of_an_eight_day_clock() {
        // An eight-day longcase (common practice, from memory): the great wheel turns once in
        // 12 hours and drives the centre pinion, 96 into 8, so 12 = 96/8.
        let part = Part {
            arbors: ["great wheel", "centre"].map(String::from).to_vec(),
            ratio: Ratio::new(1, 12).unwrap(),
            drivers: IntRange { lo: 30, hi: 130 },
            driven: IntRange { lo: 8, hi: 8 },
            stages: IntRange { lo: 1, hi: 1 },
        };
        let pool = Pool::to_cut(IntRange { lo: 8, hi: 130 }, 0.5, 20.0, None).unwrap();
        let check = MeshCheck { tooth_form: ToothForm::Cycloidal, min_contact_ratio: 1.0 };
        let plan = part.plan(&pool, Some(check), 10, &RunOptions::default()).unwrap();
        let found: Vec<(u32, u32)> =
            plan.trains.iter().map(|t| (t.stages[0].driver.teeth, t.stages[0].driven.teeth)).collect();
        assert_eq!(found, [(96, 8)]);
        assert_eq!(plan.pairs(0).len(), 1);
    }
}
