//! Reducers laid out for people: what was asked, then each train as a small block — one line
//! per stage with module, teeth, ratio, profile shifts, centre distance, tip diameters and
//! whether the pair is hunting — and its envelope and output speed; the caution at the foot.
//! It computes nothing about gears.

use crate::geometry::layout::ShaftLayout;
use crate::model::pool::fmt_num;
use crate::report::gear_data;
use crate::report::words::{count_line, describe_error, describe_tolerance, CONVENTION, REDUCER_CAUTION};
use crate::report::{Document, Table};
use crate::trades::reducer::hunting::{is_hunting, non_hunting, spread};
use crate::trades::reducer::shop::TrainShop;
use crate::trades::reducer::split::{rule_split, split_deviation};
use crate::trades::reducer::{centre_distance_sum_mm, largest_tip_mm, Hunting, Priority, ReducerPlan};

/// Where the shafts sit, how close a gear comes to another shaft, each stage's backlash, and
/// the gear data table of the train.
fn shop_section(p: &ReducerPlan, shop: &TrainShop, d: &mut Document) {
    let last = shop.shafts_mm.len().saturating_sub(1);
    let shafts: Vec<String> = shop
        .shafts_mm
        .iter()
        .enumerate()
        .map(|(k, c)| {
            let name = match k {
                0 => "input".to_string(),
                k if k == last => "output".to_string(),
                k => format!("shaft {k}"),
            };
            format!("{name} ({}, {})", fmt_num(c[0]), fmt_num(c[1]))
        })
        .collect();
    let layout = match p.spec.shop.layout {
        ShaftLayout::Inline => "in line".to_string(),
        ShaftLayout::Folded { turn_deg } => format!("folded {}° at each stage", fmt_num(turn_deg)),
    };
    d.item(1, false, format!("shafts, {layout}, centres in mm: {}", shafts.join(", ")));
    if let (Some(c), Some(dia)) = (shop.tightest, p.spec.shop.shaft_diameter_mm) {
        d.item(
            1,
            false,
            format!(
                "tightest: the stage {} {} clears {} ({} mm) by {} mm (margin wanted {} mm)",
                c.stage,
                if c.driven { "gear" } else { "pinion" },
                match c.shaft {
                    0 => "the input shaft".to_string(),
                    k if k == last => "the output shaft".to_string(),
                    k => format!("shaft {k}"),
                },
                fmt_num(dia),
                fmt_num(c.gap_mm),
                fmt_num(p.spec.shop.shaft_margin_mm)
            ),
        );
    }
    let mut labels = Vec::new();
    let mut gears = Vec::new();
    for (k, stage) in shop.stages.iter().enumerate() {
        let Some(pair) = stage else { continue };
        for line in gear_data::backlash_lines(pair) {
            d.item(1, false, format!("stage {}: {line}", k + 1));
        }
        labels.extend(gear_data::pair_labels(pair, [format!("{} pinion", k + 1), format!("{} gear", k + 1)]));
        gears.extend(pair.gears.iter());
    }
    if !gears.is_empty() {
        gear_data::add_table(d, "", &labels, &gears);
    }
}

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
            Priority::Split => "hunting pairs, closeness to the split rule in steps of 10%, error, size",
        }
    ));
    if s.priority == Priority::Split {
        let n = p.problem.stages.hi as usize;
        let rule: Vec<String> = rule_split(s.ratio.to_f64(), n).iter().map(|r| format!("{r:.3}")).collect();
        d.line(format!(
            "Split rule: {} for {n} stage{} (input to output; {})",
            rule.join(" × "),
            if n == 1 { "" } else { "s" },
            if n == 2 {
                "output stage 0.88·√i, Dunaev and Lelikov's design handbook, from memory; stages of one module may be mounted in either order"
            } else {
                "equal stages, common practice"
            }
        ));
    }
    d.blank();
    match p.gear_set_count.filter(|_| p.count > 0) {
        Some(sets) => d.line(crate::report::words::set_count_line(
            p.count,
            Some(sets),
            p.trains.len(),
            p.complete,
            "best first",
            "the arrangement of its gears into stages that ranks best",
        )),
        None => d.line(count_line(p.count, p.trains.len(), p.complete, "train", "best first")),
    }
    for (n, t) in p.trains.iter().enumerate() {
        d.blank();
        let from_rule = if s.priority == Priority::Split {
            format!("; {:.1}% from the split rule", (split_deviation(t).exp() - 1.0) * 100.0)
        } else {
            String::new()
        };
        let speed = s.input_rpm.map_or(String::new(), |rpm| {
            format!("; output {} rpm at {} rpm in", fmt_num(rpm / t.ratio.to_f64()), fmt_num(rpm))
        });
        let arrangements = match p.arrangements.get(n) {
            Some(&k) if k > 1 => format!("; {k} arrangements of these gears"),
            _ => String::new(),
        };
        d.heading(format!("{}. i = {} = {:.5} ({}); balance {:.3} (largest stage ratio / smallest); {} non-hunting pair{}{from_rule}{speed}{arrangements}",
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
        for (k, o) in p.others.get(n).into_iter().flatten().enumerate() {
            let stages: Vec<String> = o
                .stages
                .iter()
                .map(|st| {
                    let (x, a) = match &st.mesh {
                        Some(m) => {
                            (format!(" x {:+.3}/{:+.3}", m.shift[0], m.shift[1]), m.centre_distance_mm)
                        }
                        None => (String::new(), st.centre_distance_mm()),
                    };
                    format!(
                        "m{} {}→{} ({} mm{x})",
                        fmt_num(st.module_mm),
                        st.driver.teeth,
                        st.driven.teeth,
                        fmt_num(a)
                    )
                })
                .collect();
            d.item(
                1,
                false,
                format!(
                    "arrangement {}.{}: {}; balance {:.3}; {} non-hunting pair{}; envelope {} mm, centres add up to {} mm",
                    n + 1,
                    k + 2,
                    stages.join("  "),
                    spread(o),
                    non_hunting(o),
                    if non_hunting(o) == 1 { "" } else { "s" },
                    fmt_num(largest_tip_mm(o)),
                    fmt_num(centre_distance_sum_mm(o))
                ),
            );
        }
        if let Some(shop) = p.shop.get(n) {
            shop_section(p, shop, &mut d);
        }
    }
    d.blank();
    let listed: Vec<crate::report::fields::TrainJson> =
        p.trains.iter().map(crate::report::fields::TrainJson::from_train).collect();
    crate::report::fields::on_hand(&listed, &mut d);
    d.note("Stages run from the input (motor) shaft to the output shaft; shifts in modules.");
    d.note(format!("Ratios: {CONVENTION}."));
    d.note(format!("CAUTION: {REDUCER_CAUTION}"));
    d
}
