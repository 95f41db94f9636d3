//! Pictures of results: a train drawn to scale on its shafts, and one pair. Each gear is drawn
//! with its pitch, base and root circles and its tip (its true tooth outline where the geometry
//! provides one); gears sharing a shaft are drawn on their planes, the front plane solid and the
//! back plane dashed, so a compound train reads at a glance; each line of centres carries its
//! working centre distance. Built from finished results (the JSON views every format shares);
//! shaft positions come from [`crate::geometry::layout`].

use super::drawing::{Drawing, Pen, Shape};
use super::fields::StageJson;
use super::{Completion, Document, Report, Table};
use crate::geometry::layout::{shaft_centres, ShaftLayout};
use crate::geometry::outline::{gear_outline, mesh_rotation, BacklashSide};
use crate::geometry::{cycloidal_mesh, cycloidal_outline};
use crate::geometry::{mesh_geometry, Mounting, RackProfile, ToothSystem};
use crate::model::pool::fmt_num;

/// Chordal tolerance of tooth outlines in pictures, mm: finer than a printed line is wide.
pub const PICTURE_TOLERANCE_MM: f64 = 0.01;

/// Letter height of labels, mm, for a picture whose largest gear has radius `r_mm`.
pub fn label_mm(r_mm: f64) -> f64 {
    (r_mm / 8.0).clamp(2.0, 6.0)
}

/// One gear of a picture: where it sits and what it is.
struct GearAt {
    shaft: usize,
    centre: [f64; 2],
    /// The true tooth outline (points in the gear's own frame, mm) and its rotation, when the
    /// geometry could work it out.
    outline: Option<(Vec<[f64; 2]>, f64)>,
    /// Cycloidal teeth: no base circle to draw.
    cycloidal: bool,
    teeth: u32,
    module_mm: f64,
    pressure_angle_deg: f64,
    shift: f64,
    tip_diameter_mm: f64,
    back: bool,
}

impl GearAt {
    fn shapes(&self, rack: RackProfile, out: &mut Vec<Shape>) {
        let m = self.module_mm;
        let d = m * self.teeth as f64;
        let base = d * self.pressure_angle_deg.to_radians().cos();
        let root = d - 2.0 * m * (rack.dedendum - self.shift);
        let c = self.centre;
        let circle = |r: f64, pen| Shape::Circle { centre: c, radius_mm: r, pen };
        let pen = if self.back { Pen::BackPlane } else { Pen::Outline };
        if !self.cycloidal {
            out.push(circle(base / 2.0, Pen::Base));
        }
        out.push(circle(d / 2.0, Pen::Pitch));
        match &self.outline {
            Some((points, rotation)) => {
                let (sin, cos) = rotation.sin_cos();
                let placed =
                    points.iter().map(|p| [c[0] + cos * p[0] - sin * p[1], c[1] + sin * p[0] + cos * p[1]]);
                out.push(Shape::Path { points: placed.collect(), closed: true, pen })
            }
            None => {
                out.push(circle(root / 2.0, Pen::Root));
                out.push(circle(self.tip_diameter_mm / 2.0, pen));
            }
        }
    }
}

/// The gears of stage `k` placed on shaft `k` at `from` (driver) and shaft `k + 1` at `to`
/// (driven), with their true outlines turned so that their teeth interleave.
fn stage_gears(
    s: &StageJson,
    k: usize,
    rack: RackProfile,
    from: [f64; 2],
    to: [f64; 2],
    back: bool,
    driver_rotation: Option<f64>,
) -> [GearAt; 2] {
    let shift = s.shift.unwrap_or([0.0, 0.0]);
    let tip = |i: usize, z: u32| {
        s.tip_diameter_mm.map_or(s.module_mm * (z as f64 + 2.0 * (rack.addendum + shift[i])), |t| t[i])
    };
    let cycloidal = s.tooth_form.as_deref() == Some("cycloidal");
    let outlines = if cycloidal {
        cycloidal_outlines(s, from, to, driver_rotation)
    } else {
        stage_outlines(s, rack, shift, from, to, driver_rotation)
    };
    let gear = |i: usize, centre: [f64; 2], teeth: u32| GearAt {
        shaft: k + i,
        centre,
        outline: outlines.as_ref().map(|o| o[i].clone()),
        cycloidal,
        teeth,
        module_mm: s.module_mm,
        pressure_angle_deg: s.pressure_angle_deg,
        shift: shift[i],
        tip_diameter_mm: tip(i, teeth),
        back,
    };
    [gear(0, from, s.driver), gear(1, to, s.driven)]
}

