//! One gear's outline to cut (`gearsieve draw --gear`): its data for the cutter as a table, its
//! closed outline in mm centred at the origin as an SVG drawing, as DXF (a closed polyline in
//! millimetres, for CAM and laser or wire cutting) and as JSON points. The outline is the
//! geometry core's ([`crate::geometry::outline`]); nothing here computes a tooth.

use std::io::Write;

use serde::Serialize;

use super::drawing::{Drawing, Pen, Shape};
use super::words::MESH_CAUTION;
use super::{write_json, Completion, Document, RenderError, Report, Table, SCHEMA_VERSION};
use crate::geometry::outline::Outline;
use crate::model::pool::fmt_num;

/// A gear's outline with what it was cut from.
#[derive(Debug, Clone)]
pub struct GearProfile {
    /// Module, mm.
    pub module_mm: f64,
    /// Pressure angle of the basic rack, degrees.
    pub pressure_angle_deg: f64,
    /// Profile shift coefficient, modules.
    pub shift: f64,
    /// Tip shortening, modules.
    pub tip_shortening: f64,
    /// The outline.
    pub outline: Outline,
}

#[derive(Serialize)]
struct ProfileJson<'a> {
    schema_version: u32,
    teeth: u32,
    module_mm: f64,
    pressure_angle_deg: f64,
    shift: f64,
    tip_shortening: f64,
    tip_diameter_mm: f64,
    root_diameter_mm: f64,
    pitch_diameter_mm: f64,
    base_diameter_mm: f64,
    form_diameter_mm: f64,
    undercut: bool,
    tolerance_mm: f64,
    points: &'a [[f64; 2]],
    caution: &'static str,
}

impl GearProfile {
    fn title(&self) -> String {
        format!(
            "{}-tooth gear, module {} mm, {}°, profile shift {}",
            self.outline.teeth,
            fmt_num(self.module_mm),
            fmt_num(self.pressure_angle_deg),
            fmt_num(self.shift)
        )
    }

    /// Write the outline as DXF: one closed polyline in millimetres, centred at the origin.
    pub fn write_dxf(&self, w: &mut dyn Write) -> Result<(), RenderError> {
        let mut drawing = dxf::Drawing::new();
        // Lightweight polylines need a file version of R14 or later.
        drawing.header.version = dxf::enums::AcadVersion::R2000;
        drawing.header.default_drawing_units = dxf::enums::Units::Millimeters;
        let mut poly = dxf::entities::LwPolyline {
            vertices: self
                .outline
                .points
                .iter()
                .map(|p| dxf::LwPolylineVertex { x: p[0], y: p[1], ..Default::default() })
                .collect(),
            ..Default::default()
        };
        poly.set_is_closed(true);
        drawing.add_entity(dxf::entities::Entity::new(dxf::entities::EntityType::LwPolyline(poly)));
        drawing.save(w).map_err(|e| std::io::Error::other(e.to_string()))?;
        Ok(())
    }

    /// The outline alone, as a cutter wants it: the closed path and nothing else.
    pub fn cutting_drawing(&self) -> Drawing {
        Drawing {
            title: self.title(),
            shapes: vec![Shape::Path {
                points: self.outline.points.clone(),
                closed: true,
                pen: Pen::Outline,
            }],
            notes: Vec::new(),
        }
    }
}

impl Report for GearProfile {
    fn kind(&self) -> &'static str {
        "a gear profile"
    }

    fn completion(&self) -> Completion {
        Completion { complete: true, found: true }
    }

    fn document(&self) -> Option<Document> {
        let o = &self.outline;
        let mut d = Document::new();
        d.title(self.title());
        d.line(format!(
            "Cut by the ISO 53 basic rack, tip shortened {} modules; outline traced to {} mm",
            fmt_num(self.tip_shortening),
            fmt_num(o.tolerance_mm)
        ));
        d.blank();
        let mm = |r: f64| format!("{:.3}", 2.0 * r);
        let rows = vec![
            vec!["tip diameter".into(), "mm".into(), mm(o.tip_radius_mm)],
            vec!["pitch diameter".into(), "mm".into(), mm(o.pitch_radius_mm)],
            vec!["form diameter (involute begins)".into(), "mm".into(), mm(o.form_radius_mm)],
            vec!["base diameter".into(), "mm".into(), mm(o.base_radius_mm)],
            vec!["root diameter".into(), "mm".into(), mm(o.root_radius_mm)],
            vec!["undercut".into(), String::new(), if o.undercut { "yes" } else { "no" }.into()],
            vec!["outline points".into(), String::new(), o.points.len().to_string()],
        ];
        d.table(Table::new(&["quantity", "unit", "value"], &[2]).with_rows(rows));
        d.blank();
        d.note(MESH_CAUTION);
        Some(d)
    }

    fn json(&self, w: &mut dyn Write) -> Result<(), RenderError> {
        let o = &self.outline;
        write_json(
            &ProfileJson {
                schema_version: SCHEMA_VERSION,
                teeth: o.teeth,
                module_mm: self.module_mm,
                pressure_angle_deg: self.pressure_angle_deg,
                shift: self.shift,
                tip_shortening: self.tip_shortening,
                tip_diameter_mm: 2.0 * o.tip_radius_mm,
                root_diameter_mm: 2.0 * o.root_radius_mm,
                pitch_diameter_mm: 2.0 * o.pitch_radius_mm,
                base_diameter_mm: 2.0 * o.base_radius_mm,
                form_diameter_mm: 2.0 * o.form_radius_mm,
                undercut: o.undercut,
                tolerance_mm: o.tolerance_mm,
                points: &o.points,
                caution: MESH_CAUTION,
            },
            w,
        )
    }

    /// The outline with its pitch and base circles, to look at.
    fn drawing(&self) -> Option<Drawing> {
        let o = &self.outline;
        let circle = |r: f64, pen| Shape::Circle { centre: [0.0, 0.0], radius_mm: r, pen };
        Some(Drawing {
            title: self.title(),
            shapes: vec![
                circle(o.base_radius_mm, Pen::Base),
                circle(o.pitch_radius_mm, Pen::Pitch),
                Shape::Path { points: o.points.clone(), closed: true, pen: Pen::Outline },
                Shape::Circle { centre: [0.0, 0.0], radius_mm: o.pitch_radius_mm / 40.0, pen: Pen::Centre },
            ],
            notes: vec![format!(
                "Outline as the basic rack cuts it, traced to {} mm; circles: pitch (dash-dot), base (thin). \
                 Drawn to scale, mm.",
                fmt_num(o.tolerance_mm)
            )],
        })
    }
}
