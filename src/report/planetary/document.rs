//! Planetary trains laid out for people: the conditions asked for, the count, one row per
//! design (tooth counts, planets, exact ratio, direction, carrier centre distance, shifts when
//! any design is shifted, the gap between neighbouring planets, where the planets go), what
//! was left out and why when asked, the convention and the caution. It computes nothing about
//! gears.

use crate::model::pool::fmt_num;
use crate::report::fields::{decimals, mm, on_hand_notes, shift};
use crate::report::words::{
    count_line, describe_error, describe_tolerance, group_thousands, PLANETARY_CONVENTION,
};
use crate::report::{Document, Table};
use crate::trades::planetary::layout::{gear_circles, Gear};
use crate::trades::planetary::{Arrangement, Design, Spacing, CAUTION};

use super::{candidate_words, drive, formula, teeth_cells, teeth_heads, PlanetaryReport};

/// The order designs are listed in, in words.
pub const ORDER: &str = "by ratio error, then ring size, then planets";

/// A planetary search as a document.
pub fn document(r: &PlanetaryReport) -> Document {
    let mut d = Document::new();
    let s = r.problem.spec();
    let exact = s.ratio.to_string();
    let typed = if exact == r.ratio_text { exact } else { format!("{} (= {exact} exactly)", r.ratio_text) };
    d.title(format!("Planetary train: i = {typed}, tolerance {}", describe_tolerance(s.tolerance.to_f64())));
    let (held, input, output) = drive(s.arrangement);
    let kind = match s.arrangement {
        Arrangement::Simple { .. } => "Simple train (sun, planets, ring)",
        Arrangement::Stepped { .. } => "Stepped planets (sun, planets of two gears on one shaft, ring)",
        Arrangement::TwoRing => "Two-ring train (held ring, planets of two gears on one shaft, output ring)",
    };
    let turning = match s.direction {
        Some(dir) => format!("; the output turning the {} way", dir.as_str()),
        None => String::new(),
    };
    d.line(format!(
        "{kind}: {held} held, {input} driving, {output} driven: {}{turning}",
        formula(s.arrangement)
    ));
    let ranges = match s.arrangement {
        Arrangement::Simple { .. } => {
            format!("sun {}, planet {}, ring {}", s.sun_teeth, s.planet_teeth, s.ring_teeth)
        }
        Arrangement::Stepped { .. } => format!(
            "sun {}, planet {} (sun side) and {} (ring side), ring {}",
            s.sun_teeth,
            s.planet_teeth,
            s.range_of(Gear::PlanetRing),
            s.ring_teeth
        ),
        Arrangement::TwoRing => format!(
            "held ring {}, planet {} (held ring side) and {} (output ring side), output ring {}",
            s.ring_teeth,
            s.range_of(Gear::PlanetRing),
            s.range_of(Gear::PlanetRing2),
            s.range_of(Gear::Ring2)
        ),
    };
    let spacing = match s.spacing {
        Spacing::Equal => "equally spaced",
        Spacing::NearEqual => "equally spaced or, where they cannot be, as nearly as they fit",
    };
    d.line(format!("Teeth: {ranges}; {} planets, {spacing}", s.planets));
    let shifts = if s.shift_sum == (0.0, 0.0) && s.carrier_offset_modules == 0.0 {
        "coaxial at the standard centre distances only (no shift per mesh)".to_string()
    } else {
        let offset = if s.carrier_offset_modules == 0.0 {
            "the carrier midway between the meshes' standard centre distances".to_string()
        } else {
            format!(
                "the carrier {} module beyond midway between the meshes' standard centre distances",
                fmt_num(s.carrier_offset_modules)
            )
        };
        format!(
            "profile shift per mesh {}..{} modules, {offset}",
            fmt_num(s.shift_sum.0),
            fmt_num(s.shift_sum.1)
        )
    };
    d.line(format!(
        "Module {} mm, pressure angle {}°; {shifts}; neighbouring planets clear by more than {} mm; meshes {}",
        fmt_num(s.module_mm),
        fmt_num(s.pressure_angle_deg),
        fmt_num(s.tip_clearance_mm),
        if s.mesh_limits.is_some() { "checked" } else { "not checked" }
    ));
    if let Some(st) = r.problem.stock() {
        let list = |shelf: &std::collections::BTreeMap<u32, u32>| {
            shelf
                .iter()
                .map(|(t, n)| if *n == 1 { t.to_string() } else { format!("{t}×{n}") })
                .collect::<Vec<_>>()
                .join(", ")
        };
        d.line(format!(
            "Gears on hand (taken as cut standard): {}; rings {}",
            list(&st.gears),
            list(&st.rings)
        ));
        if st.left_out > 0 {
            d.line(format!(
                "{} gear{} of the catalogues in other modules or pressure angles not used",
                st.left_out,
                if st.left_out == 1 { "" } else { "s" }
            ));
        }
    }
    d.blank();
    let o = r.outcome;
    d.line(count_line(o.count, o.designs.len(), o.complete, "design", ORDER));
    if !o.designs.is_empty() {
        d.blank();
        designs(r, &mut d);
    }
    asked(r, &mut d);
    // A design asked for by name has every condition it fails listed already.
    if r.asked.is_empty() {
        left_out(r, &mut d);
    }
    d.blank();
    notes(r, &mut d);
    d
}

