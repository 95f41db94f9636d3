//! The parallel driver: it plans a search, runs its units of work on the rayon pool (each
//! worker with its own tally), reports progress, stops between units when asked, merges the
//! tallies and turns the best candidates into trains. It neither chooses engines nor cuts
//! units (the plan does) nor judges candidates (the space does).

use std::sync::atomic::{AtomicU64, Ordering as AtomicOrdering};

use rayon::prelude::*;

use super::lineup::EngineChoice;
use super::meet;
use super::options::{Outcome, Progress, RunOptions};
use super::plan::{plan, WorkUnit};
use super::space::SearchSpace;
use super::tally::Tally;
use crate::model::problem::Problem;

/// Run a search with the chosen engine on the current rayon pool, keeping the best trains (or
/// the Pareto front) and counting all.
pub fn search(problem: &Problem, engine: EngineChoice, options: &RunOptions) -> Outcome {
    let space = SearchSpace::new(problem, options.cancel);
    let (units, data) = plan(problem, &space, engine, options.shard);
    let engine = engine.engine();
    let judged = AtomicU64::new(0);
    let meet = data.meet.as_ref().map(|d| meet::Meet {
        space: &space,
        values: &d.values,
        pairs: d.pairs.as_ref(),
        judged: &judged,
    });
    let total = units.iter().map(|u| data.ticks(u)).sum();
    let done = AtomicU64::new(0);
    let tick = || {
        let d = done.fetch_add(1, AtomicOrdering::Relaxed) + 1;
        if let Some(p) = options.progress {
            p(Progress { done: d, total });
        }
    };
    let kept = units
        .par_iter()
        .with_max_len(1)
        .fold(
            || Tally::new(problem),
            |mut tally, unit| {
                match (*unit, &meet) {
                    _ if space.cancelled() => {}
                    (WorkUnit::Visit(n, first), _) => engine.visit_unit(&space, n, first, &mut |idx| {
                        if let Some(c) = space.judge(idx) {
                            tally.push(c);
                        }
                    }),
                    (WorkUnit::Meet(u), Some(m)) => m.run(u, &mut tally),
                    (WorkUnit::Meet(_), None) => unreachable!("meet units come with their data"),
                    (WorkUnit::Factor(n), _) => match (&data.factor, data.work(n)) {
                        (Some(f), Some(w)) => {
                            // It ticks as it goes.
                            f.run(&space, w, &mut tally, &tick);
                            return tally;
                        }
                        _ => unreachable!("factor units come with their data"),
                    },
                }
                tick();
                tally
            },
        )
        .reduce(|| Tally::new(problem), Tally::merge);
    let (count, best, pareto_size) = match kept {
        Tally::Top(t) => {
            let (n, b) = t.into_sorted();
            (n, b, None)
        }
        Tally::Front(f) => {
            let (n, mut b) = f.into_sorted(&problem.rank);
            let size = b.len();
            // A part of a split search lists its whole front: the merge needs it to be exact.
            if problem.limit > 0 && options.shard.is_none() {
                b.truncate(problem.limit);
            }
            (n, b, Some(size))
        }
    };
    Outcome {
        count,
        trains: best.iter().map(|c| space.train(c)).collect(),
        pareto_size,
        complete: !space.cancelled(),
        stage_options: space.stages.len(),
        rejected: space.rejections(),
    }
}
