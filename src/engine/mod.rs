//! Search engines and the driver that runs them.
//!
//! The driver builds the [`SearchSpace`] (every allowed stage, sorted by ratio, so that a train's
//! canonical form is a non-decreasing sequence of stage indices), splits it into units of work
//! (one per stage count and first stage), runs them in parallel with rayon, and keeps the
//! counts and the best trains. Engines only enumerate candidate stage sequences; the driver
//! decides every candidate exactly (ratio within tolerance, stock quantities), so an engine's
//! pruning can make it faster but never make it wrong.

pub mod exhaustive;
pub mod factor;
pub mod meet;
pub mod sieve;

use std::sync::atomic::{AtomicBool, AtomicU64, Ordering as AtomicOrdering};

use rayon::prelude::*;

use crate::geometry::{
    check_mesh, mesh_geometry, shift_for_centre_distance, MeshDefect, MeshGeometry, Mounting, ToothSystem,
};
use crate::model::pool::{MeshGroup, MAX_STAGES};
use crate::model::problem::{MeshRules, Problem};
use crate::model::rank::{Candidate, ParetoFront, TopK};
use crate::model::train::{Gear, Stage, Train};
use crate::numbers::rational::{Ratio, RelError};

/// One allowed stage: a driver and a driven gear kind of one mesh group meeting every limit.
#[derive(Debug, Clone, PartialEq)]
pub struct StageDef {
    /// Index of the driver in [`crate::model::pool::Pool::gears`].
    pub driver: u32,
    /// Index of the driven gear.
    pub driven: u32,
    /// Driver teeth.
    pub driver_teeth: u32,
    /// Driven teeth.
    pub driven_teeth: u32,
    /// driven / driver as `f64` (for pruning only).
    pub value: f64,
    /// The worked-out mesh, when the problem checks geometry at a known centre distance.
    pub mesh: Option<MeshGeometry>,
}

/// The rejection kind of trains that could not be made coaxial; counted per train, so it adds
/// up across the parts of a split search.
pub const COAXIAL_MISFIT_KIND: &str = "NotCoaxial";

/// Why some stage pairings or trains were left out, for `--explain`.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Rejection {
    /// The kind of defect, e.g. `Undercut`.
    pub kind: String,
    /// How many stage pairings (or trains, for coaxial fit) it removed.
    pub count: u64,
    /// The message for the first one, in shop words.
    pub example: String,
}

fn defect_kind(d: &MeshDefect) -> String {
    let dbg = format!("{d:?}");
    dbg.split([' ', '{', '(']).next().unwrap_or("").to_string()
}

