//! The going train, wheels driving pinions: from the centre arbor, which turns once an hour and
//! carries the minute hand, to the escape arbor, and — when the train starts from a slower arbor
//! (the great wheel or the barrel) — from that arbor to the centre arbor as a part of its own
//! ([`super::part`]), so the centre arbor always turns once an hour. Works out the ratio the
//! beat needs, searches it, gives each train's arbor speeds, rate error in seconds per day and
//! the arbor that can carry a seconds hand, and the run time's figures: the barrel's turns and,
//! for a weight on a line barrel, the weight's drop.

use super::beat::{Beat, Escapement};
use super::part::{MeshCheck, Part, PartPlan};
use super::{approx_ratio, arbor_speeds, clock_problem, SECONDS_PER_DAY};
use crate::engine::{search, Outcome, RunOptions};
use crate::error::{Error, Quantity, Result};
use crate::geometry::CycloidalMesh;
use crate::model::pool::Pool;
use crate::model::problem::{Problem, StageLimits, ToothForm};
use crate::model::train::Train;
use crate::numbers::exact::Exact;
use crate::numbers::range::IntRange;
use crate::numbers::rational::Ratio;
use crate::numbers::target::Target;

/// Default wheel teeth of a going train (common practice, settable).
pub const DEFAULT_WHEELS: IntRange = IntRange { lo: 30, hi: 130 };
/// Default pinion leaves (clock pinions from 6 leaves — common practice, settable).
pub const DEFAULT_PINIONS: IntRange = IntRange { lo: 6, hi: 16 };

/// Largest rate tolerance accepted, seconds per day: a clock a tenth of a day out is not
/// keeping time.
pub const MAX_RATE_TOLERANCE_S_PER_DAY: u64 = 8640;

/// Parse a rate tolerance in seconds per day: `0` (exact), `5`, `0.5`, `1/2`. Errors name
/// [`Quantity::RateTolerance`].
pub fn parse_rate_tolerance(text: &str) -> Result<Ratio> {
    if text.trim().parse::<f64>().is_ok_and(|v| v == 0.0) {
        return Ok(Ratio::integer(0));
    }
    crate::numbers::target::parse_ratio(text, Quantity::RateTolerance).map_err(|_| {
        Error::value(
            Quantity::RateTolerance,
            format!("\"{}\" is not a rate; wanted seconds per day such as 0, 5 or 0.5", text.trim()),
        )
    })
}

/// What the clockmaker asks for.
#[derive(Debug, Clone, PartialEq)]
pub struct GoingSpec {
    /// The pendulum's beat.
    pub beat: Beat,
    /// The escape wheel.
    pub escapement: Escapement,
    /// Turns per hour of the arbor the train starts from (1 for the centre arbor; below 1 for
    /// the great wheel or barrel, which then drives the centre arbor through a part of its own).
    pub from_turns_per_hour: Ratio,
    /// Stage counts from the great wheel to the centre arbor.
    pub great_stages: IntRange,
    /// The run time asked for, hours, if any.
    pub run_hours: Option<Ratio>,
    /// The weight's line barrel, if the clock is weight-driven and its drop is wanted.
    pub line_barrel: Option<LineBarrel>,
    /// Wheel blanks to be cut or on hand.
    pub pool: Pool,
    /// Wheel teeth allowed (the drivers).
    pub wheels: IntRange,
    /// Pinion leaves allowed (the driven).
    pub pinions: IntRange,
    /// Stage counts, each stage a wheel driving a pinion.
    pub stages: IntRange,
    /// Largest rate error accepted, seconds per day (0 for exact), exactly as given.
    pub rate_tolerance_s_per_day: Ratio,
    /// The meshes to check, if any.
    pub meshes: Option<MeshCheck>,
    /// Gear sets to list, each by its first arrangement.
    pub limit: usize,
}

/// Default stage counts from the great wheel to the centre arbor (one for a 30-hour or
/// eight-day clock, two for a month clock — common practice).
pub const DEFAULT_GREAT_STAGES: IntRange = IntRange { lo: 1, hi: 2 };

/// A weight's line wound on a barrel.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct LineBarrel {
    /// Diameter the line winds on, mm.
    pub diameter_mm: f64,
    /// Falls of the line: 1 for a weight hung straight from the barrel, 2 with one pulley.
    pub falls: u32,
}

