//! `gearsieve thread` and `gearsieve chart`: change gears for a thread on a lathe, and a chart of
//! the best setup for every thread of a series. The clap structs mirror the flags; `TryFrom`
//! turns them into a validated [`Lathe`] and the thread or series to run.

use std::borrow::Cow;
use std::path::PathBuf;

use clap::{ArgGroup, Args};
use gearsieve::model::catalog::CatalogueDefaults;
use gearsieve::model::pool::{check_module, Pool, MAX_STAGES, MAX_TEETH, MIN_TEETH};
use gearsieve::model::purchase::Purchase;
use gearsieve::numbers::length::{parse_length, LengthUnit};
use gearsieve::numbers::range::{parse_int_range, parse_length_range, IntRange};
use gearsieve::numbers::rational::Ratio;
use gearsieve::numbers::target::{parse_ratio, parse_tolerance};
use gearsieve::report::thread::{BuyChartReport, ChartReport, ThreadReport};
use gearsieve::report::Report;
use gearsieve::trades::thread::banjo::{load_banjo, Banjo};
use gearsieve::trades::thread::chart::{chart, Chart};
use gearsieve::trades::thread::chart_buy::{buy_chart, BuyChart, MOST_TO_BUY};
use gearsieve::trades::thread::feed::parse_feed;
use gearsieve::trades::thread::lathe_file::{load_lathe, LatheFile};
use gearsieve::trades::thread::machine::{parse_gearbox, Machine};
use gearsieve::trades::thread::pitch::{parse_leadscrew, parse_pitch};
use gearsieve::trades::thread::series::{built_in, load_list, SeriesEntry};
use gearsieve::trades::thread::{
    Equipment, Lathe, Rejected, ThreadPlan, ThreadSpec, MAX_TOLERANCE, USUAL_CHANGE_GEARS,
};
use gearsieve::{Error, Problem, Quantity, RunOptions};

use super::args::{load_stock, number, PrintArgs};
use super::buy::BuyArgs;
use super::flags::{flag_for, refuse};
use super::hints;
use super::run::{self, either, Job, Outlook, Print, Words};

/// The lathe and its change gears, shared by `thread` and `chart`.
#[derive(Args, Debug)]
pub struct LatheArgs {
    /// The lathe described once, in a lathe file (leadscrew, gearbox, banjo, gears on hand,
    /// guard, tumbler reverse, thread dial); the options below override what it says.
    #[arg(long, value_name = "FILE")]
    pub lathe: Option<PathBuf>,
    /// The leadscrew: threads per inch (8tpi) or a metric pitch (3mm).
    #[arg(long, value_name = "PITCH")]
    pub leadscrew: Option<String>,
    /// Fixed ratio from spindle to stud, spindle turns per stud turn (1, 2, 1/2); default 1.
    #[arg(long, value_name = "R")]
    pub stud_ratio: Option<String>,
    /// Gearbox between the change gears and the leadscrew: a list NAME=RATIO,… (A=2,B=1,C=1/2)
    /// or a file of NAME = RATIO lines; ratios are input turns per leadscrew turn. Each setup
    /// names the position it uses.
    #[arg(long, value_name = "LIST|FILE")]
    pub gearbox: Option<String>,
    /// Change gears on hand, from a CSV catalogue (repeatable); each used at most its quantity.
    #[arg(long, value_name = "FILE")]
    pub stock: Vec<PathBuf>,
    /// Change gears to be cut instead: every tooth count in LO..HI, any number of each.
    #[arg(long, value_name = "LO..HI", conflicts_with = "stock")]
    pub teeth: Option<String>,
    /// Module in mm for --teeth (default 1), or for catalogue rows that give none.
    #[arg(long, value_name = "MM", allow_negative_numbers = true, value_parser = number)]
    pub module: Option<f64>,
    /// Pressure angle in degrees for --teeth, and for catalogue rows that give none (default 20).
    #[arg(long, value_name = "DEG", allow_negative_numbers = true, value_parser = number)]
    pub pressure_angle: Option<f64>,
    /// Banjo geometry from a file (stud_to_leadscrew_mm, intermediate_from_leadscrew_mm,
    /// shaft_diameter_mm); setups that cannot be set up on it are rejected.
    #[arg(long, value_name = "FILE", conflicts_with_all = ["stud_to_leadscrew", "intermediate_range", "shaft_diameter"])]
    pub banjo: Option<PathBuf>,
    /// Banjo: distance between the stud and leadscrew axes, mm (or with a unit: 4.5in).
    #[arg(long, value_name = "MM", requires_all = ["intermediate_range", "shaft_diameter"], allow_hyphen_values = true)]
    pub stud_to_leadscrew: Option<String>,
    /// Banjo: distances from the leadscrew the intermediate stud can take, LO..HI mm.
    #[arg(long, value_name = "LO..HI", requires_all = ["stud_to_leadscrew", "shaft_diameter"], allow_hyphen_values = true)]
    pub intermediate_range: Option<String>,
    /// Banjo: diameter of the shafts and spacers the gears must clear, mm (or with a unit).
    #[arg(long, value_name = "MM", requires_all = ["stud_to_leadscrew", "intermediate_range"], allow_hyphen_values = true)]
    pub shaft_diameter: Option<String>,
    /// Change-gear stages: 1 is a simple train through an idler, 2 a compound train; N or A..B.
    #[arg(long, value_name = "N|A..B", default_value = "1..2")]
    pub stages: String,
    /// Pitch tolerance |pitch cut / pitch − 1| ≤ T: 0 (exact), 0.1%, 50ppm; at most 10%.
    #[arg(long, value_name = "T", default_value = "0.1%", allow_hyphen_values = true)]
    pub tol: String,
    /// Run even when the search is forecast to take more than an hour.
    #[arg(long)]
    pub long: bool,
    #[command(flatten)]
    pub print: PrintArgs,
}

