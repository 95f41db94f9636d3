//! Reducers, a trade workflow on top of the search, in the reducer designer's words: from the
//! ratio (or motor and output speeds), the number of stages, a module per stage (coarser toward
//! the output), the least teeth, a per-stage ratio limit and optionally the housing's fixed
//! centre distances, find trains ranked for balanced stages and hunting-tooth pairs, and show
//! each stage's module, teeth, profile shifts and centre distance, and the envelope. Owns the
//! reducer model and its results; the search is [`crate::engine`]'s, the meshes
//! [`crate::geometry`]'s.
//!
//! - [`hunting`]: hunting-tooth pairs and the balance key;
//! - [`housing`]: which stage goes in which place, at which centre distance;
//! - [`split`]: a rule of thumb for splitting the ratio across stages, as a ranking key;
//! - [`shop`]: shaft positions, the housing fit (gears clear of other shafts), and each stage's
//!   allowances, backlash and gear data;
//! - the output formats are in [`crate::report::reducer`].
//!
//! One module per stage is held by drawing the gears from a pool with the tooth range in every
//! module and a train check that place `i` (input to output) gets module `i`; the core keeps one
//! pool per problem. gearsieve sizes geometry only; the reports say so.

pub mod housing;
pub mod hunting;
pub mod shop;
pub mod split;

use std::sync::Arc;

use crate::engine::{search, RunOptions};
use crate::error::{Error, Message, Quantity, Result};
use crate::model::pool::{Pool, StockGear, MAX_STAGES};
use crate::model::problem::{ExtraKey, MeshRules, Problem, StageCheck, StageLimits, TrainCheck};
use crate::model::rank::RankKey;
use crate::model::train::{Stage, Train};
use crate::numbers::range::{FloatRange, IntRange, RatioRange};
use crate::numbers::rational::Ratio;
use crate::numbers::target::Target;

use housing::{arranged, Places};
use shop::{ShopRules, TrainShop};

/// Default largest ratio of one spur stage (about 6 is common practice).
pub const DEFAULT_MAX_STAGE_RATIO: u64 = 6;

/// How hunting-tooth pairs count.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Hunting {
    /// Rank trains with fewer non-hunting pairs first.
    Prefer,
    /// Keep only trains whose every pair is hunting.
    Require,
    /// Do not consider it.
    Ignore,
}

/// What ranks first.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Priority {
    /// Hunting pairs (when preferred), then balance in steps of [`hunting::BALANCE_STEP`], then
    /// ratio error, then size.
    Balance,
    /// Ratio error, then hunting and balance, then teeth.
    Error,
    /// Hunting pairs (when preferred), then closeness to the rule of thumb of [`split`] in
    /// steps of [`hunting::BALANCE_STEP`], then ratio error, then size.
    Split,
}

/// What the reducer designer asks for.
#[derive(Debug, Clone, PartialEq)]
pub struct ReducerSpec {
    /// Input turns per output turn, above 1.
    pub ratio: Ratio,
    /// The ratio as given (or worked out from the speeds).
    pub ratio_text: String,
    /// Relative tolerance on the ratio.
    pub tolerance: Ratio,
    /// Stage counts.
    pub stages: IntRange,
    /// Module per stage, input to output (non-decreasing), or one for every stage; empty with
    /// stock to take any module on the shelf.
    pub modules: Vec<f64>,
    /// Tooth counts to cut (ignored with stock).
    pub teeth: IntRange,
    /// Largest ratio of one stage.
    pub max_stage_ratio: Ratio,
    /// Smallest ratio of one stage (`None`: above 1, as any reducing stage).
    pub min_stage_ratio: Option<Ratio>,
    /// Fixed centre distance of each stage, mm, input to output; empty when free.
    pub centre_distances_mm: Vec<f64>,
    /// Allowed profile shift sum per stage, modules.
    pub shift_sum: (f64, f64),
    /// How far beyond their tight distance gears on hand (never re-cut) may stand to meet a
    /// fixed centre distance, mm; also how close a standard distance must be to need no shift.
    pub centre_tolerance_mm: f64,
    /// Hunting-tooth pairs.
    pub hunting: Hunting,
    /// What ranks first.
    pub priority: Priority,
    /// Input speed, rpm, for the output speed.
    pub input_rpm: Option<f64>,
    /// Gears on the shelf, instead of cutting.
    pub stock: Option<Pool>,
    /// Trains to list.
    pub limit: usize,
    /// Backlash, housing tolerance, shaft layout and the housing fit.
    pub shop: ShopRules,
}

