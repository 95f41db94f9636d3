//! `gearsieve reducer`: a spur reducer from its ratio or speeds, stages, a module per stage,
//! least teeth, a per-stage ratio limit and optionally the housing's centre distances. The clap
//! struct mirrors the flags; `TryFrom` turns it into a [`ReducerSpec`].

use std::borrow::Cow;
use std::path::PathBuf;

use clap::{ArgGroup, Args, ValueEnum};
use gearsieve::model::catalog::CatalogueDefaults;
use gearsieve::model::pool::{MAX_STAGES, MAX_TEETH, MIN_TEETH};
use gearsieve::numbers::exact::Exact;
use gearsieve::numbers::length::{parse_length, LengthUnit};
use gearsieve::numbers::range::{parse_int_range, parse_signed_range, IntRange};
use gearsieve::numbers::target::{parse_ratio, parse_tolerance};
use gearsieve::report::Report;
use gearsieve::trades::reducer::{
    example_modules, Hunting, Priority, ReducerPlan, ReducerSpec, DEFAULT_MAX_STAGE_RATIO,
};
use gearsieve::{Error, Quantity, RunOptions};

use super::args::{load_stock, number, PrintArgs};
use super::flags::refuse;
use super::hints::{self, ExactBlocked, OutOfReach};
use super::mesh::{parse_backlash, parse_housing_tolerance};
use super::run::{self, Job, Outlook, Print, Words};
use gearsieve::geometry::layout::ShaftLayout;
use gearsieve::geometry::RackProfile;
use gearsieve::trades::reducer::shop::ShopRules;

/// The hunting-tooth flag.
#[derive(Clone, Copy, Debug, ValueEnum)]
pub enum HuntingArg {
    /// Rank trains with fewer non-hunting pairs first.
    Prefer,
    /// Only trains whose every pair has no common factor.
    Require,
    /// Do not consider it.
    Ignore,
}

/// The ranking flag.
#[derive(Clone, Copy, Debug, ValueEnum)]
pub enum PriorityArg {
    /// Hunting pairs, then stage balance in steps of 10 % (spreads within one step rank alike,
    /// so a negligible gain in balance never outranks a better ratio), then ratio error.
    Balance,
    /// Ratio error first.
    Error,
    /// Hunting pairs, then closeness to a rule of thumb for splitting the ratio (two stages:
    /// the output stage 0.88·√i, the input stage the rest; Dunaev and Lelikov, from memory;
    /// other counts: equal stages), in steps of 10 %, then ratio error.
    Split,
}

