//! `gearsieve search`: the general search, listing gear sets (each by its best arrangement). The clap struct mirrors the flags; `TryFrom` turns it
//! into a validated [`Problem`] plus how to run and print it.

use std::borrow::Cow;
use std::path::PathBuf;

use clap::{Args, ValueEnum};
use gearsieve::engine::Shard;
use gearsieve::geometry::MeshLimits;
use gearsieve::model::catalog::CatalogueDefaults;
use gearsieve::model::pool::{check_diametral_pitch, check_module, Pool, MAX_STAGES, MAX_TEETH, MIN_TEETH};
use gearsieve::model::problem::MeshRules;
use gearsieve::model::rank::parse_rank;
use gearsieve::model::train::Direction;
use gearsieve::numbers::range::{parse_int_range, parse_length_range, parse_ratio_range, parse_signed_range};
use gearsieve::numbers::target::Target;
use gearsieve::report::search::stream::Stream;
use gearsieve::report::search::SearchReport;
use gearsieve::report::{RenderError, Report};
use gearsieve::{CountMode, EngineChoice, Error, Problem, Quantity, RunOptions, StageLimits};

use super::args::{load_stock, number, FormatArg, PrintArgs, ToothFormArg};
use super::buy::BuyArgs;
use super::flags::refuse;
use super::hints;
use super::progress::Bar;
use super::run::{self, Job, Outlook, Print, Words};
use super::EXIT_OK;

/// Tooth range used when neither `--teeth` nor `--stock` is given.
pub const DEFAULT_TEETH: &str = "12..120";

/// The engine flag.
#[derive(Clone, Copy, Debug, ValueEnum)]
pub enum EngineArg {
    /// Per stage count, the first engine that takes it: the factor engine for exact targets
    /// (--tol 0) over gears to be cut when every pairing of allowed teeth is a stage (no
    /// --stage-ratio, --centre-distance or mesh check leaves one out), up to four stages (six
    /// when no gear has more than 255 teeth); with --count lower-bound, the window engine for
    /// near targets of four to six stages; then meet-in-the-middle over distinct stage ratios
    /// for gears to be cut, up to six stages (four to six only while its pair table fits in
    /// 1 GiB); the sieve for the rest (gears on hand, --coaxial without a fixed centre
    /// distance) and for --limit 0.
    Fast,
    /// Depth-first with ratio bounds, for every case.
    Sieve,
    /// Every combination (slow reference).
    Exhaustive,
}

/// The count flag.
#[derive(Clone, Copy, Debug, PartialEq, Eq, ValueEnum)]
pub enum CountArg {
    /// Count every train and gear set.
    Exact,
    /// List the same proven best, but count only the trains met on the way to it: near targets
    /// over four to six stages of gears to be cut then take seconds where counting every train
    /// would take hours; the counts are marked as lower bounds.
    LowerBound,
}

impl From<CountArg> for CountMode {
    fn from(c: CountArg) -> CountMode {
        match c {
            CountArg::Exact => CountMode::Exact,
            CountArg::LowerBound => CountMode::LowerBound,
        }
    }
}

/// The direction flag.
#[derive(Clone, Copy, Debug, ValueEnum)]
pub enum DirectionArg {
    /// Output turns the same way as the input (even number of meshes).
    Same,
    /// Output turns the opposite way (odd number of meshes).
    Opposite,
}

