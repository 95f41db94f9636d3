//! `gearsieve mesh`: the full geometry of one external spur pair, judged against the mesh
//! limits. The clap struct mirrors the flags; `TryFrom` turns it into a validated [`MeshJob`]
//! (tooth system, tooth counts, mounting, limits); `run` works the mesh out with
//! [`gearsieve::geometry`], prints it with [`gearsieve::report::mesh`] and picks the exit status.

use std::path::PathBuf;

use clap::{ArgGroup, Args};
use gearsieve::engine::RunOptions;
use gearsieve::geometry::allowance::BacklashChoice;
use gearsieve::geometry::cycloidal::MIN_PINION_LEAVES;
use gearsieve::geometry::measure::{pair_data, PairData};
use gearsieve::geometry::{
    check_cycloidal, check_mesh, cycloidal_mesh, mesh_geometry, shift_for_centre_distance, CycloidalLimits,
    CycloidalMesh, MeshDefect, MeshGeometry, MeshLimits, Mounting, RackProfile, ToothSystem, MM_PER_INCH,
};
use gearsieve::model::pool::{
    check_diametral_pitch, check_module, check_pressure_angle, fmt_num, MAX_TEETH, MIN_TEETH,
};
use gearsieve::model::problem::{check_min_contact_ratio, DEFAULT_SHIFT_SUM};
use gearsieve::numbers::length::{parse_length, LengthUnit};
use gearsieve::numbers::range::parse_signed_range;
use gearsieve::report::mesh::cycloidal::CycloidalPairReport;
use gearsieve::report::mesh::{MeshInputs, MeshReport, MountingInput, ShopInputs};
use gearsieve::report::Report;
use gearsieve::{Error, Quantity};

use super::args::{chosen_format, number, FormatArg, ToothFormArg};
use super::flags::refuse;
use super::run::{self, Job, Print, Words};

