//! Reducers laid out for people: what was asked, then each train as a small block — one line
//! per stage with module, teeth, ratio, profile shifts, centre distance, tip diameters and
//! whether the pair is hunting — and its envelope and output speed; the caution at the foot.
//! It computes nothing about gears.

use crate::model::pool::fmt_num;
use crate::report::words::{count_line, describe_error, describe_tolerance, CONVENTION, REDUCER_CAUTION};
use crate::report::{Document, Table};
use crate::trades::reducer::hunting::{is_hunting, non_hunting, spread};
use crate::trades::reducer::{centre_distance_sum_mm, largest_tip_mm, Hunting, Priority, ReducerPlan};

/// A reducer search as a document.
pub fn document(p: &ReducerPlan) -> Document {
    let mut d = Document::new();
    let s = &p.spec;
    let exact = s.ratio.to_string();
    if exact == s.ratio_text {
        d.title(format!(
            "Reducer: i = {}, tolerance {}",
            s.ratio_text,
            describe_tolerance(s.tolerance.to_f64())
        ));
    } else {
        d.title(format!(
            "Reducer: i = {} (= {} exactly), tolerance {}",
            s.ratio_text,
            exact,
            describe_tolerance(s.tolerance.to_f64())
        ));
    }
    let modules: Vec<String> = s.modules.iter().map(|m| fmt_num(*m)).collect();
    d.line(format!(
        "Stages {}; modules {} (input to output); each stage at most {}:1; gears: {}",
        p.problem.stages,
        if modules.is_empty() { "from the shelf".into() } else { modules.join(", ") },
        s.max_stage_ratio,
        p.problem.pool.describe()
    ));
    let cd: Vec<String> = s.centre_distances_mm.iter().map(|a| fmt_num(*a)).collect();
    d.line(format!(
        "Housing centre distances: {}; hunting-tooth pairs {}; ranked by {}",
        if cd.is_empty() { "free (standard)".into() } else { format!("{} mm", cd.join(", ")) },
        match s.hunting {
            Hunting::Prefer => "preferred",
            Hunting::Require => "required",
            Hunting::Ignore => "not considered",
        },
        match s.priority {
            Priority::Balance => "hunting pairs, stage balance in steps of 10%, error, size",
            Priority::Error => "error, hunting pairs, stage balance in steps of 10%, size",
        }
    ));
    d.blank();
    d.line(count_line(p.count, p.trains.len(), p.complete, "train", "best first"));
    for (n, t) in p.trains.iter().enumerate() {
        d.blank();
        let speed = s.input_rpm.map_or(String::new(), |rpm| {
            format!("; output {} rpm at {} rpm in", fmt_num(rpm / t.ratio.to_f64()), fmt_num(rpm))
        });
        d.heading(format!("{}. i = {} = {:.5} ({}); balance {:.3} (largest stage ratio / smallest); {} non-hunting pair{}{speed}",
            n + 1,
            t.ratio,
            t.ratio.to_f64(),
            describe_error(&t.error),
            spread(t),
            non_hunting(t),
            if non_hunting(t) == 1 { "" } else { "s" }));
        let rows: Vec<Vec<String>> = t
            .stages
            .iter()
            .enumerate()
            .map(|(k, st)| {
                let (x, a, tips) = match &st.mesh {
                    Some(m) => (
                        format!("{:+.3} / {:+.3}", m.shift[0], m.shift[1]),
                        fmt_num(m.centre_distance_mm),
                        format!("{} / {}", fmt_num(m.tip_diameter_mm[0]), fmt_num(m.tip_diameter_mm[1])),
                    ),
                    None => ("-".into(), fmt_num(st.centre_distance_mm()), "-".into()),
                };
                vec![
                    (k + 1).to_string(),
                    fmt_num(st.module_mm),
                    format!("{} → {}", st.driver.teeth, st.driven.teeth),
                    format!("{:.4}", st.driven.teeth as f64 / st.driver.teeth as f64),
                    x,
                    a,
                    tips,
                    if is_hunting(st) { "yes".into() } else { "no".into() },
                ]
            })
            .collect();
        d.table(
            Table::new(
                &[
                    "stage",
                    "module",
                    "pinion → gear",
                    "ratio",
                    "shift x1 / x2",
                    "centre mm",
                    "tip Ø mm",
                    "hunting",
                ],
                &[],
            )
            .spaced(2, 2)
            .with_rows(rows),
        );
        d.item(
            1,
            false,
            format!(
                "envelope: largest tip diameter {} mm, centre distances add up to {} mm",
                fmt_num(largest_tip_mm(t)),
                fmt_num(centre_distance_sum_mm(t))
            ),
        );
    }
    d.blank();
    d.note("Stages run from the input (motor) shaft to the output shaft; shifts in modules.");
    d.note(format!("Ratios: {CONVENTION}."));
    d.note(format!("CAUTION: {REDUCER_CAUTION}"));
    d
}