/// Search every compound train of external spur stages for a ratio.
///
/// Ratio convention (ISO 1122-1): i = input turns per output turn = product of driven teeth /
/// product of driver teeth; a reducer's ratio is above 1, a speed-up's below 1.
#[derive(Args, Debug)]
pub struct SearchArgs {
    /// Ratio wanted, input turns per output turn: 12, 1.0583, 127/120, 37.5:1 or pi. Decimals
    /// and fractions are held exactly.
    #[arg(long, short, value_name = "R", allow_hyphen_values = true)]
    pub ratio: String,
    /// Relative tolerance |i/R − 1| ≤ T: 0 (exact), 1e-4, 0.01% or 50ppm.
    #[arg(long, value_name = "T", default_value = "0", allow_hyphen_values = true)]
    pub tol: String,
    /// Stages (meshes): N or A..B inclusive. Fewer meshes rank first among equal errors.
    #[arg(long, value_name = "N|A..B", default_value = "1..3", allow_hyphen_values = true)]
    pub stages: String,
    /// Gears to be cut: every tooth count in LO..HI, any number of each [default: 12..120
    /// when no --stock is given].
    #[arg(long, value_name = "LO..HI", conflicts_with = "stock", allow_hyphen_values = true)]
    pub teeth: Option<String>,
    /// Gears on hand, from a CSV catalogue (repeatable). Each gear is used at most its quantity.
    #[arg(long, value_name = "FILE")]
    pub stock: Vec<PathBuf>,
    /// Module in mm for --teeth (default 1), or for catalogue rows that give none.
    #[arg(long, value_name = "MM", conflicts_with = "diametral_pitch", allow_negative_numbers = true, value_parser = number)]
    pub module: Option<f64>,
    /// Diametral pitch (teeth per inch of pitch diameter) instead of a module: m = 25.4 / P.
    #[arg(long, value_name = "P", allow_negative_numbers = true, value_parser = number)]
    pub diametral_pitch: Option<f64>,
    /// Pressure angle in degrees for --teeth, and for catalogue rows that give none.
    #[arg(long, value_name = "DEG", default_value_t = 20.0, allow_negative_numbers = true, value_parser = number)]
    pub pressure_angle: f64,
    /// Allowed driver teeth per stage (e.g. clock pinions 6..12).
    #[arg(long, value_name = "LO..HI", allow_hyphen_values = true)]
    pub driver_teeth: Option<String>,
    /// Allowed driven teeth per stage.
    #[arg(long, value_name = "LO..HI", allow_hyphen_values = true)]
    pub driven_teeth: Option<String>,
    /// Allowed ratio of each stage, driven/driver: e.g. 1..6, 1/6..6 or ..6.
    #[arg(long, value_name = "LO..HI", allow_hyphen_values = true)]
    pub stage_ratio: Option<String>,
    /// Centre distance of each stage, mm. A range LO..HI limits the standard centre distance;
    /// a single value fixes the working centre distance, reached by profile shift (and turns on
    /// the mesh checks).
    #[arg(long, value_name = "A|LO..HI", allow_hyphen_values = true)]
    pub centre_distance: Option<String>,
    /// How close a standard centre distance must be to a fixed one to need no shift, mm; for
    /// gears on hand (which are never re-cut), how far beyond their tight distance they may stand
    /// at a fixed or coaxial distance (backlash opens, the working pressure angle rises).
    #[arg(long, value_name = "MM", default_value_t = gearsieve::model::problem::DEFAULT_CENTRE_TOLERANCE_MM, allow_negative_numbers = true, value_parser = number)]
    pub centre_tol: f64,
    /// Allowed profile shift sum x1+x2 per stage, in modules [default: -0.5..1].
    #[arg(long, value_name = "LO..HI", allow_hyphen_values = true)]
    pub shift_sum: Option<String>,
    /// Work out every mesh (profile shift split against undercut, contact ratio, tip
    /// thickness) and keep only stages that run. On whenever a geometry flag is given.
    #[arg(long)]
    pub check_meshes: bool,
    /// Least transverse contact ratio of a mesh [default: 1.2, common practice].
    #[arg(long, value_name = "X", allow_negative_numbers = true, value_parser = number)]
    pub min_contact_ratio: Option<f64>,
    /// Accept undercut gears (small clock pinions are often cut so).
    #[arg(long)]
    pub allow_undercut: bool,
    /// Input and output shafts on one axis (a reverted train): every stage at one working
    /// centre distance, reached by profile shift; modules may differ.
    #[arg(long)]
    pub coaxial: bool,
    /// Tooth form of every mesh checked: involute, or cycloidal as clock wheels and pinions are
    /// cut (no shift: not with --coaxial or --shift-sum; a fixed --centre-distance mounts each
    /// pair there as it is) [default: involute]. Turns on the mesh checks.
    #[arg(long, value_enum, value_name = "FORM")]
    pub tooth_form: Option<ToothFormArg>,
    /// Say why stage pairings were left out by the mesh checks.
    #[arg(long)]
    pub explain: bool,
    /// Required output direction relative to the input.
    #[arg(long, value_enum)]
    pub direction: Option<DirectionArg>,
    /// Ranking keys, most important first: error, meshes, size (sum of teeth), span (largest
    /// pitch diameter). Ties go to fewer meshes, smaller error, smaller size, then the stages.
    #[arg(long, value_name = "KEYS", default_value = "error,meshes,size")]
    pub rank: String,
    /// Gear sets to list, each by its best arrangement; every train and gear set is counted. 0
    /// streams every train as it is found (CSV rows or JSON lines) without holding them.
    #[arg(long, value_name = "K", default_value_t = 20)]
    pub limit: usize,
    /// List every arrangement of each gear set under it (the ways of pairing its drivers with
    /// its driven gears into stages that meet every constraint), not only the best.
    #[arg(long)]
    pub arrangements: bool,
    /// List the Pareto front instead: the gear sets no other beats on error, meshes and size at
    /// once (the first K of it by --rank).
    #[arg(long)]
    pub pareto: bool,
    /// How to count the trains: every one (exact), or only those met on the way to the listed
    /// best, which stay the proven best (lower-bound: for near targets over four to six stages,
    /// where counting all would take far longer than finding the best; needs --rank led by
    /// error, no --pareto and a --limit above 0).
    #[arg(long, value_enum, value_name = "HOW", default_value = "exact")]
    pub count: CountArg,
    /// Run even when the search is forecast to take more than an hour.
    #[arg(long)]
    pub long: bool,
    /// Search only part I of N of the space (deterministic, disjoint parts; combine their JSON
    /// with `gearsieve merge`).
    #[arg(long, value_name = "I/N")]
    pub shard: Option<String>,
    /// Search engine; the exhaustive one is a slow reference.
    #[arg(long, value_enum, default_value = "fast")]
    pub engine: EngineArg,
    #[command(flatten)]
    pub buy: BuyArgs,
    #[command(flatten)]
    pub print: PrintArgs,
}

