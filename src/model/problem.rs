//! A search problem, valid by construction: the target, the gear pool, how many stages, the
//! per-stage limits, the required direction, how to rank and how many to list. The command line
//! builds one of these; the engines only read it.

use std::fmt;
use std::sync::Arc;

use crate::error::{Error, Quantity, Result};
use crate::geometry::{CycloidalLimits, MeshLimits, RackProfile};
use crate::model::pool::{Pool, MAX_STAGES};
use crate::model::purchase::Purchase;
use crate::model::rank::RankKey;
use crate::model::train::{Direction, Stage, Train};
use crate::numbers::range::{FloatRange, IntRange, RatioRange};
use crate::numbers::target::Target;

/// A train-level requirement beyond the ratio and the per-stage limits (a lathe's banjo
/// geometry, a coaxial clock train…). Called only for trains already within tolerance and
/// stock; `true` keeps the train. Must be a pure function of the train so results stay
/// deterministic.
#[derive(Clone)]
pub struct TrainCheck(pub Arc<dyn Fn(&Train) -> bool + Send + Sync>);

impl TrainCheck {
    /// Wrap a predicate.
    pub fn new(f: impl Fn(&Train) -> bool + Send + Sync + 'static) -> TrainCheck {
        TrainCheck(Arc::new(f))
    }
}

/// A per-stage requirement beyond the [`StageLimits`] (a reducer's housing: the stage must
/// mesh in some place of its module). Called once per allowed pairing while the stage table is
/// built, with the stage as the search would list it (its worked-out mesh when meshes are
/// checked); `false` leaves the pairing out of every train. Must be a pure function of the
/// stage.
#[derive(Clone)]
pub struct StageCheck {
    /// The kind of rejection a pairing it leaves out counts as (e.g. `FitsNoPlace`).
    pub kind: &'static str,
    /// The predicate.
    pub check: Arc<dyn Fn(&Stage) -> bool + Send + Sync>,
}

impl StageCheck {
    /// Wrap a predicate whose refusals count as rejections of kind `kind`.
    pub fn new(kind: &'static str, f: impl Fn(&Stage) -> bool + Send + Sync + 'static) -> StageCheck {
        StageCheck { kind, check: Arc::new(f) }
    }
}

impl fmt::Debug for StageCheck {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "StageCheck({})", self.kind)
    }
}

impl PartialEq for StageCheck {
    fn eq(&self, other: &Self) -> bool {
        self.kind == other.kind && Arc::ptr_eq(&self.check, &other.check)
    }
}

/// A trade workflow's own ranking key (smaller is better), used where the problem's rank list
/// names [`crate::model::rank::RankKey::Extra`]. Called for trains already within tolerance; must be a
/// pure function of the train.
#[derive(Clone)]
pub struct ExtraKey {
    /// The key's name in reports (e.g. `balance`).
    pub name: &'static str,
    /// The key's value for a train.
    pub key: Arc<dyn Fn(&Train) -> f64 + Send + Sync>,
}

impl ExtraKey {
    /// Wrap a key function.
    pub fn new(name: &'static str, f: impl Fn(&Train) -> f64 + Send + Sync + 'static) -> ExtraKey {
        ExtraKey { name, key: Arc::new(f) }
    }
}

impl fmt::Debug for ExtraKey {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "ExtraKey({})", self.name)
    }
}

impl PartialEq for ExtraKey {
    fn eq(&self, other: &Self) -> bool {
        self.name == other.name && Arc::ptr_eq(&self.key, &other.key)
    }
}

impl fmt::Debug for TrainCheck {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str("TrainCheck(..)")
    }
}

impl PartialEq for TrainCheck {
    fn eq(&self, other: &Self) -> bool {
        Arc::ptr_eq(&self.0, &other.0)
    }
}

/// Limits every stage must meet.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct StageLimits {
    /// Allowed driver tooth counts (e.g. clock pinions of 6..12 leaves).
    pub driver_teeth: Option<IntRange>,
    /// Allowed driven tooth counts.
    pub driven_teeth: Option<IntRange>,
    /// Allowed stage ratio, driven / driver.
    pub stage_ratio: Option<RatioRange>,
    /// Allowed standard centre distance of each stage, mm.
    pub centre_distance_mm: Option<FloatRange>,
}