/// The full geometry of one external spur pair, the check a designer runs before cutting.
///
/// Gives the pitch, base, tip and root diameters, tip thickness and undercut limit of each gear,
/// and the centre distances, working pressure angle, shift sum, tip shortening, clearance,
/// backlash and contact ratio of the pair, then says whether it runs. Exit status 0 when it
/// runs, 1 when it has defects (still printed), 2 on bad input.
#[derive(Args, Debug)]
#[command(group(ArgGroup::new("size").required(true).args(["module", "diametral_pitch"])))]
pub struct MeshArgs {
    /// Tooth counts of the pair, driver (pinion) first: e.g. 12,40.
    #[arg(long, value_name = "Z1,Z2")]
    pub teeth: String,
    /// Module, mm.
    #[arg(long, value_name = "MM", conflicts_with = "diametral_pitch", allow_negative_numbers = true, value_parser = number)]
    pub module: Option<f64>,
    /// Diametral pitch (teeth per inch of pitch diameter) instead of a module: m = 25.4 / P.
    /// Inch figures are shown beside the millimetres.
    #[arg(long, value_name = "P", allow_negative_numbers = true, value_parser = number)]
    pub diametral_pitch: Option<f64>,
    /// Pressure angle, degrees (20 is usual, 14.5 on older inch gearing).
    #[arg(long, value_name = "DEG", default_value_t = 20.0, allow_negative_numbers = true, value_parser = number)]
    pub pressure_angle: f64,
    /// Profile shifts of driver and driven gear, in modules (positive away from the centre);
    /// the pair is mounted tight [default: 0,0].
    #[arg(long, value_name = "X1,X2", conflicts_with = "centre_distance", allow_hyphen_values = true)]
    pub shift: Option<String>,
    /// Working centre distance to reach by profile shift, in mm (or inches with a suffix:
    /// 14.25in). The shift sum it needs is split between the gears favouring the pinion against
    /// undercut.
    #[arg(long, value_name = "MM")]
    pub centre_distance: Option<String>,
    /// Allowed profile shift sum x1 + x2 for --centre-distance, in modules: LO..HI, the same
    /// default as search [default: -0.5..1].
    #[arg(long, value_name = "LO..HI", requires = "centre_distance", allow_hyphen_values = true)]
    pub shift_sum: Option<String>,
    /// Addendum of the basic rack, in modules (ISO 53 type A: 1).
    #[arg(long, value_name = "MODULES", default_value_t = RackProfile::default().addendum, allow_negative_numbers = true, value_parser = number)]
    pub addendum: f64,
    /// Dedendum of the basic rack, in modules (ISO 53 type A: 1.25).
    #[arg(long, value_name = "MODULES", default_value_t = RackProfile::default().dedendum, allow_negative_numbers = true, value_parser = number)]
    pub dedendum: f64,
    /// Root fillet radius of the basic rack, in modules (ISO 53 type A: 0.38).
    #[arg(long, value_name = "MODULES", default_value_t = RackProfile::default().root_radius, allow_negative_numbers = true, value_parser = number)]
    pub root_radius: f64,
    /// Least transverse contact ratio for the mesh to count as running (1.2 is common practice).
    #[arg(long, value_name = "R", default_value_t = MeshLimits::default().min_contact_ratio, allow_negative_numbers = true, value_parser = number)]
    pub min_contact_ratio: f64,
    /// Least tooth thickness at the tip, in modules.
    #[arg(long, value_name = "MODULES", default_value_t = MeshLimits::default().min_tip_thickness_modules, allow_negative_numbers = true, value_parser = number)]
    pub min_tip_thickness: f64,
    /// Accept undercut gears (small clock pinions are often cut so); still reported.
    #[arg(long)]
    pub allow_undercut: bool,
    /// Output format (a mesh check has no CSV rows) [default: table, or the one --output's
    /// extension names].
    #[arg(long, value_enum)]
    pub format: Option<FormatArg>,
    /// Normal backlash the pair is to have, mm: LO..HI, over the whole housing tolerance; the
    /// tooth-thickness allowances are worked out from it [default: the recommended least
    /// backlash (2/3)(0.06 + 0.0005·a + 0.03·m), ISO/TR 10064-2, up to twice that plus what
    /// the housing tolerance opens].
    #[arg(long, value_name = "LO..HI", allow_hyphen_values = true)]
    pub backlash: Option<String>,
    /// How far the housing may put the centres from the working centre distance, either way,
    /// mm (± f_a) [default: 0].
    #[arg(long, value_name = "MM", allow_hyphen_values = true)]
    pub housing_tol: Option<String>,
    /// Ball or pin diameters to measure over, mm, driver and driven (or one for both)
    /// [default: a size touching near the reference circle, rounded to 0.05 mm].
    #[arg(long, value_name = "D1,D2")]
    pub balls: Option<String>,
    /// Tooth form: involute, or cycloidal as clock wheels and pinions are cut (proportions by
    /// leaf count, no shift: the rack, pressure angle and shift flags do not apply; a
    /// --centre-distance mounts the pair there as it is).
    #[arg(long, value_enum, value_name = "FORM", default_value = "involute")]
    pub tooth_form: ToothFormArg,
    /// Write the report to FILE (atomically: complete or not at all) instead of standard output.
    #[arg(long, value_name = "FILE")]
    pub output: Option<PathBuf>,
}

/// A validated mesh check, ready to run.
#[derive(Debug)]
pub struct MeshJob {
    system: ToothSystem,
    inputs: MeshInputs,
    shop: ShopInputs,
    limits: MeshLimits,
    format: FormatArg,
    output: Option<PathBuf>,
}

