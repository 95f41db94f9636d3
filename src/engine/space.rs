//! The stage space and the exact judge. [`SearchSpace::new`] lists every allowed stage of a
//! problem (same mesh group, different tooth counts, every per-stage limit and mesh check),
//! sorted by ratio, so that a train's canonical form is a non-decreasing sequence of stage
//! indices; [`SearchSpace::judge`] decides each candidate train exactly (integer
//! cross-multiplication, stock quantities, coaxial fit, train checks) and builds the trains
//! that are reported. It owns no engine, no unit of work and no ranking: engines propose, the
//! space decides, the tally keeps.

use std::sync::atomic::{AtomicBool, AtomicU64, Ordering as AtomicOrdering};
use std::sync::{Mutex, OnceLock};

use crate::geometry::Making;
use crate::geometry::{
    check_cycloidal, check_mesh, common_windows, cycloidal_mesh, mesh_as_made, mesh_at_place,
    on_hand_defects, running_window, MeshDefect, MeshGeometry, ToothSystem,
};
use crate::model::pool::{MeshGroup, MAX_STAGES};
use crate::model::problem::{MeshRules, Problem, ToothForm, DEFAULT_SHIFT_SUM};
use crate::model::purchase::Budget;
use crate::model::rank::Candidate;
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
    /// What is wrong with the gears on hand of this stage as they are made (undercut, pointed
    /// tips, low contact ratio), found whether or not the problem checks meshes.
    pub made_defects: Vec<MeshDefect>,
}

/// The rejection kind of trains that could not be made coaxial; counted per train, so it adds
/// up across the parts of a split search.
pub const COAXIAL_MISFIT_KIND: &str = "NotCoaxial";

/// Why some stage pairings or trains were left out, for an explanation.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Rejection {
    /// The kind of defect, e.g. `Undercut`.
    pub kind: String,
    /// How many stage pairings (or trains, for coaxial fit) it removed.
    pub count: u64,
    /// The message for the first one, in shop words.
    pub example: String,
}

/// Count one pairing left out for `kind`, the first of a kind giving the example.
fn count_rejection(rejected: &mut Vec<Rejection>, kind: String, example: impl FnOnce() -> String) {
    match rejected.iter_mut().find(|r| r.kind == kind) {
        Some(r) => r.count += 1,
        None => rejected.push(Rejection { kind, count: 1, example: example() }),
    }
}

fn defect_kind(d: &MeshDefect) -> String {
    let dbg = format!("{d:?}");
    dbg.split([' ', '{', '(']).next().unwrap_or("").to_string()
}

/// Work out one stage's mesh under `rules` at its known centre distance (the fixed one, or as
/// close as the gears go: gears to cut with the undercut split of a zero shift sum), and check
/// it runs. Gears on hand keep their shift and tip (see [`mesh_as_made`]). A cycloidal stage is
/// checked at the fixed distance or its standard one and keeps no involute geometry.
fn stage_mesh(
    rules: &MeshRules,
    group: &MeshGroup,
    teeth: [u32; 2],
    made: Making,
) -> Result<Option<MeshGeometry>, MeshDefect> {
    if rules.tooth_form == ToothForm::Cycloidal {
        let mesh = cycloidal_mesh(group.module_mm, teeth, rules.centre_distance_mm)?;
        return match check_cycloidal(&mesh, &rules.cycloidal, rules.limits.min_contact_ratio).first() {
            Some(d) => Err(*d),
            None => Ok(None),
        };
    }
    let sys = ToothSystem::new(group.module_mm, group.pressure_angle_deg, rules.rack)?;
    let mesh = mesh_at_place(
        &sys,
        teeth,
        made,
        rules.centre_distance_mm,
        &(rules.shift_sum.0..=rules.shift_sum.1),
        rules.centre_tolerance_mm,
    )?;
    match check_mesh(&mesh, &rules.limits).first() {
        Some(d) => Err(*d),
        None => Ok(Some(mesh)),
    }
}

/// Does a train under `rules` need one working centre distance found for it by profile shift?
/// (Coaxial involute trains without a fixed distance; cycloidal teeth take no shift.)
fn needs_fit(rules: &MeshRules) -> bool {
    rules.coaxial && rules.centre_distance_mm.is_none() && rules.tooth_form == ToothForm::Involute
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
    /// With gears to buy, the budget per kind of the pool, for engines that prune on it (the
    /// train check holds every engine to it anyway).
    pub budget: Option<Budget>,
    coaxial_misfits: AtomicU64,
    /// The first train (by stage indices) that found no common centre distance, and why.
    first_misfit: Mutex<Option<(Vec<u32>, String)>>,
    /// Each stage's running window, worked out when a coaxial train first needs it.
    windows: Vec<OnceLock<Vec<(f64, f64)>>>,
    cancel: Option<&'p AtomicBool>,
}

