//! The gear data block — what a gear cutter and an inspector read — laid out once for every
//! result kind that shows it (`mesh`, `reducer`, `search --explain`): a table with one column
//! per gear in a [`Document`], the backlash lines of a pair, and the CSV columns of one gear.
//! JSON writes [`GearData`] and [`PairData`] as they are.
//!
//! Owns the layout and the CSV names only; every figure comes worked out from
//! [`crate::geometry::measure`] and [`crate::geometry::allowance`].

use crate::geometry::allowance::BacklashPlan;
use crate::geometry::measure::{GearData, GearKind, Measure, PairData};
use crate::model::pool::fmt_num;
use crate::report::fields::mm;
use crate::report::{Document, Table};

/// A length in mm to 0.001 mm for the table, without a minus sign on a value that rounds to 0.
fn len(v: f64) -> String {
    let s = format!("{v:.3}");
    match s.strip_prefix('-') {
        Some(rest) if rest.chars().all(|c| c == '0' || c == '.') => rest.to_string(),
        _ => s,
    }
}

/// The range a measure may take with the allowances, smaller end first: `23.398 to 23.456`.
fn accepted(m: &Measure) -> String {
    match (m.upper_mm, m.lower_mm) {
        (Some(a), Some(b)) => format!("{} to {}", len(a.min(b)), len(a.max(b))),
        _ => "-".to_string(),
    }
}

/// The rows of the gear data table for `gears`, one column per gear.
fn rows(gears: &[&GearData]) -> Vec<Vec<String>> {
    let mut rows = Vec::new();
    let mut row = |label: &str, unit: &str, cell: &dyn Fn(&GearData) -> String| {
        let mut r = vec![label.to_string(), unit.to_string()];
        r.extend(gears.iter().map(|g| cell(g)));
        rows.push(r);
    };
    row("teeth", "", &|g| match g.kind {
        GearKind::External => g.teeth.to_string(),
        GearKind::Internal => format!("{} (internal)", g.teeth),
    });
    row("module", "mm", &|g| fmt_num(g.module_mm));
    row("pressure angle", "deg", &|g| fmt_num(g.pressure_angle_deg));
    row("profile shift x", "modules", &|g| format!("{:.4}", g.shift).replace("-0.0000", "0.0000"));
    row("reference diameter", "mm", &|g| len(g.reference_diameter_mm));
    row("tip diameter", "mm", &|g| len(g.tip_diameter_mm));
    row("root diameter", "mm", &|g| len(g.root_diameter_mm));
    row("thickness allowance upper", "mm", &|g| g.thickness_allowance_mm.map_or("-".into(), |a| len(a[0])));
    row("thickness allowance lower", "mm", &|g| g.thickness_allowance_mm.map_or("-".into(), |a| len(a[1])));
    row("span over k teeth, k", "", &|g| g.span.map_or("-".into(), |s| s.teeth.to_string()));
    row("span, nominal", "mm", &|g| g.span.map_or("-".into(), |s| len(s.span.nominal_mm)));
    row("span, accepted", "mm", &|g| g.span.map_or("-".into(), |s| accepted(&s.span)));
    row("ball or pin diameter", "mm", &|g| g.over_balls.map_or("-".into(), |b| len(b.ball_diameter_mm)));
    row("over / between balls, nominal", "mm", &|g| {
        g.over_balls.map_or("-".into(), |b| match g.kind {
            GearKind::External => format!("{} over", len(b.dimension.nominal_mm)),
            GearKind::Internal => format!("{} between", len(b.dimension.nominal_mm)),
        })
    });
    row("over / between balls, accepted", "mm", &|g| {
        g.over_balls.map_or("-".into(), |b| accepted(&b.dimension))
    });
    row("chordal thickness, nominal", "mm", &|g| len(g.chordal.thickness.nominal_mm));
    row("chordal thickness, accepted", "mm", &|g| accepted(&g.chordal.thickness));
    row("chordal height", "mm", &|g| len(g.chordal.height_mm));
    rows
}

