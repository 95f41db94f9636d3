//! A thread setup drawn on its lathe: with a banjo, the gears on the stud, the intermediate (or
//! idler) stud and the leadscrew where [`Banjo::placement`] puts them, the slot the
//! intermediate stud slides in, the shafts and the planes, and for three or four stages every
//! stud where the banjo model placed it; without one (or for a train the banjo model does not
//! place), the train in a line. It draws finished results only: every
//! position comes from the thread trade's banjo model.

use crate::model::pool::fmt_num;
use crate::report::drawing::{Drawing, Pen, Shape};
use crate::report::fields::{StageJson, TrainJson};
use crate::report::pictures::{self, Arrangement};
use crate::report::words::THREAD_CAUTION;
use crate::trades::thread::banjo::{Banjo, ChainFit, Fit, Placement};
use crate::trades::thread::Setup;

/// Half the angle the drawn slot spans on each side of the intermediate stud, degrees: enough
/// to read as a slot, short of the gears on the far side.
const SLOT_HALF_ANGLE_DEG: f64 = 10.0;

/// `setup` drawn with `title`: on `banjo` when there is one and it places the train, else in a
/// line from the stud to the leadscrew.
pub fn setup(setup: &Setup, banjo: Option<&Banjo>, title: &str) -> Drawing {
    // The setup's train runs from the stud to the leadscrew already (the fit's order applied).
    let ordered: Vec<StageJson> = TrainJson::from_train(&setup.train).stages;
    // The placement reads the stages through the fit's order; the setup's train is in that
    // order already, so it is read as it stands.
    if let (Some(b), Some(chain)) = (banjo, &setup.fit.chain) {
        return on_banjo_chain(&ordered, b, chain, title);
    }
    let as_mounted = Fit { order: (0..setup.train.stages.len()).collect(), ..setup.fit.clone() };
    let placed = banjo.and_then(|b| Some((b, b.placement(&setup.train, &as_mounted)?)));
    match placed {
        Some((b, p)) => on_banjo(setup, &ordered, b, &p, title),
        None => pictures::train(&ordered, title, ("stud", "leadscrew")),
    }
}

fn on_banjo(setup: &Setup, ordered: &[StageJson], banjo: &Banjo, p: &Placement, title: &str) -> Drawing {
    let shafts = p.shafts();
    // An idler makes two meshes of one stage, in one plane; a compound train's stud mesh is
    // in the back plane when it is the inner one (nearest the machine).
    let (stages, back, middle) = match (setup.fit.idler, ordered) {
        (Some(zi), [s]) => {
            let mesh = |a: u32, b: u32| StageJson::plain(a, b, s.module_mm, s.pressure_angle_deg);
            (vec![mesh(s.driver, zi), mesh(zi, s.driven)], vec![false, false], "idler")
        }
        _ => {
            let inner = setup.fit.stud_mesh_inner.unwrap_or(false);
            (ordered.to_vec(), vec![inner, !inner], "intermediate")
        }
    };
    let at = Arrangement {
        shafts: &shafts,
        back: &back,
        idler: setup.fit.idler.is_some(),
        dimensions_close_left: true,
    };
    let d = pictures::train_on_centres(&stages, &at, title, ("stud", "leadscrew"));
    let studs: Vec<([f64; 2], usize)> =
        p.intermediate.map(|i| (i, banjo.slot_holding(i[0].hypot(i[1])).unwrap_or(0))).into_iter().collect();
    let names: Vec<String> = match p.intermediate {
        Some(_) => vec!["stud".into(), middle.into(), "leadscrew".into()],
        None => vec!["stud".into(), "leadscrew".into()],
    };
    machine(d, banjo, &shafts, &studs, &names, &format!("the {middle} stud drawn above the line from the stud to the leadscrew (its mirror image below serves as well)"))
}

