//! `gearsieve planetary`: planetary trains from a ratio, tooth ranges for sun, planets and ring,
//! the planet count, the member held and the member driving, and the module. The clap struct
//! mirrors the flags; `TryFrom` turns it into a [`PlanetaryProblem`], and the job runs it, says
//! why designs were left out when asked, and, when nothing is found, tries the changes a
//! designer would reach for and names those that would each find designs.

use clap::{Args, ValueEnum};
use gearsieve::geometry::MeshLimits;
use gearsieve::model::catalog::{self, CatalogueDefaults};
use gearsieve::model::pool::fmt_num;
use gearsieve::model::pool::MeshGroup;
use gearsieve::model::train::Direction;
use gearsieve::numbers::range::{parse_int_range, parse_signed_range, IntRange};
use gearsieve::numbers::rational::Ratio;
use gearsieve::numbers::target::{parse_ratio, parse_tolerance};
use gearsieve::report::planetary::{Asked, PlanetaryReport};
use gearsieve::report::Report;
use gearsieve::trades::planetary::PlanetaryStock;
use gearsieve::trades::planetary::{
    check_design, search, search_with, Arrangement, Member, PlanetaryOutcome, PlanetaryProblem,
    PlanetarySpec, Spacing, MAX_PLANETS, MAX_TEETH, MIN_TEETH,
};
use gearsieve::{Quantity, RunOptions};

use super::args::PrintArgs;
use super::flags::refuse;
use super::run::{self, Job, Print, Words};

/// Sun teeth when `--sun` is not given: from 18, the fewest teeth an unshifted gear of the
/// 20° ISO 53 rack has without undercut (2/sin²20° = 17.1), to 60, a large sun at module 1.
pub const DEFAULT_SUN: &str = "18..60";

/// Ring teeth when `--ring` is not given.
pub const DEFAULT_RING: &str = "40..200";

/// The gears on hand of every `--stock` catalogue that mesh at the module and pressure angle
/// asked: external gears and rings (rows with `internal` = yes) by teeth, and how many gears of
/// other modules or pressure angles are left out (the listing says so).
fn load_planetary_stock(a: &PlanetaryArgs) -> anyhow::Result<PlanetaryStock> {
    let defaults = CatalogueDefaults { module_mm: Some(a.module), pressure_angle_deg: a.pressure_angle };
    let group =
        MeshGroup { module_mm: a.module, pressure_angle_deg: a.pressure_angle, diametral_pitch: None };
    let mut stock = PlanetaryStock::default();
    for file in &a.stock {
        for g in catalog::load(file, defaults)? {
            if !group.meshes_with(g.module_mm, g.pressure_angle_deg) {
                stock.left_out += u64::from(g.quantity);
                continue;
            }
            if g.made.is_some_and(|m| m.shift != 0.0 || m.tip_diameter_mm.is_some()) {
                return Err(refuse(
                    "--stock",
                    format!(
                        "{}: the {}-tooth gear is given a shift or a measured tip; planetary trains take \
                         gears on hand as cut standard, so leave those cells empty or the row out",
                        file.display(),
                        g.teeth
                    ),
                ));
            }
            let shelf = if g.internal { &mut stock.rings } else { &mut stock.gears };
            let n = shelf.entry(g.teeth).or_default();
            *n = n.saturating_add(g.quantity);
        }
    }
    Ok(stock)
}

/// A member of the train, as the flags name it.
#[derive(Clone, Copy, Debug, PartialEq, Eq, ValueEnum)]
pub enum MemberArg {
    /// The sun gear.
    Sun,
    /// The ring gear.
    Ring,
    /// The planet carrier.
    Carrier,
}

impl From<MemberArg> for Member {
    fn from(m: MemberArg) -> Member {
        match m {
            MemberArg::Sun => Member::Sun,
            MemberArg::Ring => Member::Ring,
            MemberArg::Carrier => Member::Carrier,
        }
    }
}

