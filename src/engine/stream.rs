//! Streaming (a limit of 0): every train that satisfies the problem handed out as it is found,
//! in unit order whatever the thread count, in batches so that little is held at once.
//! Streaming visits every train, so only engines that propose trains one by one take part; it
//! keeps no tally.

use std::sync::atomic::{AtomicU64, Ordering as AtomicOrdering};

use rayon::prelude::*;

use super::lineup::EngineChoice;
use super::options::{Outcome, Progress, RunOptions};
use super::plan::proposed_units;
use super::space::SearchSpace;
use crate::model::problem::Problem;
use crate::model::rank::Candidate;
use crate::model::train::Train;

/// Units handled per parallel batch when streaming: bounds what is held at once.
const STREAM_BATCH: usize = 64;

/// Run a search and hand every train that satisfies the problem to `emit`, in a deterministic
/// order (unit by unit, each unit in its enumeration order) whatever the thread count, without
/// holding them all. Returns the outcome with an empty train list. `emit` returning an error
/// stops the search and the error is returned.
pub fn search_each<E>(
    problem: &Problem,
    choice: EngineChoice,
    options: &RunOptions,
    emit: &mut dyn FnMut(&Train) -> Result<(), E>,
) -> Result<Outcome, E> {
    let space = SearchSpace::new(problem, options.cancel);
    // Streaming visits every train, so the bulk engines give way to the stage engine.
    let engine = choice.lineup().stage;
    let units = proposed_units(problem, &space, engine, options.shard);
    let total = units.len() as u64;
    let done = AtomicU64::new(0);
    let mut count = 0u64;
    for batch in units.chunks(STREAM_BATCH) {
        if space.cancelled() {
            break;
        }
        let found: Vec<Vec<Candidate>> = batch
            .par_iter()
            .with_max_len(1)
            .map(|&(n, first)| {
                let mut v = Vec::new();
                if !space.cancelled() {
                    engine.visit_unit(&space, n, first, &mut |idx| v.extend(space.judge(idx)));
                }
                let d = done.fetch_add(1, AtomicOrdering::Relaxed) + 1;
                if let Some(p) = options.progress {
                    p(Progress { done: d, total });
                }
                v
            })
            .collect();
        for c in found.iter().flatten() {
            count += 1;
            emit(&space.train(c))?;
        }
    }
    Ok(Outcome {
        count,
        gear_set_count: None,
        trains: Vec::new(),
        arrangements: Vec::new(),
        pareto_size: None,
        counted_all: true,
        complete: !space.cancelled(),
        stage_options: space.stages.len(),
        rejected: space.rejections(),
    })
}
