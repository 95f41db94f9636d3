//! The geometry of one pair (`gearsieve mesh`) for people — what was asked, the two gears side
//! by side, the pair, the verdict — and as a JSON document for scripts. Both read a finished
//! [`MeshReport`]; neither works out any geometry (the only arithmetic is mm-to-inch for
//! display).
//!
//! The JSON contract:
//!
//! ```text
//! {"schema_version": 3,
//!  "inputs": {"teeth": [z1, z2], "module_mm": f64, "diametral_pitch": f64 (inch input only),
//!             "pressure_angle_deg": f64, "rack": {"addendum", "dedendum", "root_radius"},
//!             "mounting": {"shifted": {"shift": [x1, x2]}}
//!                       | {"at_centre_distance": {"working_centre_distance_mm": f64,
//!                                                 "shift_sum_range": [lo, hi]}}},
//!  "limits": {"min_contact_ratio", "min_tip_thickness_modules", "allow_undercut"},
//!  "geometry": { every field of MeshGeometry, lengths in mm, angles in degrees },
//!  "shift_sum": x1 + x2, "ok": bool, "defects": ["<reason in shop words>", …],
//!  "caution": "<text>"}
//! ```
//! An open end of `shift_sum_range` is written as `null`. Field names and meanings are stable;
//! fields may be added.

pub mod cycloidal;

use std::io::Write;

use serde::Serialize;

use super::fields::StageJson;
use super::gear_data;
use super::words::MESH_CAUTION;
use super::{
    pictures, write_json, Completion, Document, Drawing, RenderError, Report, Table, SCHEMA_VERSION,
};
use crate::geometry::allowance::{BacklashChoice, BacklashPlan};
use crate::geometry::measure::{GearData, PairData};
use crate::geometry::{MeshDefect, MeshGeometry, MeshLimits, RackProfile, MM_PER_INCH};
use crate::model::pool::fmt_num;

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
        #[serde(rename = "working_centre_distance_mm")]
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

/// What the shop figures were asked for: backlash, housing tolerance, balls.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct ShopInputs {
    /// The backlash the pair is to have (`backlash_wanted` in JSON).
    #[serde(rename = "backlash_wanted")]
    pub backlash: BacklashChoice,
    /// How far the housing may put the centres from the working centre distance, either way,
    /// mm.
    pub housing_tolerance_mm: f64,
    /// Ball diameters to measure over, mm, `None` for the suggested size.
    pub balls_mm: [Option<f64>; 2],
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
    /// What the shop figures were asked for.
    pub shop: &'a ShopInputs,
    /// The allowances, backlash and measurement data of both gears.
    pub pair: &'a PairData,
}

impl Report for MeshReport<'_> {
    fn kind(&self) -> &'static str {
        "a mesh check"
    }

    fn completion(&self) -> Completion {
        Completion { complete: true, found: self.defects.is_empty() }
    }

    fn document(&self) -> Option<Document> {
        Some(document(self))
    }

    fn json(&self, w: &mut dyn Write) -> Result<(), RenderError> {
        json(self, w)
    }

    /// The pair at its working centre distance, driver on the left.
    fn drawing(&self) -> Option<Drawing> {
        let g = self.geometry;
        let stage = StageJson {
            driver: g.teeth[0],
            driven: g.teeth[1],
            module_mm: g.module_mm,
            pressure_angle_deg: g.pressure_angle_deg,
            diametral_pitch: self.inputs.diametral_pitch,
            reference_centre_distance_mm: g.standard_centre_distance_mm,
            driver_labels: Vec::new(),
            driven_labels: Vec::new(),
            shift: Some(g.shift),
            working_centre_distance_mm: Some(g.centre_distance_mm),
            working_pressure_angle_deg: Some(g.working_pressure_angle_deg),
            contact_ratio: Some(g.contact_ratio),
            tip_diameter_mm: Some(g.tip_diameter_mm),
            backlash_mm: None,
            on_hand_defects: Vec::new(),
            gear_data: None,
            tooth_form: None,
        };
        let verdict = if self.defects.is_empty() { "runs" } else { "does not run" };
        let title = format!(
            "{}-tooth driver and {}-tooth driven gear, module {} mm, x {}/{}: {verdict}",
            g.teeth[0],
            g.teeth[1],
            fmt_num(g.module_mm),
            fmt_num(g.shift[0]),
            fmt_num(g.shift[1])
        );
        let mut d = pictures::train(std::slice::from_ref(&stage), &title, ("driver", "driven"));
        pictures::add_line_of_action(&mut d, &stage, [0.0, 0.0], [g.centre_distance_mm, 0.0]);
        Some(d)
    }
}