/// The direction flag.
#[derive(Clone, Copy, Debug, PartialEq, Eq, ValueEnum)]
pub enum TurnArg {
    /// The output turns the same way as the input.
    Same,
    /// The output turns against the input.
    Opposite,
}

/// The spacing flag.
#[derive(Clone, Copy, Debug, PartialEq, Eq, ValueEnum)]
pub enum SpacingArg {
    /// At equal angles, 360°/N apart; (Zs + Zr)/N must be whole for a simple train.
    Equal,
    /// At the places nearest to equal spacing where a planet fits, when equal spacing cannot be
    /// assembled (the carrier's bores then at those angles).
    NearEqual,
}

/// The flags of `gearsieve planetary` (its help is the doc comment of its `Command` variant).
#[derive(Args, Debug)]
pub struct PlanetaryArgs {
    /// Ratio wanted, input turns per output turn: 5, 4.5, 37/8 or 7:1.
    #[arg(long, short, value_name = "R", allow_hyphen_values = true)]
    pub ratio: String,
    /// Relative tolerance on the ratio: 1%, 0.1%, 50ppm, 0 (exact).
    #[arg(long, value_name = "T", default_value = "1%", allow_hyphen_values = true)]
    pub tol: String,
    /// Sun teeth [default: 18..60, the least without undercut at 20°; with --stock, the external
    /// gears on hand; the two-ring train has no sun].
    #[arg(long, value_name = "LO..HI", allow_hyphen_values = true)]
    pub sun: Option<String>,
    /// Planet teeth: every planet gear without a range of its own [default: 18..60; with
    /// --stock, the external gears on hand].
    #[arg(long, value_name = "LO..HI", allow_hyphen_values = true)]
    pub planet: Option<String>,
    /// Teeth of the planet gear meshing the ring, with --stepped (or the held ring, with
    /// --two-ring) [default: as --planet].
    #[arg(long, value_name = "LO..HI", allow_hyphen_values = true)]
    pub planet_ring: Option<String>,
    /// Teeth of the planet gear meshing the output ring, with --two-ring [default: as --planet].
    #[arg(long, value_name = "LO..HI", allow_hyphen_values = true)]
    pub planet_ring2: Option<String>,
    /// Ring teeth (the held ring, with --two-ring) [default: 40..200; with --stock, the rings on
    /// hand].
    #[arg(long, value_name = "LO..HI", allow_hyphen_values = true)]
    pub ring: Option<String>,
    /// Teeth of the output ring, with --two-ring [default: as --ring].
    #[arg(long, value_name = "LO..HI", allow_hyphen_values = true)]
    pub ring2: Option<String>,
    /// Planets on the carrier: N or A..B.
    #[arg(long, value_name = "N|A..B", default_value = "3", allow_hyphen_values = true)]
    pub planets: String,
    /// The member held still [default: ring].
    #[arg(long, value_enum)]
    pub fixed: Option<MemberArg>,
    /// The driving member; the third member is the output [default: sun, or the ring when the
    /// sun is held].
    #[arg(long, value_enum)]
    pub input: Option<MemberArg>,
    /// Stepped planets: a gear meshing the sun and one meshing the ring on each planet shaft
    /// (i = 1 + Zr·Zp1/(Zs·Zp2) with the ring held and the sun driving).
    #[arg(long)]
    pub stepped: bool,
    /// Two-ring train: no sun; stepped planets mesh a held ring (--ring) and an output ring
    /// (--ring2); the carrier drives. Very high ratios from few parts.
    #[arg(long)]
    pub two_ring: bool,
    /// Required output direction relative to the input.
    #[arg(long, value_enum)]
    pub direction: Option<TurnArg>,
    /// Module of every gear, mm.
    #[arg(long, value_name = "MM", default_value_t = 1.0, allow_negative_numbers = true)]
    pub module: f64,
    /// Pressure angle, degrees (ISO 53 type A basic rack).
    #[arg(long, value_name = "DEG", default_value_t = 20.0, allow_negative_numbers = true)]
    pub pressure_angle: f64,
    /// How the planets are placed round the carrier.
    #[arg(long, value_enum, default_value = "equal")]
    pub spacing: SpacingArg,
    /// Least gap between the tip circles of neighbouring planets, mm.
    #[arg(long, value_name = "MM", default_value_t = 1.0, allow_negative_numbers = true)]
    pub tip_clearance: f64,
    /// Profile shift allowed per mesh, in modules: the sum x_sun + x_planet of the sun mesh and
    /// the difference x_ring − x_planet of a ring mesh. With it, tooth counts that are not
    /// coaxial unshifted are made coaxial by shift [default: 0..0, coaxial unshifted only].
    #[arg(long, value_name = "LO..HI", allow_hyphen_values = true)]
    pub shift_sum: Option<String>,
    /// How far beyond midway between the two meshes' standard centre distances the carrier's
    /// centre distance is set, in modules. A positive offset gives both meshes positive shift,
    /// which full-depth ring meshes usually need to pass --check-meshes.
    #[arg(long, value_name = "MODULES", default_value_t = 0.0, allow_negative_numbers = true)]
    pub carrier_offset: f64,
    /// Work out both meshes of every design (undercut, tip thickness, contact ratio, the
    /// interferences of ring meshes) and keep only designs whose meshes run.
    #[arg(long)]
    pub check_meshes: bool,
    /// Count the candidates left out by the first condition each fails; with one tooth count
    /// per gear, list every condition that design fails.
    #[arg(long)]
    pub explain: bool,
    /// Designs to list; all are counted.
    #[arg(long, value_name = "K", default_value_t = 10)]
    pub limit: usize,
    /// Stock catalogue (CSV; repeatable): only gears on hand of the module and pressure angle
    /// asked, taken as cut standard, in the numbers a design needs (a planet gear once per
    /// planet); ring gears are the rows with internal = yes.
    #[arg(long, value_name = "FILE")]
    pub stock: Vec<std::path::PathBuf>,
    #[command(flatten)]
    pub print: PrintArgs,
}