/// Change gears for one thread on a lathe: the best setups, with the pitch each cuts.
///
/// Lead = starts × pitch. Each setup names the gear in each position (stud, idler or
/// intermediate driven and driver, leadscrew), the pitch it cuts, the pitch error and the lead
/// error over 100 mm (inch per inch for inch threads).
#[derive(Args, Debug)]
#[command(group(ArgGroup::new("what").required(true).args(["pitch", "feed"])))]
pub struct ThreadArgs {
    /// The thread: 1.25mm, 11tpi, module:2 (worm, axial pitch π·m) or dp:16 (worm, π/P inch).
    #[arg(long, value_name = "PITCH")]
    pub pitch: Option<String>,
    /// A turning feed instead, per spindle turn: 0.1mm or 0.004in (same ranking and banjo
    /// checks as a thread).
    #[arg(long, value_name = "LENGTH", conflicts_with_all = ["pitch", "starts"])]
    pub feed: Option<String>,
    /// Starts of a multi-start thread (default 1).
    #[arg(long, value_name = "N")]
    pub starts: Option<u32>,
    /// Also list trains that cut the thread but cannot be set up on the banjo, and why.
    #[arg(long)]
    pub explain: bool,
    /// Setups to list, each gear set once by its best arrangement on the machine; every setup
    /// and gear set is counted.
    #[arg(long, value_name = "K", default_value_t = 10)]
    pub limit: usize,
    /// List every arrangement of each gear set under it (the other ways of pairing its gears
    /// into stages that cut the thread and fit the machine), not only the best.
    #[arg(long)]
    pub arrangements: bool,
    #[command(flatten)]
    pub buy: BuyArgs,
    #[command(flatten)]
    pub lathe: LatheArgs,
}

