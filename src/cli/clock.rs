//! `gearsieve clock`: clock trains in the clockmaker's words — `going` (pendulum to escape
//! wheel), `motion` (the motion work and other hand ratios) and `astro` (moon phase, sidereal
//! time, the year). The clap structs mirror the flags; `TryFrom` turns them into the library's
//! specs, valid by construction.

use std::borrow::Cow;
use std::path::PathBuf;

use clap::{ArgGroup, Args, Subcommand};
use gearsieve::model::catalog::CatalogueDefaults;
use gearsieve::model::pool::{fmt_num, Pool, MAX_STAGES, MAX_TEETH, MIN_TEETH};
use gearsieve::numbers::exact::Exact;
use gearsieve::numbers::length::{parse_length, LengthUnit};
use gearsieve::numbers::period::{parse_period, TimeUnit};
use gearsieve::numbers::range::{parse_int_range, IntRange};
use gearsieve::numbers::rational::Ratio;
use gearsieve::numbers::target::{parse_ratio, parse_tolerance};
use gearsieve::report::Report;
use gearsieve::trades::clock::astro::{AstroPlan, AstroSpec, InputArbor, Period};
use gearsieve::trades::clock::beat::{
    parse_beats_per_hour, parse_beats_per_minute, parse_gravity, Beat, Escapement, STANDARD_GRAVITY,
};
use gearsieve::trades::clock::going::{parse_rate_tolerance, GoingPlan, GoingSpec, LineBarrel};
use gearsieve::trades::clock::motion::{Dial, MotionPlan, MotionSpec};
use gearsieve::trades::clock::part::MeshCheck;
use gearsieve::trades::clock::strike::{StrikePlan, StrikeSpec};
use gearsieve::trades::clock::{going, motion, strike};
use gearsieve::{CountMode, Error, Problem, Quantity, RunOptions};

use super::args::{load_stock, number, PrintArgs, ToothFormArg};
use super::flags::refuse;
use super::hints::{self, ExactBlocked, OutOfReach};
use super::run::{self, Job, Outlook, Print, Words};
use super::search::CountArg;

/// Clock trains: the going train, the motion work, astronomical trains.
#[derive(Args, Debug)]
pub struct ClockArgs {
    #[command(subcommand)]
    pub what: ClockCommand,
}

/// Which clock train.
#[derive(Subcommand, Debug)]
pub enum ClockCommand {
    /// The going train from the arbor that turns once an hour to the escape arbor.
    Going(Box<GoingArgs>),
    /// The motion work (12:1 reverted train behind the hands) or another hand ratio.
    Motion(Box<MotionArgs>),
    /// The count-wheel striking train: great wheel, pin wheel, locking, warning and fly, and the
    /// count wheel.
    Strike(Box<StrikeArgs>),
    /// A dial turning once per synodic month, sidereal day or tropical year.
    Astro(Box<AstroArgs>),
}

/// Wheels to cut, or wheels on hand; shared by the clock commands.
#[derive(Args, Debug)]
pub struct ClockGears {
    /// Wheels and pinions on hand, from a CSV catalogue (repeatable); each used at most its
    /// quantity.
    #[arg(long, value_name = "FILE")]
    pub stock: Vec<PathBuf>,
    /// Module in mm of the wheels to cut, or for catalogue rows that give none.
    #[arg(long, value_name = "MM", default_value_t = 0.5, allow_negative_numbers = true, value_parser = number)]
    pub module: f64,
    /// Stages (meshes): N or A..B.
    #[arg(long, value_name = "N|A..B", allow_hyphen_values = true)]
    pub stages: Option<String>,
    /// Gear sets to list, each by its first arrangement in stage order; every train and gear
    /// set is counted (unless astro's --count lower-bound).
    #[arg(long, value_name = "K", default_value_t = 10)]
    pub limit: usize,
    /// List every arrangement of each gear set under it (the ways of pairing its wheels with
    /// its pinions into stages that pass every check).
    #[arg(long)]
    pub arrangements: bool,
    /// Run even when the search is forecast to take more than an hour.
    #[arg(long)]
    pub long: bool,
    #[command(flatten)]
    pub print: PrintArgs,
}