/// A validated planetary search, ready to run.
pub struct PlanetaryJob {
    problem: PlanetaryProblem,
    ratio_text: String,
    explain: bool,
    /// The changes tried when nothing is found: the flags as a user would type them, and the
    /// spec they make.
    changes: Vec<Change>,
}

/// One change a designer might make to find designs, tried when nothing is found.
struct Change {
    /// The flags, as typed: `--spacing near-equal`.
    flags: String,
    /// The problem with the change made.
    spec: PlanetarySpec,
}

/// What a run found.
pub struct Found {
    outcome: PlanetaryOutcome,
    asked: Vec<Asked>,
    /// When nothing was found: the changes that would each find designs, with how many.
    helps: Vec<(String, u64)>,
}

impl TryFrom<&PlanetaryArgs> for PlanetaryJob {
    type Error = anyhow::Error;

    fn try_from(a: &PlanetaryArgs) -> anyhow::Result<PlanetaryJob> {
        if a.stepped && a.two_ring {
            return Err(refuse("--two-ring", "is a train of its own; it does not go with --stepped"));
        }
        if a.two_ring {
            let given =
                [("--sun", a.sun.is_some()), ("--fixed", a.fixed.is_some()), ("--input", a.input.is_some())];
            if let Some((flag, _)) = given.iter().find(|g| g.1) {
                return Err(refuse(
                    flag,
                    "the two-ring train has no sun: its first ring is held and its carrier drives; \
                     leave it out or drop --two-ring",
                ));
            }
        } else {
            if a.ring2.is_some() {
                return Err(refuse(
                    "--ring2",
                    "only the two-ring train has an output ring; give --two-ring too",
                ));
            }
            if a.planet_ring2.is_some() {
                return Err(refuse(
                    "--planet-ring2",
                    "only the two-ring train has an output ring; give --two-ring too",
                ));
            }
            if a.planet_ring.is_some() && !a.stepped {
                return Err(refuse(
                    "--planet-ring",
                    "the planet of a simple train is one gear, meshing sun and ring; give --stepped too",
                ));
            }
        }
        let teeth = |text: &str, quantity| parse_int_range(text, quantity, "teeth", MIN_TEETH, MAX_TEETH);
        let optional =
            |text: &Option<String>, quantity| text.as_deref().map(|t| teeth(t, quantity)).transpose();
        let fixed = Member::from(a.fixed.unwrap_or(MemberArg::Ring));
        let input = match a.input {
            Some(m) => Member::from(m),
            None if fixed == Member::Sun => Member::Ring,
            None => Member::Sun,
        };
        let arrangement = if a.two_ring {
            Arrangement::TwoRing
        } else if a.stepped {
            Arrangement::Stepped { fixed, input }
        } else {
            Arrangement::Simple { fixed, input }
        };
        let stock = if a.stock.is_empty() { None } else { Some(load_planetary_stock(a)?) };
        let hull = |shelf: Option<&std::collections::BTreeMap<u32, u32>>, default: &str| match shelf
            .and_then(|s| Some(format!("{}..{}", s.keys().next()?, s.keys().next_back()?)))
        {
            Some(h) => h,
            None => default.to_string(),
        };
        let gears_hull = hull(stock.as_ref().map(|s| &s.gears), DEFAULT_SUN);
        let rings_hull = hull(stock.as_ref().map(|s| &s.rings), DEFAULT_RING);
        let shift_sum = match &a.shift_sum {
            Some(s) => parse_signed_range(s, Quantity::ShiftSum, "modules")?,
            None => (0.0, 0.0),
        };
        let spec = PlanetarySpec {
            arrangement,
            ratio: parse_ratio(&a.ratio, Quantity::TargetRatio)?,
            tolerance: parse_tolerance(&a.tol)?,
            direction: a.direction.map(|d| match d {
                TurnArg::Same => Direction::Same,
                TurnArg::Opposite => Direction::Opposite,
            }),
            sun_teeth: teeth(a.sun.as_deref().unwrap_or(&gears_hull), Quantity::SunTeeth)?,
            planet_teeth: teeth(a.planet.as_deref().unwrap_or(&gears_hull), Quantity::PlanetTeeth)?,
            planet_ring_teeth: optional(&a.planet_ring, Quantity::PlanetRingTeeth)?,
            planet_ring2_teeth: optional(&a.planet_ring2, Quantity::PlanetRing2Teeth)?,
            ring_teeth: teeth(a.ring.as_deref().unwrap_or(&rings_hull), Quantity::RingTeeth)?,
            output_ring_teeth: optional(&a.ring2, Quantity::OutputRingTeeth)?,
            planets: parse_int_range(&a.planets, Quantity::PlanetCount, "planets", 2, MAX_PLANETS)?,
            spacing: match a.spacing {
                SpacingArg::Equal => Spacing::Equal,
                SpacingArg::NearEqual => Spacing::NearEqual,
            },
            module_mm: a.module,
            pressure_angle_deg: a.pressure_angle,
            shift_sum,
            carrier_offset_modules: a.carrier_offset,
            tip_clearance_mm: a.tip_clearance,
            mesh_limits: a.check_meshes.then(MeshLimits::default),
            limit: a.limit,
            ..PlanetarySpec::reduction(Ratio::integer(1))
        };
        let mut problem = PlanetaryProblem::new(spec)?;
        if let Some(stock) = stock {
            problem = problem.with_stock(stock)?;
        }
        let changes = changes(problem.spec());
        Ok(PlanetaryJob { problem, ratio_text: a.ratio.trim().to_string(), explain: a.explain, changes })
    }
}