/// The result of a reducer search.
#[derive(Debug, Clone, PartialEq)]
pub struct ReducerPlan {
    /// What was asked.
    pub spec: ReducerSpec,
    /// The problem searched.
    pub problem: Problem,
    /// Trains meeting every constraint.
    pub count: u64,
    /// The gear sets those trains are made of; `None` when they were not counted.
    pub gear_set_count: Option<u64>,
    /// False when interrupted.
    pub complete: bool,
    /// The best gear sets, each by its best arrangement (a train), stages input to output, each
    /// with its mesh.
    pub trains: Vec<Train>,
    /// How many arrangements of each listed train's gears meet every constraint, in the order
    /// of `trains`.
    pub arrangements: Vec<u64>,
    /// Each listed train made ready for the shop, in the order of `trains`.
    pub shop: Vec<TrainShop>,
    /// The other arrangements of each listed train's gears, best first, arranged in the housing
    /// like the listed one, when they were asked for ([`RunOptions::list_arrangements`]); in the
    /// order of `trains`, empty lists otherwise.
    pub others: Vec<Vec<Train>>,
}

/// Largest tip diameter of a train, mm (from the meshes; `m·(z + 2)` for a stage without one).
pub fn largest_tip_mm(t: &Train) -> f64 {
    t.stages
        .iter()
        .flat_map(|s| match s.mesh {
            Some(m) => m.tip_diameter_mm,
            None => [s.module_mm * (s.driver.teeth + 2) as f64, s.module_mm * (s.driven.teeth + 2) as f64],
        })
        .fold(0.0, f64::max)
}

/// Sum of the working centre distances, mm: the distance from the input to the output shaft
/// when all shafts lie in one plane.
pub fn centre_distance_sum_mm(t: &Train) -> f64 {
    t.stages.iter().map(|s| s.mesh.map_or(s.centre_distance_mm(), |m| m.centre_distance_mm)).sum()
}

/// Modules one per stage for a fixed stage count above one, coarser toward the output
/// (`1,1.5` for two stages), to show how a list is given; `None` for one stage or a range of
/// counts, where one module for every stage is the way.
pub fn example_modules(stages: IntRange) -> Option<String> {
    const MODULES: [&str; MAX_STAGES] = ["1", "1.5", "2", "2.5", "3", "4"];
    let n = stages.lo as usize;
    (stages.lo == stages.hi && n > 1 && n <= MAX_STAGES).then(|| MODULES[..n].join(","))
}

impl ReducerSpec {
    /// The stage count searched. A list of more than one module or distance gives one per
    /// stage, so the stage count must be exactly its length: a range or another count is
    /// refused rather than narrowed.
    fn stage_range(&self) -> Result<IntRange> {
        let (m, c) = (self.modules.len(), self.centre_distances_mm.len());
        if m > 1 && c > 1 && m != c {
            return Err(Error::value(
                Quantity::StageCentreDistances,
                Message::from(format!("{c} distances given, but ")).quantity(Quantity::StageModules).text(
                    format!(" lists {m} modules; give as many of each (one per stage), or one for all"),
                ),
            ));
        }
        let per_stage = m.max(c);
        if per_stage <= 1 {
            return Ok(self.stages);
        }
        let n = per_stage as u32;
        if self.stages != (IntRange { lo: n, hi: n }) {
            let (list, what, one) = if m > 1 {
                (Quantity::StageModules, format!("{m} modules"), "module")
            } else {
                (Quantity::StageCentreDistances, format!("{c} centre distances"), "distance")
            };
            return Err(Error::value(
                Quantity::StageCount,
                Message::from(format!("{} does not fit ", self.stages)).quantity(list).text(format!(
                    ", which lists {what}, one per stage; give {n} stages, or one {one} for all"
                )),
            ));
        }
        Ok(self.stages)
    }