/// Where the planets go: `equal: 100 places, 25 apart`, or their angles when they are not
/// equally spaced.
pub fn assembly(design: &Design) -> String {
    let p = &design.positions;
    if p.equally_spaced() {
        format!("equal: {} places, {} apart", p.places, p.places / p.at.len() as u64)
    } else {
        let angles: Vec<String> = p.angles_deg().iter().map(|a| format!("{}°", decimals(*a, 2))).collect();
        format!("near-equal: {} ({} places)", angles.join(", "), p.places)
    }
}

/// True when some listed design has a profile shift on some gear.
fn any_shifted(r: &PlanetaryReport) -> bool {
    r.outcome.designs.iter().any(|d| d.carrier.shift.iter().flatten().any(|&x| x != 0.0))
}

fn designs(r: &PlanetaryReport, d: &mut Document) {
    let arrangement = r.problem.spec().arrangement;
    let shifted = any_shifted(r);
    // Each heading with whether its numbers stand flush right.
    let mut heads = vec![("#", true)];
    heads.extend(teeth_heads(arrangement).into_iter().map(|h| (h, true)));
    heads.extend([
        ("planets", true),
        ("ratio", true),
        ("value", true),
        ("error", false),
        ("direction", false),
        ("carrier mm", true),
    ]);
    if shifted {
        heads.push(("shift x", false));
    }
    heads.extend([("gap mm", true), ("assembly", false)]);
    let rows = Table::numbered(&r.outcome.designs, |design| {
        let mut row = teeth_cells(&design.teeth);
        row.extend([
            design.planets.to_string(),
            design.ratio.magnitude.to_string(),
            decimals(design.ratio.magnitude.to_f64(), 6),
            describe_error(&design.error),
            design.ratio.direction.as_str().to_string(),
            mm(design.carrier.centre_distance_mm),
        ]);
        if shifted {
            let x: Vec<String> = gear_circles(r.problem.system(), design)
                .iter()
                .map(|g| {
                    let x = shift(g.shift);
                    if x.starts_with('-') || x == "0" {
                        x
                    } else {
                        format!("+{x}")
                    }
                })
                .collect();
            row.push(x.join("/"));
        }
        row.extend([mm(design.neighbour_gap_mm), assembly(design)]);
        row
    });
    let right: Vec<usize> = heads.iter().enumerate().filter(|(_, h)| h.1).map(|(i, _)| i).collect();
    let names: Vec<&str> = heads.iter().map(|h| h.0).collect();
    d.table(Table::new(&names, &right).with_rows(rows));
    let notes =
        r.outcome.designs.iter().enumerate().map(|(i, design)| (format!("#{}", i + 1), on_hand_cell(design)));
    on_hand_notes(notes, d);
}

/// What is wrong with a design's gears on hand as they are made, in one line; empty when
/// nothing is.
pub fn on_hand_cell(design: &Design) -> String {
    design.on_hand_defects.iter().map(ToString::to_string).collect::<Vec<_>>().join("; ")
}

fn asked(r: &PlanetaryReport, d: &mut Document) {
    for a in r.asked {
        d.blank();
        d.heading(format!("{} fails:", candidate_words(&a.teeth, a.planets)));
        for unmet in &a.unmet {
            d.item(1, true, format!("{}: {unmet}", unmet.condition()));
        }
    }
}

fn left_out(r: &PlanetaryReport, d: &mut Document) {
    let Some(left) = &r.outcome.left_out else { return };
    d.blank();
    if left.conditions.is_empty() {
        d.line(format!(
            "Nothing was left out: all {} candidates meet every condition.",
            group_thousands(left.candidates)
        ));
        return;
    }
    d.heading(format!(
        "Left out of {} candidate{} (each set of tooth counts with each planet count), by the first \
         condition each fails (count, condition: the first of them and why):",
        group_thousands(left.candidates),
        if left.candidates == 1 { "" } else { "s" }
    ));
    let rows = left
        .conditions
        .iter()
        .map(|c| {
            vec![
                group_thousands(c.count),
                format!("{}: {}: {}", c.condition, candidate_words(&c.teeth, c.planets), c.unmet),
            ]
        })
        .collect();
    let table =
        Table::new(&["count", "condition: the first of them and why"], &[0]).headless_in_text().spaced(2, 2);
    d.table(table.with_rows(rows));
}

fn notes(r: &PlanetaryReport, d: &mut Document) {
    let s = r.problem.spec();
    if !r.outcome.designs.is_empty() {
        d.note(
            "Carrier mm: the working centre distance of both meshes, the radius the planets' centres \
             sit on. Gap mm: between the tip circles of the two closest neighbouring planets. \
             Assembly: the places round the carrier where a planet fits, and the planets' angles \
             when they are not equally spaced.",
        );
        match s.arrangement {
            Arrangement::Stepped { .. } => d.note(
                "Planet: teeth of the gear meshing the sun / of the gear meshing the ring, fast on one \
                 planet shaft.",
            ),
            Arrangement::TwoRing => d.note(
                "Planet: teeth of the gear meshing the held ring / of the gear meshing the output ring \
                 (ring2), fast on one planet shaft.",
            ),
            Arrangement::Simple { .. } => {}
        }
        if any_shifted(r) {
            let names: Vec<&str> = super::gears_of(s.arrangement).iter().map(|g| g.name()).collect();
            d.note(format!(
                "Shift x: profile shift of each gear in modules, in the order {}; a ring's shift is \
                 positive outwards.",
                names.join(", ")
            ));
        }
    }
    d.note(format!("Ratios: {PLANETARY_CONVENTION}."));
    d.note(format!("CAUTION: {CAUTION}"));
}