/// `0.5%` for a tolerance of 1/200.
fn percent(t: Ratio) -> String {
    format!("{}%", fmt_num(t.to_f64() * 100.0))
}

/// The changes a designer would try when nothing is found, each alone: a looser tolerance
/// (the first of a few steps that finds designs counts), another planet count, nearly equal
/// spacing, no clearance margin, profile shift, a carrier offset for checked meshes, no
/// direction asked, another drive, stepped planets, larger planets and rings, smaller suns or
/// planets.
fn changes(spec: &PlanetarySpec) -> Vec<Change> {
    let mut out = Vec::new();
    let mut add = |flags: String, spec: PlanetarySpec| out.push(Change { flags, spec });
    for t in [(1, 1000), (1, 200), (1, 100), (1, 50), (1, 20), (1, 10)] {
        let t = Ratio::new(t.0, t.1).unwrap_or(spec.tolerance);
        if t > spec.tolerance {
            add(format!("--tol {}", percent(t)), PlanetarySpec { tolerance: t, ..spec.clone() });
        }
    }
    for n in 2..=8 {
        if !spec.planets.contains(n) {
            add(
                format!("--planets {n}"),
                PlanetarySpec { planets: IntRange { lo: n, hi: n }, ..spec.clone() },
            );
        }
    }
    if spec.spacing == Spacing::Equal {
        add("--spacing near-equal".into(), PlanetarySpec { spacing: Spacing::NearEqual, ..spec.clone() });
    }
    if spec.tip_clearance_mm > 0.0 {
        add("--tip-clearance 0".into(), PlanetarySpec { tip_clearance_mm: 0.0, ..spec.clone() });
    }
    if spec.shift_sum == (0.0, 0.0) {
        add("--shift-sum -0.5..1".into(), PlanetarySpec { shift_sum: (-0.5, 1.0), ..spec.clone() });
    }
    if spec.mesh_limits.is_some() && spec.carrier_offset_modules == 0.0 {
        let (lo, hi) = spec.shift_sum;
        let (flags, shift_sum) = if hi < 1.0 {
            (format!("--shift-sum {}..1 --carrier-offset 0.5", fmt_num(lo.min(0.0))), (lo.min(0.0), 1.0))
        } else {
            ("--carrier-offset 0.5".to_string(), (lo, hi))
        };
        add(flags, PlanetarySpec { shift_sum, carrier_offset_modules: 0.5, ..spec.clone() });
    }
    if spec.direction.is_some() {
        add("without --direction".into(), PlanetarySpec { direction: None, ..spec.clone() });
    }
    if let Arrangement::Simple { fixed, input } | Arrangement::Stepped { fixed, input } = spec.arrangement {
        let members = [Member::Ring, Member::Sun, Member::Carrier];
        for f in members {
            for i in members {
                if f == i || (f, i) == (fixed, input) {
                    continue;
                }
                let arrangement = match spec.arrangement {
                    Arrangement::Stepped { .. } => Arrangement::Stepped { fixed: f, input: i },
                    _ => Arrangement::Simple { fixed: f, input: i },
                };
                add(
                    format!("--fixed {} --input {}", f.name(), i.name()),
                    PlanetarySpec { arrangement, ..spec.clone() },
                );
            }
        }
    }
    if let Arrangement::Simple { fixed, input } = spec.arrangement {
        add(
            "--stepped".into(),
            PlanetarySpec { arrangement: Arrangement::Stepped { fixed, input }, ..spec.clone() },
        );
    }
    // Larger planets go with larger rings (coaxiality), so both widen together.
    let (p, r) = (spec.planet_teeth, spec.ring_teeth);
    if p.hi < MAX_TEETH || r.hi < MAX_TEETH {
        let planet_teeth = IntRange { lo: p.lo, hi: (2 * p.hi).min(MAX_TEETH) };
        let ring_teeth = IntRange { lo: r.lo, hi: (2 * r.hi).min(MAX_TEETH) };
        add(
            format!("--planet {planet_teeth} --ring {ring_teeth}"),
            PlanetarySpec { planet_teeth, ring_teeth, ..spec.clone() },
        );
    }
    for (flag, range, which) in [("--sun", spec.sun_teeth, 0), ("--planet", spec.planet_teeth, 1)] {
        if which == 0 && spec.arrangement == Arrangement::TwoRing {
            continue;
        }
        if range.lo > 12 {
            let wider = IntRange { lo: 12, hi: range.hi.max(12) };
            let changed = if which == 0 {
                PlanetarySpec { sun_teeth: wider, ..spec.clone() }
            } else {
                PlanetarySpec { planet_teeth: wider, ..spec.clone() }
            };
            add(format!("{flag} {wider}"), changed);
        }
    }
    out
}

