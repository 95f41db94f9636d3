//! Thread cutting on a lathe, a trade workflow on top of the search: which change gears cut a
//! thread on a given lathe, how far off the pitch is, and whether the train can be set up on the
//! banjo. Owns the lathe model and its results; the gear search itself is [`crate::engine`]'s.
//!
//! - [`pitch`]: pitch and leadscrew syntax, exact lengths in mm;
//! - [`machine`]: spindle → stud ratio → change gears → gearbox position → leadscrew;
//! - [`banjo`]: setup geometry and the reasons a setup is rejected;
//! - [`series`]: built-in thread series and list files, their tables in [`series_tables`];
//! - [`lathe_file`]: the lathe described once, in a file;
//! - [`feed`]: turning feeds, searched like a thread;
//! - [`dial`]: which thread-dial lines are safe to engage at;
//! - [`chart`]: the best setup for every thread of a series;
//! - [`chart_buy`]: which gears to buy so that a chart has the most threads;
//! - the output formats for setups and charts are in [`crate::report::thread`].
//!
//! The hand of the thread is set by the tumbler reverse (common practice), so a setup's output
//! direction is not constrained here.

pub mod banjo;
pub mod chart;
pub mod chart_buy;
pub mod dial;
pub mod feed;
pub mod lathe_file;
pub mod machine;
pub mod pitch;
pub mod series;
pub mod series_tables;

use std::cmp::Ordering;

use crate::engine::{search, RunOptions};
use crate::error::{Error, Quantity, Result};
use crate::geometry::on_hand_defects;
use crate::model::pool::Pool;
use crate::model::problem::{
    ExtraKey, Problem, StageLimits, ToothForm, TrainCheck, DEFAULT_SHIFT_SUM, TO_BUY_KEY,
};
use crate::model::purchase::{Purchase, ToBuy};
use crate::model::rank::DEFAULT_RANK;
use crate::model::train::{Gear, Stage, Train};
use crate::numbers::range::IntRange;
use crate::numbers::rational::{Ratio, RelError};
use crate::numbers::target::Target;

use crate::numbers::exact::Exact;
use banjo::{Banjo, Fit};
use dial::{engagement, Dial, Engagement};
use machine::{GearboxPosition, Machine};
use pitch::{Pitch, PitchKind};

/// Largest pitch tolerance accepted: a pitch further off than this is not the thread asked for.
pub const MAX_TOLERANCE: Ratio = match Ratio::from_parts(1, 10) {
    Some(r) => r,
    None => panic!("1/10 is reduced"),
};

/// The tooth counts change gears are commonly sold in for a lathe, 20 to 127 (common practice:
/// sets run from 20 teeth up, and 127 is the transposing gear between inch and metric).
pub const USUAL_CHANGE_GEARS: IntRange = IntRange { lo: 20, hi: 127 };

/// Tolerance used to find the nearest reachable pitch when none is within tolerance.
const NEAREST_TOLERANCE: Ratio = match Ratio::from_parts(1, 3) {
    Some(r) => r,
    None => panic!("1/3 is reduced"),
};

/// The thread wanted.
#[derive(Debug, Clone, PartialEq)]
pub struct ThreadSpec {
    /// Its pitch (distance between neighbouring threads).
    pub pitch: Pitch,
    /// Number of starts, at least 1; lead = starts × pitch.
    pub starts: u32,
    /// True for a turning feed (`pitch` is then the feed per spindle turn, one start).
    pub feed: bool,
}

impl ThreadSpec {
    /// Lead per spindle turn, mm.
    pub fn lead_mm(&self) -> Exact {
        self.pitch.mm.times(Exact::of(Ratio::integer(self.starts as u64)))
    }
}

/// A lathe with its change gears and how to search them.
#[derive(Debug, Clone, PartialEq)]
pub struct Lathe {
    /// The drive from spindle to leadscrew.
    pub machine: Machine,
    /// The change gears on hand (or to be cut).
    pub pool: Pool,
    /// Banjo geometry to check setups against; `None` checks ratios only.
    pub banjo: Option<Banjo>,
    /// Stage counts allowed (1 is a simple train through an idler).
    pub stages: IntRange,
    /// Relative pitch tolerance `|pitch cut / pitch − 1| ≤ T`, `0 ≤ T ≤` [`MAX_TOLERANCE`].
    pub tolerance: Ratio,
    /// How many setups to list (all are counted).
    pub limit: usize,
    /// What else is known of the machine: its name, guard, tumbler reverse, thread dial.
    pub equipment: Equipment,
    /// Gears that may be bought beyond those on hand (set with [`Lathe::buying`]).
    pub buy: Option<Purchase>,
}

