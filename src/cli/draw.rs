//! `gearsieve draw`: a train drawn to scale with true teeth — given inline (`--stages 20:40,15:45
//! --module 2`) or taken from a search's JSON result (`--from result.json --train 3`) — or one
//! gear's outline to cut (`--gear 20 --module 2 --profile gear.dxf`). The clap struct mirrors
//! the flags; `TryFrom` turns them into a validated job.

use std::path::{Path, PathBuf};

use clap::{ArgGroup, Args};
use gearsieve::engine::RunOptions;
use gearsieve::geometry::layout::ShaftLayout;
use gearsieve::geometry::outline::{gear_outline, DEFAULT_TOLERANCE_MM, MIN_TOLERANCE_MM};
use gearsieve::geometry::{RackProfile, ToothSystem};
use gearsieve::model::pool::{check_module, check_pressure_angle, MAX_TEETH, MIN_TEETH};
use gearsieve::report::fields::StageJson;
use gearsieve::report::pictures::TrainPicture;
use gearsieve::report::profile::GearProfile;
use gearsieve::report::search::json::Doc;
use gearsieve::report::Report;
use gearsieve::{Error, Quantity};

use super::args::{chosen_format, FormatArg};
use super::flags::refuse;
use super::run::{self, Job, Print, Words};

/// Draw a train to scale with true teeth, or write one gear's outline to cut.
///
/// Give the train inline (--stages), or as one train of a search's JSON result (--from), or one
/// gear (--gear) with --profile FILE.svg|FILE.dxf for its closed outline in mm.
#[derive(Args, Debug)]
#[command(group(ArgGroup::new("what").required(true).args(["stages", "from", "gear"])))]
pub struct DrawArgs {
    /// Stages input to output as DRIVER:DRIVEN teeth, e.g. 20:40,15:45 (unshifted, at their
    /// reference centre distances).
    #[arg(long, value_name = "Z1:Z2,…")]
    pub stages: Option<String>,
    /// A search's JSON result (`gearsieve search --format json`); draws train --train of it.
    #[arg(long, value_name = "FILE")]
    pub from: Option<PathBuf>,
    /// Which listed train of --from to draw, from 1.
    #[arg(long, value_name = "N", default_value_t = 1, requires = "from")]
    pub train: usize,
    /// Draw the line of action and the working pressure angle of stage K (from 1).
    #[arg(long, value_name = "K", conflicts_with = "gear")]
    pub line_of_action: Option<usize>,
    /// One gear's tooth count, for --profile.
    #[arg(long, value_name = "Z", requires = "profile")]
    pub gear: Option<u32>,
    /// Profile shift coefficient of --gear, in modules.
    #[arg(long, value_name = "X", default_value_t = 0.0, allow_negative_numbers = true, requires = "gear")]
    pub shift: f64,
    /// Write --gear's closed outline, mm, centred at the origin, to FILE: .svg or .dxf.
    #[arg(long, value_name = "FILE", requires = "gear")]
    pub profile: Option<PathBuf>,
    /// Chordal tolerance of the outline, mm: no chord strays further from the true curve.
    #[arg(long, value_name = "MM", default_value_t = DEFAULT_TOLERANCE_MM)]
    pub tolerance: f64,
    /// Module, mm, for --stages and --gear.
    #[arg(long, value_name = "MM", default_value_t = 1.0, allow_negative_numbers = true)]
    pub module: f64,
    /// Pressure angle, degrees, for --stages and --gear.
    #[arg(long, value_name = "DEG", default_value_t = 20.0, allow_negative_numbers = true)]
    pub pressure_angle: f64,
    /// Output format: the drawing (SVG), or its data as a table, Markdown or JSON [default: svg
    /// for a train, table for --gear, whose outline goes to --profile].
    #[arg(long, value_enum)]
    pub format: Option<FormatArg>,
    /// Write to FILE (atomically) instead of standard output.
    #[arg(long, value_name = "FILE")]
    pub output: Option<PathBuf>,
}

/// What `draw` makes.
enum DrawJob {
    Train(TrainPicture),
    Gear { profile: GearProfile, file: PathBuf },
}

/// `20:40,15:45` as stages of `module_mm`.
fn parse_stages(text: &str, module_mm: f64, pressure_angle_deg: f64) -> anyhow::Result<Vec<StageJson>> {
    let bad = || {
        refuse(
            "--stages",
            format!(
                "wanted DRIVER:DRIVEN tooth counts from {MIN_TEETH} to {MAX_TEETH}, stages separated by \
                 commas, such as 20:40,15:45; found \"{text}\""
            ),
        )
    };
    let teeth = |s: &str| s.trim().parse::<u32>().ok().filter(|z| (MIN_TEETH..=MAX_TEETH).contains(z));
    text.split(',')
        .map(|pair| {
            let (a, b) = pair.split_once(':').ok_or_else(bad)?;
            let (a, b) = (teeth(a).ok_or_else(bad)?, teeth(b).ok_or_else(bad)?);
            Ok(StageJson::plain(a, b, module_mm, pressure_angle_deg))
        })
        .collect()
}

/// `--line-of-action K` names a stage of a train of `stages` stages.
fn check_stage(k: Option<usize>, stages: usize) -> anyhow::Result<()> {
    match k {
        Some(k) if k == 0 || k > stages => {
            Err(refuse("--line-of-action", format!("the train has stages 1 to {stages}; found {k}")))
        }
        _ => Ok(()),
    }
}