    fn pool(&self) -> Result<Pool> {
        // The same limits whether the modules are cut or looked for on the shelf.
        for &m in &self.modules {
            crate::model::pool::check_module(m, &|msg| Error::value(Quantity::StageModules, msg))?;
        }
        if let Some(p) = &self.stock {
            return Ok(p.clone());
        }
        let mut modules = self.modules.clone();
        modules.dedup_by(|a, b| (*a - *b).abs() <= 1e-9 * a.abs());
        let stock: Vec<StockGear> = modules
            .iter()
            .flat_map(|&m| {
                (self.teeth.lo..=self.teeth.hi).map(move |teeth| StockGear {
                    teeth,
                    module_mm: m,
                    diametral_pitch: None,
                    pressure_angle_deg: 20.0,
                    quantity: 2 * MAX_STAGES as u32,
                    label: String::new(),
                    made: None,
                    internal: false,
                })
            })
            .collect();
        let pool = Pool::from_stock_at(&stock, &|msg| Error::value(Quantity::ToothRange, msg))?;
        // Gears to cut: any number, as with a tooth range.
        Ok(Pool { from_stock: false, ..pool })
    }

    fn places(&self) -> Places {
        Places {
            modules: self.modules.clone(),
            centre_distances_mm: if self.centre_distances_mm.len() == 1 {
                vec![self.centre_distances_mm[0]; MAX_STAGES]
            } else {
                self.centre_distances_mm.clone()
            },
            rules: MeshRules {
                shift_sum: self.shift_sum,
                centre_tolerance_mm: self.centre_tolerance_mm,
                ..MeshRules::default()
            },
        }
    }