/// `Z1,Z2` as two tooth counts within the pool's limits.
fn parse_teeth(text: &str) -> anyhow::Result<[u32; 2]> {
    let bad = || {
        refuse(
            "--teeth",
            format!(
                "wanted two tooth counts such as 12,40, each from {MIN_TEETH} to {MAX_TEETH}, \
                 found \"{text}\""
            ),
        )
    };
    let parts: Vec<&str> = text.split(',').map(str::trim).collect();
    let [a, b] = parts[..] else {
        return Err(bad());
    };
    let count =
        |s: &str| s.parse::<u32>().ok().filter(|z| (MIN_TEETH..=MAX_TEETH).contains(z)).ok_or_else(bad);
    Ok([count(a)?, count(b)?])
}

/// `X1,X2` as two finite profile shifts.
fn parse_shift(text: &str) -> anyhow::Result<[f64; 2]> {
    let bad = || {
        refuse(
            "--shift",
            format!(
                "wanted two profile shifts in modules such as 0.3,-0.1 (driver first), found \
                 \"{text}\""
            ),
        )
    };
    let parts: Vec<&str> = text.split(',').map(str::trim).collect();
    let [a, b] = parts[..] else {
        return Err(bad());
    };
    let shift = |s: &str| s.parse::<f64>().ok().filter(|x| x.is_finite()).ok_or_else(bad);
    Ok([shift(a)?, shift(b)?])
}

/// `--backlash LO..HI` as a backlash choice: the recommended one when not given.
pub fn parse_backlash(text: Option<&str>) -> anyhow::Result<BacklashChoice> {
    let Some(text) = text else {
        return Ok(BacklashChoice::Recommended);
    };
    let range = text.split_once("..").and_then(|(lo, hi)| {
        let lo = lo.trim().parse::<f64>().ok().filter(|v| v.is_finite())?;
        let hi = hi.trim().parse::<f64>().ok().filter(|v| v.is_finite())?;
        (lo >= 0.0 && hi > lo).then_some([lo, hi])
    });
    match range {
        Some(r) => Ok(BacklashChoice::Range(r)),
        None => Err(refuse(
            "--backlash",
            format!(
                "wanted the least and most normal backlash in mm as LO..HI, 0 ≤ LO < HI, such as \
                 0.08..0.2, found \"{}\"",
                text.trim()
            ),
        )),
    }
}

/// `--housing-tol MM`: a length in mm, or 0; 0 when not given.
pub fn parse_housing_tolerance(text: Option<&str>) -> anyhow::Result<f64> {
    match text.map(str::trim) {
        None => Ok(0.0),
        Some(t) if t.parse::<f64>() == Ok(0.0) => Ok(0.0),
        Some(t) if t.starts_with('-') => Err(refuse(
            "--housing-tol",
            format!("wanted how far the centres may stray either way, in mm, 0 or more, such as 0.02, found \"{t}\""),
        )),
        Some(t) => Ok(parse_length(t, Quantity::HousingTolerance, Some(LengthUnit::Millimetre))?.mm_f64()),
    }
}

/// `--balls D1,D2` (or one for both) as ball diameters in mm; the suggested ones when not given.
fn parse_balls(text: Option<&str>) -> anyhow::Result<[Option<f64>; 2]> {
    let Some(text) = text else {
        return Ok([None, None]);
    };
    let parts: Vec<&str> = text.split(',').map(str::trim).collect();
    let ball = |s: &str| -> anyhow::Result<Option<f64>> {
        Ok(Some(parse_length(s, Quantity::BallDiameter, Some(LengthUnit::Millimetre))?.mm_f64()))
    };
    match parts[..] {
        [one] => Ok([ball(one)?, ball(one)?]),
        [a, b] => Ok([ball(a)?, ball(b)?]),
        _ => Err(refuse(
            "--balls",
            format!("wanted one or two diameters in mm such as 3.5,3.5, found \"{text}\""),
        )),
    }
}

/// A number that must be finite and satisfy `ok`, else `--flag: wanted …, found …`.
fn check_number(flag: &str, value: f64, ok: bool, wanted: &str) -> anyhow::Result<f64> {
    if value.is_finite() && ok {
        Ok(value)
    } else {
        Err(refuse(flag, format!("wanted {wanted}, found {value}")))
    }
}