/// A chart of the best setup for every thread of a series, to print and keep by the machine.
#[derive(Args, Debug)]
#[command(group(ArgGroup::new("thread_list").required(true).args(["series", "list"])))]
pub struct ChartArgs {
    /// Built-in series: iso-coarse, iso-fine, iso-fine-sizes (ISO 261/262), unc, unf (ASME B1.1),
    /// bsw, bsf (BS 84), ba (BS 93), pipe-g (ISO 228-1), me (32 and 40 TPI), trapezoidal
    /// (ISO 2904), module-worms, dp-worms.
    #[arg(long, value_name = "NAME")]
    pub series: Option<String>,
    /// A list file instead: one thread a line, LABEL, PITCH or just PITCH.
    #[arg(long, value_name = "FILE")]
    pub list: Option<PathBuf>,
    /// With --buy, how many choices to list (default 10; all are counted). Not for a plain
    /// chart, which lists one setup per thread.
    #[arg(long, value_name = "K", allow_hyphen_values = true)]
    pub limit: Option<String>,
    /// Which N gears (1 to 3), added to the gears on hand, make the most threads of the series
    /// cuttable within the tolerance: the best choices with the threads each gains (setups of
    /// one and two stages).
    #[arg(long, value_name = "N")]
    pub buy: Option<usize>,
    /// With --buy, the tooth counts on offer, LO..HI (default 20..127).
    #[arg(long, value_name = "LO..HI", requires = "buy")]
    pub buy_teeth: Option<String>,
    /// With --buy, the module of the gears to buy, mm: one the gears on hand come in [default:
    /// theirs, when they all share one]; the gears bought take that module's pressure angle.
    #[arg(long, value_name = "MM", requires = "buy", allow_negative_numbers = true, value_parser = number)]
    pub buy_module: Option<f64>,
    #[command(flatten)]
    pub lathe: LatheArgs,
}

/// The banjo the flags describe, if they describe one (they override the lathe file's).
fn banjo_from(a: &LatheArgs) -> Result<Option<Banjo>, Error> {
    if let Some(path) = &a.banjo {
        return load_banjo(path).map(Some);
    }
    match (&a.stud_to_leadscrew, &a.intermediate_range, &a.shaft_diameter) {
        (Some(d), Some(r), Some(s)) => {
            let mm = |text: &str, quantity| -> Result<f64, Error> {
                Ok(parse_length(text, quantity, Some(LengthUnit::Millimetre))?.mm_f64())
            };
            let range = parse_length_range(r, Quantity::IntermediateRange)?;
            let (d, s) = (mm(d, Quantity::StudToLeadscrew)?, mm(s, Quantity::ShaftDiameter)?);
            Banjo::new(d, range, s, &|q, m| Error::value(q, m)).map(Some)
        }
        _ => Ok(None),
    }
}

/// The gears on hand: `--teeth` or `--stock` when given, else the lathe file's.
fn pool_from(a: &LatheArgs, file: Option<&LatheFile>) -> anyhow::Result<Pool> {
    let pressure_angle = a.pressure_angle.unwrap_or(20.0);
    if let Some(t) = &a.teeth {
        let teeth = parse_int_range(t, Quantity::ToothRange, "teeth", MIN_TEETH, MAX_TEETH)?;
        return Ok(Pool::to_cut(teeth, a.module.unwrap_or(1.0), pressure_angle, None)?);
    }
    if !a.stock.is_empty() {
        let defaults = CatalogueDefaults { module_mm: a.module, pressure_angle_deg: pressure_angle };
        return Ok(load_stock(&a.stock, defaults, Quantity::Module)?);
    }
    if let Some(f) = file {
        if let Some(m) = a.module {
            check_module(m, &|e| Error::value(Quantity::Module, e))?;
        }
        if let Some(gears) = f.stock(a.module, a.pressure_angle)? {
            let source = f.gears_source();
            return Ok(Pool::from_stock_at(&gears, &|m| {
                Error::value(Quantity::Lathe, format!("{source}: {m}"))
            })?);
        }
    }
    Err(refuse(
        "--stock",
        "give the change gears on hand as a catalogue FILE, a range to cut with --teeth LO..HI, or a \
         --lathe file that lists them",
    ))
}