#[derive(Serialize)]
struct Doc<'a> {
    schema_version: u32,
    inputs: &'a MeshInputs,
    limits: &'a MeshLimits,
    geometry: &'a MeshGeometry,
    shift_sum: f64,
    ok: bool,
    defects: Vec<String>,
    shop_inputs: &'a ShopInputs,
    backlash: Option<BacklashPlan>,
    #[serde(skip_serializing_if = "Option::is_none")]
    backlash_problem: Option<&'a str>,
    gear_data: &'a [GearData; 2],
    caution: &'static str,
}

/// Write `report` as one pretty-printed JSON document and a newline.
pub fn json(report: &MeshReport, w: &mut dyn Write) -> Result<(), RenderError> {
    let doc = Doc {
        schema_version: SCHEMA_VERSION,
        inputs: report.inputs,
        limits: report.limits,
        geometry: report.geometry,
        shift_sum: report.geometry.shift_sum(),
        ok: report.defects.is_empty(),
        defects: report.defects.iter().map(ToString::to_string).collect(),
        shop_inputs: report.shop,
        backlash: report.pair.backlash,
        backlash_problem: report.pair.backlash_problem.as_deref(),
        gear_data: &report.pair.gears,
        caution: MESH_CAUTION,
    };
    write_json(&doc, w)
}

/// Text widths of the label, unit and value columns.
const WIDTHS: [usize; 4] = [28, 8, 12, 12];

/// Rows of the gear and pair tables; `inch` adds an inch row under every length row.
struct Rows {
    rows: Vec<Vec<String>>,
    inch: bool,
}

impl Rows {
    fn row(&mut self, label: &str, unit: &str, values: &[String]) {
        let mut r = vec![label.to_string(), unit.to_string()];
        r.extend(values.iter().cloned());
        self.rows.push(r);
    }

    /// A length in mm (3 decimals), and in inches (4 decimals) for inch gearing.
    fn lengths(&mut self, label: &str, mm: &[f64]) {
        self.row(label, "mm", &fixed(mm, 3));
        if self.inch {
            let inches: Vec<f64> = mm.iter().map(|v| v / MM_PER_INCH).collect();
            self.row("", "in", &fixed(&inches, 4));
        }
    }