/// The going train: from the pendulum and escape wheel, search the wheels and pinions from the
/// arbor that turns once an hour (or --from-turns-per-hour) to the escape arbor. Wheels drive
/// pinions, so the ratio i (input turns per output turn) is below 1.
#[derive(Args, Debug)]
#[command(group(ArgGroup::new("beat").required(true).args(["pendulum", "period", "beats_per_hour", "beats_per_minute"])))]
pub struct GoingArgs {
    /// Pendulum length in m (simple pendulum, small swings): period 2π·√(L/g). Other units:
    /// 994mm, 39.13in.
    #[arg(long, value_name = "M", allow_hyphen_values = true)]
    pub pendulum: Option<String>,
    /// Pendulum period in s, a full swing there and back (2 for a seconds pendulum). Other
    /// units: 2s, 1.5min.
    #[arg(long, value_name = "S", allow_hyphen_values = true)]
    pub period: Option<String>,
    /// Beats per hour (a beat is one swing, half a period).
    #[arg(long, value_name = "N", allow_hyphen_values = true)]
    pub beats_per_hour: Option<String>,
    /// Beats per minute (60 for a seconds pendulum).
    #[arg(long, value_name = "N", allow_hyphen_values = true)]
    pub beats_per_minute: Option<String>,
    /// Local gravity, m/s², from 1 to 30: sets the period of a --pendulum, and the simple
    /// pendulum a --period or --beats-per-hour stands for.
    #[arg(long, value_name = "G", default_value_t = STANDARD_GRAVITY.to_string(), allow_hyphen_values = true)]
    pub gravity: String,
    /// Escape wheel teeth.
    #[arg(long, value_name = "N", default_value_t = 30)]
    pub escape_teeth: u32,
    /// Beats per escape wheel tooth: 2 for an anchor or dead-beat escapement (one per pallet).
    #[arg(long, value_name = "N", default_value_t = 2)]
    pub beats_per_tooth: u32,
    /// Turns per hour of the arbor the train starts from: 1 for the centre arbor; below 1 for a
    /// great wheel or barrel, which then drives the centre arbor (once an hour) through a part of
    /// its own.
    #[arg(long, value_name = "R", default_value = "1")]
    pub from_turns_per_hour: String,
    /// The arbor the train starts from, by its time per turn: 1h for the centre arbor, 12h for a
    /// great wheel turning with the hour hand. In hours, or with a unit: 720min, 1d.
    #[arg(long, value_name = "PERIOD", conflicts_with = "from_turns_per_hour")]
    pub from: Option<String>,
    /// How long the clock runs at a winding: in hours, or with a unit (30h, 8d, 32d). Gives the
    /// barrel's turns (and with --line-barrel the weight's drop); with --barrel-turns it sets the
    /// great wheel's speed.
    #[arg(long, value_name = "PERIOD")]
    pub run: Option<String>,
    /// Turns of the barrel (or great wheel) at a winding, with --run: the train starts from an
    /// arbor turning that many times in the run time (16 turns in 8 days: once in 12 hours).
    #[arg(long, value_name = "N", requires = "run", conflicts_with_all = ["from", "from_turns_per_hour"])]
    pub barrel_turns: Option<String>,
    /// Diameter the weight's line winds on, mm (other units: 1.5in): gives the weight's drop
    /// over the run time.
    #[arg(long, value_name = "MM", requires = "run", allow_hyphen_values = true)]
    pub line_barrel: Option<String>,
    /// Falls of the weight's line: 1 hung straight from the barrel, 2 over one pulley.
    #[arg(long, value_name = "N", default_value_t = 1)]
    pub falls: u32,
    /// Stages from the great wheel (or barrel) to the centre arbor: N or A..B, at most 3.
    #[arg(long, value_name = "N|A..B", default_value_t = going::DEFAULT_GREAT_STAGES.to_string())]
    pub great_stages: String,
    /// Wheel teeth allowed (the drivers).
    #[arg(long, value_name = "LO..HI", default_value_t = going::DEFAULT_WHEELS.to_string())]
    pub wheels: String,
    /// Pinion leaves allowed (the driven), from 6.
    #[arg(long, value_name = "LO..HI", default_value_t = going::DEFAULT_PINIONS.to_string())]
    pub pinions: String,
    /// Largest rate error accepted, seconds per day; 0 for exact.
    #[arg(long, value_name = "S", default_value = "0")]
    pub rate_tol: String,
    /// Work out every wheel and pinion as a mesh in --tooth-form and keep only stages that run.
    #[arg(long)]
    pub check_meshes: bool,
    /// Tooth form of the meshes checked: cycloidal, as clock wheels and pinions are cut, or
    /// involute. Turns on the mesh checks.
    #[arg(long, value_enum, value_name = "FORM")]
    pub tooth_form: Option<ToothFormArg>,
    /// Least contact ratio of a mesh checked (leaves in action for cycloidal teeth).
    #[arg(long, value_name = "X", default_value_t = 1.0, allow_negative_numbers = true, value_parser = number)]
    pub min_contact_ratio: f64,
    #[command(flatten)]
    pub gears: ClockGears,
}