/// A validated search, ready to run.
pub struct SearchJob {
    problem: Problem,
    engine: EngineChoice,
    print: PrintArgs,
    explain: bool,
    shard: Option<Shard>,
    long: bool,
    arrangements: bool,
}

/// The module the flags give (checked here, so that with `--stock` an error names the flag and
/// not a catalogue row), with the diametral pitch it came from.
fn module_from_flags(module: Option<f64>, dp: Option<f64>) -> anyhow::Result<Option<(f64, Option<f64>)>> {
    Ok(match (module, dp) {
        (Some(m), _) => Some((check_module(m, &|e| Error::value(Quantity::Module, e))?, None)),
        (None, Some(p)) => {
            Some((check_diametral_pitch(p, &|e| Error::value(Quantity::DiametralPitch, e))?, Some(p)))
        }
        (None, None) => None,
    })
}

impl TryFrom<SearchArgs> for SearchJob {
    type Error = anyhow::Error;

    fn try_from(a: SearchArgs) -> anyhow::Result<SearchJob> {
        let target = Target::parse(&a.ratio, &a.tol)?;
        let module = module_from_flags(a.module, a.diametral_pitch)?;
        let pool = if a.stock.is_empty() {
            let teeth = a.teeth.as_deref().unwrap_or(DEFAULT_TEETH);
            let teeth = parse_int_range(teeth, Quantity::ToothRange, "teeth", MIN_TEETH, MAX_TEETH)?;
            let (m, dp) = module.unwrap_or((1.0, None));
            Pool::to_cut(teeth, m, a.pressure_angle, dp)?
        } else {
            let defaults =
                CatalogueDefaults { module_mm: module.map(|m| m.0), pressure_angle_deg: a.pressure_angle };
            load_stock(&a.stock, defaults, Quantity::Module)?
        };
        let tooth_range = |s: &Option<String>, quantity: Quantity| {
            s.as_deref().map(|s| parse_int_range(s, quantity, "teeth", MIN_TEETH, MAX_TEETH)).transpose()
        };
        let centre = a
            .centre_distance
            .as_deref()
            .map(|s| parse_length_range(s, Quantity::CentreDistance))
            .transpose()?;
        let fixed_centre = centre.filter(|c| c.is_single()).map(|c| c.lo);
        let limits = StageLimits {
            driver_teeth: tooth_range(&a.driver_teeth, Quantity::DriverTeeth)?,
            driven_teeth: tooth_range(&a.driven_teeth, Quantity::DrivenTeeth)?,
            stage_ratio: a
                .stage_ratio
                .as_deref()
                .map(|s| parse_ratio_range(s, Quantity::StageRatio))
                .transpose()?,
            centre_distance_mm: centre.filter(|c| !c.is_single()),
        };
        let stages = parse_int_range(&a.stages, Quantity::StageCount, "stages", 1, MAX_STAGES as u32)?;
        let direction = a.direction.map(|d| match d {
            DirectionArg::Same => Direction::Same,
            DirectionArg::Opposite => Direction::Opposite,
        });
        let rank = parse_rank(&a.rank)?;
        let purchase = a.buy.purchase(&pool, None, "--stock FILE")?;
        let mut problem = Problem::new(target, pool, stages, limits, direction, rank, a.limit)?;
        problem.pareto = a.pareto;
        if let Some(purchase) = purchase {
            if a.pareto {
                return Err(refuse(
                    "--buy",
                    "ranks trains by the gears they need bought first; it does not go with --pareto",
                ));
            }
            if a.limit == 0 {
                return Err(refuse(
                    "--limit",
                    "0 streams every train without ranking; it does not go with --buy, which lists the \
                     trains needing fewest gears bought first",
                ));
            }
            problem = problem.with_purchase(purchase)?;
        }
        // A listing shows gear sets; a stream hands out every train.
        problem.gear_sets = a.limit > 0;
        problem = problem.with_count(a.count.into())?;
        if a.limit == 0 {
            if a.arrangements {
                return Err(refuse("--limit", "0 streams every train; it does not go with --arrangements"));
            }
            if a.pareto {
                return Err(refuse("--limit", "0 streams every train; it does not go with --pareto"));
            }
            if matches!(a.print.format(), FormatArg::Table | FormatArg::Markdown | FormatArg::Svg) {
                return Err(refuse(
                    "--limit",
                    "0 streams every train; give --format csv, or json for JSON lines",
                ));
            }
        }
        let geometry = a.check_meshes
            || a.coaxial
            || a.allow_undercut
            || fixed_centre.is_some()
            || a.shift_sum.is_some()
            || a.min_contact_ratio.is_some()
            || a.tooth_form.is_some();
        let tooth_form = a.tooth_form.unwrap_or(ToothFormArg::Involute);
        if tooth_form == ToothFormArg::Cycloidal {
            if a.coaxial {
                return Err(refuse(
                    "--coaxial",
                    "cycloidal teeth take no shift, so a coaxial train needs a module per pair; \
                     give --tooth-form involute, or use gearsieve clock motion",
                ));
            }
            if a.shift_sum.is_some() {
                return Err(refuse(
                    "--shift-sum",
                    "cycloidal teeth take no shift; give --tooth-form involute",
                ));
            }
            if a.allow_undercut {
                return Err(refuse(
                    "--allow-undercut",
                    "belongs to involute teeth; give --tooth-form involute",
                ));
            }
        }
        if geometry {
            let mut rules = MeshRules {
                tooth_form: tooth_form.into(),
                centre_distance_mm: fixed_centre,
                centre_tolerance_mm: a.centre_tol,
                coaxial: a.coaxial,
                limits: MeshLimits { allow_undercut: a.allow_undercut, ..MeshLimits::default() },
                ..MeshRules::default()
            };
            if let Some(s) = &a.shift_sum {
                rules.shift_sum = parse_signed_range(s, Quantity::ShiftSum, "modules")?;
            }
            if let Some(c) = a.min_contact_ratio {
                rules.limits.min_contact_ratio = c;
            }
            problem = problem.with_mesh_rules(rules)?;
        } else if a.explain {
            return Err(refuse(
                "--explain",
                "explains the mesh checks; give --check-meshes, a fixed --centre-distance or --coaxial too",
            ));
        }
        let engine = match a.engine {
            EngineArg::Fast => EngineChoice::Auto,
            EngineArg::Sieve => EngineChoice::Sieve,
            EngineArg::Exhaustive => EngineChoice::Exhaustive,
        };
        Ok(SearchJob {
            problem,
            engine,
            shard: a.shard.as_deref().map(Shard::parse).transpose()?,
            print: a.print,
            explain: a.explain,
            long: a.long,
            arrangements: a.arrangements,
        })
    }
}