impl TryFrom<MeshArgs> for MeshJob {
    type Error = anyhow::Error;

    fn try_from(a: MeshArgs) -> anyhow::Result<MeshJob> {
        let teeth = parse_teeth(&a.teeth)?;
        // The same limits as every other command that takes a module or a pressure angle.
        let (module_mm, diametral_pitch) = match (a.module, a.diametral_pitch) {
            (Some(m), _) => (check_module(m, &|e| Error::value(Quantity::Module, e))?, None),
            (None, Some(p)) => {
                (check_diametral_pitch(p, &|e| Error::value(Quantity::DiametralPitch, e))?, Some(p))
            }
            (None, None) => return Err(refuse("--module", "wanted a module in mm, or --diametral-pitch")),
        };
        let pa = check_pressure_angle(a.pressure_angle, &|e| Error::value(Quantity::PressureAngle, e))?;
        let ha = a.addendum;
        check_number("--addendum", ha, ha > 0.0, "a positive number of modules")?;
        let hf = a.dedendum;
        check_number(
            "--dedendum",
            hf,
            hf >= ha,
            &format!("a number of modules no smaller than the addendum, {}", fmt_num(ha)),
        )?;
        let rho = a.root_radius;
        check_number("--root-radius", rho, rho >= 0.0, "zero or more modules")?;
        let rack = RackProfile { addendum: ha, dedendum: hf, root_radius: rho };
        let limits = MeshLimits {
            min_contact_ratio: check_min_contact_ratio(a.min_contact_ratio)?,
            min_tip_thickness_modules: check_number(
                "--min-tip-thickness",
                a.min_tip_thickness,
                a.min_tip_thickness >= 0.0,
                "zero or more modules, such as 0.25",
            )?,
            allow_undercut: a.allow_undercut,
        };
        let mounting = match &a.centre_distance {
            Some(cd) => MountingInput::AtCentreDistance {
                centre_distance_mm: parse_length(cd, Quantity::CentreDistance, Some(LengthUnit::Millimetre))?
                    .mm_f64(),
                // The same default and syntax as `search --shift-sum`, so a pair that
                // search reports at a centre distance is checked here the same way.
                shift_sum_range: match &a.shift_sum {
                    Some(s) => parse_signed_range(s, Quantity::ShiftSum, "modules")?,
                    None => DEFAULT_SHIFT_SUM,
                }
                .into(),
            },
            None => MountingInput::Shifted {
                shift: match &a.shift {
                    Some(s) => parse_shift(s)?,
                    None => [0.0, 0.0],
                },
            },
        };
        // Every value ToothSystem::new checks was checked above with its flag; this is a
        // fallback that keeps a future rule of the geometry from becoming a panic.
        let system = ToothSystem::new(module_mm, pa, rack).map_err(Error::from)?;
        let shop = ShopInputs {
            backlash: parse_backlash(a.backlash.as_deref())?,
            housing_tolerance_mm: parse_housing_tolerance(a.housing_tol.as_deref())?,
            balls_mm: parse_balls(a.balls.as_deref())?,
        };
        Ok(MeshJob {
            system,
            inputs: MeshInputs { teeth, module_mm, diametral_pitch, pressure_angle_deg: pa, rack, mounting },
            shop,
            limits,
            format: chosen_format(a.format, a.output.as_deref(), FormatArg::Table),
            output: a.output,
        })
    }
}

