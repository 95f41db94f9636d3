//! `gearsieve reducer`: a spur reducer from its ratio or speeds, stages, a module per stage,
//! least teeth, a per-stage ratio limit and optionally the housing's centre distances. The clap
//! struct mirrors the flags; `TryFrom` turns it into a [`ReducerSpec`].

use std::path::PathBuf;

use clap::{ArgGroup, Args, ValueEnum};
use gearsieve::model::catalog::CatalogueDefaults;
use gearsieve::model::pool::{MAX_STAGES, MAX_TEETH, MIN_TEETH};
use gearsieve::numbers::exact::Exact;
use gearsieve::numbers::range::{parse_int_range, parse_signed_range, IntRange};
use gearsieve::numbers::target::{parse_ratio, parse_tolerance};
use gearsieve::report::Report;
use gearsieve::trades::reducer::{Hunting, Priority, ReducerPlan, ReducerSpec, DEFAULT_MAX_STAGE_RATIO};
use gearsieve::{Quantity, RunOptions};

use super::args::{load_stock, PrintArgs};
use super::flags::refuse;
use super::run::{self, Job, Print, Words};

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
    /// Hunting pairs, then balanced stages, then ratio error.
    Balance,
    /// Ratio error first.
    Error,
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
    /// Stages: N or A..B (a single count when modules or distances are given per stage).
    #[arg(long, value_name = "N|A..B", default_value = "2")]
    pub stages: String,
    /// Module per stage in mm, input to output, coarser toward the output (1,1.5,2), or one
    /// for every stage.
    #[arg(long, value_name = "MM,…", value_delimiter = ',')]
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
    /// The housing's fixed centre distance of each stage, mm, input to output (or one for all):
    /// reached by profile shift.
    #[arg(long, value_name = "MM,…", value_delimiter = ',', allow_negative_numbers = true)]
    pub centre_distances: Vec<f64>,
    /// Allowed profile shift sum x1+x2 per stage, in modules [default: -0.5..1].
    #[arg(long, value_name = "LO..HI", allow_hyphen_values = true)]
    pub shift_sum: Option<String>,
    /// Hunting-tooth pairs (no common factor between mating teeth, for even wear).
    #[arg(long, value_enum, default_value = "prefer")]
    pub hunting: HuntingArg,
    /// What ranks first.
    #[arg(long, value_enum, default_value = "balance")]
    pub prefer: PriorityArg,
    /// Gears on the shelf, from a CSV catalogue (repeatable), instead of cutting.
    #[arg(long, value_name = "FILE")]
    pub stock: Vec<PathBuf>,
    /// Trains to list; all are counted.
    #[arg(long, value_name = "K", default_value_t = 5)]
    pub limit: usize,
    #[command(flatten)]
    pub print: PrintArgs,
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
            _ => return Err(refuse("--ratio", "give --ratio R, or --input-rpm and --output-rpm")),
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
        let stock = if a.stock.is_empty() {
            None
        } else {
            Some(load_stock(
                &a.stock,
                CatalogueDefaults { module_mm: a.modules.first().copied(), pressure_angle_deg: 20.0 },
                Quantity::StageModules,
            )?)
        };
        let shift_sum = match &a.shift_sum {
            Some(s) => parse_signed_range(s, Quantity::ShiftSum, "modules")?,
            None => gearsieve::model::problem::DEFAULT_SHIFT_SUM,
        };
        Ok(ReducerSpec {
            ratio,
            ratio_text,
            tolerance: parse_tolerance(&a.tol)?,
            stages: parse_int_range(&a.stages, Quantity::StageCount, "stages", 1, MAX_STAGES as u32)?,
            modules: a.modules.clone(),
            teeth: IntRange { lo: teeth.lo, hi: teeth.hi },
            max_stage_ratio: parse_ratio(&a.max_stage_ratio, Quantity::MaxStageRatio)?,
            centre_distances_mm: a.centre_distances.clone(),
            shift_sum,
            hunting: match a.hunting {
                HuntingArg::Prefer => Hunting::Prefer,
                HuntingArg::Require => Hunting::Require,
                HuntingArg::Ignore => Hunting::Ignore,
            },
            priority: match a.prefer {
                PriorityArg::Balance => Priority::Balance,
                PriorityArg::Error => Priority::Error,
            },
            input_rpm: input_rpm.map(|r| r.to_f64()),
            stock,
            limit: a.limit,
        })
    }
}

impl Job for ReducerSpec {
    type Found = ReducerPlan;

    fn search(&self, options: &RunOptions) -> anyhow::Result<ReducerPlan> {
        Ok(self.plan(options)?)
    }

    fn report<'a>(&'a self, found: &'a ReducerPlan) -> Box<dyn Report + 'a> {
        Box::new(found)
    }

    fn words(&self) -> Words {
        Words {
            interrupted: Some("the trains above are the best found so far".into()),
            nothing: Some(
                "no train meets every constraint. Try a looser --tol, a higher --max-stage-ratio, more \
                 teeth, --hunting prefer, or a wider --shift-sum for the housing."
                    .into(),
            ),
        }
    }
}

/// Run `gearsieve reducer`.
pub fn run(args: ReducerArgs) -> anyhow::Result<i32> {
    run::run(&ReducerSpec::try_from(&args)?, &Print::from(&args.print))
}