impl PlanetaryJob {
    /// The changes that would each find designs, with how many: of the tolerance steps only
    /// the first that finds any.
    fn helps(&self) -> Vec<(String, u64)> {
        let mut helps = Vec::new();
        let mut tolerance_found = false;
        for change in &self.changes {
            let is_tolerance = change.flags.starts_with("--tol ");
            if is_tolerance && tolerance_found {
                continue;
            }
            // Counting is enough: nothing need be listed.
            // A change is tried on the same gears: from stock when the search draws from stock
            // (a change the stock cannot take, such as a profile shift, is not offered).
            let Ok(problem) = PlanetaryProblem::new(PlanetarySpec { limit: 0, ..change.spec.clone() })
                .and_then(|p| match self.problem.stock() {
                    Some(stock) => p.with_stock(stock.clone()),
                    None => Ok(p),
                })
            else {
                continue;
            };
            let count = search(&problem).count;
            if count > 0 {
                tolerance_found |= is_tolerance;
                helps.push((change.flags.clone(), count));
            }
        }
        helps
    }
}

impl Job for PlanetaryJob {
    type Found = Found;

    fn search(&self, options: &RunOptions) -> anyhow::Result<Found> {
        let outcome = search_with(&self.problem, self.explain, options);
        let spec = self.problem.spec();
        let asked = match spec.single_teeth().filter(|_| self.explain) {
            Some(teeth) => (spec.planets.lo..=spec.planets.hi)
                .filter_map(|planets| {
                    check_design(&self.problem, &teeth, planets).err().map(|unmet| Asked {
                        teeth,
                        planets,
                        unmet,
                    })
                })
                .collect(),
            None => Vec::new(),
        };
        let helps = if outcome.count == 0 && outcome.complete { self.helps() } else { Vec::new() };
        Ok(Found { outcome, asked, helps })
    }