/// What a lathe file may say of a machine beyond its drive and gears.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct Equipment {
    /// What the machine is called.
    pub name: Option<String>,
    /// The largest gear the guard closes over, teeth; larger gears are left out of the search.
    pub largest_teeth: Option<u32>,
    /// Tooth counts left out because the guard does not close over them, ascending.
    pub left_out: Vec<u32>,
    /// Whether the hand of the thread is set by a tumbler reverse (`None`: not said).
    pub tumbler_reverse: Option<bool>,
    /// The thread dial, when one is described.
    pub dial: Option<Dial>,
}

impl Lathe {
    /// Check the parts against each other.
    pub fn new(
        machine: Machine,
        pool: Pool,
        banjo: Option<Banjo>,
        stages: IntRange,
        tolerance: Ratio,
        limit: usize,
    ) -> Result<Lathe> {
        if tolerance > MAX_TOLERANCE {
            return Err(Error::value(
                Quantity::Tolerance,
                "a pitch tolerance above 10% cuts a different thread; give 0 (exact) up to 10%",
            ));
        }
        if limit == 0 {
            return Err(Error::value(Quantity::Limit, "list at least one setup"));
        }
        // Problem::new checks the stage range; check it here too so the error comes early.
        let probe = Target::exact("1", Ratio::integer(1), Ratio::integer(0));
        Problem::new(probe, pool.clone(), stages, StageLimits::default(), None, DEFAULT_RANK.to_vec(), 1)?;
        Ok(Lathe {
            machine,
            pool,
            banjo,
            stages,
            tolerance,
            limit,
            equipment: Equipment::default(),
            buy: None,
        })
    }

    /// The lathe with `equipment`: gears larger than the guard allows are left out (and listed
    /// in [`Equipment::left_out`]). Errors name [`Quantity::Lathe`] when no two gears that mesh
    /// are left.
    pub fn equipped(mut self, mut equipment: Equipment) -> Result<Lathe> {
        if let Some(largest) = equipment.largest_teeth {
            let mut left_out: Vec<u32> =
                self.pool.gears.iter().filter(|g| g.teeth > largest).map(|g| g.teeth).collect();
            left_out.sort_unstable();
            left_out.dedup();
            self.pool.gears.retain(|g| g.teeth <= largest);
            let gears = &self.pool.gears;
            let can_mesh =
                gears.iter().any(|a| gears.iter().any(|b| a.group == b.group && a.teeth != b.teeth));
            if !can_mesh {
                return Err(Error::value(
                    Quantity::Lathe,
                    format!(
                        "the guard closes over gears of at most {largest} teeth, and no two of the gears \
                         left can mesh"
                    ),
                ));
            }
            equipment.left_out = left_out;
        }
        self.equipment = equipment;
        Ok(self)
    }

    /// The lathe with gears that may be bought: setups may use up to [`Purchase::most`] gears
    /// not on hand, each setup says which, and fewer to buy rank first. Call after
    /// [`Lathe::equipped`]: the purchase adds to the gears left on hand, and a gear larger than
    /// the guard allows cannot be bought (errors name [`Quantity::BuyTeeth`]). An idler comes
    /// from the gears on hand when one serves, else it may be bought within the budget, and
    /// then it is named among the gears to buy.
    pub fn buying(mut self, purchase: Purchase) -> Result<Lathe> {
        if purchase.on_hand != self.pool {
            return Err(Error::problem("gears to buy must be added to the lathe's gears on hand"));
        }
        if let Some(largest) = self.equipment.largest_teeth.filter(|&z| purchase.teeth.hi > z) {
            return Err(Error::value(
                Quantity::BuyTeeth,
                format!(
                    "the guard closes over gears of at most {largest} teeth, so a gear of {} cannot be used; \
                     give at most {largest}",
                    purchase.teeth.hi
                ),
            ));
        }
        self.buy = Some(purchase);
        Ok(self)
    }