/// Work out one stage's mesh under `rules` at its known centre distance (the fixed one, or the
/// standard one with the undercut split of a zero shift sum), and check it runs.
fn stage_mesh(rules: &MeshRules, group: &MeshGroup, teeth: [u32; 2]) -> Result<MeshGeometry, MeshDefect> {
    let sys = ToothSystem::new(group.module_mm, group.pressure_angle_deg, rules.rack)?;
    let standard = sys.standard_centre_distance_mm(teeth);
    let mesh = match rules.centre_distance_mm {
        Some(a_w) if (a_w - standard).abs() > rules.centre_tolerance_mm => {
            shift_for_centre_distance(&sys, teeth, a_w, &(rules.shift_sum.0..=rules.shift_sum.1))?
        }
        _ => mesh_geometry(&sys, teeth, Mounting::Shifted { shift: sys.split_shift_sum(teeth, 0.0) })?,
    };
    match check_mesh(&mesh, &rules.limits).first() {
        Some(d) => Err(*d),
        None => Ok(mesh),
    }
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
    /// Stage pairings left out by the mesh checks, by kind, most first.
    pub rejected: Vec<Rejection>,
    coaxial_misfits: AtomicU64,
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
        let mut rejected: Vec<Rejection> = Vec::new();
        // Coaxial trains without a fixed distance find their common distance per train.
        let per_stage_mesh = problem.mesh.as_ref().filter(|r| !r.coaxial || r.centre_distance_mm.is_some());
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
                if lim.stage_ratio.is_some_and(|r| !r.contains(b.teeth as u64, a.teeth as u64)) {
                    continue;
                }
                if let Some(cd) = lim.centre_distance_mm {
                    let a_mm =
                        crate::model::train::standard_centre_distance_mm(pool.module_of(i), a.teeth, b.teeth);
                    if !cd.contains(a_mm, 1e-9 * a_mm) {
                        continue;
                    }
                }
                let mesh = match per_stage_mesh {
                    None => None,
                    Some(rules) => match stage_mesh(rules, &pool.groups[a.group], [a.teeth, b.teeth]) {
                        Ok(m) => Some(m),
                        Err(d) => {
                            let kind = defect_kind(&d);
                            match rejected.iter_mut().find(|r| r.kind == kind) {
                                Some(r) => r.count += 1,
                                None => rejected.push(Rejection { kind, count: 1, example: d.to_string() }),
                            }
                            continue;
                        }
                    },
                };
                stages.push(StageDef {
                    driver: i as u32,
                    driven: j as u32,
                    driver_teeth: a.teeth,
                    driven_teeth: b.teeth,
                    value: b.teeth as f64 / a.teeth as f64,
                    mesh,
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
        rejected.sort_by(|x, y| y.count.cmp(&x.count).then(x.kind.cmp(&y.kind)));
        let values = stages.iter().map(|s| s.value).collect();
        let r = problem.target.ratio.to_f64();
        let t = problem.target.tolerance.to_f64();
        SearchSpace {
            problem,
            stages,
            values,
            lo: r * (1.0 - t) * (1.0 - FLOAT_MARGIN),
            hi: r * (1.0 + t) * (1.0 + FLOAT_MARGIN),
            rejected,
            coaxial_misfits: AtomicU64::new(0),
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
            span = span.max(pool.module_of(s.driver as usize) * s.driver_teeth.max(s.driven_teeth) as f64);
        }
        if self.needs_coaxial_fit() && self.coaxial_meshes(idx).is_none() {
            self.coaxial_misfits.fetch_add(1, AtomicOrdering::Relaxed);
            return None;
        }
        let mut c = Candidate { stages, len: idx.len() as u8, error, size, span_mm: span, extra: 0.0 };
        if self.problem.train_check.is_some() || self.problem.extra_key.is_some() {
            let train = self.train(&c);
            if let Some(check) = &self.problem.train_check {
                if !(check.0)(&train) {
                    return None;
                }
            }
            if let Some(k) = &self.problem.extra_key {
                c.extra = (k.key)(&train);
            }
        }
        Some(c)
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
        used[..n].iter().all(|&(g, c)| gears[g as usize].quantity.is_none_or(|q| c <= q))
    }

    pub(crate) fn needs_coaxial_fit(&self) -> bool {
        self.problem.mesh.as_ref().is_some_and(|r| r.coaxial && r.centre_distance_mm.is_none())
    }

    /// For a coaxial train without a fixed distance: one working centre distance every stage
    /// can reach within the shift-sum range (the one nearest the mean of their standard
    /// distances), and each stage's mesh there, if all run.
    pub fn coaxial_meshes(&self, idx: &[u32]) -> Option<Vec<MeshGeometry>> {
        let rules = self.problem.mesh.as_ref()?;
        let pool = &self.problem.pool;
        let mut systems = Vec::with_capacity(idx.len());
        let (mut lo, mut hi, mut mean) = (f64::NEG_INFINITY, f64::INFINITY, 0.0);
        for &i in idx {
            let s = &self.stages[i as usize];
            let g = &pool.groups[pool.gears[s.driver as usize].group];
            let sys = ToothSystem::new(g.module_mm, g.pressure_angle_deg, rules.rack).ok()?;
            let teeth = [s.driver_teeth, s.driven_teeth];
            lo = lo.max(sys.centre_distance_for_shift_sum(teeth, rules.shift_sum.0)?);
            hi = hi.min(sys.centre_distance_for_shift_sum(teeth, rules.shift_sum.1)?);
            mean += sys.standard_centre_distance_mm(teeth) / idx.len() as f64;
            systems.push((sys, teeth));
        }
        if lo > hi {
            return None;
        }
        let a_w = mean.clamp(lo, hi);
        // Widen the range by a hair so the ends of the interval, found by the inverse formula,
        // are not lost to rounding on the way back.
        let range = (rules.shift_sum.0 - 1e-9)..=(rules.shift_sum.1 + 1e-9);
        systems
            .iter()
            .map(|(sys, teeth)| {
                let m = shift_for_centre_distance(sys, *teeth, a_w, &range).ok()?;
                check_mesh(&m, &rules.limits).is_empty().then_some(m)
            })
            .collect()
    }

    /// Everything left out by the mesh checks so far, including trains that could not be made
    /// coaxial.
    pub fn rejections(&self) -> Vec<Rejection> {
        let mut r = self.rejected.clone();
        let misfits = self.coaxial_misfits.load(AtomicOrdering::Relaxed);
        if misfits > 0 {
            r.push(Rejection {
                kind: COAXIAL_MISFIT_KIND.into(),
                count: misfits,
                example: "trains within tolerance whose stages cannot all be shifted to one centre distance"
                    .into(),
            });
        }
        r
    }

    /// Turn a candidate into a full train for reporting.
    pub fn train(&self, c: &Candidate) -> Train {
        let pool = &self.problem.pool;
        let coaxial = if self.needs_coaxial_fit() { self.coaxial_meshes(c.stage_indices()) } else { None };
        let gear = |k: u32| {
            let g = &pool.gears[k as usize];
            Gear { teeth: g.teeth, labels: g.labels.clone() }
        };
        let mut stages: Vec<Stage> = c
            .stage_indices()
            .iter()
            .enumerate()
            .map(|(n, &i)| {
                let s = &self.stages[i as usize];
                let group = &pool.groups[pool.gears[s.driver as usize].group];
                Stage {
                    driver: gear(s.driver),
                    driven: gear(s.driven),
                    module_mm: group.module_mm,
                    pressure_angle_deg: group.pressure_angle_deg,
                    diametral_pitch: group.diametral_pitch,
                    mesh: coaxial.as_ref().map(|m| m[n]).or(s.mesh),
                }
            })
            .collect();
        // Shown finer module first (toward the input, as reducers are built), then in table
        // order: ascending stage ratio. Stable, so one multiset always prints one way.
        stages.sort_by(|a, b| {
            a.module_mm.total_cmp(&b.module_mm).then(a.pressure_angle_deg.total_cmp(&b.pressure_angle_deg))
        });
        let (mut p, mut q) = (1u128, 1u128);
        for &i in c.stage_indices() {
            p *= self.stages[i as usize].driven_teeth as u128;
            q *= self.stages[i as usize].driver_teeth as u128;
        }
        Train { stages, ratio: Ratio::new(p, q).expect("fits"), error: c.error }
    }
}

/// An engine enumerates candidate stage sequences of one unit of work.
pub trait StageEngine: Sync {
    /// The engine's name on the command line.
    fn name(&self) -> &'static str;

    /// Call `visit` with every non-decreasing sequence of `n` stage indices starting with
    /// `first` that might satisfy the problem. Visiting extra sequences is allowed (the driver
    /// judges each exactly); missing one that satisfies is a bug.
    fn visit_unit(&self, space: &SearchSpace, n: usize, first: usize, visit: &mut dyn FnMut(&[u32]));
}

/// Which engines a search may use (`--engine`).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum EngineChoice {
    /// The default: per stage count, the factor engine where it applies
    /// (exact targets), else the meet engine (gears to be cut, up to four stages), else the
    /// sieve.
    Auto,
    /// Depth-first over ratio-sorted stages with bound pruning, for every stage count.
    Sieve,
    /// Every combination, judged one by one: the reference.
    Exhaustive,
}

