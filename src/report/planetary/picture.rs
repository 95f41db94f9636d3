//! The best planetary design drawn to scale, looking along the central axis: the sun at the
//! centre, the planets on the carrier circle at their angles, the ring as its tip (inner) and
//! root (outer) circles, the carrier circle dash-dotted like every line of centres. Each gear
//! shows its tip, pitch, base and root circles; the planet gears and rings of the second mesh
//! of stepped planets or a two-ring train lie in the back plane, dashed grey. Gear sizes and
//! planet centres come from [`crate::trades::planetary::layout`].

use std::f64::consts::TAU;

use crate::geometry::outline::{gear_outline, mesh_rotation, ring_outline, BacklashSide, Outline};
use crate::model::pool::fmt_num;
use crate::model::train::Direction;
use crate::report::drawing::{Drawing, Pen, Shape};
use crate::report::fields::decimals;
use crate::report::pictures::PICTURE_TOLERANCE_MM;
use crate::report::words::describe_error;
use crate::trades::planetary::layout::{gear_circles, planet_centres_mm, Gear, GearCircles};
use crate::trades::planetary::{Arrangement, PlanetMesh, CAUTION};

use super::{drive, short_words, PlanetaryReport};

/// The four circles of a gear centred at `at`, the tip drawn with `outline`; with `teeth` (its
/// true outline and rotation) the teeth are drawn in place of the tip circle.
fn gear_shapes(
    g: &GearCircles,
    at: [f64; 2],
    outline: Pen,
    teeth: Option<(&Outline, f64)>,
    out: &mut Vec<Shape>,
) {
    let circle = |d: f64, pen| Shape::Circle { centre: at, radius_mm: d / 2.0, pen };
    out.push(circle(g.root_diameter_mm, Pen::Root));
    out.push(circle(g.base_diameter_mm, Pen::Base));
    out.push(circle(g.pitch_diameter_mm, Pen::Pitch));
    match teeth {
        Some((o, rotation)) => {
            out.push(Shape::Path { points: o.placed(at, rotation), closed: true, pen: outline })
        }
        None => out.push(circle(g.tip_diameter_mm, outline)),
    }
}

/// The angle nearest zero, turned by whole multiples of `step`, radians.
fn nearest_zero(angle: f64, step: f64) -> f64 {
    angle - step * (angle / step).round()
}

/// The front plane's gears with their teeth: each gear's outline, and its rotation at each
/// place it sits (the sun's and a ring's once, a planet gear's at every planet). The sun is
/// turned to zero (tooth 0 on the x axis) and each planet so that it meshes the sun at its
/// place ([`mesh_rotation`], backlash split); without a sun, the ring is turned to zero and
/// each planet sits in the ring's space nearest its place. A ring meshing planets that mesh a
/// sun is turned to meet the first planet: a planet tooth `δ` from the line of centres faces a
/// ring space `δ·zp/zr` from it (the pitch circles roll together). The assembly condition makes
/// every other planet fit as well. `None` for a gear whose outline cannot be traced.
fn front_teeth(
    r: &PlanetaryReport,
    circles: &[GearCircles],
    front: &[bool],
) -> Vec<Option<(Outline, Vec<f64>)>> {
    let best = &r.outcome.designs[0];
    let system = r.problem.system();
    let angles: Vec<f64> = best.positions.angles_deg().iter().map(|a| a.to_radians()).collect();
    let gears = best.teeth.gears();
    let outline = |k: usize| {
        let (g, at) = (&circles[k], gears[k]);
        if g.gear.internal() {
            ring_outline(system, g.teeth, g.shift, PICTURE_TOLERANCE_MM).ok()
        } else {
            gear_outline(
                system,
                g.teeth,
                g.shift,
                best.carrier.tip_shortening[at.mesh.0],
                PICTURE_TOLERANCE_MM,
            )
            .ok()
        }
    };
    let sun_mesh = match &best.meshes[0] {
        Ok(PlanetMesh::External(m)) if front.first() == Some(&true) && gears[0].gear == Gear::Sun => Some(m),
        _ => None,
    };
    // The front planet gear's rotation at each place.
    let planet = gears.iter().position(|g| g.gear.on_planet()).filter(|&k| front[k]);
    let ring = gears.iter().position(|g| g.gear.internal()).filter(|&k| front[k]);
    let planet_turns: Option<Vec<f64>> = planet.map(|k| {
        let zp = f64::from(gears[k].teeth);
        angles
            .iter()
            .map(|&phi| match (sun_mesh, ring) {
                // Turn the pair's frame to the planet's place: the sun is then at -phi in it.
                (Some(m), _) => phi + mesh_rotation(m, -phi, BacklashSide::Split),
                (None, Some(j)) => {
                    let zr = f64::from(gears[j].teeth);
                    // The ring's space nearest the place, and the planet tooth facing it.
                    phi + nearest_zero(phi, TAU / zr) * zr / zp
                }
                (None, None) => phi,
            })
            .collect()
    });
    let ring_turn = match (sun_mesh, ring, planet, &planet_turns) {
        (Some(_), Some(j), Some(k), Some(turns)) => {
            let (zp, zr) = (f64::from(gears[k].teeth), f64::from(gears[j].teeth));
            // The planet tooth nearest the first planet's outward line of centres.
            nearest_zero(turns[0] - angles[0], TAU / zp) * zp / zr + angles[0]
        }
        _ => 0.0,
    };
    (0..circles.len())
        .map(|k| {
            if !front[k] {
                return None;
            }
            let turns = if Some(k) == planet {
                planet_turns.clone()?
            } else if Some(k) == ring {
                vec![ring_turn]
            } else {
                vec![0.0]
            };
            Some((outline(k)?, turns))
        })
        .collect()
}