    /// Spindle turns per leadscrew turn of a train of ratio `train` through `position`, exact
    /// unless it outgrows 64-bit parts.
    pub fn spindle_per_leadscrew(&self, train: Ratio, position: Option<&GearboxPosition>) -> Exact {
        let g = position.map_or(Ratio::integer(1), |p| p.ratio);
        Exact::of(self.machine.stud_ratio).times(Exact::of(train)).times(Exact::of(g))
    }
}

/// One way to cut the thread.
#[derive(Debug, Clone, PartialEq)]
pub struct Setup {
    /// The change-gear train, stages from the stud to the leadscrew; `error` is against the
    /// ratio the thread needs.
    pub train: Train,
    /// Where it sits on the banjo (idler, planes), or the plain order when unchecked.
    pub fit: Fit,
    /// The gearbox position used, when the lathe has a gearbox.
    pub position: Option<GearboxPosition>,
    /// Lead cut per spindle turn, mm, recomputed from the gears.
    pub lead_cut_mm: Exact,
    /// Pitch cut (lead / starts), mm.
    pub pitch_cut_mm: Exact,
    /// Relative pitch error `pitch cut / pitch − 1`, exact.
    pub pitch_error: RelError,
    /// True when the setup is for a feed, not a thread.
    pub feed: bool,
    /// Where the half-nuts may be closed again (on the lathe's dial when it has one); `None`
    /// when the spindle turns per leadscrew turn are not exact (a worm's π).
    pub engagement: Option<Engagement>,
    /// With gears to buy: the gears this setup needs bought (empty when all are on hand).
    pub to_buy: Option<Vec<ToBuy>>,
    /// How many arrangements of this setup's gear set (its stud-side and leadscrew-side gears
    /// paired another way) cut the thread and fit the banjo, this one among them.
    pub arrangements: u64,
    /// The other arrangements, best first, when they were asked for
    /// ([`RunOptions::list_arrangements`]); empty otherwise.
    pub others: Vec<Setup>,
}

impl Setup {
    /// The gears by position, from the stud to the leadscrew: `("stud", 40)`, `("idler", 80)`,
    /// `("intermediate driven", 127)`, `("intermediate driver", 50)`, `("leadscrew", 100)`.
    pub fn positions(&self) -> Vec<(String, u32)> {
        let s = &self.train.stages;
        let n = s.len();
        let mut out = vec![("stud".to_string(), s[0].driver.teeth)];
        if let Some(z) = self.fit.idler {
            out.push(("idler".to_string(), z));
        }
        for k in 0..n - 1 {
            let tag = if n == 2 { String::new() } else { format!(" {}", k + 1) };
            out.push((format!("intermediate{tag} driven"), s[k].driven.teeth));
            out.push((format!("intermediate{tag} driver"), s[k + 1].driver.teeth));
        }
        out.push(("leadscrew".to_string(), s[n - 1].driven.teeth));
        out
    }

    /// The train as it turns on the machine, stud to leadscrew: a simple setup through an idler
    /// is two meshes, stud → idler and idler → leadscrew, each at its own centre distance, so
    /// the leadscrew turns the same way as the stud. The ratio is unchanged (the idler's teeth
    /// cancel).
    pub fn mounted_train(&self) -> Train {
        let (Some(zi), [s]) = (self.fit.idler, self.train.stages.as_slice()) else {
            return self.train.clone();
        };
        // An idler chosen from the gears on hand, cut standard.
        let idler = Gear { teeth: zi, labels: Vec::new(), made: Some(Default::default()) };
        // A worked-out mesh was of the direct pair, which the machine does not have; the
        // gears on hand are judged again in the two meshes the machine has.
        let judged = |a: &Gear, b: &Gear| {
            on_hand_defects(
                s.module_mm,
                s.pressure_angle_deg,
                [a.teeth, b.teeth],
                [a.made, b.made],
                ToothForm::Involute,
                &(DEFAULT_SHIFT_SUM.0..=DEFAULT_SHIFT_SUM.1),
            )
        };
        let to_idler = Stage {
            on_hand_defects: judged(&s.driver, &idler),
            driven: idler.clone(),
            mesh: None,
            ..s.clone()
        };
        let from_idler =
            Stage { on_hand_defects: judged(&idler, &s.driven), driver: idler, mesh: None, ..s.clone() };
        Train { stages: vec![to_idler, from_idler], ..self.train.clone() }
    }