/// Default allowed profile shift sum `x1 + x2` per stage, in modules: a conservative range
/// that keeps working pressure angles near the rack's and tips from running thin.
pub const DEFAULT_SHIFT_SUM: (f64, f64) = (-0.5, 1.0);

/// Default tolerance on a fixed centre distance, mm: a stage whose standard centre distance is
/// this close needs no profile shift.
pub const DEFAULT_CENTRE_TOLERANCE_MM: f64 = 0.01;

pub use crate::geometry::ToothForm;

/// Mesh geometry rules. When a problem has them, every stage is worked out in its tooth form
/// (an involute mesh with profile shifts split by the geometry module's rule, or a cycloidal
/// pair) and kept only if it runs.
#[derive(Debug, Clone, PartialEq)]
pub struct MeshRules {
    /// The tooth form of every stage. A cycloidal stage takes no shift: the rack, shift-sum
    /// range and the tip-thickness and undercut limits do not apply to it, and a coaxial train
    /// is left to the trade (a module per pair, as clockmakers do).
    pub tooth_form: ToothForm,
    /// What a cycloidal mesh must meet besides the least contact ratio in `limits`.
    pub cycloidal: CycloidalLimits,
    /// Basic rack both gears of every stage are cut with.
    pub rack: RackProfile,
    /// What a mesh must meet (contact ratio, tip thickness, undercut).
    pub limits: MeshLimits,
    /// Allowed profile shift sum `x1 + x2` per stage, in modules, `lo ≤ hi`.
    pub shift_sum: (f64, f64),
    /// Fixed working centre distance of every stage, mm, reached by profile shift.
    pub centre_distance_mm: Option<f64>,
    /// A stage whose standard centre distance is within this of the fixed one is left unshifted
    /// (apart from the undercut split), mm.
    pub centre_tolerance_mm: f64,
    /// Input and output shafts on one axis: every stage at one working centre distance (a
    /// reverted train), so only even stage counts qualify.
    pub coaxial: bool,
}

impl Default for MeshRules {
    fn default() -> Self {
        MeshRules {
            tooth_form: ToothForm::Involute,
            cycloidal: CycloidalLimits::default(),
            rack: RackProfile::default(),
            limits: MeshLimits::default(),
            shift_sum: DEFAULT_SHIFT_SUM,
            centre_distance_mm: None,
            centre_tolerance_mm: DEFAULT_CENTRE_TOLERANCE_MM,
            coaxial: false,
        }
    }
}

/// A validated search problem.
#[derive(Debug, Clone, PartialEq)]
pub struct Problem {
    /// What ratio, how close.
    pub target: Target,
    /// Which gears.
    pub pool: Pool,
    /// Stage counts allowed, inclusive, within `1..=MAX_STAGES`.
    pub stages: IntRange,
    /// Per-stage limits.
    pub limits: StageLimits,
    /// Required output direction, if any.
    pub direction: Option<Direction>,
    /// Ranking keys, most important first; never empty.
    pub rank: Vec<RankKey>,
    /// How many trains to list (all are counted).
    pub limit: usize,
    /// Extra train-level requirement, if any (set after [`Problem::new`]).
    pub train_check: Option<TrainCheck>,
    /// Extra per-stage requirements, each judged once per stage while the stage table is built
    /// (set after [`Problem::new`]).
    pub stage_checks: Vec<StageCheck>,
    /// Mesh geometry rules, if meshes are to be worked out and checked (set with
    /// [`Problem::with_mesh_rules`]).
    pub mesh: Option<MeshRules>,
    /// List the Pareto front on (|error|, meshes, size) instead of the best `limit`.
    pub pareto: bool,
    /// The extra ranking key, needed when `rank` names [`RankKey::Extra`].
    pub extra_key: Option<ExtraKey>,
    /// Whether a stage may pair gears of equal teeth (ratio 1). Off by default: in a train of
    /// its own such a stage changes nothing; a trade turns it on where an idler or a compound
    /// stud makes it meaningful (set after [`Problem::new`]).
    pub equal_teeth_stages: bool,
    /// The form the trade cuts its teeth to, by which gears on hand are judged on every listing
    /// when meshes are not checked (mesh rules carry their own form). Involute unless a trade
    /// says otherwise (clocks: cycloidal).
    pub tooth_form: ToothForm,
    /// List gear sets rather than trains: one entry per gear set (its best arrangement by the
    /// ranking), with the number of gear sets counted beside the number of trains. Off by
    /// default (set after [`Problem::new`]).
    pub gear_sets: bool,
    /// Gears that may be bought beyond those on hand (set with [`Problem::with_purchase`]):
    /// the pool then holds them too, and every train's gears to buy are counted.
    pub buy: Option<Purchase>,
    /// Whether every train must be counted, or only the listing must be the proven best (set
    /// with [`Problem::with_count`]).
    pub count: CountMode,
}

