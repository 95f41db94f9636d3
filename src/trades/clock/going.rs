//! The going train: from the arbor that turns once an hour (or any arbor speed given) to the
//! escape arbor, wheels driving pinions. Works out the ratio the beat needs, searches it, and
//! gives each train's arbor speeds and rate error in seconds per day.

use super::beat::{Beat, Escapement};
use super::{approx_ratio, arbor_speeds, clock_problem, SECONDS_PER_DAY};
use crate::engine::{search, Outcome, RunOptions};
use crate::error::{Error, Quantity, Result};
use crate::geometry::{CycloidalMesh, MeshLimits};
use crate::model::pool::Pool;
use crate::model::problem::{MeshRules, Problem, StageLimits, ToothForm};
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
    /// Turns per hour of the arbor the train starts from (1 for the centre arbor).
    pub from_turns_per_hour: Ratio,
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
    pub meshes: Option<GoingMeshes>,
    /// Trains to list.
    pub limit: usize,
}

/// How the meshes of a going train are checked: each wheel and pinion at its own standard
/// centre distance.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct GoingMeshes {
    /// The tooth form.
    pub tooth_form: ToothForm,
    /// Least contact ratio of a mesh.
    pub min_contact_ratio: f64,
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
    /// The cycloidal pair of every stage, when the meshes were checked in that form.
    pub cycloidal: Vec<CycloidalMesh>,
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
    /// Trains meeting every constraint.
    pub count: u64,
    /// False when interrupted.
    pub complete: bool,
    /// The best trains.
    pub trains: Vec<GoingTrain>,
}

impl GoingSpec {
    /// The ratio the beat needs from the driving arbor to the escape arbor (input turns per
    /// output turn: driving arbor speed / escape arbor speed), and whether it is exact.
    pub fn needed_ratio(&self) -> (Ratio, bool) {
        match self.escapement.exact_turns_per_hour(&self.beat) {
            Some(escape) => {
                let r = Exact::of(self.from_turns_per_hour).over(Exact::of(escape));
                (r.value, r.exact)
            }
            None => {
                let escape = self.escapement.turns_per_hour(&self.beat);
                (approx_ratio(self.from_turns_per_hour.to_f64() / escape), false)
            }
        }
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
            Some(m) => p.with_mesh_rules(MeshRules {
                tooth_form: m.tooth_form,
                limits: MeshLimits { min_contact_ratio: m.min_contact_ratio, ..MeshLimits::default() },
                ..MeshRules::default()
            }),
        }
    }

    /// Search.
    pub fn plan(&self, options: &RunOptions) -> Result<GoingPlan> {
        let problem = self.problem()?;
        let found: Outcome = search(&problem, crate::trades::ENGINE, options);
        let escape = self.escapement.turns_per_hour(&self.beat);
        let from = self.from_turns_per_hour.to_f64();
        let cycloidal = self.meshes.is_some_and(|m| m.tooth_form == ToothForm::Cycloidal);
        let trains = found
            .trains
            .into_iter()
            .map(|train| {
                let mut speeds = arbor_speeds(&train, from);
                // The escape arbor's speed is the pendulum's; the driving arbor's follows.
                let scale = escape / speeds[speeds.len() - 1];
                speeds.iter_mut().for_each(|s| *s *= scale);
                Ok(GoingTrain {
                    rate_s_per_day: train.error.to_f64() * SECONDS_PER_DAY,
                    arbor_turns_per_hour: speeds,
                    cycloidal: if cycloidal { super::cycloidal_pairs(&train)? } else { Vec::new() },
                    train,
                })
            })
            .collect::<Result<Vec<_>>>()?;
        Ok(GoingPlan {
            spec: self.clone(),
            problem,
            escape_turns_per_hour: escape,
            count: found.count,
            complete: found.complete,
            trains,
        })
    }
}