    /// How many gears the setup needs bought (0 when all are on hand or none may be bought).
    pub fn to_buy_count(&self) -> u32 {
        self.to_buy.as_ref().map_or(0, |b| b.iter().map(|x| x.count).sum())
    }

    /// Meshes on the machine, the idler's two included.
    pub fn meshes(&self) -> usize {
        self.train.meshes() + usize::from(self.fit.idler.is_some())
    }

    /// Teeth on the stud.
    pub fn stud(&self) -> u32 {
        self.train.stages[0].driver.teeth
    }

    /// Teeth on the leadscrew.
    pub fn leadscrew(&self) -> u32 {
        self.train.stages[self.train.stages.len() - 1].driven.teeth
    }

    /// The compound pairs on the intermediate studs, stud side first: (driven, driver).
    pub fn intermediates(&self) -> Vec<(u32, u32)> {
        self.train.stages.windows(2).map(|w| (w[0].driven.teeth, w[1].driver.teeth)).collect()
    }

    /// True when the pitch cut is the pitch asked for, exactly.
    pub fn is_exact(&self) -> bool {
        self.pitch_error.is_exact() && self.pitch_cut_mm.exact
    }

    /// The error in the sense of the number the thread was given by: for a thread given in
    /// threads per inch the error of that count, `TPI cut / TPI wanted − 1` (the inverse sense of
    /// the pitch error: a pitch too long is a count too low), else the pitch error.
    pub fn shown_error(&self, pitch: &Pitch) -> (RelError, ErrorSense) {
        if self.feed {
            (self.pitch_error, ErrorSense::Feed)
        } else if pitch.kind == PitchKind::Inch {
            (inverse_error(&self.pitch_error), ErrorSense::Tpi)
        } else {
            (self.pitch_error, ErrorSense::Pitch)
        }
    }

    /// Lead error over the pitch's stated length ([`Pitch::lead_error_basis`]), in its unit.
    pub fn lead_error(&self, pitch: &Pitch) -> f64 {
        self.pitch_error.to_f64() * pitch.lead_error_basis().0
    }
}

/// Which number an error shown is the error of.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum ErrorSense {
    /// `TPI cut / TPI wanted − 1`, for threads given in threads per inch.
    Tpi,
    /// `pitch cut / pitch wanted − 1`.
    Pitch,
    /// `feed cut / feed wanted − 1`.
    Feed,
}

impl ErrorSense {
    /// `TPI` or `pitch`, as a table cell's tag and a JSON value.
    pub fn as_str(self) -> &'static str {
        match self {
            ErrorSense::Tpi => "TPI",
            ErrorSense::Pitch => "pitch",
            ErrorSense::Feed => "feed",
        }
    }
}

/// The error of `1/x` given the error `e` of `x`, exact: `1/(1 + e) − 1 = −e/(1 + e)`.
pub fn inverse_error(e: &RelError) -> RelError {
    // e = ±a/d, so 1 + e = (d ± a)/d and −e/(1 + e) = ∓a/(d ± a).
    let den = if e.sign > 0 { e.den + e.abs_num } else { e.den - e.abs_num };
    RelError { abs_num: e.abs_num, sign: -e.sign, den }
}

/// The best setups for one thread.
#[derive(Debug, Clone, PartialEq)]
pub struct ThreadPlan {
    /// What was asked.
    pub thread: ThreadSpec,
    /// Setups meeting every constraint (a lower bound when `complete` is false).
    pub count: u64,
    /// The gear sets those setups are made of (each listed once, by its best arrangement), when
    /// counted.
    pub gear_set_count: Option<u64>,
    /// The best: fewest gears to buy first (when gears may be bought), then smallest pitch error,
    /// fewest meshes, fewest teeth.
    pub setups: Vec<Setup>,
    /// False when the search was interrupted.
    pub complete: bool,
}

/// The relative pitch error of a train of ratio `i` against the needed ratio `need`:
/// pitch cut / pitch − 1 = need / i − 1, exact.
pub fn pitch_error(i: Ratio, need: Ratio) -> RelError {
    let inverse = Ratio::new(need.den() as u128, need.num() as u128).unwrap_or(need);
    RelError::of(i.den(), i.num(), inverse)
}

/// A train tolerance wide enough for a pitch tolerance `t`: |need/i − 1| ≤ t holds only where
/// |i/need − 1| ≤ t/(1 − t). The exact pitch check then decides.
fn widened(t: Ratio) -> Ratio {
    Ratio::new(t.num() as u128, (t.den() - t.num()) as u128).unwrap_or(t)
}