/// The motion work: the reverted train from the minute (cannon) arbor to the hour wheel, which
/// turns coaxially on it; or any other hand ratio. Pinions drive wheels (i > 1).
#[derive(Args, Debug)]
pub struct MotionArgs {
    /// A named hand: hour (12:1), 24h (24:1), week (7:1 from an arbor turning once a day).
    #[arg(long, value_name = "NAME", conflicts_with = "ratio", default_value = "hour")]
    pub dial: String,
    /// Any other ratio, input turns per hand turn (e.g. 14 for a week hand from the hour wheel).
    #[arg(long, value_name = "R")]
    pub ratio: Option<String>,
    /// Relative tolerance on the ratio; hands want 0 (exact).
    #[arg(long, value_name = "T", default_value = "0")]
    pub tol: String,
    /// Pinion leaves allowed (the drivers).
    #[arg(long, value_name = "LO..HI", default_value_t = motion::DEFAULT_PINIONS.to_string())]
    pub pinions: String,
    /// Wheel teeth allowed (the driven).
    #[arg(long, value_name = "LO..HI", default_value_t = motion::DEFAULT_WHEELS.to_string())]
    pub wheels: String,
    /// The hand is not on the input arbor's axis (e.g. a subsidiary dial): no coaxial fit.
    #[arg(long)]
    pub not_coaxial: bool,
    /// Tooth form: cycloidal, as clock wheels and pinions are cut (each pair at m·(z1 + z2)/2, a
    /// coaxial train met by a module per pair), or involute (the stages shifted to one centre
    /// distance).
    #[arg(long, value_enum, value_name = "FORM", default_value = "cycloidal")]
    pub tooth_form: ToothFormArg,
    /// Refuse undercut pinions of involute teeth (accepted by default: clock pinions are often
    /// cut so).
    #[arg(long)]
    pub no_undercut: bool,
    /// Least contact ratio of a mesh (transverse for involute teeth, leaves in action for
    /// cycloidal teeth).
    #[arg(long, value_name = "X", default_value_t = 1.0, allow_negative_numbers = true, value_parser = number)]
    pub min_contact_ratio: f64,
    #[command(flatten)]
    pub gears: ClockGears,
}

/// The striking train of a count-wheel (or rack) striking clock: from the pins, the run time and
/// the barrel's turns, the wheels and pinions from the great wheel to the pin wheel, the locking
/// wheel (once a blow), the warning wheel and the fly, and the count wheel (once in 12 hours).
#[derive(Args, Debug)]
pub struct StrikeArgs {
    /// Pins on the pin wheel, one blow each.
    #[arg(long, value_name = "N", default_value_t = strike::DEFAULT_PINS)]
    pub pins: u32,
    /// Strike one blow at each half hour too (90 blows in 12 hours instead of 78).
    #[arg(long)]
    pub half_hours: bool,
    /// How long the clock runs at a winding: in hours, or with a unit (30h, 8d).
    #[arg(long, value_name = "PERIOD", default_value = "8d")]
    pub run: String,
    /// Turns of the barrel (great wheel) at a winding.
    #[arg(long, value_name = "N", default_value = "16")]
    pub barrel_turns: String,
    /// Turns of the warning wheel per blow (whole, so it stops in the same place each hour).
    #[arg(long, value_name = "N", default_value_t = strike::DEFAULT_WARNING_TURNS)]
    pub warning_turns: u32,
    /// Turns of the fly per turn of the warning wheel.
    #[arg(long, value_name = "N", default_value_t = strike::DEFAULT_FLY_TURNS)]
    pub fly_turns: u32,
    /// Wheel teeth allowed.
    #[arg(long, value_name = "LO..HI", default_value_t = going::DEFAULT_WHEELS.to_string())]
    pub wheels: String,
    /// Pinion leaves allowed, from 6.
    #[arg(long, value_name = "LO..HI", default_value_t = going::DEFAULT_PINIONS.to_string())]
    pub pinions: String,
    /// Stages from the great wheel to the pin wheel: N or A..B, at most 3.
    #[arg(long, value_name = "N|A..B", default_value = "1")]
    pub great_stages: String,
    /// Work out every wheel and pinion as a mesh in --tooth-form and keep only stages that run.
    #[arg(long)]
    pub check_meshes: bool,
    /// Tooth form of the meshes checked: cycloidal, as clock wheels and pinions are cut, or
    /// involute. Turns on the mesh checks.
    #[arg(long, value_enum, value_name = "FORM")]
    pub tooth_form: Option<ToothFormArg>,
    /// Least contact ratio of a mesh checked (leaves in action for cycloidal teeth).
    #[arg(long, value_name = "X", default_value_t = 1.0, allow_negative_numbers = true, value_parser = number)]
    pub min_contact_ratio: f64,
    #[command(flatten)]
    pub gears: ClockGears,
}