/// A spur reducer: trains for a ratio with a module per stage, balanced stages and hunting-tooth
/// pairs, profile shifts for a housing's fixed centre distances, and the envelope.
///
/// gearsieve sizes geometry only: a reducer that carries power needs a load-capacity rating
/// (e.g. ISO 6336 or AGMA 2001) and a check by a qualified person.
#[derive(Args, Debug)]
#[command(group(ArgGroup::new("want").required(true).args(["ratio", "output_rpm"])))]
pub struct ReducerArgs {
    /// Ratio, input turns per output turn (above 1): 20, 37.5:1, 127/6.
    #[arg(long, short, value_name = "R")]
    pub ratio: Option<String>,
    /// Output speed, rpm (with --input-rpm instead of --ratio).
    #[arg(long, value_name = "RPM", requires = "input_rpm")]
    pub output_rpm: Option<String>,
    /// Input (motor) speed, rpm: gives the output speed of each train.
    #[arg(long, value_name = "RPM")]
    pub input_rpm: Option<String>,
    /// Relative tolerance on the ratio: 1%, 0.5%, 0 (exact).
    #[arg(long, value_name = "T", default_value = "1%")]
    pub tol: String,
    /// Stages: N or A..B [default: as many as the modules or centre distances listed one per
    /// stage, else 2].
    #[arg(long, value_name = "N|A..B", allow_hyphen_values = true)]
    pub stages: Option<String>,
    /// Module per stage in mm, input to output, coarser toward the output (1,1.5,2), or one
    /// for every stage. Required unless --stock is given.
    #[arg(long, value_name = "MM,…", value_delimiter = ',', allow_negative_numbers = true, value_parser = number)]
    pub modules: Vec<f64>,
    /// Least teeth of any gear (17 avoids undercut at 20°, common practice).
    #[arg(long, value_name = "N", default_value_t = 17)]
    pub min_teeth: u32,
    /// Most teeth of any gear.
    #[arg(long, value_name = "N", default_value_t = 100)]
    pub max_teeth: u32,
    /// Largest ratio of one stage (about 6 for spur gears, common practice).
    #[arg(long, value_name = "R", default_value_t = DEFAULT_MAX_STAGE_RATIO.to_string())]
    pub max_stage_ratio: String,
    /// Smallest ratio of one stage: leaves out stages that hardly reduce (e.g. 2).
    #[arg(long, value_name = "R")]
    pub min_stage_ratio: Option<String>,
    /// The housing's fixed centre distance of each stage, mm, input to output (or one for all):
    /// reached by profile shift. Other units: 2.5in.
    #[arg(long, value_name = "MM,…", value_delimiter = ',', allow_hyphen_values = true)]
    pub centre_distances: Vec<String>,
    /// Allowed profile shift sum x1+x2 per stage, in modules [default: -0.5..1].
    #[arg(long, value_name = "LO..HI", allow_hyphen_values = true)]
    pub shift_sum: Option<String>,
    /// How far beyond their tight distance gears on hand (which are never re-cut) may stand to
    /// meet a fixed centre distance, mm: backlash opens and the working pressure angle rises as
    /// they move apart; also how close a standard centre distance must be to need no shift.
    #[arg(long, value_name = "MM", default_value_t = gearsieve::model::problem::DEFAULT_CENTRE_TOLERANCE_MM, allow_negative_numbers = true, value_parser = number)]
    pub centre_tol: f64,
    /// Hunting-tooth pairs (no common factor between mating teeth, for even wear).
    #[arg(long, value_enum, default_value = "prefer")]
    pub hunting: HuntingArg,
    /// What ranks first.
    #[arg(long, value_enum, default_value = "balance")]
    pub prefer: PriorityArg,
    /// Gears on the shelf, from a CSV catalogue (repeatable), instead of cutting.
    #[arg(long, value_name = "FILE")]
    pub stock: Vec<PathBuf>,
    /// Normal backlash each stage is to have, mm: LO..HI over the whole housing tolerance; each
    /// gear's tooth-thickness allowances follow [default: the recommended least backlash
    /// (2/3)(0.06 + 0.0005·a + 0.03·m) of ISO/TR 10064-2 for each stage, up to twice that plus
    /// what the housing tolerance opens].
    #[arg(long, value_name = "LO..HI", allow_hyphen_values = true)]
    pub backlash: Option<String>,
    /// How far the housing may put each pair of centres from its working distance, either
    /// way, mm [default: 0].
    #[arg(long, value_name = "MM", allow_hyphen_values = true)]
    pub housing_tol: Option<String>,
    /// Shaft diameter, mm: keep only trains whose every gear's tip circle clears every shaft
    /// it does not sit on by --shaft-margin.
    #[arg(long, value_name = "MM")]
    pub shaft_diameter: Option<String>,
    /// Least gap between a gear's tip circle and another shaft, mm (with --shaft-diameter).
    #[arg(long, value_name = "MM", default_value = "2", requires = "shaft_diameter")]
    pub shaft_margin: String,
    /// Fold the train: turn each stage's line of centres this many degrees from the one before
    /// (0: all shafts in line; 180 brings a two-stage train's output back onto the input axis).
    #[arg(long, value_name = "DEG", default_value_t = 0.0, allow_negative_numbers = true, value_parser = number)]
    pub fold: f64,
    /// Trains to list; all are counted.
    #[arg(long, value_name = "K", default_value_t = 5)]
    pub limit: usize,
    /// List every arrangement of each gear set under it (the other ways of pairing its pinions
    /// with its gears into stages that meet every constraint), not only the best.
    #[arg(long)]
    pub arrangements: bool,
    /// Run even when the search is forecast to take more than an hour.
    #[arg(long)]
    pub long: bool,
    #[command(flatten)]
    pub print: PrintArgs,
}

/// The stage count: as given, or one per value of a list given per stage, else 2.
fn stage_count(a: &ReducerArgs) -> Result<IntRange, Error> {
    let per_stage = a.modules.len().max(a.centre_distances.len());
    let default = if per_stage > 1 { per_stage.to_string() } else { "2".to_string() };
    parse_int_range(
        a.stages.as_deref().unwrap_or(&default),
        Quantity::StageCount,
        "stages",
        1,
        MAX_STAGES as u32,
    )
}

impl TryFrom<&ReducerArgs> for ReducerSpec {
    type Error = anyhow::Error;