    /// The rows as a table under `head`, laid out in fixed columns in text.
    fn table(self, head: &[&str]) -> Table {
        Table::new(head, &[2, 3]).spaced(0, 0).min_widths(&WIDTHS).with_rows(self.rows)
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
pub fn document(report: &MeshReport) -> Document {
    let mut d = Document::new();
    let i = report.inputs;
    let g = report.geometry;
    let l = report.limits;
    d.title(format!(
        "External spur mesh: a {}-tooth driver and a {}-tooth driven gear",
        g.teeth[0], g.teeth[1]
    ));
    match i.diametral_pitch {
        Some(p) => d.line(format!(
            "Diametral pitch {} (module {} mm), pressure angle {}°",
            fmt_num(p),
            fmt_num(i.module_mm),
            fmt_num(i.pressure_angle_deg)
        )),
        None => d.line(format!(
            "Module {} mm, pressure angle {}°",
            fmt_num(i.module_mm),
            fmt_num(i.pressure_angle_deg)
        )),
    }
    d.line(format!(
        "Basic rack, in modules: addendum {}, dedendum {}, root radius {}",
        fmt_num(i.rack.addendum),
        fmt_num(i.rack.dedendum),
        fmt_num(i.rack.root_radius)
    ));
    match i.mounting {
        MountingInput::Shifted { shift } => d.line(format!(
            "Cut with profile shifts {} and {}, mounted tight",
            fmt_num(shift[0]),
            fmt_num(shift[1])
        )),
        MountingInput::AtCentreDistance { centre_distance_mm, shift_sum_range } => d.line(format!(
            "Cut by profile shift to mesh tight at {} mm{}, shift sum allowed {}",
            fmt_num(centre_distance_mm),
            if i.diametral_pitch.is_some() {
                format!(" ({} in)", fmt_num(centre_distance_mm / MM_PER_INCH))
            } else {
                String::new()
            },
            describe_range(shift_sum_range)
        )),
    }
    d.line(format!(
        "Limits: contact ratio at least {}, tip at least {} modules thick, undercut {}",
        fmt_num(l.min_contact_ratio),
        fmt_num(l.min_tip_thickness_modules),
        if l.allow_undercut { "allowed" } else { "not allowed" }
    ));
    d.blank();

    let inch = i.diametral_pitch.is_some();
    let mut rows = Rows { rows: Vec::new(), inch };
    rows.row("teeth", "", &g.teeth.map(|z| z.to_string()));
    rows.row("profile shift x", "modules", &fixed(&g.shift, 4));
    rows.lengths("pitch diameter", &g.pitch_diameter_mm);
    rows.lengths("working pitch diameter", &g.working_pitch_diameter_mm);
    rows.lengths("base diameter", &g.base_diameter_mm);
    rows.lengths("tip diameter", &g.tip_diameter_mm);
    rows.lengths("root diameter", &g.root_diameter_mm);
    rows.lengths("tip thickness", &g.tip_thickness_mm);
    rows.row("", "modules", &fixed(&g.tip_thickness_modules, 4));
    rows.row("x_min (undercut limit)", "modules", &fixed(&g.min_shift, 4));
    rows.row("undercut", "", &yes_no(g.undercut));
    rows.row("tips dig into mate's flank", "", &yes_no(g.tip_interference));
    rows.lengths("clearance under its tip", &g.bottom_clearance_mm);
    d.table(rows.table(&["Gear", "", "driver", "driven"]));
    d.blank();

    d.heading("Pair");
    let mut rows = Rows { rows: Vec::new(), inch };
    rows.lengths("standard centre distance", &[g.standard_centre_distance_mm]);
    rows.lengths("working centre distance", &[g.centre_distance_mm]);
    rows.row("working pressure angle", "deg", &fixed(&[g.working_pressure_angle_deg], 4));
    rows.row("profile shift sum", "modules", &fixed(&[g.shift_sum()], 4));
    rows.row("tip shortening", "modules", &fixed(&[g.tip_shortening], 4));
    rows.lengths("backlash, nominal teeth", &[g.backlash_mm]);
    if let Some(b) = &report.pair.backlash {
        rows.lengths("normal backlash, least", &[b.backlash.normal_mm[0]]);
        rows.lengths("normal backlash, most", &[b.backlash.normal_mm[1]]);
        rows.lengths("circumf. backlash, least", &[b.backlash.circumferential_mm[0]]);
        rows.lengths("circumf. backlash, most", &[b.backlash.circumferential_mm[1]]);
    }
    rows.row("transverse contact ratio", "", &fixed(&[g.contact_ratio], 4));
    d.table(rows.table(&["quantity", "unit", "value"]).headless_in_text());
    d.blank();

    d.heading("Backlash and tooth thickness");
    for line in gear_data::backlash_lines(report.pair) {
        d.item(1, true, line);
    }
    d.item(
        1,
        true,
        match report.shop.backlash {
            BacklashChoice::Recommended => "least backlash as recommended for industrial drives, \
                (2/3)(0.06 + 0.0005·a + 0.03·m) mm (ISO/TR 10064-2); allowances split equally \
                between the gears"
                .to_string(),
            BacklashChoice::Range(_) => "allowances split equally between the gears".to_string(),
        },
    );
    d.blank();
    let labels = ["driver".to_string(), "driven".to_string()];
    let gears = [&report.pair.gears[0], &report.pair.gears[1]];
    gear_data::add_table(&mut d, "For the gear cutter", &labels, &gears);
    d.blank();

    if report.defects.is_empty() {
        d.heading("Verdict: runs");
    } else {
        d.heading("Verdict: does not run");
        for defect in report.defects {
            d.item(1, true, defect.to_string());
        }
    }
    d.note(MESH_CAUTION);
    d
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