/// Astronomical trains: a dial turning once per period, from an arbor turning once a day (or
/// an hour). Reports drift per year and the days until the dial is one day out.
#[derive(Args, Debug)]
pub struct AstroArgs {
    /// A mean period at J2000: synodic-month (29.530588853 d), sidereal-month, draconic-month,
    /// anomalistic-month, sidereal-day, tropical-year, sidereal-year; or a number of days.
    #[arg(long, value_name = "NAME|DAYS")]
    pub period: String,
    /// The input arbor turns once a day or once an hour.
    #[arg(long, value_name = "day|hour", default_value = "day")]
    pub from: String,
    /// Relative tolerance on the ratio: 1e-4, 10ppm, 0.01%.
    #[arg(long, value_name = "T", default_value = "100ppm")]
    pub tol: String,
    /// Teeth of the gears to cut, LO..HI.
    #[arg(long, value_name = "LO..HI", default_value = "8..150")]
    pub teeth: String,
    /// How to count the trains: every one (exact), or only those met on the way to the listed
    /// best, which stay the proven best (lower-bound: for four to six stages of gears to be cut
    /// at a tolerance above 0, where counting all would take far longer than finding the best;
    /// the counts are then marked as lower bounds).
    #[arg(long, value_enum, value_name = "HOW", default_value = "exact")]
    pub count: CountArg,
    #[command(flatten)]
    pub gears: ClockGears,
}

fn stages(g: &ClockGears, default: &str) -> Result<IntRange, Error> {
    parse_int_range(
        g.stages.as_deref().unwrap_or(default),
        Quantity::StageCount,
        "stages",
        1,
        MAX_STAGES as u32,
    )
}

fn pool(g: &ClockGears, teeth: IntRange) -> Result<Pool, Error> {
    if g.stock.is_empty() {
        Pool::to_cut(teeth, g.module, 20.0, None)
    } else {
        load_stock(
            &g.stock,
            CatalogueDefaults { module_mm: Some(g.module), pressure_angle_deg: 20.0 },
            Quantity::Module,
        )
    }
}

fn teeth(text: &str, quantity: Quantity) -> Result<IntRange, Error> {
    parse_int_range(text, quantity, "teeth", MIN_TEETH, MAX_TEETH)
}

/// Turns per hour of an arbor taking `hours` per turn.
fn per_turn(hours: Ratio) -> Ratio {
    Exact::of(Ratio::integer(1)).over(Exact::of(hours)).value
}

fn span(a: IntRange, b: IntRange) -> IntRange {
    IntRange { lo: a.lo.min(b.lo), hi: a.hi.max(b.hi) }
}

impl TryFrom<&GoingArgs> for GoingSpec {
    type Error = anyhow::Error;