/// Both gears' outlines and rotations for a pair meshing tight with these shifts along the line
/// from `from` to `to`, backlash split, the driver turned by `driver_rotation` (radians from the
/// x axis; by default a tooth points along the line); `None` when the geometry cannot work the pair out (the
/// picture then shows tip and root circles).
fn stage_outlines(
    s: &StageJson,
    rack: RackProfile,
    shift: [f64; 2],
    from: [f64; 2],
    to: [f64; 2],
    driver_rotation: Option<f64>,
) -> Option<[(Vec<[f64; 2]>, f64); 2]> {
    let system = ToothSystem::new(s.module_mm, s.pressure_angle_deg, rack).ok()?;
    let teeth = [s.driver, s.driven];
    let mesh = mesh_geometry(&system, teeth, Mounting::Shifted { shift }).ok()?;
    let heading = (to[1] - from[1]).atan2(to[0] - from[0]);
    let outline =
        |i: usize| gear_outline(&system, teeth[i], shift[i], mesh.tip_shortening, PICTURE_TOLERANCE_MM).ok();
    // The mesh's own frame runs along the line of centres.
    let driver = driver_rotation.unwrap_or(heading);
    let driven = heading + mesh_rotation(&mesh, driver - heading, BacklashSide::Split);
    Some([(outline(0)?.points, driver), (outline(1)?.points, driven)])
}

/// Both gears' cycloidal outlines and rotations along the line from `from` to `to`, the driver
/// turned by `driver_rotation` (by default a tooth along the line), the driven gear with a space
/// facing it.
fn cycloidal_outlines(
    s: &StageJson,
    from: [f64; 2],
    to: [f64; 2],
    driver_rotation: Option<f64>,
) -> Option<[(Vec<[f64; 2]>, f64); 2]> {
    let mesh = cycloidal_mesh(s.module_mm, [s.driver, s.driven], s.working_centre_distance_mm).ok()?;
    let heading = (to[1] - from[1]).atan2(to[0] - from[0]);
    let driver = driver_rotation.unwrap_or(heading);
    let (z1, z2) = (f64::from(s.driver), f64::from(s.driven));
    let driven = heading + std::f64::consts::PI - std::f64::consts::PI / z2 - (driver - heading) * z1 / z2;
    let steps = 8;
    Some([(cycloidal_outline(&mesh, 0, steps), driver), (cycloidal_outline(&mesh, 1, steps), driven)])
}

/// What the first and the last shaft of a train are called in the trade's words: `input` and
/// `output`, `stud` and `leadscrew`, `centre arbor` and `escape arbor`.
pub type ShaftNames<'a> = (&'a str, &'a str);

/// A train drawn to scale on its shafts, in a line with the input on the left, with `title`
/// over it.
pub fn train(stages: &[StageJson], title: &str, names: ShaftNames) -> Drawing {
    train_laid_out(stages, title, names, ShaftLayout::Inline)
}

/// A train drawn to scale on shafts laid out as `layout` says (a reverted train folded back
/// onto its input axis, for one).
pub fn train_laid_out(stages: &[StageJson], title: &str, names: ShaftNames, layout: ShaftLayout) -> Drawing {
    let distances: Vec<f64> = stages
        .iter()
        .map(|s| s.working_centre_distance_mm.unwrap_or(s.reference_centre_distance_mm))
        .collect();
    let shafts = shaft_centres(&distances, layout);
    // Successive meshes alternate between the front and the back plane.
    let back: Vec<bool> = (0..stages.len()).map(|k| k % 2 == 1).collect();
    let at = Arrangement { shafts: &shafts, back: &back, idler: false, dimensions_close_left: false };
    train_on_centres(stages, &at, title, names)
}

/// Where the shafts of a train stand and how its gears sit on them, for
/// [`train_on_centres`].
#[derive(Debug, Clone, Copy)]
pub struct Arrangement<'a> {
    /// The shaft centres, mm, y up: one more than the stages.
    pub shafts: &'a [[f64; 2]],
    /// Per stage: whether its gears are in the back plane.
    pub back: &'a [bool],
    /// Whether every shaft between the first and the last carries one gear, driven by one
    /// stage and driving the next (an idler): drawn once and turned to mesh with both.
    pub idler: bool,
    /// Whether each centre distance is dimensioned close to the left of its line of centres
    /// (outside a train that bends to the right, as on a banjo) instead of on its right clear
    /// of every gear.
    pub dimensions_close_left: bool,
}