    /// The search problem: per-stage ratio limit, the module and housing fit as a train check,
    /// and the hunting and balance key.
    pub fn problem(&self) -> Result<Problem> {
        if self.ratio <= Ratio::integer(1) {
            return Err(Error::value(
                Quantity::TargetRatio,
                format!("a reducer's ratio is above 1 (input faster than output), found {}", self.ratio),
            ));
        }
        if self.max_stage_ratio <= Ratio::integer(1) {
            return Err(Error::value(Quantity::MaxStageRatio, "wanted a ratio above 1, e.g. 6"));
        }
        if let Some(lo) = self.min_stage_ratio {
            if lo < Ratio::integer(1) || lo > self.max_stage_ratio {
                return Err(Error::value(
                    Quantity::MinStageRatio,
                    Message::from("wanted a ratio of at least 1 and at most ")
                        .quantity(Quantity::MaxStageRatio)
                        .text(format!(" ({}), found {lo}", self.max_stage_ratio)),
                ));
            }
        }
        if self.modules.windows(2).any(|w| w[1] < w[0]) {
            return Err(Error::value(
                Quantity::StageModules,
                "give the modules input to output, coarser toward the output (e.g. 1,1.5,2)",
            ));
        }
        if let Some(a) = self.centre_distances_mm.iter().find(|a| !(a.is_finite() && **a > 0.0)) {
            return Err(Error::value(
                Quantity::StageCentreDistances,
                format!("wanted positive distances in mm, found {a}"),
            ));
        }
        if self.stock.is_none() && self.modules.is_empty() {
            return Err(Error::value(
                Quantity::StageModules,
                match example_modules(self.stages) {
                    Some(list) => format!(
                        "give the module in mm of each stage, input to output, such as {list} for {} stages \
                         (or 1 for every stage)",
                        self.stages
                    ),
                    None => format!("give the module in mm for every stage of {}, such as 1", self.stages),
                },
            ));
        }
        let stages = self.stage_range()?;
        let pool = self.pool()?;
        let mut limits = StageLimits {
            stage_ratio: Some(RatioRange {
                lo: Some(self.min_stage_ratio.unwrap_or(Ratio::integer(1))),
                hi: Some(self.max_stage_ratio),
            }),
            ..StageLimits::default()
        };
        if !self.centre_distances_mm.is_empty() {
            // A stage reaches a fixed distance only from a standard one within about the
            // shift-sum range times the module: leave the rest out of the stage table early.
            let m = pool.groups.iter().map(|g| g.module_mm).fold(0.0, f64::max);
            let slack = (self.shift_sum.0.abs().max(self.shift_sum.1.abs()) + 1.0) * m;
            let lo = self.centre_distances_mm.iter().copied().fold(f64::MAX, f64::min);
            let hi = self.centre_distances_mm.iter().copied().fold(0.0, f64::max);
            limits.centre_distance_mm = Some(FloatRange { lo: (lo - slack).max(0.0), hi: hi + slack });
        }
        let rank = match self.priority {
            Priority::Balance | Priority::Split => vec![RankKey::Extra, RankKey::Error, RankKey::Size],
            Priority::Error => vec![RankKey::Error, RankKey::Extra, RankKey::Size],
        };
        if self.limit == 0 {
            return Err(Error::value(Quantity::Limit, "list at least one train"));
        }
        let target = Target::exact(self.ratio_text.clone(), self.ratio, self.tolerance);
        let mut p = Problem::new(target, pool, stages, limits, None, rank, self.limit)?;
        let places = self.places();
        if self.centre_distances_mm.is_empty() {
            // Free centre distances: the search works out and checks each stage's mesh once.
            p = p.with_mesh_rules(places.rules.clone())?;
        }
        let places = Arc::new(places);
        if !self.centre_distances_mm.is_empty() {
            // A stage that meshes in no place of its module at the housing's distance is left
            // out of the stage table once, rather than train by train.
            let (places, most) = (places.clone(), stages.hi as usize);
            p.stage_checks
                .push(StageCheck::new("FitsNoPlace", move |s: &Stage| places.fits_some_place(s, most)));
        }
        if self.hunting == Hunting::Require {
            // Every stage left is a hunting pair, so no train needs the test again.
            p.stage_checks.push(StageCheck::new("NotHunting", hunting::is_hunting));
        }
        let shop = self.shop;
        p.train_check = Some(TrainCheck::new(move |t: &Train| {
            places.arrange(t).is_some_and(|(order, meshes)| {
                // Housed as arranged: the fit depends on which stage sits where.
                shop.shaft_diameter_mm.is_none() || shop.fits(&arranged(t, &order, &meshes))
            })
        }));
        let prefer = self.hunting == Hunting::Prefer;
        p.extra_key = Some(match self.priority {
            Priority::Split => ExtraKey::new("split", move |t: &Train| split::split_key(t, prefer)),
            _ => ExtraKey::new("balance", move |t: &Train| hunting::balance_key(t, prefer)),
        });
        // One entry per gear set, by its best arrangement in the reducer's order (hunting pairs,
        // balance or split rule, then error and size): the pairing is a choice made for fit.
        p.gear_sets = true;
        Ok(p)
    }