    fn try_from(a: &GoingArgs) -> anyhow::Result<GoingSpec> {
        let gravity = parse_gravity(&a.gravity)?;
        let beat = match (&a.pendulum, &a.period, &a.beats_per_hour) {
            (Some(l), _, _) => {
                let length = parse_length(l, Quantity::PendulumLength, Some(LengthUnit::Metre))?;
                Beat::from_length(length.mm_f64() / 1000.0, gravity)?
            }
            (None, Some(p), _) => {
                Beat::from_period(parse_period(p, Quantity::PendulumPeriod, TimeUnit::Second)?, gravity)?
            }
            (None, None, Some(b)) => Beat::from_beats_per_hour(parse_beats_per_hour(b)?, gravity)?,
            (None, None, None) if a.beats_per_minute.is_some() => {
                let text = a.beats_per_minute.as_deref().unwrap_or_default();
                Beat::from_beats_per_hour(parse_beats_per_minute(text)?, gravity)?
            }
            _ => {
                return Err(anyhow::anyhow!("give the beat: --pendulum M, --period S or --beats-per-hour N"))
            }
        };
        let wheels = teeth(&a.wheels, Quantity::WheelTeeth)?;
        let pinions = teeth(&a.pinions, Quantity::PinionLeaves)?;
        if pinions.lo < 6 {
            return Err(refuse(
                "--pinions",
                format!("clock pinions have at least 6 leaves, found {pinions}"),
            ));
        }
        let run_hours =
            a.run.as_deref().map(|r| parse_period(r, Quantity::RunTime, TimeUnit::Hour)).transpose()?;
        let from_turns_per_hour = match (&a.from, &a.barrel_turns, run_hours) {
            (Some(p), _, _) => per_turn(parse_period(p, Quantity::InputArborPeriod, TimeUnit::Hour)?),
            (None, Some(t), Some(run)) => {
                let turns = parse_ratio(t, Quantity::BarrelTurns)?;
                Exact::of(turns).over(Exact::of(run)).value
            }
            _ => parse_ratio(&a.from_turns_per_hour, Quantity::InputTurnsPerHour)?,
        };
        if run_hours.is_some() && from_turns_per_hour == Ratio::integer(1) {
            return Err(refuse(
                "--run",
                "give the arbor the weight or spring drives: --barrel-turns N, or --from 12h for a great \
                 wheel turning once in 12 hours",
            ));
        }
        let line_barrel = match &a.line_barrel {
            Some(d) => Some(LineBarrel {
                diameter_mm: parse_length(d, Quantity::LineBarrelDiameter, Some(LengthUnit::Millimetre))?
                    .mm_f64(),
                falls: a.falls.max(1),
            }),
            None => None,
        };
        Ok(GoingSpec {
            beat,
            escapement: Escapement::new(a.escape_teeth, a.beats_per_tooth)?,
            from_turns_per_hour,
            great_stages: parse_int_range(&a.great_stages, Quantity::StageCount, "stages", 1, 3)?,
            run_hours,
            line_barrel,
            pool: pool(&a.gears, span(wheels, pinions))?,
            wheels,
            pinions,
            stages: stages(&a.gears, "1..3")?,
            rate_tolerance_s_per_day: parse_rate_tolerance(&a.rate_tol)?,
            meshes: (a.check_meshes || a.tooth_form.is_some()).then(|| MeshCheck {
                tooth_form: a.tooth_form.unwrap_or(ToothFormArg::Cycloidal).into(),
                min_contact_ratio: a.min_contact_ratio,
            }),
            limit: a.gears.limit,
        })
    }
}

impl TryFrom<&MotionArgs> for MotionSpec {
    type Error = anyhow::Error;

    fn try_from(a: &MotionArgs) -> anyhow::Result<MotionSpec> {
        let (ratio, ratio_text) = match &a.ratio {
            Some(r) => (parse_ratio(r, Quantity::TargetRatio)?, r.trim().to_string()),
            None => (Dial::parse(&a.dial)?.ratio(), a.dial.trim().to_string()),
        };
        let pinions = teeth(&a.pinions, Quantity::PinionLeaves)?;
        let wheels = teeth(&a.wheels, Quantity::WheelTeeth)?;
        if a.no_undercut && a.tooth_form == ToothFormArg::Cycloidal {
            return Err(refuse("--no-undercut", "belongs to involute teeth; give --tooth-form involute too"));
        }
        Ok(MotionSpec {
            ratio,
            ratio_text,
            tolerance: parse_tolerance(&a.tol)?,
            pool: pool(&a.gears, span(wheels, pinions))?,
            pinions,
            wheels,
            stages: stages(&a.gears, if a.not_coaxial { "1..2" } else { "2" })?,
            coaxial: !a.not_coaxial,
            tooth_form: a.tooth_form.into(),
            allow_undercut: !a.no_undercut,
            min_contact_ratio: a.min_contact_ratio,
            limit: a.gears.limit,
        })
    }
}

impl TryFrom<&StrikeArgs> for StrikeSpec {
    type Error = anyhow::Error;

    fn try_from(a: &StrikeArgs) -> anyhow::Result<StrikeSpec> {
        if a.gears.stages.is_some() {
            return Err(refuse(
                "--stages",
                "a striking train's parts are one stage each; give --great-stages for the great wheel's",
            ));
        }
        let wheels = teeth(&a.wheels, Quantity::WheelTeeth)?;
        let pinions = teeth(&a.pinions, Quantity::PinionLeaves)?;
        if pinions.lo < 6 {
            return Err(refuse(
                "--pinions",
                format!("clock pinions have at least 6 leaves, found {pinions}"),
            ));
        }
        Ok(StrikeSpec {
            pins: a.pins,
            half_hours: a.half_hours,
            run_hours: parse_period(&a.run, Quantity::RunTime, TimeUnit::Hour)?,
            barrel_turns: parse_ratio(&a.barrel_turns, Quantity::BarrelTurns)?,
            warning_turns: a.warning_turns,
            fly_turns: a.fly_turns,
            pool: pool(&a.gears, span(wheels, pinions))?,
            wheels,
            pinions,
            great_stages: parse_int_range(&a.great_stages, Quantity::StageCount, "stages", 1, 3)?,
            meshes: (a.check_meshes || a.tooth_form.is_some()).then(|| MeshCheck {
                tooth_form: a.tooth_form.unwrap_or(ToothFormArg::Cycloidal).into(),
                min_contact_ratio: a.min_contact_ratio,
            }),
            limit: a.gears.limit,
        })
    }
}

