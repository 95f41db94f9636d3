//! The motion work and other hand trains: the reverted 12:1 train from the cannon pinion to the
//! hour wheel, whose pipe turns on the cannon pinion's (so both stages share one centre
//! distance, reached by profile shift where needed), and any other hand ratio — a 24-hour hand,
//! a day-of-week hand — coaxial or not.
//!
//! Pinions drive wheels here (a reduction, `i > 1`). Teeth are cycloidal by default, as clock
//! wheels are cut: each pair at its own standard centre distance, a coaxial train met by a
//! module per pair (the first pair keeps the module asked, the others take the module that
//! puts them at its centre distance), and with gears on hand by pairs whose standard centre
//! distances agree. With involute teeth the stages are shifted to one centre distance instead,
//! and small pinions, often undercut, are accepted unless asked otherwise (common practice).

use super::{clock_problem, Arrangement};
use crate::engine::{search, RunOptions};
use crate::error::{Error, Quantity, Result};
use crate::geometry::{CycloidalMesh, MeshLimits};
use crate::model::pool::Pool;
use crate::model::problem::{
    MeshRules, Problem, StageLimits, ToothForm, TrainCheck, DEFAULT_CENTRE_TOLERANCE_MM,
};
use crate::model::train::Train;
use crate::numbers::range::IntRange;
use crate::numbers::rational::Ratio;
use crate::numbers::target::Target;

/// Default pinion leaves of the motion work (common practice, settable).
pub const DEFAULT_PINIONS: IntRange = IntRange { lo: 6, hi: 20 };
/// Default wheel teeth of the motion work (common practice, settable).
pub const DEFAULT_WHEELS: IntRange = IntRange { lo: 20, hi: 96 };

/// A named hand ratio.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Dial {
    /// The hour hand: 12 turns of the minute (cannon) arbor per turn (Wikipedia, "Wheel train").
    Hour,
    /// A 24-hour hand: 24 turns of the minute arbor per turn.
    TwentyFourHour,
    /// A day-of-week hand from an arbor that turns once a day: 7 turns per turn.
    Week,
}

impl Dial {
    /// Parse `hour`, `24h` or `week`; errors name [`Quantity::Dial`].
    pub fn parse(text: &str) -> Result<Dial> {
        match text.trim() {
            "hour" | "12h" => Ok(Dial::Hour),
            "24h" => Ok(Dial::TwentyFourHour),
            "week" => Ok(Dial::Week),
            other => Err(Error::value(Quantity::Dial, format!("unknown dial \"{other}\"; wanted hour (12:1), 24h (24:1) or week (7:1 from a daily arbor)"))),
        }
    }

    /// Input turns per hand turn.
    pub fn ratio(self) -> Ratio {
        Ratio::integer(match self {
            Dial::Hour => 12,
            Dial::TwentyFourHour => 24,
            Dial::Week => 7,
        })
    }

    /// What the input arbor is, in words.
    pub fn input(self) -> &'static str {
        match self {
            Dial::Hour | Dial::TwentyFourHour => "minute (cannon) arbor, once an hour",
            Dial::Week => "an arbor turning once a day",
        }
    }
}

/// What the clockmaker asks for.
#[derive(Debug, Clone, PartialEq)]
pub struct MotionSpec {
    /// Input turns per hand turn, e.g. 12.
    pub ratio: Ratio,
    /// The ratio as given (`12`, `hour`).
    pub ratio_text: String,
    /// Relative tolerance on the ratio (0 for exact, as hands must be).
    pub tolerance: Ratio,
    /// Wheels to be cut or on hand.
    pub pool: Pool,
    /// Pinion leaves allowed (the drivers).
    pub pinions: IntRange,
    /// Wheel teeth allowed (the driven).
    pub wheels: IntRange,
    /// Stage counts.
    pub stages: IntRange,
    /// Hand arbor coaxial with the input arbor (a reverted train).
    pub coaxial: bool,
    /// The tooth form of every pair.
    pub tooth_form: ToothForm,
    /// Accept undercut pinions (involute teeth).
    pub allow_undercut: bool,
    /// Least contact ratio of a mesh (transverse, for involute teeth; leaves in action, for
    /// cycloidal teeth).
    pub min_contact_ratio: f64,
    /// Gear sets to list, each by its first arrangement.
    pub limit: usize,
}

/// The result of a motion-work search.
#[derive(Debug, Clone, PartialEq)]
pub struct MotionPlan {
    /// What was asked.
    pub spec: MotionSpec,
    /// The problem searched.
    pub problem: Problem,
    /// Trains meeting every constraint.
    pub count: u64,
    /// The gear sets those trains are made of; `None` when they were not counted.
    pub gear_set_count: Option<u64>,
    /// False when interrupted.
    pub complete: bool,
    /// The best gear sets, each by its first arrangement in stage order, stages from the input
    /// arbor to the hand; with meshes worked out (an involute stage's in its `mesh`), each
    /// stage at the module it is cut to.
    pub trains: Vec<Train>,
    /// Each listed set's number of arrangements (its listed train among them); a coaxial
    /// motion work counts only the coaxial ones.
    pub arrangements: Vec<u64>,
    /// Each listed set's other arrangements, in stage order, when every arrangement was asked
    /// for; else empty lists.
    pub others: Vec<Vec<Arrangement>>,
    /// Each train's cycloidal pairs, stage by stage (empty for involute teeth).
    pub cycloidal: Vec<Vec<CycloidalMesh>>,
}