/// Notes on a measurement that would not work as laid out: calipers or balls touching off the
/// involute.
fn warnings(labels: &[String], gears: &[&GearData]) -> Vec<String> {
    let mut w = Vec::new();
    for (label, g) in labels.iter().zip(gears) {
        if g.span.is_some_and(|s| !s.on_involute) {
            w.push(format!("{label}: the span calipers would touch off the involute; measure over balls"));
        }
        if g.over_balls.is_some_and(|b| !b.on_involute) {
            w.push(format!("{label}: the balls would touch off the involute; choose another size"));
        }
        // A micrometer reaches the balls only where they stand out past the tips.
        let hidden = g.over_balls.is_some_and(|b| match g.kind {
            GearKind::External => b.dimension.nominal_mm <= g.tip_diameter_mm,
            GearKind::Internal => b.dimension.nominal_mm >= g.tip_diameter_mm,
        });
        if hidden {
            w.push(format!("{label}: the balls would not stand out past the tips; choose a larger size"));
        }
    }
    w
}

/// Add the gear data table of `gears` under `heading` (none when empty), one column headed by
/// each of `labels`.
pub fn add_table(d: &mut Document, heading: &str, labels: &[String], gears: &[&GearData]) {
    if !heading.is_empty() {
        d.heading(heading);
    }
    let mut head = vec!["Gear data".to_string(), String::new()];
    head.extend(labels.iter().cloned());
    let right: Vec<usize> = (2..head.len()).collect();
    d.table(Table::new(&head, &right).spaced(2, 2).min_widths(&[30, 7]).with_rows(rows(gears)));
    for w in warnings(labels, gears) {
        d.item(1, true, w);
    }
}

/// One line on the backlash of a pair: what was asked, the allowances and what they give.
pub fn backlash_lines(pair: &PairData) -> Vec<String> {
    let mut lines = match (&pair.backlash, &pair.backlash_problem) {
        (Some(p), _) => describe(p),
        (None, Some(why)) if pair.on_hand == [true, true] => vec![format!("{why}.")],
        (None, Some(why)) => vec![format!("no tooth-thickness allowances fit: {why}.")],
        (None, None) => Vec::new(),
    };
    let [a, b] = pair.on_hand;
    if a != b {
        let kept = &pair.gears[usize::from(b)];
        lines.push(format!(
            "the {}-tooth gear is on hand: its teeth are taken as cut to the nominal figures (check its \
             span or balls), and the gear to cut takes the whole allowance",
            kept.teeth
        ));
    }
    lines
}

/// The column labels of a pair's two gears, `(on hand)` after a gear that is.
pub fn pair_labels(pair: &PairData, names: [String; 2]) -> [String; 2] {
    let [a, b] = names;
    let mark = |name: String, on_hand: bool| if on_hand { format!("{name} (on hand)") } else { name };
    [mark(a, pair.on_hand[0]), mark(b, pair.on_hand[1])]
}

fn describe(p: &BacklashPlan) -> Vec<String> {
    let b = &p.backlash;
    let centres = if p.spec.centre_tolerance_mm == 0.0 {
        format!("at {} mm, the centres taken as exact", len(b.centre_distance_mm[0]))
    } else {
        format!(
            "with the centres {} to {} mm apart (housing tolerance ±{} mm)",
            len(b.centre_distance_mm[0]),
            len(b.centre_distance_mm[1]),
            fmt_num(p.spec.centre_tolerance_mm)
        )
    };
    vec![
        format!(
            "normal backlash wanted {} to {} mm {centres}",
            len(p.spec.normal_backlash_mm[0]),
            len(p.spec.normal_backlash_mm[1]),
        ),
        format!(
            "backlash with the allowances: normal {} to {} mm, circumferential {} to {} mm",
            len(b.normal_mm[0]),
            len(b.normal_mm[1]),
            len(b.circumferential_mm[0]),
            len(b.circumferential_mm[1])
        ),
    ]
}