impl TryFrom<&AstroArgs> for AstroSpec {
    type Error = anyhow::Error;

    fn try_from(a: &AstroArgs) -> anyhow::Result<AstroSpec> {
        let from = match a.from.trim() {
            "day" | "daily" => InputArbor::Daily,
            "hour" | "hourly" => InputArbor::Hourly,
            other => return Err(refuse("--from", format!("unknown arbor \"{other}\"; wanted day or hour"))),
        };
        Ok(AstroSpec {
            period: Period::parse(&a.period)?,
            from,
            tolerance: parse_tolerance(&a.tol)?,
            pool: pool(&a.gears, teeth(&a.teeth, Quantity::ToothRange)?)?,
            stages: stages(&a.gears, "1..2")?,
            limit: a.gears.limit,
            count_mode: a.count.into(),
        })
    }
}

/// A clock spec with how to run it.
struct ClockJob<S> {
    spec: S,
    /// `--long`: run whatever the forecast.
    long: bool,
    /// `--arrangements`: list every arrangement of each listed gear set.
    arrangements: bool,
}

impl<S> ClockJob<S> {
    /// `options` with every arrangement of each listed set asked for when `--arrangements` was.
    fn options<'o>(&self, options: &RunOptions<'o>) -> RunOptions<'o> {
        RunOptions {
            progress: options.progress,
            cancel: options.cancel,
            shard: options.shard,
            list_arrangements: self.arrangements,
        }
    }

    /// The forecast of one search of `problem` with the trades' engine.
    fn outlook(&self, problem: Problem, narrow: Vec<String>) -> Outlook<'_> {
        Outlook {
            searches: vec![(Cow::Owned(problem), gearsieve::trades::ENGINE)],
            long: self.long,
            shard: None,
            narrow,
            can_shard: false,
            can_count_less: false,
        }
    }
}

/// What a clock command says when interrupted, and when nothing was found.
fn words(nothing: String) -> Words {
    Words { interrupted: Some("the trains above are the best found so far".into()), nothing: Some(nothing) }
}

/// "wider --wheels and --pinions", or the one of them that can be wider.
fn wider_wheels_and_pinions(wheels: IntRange, pinions: IntRange) -> Option<String> {
    let full = |r: IntRange, least: u32| r.lo <= least && r.hi >= MAX_TEETH;
    match (full(wheels, MIN_TEETH), full(pinions, 6)) {
        (false, false) => Some("wider --wheels and --pinions".into()),
        (false, true) => Some("wider --wheels".into()),
        (true, false) => Some("wider --pinions".into()),
        (true, true) => None,
    }
}

/// The reasons and hints for a clock train that was not found, shared by the three: out of
/// reach, an exact ratio no gear can make, or else `otherwise`. `target` is the ratio as shown,
/// `gears` is how to have more gears, `tolerance` how to accept a less exact train.
fn nothing_found(
    problem: &Problem,
    target: &str,
    gears: Option<String>,
    tolerance: String,
    otherwise: Vec<String>,
) -> String {
    if let Some(reach) = OutOfReach::of(problem) {
        let mut h: Vec<String> = reach.stages_hint().into_iter().collect();
        h.extend(gears);
        return hints::nothing(&reach.sentence(target), &h);
    }
    if let Some(blocked) = ExactBlocked::of(problem) {
        let mut h = vec![tolerance];
        h.extend(gears);
        return hints::nothing(&blocked.sentence(target), &h);
    }
    hints::nothing("", &otherwise)
}

impl Job for ClockJob<GoingSpec> {
    type Found = GoingPlan;

    fn search(&self, options: &RunOptions) -> anyhow::Result<GoingPlan> {
        Ok(self.spec.plan(&self.options(options))?)
    }

    fn report<'a>(&'a self, found: &'a GoingPlan) -> Box<dyn Report + 'a> {
        Box::new(found)
    }