/// What the run time asks of the barrel.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct RunFigures {
    /// The run time asked for, hours, exactly as given.
    pub run_hours: Ratio,
    /// Turns of the driving arbor (barrel or great wheel) over the run time, exactly.
    pub barrel_turns: Ratio,
    /// The weight's drop over the run time, m, when the line barrel is given.
    pub drop_m: Option<f64>,
}

/// One going train with its clock figures.
#[derive(Debug, Clone, PartialEq)]
pub struct GoingTrain {
    /// The train, stages from the driving arbor to the escape arbor (driver = wheel).
    pub train: Train,
    /// Turns per hour of each arbor, driving arbor first, escape arbor last.
    pub arbor_turns_per_hour: Vec<f64>,
    /// Rate error, seconds per day; positive gains.
    pub rate_s_per_day: f64,
    /// The arbor that turns once a minute and can carry a seconds hand (its index in
    /// `arbor_turns_per_hour`), when one does so exactly.
    pub seconds_arbor: Option<usize>,
    /// The cycloidal pair of every stage, when the meshes were checked in that form.
    pub cycloidal: Vec<CycloidalMesh>,
    /// How many arrangements of its wheels and pinions into stages make a going train (this one
    /// among them).
    pub arrangements: u64,
    /// The set's other arrangements, in stage order, when every arrangement was asked for
    /// (each with no others of its own); else empty.
    pub others: Vec<GoingTrain>,
}

/// The result of a going-train search.
#[derive(Debug, Clone, PartialEq)]
pub struct GoingPlan {
    /// What was asked.
    pub spec: GoingSpec,
    /// The problem searched (its target is the ratio the beat needs).
    pub problem: Problem,
    /// Escape arbor turns per hour.
    pub escape_turns_per_hour: f64,
    /// The part from the great wheel (or barrel) to the centre arbor, when the train starts
    /// from a slower arbor than the centre.
    pub great: Option<PartPlan>,
    /// What the run time asks of the barrel, when a run time was given.
    pub run: Option<RunFigures>,
    /// Trains meeting every constraint.
    pub count: u64,
    /// The gear sets those trains are made of; `None` when they were not counted.
    pub gear_set_count: Option<u64>,
    /// False when interrupted.
    pub complete: bool,
    /// The best gear sets, each by its first arrangement in stage order.
    pub trains: Vec<GoingTrain>,
}

impl GoingSpec {
    /// The ratio the beat needs from the centre arbor (one turn an hour) to the escape arbor
    /// (input turns per output turn: 1 / escape arbor turns per hour), and whether it is exact.
    pub fn needed_ratio(&self) -> (Ratio, bool) {
        match self.escapement.exact_turns_per_hour(&self.beat) {
            Some(escape) => {
                let r = Exact::of(Ratio::integer(1)).over(Exact::of(escape));
                (r.value, r.exact)
            }
            None => {
                let escape = self.escapement.turns_per_hour(&self.beat);
                (approx_ratio(1.0 / escape), false)
            }
        }
    }

    /// Whether the train starts from an arbor slower than the centre arbor.
    pub fn from_great_wheel(&self) -> bool {
        self.from_turns_per_hour != Ratio::integer(1)
    }

    /// The part from the driving arbor (great wheel or barrel) to the centre arbor, when the
    /// train starts from another arbor than the centre.
    pub fn great_part(&self) -> Option<Part> {
        self.from_great_wheel().then(|| Part {
            arbors: ["great wheel", "intermediate", "second intermediate", "centre"]
                .iter()
                .take(self.great_stages.hi as usize)
                .chain(std::iter::once(&"centre"))
                .map(|s| s.to_string())
                .collect(),
            ratio: self.from_turns_per_hour,
            drivers: self.wheels,
            driven: self.pinions,
            stages: self.great_stages,
        })
    }

    /// What the run time asks of the barrel, when one was given.
    pub fn run_figures(&self) -> Option<RunFigures> {
        let run_hours = self.run_hours?;
        let barrel_turns = Exact::of(run_hours).times(Exact::of(self.from_turns_per_hour)).value;
        Some(RunFigures {
            run_hours,
            barrel_turns,
            drop_m: self.line_barrel.map(|b| {
                barrel_turns.to_f64() * std::f64::consts::PI * b.diameter_mm / 1000.0 / b.falls as f64
            }),
        })
    }