/// CSV column names of one gear's data, each prefixed with `prefix` (`stage1_driver_`).
pub fn csv_header(prefix: &str) -> Vec<String> {
    CSV_FIELDS.iter().map(|f| format!("{prefix}{f}")).collect()
}

/// The CSV field names of one gear's data, without a prefix (for `docs/output-fields.md`).
pub const CSV_FIELDS: [&str; 15] = [
    "root_diameter_mm",
    "thickness_allowance_upper_mm",
    "thickness_allowance_lower_mm",
    "span_teeth",
    "span_mm",
    "span_upper_mm",
    "span_lower_mm",
    "ball_diameter_mm",
    "over_balls_mm",
    "over_balls_upper_mm",
    "over_balls_lower_mm",
    "chordal_thickness_mm",
    "chordal_thickness_upper_mm",
    "chordal_thickness_lower_mm",
    "chordal_height_mm",
];

/// The CSV cells of one gear's data in the order of [`csv_header`]; empty cells for a gear
/// that is not there.
pub fn csv_cells(g: Option<&GearData>) -> Vec<String> {
    let Some(g) = g else {
        return vec![String::new(); CSV_FIELDS.len()];
    };
    let opt = |v: Option<f64>| v.map_or(String::new(), mm);
    let span = g.span;
    let balls = g.over_balls;
    vec![
        mm(g.root_diameter_mm),
        opt(g.thickness_allowance_mm.map(|a| a[0])),
        opt(g.thickness_allowance_mm.map(|a| a[1])),
        span.map_or(String::new(), |s| s.teeth.to_string()),
        opt(span.map(|s| s.span.nominal_mm)),
        opt(span.and_then(|s| s.span.upper_mm)),
        opt(span.and_then(|s| s.span.lower_mm)),
        opt(balls.map(|b| b.ball_diameter_mm)),
        opt(balls.map(|b| b.dimension.nominal_mm)),
        opt(balls.and_then(|b| b.dimension.upper_mm)),
        opt(balls.and_then(|b| b.dimension.lower_mm)),
        mm(g.chordal.thickness.nominal_mm),
        opt(g.chordal.thickness.upper_mm),
        opt(g.chordal.thickness.lower_mm),
        mm(g.chordal.height_mm),
    ]
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::geometry::measure::CutGear;
    use crate::geometry::{RackProfile, ToothSystem};

    fn gear(ball: f64) -> GearData {
        let s = ToothSystem::new(2.0, 20.0, RackProfile::default()).unwrap();
        let cut = CutGear {
            kind: GearKind::External,
            teeth: 40,
            shift: 0.0,
            tip_diameter_mm: s.tip_diameter_mm(40, 0.0, 0.0),
            root_diameter_mm: s.root_diameter_mm(40, 0.0),
        };
        s.gear_data(&cut, Some([-0.05, -0.1]), Some(ball))
    }

    #[test]
    fn a_ball_too_small_to_reach_is_warned_of() {
        let labels = ["wheel".to_string()];
        // A 2 mm ball sinks below the 84 mm tip circle of 40 teeth at module 2; the usual
        // 1.68·m = 3.36 mm ball stands out (common practice, from memory).
        let small = gear(2.0);
        assert!(small.over_balls.unwrap().dimension.nominal_mm < 84.0);
        assert_eq!(warnings(&labels, &[&small]).len(), 1);
        assert!(warnings(&labels, &[&gear(3.35)]).is_empty());
    }

    #[test]
    fn accepted_ranges_read_small_to_large_and_csv_rows_are_whole() {
        let g = gear(3.35);
        let span = g.span.unwrap().span;
        let text = accepted(&span);
        let (lo, hi) = text.split_once(" to ").unwrap();
        assert!(lo.parse::<f64>().unwrap() < hi.parse::<f64>().unwrap(), "{text}");
        assert_eq!(csv_cells(Some(&g)).len(), CSV_FIELDS.len());
        assert!(csv_cells(None).iter().all(String::is_empty));
        // Every row has a label, a unit and one cell per gear.
        assert!(rows(&[&g, &g]).iter().all(|r| r.len() == 4));
    }
}