/// Fewest gears to buy first (every setup listed is within the tolerance), then smallest pitch
/// error, fewest meshes, fewest teeth.
fn by_quality(a: &Setup, b: &Setup) -> Ordering {
    a.to_buy_count()
        .cmp(&b.to_buy_count())
        .then(a.pitch_error.cmp_abs(&b.pitch_error))
        .then(a.meshes().cmp(&b.meshes()))
        .then(a.train.size().cmp(&b.train.size()))
}

impl Lathe {
    fn problem(&self, need: Ratio, tolerance: Ratio, limit: usize, geometry: bool) -> Result<Problem> {
        let target = Target::exact(need.to_string(), need, widened(tolerance));
        let mut p = Problem::new(
            target,
            self.pool.clone(),
            self.stages,
            StageLimits::default(),
            None,
            DEFAULT_RANK.to_vec(),
            limit,
        )?;
        // Equal gears turn the leadscrew at the stud's speed: through an idler (40 → idler → 40
        // cuts the leadscrew's own pitch) or on a compound stud they are an ordinary setup.
        p.equal_teeth_stages = true;
        let banjo = if geometry { self.banjo.clone() } else { None };
        let buy = self.buying_pool()?;
        let (pool, bought) = (self.pool.clone(), buy.clone());
        p.train_check = Some(TrainCheck::new(move |t: &Train| {
            pitch_error(t.ratio, need).within(tolerance)
                && banjo.as_ref().is_none_or(|b| fit_buying(b, t, &pool, bought.as_ref()).is_ok())
        }));
        let Some((purchase, _)) = &buy else {
            return Ok(p);
        };
        let mut p = p.with_purchase(purchase.clone())?;
        if let (true, Some(banjo)) = (geometry, self.banjo.clone()) {
            // A bought idler is a gear bought: the ranking counts it with the train's own.
            let pool = self.pool.clone();
            p.extra_key = Some(ExtraKey::new(TO_BUY_KEY, move |t: &Train| {
                let Some((purchase, _)) = &buy else { return 0.0 };
                let idler = fit_buying(&banjo, t, &pool, buy.as_ref()).ok().and_then(|f| f.idler);
                f64::from(purchase.to_buy_with_idler(t, idler).iter().map(|b| b.count).sum::<u32>())
            }));
        }
        Ok(p)
    }

    /// With gears to buy, the purchase and the pool it makes (the gears on hand and those on
    /// offer), which a banjo may take a bought idler from.
    fn buying_pool(&self) -> Result<Option<(Purchase, Pool)>> {
        self.buy.as_ref().map(|b| b.pool().map(|pool| (b.clone(), pool))).transpose()
    }

    fn setup(
        &self,
        thread: &ThreadSpec,
        train: Train,
        position: Option<&GearboxPosition>,
        need: Ratio,
    ) -> Setup {
        let buy = self.buying_pool().ok().flatten();
        let fit = match &self.banjo {
            // The search kept only trains the banjo takes, so a refusal here cannot happen.
            Some(b) => fit_buying(b, &train, &self.pool, buy.as_ref())
                .unwrap_or_else(|why| Fit::unchecked(&train, why.join("; "))),
            None => Fit::unchecked(&train, banjo::NO_BANJO),
        };
        let stages = fit.order.iter().map(|&k| train.stages[k].clone()).collect();
        let train = Train { stages, ..train };
        let lead_cut_mm = self.machine.lead_cut_mm(train.ratio_from_teeth(), position);
        let starts = Exact::of(Ratio::integer(thread.starts as u64));
        let turns = self.spindle_per_leadscrew(train.ratio_from_teeth(), position);
        let engagement = turns.exact.then(|| engagement(turns.value, self.equipment.dial.as_ref()));
        Setup {
            arrangements: 1,
            others: Vec::new(),
            to_buy: self.buy.as_ref().map(|b| b.to_buy_with_idler(&train, fit.idler)),
            feed: thread.feed,
            engagement,
            pitch_error: pitch_error(train.ratio, need),
            fit,
            position: position.cloned(),
            lead_cut_mm,
            pitch_cut_mm: lead_cut_mm.over(starts),
            train,
        }
    }