/// How a search counts the trains that satisfy a problem.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum CountMode {
    /// Every train (and gear set) is counted exactly.
    #[default]
    Exact,
    /// The listing is the proven best, but only the trains met on the way to it need be
    /// counted: where an engine can list the best without meeting every train (near targets
    /// over four to six stages), the count is a lower bound, and the outcome says so. Needs a
    /// ranking led by the error, a limit, and no Pareto front.
    LowerBound,
}

impl Problem {
    /// Check the parts against each other.
    pub fn new(
        target: Target,
        pool: Pool,
        stages: IntRange,
        limits: StageLimits,
        direction: Option<Direction>,
        rank: Vec<RankKey>,
        limit: usize,
    ) -> Result<Problem> {
        if stages.lo < 1 || stages.hi as usize > MAX_STAGES {
            return Err(Error::value(
                Quantity::StageCount,
                format!("stages must lie within 1..{MAX_STAGES}"),
            ));
        }
        if rank.is_empty() {
            return Err(Error::value(
                Quantity::RankKeys,
                "give at least one key of error, meshes, size, span",
            ));
        }
        let p = Problem {
            target,
            pool,
            stages,
            limits,
            direction,
            rank,
            limit,
            train_check: None,
            stage_checks: Vec::new(),
            mesh: None,
            pareto: false,
            extra_key: None,
            equal_teeth_stages: false,
            tooth_form: ToothForm::Involute,
            gear_sets: false,
            buy: None,
            count: CountMode::Exact,
        };
        if p.stage_counts().is_empty() {
            return Err(Error::value(
                Quantity::Direction,
                format!(
                    "no stage count in {} turns the output the {} way: each external mesh reverses it, so \
                     same needs an even number of stages and opposite an odd number",
                    p.stages,
                    direction.map_or("", |d| d.as_str())
                ),
            ));
        }
        Ok(p)
    }

    /// Set how trains are counted; a lower-bound count needs a listing ranked by error first,
    /// with a limit and without a Pareto front (errors name [`Quantity::CountMode`]).
    pub fn with_count(mut self, mode: CountMode) -> Result<Problem> {
        if mode == CountMode::LowerBound {
            let why = if self.pareto {
                Some("a Pareto front is not a best K: it needs every train")
            } else if self.limit == 0 {
                Some("a listing of every train needs every train counted")
            } else if self.rank.first() != Some(&RankKey::Error) {
                Some("the ranking must be led by the error (the window narrows on it)")
            } else {
                None
            };
            if let Some(why) = why {
                return Err(Error::value(
                    Quantity::CountMode,
                    format!("a lower-bound count cannot serve here: {why}"),
                ));
            }
        }
        self.count = mode;
        Ok(self)
    }

    /// The stage counts searched, ascending, after the direction and coaxial requirements.
    pub fn stage_counts(&self) -> Vec<usize> {
        let coaxial = self.mesh.as_ref().is_some_and(|m| m.coaxial);
        (self.stages.lo as usize..=self.stages.hi as usize)
            .filter(|&n| self.direction.is_none_or(|d| Direction::after_meshes(n) == d))
            .filter(|&n| !coaxial || n % 2 == 0)
            .collect()
    }