    fn try_from(a: &ReducerArgs) -> anyhow::Result<ReducerSpec> {
        let input_rpm = a.input_rpm.as_deref().map(|s| parse_ratio(s, Quantity::InputSpeed)).transpose()?;
        let (ratio, ratio_text) = match (&a.ratio, &a.output_rpm, input_rpm) {
            (Some(r), _, _) => (parse_ratio(r, Quantity::TargetRatio)?, r.trim().to_string()),
            (None, Some(out), Some(inp)) => {
                let out = parse_ratio(out, Quantity::OutputSpeed)?;
                let r = Exact::of(inp).over(Exact::of(out));
                (r.value, format!("{inp} rpm in / {out} rpm out"))
            }
            _ => return Err(anyhow::anyhow!("give --ratio R, or --input-rpm and --output-rpm")),
        };
        if a.min_teeth > a.max_teeth {
            return Err(refuse(
                "--min-teeth",
                format!("{} is above --max-teeth {}", a.min_teeth, a.max_teeth),
            ));
        }
        let teeth = parse_int_range(
            &format!("{}..{}", a.min_teeth, a.max_teeth),
            Quantity::ToothLimits,
            "teeth",
            MIN_TEETH,
            MAX_TEETH,
        )?;
        let stages = stage_count(a)?;
        if a.stock.is_empty() && a.modules.is_empty() {
            // Built from the stage count asked for, so that following it works.
            let how = match example_modules(stages) {
                Some(list) => format!(
                    "the module in mm of each stage, input to output, such as {list} for --stages {stages} (or \
                     1 for every stage)"
                ),
                None => format!("one module in mm for every stage of --stages {stages}, such as 1"),
            };
            return Err(refuse("--modules", format!("give {how}; or gears on hand with --stock FILE")));
        }
        let centre_distances_mm = a
            .centre_distances
            .iter()
            .map(|d| {
                parse_length(d, Quantity::StageCentreDistances, Some(LengthUnit::Millimetre))
                    .map(|l| l.mm_f64())
            })
            .collect::<Result<Vec<f64>, Error>>()?;
        let stock = if a.stock.is_empty() {
            None
        } else {
            Some(load_stock(
                &a.stock,
                CatalogueDefaults { module_mm: a.modules.first().copied(), pressure_angle_deg: 20.0 },
                Quantity::StageModules,
            )?)
        };
        let length = |text: &str, q| -> anyhow::Result<f64> {
            Ok(parse_length(text, q, Some(LengthUnit::Millimetre))?.mm_f64())
        };
        let shaft_margin_mm = match a.shaft_margin.trim() {
            t if t.parse::<f64>() == Ok(0.0) => 0.0,
            t => length(t, Quantity::ShaftMargin)?,
        };
        if !(a.fold.is_finite() && a.fold.abs() <= 180.0) {
            return Err(refuse(
                "--fold",
                format!("wanted an angle from -180 to 180 degrees, found {}", a.fold),
            ));
        }
        let shop = ShopRules {
            backlash: parse_backlash(a.backlash.as_deref())?,
            housing_tolerance_mm: parse_housing_tolerance(a.housing_tol.as_deref())?,
            layout: if a.fold == 0.0 {
                ShaftLayout::Inline
            } else {
                ShaftLayout::Folded { turn_deg: a.fold }
            },
            shaft_diameter_mm: a
                .shaft_diameter
                .as_deref()
                .map(|t| length(t, Quantity::ShaftDiameter))
                .transpose()?,
            shaft_margin_mm,
            rack: RackProfile::default(),
        };
        let shift_sum = match &a.shift_sum {
            Some(s) => parse_signed_range(s, Quantity::ShiftSum, "modules")?,
            None => gearsieve::model::problem::DEFAULT_SHIFT_SUM,
        };
        Ok(ReducerSpec {
            ratio,
            ratio_text,
            tolerance: parse_tolerance(&a.tol)?,
            stages,
            modules: a.modules.clone(),
            teeth: IntRange { lo: teeth.lo, hi: teeth.hi },
            max_stage_ratio: parse_ratio(&a.max_stage_ratio, Quantity::MaxStageRatio)?,
            min_stage_ratio: a
                .min_stage_ratio
                .as_deref()
                .map(|r| parse_ratio(r, Quantity::MinStageRatio))
                .transpose()?,
            centre_distances_mm,
            shift_sum,
            centre_tolerance_mm: a.centre_tol,
            hunting: match a.hunting {
                HuntingArg::Prefer => Hunting::Prefer,
                HuntingArg::Require => Hunting::Require,
                HuntingArg::Ignore => Hunting::Ignore,
            },
            priority: match a.prefer {
                PriorityArg::Balance => Priority::Balance,
                PriorityArg::Error => Priority::Error,
                PriorityArg::Split => Priority::Split,
            },
            input_rpm: input_rpm.map(|r| r.to_f64()),
            stock,
            limit: a.limit,
            shop,
        })
    }
}

