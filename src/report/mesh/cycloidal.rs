//! One cycloidal wheel-and-pinion pair (`gearsieve mesh --tooth-form cycloidal`) as a document,
//! JSON and a drawing (no CSV, as for an involute pair): each gear's proportions, the pair's centre distance and arcs of action, and the
//! verdict. It computes nothing about gears; the figures come from
//! [`crate::geometry::cycloidal`].

use std::io::Write;

use serde::Serialize;

use crate::geometry::cycloidal::{CycloidalGear, CycloidalLimits, CycloidalMesh};
use crate::geometry::MeshDefect;
use crate::model::pool::fmt_num;
use crate::report::fields::{decimals, StageJson};
use crate::report::{
    pictures, write_json, Completion, Document, Drawing, RenderError, Report, Table, SCHEMA_VERSION,
};

/// A cycloidal pair, worked out and judged.
#[derive(Debug)]
pub struct CycloidalPairReport<'a> {
    /// The pair.
    pub mesh: &'a CycloidalMesh,
    /// The limits it was judged against.
    pub limits: &'a CycloidalLimits,
    /// The least contact ratio asked for.
    pub min_contact_ratio: f64,
    /// Every reason it would not run, empty when it runs.
    pub defects: &'a [MeshDefect],
}

#[derive(Serialize)]
struct GearJson {
    teeth: u32,
    role: &'static str,
    pitch_diameter_mm: f64,
    addendum_mm: f64,
    dedendum_mm: f64,
    tip_diameter_mm: f64,
    root_diameter_mm: f64,
    thickness_mm: f64,
    tip_radius_mm: f64,
}

#[derive(Serialize)]
struct PairDoc {
    schema_version: u32,
    tooth_form: &'static str,
    module_mm: f64,
    reference_centre_distance_mm: f64,
    working_centre_distance_mm: f64,
    gears: Vec<GearJson>,
    pitch_deg: f64,
    wheel_tip_arc_deg: f64,
    pinion_tip_arc_deg: f64,
    contact_ratio: f64,
    before_line_fraction: f64,
    root_clearance_mm: [f64; 2],
    min_contact_ratio: f64,
    max_before_line_fraction: f64,
    min_root_clearance_modules: f64,
    ok: bool,
    defects: Vec<String>,
}

fn role(g: &CycloidalGear) -> &'static str {
    if g.is_pinion {
        "pinion"
    } else {
        "wheel"
    }
}

impl CycloidalPairReport<'_> {
    fn doc(&self) -> PairDoc {
        let m = self.mesh;
        PairDoc {
            schema_version: SCHEMA_VERSION,
            tooth_form: "cycloidal",
            module_mm: m.module_mm,
            reference_centre_distance_mm: m.standard_centre_distance_mm,
            working_centre_distance_mm: m.centre_distance_mm,
            gears: m
                .gears
                .iter()
                .map(|g| GearJson {
                    teeth: g.teeth,
                    role: role(g),
                    pitch_diameter_mm: g.pitch_diameter_mm,
                    addendum_mm: g.addendum_mm,
                    dedendum_mm: g.dedendum_mm,
                    tip_diameter_mm: g.tip_diameter_mm,
                    root_diameter_mm: g.root_diameter_mm,
                    thickness_mm: g.thickness_mm,
                    tip_radius_mm: g.tip_radius_mm,
                })
                .collect(),
            pitch_deg: m.pitch_deg,
            wheel_tip_arc_deg: m.wheel_tip_arc_deg,
            pinion_tip_arc_deg: m.pinion_tip_arc_deg,
            contact_ratio: m.contact_ratio,
            before_line_fraction: m.before_line_fraction,
            root_clearance_mm: m.root_clearance_mm,
            min_contact_ratio: self.min_contact_ratio,
            max_before_line_fraction: self.limits.max_before_line_fraction,
            min_root_clearance_modules: self.limits.min_root_clearance_modules,
            ok: self.defects.is_empty(),
            defects: self.defects.iter().map(|d| d.to_string()).collect(),
        }
    }
}