    fn words(&self, found: &GoingPlan) -> Words {
        let s = &self.spec;
        let gears = if s.pool.from_stock {
            Some("more stock".to_string())
        } else {
            wider_wheels_and_pinions(s.wheels, s.pinions)
        };
        if let Some(g) = found.great.as_ref().filter(|g| g.count == 0 && found.count > 0) {
            let mut h: Vec<String> = gears.clone().into_iter().collect();
            if g.part.stages.hi < 3 {
                h.push("more --great-stages".into());
            }
            if s.run_hours.is_some() {
                h.push("other --barrel-turns".into());
            }
            let why = format!(
                "No wheels and pinions make the great wheel's ratio {} to the centre arbor. ",
                g.part.ratio
            );
            return words(hints::nothing(&why, &h));
        }
        let t = s.rate_tolerance_s_per_day;
        let looser = format!("a --rate-tol above {} s/day", fmt_num(t.to_f64()));
        let (_, exact) = s.needed_ratio();
        if !exact && t.is_zero() && OutOfReach::of(&found.problem).is_none() {
            // A beat from a pendulum's length carries π and a square root: no ratio of whole
            // numbers is it, so only a rate tolerance can let a train through.
            let why =
                "A pendulum given by its length beats at no ratio of whole numbers, so no train is exact. ";
            return words(hints::nothing(why, &[looser]));
        }
        let mut otherwise = Vec::new();
        if t < Ratio::integer(going::MAX_RATE_TOLERANCE_S_PER_DAY) {
            otherwise.push(looser.clone());
        }
        otherwise.extend(hints::more_stages(s.stages));
        otherwise.extend(gears.clone());
        match s.meshes {
            Some(m) if m.tooth_form == gearsieve::ToothForm::Involute => {
                otherwise.push("--tooth-form cycloidal".into())
            }
            Some(m) if m.min_contact_ratio > 0.0 => otherwise.push("a lower --min-contact-ratio".into()),
            _ => {}
        }
        // A ratio worked out from a pendulum's length is no short fraction: show it as a number.
        let target = if exact {
            found.problem.target.text.clone()
        } else {
            fmt_num(found.problem.target.ratio.to_f64())
        };
        words(nothing_found(&found.problem, &target, gears, looser, otherwise))
    }

    fn forecast(&self) -> anyhow::Result<Option<Outlook<'_>>> {
        let s = &self.spec;
        let mut narrow = narrow_clock(s.stages);
        narrow.push("narrower --wheels or --pinions".into());
        if !s.rate_tolerance_s_per_day.is_zero() {
            narrow.push("a tighter --rate-tol".into());
        }
        Ok(Some(self.outlook(s.problem()?, narrow)))
    }
}

impl Job for ClockJob<MotionSpec> {
    type Found = MotionPlan;

    fn search(&self, options: &RunOptions) -> anyhow::Result<MotionPlan> {
        Ok(self.spec.plan(&self.options(options))?)
    }

    fn report<'a>(&'a self, found: &'a MotionPlan) -> Box<dyn Report + 'a> {
        Box::new(found)
    }

    fn words(&self, found: &MotionPlan) -> Words {
        let s = &self.spec;
        let gears = if s.pool.from_stock {
            Some("more stock".to_string())
        } else {
            wider_wheels_and_pinions(s.wheels, s.pinions)
        };
        let mut otherwise: Vec<String> = gears.clone().into_iter().collect();
        if s.min_contact_ratio > 0.0 {
            otherwise.push("a lower --min-contact-ratio".into());
        }
        if s.tooth_form == gearsieve::ToothForm::Involute {
            otherwise.push("--tooth-form cycloidal".into());
            if !s.allow_undercut {
                otherwise.push("leaving out --no-undercut".into());
            }
        }
        if s.coaxial {
            otherwise.push("--not-coaxial".into());
        } else {
            otherwise.extend(hints::more_stages(s.stages));
        }
        // Hands want an exact ratio: a looser tolerance is named only when one was already
        // accepted, or when no exact train can exist.
        if !s.tolerance.is_zero() {
            otherwise.push("a looser --tol".into());
        }
        let hand_drifts = "a --tol above 0 (the hand then drifts)".to_string();
        words(nothing_found(&found.problem, &found.problem.target.text, gears, hand_drifts, otherwise))
    }

    fn forecast(&self) -> anyhow::Result<Option<Outlook<'_>>> {
        let s = &self.spec;
        let mut narrow = narrow_clock(s.stages);
        narrow.push("narrower --wheels or --pinions".into());
        if !s.tolerance.is_zero() {
            narrow.push("a tighter --tol".into());
        }
        Ok(Some(self.outlook(s.problem()?, narrow)))
    }
}

impl Job for ClockJob<StrikeSpec> {
    type Found = StrikePlan;

    fn search(&self, options: &RunOptions) -> anyhow::Result<StrikePlan> {
        Ok(self.spec.plan(&self.options(options))?)
    }

    fn report<'a>(&'a self, found: &'a StrikePlan) -> Box<dyn Report + 'a> {
        Box::new(found)
    }