/// The best design of `r` to scale; a drawing that says so when nothing was found.
pub fn drawing(r: &PlanetaryReport) -> Drawing {
    let Some(best) = r.outcome.designs.first() else {
        // The words as the picture, so that the page is wide enough to read them.
        return Drawing {
            title: "Planetary train".to_string(),
            shapes: vec![Shape::Text {
                at: [0.0, 0.0],
                text: "No design meets every condition.".to_string(),
                size_mm: 4.0,
            }],
            notes: vec![format!("CAUTION: {CAUTION}")],
        };
    };
    let spec = r.problem.spec();
    let circles = gear_circles(r.problem.system(), best);
    let centres = planet_centres_mm(best);
    let two_planes = !best.teeth.single_planet_gear();
    // The second mesh's gears lie behind the first's.
    let back =
        |g: &GearCircles| two_planes && best.teeth.gears().iter().any(|a| a.gear == g.gear && a.mesh.0 == 1);
    // How far the gears reach from the axis, and up and down: a planet's large gear may reach
    // beyond the ring it does not mesh.
    let radius = |g: &GearCircles| g.root_diameter_mm.max(g.tip_diameter_mm) / 2.0;
    let mut reach = [0.0_f64, 0.0, 0.0];
    for g in &circles {
        let r = radius(g);
        let at: &[[f64; 2]] = if g.gear.on_planet() { &centres } else { &[[0.0, 0.0]] };
        for c in at {
            reach[0] = reach[0].max(c[0].hypot(c[1]) + r);
            reach[1] = reach[1].max(c[1] + r);
            reach[2] = reach[2].min(c[1] - r);
        }
    }
    let [outer, top, bottom] = reach;
    let text = (outer / 12.0).clamp(1.5, 5.0);
    let front: Vec<bool> = circles.iter().map(|g| !back(g)).collect();
    let teeth = front_teeth(r, &circles, &front);
    let mut shapes = Vec::new();
    for in_back in [true, false] {
        for (k, g) in circles.iter().enumerate().filter(|(_, g)| back(g) == in_back) {
            let pen = if in_back { Pen::BackPlane } else { Pen::Outline };
            let drawn = teeth[k].as_ref();
            if g.gear.on_planet() {
                for (n, &c) in centres.iter().enumerate() {
                    let t = drawn.and_then(|(o, turns)| Some((o, *turns.get(n)?)));
                    gear_shapes(g, c, pen, t, &mut shapes);
                }
            } else {
                gear_shapes(g, [0.0, 0.0], pen, drawn.map(|(o, turns)| (o, turns[0])), &mut shapes);
            }
        }
    }
    let a_w = best.carrier.centre_distance_mm;
    shapes.push(Shape::Circle { centre: [0.0, 0.0], radius_mm: a_w, pen: Pen::Centre });
    for (k, &c) in std::iter::once(&[0.0, 0.0]).chain(&centres).enumerate() {
        shapes.push(Shape::Circle { centre: c, radius_mm: text * 0.25, pen: Pen::Centre });
        if k > 0 {
            // Planets numbered beside their centres, outwards from the carrier's axis.
            let (dx, dy) = (c[0] / a_w, c[1] / a_w);
            let at = [c[0] + dx * 1.4 * text, c[1] + dy * 1.4 * text];
            shapes.push(Shape::Text { at, text: k.to_string(), size_mm: text });
        }
    }
    // The carrier radius dimensioned below the gears, from the axis to the first planet's
    // centre (on the x axis), with thin extension lines down from both centres.
    let first = centres.first().copied().unwrap_or([a_w, 0.0]);
    let below = bottom - 1.5 * text;
    for x in [0.0, first[0]] {
        shapes.push(Shape::Line { from: [x, -0.5 * text], to: [x, below - 0.5 * text], pen: Pen::Dimension });
    }
    shapes.push(Shape::Line { from: [0.0, below], to: [first[0], below], pen: Pen::Dimension });
    shapes.push(Shape::Text {
        at: [first[0] / 2.0, below - 1.2 * text],
        text: format!("a = {}", fmt_num(a_w)),
        size_mm: text,
    });
    let (central, labels): (Vec<&GearCircles>, Vec<String>) = circles
        .iter()
        .filter(|g| !g.gear.on_planet())
        .map(|g| (g, format!("{} {}", g.gear.name(), g.teeth)))
        .unzip();
    // Central gears named: the sun just above the axis (the dimension runs down), the rings
    // above the drawing.
    let mut above = top + 1.2 * text;
    for (g, label) in central.iter().zip(labels) {
        let at = if g.gear.internal() {
            let at = [0.0, above];
            above += 1.4 * text;
            at
        } else {
            [0.0, 1.4 * text]
        };
        shapes.push(Shape::Text { at, text: label, size_mm: text });
    }
    let (held, input, output) = drive(spec.arrangement);
    let angles: Vec<String> =
        best.positions.angles_deg().iter().map(|a| format!("{}°", decimals(*a, 2))).collect();
    let mut notes = vec![format!(
        "{held} held, {input} driving, {output} driven, turning {} the input; {} planets (numbered) \
         on the carrier circle (dash-dot, radius a = {} mm, the working centre distance of both \
         meshes) at {}.",
        match best.ratio.direction {
            Direction::Same => "the same way as",
            Direction::Opposite => "against",
        },
        best.planets,
        fmt_num(a_w),
        angles.join(", ")
    )];
    if two_planes {
        let front = match spec.arrangement {
            Arrangement::TwoRing => "the held ring and the planet gears meshing it",
            _ => "the sun and the planet gears meshing it",
        };
        let behind = match spec.arrangement {
            Arrangement::TwoRing => "the output ring and the planet gears meshing it",
            _ => "the ring and the planet gears meshing it",
        };
        notes.push(format!("Solid: front plane, {front}; dashed grey: back plane, {behind}."));
    }
    notes.push(
        "Teeth of the front plane drawn as cut (involute flanks; a ring's root corners drawn sharp), \
         in mesh; circles: tip (a ring's inner circle; the back plane's gears by it alone), pitch \
         (dash-dot), base (thin), root (dotted; a ring's outer circle). Drawn to scale in mm."
            .to_string(),
    );
    notes.push(format!("CAUTION: {CAUTION}"));
    Drawing {
        title: format!(
            "Planetary 1: {}; i = {} ({})",
            short_words(&best.teeth, best.planets),
            best.ratio.magnitude,
            describe_error(&best.error)
        ),
        shapes,
        notes,
    }
}