impl Report for CycloidalPairReport<'_> {
    fn kind(&self) -> &'static str {
        "a cycloidal pair"
    }

    fn completion(&self) -> Completion {
        Completion { complete: true, found: self.defects.is_empty() }
    }

    fn document(&self) -> Option<Document> {
        let m = self.mesh;
        let mut d = Document::new();
        d.title(format!(
            "Cycloidal pair: {}-tooth driver, {}-tooth driven, module {} mm",
            m.teeth[0],
            m.teeth[1],
            fmt_num(m.module_mm)
        ));
        let rows: Vec<Vec<String>> = [
            (
                "role",
                Box::new(|g: &CycloidalGear| role(g).to_string()) as Box<dyn Fn(&CycloidalGear) -> String>,
            ),
            ("teeth", Box::new(|g: &CycloidalGear| g.teeth.to_string())),
            ("pitch diameter, mm", Box::new(|g: &CycloidalGear| decimals(g.pitch_diameter_mm, 3))),
            ("addendum, mm", Box::new(|g: &CycloidalGear| decimals(g.addendum_mm, 3))),
            ("dedendum, mm", Box::new(|g: &CycloidalGear| decimals(g.dedendum_mm, 3))),
            ("tip diameter, mm", Box::new(|g: &CycloidalGear| decimals(g.tip_diameter_mm, 3))),
            ("root diameter, mm", Box::new(|g: &CycloidalGear| decimals(g.root_diameter_mm, 3))),
            ("tooth (leaf) thickness, mm", Box::new(|g: &CycloidalGear| decimals(g.thickness_mm, 3))),
            ("tip rounded to radius, mm", Box::new(|g: &CycloidalGear| decimals(g.tip_radius_mm, 3))),
        ]
        .iter()
        .map(|(name, f)| vec![name.to_string(), f(&m.gears[0]), f(&m.gears[1])])
        .collect();
        d.table(Table::new(&["", "driver", "driven"], &[]).with_rows(rows));
        d.blank();
        d.line(format!(
            "Centre distance {} mm (m·(z1 + z2)/2 = {} mm); root clearance {} / {} mm",
            decimals(m.centre_distance_mm, 3),
            decimals(m.standard_centre_distance_mm, 3),
            decimals(m.root_clearance_mm[0], 3),
            decimals(m.root_clearance_mm[1], 3)
        ));
        d.line(format!(
            "Arcs of action (degrees of the pinion's turn): wheel tips {:.2}°, pinion tips {:.2}°, a leaf's pitch {:.2}°",
            m.wheel_tip_arc_deg, m.pinion_tip_arc_deg, m.pitch_deg
        ));
        d.line(format!(
            "Contact ratio (leaves in action) {:.3}; {:.0}% of each leaf's action before the line of centres",
            m.contact_ratio,
            100.0 * m.before_line_fraction
        ));
        d.blank();
        if self.defects.is_empty() {
            d.line("Runs.");
        } else {
            d.line("Does not run:");
            for defect in self.defects {
                d.line(format!("- {defect}"));
            }
        }
        d.blank();
        d.note(format!(
            "Limits: least contact ratio {}, at most {:.0}% of a leaf's action before the line of centres, root \
             clearance at least {} modules. Proportions of BS 978 part 2, from memory.",
            fmt_num(self.min_contact_ratio),
            100.0 * self.limits.max_before_line_fraction,
            fmt_num(self.limits.min_root_clearance_modules)
        ));
        Some(d)
    }

    fn json(&self, w: &mut dyn Write) -> Result<(), RenderError> {
        write_json(&self.doc(), w)
    }

    fn drawing(&self) -> Option<Drawing> {
        let m = self.mesh;
        let mut stage = StageJson::plain(m.teeth[0], m.teeth[1], m.module_mm, 20.0);
        stage.working_centre_distance_mm = Some(m.centre_distance_mm);
        stage.tip_diameter_mm = Some([m.gears[0].tip_diameter_mm, m.gears[1].tip_diameter_mm]);
        stage.tooth_form = Some("cycloidal".into());
        let verdict = if self.defects.is_empty() { "runs" } else { "does not run" };
        let title = format!("Cycloidal {}-leaf and {}-tooth pair: {verdict}", m.teeth[0], m.teeth[1]);
        Some(pictures::train(&[stage], &title, ("driver", "driven")))
    }
}