impl MotionSpec {
    /// The search problem, with mesh rules for the coaxial fit.
    pub fn problem(&self) -> Result<Problem> {
        let target = Target::exact(self.ratio_text.clone(), self.ratio, self.tolerance);
        let limits = StageLimits {
            driver_teeth: Some(self.pinions),
            driven_teeth: Some(self.wheels),
            ..StageLimits::default()
        };
        let mut p = clock_problem(target, self.pool.clone(), self.stages, limits, self.limit)?;
        if self.coaxial && self.tooth_form == ToothForm::Cycloidal && self.pool.from_stock {
            // Gears on hand are cut to their module: the pairs must already agree.
            p.train_check = Some(TrainCheck::new(|t: &Train| {
                let first = t.stages.first().map_or(0.0, |s| s.centre_distance_mm());
                t.stages.iter().all(|s| (s.centre_distance_mm() - first).abs() <= DEFAULT_CENTRE_TOLERANCE_MM)
            }));
        }
        let rules = MeshRules {
            tooth_form: self.tooth_form,
            coaxial: self.coaxial,
            limits: MeshLimits {
                allow_undercut: self.allow_undercut,
                min_contact_ratio: self.min_contact_ratio,
                ..MeshLimits::default()
            },
            ..MeshRules::default()
        };
        p.with_mesh_rules(rules)
    }

    /// Search.
    pub fn plan(&self, options: &RunOptions) -> Result<MotionPlan> {
        let problem = self.problem()?;
        let found = search(&problem, crate::trades::ENGINE, options);
        let cycloidal = self.tooth_form == ToothForm::Cycloidal;
        let arranged = |mut train: Train| -> Result<Arrangement> {
            let mut pairs = Vec::new();
            if cycloidal {
                if self.coaxial && !self.pool.from_stock {
                    module_per_pair(&mut train);
                }
                pairs = super::cycloidal_pairs(&train)?;
            }
            Ok(Arrangement { train, cycloidal: pairs })
        };
        let listed = found.trains.into_iter().map(arranged).collect::<Result<Vec<_>>>()?;
        let others = found
            .arrangements
            .iter()
            .map(|a| a.others.iter().cloned().map(arranged).collect::<Result<Vec<_>>>())
            .collect::<Result<Vec<_>>>()?;
        let (trains, pairs): (Vec<Train>, Vec<Vec<CycloidalMesh>>) =
            listed.into_iter().map(|a| (a.train, a.cycloidal)).unzip();
        Ok(MotionPlan {
            spec: self.clone(),
            problem,
            count: found.count,
            gear_set_count: found.gear_set_count,
            complete: found.complete,
            trains,
            arrangements: found.arrangements.iter().map(|a| a.count).collect(),
            others,
            cycloidal: if cycloidal { pairs } else { Vec::new() },
        })
    }
}

/// Give every stage after the first the module that puts it at the first stage's standard
/// centre distance: m_k = m_1·(z_1 + z_2)/(z_k + z_k').
pub fn module_per_pair(train: &mut Train) {
    let Some(first) = train.stages.first() else { return };
    let (m, teeth) = (first.module_mm, first.driver.teeth + first.driven.teeth);
    for s in train.stages.iter_mut().skip(1) {
        s.module_mm = m * teeth as f64 / (s.driver.teeth + s.driven.teeth) as f64;
        s.diametral_pitch = None;
    }
}

impl MotionPlan {
    /// The number of arrangements of listed set `k`.
    pub fn arrangements_of(&self, k: usize) -> u64 {
        self.arrangements.get(k).copied().unwrap_or(1)
    }

    /// The other arrangements of listed set `k`, empty when they were not asked for.
    pub fn others_of(&self, k: usize) -> &[Arrangement] {
        self.others.get(k).map_or(&[][..], |v| &v[..])
    }

    /// True for the usual motion work: a coaxial two-stage 12:1 train.
    pub fn is_hour_motion_work(&self, train: &Train) -> bool {
        self.spec.coaxial && self.spec.ratio == Ratio::integer(12) && train.stages.len() == 2
    }
}

/// The clockmaker's names of the gears of stage `k` (0-based) of a train: in the usual motion
/// work (`hour_work`) the cannon pinion drives the minute wheel and the minute pinion drives the
/// hour wheel; otherwise pinion k drives wheel k.
pub fn stage_names(k: usize, hour_work: bool) -> (String, String) {
    match (k, hour_work) {
        (0, true) => ("cannon pinion".into(), "minute wheel".into()),
        (1, true) => ("minute pinion".into(), "hour wheel".into()),
        _ => ("pinion".into(), "wheel".into()),
    }
}