    /// Add mesh geometry rules, checking them against the rest of the problem.
    pub fn with_mesh_rules(mut self, rules: MeshRules) -> Result<Problem> {
        let (lo, hi) = rules.shift_sum;
        if !(lo.is_finite() && hi.is_finite() && lo <= hi) {
            return Err(Error::value(
                Quantity::ShiftSum,
                "wanted LO..HI in modules with LO ≤ HI, e.g. -0.5..1",
            ));
        }
        if let Some(a) = rules.centre_distance_mm {
            if !(a.is_finite() && a > 0.0) {
                return Err(Error::value(
                    Quantity::CentreDistance,
                    format!("wanted a positive distance in mm, found {a}"),
                ));
            }
        }
        if !(rules.centre_tolerance_mm.is_finite() && rules.centre_tolerance_mm >= 0.0) {
            return Err(Error::value(Quantity::CentreTolerance, "wanted a distance of 0 mm or more"));
        }
        check_min_contact_ratio(rules.limits.min_contact_ratio)?;
        self.mesh = Some(rules);
        if self.stage_counts().is_empty() {
            return Err(Error::value(
                Quantity::Coaxial,
                format!(
                    "a coaxial (reverted) train needs an even number of stages; none in {} qualifies",
                    self.stages
                ),
            ));
        }
        Ok(self)
    }
}

impl Problem {
    /// Let trains use gears bought as well as those on hand: the pool becomes the purchase's
    /// ([`Purchase::pool`]), a train is kept only if it needs at most [`Purchase::most`] gears
    /// bought (besides any train check already set), and trains rank first by how many gears
    /// they need bought (the extra key `to_buy`), then by the ranking already set. The pool must
    /// be the purchase's gears on hand; the problem must not have an extra key of its own.
    pub fn with_purchase(mut self, purchase: Purchase) -> Result<Problem> {
        if self.pool != purchase.on_hand {
            return Err(Error::problem("gears to buy must be added to the gears the search draws from"));
        }
        if self.extra_key.is_some() || self.rank.contains(&RankKey::Extra) {
            return Err(Error::problem(
                "a search with its own extra ranking key cannot also count gears to buy",
            ));
        }
        self.pool = purchase.pool()?;
        let own = self.train_check.take();
        let most = purchase.most;
        let counted = Arc::new(purchase.clone());
        let check = Arc::clone(&counted);
        self.train_check = Some(TrainCheck::new(move |t: &Train| {
            check.count(t) <= most && own.as_ref().is_none_or(|c| (c.0)(t))
        }));
        self.extra_key = Some(ExtraKey::new(TO_BUY_KEY, move |t: &Train| f64::from(counted.count(t))));
        self.rank.insert(0, RankKey::Extra);
        self.buy = Some(purchase);
        Ok(self)
    }
}

/// The name of the extra ranking key of a search with gears to buy: the number of gears a train
/// needs bought.
pub const TO_BUY_KEY: &str = "to_buy";

/// Check a least transverse contact ratio, the same wherever one is asked for (a search's mesh
/// checks, a mesh check, a motion work). Errors name [`Quantity::ContactRatio`].
pub fn check_min_contact_ratio(ratio: f64) -> Result<f64> {
    if ratio.is_finite() && ratio >= 0.0 {
        Ok(ratio)
    } else {
        Err(Error::value(
            Quantity::ContactRatio,
            format!("wanted a number of 0 or more such as 1.2, found {ratio}"),
        ))
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::model::rank::DEFAULT_RANK;

    fn problem(stages: IntRange, direction: Option<Direction>) -> Result<Problem> {
        let target = Target::parse("2", "0")?;
        let pool = Pool::to_cut(IntRange { lo: 12, hi: 40 }, 1.0, 20.0, None)?;
        Problem::new(target, pool, stages, StageLimits::default(), direction, DEFAULT_RANK.to_vec(), 5)
    }

    #[test]
    fn errors_name_the_quantity_not_a_flag() {
        let e = problem(IntRange { lo: 1, hi: 9 }, None).unwrap_err().to_string();
        assert_eq!(e, "the stage count: stages must lie within 1..6");
        let e = problem(IntRange { lo: 1, hi: 1 }, Some(Direction::Same)).unwrap_err().to_string();
        assert!(
            e.starts_with("the output direction: no stage count in 1 turns the output the same way"),
            "{e}"
        );
        let one_stage = problem(IntRange { lo: 1, hi: 1 }, None).unwrap();
        let e = one_stage
            .with_mesh_rules(MeshRules { coaxial: true, ..MeshRules::default() })
            .unwrap_err()
            .to_string();
        assert!(
            e.starts_with("the coaxial arrangement: a coaxial (reverted) train needs an even number"),
            "{e}"
        );
    }
}