/// The lathe the flags (and the lathe file they name) describe, listing `limit` setups per
/// thread. Each flag given overrides the file.
fn lathe(a: &LatheArgs, limit: usize) -> anyhow::Result<Lathe> {
    let file = a.lathe.as_deref().map(load_lathe).transpose()?;
    let leadscrew = match (&a.leadscrew, file.as_ref().and_then(|f| f.leadscrew.clone())) {
        (Some(text), _) => parse_leadscrew(text)?,
        (None, Some(p)) => p,
        (None, None) => {
            return Err(refuse(
                "--leadscrew",
                "give the leadscrew's pitch (8tpi, 3mm), or a --lathe file with a leadscrew = line",
            ))
        }
    };
    let stud_ratio = match (&a.stud_ratio, file.as_ref().and_then(|f| f.stud_ratio)) {
        (Some(text), _) => parse_ratio(text, Quantity::StudRatio)?,
        (None, Some(r)) => r,
        (None, None) => Ratio::integer(1),
    };
    let gearbox = match &a.gearbox {
        Some(text) => parse_gearbox(text)?,
        None => file.as_ref().map(|f| f.gearbox.clone()).unwrap_or_default(),
    };
    let pool = pool_from(a, file.as_ref())?;
    let banjo = match banjo_from(a)? {
        Some(b) => Some(b),
        None => file.as_ref().and_then(|f| f.banjo.clone()),
    };
    let stages = parse_int_range(&a.stages, Quantity::StageCount, "stages", 1, MAX_STAGES as u32)?;
    let tolerance = parse_tolerance(&a.tol)?;
    let machine = Machine { leadscrew, stud_ratio, gearbox };
    let equipment = match file {
        Some(f) => Equipment {
            name: f.name,
            largest_teeth: f.largest_teeth,
            left_out: Vec::new(),
            tumbler_reverse: f.tumbler_reverse,
            dial: f.dial,
        },
        None => Equipment::default(),
    };
    Ok(Lathe::new(machine, pool, banjo, stages, tolerance, limit)?.equipped(equipment)?)
}

/// Ways to get more setups from this lathe, in its flags: a looser tolerance while one is
/// allowed, more stages while a train may have more, more gears.
fn more_setups(lathe: &Lathe) -> Vec<String> {
    let mut hints = Vec::new();
    if lathe.tolerance < MAX_TOLERANCE {
        hints.push("a looser --tol".to_string());
    }
    hints.extend(hints::more_stages(lathe.stages));
    hints.extend(hints::more_gears(&lathe.pool, "--teeth"));
    hints
}

/// How a lathe search that would run for hours could be made smaller, in its flags.
fn narrow_lathe(lathe: &Lathe) -> Vec<String> {
    let mut narrow = Vec::new();
    if lathe.stages.hi > 1 {
        narrow.push("fewer --stages".to_string());
    }
    if !lathe.pool.from_stock && lathe.pool.gears.len() > 1 {
        narrow.push("a narrower --teeth range".into());
    }
    if !lathe.tolerance.is_zero() {
        narrow.push("a tighter --tol".into());
    }
    narrow
}

/// The forecast of `problems`, searched with the trades' engine.
fn lathe_outlook<'a>(problems: Vec<Problem>, lathe: &Lathe, long: bool) -> Outlook<'a> {
    Outlook {
        searches: problems.into_iter().map(|p| (Cow::Owned(p), gearsieve::trades::ENGINE)).collect(),
        long,
        shard: None,
        narrow: narrow_lathe(lathe),
        can_shard: false,
        can_count_less: false,
    }
}

/// What a lathe command says after nothing was found: `{first} Try {hints}.`, with a pointer to
/// `--explain` when the banjo may have refused setups and it was not given.
fn lathe_nothing(first: String, hints: &[String], point_to_explain: bool) -> String {
    let explain = "--explain shows what the banjo refused";
    match (hints.is_empty(), point_to_explain) {
        (false, true) => format!("{first} Try {}; {explain}.", either(hints)),
        (false, false) => format!("{first} Try {}.", either(hints)),
        (true, true) => format!("{first} {explain}."),
        (true, false) => first,
    }
}

/// A validated thread search.
struct ThreadJob {
    lathe: Lathe,
    spec: ThreadSpec,
    explain: bool,
    /// `--arrangements`: list every arrangement of each gear set.
    arrangements: bool,
    /// `--long`: run whatever the forecast.
    long: bool,
}

impl Job for ThreadJob {
    type Found = (ThreadPlan, Option<Vec<Rejected>>);

    fn search(&self, options: &RunOptions) -> anyhow::Result<Self::Found> {
        let listing = RunOptions { list_arrangements: self.arrangements, ..*options };
        let plan = self.lathe.plan(&self.spec, &listing)?;
        let rejected = if self.explain { Some(self.lathe.explain(&self.spec, options)?) } else { None };
        Ok((plan, rejected))
    }

    fn report<'a>(&'a self, found: &'a Self::Found) -> Box<dyn Report + 'a> {
        Box::new(ThreadReport { lathe: &self.lathe, plan: &found.0, rejected: found.1.as_deref() })
    }