/// A validated reducer search.
struct ReducerJob {
    spec: ReducerSpec,
    /// `--arrangements`: list every arrangement of each gear set.
    arrangements: bool,
    /// `--long`: run whatever the forecast.
    long: bool,
}

impl ReducerJob {
    /// True when the stage count is set by a list of modules or distances, one per stage.
    fn per_stage(&self) -> bool {
        self.spec.modules.len().max(self.spec.centre_distances_mm.len()) > 1
    }
}

impl Job for ReducerJob {
    type Found = ReducerPlan;

    fn search(&self, options: &RunOptions) -> anyhow::Result<ReducerPlan> {
        Ok(self.spec.plan(&RunOptions { list_arrangements: self.arrangements, ..*options })?)
    }

    fn report<'a>(&'a self, found: &'a ReducerPlan) -> Box<dyn Report + 'a> {
        Box::new(found)
    }

    fn words(&self, found: &ReducerPlan) -> Words {
        let s = &self.spec;
        let problem = &found.problem;
        let more_teeth = if s.stock.is_some() {
            Some("more stock".to_string())
        } else {
            (s.teeth.hi < MAX_TEETH).then(|| "a higher --max-teeth".to_string())
        };
        let more_stages = if self.per_stage() { None } else { hints::more_stages(s.stages) };
        // Which caps a stage's ratio: the largest stage ratio, or the teeth (most over least).
        let teeth = problem.pool.gears.iter().map(|g| g.teeth);
        let (lo, hi) = (teeth.clone().min().unwrap_or(1), teeth.max().unwrap_or(1));
        let teeth_cap = hi as f64 / lo as f64;
        let ratio_binds = s.max_stage_ratio.to_f64() < teeth_cap;
        let higher_ratio = ratio_binds.then(|| "a higher --max-stage-ratio".to_string());
        let nothing = if let Some(reach) = OutOfReach::of(problem) {
            let mut h = Vec::new();
            if !self.per_stage() {
                h.extend(reach.stages_hint());
            }
            h.extend(higher_ratio);
            if !ratio_binds {
                h.extend(more_teeth);
            }
            hints::nothing(&reach.sentence(&problem.target.text), &h)
        } else if let Some(blocked) = ExactBlocked::of(problem) {
            let mut h = vec!["a --tol above 0".to_string()];
            h.extend(more_teeth);
            hints::nothing(&blocked.sentence(&problem.target.text), &h)
        } else {
            let mut h = vec!["a looser --tol".to_string()];
            h.extend(higher_ratio);
            h.extend(more_teeth);
            if s.stock.is_none() && s.teeth.lo > MIN_TEETH {
                h.push("a lower --min-teeth".into());
            }
            h.extend(more_stages);
            if s.hunting == Hunting::Require {
                h.push("--hunting prefer".into());
            }
            if s.min_stage_ratio.is_some() {
                h.push("a lower --min-stage-ratio".into());
            }
            if s.shop.shaft_diameter_mm.is_some() {
                h.push("a smaller --shaft-diameter or --shaft-margin".into());
            }
            if !s.centre_distances_mm.is_empty() {
                h.push("a wider --shift-sum for the housing".into());
                if s.stock.is_some() {
                    h.push("a larger --centre-tol (gears on hand stand apart to meet the housing)".into());
                }
            }
            hints::nothing("", &h)
        };
        Words {
            interrupted: Some("the trains above are the best found so far".into()),
            nothing: Some(nothing),
        }
    }

    fn forecast(&self) -> anyhow::Result<Option<Outlook<'_>>> {
        let s = &self.spec;
        let mut narrow = Vec::new();
        if s.stages.hi > 1 && !self.per_stage() {
            narrow.push("fewer --stages".to_string());
        }
        if s.stock.is_none() && s.teeth.hi > s.teeth.lo {
            narrow.push("a lower --max-teeth".into());
        }
        narrow.push("a lower --max-stage-ratio".into());
        if !s.tolerance.is_zero() {
            narrow.push("a tighter --tol".into());
        }
        Ok(Some(Outlook {
            searches: vec![(Cow::Owned(s.problem()?), gearsieve::trades::ENGINE)],
            long: self.long,
            shard: None,
            narrow,
            can_shard: false,
            can_count_less: false,
        }))
    }
}

/// Run `gearsieve reducer`.
pub fn run(args: ReducerArgs) -> anyhow::Result<i32> {
    let job =
        ReducerJob { spec: ReducerSpec::try_from(&args)?, arrangements: args.arrangements, long: args.long };
    run::run(&job, &Print::from(&args.print))
}