impl Job for SearchJob {
    type Found = gearsieve::Outcome;

    fn search(&self, options: &RunOptions) -> anyhow::Result<gearsieve::Outcome> {
        let options = RunOptions {
            progress: options.progress,
            cancel: options.cancel,
            shard: options.shard,
            list_arrangements: self.arrangements,
        };
        Ok(gearsieve::search(&self.problem, self.engine, &options))
    }

    fn report<'a>(&'a self, found: &'a gearsieve::Outcome) -> Box<dyn Report + 'a> {
        Box::new(SearchReport {
            problem: &self.problem,
            outcome: found,
            explain: self.explain,
            shard: self.shard,
        })
    }

    fn words(&self, _found: &gearsieve::Outcome) -> Words {
        words(self)
    }

    fn forecast(&self) -> anyhow::Result<Option<Outlook<'_>>> {
        let engine = if self.problem.limit == 0 { self.engine.streaming() } else { self.engine };
        Ok(Some(Outlook {
            searches: vec![(Cow::Borrowed(&self.problem), engine)],
            long: self.long,
            shard: self.shard,
            narrow: hints::narrow_search(&self.problem),
            can_shard: true,
            can_count_less: self.problem.count == CountMode::Exact
                && gearsieve::engine::window::would_serve(&self.problem),
        }))
    }

    fn shard(&self) -> Option<Shard> {
        self.shard
    }
}

