//! Search engines and the driver that runs them.
//!
//! The driver builds the [`SearchSpace`] (every allowed stage, sorted by ratio, so that a train's
//! canonical form is a non-decreasing sequence of stage indices), splits it into units of work
//! (one per stage count and first stage), runs them in parallel with rayon, and keeps the
//! counts and the best trains. Engines only enumerate candidate stage sequences; the driver
//! decides every candidate exactly (ratio within tolerance, stock quantities), so an engine's
//! pruning can make it faster but never make it wrong.

pub mod exhaustive;
pub mod sieve;

use std::sync::atomic::{AtomicBool, AtomicU64, Ordering as AtomicOrdering};

use rayon::prelude::*;

use crate::pool::MAX_STAGES;
use crate::problem::Problem;
use crate::rank::{Candidate, TopK};
use crate::rational::{Ratio, RelError};
use crate::train::{Gear, Stage, Train};

/// One allowed stage: a driver and a driven gear kind of one mesh group meeting every limit.
#[derive(Debug, Clone, PartialEq)]
pub struct StageDef {
    /// Index of the driver in [`crate::pool::Pool::gears`].
    pub driver: u32,
    /// Index of the driven gear.
    pub driven: u32,
    /// Driver teeth.
    pub driver_teeth: u32,
    /// Driven teeth.
    pub driven_teeth: u32,
    /// driven / driver as `f64` (for pruning only).
    pub value: f64,
}

/// Everything an engine needs, prepared once per search.
pub struct SearchSpace<'p> {
    /// The problem.
    pub problem: &'p Problem,
    /// Allowed stages sorted by (ratio, driver teeth, driven teeth, module, pressure angle).
    pub stages: Vec<StageDef>,
    /// `stages[i].value`, contiguous for fast searching.
    pub values: Vec<f64>,
    /// Lower bound of acceptable train ratios, widened a little below the exact bound.
    pub lo: f64,
    /// Upper bound, widened a little above the exact bound.
    pub hi: f64,
    cancel: Option<&'p AtomicBool>,
}

/// Relative widening of the float window: far above the rounding error of a product of six
/// ratios, far below any tolerance worth asking for. Exact checks decide after it.
const FLOAT_MARGIN: f64 = 1e-9;

impl<'p> SearchSpace<'p> {
    /// Build the stage table for `problem`.
    pub fn new(problem: &'p Problem, cancel: Option<&'p AtomicBool>) -> SearchSpace<'p> {
        let pool = &problem.pool;
        let lim = &problem.limits;
        let mut stages = Vec::new();
        for (i, a) in pool.gears.iter().enumerate() {
            if lim.driver_teeth.is_some_and(|r| !r.contains(a.teeth)) {
                continue;
            }
            for (j, b) in pool.gears.iter().enumerate() {
                if a.group != b.group || a.teeth == b.teeth {
                    continue;
                }
                if lim.driven_teeth.is_some_and(|r| !r.contains(b.teeth)) {
                    continue;
                }
                if lim
                    .stage_ratio
                    .is_some_and(|r| !r.contains(b.teeth as u64, a.teeth as u64))
                {
                    continue;
                }
                if let Some(cd) = lim.centre_distance_mm {
                    let a_mm = crate::train::standard_centre_distance_mm(
                        pool.module_of(i),
                        a.teeth,
                        b.teeth,
                    );
                    if !cd.contains(a_mm, 1e-9 * a_mm) {
                        continue;
                    }
                }
                stages.push(StageDef {
                    driver: i as u32,
                    driven: j as u32,
                    driver_teeth: a.teeth,
                    driven_teeth: b.teeth,
                    value: b.teeth as f64 / a.teeth as f64,
                });
            }
        }
        stages.sort_by(|x, y| {
            (x.driven_teeth as u64 * y.driver_teeth as u64)
                .cmp(&(y.driven_teeth as u64 * x.driver_teeth as u64))
                .then(x.driver_teeth.cmp(&y.driver_teeth))
                .then(x.driven_teeth.cmp(&y.driven_teeth))
                .then_with(|| {
                    let gx = &pool.groups[pool.gears[x.driver as usize].group];
                    let gy = &pool.groups[pool.gears[y.driver as usize].group];
                    gx.module_mm
                        .total_cmp(&gy.module_mm)
                        .then(gx.pressure_angle_deg.total_cmp(&gy.pressure_angle_deg))
                })
        });
        let values = stages.iter().map(|s| s.value).collect();
        let r = problem.target.ratio.to_f64();
        let t = problem.target.tolerance.to_f64();
        SearchSpace {
            problem,
            stages,
            values,
            lo: r * (1.0 - t) * (1.0 - FLOAT_MARGIN),
            hi: r * (1.0 + t) * (1.0 + FLOAT_MARGIN),
            cancel,
        }
    }

    /// Has the user asked to stop?
    pub fn cancelled(&self) -> bool {
        self.cancel.is_some_and(|c| c.load(AtomicOrdering::Relaxed))
    }

    /// Exact verdict on a stage sequence: `Some(candidate)` when its ratio is within tolerance and
    /// the stock holds enough of every gear it uses.
    pub fn judge(&self, idx: &[u32]) -> Option<Candidate> {
        let (mut p, mut q) = (1u64, 1u64);
        for &i in idx {
            let s = &self.stages[i as usize];
            p *= s.driven_teeth as u64;
            q *= s.driver_teeth as u64;
        }
        let error = RelError::of(p, q, self.problem.target.ratio);
        if !error.within(self.problem.target.tolerance) {
            return None;
        }
        if self.problem.pool.from_stock && !self.stock_suffices(idx) {
            return None;
        }
        let pool = &self.problem.pool;
        let mut stages = [0u32; MAX_STAGES];
        stages[..idx.len()].copy_from_slice(idx);
        let (mut size, mut span) = (0u32, 0f64);
        for &i in idx {
            let s = &self.stages[i as usize];
            size += s.driver_teeth + s.driven_teeth;
            span = span
                .max(pool.module_of(s.driver as usize) * s.driver_teeth.max(s.driven_teeth) as f64);
        }
        Some(Candidate {
            stages,
            len: idx.len() as u8,
            error,
            size,
            span_mm: span,
        })
    }

    /// Does the stock hold every gear the sequence uses, counting repeats across the train?
    pub fn stock_suffices(&self, idx: &[u32]) -> bool {
        let gears = &self.problem.pool.gears;
        let mut used: [(u32, u32); 2 * MAX_STAGES] = [(u32::MAX, 0); 2 * MAX_STAGES];
        let mut n = 0;
        for &i in idx {
            let s = &self.stages[i as usize];
            for g in [s.driver, s.driven] {
                match used[..n].iter_mut().find(|(k, _)| *k == g) {
                    Some(e) => e.1 += 1,
                    None => {
                        used[n] = (g, 1);
                        n += 1;
                    }
                }
            }
        }
        used[..n]
            .iter()
            .all(|&(g, c)| gears[g as usize].quantity.is_none_or(|q| c <= q))
    }

    /// Turn a candidate into a full train for reporting.
    pub fn train(&self, c: &Candidate) -> Train {
        let pool = &self.problem.pool;
        let gear = |k: u32| {
            let g = &pool.gears[k as usize];
            Gear {
                teeth: g.teeth,
                labels: g.labels.clone(),
            }
        };
        let mut stages: Vec<Stage> = c
            .stage_indices()
            .iter()
            .map(|&i| {
                let s = &self.stages[i as usize];
                let group = &pool.groups[pool.gears[s.driver as usize].group];
                Stage {
                    driver: gear(s.driver),
                    driven: gear(s.driven),
                    module_mm: group.module_mm,
                    pressure_angle_deg: group.pressure_angle_deg,
                    diametral_pitch: group.diametral_pitch,
                }
            })
            .collect();
        // Shown finer module first (toward the input, as reducers are built), then in table
        // order: ascending stage ratio. Stable, so one multiset always prints one way.
        stages.sort_by(|a, b| {
            a.module_mm
                .total_cmp(&b.module_mm)
                .then(a.pressure_angle_deg.total_cmp(&b.pressure_angle_deg))
        });
        let (mut p, mut q) = (1u128, 1u128);
        for &i in c.stage_indices() {
            p *= self.stages[i as usize].driven_teeth as u128;
            q *= self.stages[i as usize].driver_teeth as u128;
        }
        Train {
            stages,
            ratio: Ratio::new(p, q).expect("fits"),
            error: c.error,
        }
    }
}

