//! The forecast of a search's cost, made before it runs: a timed sample of the units that
//! engines propose one by one, and the bulk engines' own estimates of work their tables do not
//! bound. It runs nothing to completion and keeps no trains.

use std::sync::atomic::{AtomicBool, Ordering as AtomicOrdering};
use std::time::Duration;

use super::kinds::BulkPlan;
use super::lineup::EngineChoice;
use super::plan::assign;
use super::space::SearchSpace;
use crate::model::problem::Problem;

/// A forecast of a search's cost, made before it runs.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Estimate {
    /// Stage combinations in the whole space (before any pruning), summed over stage counts.
    pub combinations: f64,
    /// Units of work forecast: those of the stage engine, and the stage counts a bulk engine
    /// forecasts itself (the factor engine's counts, the meet engine's five and six stages).
    pub units: usize,
    /// Projected time on one thread, seconds; `None` when the search is sure to be quick (the
    /// meet engine covers every stage count up to four, or the space is small).
    pub seconds_one_thread: Option<f64>,
    /// True when a sampled unit was cut short by the budget: the time is then a lower bound.
    pub at_least: bool,
    /// True when most of the time goes to work that a split search (a shard) splits; the factor
    /// engine's count of one stage count is a single unit.
    pub shardable: bool,
}

/// `C(s + n − 1, n)` as a float: multisets of `n` stages from `s`.
fn multisets(s: usize, n: usize) -> f64 {
    (0..n).fold(1.0, |acc, i| acc * (s + i) as f64 / (i + 1) as f64)
}

/// Forecast a search on this thread for at most about `budget`: a timed sample of the units
/// the stage engine would run, and the bulk engines' own estimates of the stage counts they
/// forecast themselves (the factor engine's probe estimate of its counts, the meet engine's
/// random descents through its prefixes of five and six stages). The meet engine's cost up to
/// four stages is bounded by its tables and is not forecast.
pub fn estimate(problem: &Problem, choice: EngineChoice, budget: Duration) -> Estimate {
    let space = SearchSpace::new(problem, None);
    let counts = problem.stage_counts();
    let combinations = counts.iter().map(|&n| multisets(space.stages.len(), n)).sum();
    let assigned = assign(problem, &space, choice.lineup_for(problem.count));
    let proposed: Vec<(usize, usize)> =
        assigned.stage_counts.iter().flat_map(|&n| (0..space.stages.len()).map(move |f| (n, f))).collect();
    let bulk_work: Vec<(&dyn BulkPlan, usize)> = assigned
        .bulk
        .iter()
        .flat_map(|b| b.forecast_counts().iter().map(move |&n| (b.as_ref(), n)))
        .collect();
    let units = proposed.len() + bulk_work.len();
    if units == 0 || combinations < 1e8 {
        return Estimate { combinations, units, seconds_one_thread: None, at_least: false, shardable: true };
    }
    let share = budget / (!proposed.is_empty() as u32 + !bulk_work.is_empty() as u32);
    let mut seconds = 0.0;
    let mut at_least = false;
    if !proposed.is_empty() {
        // The sample runs in a space of its own whose stop flag a timer raises when the budget
        // is spent, so even one enormous unit cannot hold the forecast up.
        let stop = AtomicBool::new(false);
        let sampled = SearchSpace::new(problem, Some(&stop));
        let (s, cut) = timed_sample(proposed.len(), share, &stop, &mut |k| {
            let (n, first) = proposed[k];
            assigned.stage.visit_unit(&sampled, n, first, &mut |idx| {
                let _ = sampled.judge(idx);
            });
        });
        seconds += s;
        at_least |= cut;
    }
    let mut unsplit = 0.0;
    for &(plan, n) in &bulk_work {
        let s = plan.forecast_seconds(&space, n, share / bulk_work.len() as u32);
        match plan.forecast_splits() {
            true => seconds += s,
            false => unsplit += s,
        }
    }
    Estimate {
        combinations,
        units,
        seconds_one_thread: Some(seconds + unsplit),
        at_least,
        shardable: seconds >= unsplit,
    }
}

/// Time `run` on up to 64 of `len` items spread evenly over them (so cheap and dear ones are
/// both seen) for at most about `budget`, after which a timer raises `stop`; return the time
/// projected for all `len` items on one thread, and whether an item was cut short (the
/// projection is then a lower bound).
fn timed_sample(len: usize, budget: Duration, stop: &AtomicBool, run: &mut dyn FnMut(usize)) -> (f64, bool) {
    stop.store(false, AtomicOrdering::Relaxed);
    let start = std::time::Instant::now();
    let sample = 64.min(len);
    let (done_tx, done_rx) = std::sync::mpsc::channel::<()>();
    let mut timed = 0usize;
    std::thread::scope(|scope| {
        scope.spawn(move || {
            if done_rx.recv_timeout(budget).is_err() {
                stop.store(true, AtomicOrdering::Relaxed);
            }
        });
        for k in 0..sample {
            run(k * len / sample);
            // An item cut short still counts as one: the projection is then a lower bound.
            timed += 1;
            if stop.load(AtomicOrdering::Relaxed) {
                break;
            }
        }
        let _ = done_tx.send(());
    });
    let per_item = start.elapsed().as_secs_f64() / timed.max(1) as f64;
    (per_item * len as f64, stop.load(AtomicOrdering::Relaxed))
}