    fn words(&self, _found: &Self::Found) -> Words {
        let hints = more_setups(&self.lathe);
        // --explain is named only when a banjo may have refused setups and it was not given.
        let point_to_explain = self.lathe.banjo.is_some() && !self.explain;
        let what = if self.spec.feed { "gives the feed" } else { "cuts" };
        let first = format!("no setup {what} {} within the tolerance from these gears.", self.spec.pitch);
        Words {
            interrupted: Some("the setups above are the best found so far".into()),
            nothing: Some(lathe_nothing(first, &hints, point_to_explain)),
        }
    }

    fn forecast(&self) -> anyhow::Result<Option<Outlook<'_>>> {
        let problems = self.lathe.problems(&self.spec, self.explain)?;
        Ok(Some(lathe_outlook(problems, &self.lathe, self.long)))
    }
}

/// Run `gearsieve thread`.
pub fn run_thread(args: ThreadArgs) -> anyhow::Result<i32> {
    let mut lathe = lathe(&args.lathe, args.limit)?;
    // Gears to buy default to the gears on hand's range widened to the usual change gears, as
    // far as the guard closes over them.
    let usual = USUAL_CHANGE_GEARS;
    let widen = IntRange { hi: lathe.equipment.largest_teeth.map_or(usual.hi, |z| z.min(usual.hi)), ..usual };
    if let Some(p) =
        args.buy.purchase(&lathe.pool, Some(widen), "--stock FILE or a --lathe file that lists them")?
    {
        lathe = lathe.buying(p)?;
    }
    let starts = args.starts.unwrap_or(1);
    if starts == 0 {
        return Err(refuse("--starts", "a thread has at least one start"));
    }
    let spec = match (&args.pitch, &args.feed) {
        (Some(p), _) => ThreadSpec::thread(parse_pitch(p)?, starts),
        (None, Some(f)) => ThreadSpec::feed(parse_feed(f)?),
        (None, None) => return Err(anyhow::anyhow!("give --pitch PITCH or --feed LENGTH")),
    };
    let job = ThreadJob {
        lathe,
        spec,
        explain: args.explain,
        arrangements: args.arrangements,
        long: args.lathe.long,
    };
    run::run(&job, &Print::from(&args.lathe.print))
}

/// A validated chart.
struct ChartJob {
    lathe: Lathe,
    name: String,
    series: Vec<SeriesEntry>,
    /// `--long`: run whatever the forecast.
    long: bool,
}

impl Job for ChartJob {
    type Found = Chart;

    fn search(&self, options: &RunOptions) -> anyhow::Result<Chart> {
        Ok(chart(&self.lathe, &self.series, options)?)
    }

    fn report<'a>(&'a self, found: &'a Chart) -> Box<dyn Report + 'a> {
        Box::new(ChartReport { lathe: &self.lathe, series: &self.name, chart: found })
    }

    fn words(&self, _found: &Chart) -> Words {
        let first = format!("no thread of {} can be cut within the tolerance from these gears.", self.name);
        Words {
            interrupted: Some("the chart above stops early".into()),
            nothing: Some(lathe_nothing(first, &more_setups(&self.lathe), false)),
        }
    }

    fn forecast(&self) -> anyhow::Result<Option<Outlook<'_>>> {
        // Each row is one thread's search (the nearest pitch of a thread out of reach is looked
        // for only then, so it is not weighed here).
        let mut problems = Vec::new();
        for e in &self.series {
            let thread = ThreadSpec::thread(e.pitch.clone(), 1);
            problems.extend(self.lathe.problems(&thread, false)?);
        }
        Ok(Some(lathe_outlook(problems, &self.lathe, self.long)))
    }

    fn shows_progress(&self) -> bool {
        false
    }
}

/// A validated search for the gears to buy for a chart.
struct BuyJob {
    lathe: Lathe,
    name: String,
    series: Vec<SeriesEntry>,
    purchase: Purchase,
    limit: usize,
}

impl Job for BuyJob {
    type Found = BuyChart;

    fn search(&self, options: &RunOptions) -> anyhow::Result<BuyChart> {
        Ok(buy_chart(&self.lathe, &self.series, &self.purchase, self.limit, options)?)
    }