/// A setup of three stages or more on its banjo: the studs where the banjo model placed them,
/// the meshes in plane 1 (nearest the machine) in the back.
fn on_banjo_chain(ordered: &[StageJson], banjo: &Banjo, chain: &ChainFit, title: &str) -> Drawing {
    let mut shafts = vec![[-banjo.stud_to_leadscrew_mm, 0.0]];
    shafts.extend(chain.studs.iter().copied());
    shafts.push([0.0, 0.0]);
    let back: Vec<bool> = chain.planes.iter().map(|&p| p == 1).collect();
    let at = Arrangement { shafts: &shafts, back: &back, idler: false, dimensions_close_left: true };
    let d = pictures::train_on_centres(ordered, &at, title, ("stud", "leadscrew"));
    let studs: Vec<([f64; 2], usize)> =
        chain.studs.iter().copied().zip(chain.slots.iter().copied()).collect();
    let mut names = vec!["stud".to_string()];
    names.extend((1..=chain.studs.len()).map(|k| format!("stud {k}")));
    names.push("leadscrew".into());
    let planes: Vec<String> = chain.planes.iter().map(|p| p.to_string()).collect();
    machine(
        d,
        banjo,
        &shafts,
        &studs,
        &names,
        &format!(
            "the intermediate studs numbered from the stud side, each in its slot, as the banjo model \
             placed them; meshes in planes {} from the stud, plane 1 (nearest the machine) in the back",
            planes.join("-")
        ),
    )
}

/// The machine around a drawn train: the slot band behind each stud, the shafts named, the
/// stud-to-leadscrew dimension and the notes.
fn machine(
    mut d: Drawing,
    banjo: &Banjo,
    shafts: &[[f64; 2]],
    studs: &[([f64; 2], usize)],
    names: &[String],
    where_note: &str,
) -> Drawing {
    let dist = banjo.stud_to_leadscrew_mm;
    // Names as large as the picture's other labels.
    let text = d.bounds().map_or(pictures::label_mm(dist / 8.0), |b| pictures::label_mm((b[2] - b[0]) / 8.0));
    let shaft_r = banjo.shaft_diameter_mm / 2.0;
    let mut machine = Vec::new();
    for &(i, k) in studs {
        let slot = &banjo.slots[k];
        let at = i[1].atan2(i[0]);
        let half = SLOT_HALF_ANGLE_DEG.to_radians();
        let arc = |r: f64, from: f64, to: f64| -> Vec<[f64; 2]> {
            // One point per degree is finer than the line is wide at these radii.
            let steps = ((to - from).abs().to_degrees().ceil() as usize).max(2);
            (0..=steps)
                .map(|k| from + (to - from) * k as f64 / steps as f64)
                .map(|a| [r * a.cos(), r * a.sin()])
                .collect()
        };
        let mut band = arc(slot.hi, at - half, at + half);
        band.extend(arc(slot.lo, at + half, at - half));
        machine.push(Shape::Path { points: band, closed: true, pen: Pen::Machine });
    }
    d.shapes.splice(0..0, machine);
    for (c, name) in shafts.iter().zip(names) {
        d.shapes.push(Shape::Circle { centre: *c, radius_mm: shaft_r, pen: Pen::Machine });
        // The intermediate stud is named above its shaft, the two fixed axes below theirs.
        let side = if c[1] > 0.0 { 1.0 } else { -1.0 };
        d.shapes.push(Shape::Text {
            at: [c[0], c[1] + side * (shaft_r + 1.2 * text)],
            text: name.clone(),
            size_mm: text,
        });
    }
    // Stud to leadscrew dimensioned under both, clear of their gears.
    let reach = d
        .shapes
        .iter()
        .filter_map(|s| match s {
            Shape::Path { points, .. } => points.iter().map(|q| q[1]).reduce(f64::min),
            _ => None,
        })
        .fold(-shaft_r, f64::min);
    let y = reach - 3.0 * text;
    d.shapes.push(Shape::Line { from: [-dist, y], to: [0.0, y], pen: Pen::Dimension });
    for x in [-dist, 0.0] {
        d.shapes.push(Shape::Line {
            from: [x, y - 0.4 * text],
            to: [x, y + 0.4 * text],
            pen: Pen::Dimension,
        });
    }
    d.shapes.push(Shape::Text {
        at: [-dist / 2.0, y - 1.2 * text],
        text: format!("stud to leadscrew {}", fmt_num(dist)),
        size_mm: text,
    });
    d.notes.push(format!(
        "Banjo: {}. Leadscrew axis at the origin, {where_note}; the slot is drawn as a band. \
         Inner plane (nearest the machine) dashed grey, outer planes solid; shafts and spacers as \
         grey circles.",
        banjo.describe()
    ));
    d.notes.push(THREAD_CAUTION.to_string());
    d
}
