//! Renderers for the geometry of one pair (`gearsieve mesh`): an aligned table a designer reads
//! before cutting, and a JSON document for scripts. Both take a finished [`MeshReport`] and a
//! writer; neither works out any geometry (the only arithmetic is mm-to-inch for display).
//!
//! The JSON contract:
//!
//! ```text
//! {"inputs": {"teeth": [z1, z2], "module_mm": f64, "diametral_pitch": f64 (inch input only),
//!             "pressure_angle_deg": f64, "rack": {"addendum", "dedendum", "root_radius"},
//!             "mounting": {"shifted": {"shift": [x1, x2]}}
//!                       | {"at_centre_distance": {"centre_distance_mm": f64,
//!                                                 "shift_sum_range": [lo, hi]}}},
//!  "limits": {"min_contact_ratio", "min_tip_thickness_modules", "allow_undercut"},
//!  "geometry": { every field of MeshGeometry, lengths in mm, angles in degrees },
//!  "shift_sum": x1 + x2, "ok": bool, "defects": ["<reason in shop words>", …],
//!  "caution": "<text>"}
//! ```
//! An open end of `shift_sum_range` is written as `null`. Field names and meanings are stable;
//! fields may be added.

use std::io::{self, Write};

use serde::Serialize;

use crate::geometry::{MeshDefect, MeshGeometry, MeshLimits, RackProfile, MM_PER_INCH};
use crate::model::pool::fmt_num;

/// The caution printed with every mesh report.
pub const MESH_CAUTION: &str = "gearsieve sizes geometry only. A pair that carries power needs a \
                                load-capacity rating (e.g. ISO 6336 or AGMA 2001) by a qualified \
                                person.";

/// How the pair was asked to be made and mounted, as given on the command line.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum MountingInput {
    /// Cut with these profile shifts `[x1, x2]` (modules) and mounted tight.
    Shifted {
        /// Profile shifts `[x1, x2]`, in modules.
        shift: [f64; 2],
    },
    /// Cut by profile shift to mesh tight at this working centre distance.
    AtCentreDistance {
        /// Working centre distance asked for, mm.
        centre_distance_mm: f64,
        /// Range the shift sum x1 + x2 was allowed to take, in modules (ends may be infinite).
        shift_sum_range: [f64; 2],
    },
}

/// What was asked for, as validated.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct MeshInputs {
    /// Tooth counts `[driver, driven]`.
    pub teeth: [u32; 2],
    /// Module, mm.
    pub module_mm: f64,
    /// Diametral pitch (teeth per inch of pitch diameter) when the size was given that way;
    /// the table then shows inch figures beside the millimetres.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub diametral_pitch: Option<f64>,
    /// Pressure angle, degrees.
    pub pressure_angle_deg: f64,
    /// Basic rack, in modules.
    pub rack: RackProfile,
    /// How the pair is made and mounted.
    pub mounting: MountingInput,
}

/// One worked-out and judged mesh, ready to print.
#[derive(Debug, Clone, Copy)]
pub struct MeshReport<'a> {
    /// What was asked.
    pub inputs: &'a MeshInputs,
    /// Limits the mesh was judged against.
    pub limits: &'a MeshLimits,
    /// The geometry.
    pub geometry: &'a MeshGeometry,
    /// Every reason it would not run, empty when it runs.
    pub defects: &'a [MeshDefect],
}

#[derive(Serialize)]
struct Doc<'a> {
    inputs: &'a MeshInputs,
    limits: &'a MeshLimits,
    geometry: &'a MeshGeometry,
    shift_sum: f64,
    ok: bool,
    defects: Vec<String>,
    caution: &'static str,
}

/// Write `report` as one pretty-printed JSON document and a newline.
pub fn write_json(report: &MeshReport, w: &mut dyn Write) -> io::Result<()> {
    let doc = Doc {
        inputs: report.inputs,
        limits: report.limits,
        geometry: report.geometry,
        shift_sum: report.geometry.shift_sum(),
        ok: report.defects.is_empty(),
        defects: report.defects.iter().map(ToString::to_string).collect(),
        caution: MESH_CAUTION,
    };
    serde_json::to_writer_pretty(&mut *w, &doc).map_err(io::Error::other)?;
    writeln!(w)
}

/// Width of the label column of the table.
const LABEL: usize = 28;
/// Width of the unit column.
const UNIT: usize = 8;
/// Width of each value column.
const VALUE: usize = 12;

/// Writes aligned rows; `inch` adds an inch row under every length row.
struct Rows<'w> {
    w: &'w mut dyn Write,
    inch: bool,
}

impl Rows<'_> {
    fn row(&mut self, label: &str, unit: &str, values: &[String]) -> io::Result<()> {
        write!(self.w, "{label:<LABEL$}{unit:<UNIT$}")?;
        for v in values {
            write!(self.w, "{v:>VALUE$}")?;
        }
        writeln!(self.w)
    }

    /// A length in mm (3 decimals), and in inches (4 decimals) for inch gearing.
    fn lengths(&mut self, label: &str, mm: &[f64]) -> io::Result<()> {
        self.row(label, "mm", &fixed(mm, 3))?;
        if self.inch {
            let inches: Vec<f64> = mm.iter().map(|v| v / MM_PER_INCH).collect();
            self.row("", "in", &fixed(&inches, 4))?;
        }
        Ok(())
    }
}