/// Train `n` (from 1) of a search's JSON file.
fn train_from(path: &Path, n: usize, line_of_action: Option<usize>) -> anyhow::Result<TrainPicture> {
    let name = path.display().to_string();
    let text = std::fs::read_to_string(path)
        .map_err(|e| refuse("--from", format!("{name}: cannot read it: {e}")))?;
    let doc: Doc = serde_json::from_str(&text)
        .map_err(|e| refuse("--from", format!("{name}: not the JSON of a gearsieve search ({e})")))?;
    let listed = doc.trains.len();
    let Some(train) = n.checked_sub(1).and_then(|i| doc.trains.get(i)) else {
        return Err(refuse("--train", format!("{name} lists trains 1 to {listed}; found {n}")));
    };
    check_stage(line_of_action, train.stages.len())?;
    Ok(TrainPicture {
        title: format!("Train {n} of {name}: i = {} for ratio {}", train.ratio, doc.target.ratio),
        stages: train.stages.clone(),
        names: ("input".into(), "output".into()),
        layout: ShaftLayout::Inline,
        line_of_action,
    })
}

impl TryFrom<DrawArgs> for DrawJob {
    type Error = anyhow::Error;

    fn try_from(a: DrawArgs) -> anyhow::Result<DrawJob> {
        // The same limits as every other command's module and pressure angle.
        let module = check_module(a.module, &|m| Error::value(Quantity::Module, m))?;
        let pa = check_pressure_angle(a.pressure_angle, &|m| Error::value(Quantity::PressureAngle, m))?;
        if let Some(path) = &a.from {
            return Ok(DrawJob::Train(train_from(path, a.train, a.line_of_action)?));
        }
        if let Some(text) = &a.stages {
            let stages = parse_stages(text, module, pa)?;
            check_stage(a.line_of_action, stages.len())?;
            let list: Vec<String> = stages.iter().map(|s| format!("{}→{}", s.driver, s.driven)).collect();
            return Ok(DrawJob::Train(TrainPicture {
                title: format!("Train {}, module {} mm", list.join(" "), module),
                stages,
                names: ("input".into(), "output".into()),
                layout: ShaftLayout::Inline,
                line_of_action: a.line_of_action,
            }));
        }
        let (Some(teeth), Some(file)) = (a.gear, a.profile) else {
            return Err(refuse("--gear", "give --gear Z with --profile FILE.svg or FILE.dxf"));
        };
        if !(MIN_TEETH..=MAX_TEETH).contains(&teeth) {
            return Err(refuse("--gear", format!("wanted {MIN_TEETH} to {MAX_TEETH} teeth, found {teeth}")));
        }
        if !(a.tolerance.is_finite() && a.tolerance >= MIN_TOLERANCE_MM) {
            return Err(refuse(
                "--tolerance",
                format!("wanted at least {MIN_TOLERANCE_MM} mm, found {}", a.tolerance),
            ));
        }
        let extension = file.extension().map(|e| e.to_string_lossy().to_ascii_lowercase());
        if !matches!(extension.as_deref(), Some("svg") | Some("dxf")) {
            return Err(refuse(
                "--profile",
                format!("{}: wanted a file ending .svg or .dxf", file.display()),
            ));
        }
        let system = ToothSystem::new(module, pa, RackProfile::default())?;
        let outline = gear_outline(&system, teeth, a.shift, 0.0, a.tolerance)
            .map_err(|e| refuse("--gear", format!("{teeth} teeth with shift {}: {e}", a.shift)))?;
        Ok(DrawJob::Gear {
            profile: GearProfile {
                module_mm: module,
                pressure_angle_deg: pa,
                shift: a.shift,
                tip_shortening: 0.0,
                outline,
            },
            file,
        })
    }
}

impl Job for DrawJob {
    type Found = ();

    fn search(&self, _options: &RunOptions) -> anyhow::Result<()> {
        // The outline file is written before the report, whole or not at all.
        if let DrawJob::Gear { profile, file } = self {
            let mut buf = Vec::new();
            let is_dxf = file.extension().is_some_and(|e| e.eq_ignore_ascii_case("dxf"));
            if is_dxf {
                profile.write_dxf(&mut buf)?;
            } else {
                gearsieve::report::svg::write(&profile.cutting_drawing(), &mut buf)?;
            }
            super::output::emit(Some(file), &buf, true)
                .map_err(|e| e.context(format!("--profile {}", file.display())))?;
        }
        Ok(())
    }

    fn report<'a>(&'a self, _found: &'a ()) -> Box<dyn Report + 'a> {
        match self {
            DrawJob::Train(picture) => Box::new(picture),
            DrawJob::Gear { profile, .. } => Box::new(profile),
        }
    }

    fn words(&self, _found: &()) -> Words {
        Words { interrupted: None, nothing: None }
    }

    fn shows_progress(&self) -> bool {
        false
    }
}

/// Run `gearsieve draw`.
pub fn run(args: DrawArgs) -> anyhow::Result<i32> {
    let default = if args.gear.is_some() { FormatArg::Table } else { FormatArg::Svg };
    let format = chosen_format(args.format, args.output.as_deref(), default);
    let print = Print { format: format.into(), output: args.output.clone(), threads: None, quiet: true };
    run::run(&DrawJob::try_from(args)?, &print)
}