impl EngineChoice {
    /// The engine that enumerates unit by unit (the bulk engines' fallback for `Auto`).
    fn engine(self) -> &'static dyn StageEngine {
        match self {
            EngineChoice::Auto | EngineChoice::Sieve => &sieve::Sieve,
            EngineChoice::Exhaustive => &exhaustive::Exhaustive,
        }
    }

    /// The engine [`search_each`] runs for this choice: streaming visits every train, so the
    /// bulk engines give way to the sieve. Forecast a stream with this one.
    pub fn streaming(self) -> EngineChoice {
        match self {
            EngineChoice::Auto => EngineChoice::Sieve,
            other => other,
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

/// How to run a search (not what to search).
#[derive(Default)]
pub struct RunOptions<'a> {
    /// Called from worker threads after each unit of work.
    pub progress: Option<&'a (dyn Fn(Progress) + Sync)>,
    /// When set to true, the search stops at the next unit and reports what it has.
    pub cancel: Option<&'a AtomicBool>,
    /// Search only this part of the space.
    pub shard: Option<Shard>,
}

/// What a search found.
#[derive(Debug, Clone, PartialEq)]
pub struct Outcome {
    /// Trains satisfying every constraint (a lower bound when `complete` is false).
    pub count: u64,
    /// The best trains, best first, at most `problem.limit` (for a Pareto search, the front's
    /// first `limit` in rank order).
    pub trains: Vec<Train>,
    /// Size of the Pareto front, for a Pareto search.
    pub pareto_size: Option<usize>,
    /// False when the search was interrupted.
    pub complete: bool,
    /// Stages allowed by the per-stage limits (the size of the stage table).
    pub stage_options: usize,
    /// What the mesh checks left out, for `--explain` (empty without geometry rules).
    pub rejected: Vec<Rejection>,
}

/// The units of work of a search, in their deterministic order, after sharding.
fn units(problem: &Problem, space: &SearchSpace, shard: Option<Shard>) -> Vec<(usize, usize)> {
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
enum WorkUnit {
    /// All trains of `n` stages starting with stage `first`, enumerated by an [`StageEngine`].
    Visit(usize, usize),
    /// A run of the meet engine.
    Meet(meet::MeetUnit),
    /// All trains of `n` stages, counted and listed by the factor engine.
    Factor(usize),
}

/// The distinct ratios and pair table, when the meet engine takes part.
struct MeetData {
    values: meet::DistinctRatios,
    pairs: Option<meet::PairTable>,
}

/// What the bulk engines prepared for a search.
struct EngineData {
    meet: Option<MeetData>,
    factor: Option<factor::FactorTables>,
    /// The factor engine's work, one per stage count it takes.
    works: Vec<factor::BurnsideSum>,
}

impl EngineData {
    fn work(&self, n: usize) -> Option<&factor::BurnsideSum> {
        self.works.iter().find(|w| w.stages() == n)
    }

    /// Progress ticks of a unit: one, or the factor engine's parts and listing.
    fn ticks(&self, unit: &WorkUnit) -> u64 {
        match unit {
            WorkUnit::Factor(n) => self.work(*n).map_or(1, factor::BurnsideSum::ticks),
            _ => 1,
        }
    }
}

/// The stage counts the factor engine takes, and its tables (exact targets only).
fn factor_plan(
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
fn plan(
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
fn meet_counts(
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

/// What a search keeps while it runs.
pub(crate) enum Tally {
    Top(TopK),
    Front(ParetoFront),
}

impl Tally {
    fn new(problem: &Problem) -> Tally {
        if problem.pareto {
            Tally::Front(ParetoFront::default())
        } else {
            Tally::Top(TopK::new(problem.limit, &problem.rank))
        }
    }

    fn push(&mut self, c: Candidate) {
        match self {
            Tally::Top(t) => t.push(c),
            Tally::Front(f) => f.push(c),
        }
    }

    fn push_uncounted(&mut self, c: Candidate) {
        match self {
            Tally::Top(t) => t.push_uncounted(c),
            Tally::Front(f) => f.push_uncounted(c),
        }
    }

    fn add_count(&mut self, n: u64) {
        match self {
            Tally::Top(t) => t.add_count(n),
            Tally::Front(f) => f.add_count(n),
        }
    }

    fn could_accept(&self, best: &Candidate) -> bool {
        match self {
            Tally::Top(t) => t.could_accept(best),
            Tally::Front(f) => f.could_accept(best),
        }
    }

    fn merge(self, other: Tally) -> Tally {
        match (self, other) {
            (Tally::Top(a), Tally::Top(b)) => Tally::Top(a.merge(b)),
            (Tally::Front(a), Tally::Front(b)) => Tally::Front(a.merge(b)),
            _ => unreachable!("one search keeps one kind"),
        }
    }
}

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

/// A forecast of a search's cost, made before it runs.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Estimate {
    /// Stage combinations in the whole space (before any pruning), summed over stage counts.
    pub combinations: f64,
    /// Units of work: those of the unit-by-unit engines and the factor engine's counts.
    pub units: usize,
    /// Projected time on one thread, seconds; `None` when the search is sure to be quick (the
    /// meet engine covers every stage count, or the space is small).
    pub seconds_one_thread: Option<f64>,
    /// True when a sampled unit was cut short by the budget: the time is then a lower bound.
    pub at_least: bool,
    /// True when most of the time goes to work that `--shard` splits; the factor engine's
    /// count of one stage count is a single unit.
    pub shardable: bool,
}

/// `C(s + n − 1, n)` as a float: multisets of `n` stages from `s`.
fn multisets(s: usize, n: usize) -> f64 {
    (0..n).fold(1.0, |acc, i| acc * (s + i) as f64 / (i + 1) as f64)
}

/// Forecast a search on this thread for at most about `budget`: a timed sample of the
/// unit-by-unit engines' units, and the factor engine's own probe estimate of its counts
/// ([`factor::FactorTables::forecast_seconds`]). The meet engine's cost is bounded by its table and
/// is not sampled.
pub fn estimate(problem: &Problem, engine: EngineChoice, budget: std::time::Duration) -> Estimate {
    let space = SearchSpace::new(problem, None);
    let counts = problem.stage_counts();
    let combinations = counts.iter().map(|&n| multisets(space.stages.len(), n)).sum();
    let (by_factor, factor) = factor_plan(problem, &space, engine);
    let by_meet = meet_counts(problem, &space, engine, &by_factor);
    let table_fits = meet::PairTable::fits(meet::DistinctRatios::new(&space).count());
    let visit: Vec<(usize, usize)> = counts
        .iter()
        .filter(|&&n| !by_factor.contains(&n) && !(by_meet.contains(&n) && (n <= 3 || table_fits)))
        .flat_map(|&n| (0..space.stages.len()).map(move |f| (n, f)))
        .collect();
    let works: Vec<factor::BurnsideSum> = factor
        .as_ref()
        .map(|f| by_factor.iter().map(|&n| f.burnside_sum(n, false)).collect())
        .unwrap_or_default();
    let units = visit.len() + works.len();
    if units == 0 || combinations < 1e8 {
        return Estimate { combinations, units, seconds_one_thread: None, at_least: false, shardable: true };
    }
    let share = budget / (!visit.is_empty() as u32 + !works.is_empty() as u32);
    let mut seconds = 0.0;
    let mut at_least = false;
    if !visit.is_empty() {
        // The sample runs in a space of its own whose stop flag a timer raises when the budget
        // is spent, so even one enormous unit cannot hold the forecast up.
        let stop = AtomicBool::new(false);
        let sampled = SearchSpace::new(problem, Some(&stop));
        let e = engine.engine();
        let (s, cut) = timed_sample(visit.len(), share, &stop, &mut |k| {
            let (n, first) = visit[k];
            e.visit_unit(&sampled, n, first, &mut |idx| {
                let _ = sampled.judge(idx);
            });
        });
        seconds += s;
        at_least |= cut;
    }
    let mut unsplit = 0.0;
    if let Some(f) = &factor {
        for work in &works {
            unsplit += f.forecast_seconds(work, share / works.len() as u32);
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
fn timed_sample(
    len: usize,
    budget: std::time::Duration,
    stop: &AtomicBool,
    run: &mut dyn FnMut(usize),
) -> (f64, bool) {
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

/// Units handled per parallel batch when streaming: bounds what is held at once.
const STREAM_BATCH: usize = 64;

/// Run a search and hand every train that satisfies the problem to `emit`, in a deterministic
/// order (unit by unit, each unit in its enumeration order) whatever the thread count, without
/// holding them all. Returns the outcome with an empty train list. `emit` returning an error
/// stops the search and the error is returned.
pub fn search_each<E>(
    problem: &Problem,
    engine: EngineChoice,
    options: &RunOptions,
    emit: &mut dyn FnMut(&Train) -> Result<(), E>,
) -> Result<Outcome, E> {
    let space = SearchSpace::new(problem, options.cancel);
    let engine = engine.engine();
    let units = units(problem, &space, options.shard);
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
        trains: Vec::new(),
        pareto_size: None,
        complete: !space.cancelled(),
        stage_options: space.stages.len(),
        rejected: space.rejections(),
    })
}
