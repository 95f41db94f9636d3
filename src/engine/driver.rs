//! The parallel driver: it plans a search, runs its units of work on the rayon pool (each
//! worker with its own tally), reports progress, stops between units when asked, merges the
//! tallies and turns the best candidates into trains. It neither chooses engines nor cuts
//! units (the plan does) nor judges candidates (the space does).

use std::sync::atomic::{AtomicU64, Ordering as AtomicOrdering};

use rayon::prelude::*;

use super::lineup::EngineChoice;
use super::options::{Outcome, Progress, RunOptions, SetArrangements};
use super::plan::{plan, WorkUnit};
use super::sets::SetTools;
use super::space::SearchSpace;
use super::tally::Tally;
use crate::model::problem::Problem;

/// Run a search with the chosen engines on the current rayon pool, keeping the best trains (or
/// the Pareto front) and counting all.
pub fn search(problem: &Problem, choice: EngineChoice, options: &RunOptions) -> Outcome {
    let space = SearchSpace::new(problem, options.cancel);
    let plan = plan(problem, &space, choice.lineup_for(problem.count), options.shard);
    let total = plan.ticks;
    let done = AtomicU64::new(0);
    let tick = || {
        let d = done.fetch_add(1, AtomicOrdering::Relaxed) + 1;
        if let Some(p) = options.progress {
            p(Progress { done: d, total });
        }
    };
    let sets = problem.gear_sets.then(|| SetTools::new(&space));
    let set_of = sets.as_ref().map(|s| &s.set_of);
    let mut tally = plan
        .units
        .par_iter()
        .with_max_len(1)
        .fold(
            || Tally::new(problem, set_of),
            |mut tally, &unit| {
                match unit {
                    _ if space.cancelled() => tick(),
                    WorkUnit::Proposed { stages, first } => {
                        plan.stage.visit_unit(&space, stages, first, &mut |idx| {
                            if let Some(c) = space.judge(idx) {
                                tally.push(c);
                                if sets.as_ref().is_some_and(|s| s.is_canonical(&space, &c)) {
                                    tally.add_sets(1);
                                }
                            }
                        });
                        tick();
                    }
                    // It ticks as it goes.
                    WorkUnit::Bulk { engine, stages, unit } => {
                        plan.bulk[engine].run(&space, stages, unit, &mut tally, &tick)
                    }
                }
                tally
            },
        )
        .reduce(|| Tally::new(problem, set_of), Tally::merge);
    tally.settle_met();
    let gear_set_count = tally.set_count().known();
    let counted_all = tally.counted_all();
    let (count, best, pareto_size) = tally.into_ranked(problem, options.shard.is_some());
    let arrangements = match &sets {
        None => Vec::new(),
        Some(sets) => best
            .iter()
            .map(|c| {
                let all = sets.arrangements(&space, c);
                let others = match options.list_arrangements {
                    true => all.iter().filter(|a| a.stages != c.stages).map(|a| space.train(a)).collect(),
                    false => Vec::new(),
                };
                SetArrangements { count: all.len() as u64, others }
            })
            .collect(),
    };
    Outcome {
        count,
        gear_set_count,
        trains: best.iter().map(|c| space.train(c)).collect(),
        arrangements,
        pareto_size,
        counted_all,
        complete: !space.cancelled(),
        stage_options: space.stages.len(),
        rejected: space.rejections(),
    }
}