/// The working centre distances, mm, that shift sums in `range` reach when the pair meshes
/// tight, as words: `49.341 to 55.330 mm`, or `more than 48.864 and up to 55.330 mm` when the
/// low end of the range is at or below the least workable sum (the base circles would touch),
/// with inch figures for inch gearing. `None` when no sum in the range is workable.
fn reachable(job: &MeshJob, range: [f64; 2]) -> Option<String> {
    let (system, teeth) = (&job.system, job.inputs.teeth);
    let least = system.least_workable_shift_sum(teeth);
    if range[1] <= least {
        return None;
    }
    let hi = system.centre_distance_for_shift_sum(teeth, range[1])?;
    let (lo, open_low) = if range[0] > least {
        (system.centre_distance_for_shift_sum(teeth, range[0])?, false)
    } else {
        (system.base_circle_distance_mm(teeth), true)
    };
    let words = |unit: &str, scale: f64, decimals: usize| {
        let (lo, hi) = (lo / scale, hi / scale);
        if open_low {
            format!("more than {lo:.decimals$} and up to {hi:.decimals$} {unit}")
        } else {
            format!("{lo:.decimals$} to {hi:.decimals$} {unit}")
        }
    };
    Some(if job.inputs.diametral_pitch.is_some() {
        format!("{} ({})", words("mm", 1.0, 3), words("in", MM_PER_INCH, 4))
    } else {
        words("mm", 1.0, 3)
    })
}

/// A failure of the geometry as a one-line message naming the flag it came from; a centre
/// distance out of reach also says which distances the allowed shift sums do reach.
fn explain(job: &MeshJob, defect: MeshDefect) -> anyhow::Error {
    match (job.inputs.mounting, defect) {
        (MountingInput::Shifted { .. }, _) => refuse("--shift", defect.to_string()),
        (
            MountingInput::AtCentreDistance { shift_sum_range, .. },
            MeshDefect::CentreDistanceUnreachable { .. } | MeshDefect::ShiftSumOutOfRange { .. },
        ) => {
            let range = match reachable(job, shift_sum_range) {
                Some(words) => format!("reachable with this --shift-sum: {words}"),
                None => "no centre distance is reachable with this --shift-sum".to_string(),
            };
            refuse("--centre-distance", format!("{defect}; {range}"))
        }
        (MountingInput::AtCentreDistance { .. }, _) => refuse("--centre-distance", defect.to_string()),
    }
}

/// Work the mesh out.
fn geometry(job: &MeshJob) -> Result<MeshGeometry, MeshDefect> {
    let teeth = job.inputs.teeth;
    match job.inputs.mounting {
        MountingInput::Shifted { shift } => mesh_geometry(&job.system, teeth, Mounting::Shifted { shift }),
        MountingInput::AtCentreDistance { centre_distance_mm, shift_sum_range } => shift_for_centre_distance(
            &job.system,
            teeth,
            centre_distance_mm,
            &(shift_sum_range[0]..=shift_sum_range[1]),
        ),
    }
}

impl Job for MeshJob {
    type Found = (MeshGeometry, Vec<MeshDefect>, PairData);

    fn search(&self, _options: &RunOptions) -> anyhow::Result<Self::Found> {
        let mesh = geometry(self).map_err(|d| explain(self, d))?;
        let defects = check_mesh(&mesh, &self.limits);
        let shop = &self.shop;
        // `mesh` works out a pair of gears to cut.
        let pair = pair_data(
            &self.system,
            &mesh,
            shop.backlash,
            shop.housing_tolerance_mm,
            shop.balls_mm,
            [false, false],
        );
        Ok((mesh, defects, pair))
    }

    fn report<'a>(&'a self, found: &'a Self::Found) -> Box<dyn Report + 'a> {
        Box::new(MeshReport {
            inputs: &self.inputs,
            limits: &self.limits,
            geometry: &found.0,
            defects: &found.1,
            shop: &self.shop,
            pair: &found.2,
        })
    }

    fn words(&self, _found: &Self::Found) -> Words {
        // The verdict in the report says why the mesh would not run.
        Words { interrupted: None, nothing: None }
    }

    fn shows_progress(&self) -> bool {
        false
    }
}

/// A cycloidal pair to work out and judge.
#[derive(Debug)]
pub struct CycloidalJob {
    module_mm: f64,
    teeth: [u32; 2],
    centre_distance_mm: Option<f64>,
    limits: CycloidalLimits,
    min_contact_ratio: f64,
}