    fn report<'a>(&'a self, found: &'a Found) -> Box<dyn Report + 'a> {
        Box::new(PlanetaryReport {
            problem: &self.problem,
            ratio_text: &self.ratio_text,
            outcome: &found.outcome,
            asked: &found.asked,
        })
    }

    /// When nothing was found: the changes tried one at a time that would find designs.
    fn words(&self, found: &Found) -> Words {
        let explain = if self.explain { "" } else { "; --explain counts what left the candidates out" };
        let nothing = if found.helps.is_empty() {
            format!(
                "no design meets every condition, and none of the changes tried alone (tolerance, \
                 planet count, spacing, clearance, profile shift, drive, stepped planets, wider tooth \
                 ranges) finds one{explain}."
            )
        } else {
            let helps: Vec<String> = found
                .helps
                .iter()
                .map(|(flags, n)| format!("{flags} ({n} design{})", if *n == 1 { "" } else { "s" }))
                .collect();
            format!(
                "no design meets every condition. Each of these changes alone would find designs: {}{explain}.",
                helps.join("; ")
            )
        };
        let interrupted = (!found.outcome.complete).then(|| {
            format!(
                "{} design{} found so far (a lower bound); the best of them are listed.",
                found.outcome.count,
                if found.outcome.count == 1 { "" } else { "s" }
            )
        });
        Words { interrupted, nothing: Some(nothing) }
    }
}

/// Run `gearsieve planetary`.
pub fn run(args: PlanetaryArgs) -> anyhow::Result<i32> {
    run::run(&PlanetaryJob::try_from(&args)?, &Print::from(&args.print))
}