/// An engine enumerates candidate stage sequences of one unit of work.
pub trait Engine: Sync {
    /// The engine's name on the command line.
    fn name(&self) -> &'static str;

    /// Call `visit` with every non-decreasing sequence of `n` stage indices starting with
    /// `first` that might satisfy the problem. Visiting extra sequences is allowed (the driver
    /// judges each exactly); missing one that satisfies is a bug.
    fn visit_unit(
        &self,
        space: &SearchSpace,
        n: usize,
        first: usize,
        visit: &mut dyn FnMut(&[u32]),
    );
}

/// The engines gearsieve ships.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum EngineKind {
    /// Depth-first over ratio-sorted stages with bound pruning (the default).
    Sieve,
    /// Every combination, judged one by one: the reference.
    Exhaustive,
}

impl EngineKind {
    fn engine(self) -> &'static dyn Engine {
        match self {
            EngineKind::Sieve => &sieve::Sieve,
            EngineKind::Exhaustive => &exhaustive::Exhaustive,
        }
    }
}

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
}

/// What a search found.
#[derive(Debug, Clone, PartialEq)]
pub struct Outcome {
    /// Trains satisfying every constraint (a lower bound when `complete` is false).
    pub count: u64,
    /// The best trains, best first, at most `problem.limit`.
    pub trains: Vec<Train>,
    /// False when the search was interrupted.
    pub complete: bool,
    /// Stages allowed by the per-stage limits (the size of the stage table).
    pub stage_options: usize,
}

/// Run a search with the chosen engine on the current rayon pool.
pub fn search(problem: &Problem, engine: EngineKind, options: &RunOptions) -> Outcome {
    let space = SearchSpace::new(problem, options.cancel);
    let engine = engine.engine();
    let units: Vec<(usize, usize)> = problem
        .stage_counts()
        .into_iter()
        .flat_map(|n| (0..space.stages.len()).map(move |f| (n, f)))
        .collect();
    let total = units.len() as u64;
    let done = AtomicU64::new(0);
    let keys = &problem.rank;
    let top = units
        .par_iter()
        .with_max_len(1)
        .fold(
            || TopK::new(problem.limit, keys),
            |mut top, &(n, first)| {
                if !space.cancelled() {
                    engine.visit_unit(&space, n, first, &mut |idx| {
                        if let Some(c) = space.judge(idx) {
                            top.push(c);
                        }
                    });
                }
                let d = done.fetch_add(1, AtomicOrdering::Relaxed) + 1;
                if let Some(p) = options.progress {
                    p(Progress { done: d, total });
                }
                top
            },
        )
        .reduce(|| TopK::new(problem.limit, keys), TopK::merge);
    let (count, best) = top.into_sorted();
    Outcome {
        count,
        trains: best.iter().map(|c| space.train(c)).collect(),
        complete: !space.cancelled(),
        stage_options: space.stages.len(),
    }
}