    fn report<'a>(&'a self, found: &'a BuyChart) -> Box<dyn Report + 'a> {
        Box::new(BuyChartReport { lathe: &self.lathe, series: &self.name, chart: found })
    }

    fn words(&self, found: &BuyChart) -> Words {
        let first = if found.rows.iter().all(|r| r.on_hand) {
            format!(
                "every thread of {} is cut within the tolerance from the gears on hand; nothing to buy.",
                self.name
            )
        } else {
            format!(
                "no choice of up to {} gears of {} teeth makes another thread of {} cuttable.",
                self.purchase.most, self.purchase.teeth, self.name
            )
        };
        Words {
            interrupted: Some("the choices above weigh only the threads done".into()),
            nothing: Some(first),
        }
    }

    fn shows_progress(&self) -> bool {
        false
    }
}

/// The gears on offer that `--buy`, `--buy-teeth` and `--buy-module` describe, for `lathe`: the
/// same purchase as `thread --buy` makes, added to the lathe's gears on hand.
fn purchase(args: &ChartArgs, most: usize, lathe: &Lathe) -> anyhow::Result<Purchase> {
    if most == 0 || most > MOST_TO_BUY {
        return Err(refuse("--buy", format!("give how many gears to buy, 1 to {MOST_TO_BUY}; found {most}")));
    }
    let text = args.buy_teeth.as_deref().unwrap_or("20..127");
    let teeth = parse_int_range(text, Quantity::ToothRange, "buy-teeth", MIN_TEETH, MAX_TEETH)
        .map_err(|e| refuse("--buy-teeth", e.detail().render(flag_for)))?;
    if let Some(largest) = lathe.equipment.largest_teeth {
        if teeth.hi > largest {
            return Err(refuse(
                "--buy-teeth",
                format!(
                    "the guard closes over gears of at most {largest} teeth; give a range up to {largest}"
                ),
            ));
        }
    }
    if let Some(m) = args.buy_module {
        check_module(m, &|e| Error::problem(e)).map_err(|e| refuse("--buy-module", e))?;
    }
    if lathe.stages.hi > 2 {
        return Err(refuse("--buy", "works out setups of one and two stages; give --stages 1..2 or less"));
    }
    // Gears bought mesh with those on hand: their module and pressure angle.
    let most = u32::try_from(most).unwrap_or(u32::MAX);
    Ok(Purchase::new(lathe.pool.clone(), most, Some(teeth), args.buy_module)?)
}

/// Run `gearsieve chart`.
pub fn run_chart(args: ChartArgs) -> anyhow::Result<i32> {
    if let Some(most) = args.buy {
        let limit = match args.limit.as_deref() {
            None => 10,
            Some(t) => match t.trim().parse::<usize>() {
                Ok(k) if k > 0 => k,
                _ => {
                    return Err(refuse(
                        "--limit",
                        format!("give how many choices to list, at least 1; found \"{t}\""),
                    ))
                }
            },
        };
        let lathe = lathe(&args.lathe, 1)?;
        let purchase = purchase(&args, most, &lathe)?;
        let (name, series) = series_of(&args)?;
        let job = BuyJob { lathe, name, series, purchase, limit };
        return run::run(&job, &Print::from(&args.lathe.print));
    }
    if args.limit.is_some() {
        return Err(refuse(
            "--limit",
            "a chart lists only the best setup of each thread; gearsieve thread --pitch P lists more \
             setups of one thread",
        ));
    }
    // A chart lists one setup per thread.
    let lathe = lathe(&args.lathe, 1)?;
    let (name, series) = series_of(&args)?;
    run::run(&ChartJob { lathe, name, series, long: args.lathe.long }, &Print::from(&args.lathe.print))
}

/// The series a chart's flags name, with its name or file.
fn series_of(args: &ChartArgs) -> anyhow::Result<(String, Vec<SeriesEntry>)> {
    Ok(match (&args.series, &args.list) {
        (Some(s), _) => (s.clone(), built_in(s)?),
        (None, Some(f)) => (f.display().to_string(), load_list(f)?),
        (None, None) => return Err(anyhow::anyhow!("give --series NAME or --list FILE")),
    })
}