/// Run `gearsieve search`.
pub fn run(args: SearchArgs) -> anyhow::Result<i32> {
    let job = SearchJob::try_from(args)?;
    let print = Print::from(&job.print);
    if job.problem.limit == 0 {
        run::forecast(job.forecast()?, &print)?;
        let bar = Bar::new(print.quiet);
        let progress = |p| bar.update(p);
        let options = RunOptions {
            progress: Some(&progress),
            cancel: Some(&super::CANCEL),
            shard: job.shard,
            list_arrangements: false,
        };
        let code = stream(&job, &print, &options);
        bar.finish();
        return code;
    }
    run::run(&job, &print)
}

/// `--limit 0`: write every train as it is found, CSV rows or JSON lines, ending JSON with a
/// summary line.
fn stream(job: &SearchJob, print: &Print, options: &RunOptions) -> anyhow::Result<i32> {
    let path = print.output.as_deref();
    let mut sink = super::output::Sink::open(path)?;
    let p = &job.problem;
    let result = run::with_threads(print.threads, || -> Result<gearsieve::Outcome, RenderError> {
        let mut stream = Stream::start(p, print.format, sink.writer())?;
        let o = gearsieve::engine::search_each(p, job.engine, options, &mut |t| stream.train(t))?;
        stream.finish(p, &o)?;
        Ok(o)
    })?;
    let outcome = match result {
        Ok(o) => o,
        Err(RenderError::Io(e)) => return super::output::quiet_broken_pipe(Err(e), path).map(|_| EXIT_OK),
        Err(e) => return Err(anyhow::anyhow!("--format: {e}")),
    };
    match sink.commit(outcome.complete) {
        Ok(Some(kept)) if !outcome.complete => super::output::say_kept(&kept),
        Ok(_) => {}
        Err(e) => return super::output::quiet_broken_pipe(Err(e), path).map(|_| EXIT_OK),
    }
    Ok(run::status(outcome.complete, outcome.count > 0, &words(job)))
}

/// What `search` says when interrupted or when nothing was found.
fn words(job: &SearchJob) -> Words {
    Words {
        interrupted: Some("the trains above are the best found so far and the count is a lower bound".into()),
        nothing: Some(hints::nothing_from_search(&job.problem)),
    }
}