/// A train drawn to scale on shafts arranged as `at` says.
pub fn train_on_centres(stages: &[StageJson], at: &Arrangement, title: &str, names: ShaftNames) -> Drawing {
    let Arrangement { shafts, back, idler, dimensions_close_left } = *at;
    let rack = RackProfile::default();
    let distances: Vec<f64> = stages
        .iter()
        .map(|s| s.working_centre_distance_mm.unwrap_or(s.reference_centre_distance_mm))
        .collect();
    let mut gears: Vec<GearAt> = Vec::new();
    for (k, s) in stages.iter().enumerate() {
        let (Some(&from), Some(&to)) = (shafts.get(k), shafts.get(k + 1)) else { break };
        let plane = back.get(k).copied().unwrap_or(false);
        let shared =
            if idler && k > 0 { gears.last().map(|g| g.outline.as_ref().map(|o| o.1)) } else { None };
        let [driver, driven] = stage_gears(s, k, rack, from, to, plane, shared.flatten());
        // The idler is the previous stage's driven gear, already drawn.
        if shared.is_none() {
            gears.push(driver);
        }
        gears.push(driven);
    }
    let largest = gears.iter().map(|g| g.tip_diameter_mm / 2.0).fold(0.0, f64::max);
    let left = gears.iter().map(|g| g.centre[0] - g.tip_diameter_mm / 2.0).fold(0.0, f64::min);
    let right = gears.iter().map(|g| g.centre[0] + g.tip_diameter_mm / 2.0).fold(0.0, f64::max);
    let text = label_mm((right - left) / 8.0);
    let mut shapes = Vec::new();
    // Back plane first, so the front plane is drawn over it.
    for g in gears.iter().filter(|g| g.back).chain(gears.iter().filter(|g| !g.back)) {
        g.shapes(rack, &mut shapes);
    }
    // Each centre distance dimensioned beside its line of centres, on the right of the way the
    // train runs (below an in-line train), clear of the gears.
    let clear = if dimensions_close_left { -2.5 * text } else { largest + 1.5 * text };
    let side = clear.signum();
    for (k, pair) in shafts.windows(2).enumerate() {
        let (p, q) = (pair[0], pair[1]);
        shapes.push(Shape::Line { from: p, to: q, pen: Pen::Centre });
        let len = (q[0] - p[0]).hypot(q[1] - p[1]).max(f64::MIN_POSITIVE);
        let (u, nrm) =
            ([(q[0] - p[0]) / len, (q[1] - p[1]) / len], [(q[1] - p[1]) / len, -(q[0] - p[0]) / len]);
        let off = |at: [f64; 2], by: f64| [at[0] + nrm[0] * by, at[1] + nrm[1] * by];
        let (a, b) = (off(p, clear), off(q, clear));
        shapes.push(Shape::Line { from: a, to: b, pen: Pen::Dimension });
        for end in [a, b] {
            let tick = |by: f64| [end[0] + nrm[0] * by, end[1] + nrm[1] * by];
            shapes.push(Shape::Line { from: tick(-0.4 * text), to: tick(0.4 * text), pen: Pen::Dimension });
        }
        let figure = format!("a{} = {}", k + 1, fmt_num(distances[k]));
        // A figure too wide for its span drops a row on every other span.
        let fits = 0.6 * text * figure.chars().count() as f64 <= len * u[0].abs().max(u[1].abs());
        let row = if fits || k % 2 == 0 { 1.0 } else { 2.2 };
        let mid = [(a[0] + b[0]) / 2.0, (a[1] + b[1]) / 2.0];
        shapes.push(Shape::Text { at: off(mid, side * row * text), text: figure, size_mm: text });
    }
    // Shafts numbered beside their centres; what each carries is in the notes.
    let mut carries = Vec::new();
    for (k, c) in shafts.iter().enumerate() {
        shapes.push(Shape::Circle { centre: *c, radius_mm: text * 0.25, pen: Pen::Centre });
        // Shafts on one axis (a reverted train) share one label: `1, 3`.
        let same: Vec<String> = (0..shafts.len())
            .filter(|&j| (shafts[j][0] - c[0]).hypot(shafts[j][1] - c[1]) < 1e-6)
            .map(|j| (j + 1).to_string())
            .collect();
        if same.first() == Some(&(k + 1).to_string()) {
            let label = same.join(", ");
            let at = [c[0] + 0.4 * text * (label.chars().count() as f64 + 1.0), c[1] + 0.8 * text];
            shapes.push(Shape::Text { at, text: label, size_mm: text });
        }
        let on_shaft: Vec<String> = gears
            .iter()
            .filter(|g| g.shaft == k)
            .map(|g| format!("{} teeth{}", g.teeth, if g.back { " (back plane)" } else { "" }))
            .collect();
        let name = if k == 0 {
            format!(" ({})", names.0)
        } else if k + 1 == shafts.len() {
            format!(" ({})", names.1)
        } else {
            String::new()
        };
        carries.push(format!("shaft {}{name}: {}", k + 1, on_shaft.join(" + ")));
    }
    Drawing {
        title: title.to_string(),
        shapes,
        notes: vec![
            format!("{}.", carries.join("; ")),
            if stages.iter().any(|s| s.tooth_form.as_deref() == Some("cycloidal")) {
                "Centre distances a in mm. Solid: front plane; dashed grey: back plane of a shared shaft. \
                 Teeth cycloidal: radial flanks below the pitch circle, wheel tips on their epicycloid, \
                 pinion tips rounded; circles: pitch (dash-dot). Drawn to scale."
                    .to_string()
            } else {
                "Centre distances a in mm. Solid: front plane; dashed grey: back plane of a shared shaft. \
                 Teeth as the basic rack cuts them; circles: pitch (dash-dot), base (thin). Drawn to scale."
                    .to_string()
            },
        ],
    }
}