    /// Search, and arrange each train found in its housing places.
    pub fn plan(&self, options: &RunOptions) -> Result<ReducerPlan> {
        let problem = self.problem()?;
        let found = search(&problem, crate::trades::ENGINE, options);
        let places = self.places();
        let place = |t: &Train| match places.arrange(t) {
            Some((order, meshes)) => arranged(t, &order, &meshes),
            None => t.clone(),
        };
        let trains: Vec<Train> = found.trains.iter().map(place).collect();
        let others = found.arrangements.iter().map(|a| a.others.iter().map(place).collect()).collect();
        let shop = trains.iter().map(|t| self.shop.shop(t)).collect();
        Ok(ReducerPlan {
            spec: self.clone(),
            problem,
            count: found.count,
            gear_set_count: found.gear_set_count,
            complete: found.complete,
            arrangements: found.arrangements.iter().map(|a| a.count).collect(),
            trains,
            shop,
            others,
        })
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn spec(modules: &[f64], teeth: IntRange) -> ReducerSpec {
        ReducerSpec {
            ratio: Ratio::integer(10),
            ratio_text: "10".into(),
            tolerance: Ratio::integer(0),
            stages: IntRange { lo: 2, hi: 2 },
            modules: modules.to_vec(),
            teeth,
            max_stage_ratio: Ratio::integer(DEFAULT_MAX_STAGE_RATIO),
            min_stage_ratio: None,
            centre_distances_mm: Vec::new(),
            shift_sum: crate::model::problem::DEFAULT_SHIFT_SUM,
            centre_tolerance_mm: crate::model::problem::DEFAULT_CENTRE_TOLERANCE_MM,
            hunting: Hunting::Prefer,
            priority: Priority::Balance,
            input_rpm: None,
            stock: None,
            limit: 5,
            shop: ShopRules {
                backlash: crate::geometry::allowance::BacklashChoice::Recommended,
                housing_tolerance_mm: 0.0,
                layout: crate::geometry::layout::ShaftLayout::Inline,
                shaft_diameter_mm: None,
                shaft_margin_mm: 0.0,
                rack: crate::geometry::RackProfile::default(),
            },
        }
    }

    #[test]
    fn leaving_out_stages_that_fit_no_place_changes_no_result() {
        // Two places of a fixed housing, modules 1 and 1.5: the stage check must only shrink the
        // stage table, never the trains found (held to the search without it).
        let mut s = spec(&[1.0, 1.5], IntRange { lo: 17, hi: 60 });
        s.ratio = Ratio::integer(8);
        s.ratio_text = "8".into();
        s.tolerance = Ratio::new(2, 100).unwrap();
        s.centre_distances_mm = vec![40.0, 60.0];
        s.limit = 50;
        let with = s.problem().unwrap();
        let without = Problem { stage_checks: Vec::new(), ..with.clone() };
        assert_eq!(with.stage_checks.len(), 1);
        let (a, b) =
            (crate::engine::SearchSpace::new(&with, None), crate::engine::SearchSpace::new(&without, None));
        assert!(a.stages.len() * 4 < b.stages.len(), "{} of {} stages kept", a.stages.len(), b.stages.len());
        assert!(a.rejections().iter().any(|r| r.kind == "FitsNoPlace"));
        let options = RunOptions::default();
        let (x, y) = (
            search(&with, crate::engine::EngineChoice::Sieve, &options),
            search(&without, crate::engine::EngineChoice::Sieve, &options),
        );
        assert!(x.count > 5, "{} trains", x.count);
        assert_eq!((x.count, x.gear_set_count), (y.count, y.gear_set_count));
        assert_eq!(x.trains, y.trains);
    }

    #[test]
    fn errors_name_quantities_and_can_name_another_inside() {
        let e = spec(&[1.0, 1.5, 2.0], IntRange { lo: 17, hi: 100 }).problem().unwrap_err();
        assert_eq!(
            e.to_string(),
            "the stage count: 2 does not fit the module of each stage, which lists 3 modules, one per \
             stage; give 3 stages, or one module for all"
        );
        let short = |q| match q {
            Quantity::StageModules => "MODULES",
            Quantity::StageCount => "STAGES",
            _ => "?",
        };
        assert_eq!(
            e.render(short),
            "STAGES: 2 does not fit MODULES, which lists 3 modules, one per stage; give 3 stages, or one \
             module for all"
        );
        let e = spec(&[1.0], IntRange { lo: 20, hi: 20 }).problem().unwrap_err().to_string();
        assert!(e.starts_with("the tooth range: nothing can mesh: "), "{e}");
        // A range of stage counts is not silently narrowed to the length of a list.
        let mut two = spec(&[1.0, 1.5], IntRange { lo: 17, hi: 100 });
        two.stages = IntRange { lo: 2, hi: 3 };
        let e = two.problem().unwrap_err().to_string();
        assert!(e.starts_with("the stage count: 2..3 does not fit the module of each stage"), "{e}");
        two.stages = IntRange { lo: 2, hi: 2 };
        assert_eq!(two.problem().unwrap().stages, IntRange { lo: 2, hi: 2 });
        let mut none = spec(&[], IntRange { lo: 17, hi: 100 });
        assert_eq!(
            none.problem().unwrap_err().to_string(),
            "the module of each stage: give the module in mm of each stage, input to output, such as 1,1.5 \
             for 2 stages (or 1 for every stage)"
        );
        none.stages = IntRange { lo: 2, hi: 3 };
        assert_eq!(
            none.problem().unwrap_err().to_string(),
            "the module of each stage: give the module in mm for every stage of 2..3, such as 1"
        );
    }
}