    /// One search per gearbox position: the position, the train ratio it needs, the problem.
    fn searches(
        &self,
        thread: &ThreadSpec,
        tolerance: Ratio,
        limit: usize,
        geometry: bool,
    ) -> Result<Vec<(Option<&GearboxPosition>, Ratio, Problem)>> {
        let lead = thread.lead_mm();
        let mut out = Vec::new();
        for position in self.machine.positions() {
            let need = self.machine.train_ratio_for(lead, position).value;
            out.push((position, need, self.problem(need, tolerance, limit, geometry)?));
        }
        Ok(out)
    }

    /// The problems [`Lathe::plan`] searches for `thread` (one per gearbox position), and with
    /// `explain` those [`Lathe::explain`] searches too: what a forecast of the run weighs.
    pub fn problems(&self, thread: &ThreadSpec, explain: bool) -> Result<Vec<Problem>> {
        let mut out: Vec<Problem> =
            self.searches(thread, self.tolerance, self.limit, true)?.into_iter().map(|s| s.2).collect();
        if explain && self.banjo.is_some() {
            let rejected = self.searches(thread, self.tolerance, self.explain_limit(), false)?;
            out.extend(rejected.into_iter().map(|s| s.2));
        }
        Ok(out)
    }

    /// How many ratio-only trains [`Lathe::explain`] looks through for ones the banjo refuses.
    fn explain_limit(&self) -> usize {
        self.limit * 4 + 16
    }

    fn run(
        &self,
        thread: &ThreadSpec,
        tolerance: Ratio,
        limit: usize,
        options: &RunOptions,
    ) -> Result<ThreadPlan> {
        let (mut count, mut complete, mut setups) = (0, true, Vec::new());
        let mut gear_set_count = Some(0);
        for (position, need, mut problem) in self.searches(thread, tolerance, limit, true)? {
            // Each gear set once, by its best arrangement among those the banjo takes; a set
            // used at two gearbox positions is two setups.
            problem.gear_sets = true;
            let found = search(&problem, crate::trades::ENGINE, options);
            count += found.count;
            gear_set_count = gear_set_count.zip(found.gear_set_count).map(|(a, b)| a + b);
            complete &= found.complete;
            let sets = found.arrangements;
            setups.extend(found.trains.into_iter().enumerate().map(|(n, t)| {
                let set = sets.get(n);
                Setup {
                    arrangements: set.map_or(1, |a| a.count),
                    others: set.map_or_else(Vec::new, |a| {
                        a.others.iter().map(|o| self.setup(thread, o.clone(), position, need)).collect()
                    }),
                    ..self.setup(thread, t, position, need)
                }
            }));
        }
        setups.sort_by(by_quality);
        setups.truncate(limit);
        Ok(ThreadPlan { thread: thread.clone(), count, gear_set_count, setups, complete })
    }

    /// The best setups for `thread` within the tolerance, across every gearbox position.
    ///
    /// Each position is searched for the train ratio it needs; the engine ranks by ratio error,
    /// which orders setups as the pitch error does except, possibly, between two of nearly equal
    /// error on opposite sides; the setups listed are re-sorted by exact pitch error.
    pub fn plan(&self, thread: &ThreadSpec, options: &RunOptions) -> Result<ThreadPlan> {
        self.run(thread, self.tolerance, self.limit, options)
    }

    /// The nearest setup that can be made when none is within tolerance (pitch off by less than
    /// a third), if any.
    pub fn nearest(&self, thread: &ThreadSpec, options: &RunOptions) -> Result<Option<Setup>> {
        Ok(self.run(thread, NEAREST_TOLERANCE, 1, options)?.setups.into_iter().next())
    }