/// A train to look at, given by its stages (`gearsieve draw --stages`, or one train of a
/// result file): the picture, and its stages as a table.
#[derive(Debug, Clone)]
pub struct TrainPicture {
    /// What the picture shows.
    pub title: String,
    /// The stages, input to output.
    pub stages: Vec<StageJson>,
    /// How its first and last shafts are called.
    pub names: (String, String),
    /// How its shafts are laid out.
    pub layout: ShaftLayout,
    /// The stage (from 1) whose line of action and working pressure angle are drawn.
    pub line_of_action: Option<usize>,
}

/// Add the line of action of the mesh from `driver` to `driven` (shaft centres, mm): the common
/// tangent of the two base circles through the pitch point, inclined at the working pressure
/// angle to the perpendicular of the line of centres, with the angle written beside it.
pub fn add_line_of_action(d: &mut Drawing, stage: &StageJson, driver: [f64; 2], driven: [f64; 2]) {
    let a = (driven[0] - driver[0]).hypot(driven[1] - driver[1]);
    if a <= 0.0 {
        return;
    }
    let u = [(driven[0] - driver[0]) / a, (driven[1] - driver[1]) / a];
    let n = [-u[1], u[0]];
    let base = |z: u32| stage.module_mm * f64::from(z) * stage.pressure_angle_deg.to_radians().cos() / 2.0;
    // At the drawn centre distance: cos αw = (rb1 + rb2) / a (the ISO 21771 relation), so the
    // line is tangent to both circles as drawn.
    let cos_w = (base(stage.driver) + base(stage.driven)) / a;
    let alpha_w = if cos_w <= 1.0 {
        cos_w.acos().to_degrees()
    } else {
        stage.working_pressure_angle_deg.unwrap_or(stage.pressure_angle_deg)
    };
    let (s, c) = alpha_w.to_radians().sin_cos();
    // The radius to each tangent point is perpendicular to the line of action.
    let e = [c * u[0] - s * n[0], c * u[1] - s * n[1]];
    let t1 = [driver[0] + base(stage.driver) * e[0], driver[1] + base(stage.driver) * e[1]];
    let t2 = [driven[0] - base(stage.driven) * e[0], driven[1] - base(stage.driven) * e[1]];
    d.shapes.push(Shape::Line { from: t1, to: t2, pen: Pen::Action });
    let text = label_mm(a / 6.0);
    let pitch = stage.driver as f64 / f64::from(stage.driver + stage.driven);
    let at =
        [driver[0] + u[0] * a * pitch + n[0] * 2.0 * text, driver[1] + u[1] * a * pitch + n[1] * 2.0 * text];
    d.shapes.push(Shape::Text { at, text: format!("αw = {}°", fmt_num(alpha_w)), size_mm: text });
    d.notes.push(format!(
        "Orange dashed: the line of action, tangent to both base circles, at the working pressure \
         angle αw = {}° (contact runs along it between the tip circles).",
        fmt_num(alpha_w)
    ));
}