/// Relative widening of the float window: far above the rounding error of a product of six
/// ratios, far below any tolerance worth asking for. Exact checks decide after it.
const FLOAT_MARGIN: f64 = 1e-9;

/// A stage of the table as a train lists it: its gears with their labels and as made, its
/// mesh group, and its mesh (`mesh`, a coaxial train's own, else the table's).
fn listed_stage(problem: &Problem, s: &StageDef, mesh: Option<MeshGeometry>) -> Stage {
    let pool = &problem.pool;
    let gear = |k: u32| {
        let g = &pool.gears[k as usize];
        Gear { teeth: g.teeth, labels: g.labels.clone(), made: g.made }
    };
    let group = &pool.groups[pool.gears[s.driver as usize].group];
    Stage {
        driver: gear(s.driver),
        driven: gear(s.driven),
        module_mm: group.module_mm,
        pressure_angle_deg: group.pressure_angle_deg,
        diametral_pitch: group.diametral_pitch,
        mesh: mesh.or(s.mesh),
        on_hand_defects: s.made_defects.clone(),
    }
}

impl<'p> SearchSpace<'p> {
    /// Build the stage table for `problem`.
    pub fn new(problem: &'p Problem, cancel: Option<&'p AtomicBool>) -> SearchSpace<'p> {
        let pool = &problem.pool;
        let lim = &problem.limits;
        let mut stages = Vec::new();
        let mut rejected: Vec<Rejection> = Vec::new();
        // Coaxial involute trains without a fixed distance find their common distance per train.
        let per_stage_mesh = problem.mesh.as_ref().filter(|r| !needs_fit(r));
        // Gears on hand are judged in the form the meshes are checked in, or else the trade's.
        let form = problem.mesh.as_ref().map_or(problem.tooth_form, |r| r.tooth_form);
        for (i, a) in pool.gears.iter().enumerate() {
            if lim.driver_teeth.is_some_and(|r| !r.contains(a.teeth)) {
                continue;
            }
            for (j, b) in pool.gears.iter().enumerate() {
                if a.group != b.group || (a.teeth == b.teeth && !problem.equal_teeth_stages) {
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
                    Some(rules) => {
                        match stage_mesh(rules, &pool.groups[a.group], [a.teeth, b.teeth], [a.made, b.made]) {
                            Ok(m) => m,
                            Err(d) => {
                                count_rejection(&mut rejected, defect_kind(&d), || d.to_string());
                                continue;
                            }
                        }
                    }
                };
                let def = StageDef {
                    driver: i as u32,
                    driven: j as u32,
                    driver_teeth: a.teeth,
                    driven_teeth: b.teeth,
                    value: b.teeth as f64 / a.teeth as f64,
                    mesh,
                    made_defects: {
                        let g = &pool.groups[a.group];
                        on_hand_defects(
                            g.module_mm,
                            g.pressure_angle_deg,
                            [a.teeth, b.teeth],
                            [a.made, b.made],
                            form,
                            &(DEFAULT_SHIFT_SUM.0..=DEFAULT_SHIFT_SUM.1),
                        )
                    },
                };
                if !problem.stage_checks.is_empty() {
                    let listed = listed_stage(problem, &def, None);
                    if let Some(check) = problem.stage_checks.iter().find(|c| !(c.check)(&listed)) {
                        count_rejection(&mut rejected, check.kind.to_string(), || {
                            format!("{}→{}", a.teeth, b.teeth)
                        });
                        continue;
                    }
                }
                stages.push(def);
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
        let coaxial = problem.mesh.as_ref().is_some_and(needs_fit);
        let windows = if coaxial { stages.iter().map(|_| OnceLock::new()).collect() } else { Vec::new() };
        SearchSpace {
            problem,
            stages,
            values,
            lo: r * (1.0 - t) * (1.0 - FLOAT_MARGIN),
            hi: r * (1.0 + t) * (1.0 + FLOAT_MARGIN),
            rejected,
            budget: problem.buy.as_ref().map(|b| b.budget(pool)),
            coaxial_misfits: AtomicU64::new(0),
            first_misfit: Mutex::new(None),
            windows,
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
        if self.needs_coaxial_fit() {
            if let Err(why) = self.coaxial_fit(idx) {
                self.coaxial_misfits.fetch_add(1, AtomicOrdering::Relaxed);
                // Keep the first by stage indices, so the example is the same whatever the
                // thread count.
                if let Ok(mut first) = self.first_misfit.lock() {
                    if first.as_ref().is_none_or(|(f, _)| idx < f.as_slice()) {
                        *first = Some((idx.to_vec(), why));
                    }
                }
                return None;
            }
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
        self.problem.mesh.as_ref().is_some_and(needs_fit)
    }

    /// A stage's running window: the centre distances at which it runs (see [`running_window`]).
    fn window(&self, i: u32, rules: &MeshRules) -> &[(f64, f64)] {
        self.windows[i as usize].get_or_init(|| {
            let pool = &self.problem.pool;
            let s = &self.stages[i as usize];
            let g = &pool.groups[pool.gears[s.driver as usize].group];
            let made = [pool.gears[s.driver as usize].made, pool.gears[s.driven as usize].made];
            match ToothSystem::new(g.module_mm, g.pressure_angle_deg, rules.rack) {
                Ok(sys) => running_window(
                    &sys,
                    [s.driver_teeth, s.driven_teeth],
                    made,
                    &(rules.shift_sum.0..=rules.shift_sum.1),
                    rules.centre_tolerance_mm,
                    &rules.limits,
                ),
                Err(_) => Vec::new(),
            }
        })
    }

    /// For a coaxial train without a fixed distance: the working centre distance every stage
    /// runs at, and each stage's mesh there. The stages' running windows (every distance at
    /// which the stage passes every check, within the shift-sum range; for gears on hand, from
    /// their tight distance to the centre-distance tolerance beyond it) are intersected, and the
    /// middle of the widest common interval is taken: the distance furthest from every limit.
    pub fn coaxial_meshes(&self, idx: &[u32]) -> Option<Vec<MeshGeometry>> {
        self.coaxial_fit(idx).ok()
    }

    /// [`Self::coaxial_meshes`], or why the stages share no distance, in shop words.
    fn coaxial_fit(&self, idx: &[u32]) -> Result<Vec<MeshGeometry>, String> {
        let rules = self.problem.mesh.as_ref().ok_or_else(String::new)?;
        let pool = &self.problem.pool;
        let name = |i: u32| {
            let s = &self.stages[i as usize];
            format!("{}→{}", s.driver_teeth, s.driven_teeth)
        };
        let windows: Vec<Vec<(f64, f64)>> = idx.iter().map(|&i| self.window(i, rules).to_vec()).collect();
        if let Some(n) = windows.iter().position(Vec::is_empty) {
            return Err(format!(
                "stage {} runs at no centre distance its profile shift range reaches{}",
                name(idx[n]),
                if self.problem.pool.gears[self.stages[idx[n] as usize].driver as usize].made.is_some() {
                    " (gears on hand mesh only near their own distance)"
                } else {
                    ""
                }
            ));
        }
        let common = common_windows(&windows);
        let Some(&(lo, hi)) = common.iter().fold(None, |best: Option<&(f64, f64)>, w| match best {
            Some(b) if b.1 - b.0 >= w.1 - w.0 => Some(b),
            _ => Some(w),
        }) else {
            let runs: Vec<String> = idx
                .iter()
                .zip(&windows)
                .enumerate()
                .map(|(n, (&i, w))| {
                    let spans: Vec<String> = w.iter().map(|(a, b)| format!("{a:.3}–{b:.3} mm")).collect();
                    format!("{} {}at {}", name(i), if n == 0 { "runs only " } else { "" }, spans.join(" or "))
                })
                .collect();
            return Err(format!("no centre distance suits every stage: {}", runs.join(", ")));
        };
        let a_w = 0.5 * (lo + hi);
        let range = (rules.shift_sum.0 - 1e-9)..=(rules.shift_sum.1 + 1e-9);
        idx.iter()
            .map(|&i| {
                let s = &self.stages[i as usize];
                let g = &pool.groups[pool.gears[s.driver as usize].group];
                let made = [pool.gears[s.driver as usize].made, pool.gears[s.driven as usize].made];
                let sys = ToothSystem::new(g.module_mm, g.pressure_angle_deg, rules.rack)
                    .map_err(|d| d.to_string())?;
                let m = mesh_as_made(
                    &sys,
                    [s.driver_teeth, s.driven_teeth],
                    made,
                    Some(a_w),
                    &range,
                    rules.centre_tolerance_mm,
                )
                .map_err(|d| format!("stage {}: {d}", name(i)))?;
                match check_mesh(&m, &rules.limits).first() {
                    Some(d) => Err(format!("stage {} at {a_w:.3} mm: {d}", name(i))),
                    None => Ok(m),
                }
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
                example: match self.first_misfit.lock().ok().and_then(|f| f.as_ref().map(|(_, w)| w.clone()))
                {
                    Some(why) => {
                        format!("trains within tolerance whose stages share no centre distance, e.g. {why}")
                    }
                    None => "trains within tolerance whose stages share no centre distance".into(),
                },
            });
        }
        r
    }

    /// Turn a candidate into a full train for reporting.
    pub fn train(&self, c: &Candidate) -> Train {
        let coaxial = if self.needs_coaxial_fit() { self.coaxial_meshes(c.stage_indices()) } else { None };
        let mut stages: Vec<Stage> = c
            .stage_indices()
            .iter()
            .enumerate()
            .map(|(n, &i)| {
                listed_stage(self.problem, &self.stages[i as usize], coaxial.as_ref().map(|m| m[n]))
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