    /// The search problem.
    pub fn problem(&self) -> Result<Problem> {
        let t = self.rate_tolerance_s_per_day;
        if t >= Ratio::integer(MAX_RATE_TOLERANCE_S_PER_DAY) {
            return Err(Error::value(
                Quantity::RateTolerance,
                format!(
                    "wanted seconds per day from 0 up to below {MAX_RATE_TOLERANCE_S_PER_DAY}, found {t}"
                ),
            ));
        }
        let (ratio, _) = self.needed_ratio();
        let tolerance = Exact::of(t).over(Exact::of(Ratio::integer(SECONDS_PER_DAY as u64))).value;
        let target = Target::exact(ratio.to_string(), ratio, tolerance);
        let limits = StageLimits {
            driver_teeth: Some(self.wheels),
            driven_teeth: Some(self.pinions),
            ..StageLimits::default()
        };
        let p = clock_problem(target, self.pool.clone(), self.stages, limits, self.limit)?;
        match self.meshes {
            None => Ok(p),
            Some(m) => p.with_mesh_rules(m.rules()),
        }
    }

    /// Search.
    pub fn plan(&self, options: &RunOptions) -> Result<GoingPlan> {
        if self.from_turns_per_hour > Ratio::integer(1) {
            return Err(Error::value(
                Quantity::InputTurnsPerHour,
                format!(
                    "a going train starts from the centre arbor (1 turn an hour) or a slower one (the \
                     great wheel or barrel), found {} turns an hour",
                    self.from_turns_per_hour
                ),
            ));
        }
        let problem = self.problem()?;
        let found: Outcome = search(&problem, crate::trades::ENGINE, options);
        let escape = self.escapement.turns_per_hour(&self.beat);
        let great = match self.great_part() {
            Some(part) => Some(part.plan(&self.pool, self.meshes, self.limit, options)?),
            None => None,
        };
        let cycloidal = self.meshes.is_some_and(|m| m.tooth_form == ToothForm::Cycloidal);
        let exact = self.needed_ratio().1;
        let going = |train: Train, arrangements: u64, others: Vec<GoingTrain>| -> Result<GoingTrain> {
            let mut speeds = arbor_speeds(&train, 1.0);
            // The escape arbor's speed is the pendulum's; the centre arbor's follows.
            let scale = escape / speeds[speeds.len() - 1];
            speeds.iter_mut().for_each(|s| *s *= scale);
            Ok(GoingTrain {
                seconds_arbor: seconds_arbor(&train, exact),
                rate_s_per_day: train.error.to_f64() * SECONDS_PER_DAY,
                arbor_turns_per_hour: speeds,
                cycloidal: if cycloidal { super::cycloidal_pairs(&train)? } else { Vec::new() },
                train,
                arrangements,
                others,
            })
        };
        let trains = found
            .trains
            .into_iter()
            .enumerate()
            .map(|(n, train)| {
                let set = found.arrangements.get(n);
                let others = set
                    .map_or(&[][..], |a| &a.others[..])
                    .iter()
                    .map(|t| going(t.clone(), set.map_or(1, |a| a.count), Vec::new()))
                    .collect::<Result<Vec<_>>>()?;
                going(train, set.map_or(1, |a| a.count), others)
            })
            .collect::<Result<Vec<_>>>()?;
        Ok(GoingPlan {
            spec: self.clone(),
            problem,
            escape_turns_per_hour: escape,
            great,
            run: self.run_figures(),
            count: found.count,
            gear_set_count: found.gear_set_count,
            complete: found.complete,
            trains,
        })
    }
}

/// The arbor of a centre-to-escape `train` that turns exactly once a minute (60 turns an hour,
/// the centre arbor turning once an hour), when the train's ratio is exact: its index from the
/// centre arbor.
pub fn seconds_arbor(train: &Train, exact: bool) -> Option<usize> {
    if !(exact && train.error.is_exact()) {
        return None;
    }
    // Turns per hour of arbor k: the product of wheels over pinions of the stages before it.
    let (mut num, mut den) = (1u128, 1u128);
    for (k, s) in train.stages.iter().enumerate() {
        num *= s.driver.teeth as u128;
        den *= s.driven.teeth as u128;
        if num == 60 * den {
            return Some(k + 1);
        }
    }
    None
}