/// Each value to `decimals` places, without a minus sign on a value that rounds to zero.
fn fixed(values: &[f64], decimals: usize) -> Vec<String> {
    values
        .iter()
        .map(|v| {
            let s = format!("{v:.decimals$}");
            match s.strip_prefix('-') {
                Some(rest) if rest.chars().all(|c| c == '0' || c == '.') => rest.to_string(),
                _ => s,
            }
        })
        .collect()
}

fn yes_no(flags: [bool; 2]) -> Vec<String> {
    flags.iter().map(|&f| if f { "yes" } else { "no" }.to_string()).collect()
}

/// Write `report` as a table for people: what was asked, the two gears side by side, the pair,
/// the verdict and the caution.
pub fn write_table(report: &MeshReport, w: &mut dyn Write) -> io::Result<()> {
    let i = report.inputs;
    let g = report.geometry;
    let l = report.limits;
    writeln!(w, "External spur mesh: a {}-tooth driver and a {}-tooth driven gear", g.teeth[0], g.teeth[1])?;
    match i.diametral_pitch {
        Some(p) => writeln!(
            w,
            "Diametral pitch {} (module {} mm), pressure angle {}°",
            fmt_num(p),
            fmt_num(i.module_mm),
            fmt_num(i.pressure_angle_deg)
        )?,
        None => writeln!(
            w,
            "Module {} mm, pressure angle {}°",
            fmt_num(i.module_mm),
            fmt_num(i.pressure_angle_deg)
        )?,
    }
    writeln!(
        w,
        "Basic rack, in modules: addendum {}, dedendum {}, root radius {}",
        fmt_num(i.rack.addendum),
        fmt_num(i.rack.dedendum),
        fmt_num(i.rack.root_radius)
    )?;
    match i.mounting {
        MountingInput::Shifted { shift } => writeln!(
            w,
            "Cut with profile shifts {} and {}, mounted tight",
            fmt_num(shift[0]),
            fmt_num(shift[1])
        )?,
        MountingInput::AtCentreDistance { centre_distance_mm, shift_sum_range } => writeln!(
            w,
            "Cut by profile shift to mesh tight at {} mm{}, shift sum allowed {}",
            fmt_num(centre_distance_mm),
            if i.diametral_pitch.is_some() {
                format!(" ({} in)", fmt_num(centre_distance_mm / MM_PER_INCH))
            } else {
                String::new()
            },
            describe_range(shift_sum_range)
        )?,
    }
    writeln!(
        w,
        "Limits: contact ratio at least {}, tip at least {} modules thick, undercut {}",
        fmt_num(l.min_contact_ratio),
        fmt_num(l.min_tip_thickness_modules),
        if l.allow_undercut { "allowed" } else { "not allowed" }
    )?;
    writeln!(w)?;

    let mut rows = Rows { w, inch: i.diametral_pitch.is_some() };
    rows.row("Gear", "", &["driver".to_string(), "driven".to_string()])?;
    rows.row("teeth", "", &g.teeth.map(|z| z.to_string()))?;
    rows.row("profile shift x", "modules", &fixed(&g.shift, 4))?;
    rows.lengths("pitch diameter", &g.pitch_diameter_mm)?;
    rows.lengths("working pitch diameter", &g.working_pitch_diameter_mm)?;
    rows.lengths("base diameter", &g.base_diameter_mm)?;
    rows.lengths("tip diameter", &g.tip_diameter_mm)?;
    rows.lengths("root diameter", &g.root_diameter_mm)?;
    rows.lengths("tip thickness", &g.tip_thickness_mm)?;
    rows.row("", "modules", &fixed(&g.tip_thickness_modules, 4))?;
    rows.row("x_min (undercut limit)", "modules", &fixed(&g.min_shift, 4))?;
    rows.row("undercut", "", &yes_no(g.undercut))?;
    rows.row("tips dig into mate's flank", "", &yes_no(g.tip_interference))?;
    rows.lengths("clearance under its tip", &g.bottom_clearance_mm)?;
    writeln!(rows.w)?;

    writeln!(rows.w, "Pair")?;
    rows.lengths("standard centre distance", &[g.standard_centre_distance_mm])?;
    rows.lengths("working centre distance", &[g.centre_distance_mm])?;
    rows.row("working pressure angle", "deg", &fixed(&[g.working_pressure_angle_deg], 4))?;
    rows.row("profile shift sum", "modules", &fixed(&[g.shift_sum()], 4))?;
    rows.row("tip shortening", "modules", &fixed(&[g.tip_shortening], 4))?;
    rows.lengths("backlash (nominal)", &[g.backlash_mm])?;
    rows.row("transverse contact ratio", "", &fixed(&[g.contact_ratio], 4))?;
    let w = rows.w;
    writeln!(w)?;

    if report.defects.is_empty() {
        writeln!(w, "Verdict: runs")?;
    } else {
        writeln!(w, "Verdict: does not run")?;
        for d in report.defects {
            writeln!(w, "  - {d}")?;
        }
    }
    writeln!(w, "{MESH_CAUTION}")
}

/// `-1 to 2`, with open ends in words.
fn describe_range(range: [f64; 2]) -> String {
    match (range[0].is_finite(), range[1].is_finite()) {
        (true, true) => format!("{} to {}", fmt_num(range[0]), fmt_num(range[1])),
        (true, false) => format!("{} or more", fmt_num(range[0])),
        (false, true) => format!("up to {}", fmt_num(range[1])),
        (false, false) => "without limit".to_string(),
    }
}