impl CycloidalJob {
    /// The pair asked for, refusing the flags that belong to involute teeth only.
    fn new(a: &MeshArgs) -> anyhow::Result<CycloidalJob> {
        let defaults = MeshLimits::default();
        let rack = RackProfile::default();
        let involute_only = [
            ("--shift", a.shift.is_some()),
            ("--shift-sum", a.shift_sum.is_some()),
            ("--pressure-angle", a.pressure_angle != 20.0),
            ("--addendum", a.addendum != rack.addendum),
            ("--dedendum", a.dedendum != rack.dedendum),
            ("--root-radius", a.root_radius != rack.root_radius),
            ("--min-tip-thickness", a.min_tip_thickness != defaults.min_tip_thickness_modules),
            ("--allow-undercut", a.allow_undercut),
        ];
        if let Some((flag, _)) = involute_only.iter().find(|(_, given)| *given) {
            return Err(refuse(
                flag,
                "belongs to involute teeth; give --tooth-form involute, or leave it out",
            ));
        }
        let module_mm = match (a.module, a.diametral_pitch) {
            (Some(m), _) => check_module(m, &|e| Error::value(Quantity::Module, e))?,
            (None, Some(p)) => check_diametral_pitch(p, &|e| Error::value(Quantity::DiametralPitch, e))?,
            (None, None) => return Err(refuse("--module", "wanted a module in mm, or --diametral-pitch")),
        };
        let teeth = parse_teeth(&a.teeth)?;
        if teeth[0].min(teeth[1]) < MIN_PINION_LEAVES {
            return Err(refuse(
                "--teeth",
                format!(
                    "cycloidal pinion proportions start at {MIN_PINION_LEAVES} leaves, found {},{}",
                    teeth[0], teeth[1]
                ),
            ));
        }
        Ok(CycloidalJob {
            module_mm,
            teeth,
            centre_distance_mm: a
                .centre_distance
                .as_deref()
                .map(|cd| {
                    parse_length(cd, Quantity::CentreDistance, Some(LengthUnit::Millimetre))
                        .map(|l| l.mm_f64())
                })
                .transpose()?,
            limits: CycloidalLimits::default(),
            min_contact_ratio: check_min_contact_ratio(a.min_contact_ratio)?,
        })
    }
}

impl Job for CycloidalJob {
    type Found = (CycloidalMesh, Vec<MeshDefect>);

    fn search(&self, _options: &RunOptions) -> anyhow::Result<Self::Found> {
        let mesh = cycloidal_mesh(self.module_mm, self.teeth, self.centre_distance_mm)
            .map_err(|d| refuse("--centre-distance", d.to_string()))?;
        let defects = check_cycloidal(&mesh, &self.limits, self.min_contact_ratio);
        Ok((mesh, defects))
    }

    fn report<'a>(&'a self, found: &'a Self::Found) -> Box<dyn Report + 'a> {
        Box::new(CycloidalPairReport {
            mesh: &found.0,
            limits: &self.limits,
            min_contact_ratio: self.min_contact_ratio,
            defects: &found.1,
        })
    }

    fn words(&self, _found: &Self::Found) -> Words {
        Words { interrupted: None, nothing: None }
    }

    fn shows_progress(&self) -> bool {
        false
    }
}

/// Run `gearsieve mesh`: 0 when the mesh runs, 1 when it has defects.
pub fn run(args: MeshArgs) -> anyhow::Result<i32> {
    if args.tooth_form == ToothFormArg::Cycloidal {
        let job = CycloidalJob::new(&args)?;
        let print = Print {
            format: chosen_format(args.format, args.output.as_deref(), FormatArg::Table).into(),
            output: args.output.clone(),
            threads: None,
            quiet: true,
        };
        return run::run(&job, &print);
    }
    let job = MeshJob::try_from(args)?;
    let print = Print { format: job.format.into(), output: job.output.clone(), threads: None, quiet: true };
    run::run(&job, &print)
}