    /// Trains within tolerance that the banjo refuses, with every reason, best first (at most
    /// `limit`). Empty when no banjo is given.
    pub fn explain(&self, thread: &ThreadSpec, options: &RunOptions) -> Result<Vec<Rejected>> {
        let Some(banjo) = &self.banjo else {
            return Ok(Vec::new());
        };
        let buy = self.buying_pool()?;
        let mut out = Vec::new();
        // Ratio-only searches, then keep what the banjo refuses.
        for (position, need, problem) in self.searches(thread, self.tolerance, self.explain_limit(), false)? {
            for t in search(&problem, crate::trades::ENGINE, options).trains {
                if let Err(reasons) = fit_buying(banjo, &t, &self.pool, buy.as_ref()) {
                    out.push(Rejected {
                        to_buy: self.buy.as_ref().map(|b| b.to_buy(&t)),
                        pitch_error: pitch_error(t.ratio, need),
                        train: t,
                        position: position.cloned(),
                        reasons,
                    });
                }
            }
        }
        out.sort_by(|a, b| {
            let bought =
                |r: &Rejected| r.to_buy.as_ref().map_or(0, |b| b.iter().map(|x| x.count).sum::<u32>());
            bought(a)
                .cmp(&bought(b))
                .then(a.pitch_error.cmp_abs(&b.pitch_error))
                .then(a.train.size().cmp(&b.train.size()))
        });
        out.truncate(self.limit);
        Ok(out)
    }
}

/// Place `train` on `banjo`, a simple train through an idler from the gears `on_hand` first;
/// failing that, when gears may be bought (`buy`: the purchase and the pool it makes) and the
/// train leaves room in the budget, through an idler bought (one more gear of a tooth count on
/// offer, counted by [`Purchase::to_buy_with_idler`]). The rule is the same as `chart --buy`'s.
fn fit_buying(
    banjo: &Banjo,
    train: &Train,
    on_hand: &Pool,
    buy: Option<&(Purchase, Pool)>,
) -> std::result::Result<Fit, Vec<String>> {
    let own = banjo.fit(train, on_hand);
    match (own, buy) {
        (Err(_), Some((purchase, pool)))
            if train.stages.len() == 1 && purchase.count(train) < purchase.most =>
        {
            // Every spare on hand failed above, so an idler found now is one bought.
            banjo.fit(train, pool)
        }
        (own, _) => own,
    }
}

/// A train that cuts the thread but cannot be set up, and why.
#[derive(Debug, Clone, PartialEq)]
pub struct Rejected {
    /// The train, canonical order.
    pub train: Train,
    /// The gearbox position it was found for.
    pub position: Option<GearboxPosition>,
    /// Its pitch error.
    pub pitch_error: RelError,
    /// Why each arrangement failed.
    pub reasons: Vec<String>,
    /// With gears to buy: the gears the train needs bought.
    pub to_buy: Option<Vec<ToBuy>>,
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn pitch_error_is_the_inverse_of_ratio_error() {
        // need 2, train 201/100: pitch cut / pitch = 2 / 2.01 → −1/201.
        let e = pitch_error(Ratio::new(201, 100).unwrap(), Ratio::integer(2));
        assert_eq!(e.sign, -1);
        assert!((e.to_f64() + 1.0 / 201.0).abs() < 1e-15);
        assert!(pitch_error(Ratio::integer(2), Ratio::integer(2)).is_exact());
    }

    #[test]
    fn the_tpi_error_is_the_inverse_sense_of_the_pitch_error() {
        // 11 tpi on an 8 tpi leadscrew needs 11/8; a train of 11/8 · (1 − 1/11000) cuts
        // 10.999 tpi: the count is 1/11000 = 90.9 ppm low, the pitch 1/10999 = 90.9 ppm long.
        let need = Ratio::new(11, 8).unwrap();
        let i = Ratio::new(10999, 8000).unwrap();
        let pitch = pitch_error(i, need);
        assert_eq!(pitch.sign, 1);
        assert!((pitch.to_f64() - 1.0 / 10999.0).abs() < 1e-15);
        let tpi = inverse_error(&pitch);
        assert_eq!(tpi.sign, -1);
        assert!((tpi.to_f64() + 1.0 / 11000.0).abs() < 1e-15);
        // Exactly the ratio error of the train against the need, which is the count's error.
        assert_eq!(tpi.cmp_abs(&RelError::of(i.num(), i.den(), need)), Ordering::Equal);
        assert!(inverse_error(&pitch_error(need, need)).is_exact());
    }

    #[test]
    fn widened_tolerance_covers_the_pitch_tolerance() {
        let t = Ratio::new(1, 100).unwrap();
        let w = widened(t);
        assert_eq!(w.to_string(), "1/99");
        // A train 1/99 high cuts a pitch exactly 1 % short: at the edge, inside.
        let need = Ratio::integer(99);
        let i = Ratio::integer(100);
        assert!(RelError::of(i.num(), i.den(), need).within(w));
        assert!(pitch_error(i, need).within(t));
    }
}