    fn words(&self, found: &StrikePlan) -> Words {
        let s = &self.spec;
        let missing: Vec<String> = found
            .parts
            .iter()
            .filter(|g| g.count == 0)
            .map(|g| {
                format!(
                    "{} to {} ({})",
                    g.part.arbors[0],
                    g.part.arbors[g.part.arbors.len() - 1],
                    g.part.ratio
                )
            })
            .collect();
        let why = format!("No wheels and pinions make {}. ", missing.join(", "));
        let mut h: Vec<String> = if s.pool.from_stock {
            vec!["more stock".into()]
        } else {
            wider_wheels_and_pinions(s.wheels, s.pinions).into_iter().collect()
        };
        if found.parts.first().is_some_and(|g| g.count == 0) {
            h.push("other --barrel-turns or --pins".into());
            if s.great_stages.hi < 3 {
                h.push("more --great-stages".into());
            }
        }
        if s.meshes.is_some() {
            h.push("a lower --min-contact-ratio".into());
        }
        words(hints::nothing(&why, &h))
    }

    fn forecast(&self) -> anyhow::Result<Option<Outlook<'_>>> {
        let s = &self.spec;
        let searches = s
            .parts()?
            .iter()
            .map(|p| Ok((Cow::Owned(p.problem(&s.pool, s.meshes, s.limit)?), gearsieve::trades::ENGINE)))
            .collect::<Result<Vec<_>, Error>>()?;
        Ok(Some(Outlook {
            searches,
            long: self.long,
            shard: None,
            narrow: vec!["narrower --wheels or --pinions".into()],
            can_shard: false,
            can_count_less: false,
        }))
    }
}

impl Job for ClockJob<AstroSpec> {
    type Found = AstroPlan;

    fn search(&self, options: &RunOptions) -> anyhow::Result<AstroPlan> {
        Ok(self.spec.plan(&self.options(options))?)
    }

    fn report<'a>(&'a self, found: &'a AstroPlan) -> Box<dyn Report + 'a> {
        Box::new(found)
    }

    fn words(&self, found: &AstroPlan) -> Words {
        let s = &self.spec;
        let gears = hints::more_gears(&found.problem.pool, "--teeth");
        let mut otherwise = vec!["a looser --tol".to_string()];
        otherwise.extend(hints::more_stages(s.stages));
        otherwise.extend(gears.clone());
        words(nothing_found(
            &found.problem,
            &found.problem.target.text,
            gears,
            "a --tol above 0".into(),
            otherwise,
        ))
    }

    fn forecast(&self) -> anyhow::Result<Option<Outlook<'_>>> {
        let s = &self.spec;
        let mut narrow = narrow_clock(s.stages);
        if !s.pool.from_stock {
            narrow.push("a narrower --teeth range".into());
        }
        if !s.tolerance.is_zero() {
            narrow.push("a tighter --tol".into());
        }
        let problem = s.problem()?;
        // As `search` does: a lower-bound count is offered where the window engine would list
        // the same best without counting every train.
        let can_count_less =
            problem.count == CountMode::Exact && gearsieve::engine::window::would_serve(&problem);
        Ok(Some(Outlook { can_count_less, ..self.outlook(problem, narrow) }))
    }
}

/// "fewer --stages" when a train may have more than one.
fn narrow_clock(stages: IntRange) -> Vec<String> {
    if stages.hi > 1 {
        vec!["fewer --stages".into()]
    } else {
        Vec::new()
    }
}

/// Run `gearsieve clock`.
pub fn run(args: ClockArgs) -> anyhow::Result<i32> {
    match &args.what {
        ClockCommand::Going(a) => {
            let job = ClockJob {
                spec: GoingSpec::try_from(a.as_ref())?,
                long: a.gears.long,
                arrangements: a.gears.arrangements,
            };
            run::run(&job, &Print::from(&a.gears.print))
        }
        ClockCommand::Motion(a) => {
            let job = ClockJob {
                spec: MotionSpec::try_from(a.as_ref())?,
                long: a.gears.long,
                arrangements: a.gears.arrangements,
            };
            run::run(&job, &Print::from(&a.gears.print))
        }
        ClockCommand::Strike(a) => {
            let job = ClockJob {
                spec: StrikeSpec::try_from(a.as_ref())?,
                long: a.gears.long,
                arrangements: a.gears.arrangements,
            };
            run::run(&job, &Print::from(&a.gears.print))
        }
        ClockCommand::Astro(a) => {
            let job = ClockJob {
                spec: AstroSpec::try_from(a.as_ref())?,
                long: a.gears.long,
                arrangements: a.gears.arrangements,
            };
            run::run(&job, &Print::from(&a.gears.print))
        }
    }
}