impl Report for TrainPicture {
    fn kind(&self) -> &'static str {
        "a train picture"
    }

    fn completion(&self) -> Completion {
        Completion { complete: true, found: !self.stages.is_empty() }
    }

    fn document(&self) -> Option<Document> {
        let mut d = Document::new();
        d.title(&self.title);
        d.blank();
        let rows = Table::numbered(&self.stages, |s| {
            vec![
                s.driver.to_string(),
                s.driven.to_string(),
                fmt_num(s.module_mm),
                fmt_num(s.working_centre_distance_mm.unwrap_or(s.reference_centre_distance_mm)),
            ]
        });
        d.table(
            Table::new(&["stage", "driver", "driven", "module mm", "centre distance mm"], &[0, 1, 2, 4])
                .with_rows(rows),
        );
        Some(d)
    }

    fn drawing(&self) -> Option<Drawing> {
        let mut d = train_laid_out(&self.stages, &self.title, (&self.names.0, &self.names.1), self.layout);
        if let Some(k) = self.line_of_action.and_then(|k| k.checked_sub(1)) {
            let distances: Vec<f64> = self
                .stages
                .iter()
                .map(|s| s.working_centre_distance_mm.unwrap_or(s.reference_centre_distance_mm))
                .collect();
            let shafts = shaft_centres(&distances, self.layout);
            if let (Some(stage), Some(&from), Some(&to)) =
                (self.stages.get(k), shafts.get(k), shafts.get(k + 1))
            {
                add_line_of_action(&mut d, stage, from, to);
            }
        }
        Some(d)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The line of action is tangent to both base circles (ISO 21771: rb = m·z·cos α / 2) and
    /// crosses the line of centres at the pitch point, a·z1/(z1 + z2) from the driver.
    #[test]
    fn the_line_of_action_touches_both_base_circles_through_the_pitch_point() {
        let mut stage = StageJson::plain(17, 53, 2.0, 20.0);
        stage.working_pressure_angle_deg = Some(22.1108);
        let (c1, c2) = ([0.0, 0.0], [71.0, 0.0]);
        let mut d = Drawing::default();
        add_line_of_action(&mut d, &stage, c1, c2);
        let Some(Shape::Line { from: t1, to: t2, pen: Pen::Action }) = d.shapes.first().cloned() else {
            panic!("no line of action: {:?}", d.shapes)
        };
        let rb = |z: f64| 2.0 * z * 20f64.to_radians().cos() / 2.0;
        let dist = |p: [f64; 2], q: [f64; 2]| (p[0] - q[0]).hypot(p[1] - q[1]);
        assert!((dist(t1, c1) - rb(17.0)).abs() < 1e-9);
        assert!((dist(t2, c2) - rb(53.0)).abs() < 1e-9);
        // Tangent: the line is perpendicular to each radius.
        let along = [t2[0] - t1[0], t2[1] - t1[1]];
        let dot = |r: [f64; 2]| along[0] * r[0] + along[1] * r[1];
        assert!(dot([t1[0] - c1[0], t1[1] - c1[1]]).abs() < 1e-9);
        assert!(dot([t2[0] - c2[0], t2[1] - c2[1]]).abs() < 1e-9);
        // Through the pitch point, at the working pressure angle to the common tangent.
        let pitch = 71.0 * 17.0 / 70.0;
        let k = (pitch - t1[0]) / along[0];
        assert!((t1[1] + k * along[1]).abs() < 1e-9);
        // 70·cos 20° / 71 = cos αw: 22.1108° (the mesh check's figure for this pair).
        let angle = (along[0] / along[1]).abs().atan().to_degrees();
        assert!(
            (angle - (70.0 * 20f64.to_radians().cos() / 71.0).acos().to_degrees()).abs() < 1e-9,
            "{angle}"
        );
        assert!((angle - 22.1108).abs() < 1e-4, "{angle}");
    }
}
