//! A search laid out for people: a short header saying what was searched, the counts of trains
//! and gear sets, the best gear sets in columns (each by its best arrangement, with the gears it
//! needs bought when gears may be bought, with how many arrangements it has, and the others under it when asked), the mesh geometry and the reasons for leaving pairings out when asked,
//! and the convention and caution as a footer. Made from the search's JSON document, so a
//! merged split search reads exactly as one run.

use super::json::{CountKind, Doc};
use crate::model::pool::fmt_num;
use crate::model::problem::TO_BUY_KEY;
use crate::model::purchase::describe_to_buy;
use crate::report::fields::{on_hand, TrainJson};
use crate::report::words::{
    describe_error_f64, describe_tolerance, group_thousands, plain_words, CAUTION, CONVENTION,
};
use crate::report::{gear_data, Document, Table};

/// The search as a document.
pub fn document(doc: &Doc) -> Document {
    let mut d = Document::new();
    let t = &doc.target;
    if t.exact == t.ratio {
        d.title(format!("Target ratio {}, tolerance {}", t.ratio, describe_tolerance(t.tolerance)));
    } else {
        d.title(format!(
            "Target ratio {} (= {} ≈ {}), tolerance {}",
            t.ratio,
            t.exact,
            fmt_value(t.value),
            describe_tolerance(t.tolerance)
        ));
    }
    d.line(format!("Gears: {}", doc.gears));
    if let Some(b) = &doc.buy {
        d.line(format!("To buy: {b}; fewest to buy first"));
    }
    let counts: Vec<String> = doc.stage_counts.iter().map(|n| n.to_string()).collect();
    d.line(format!(
        "Stages: {} ({} allowed stage pairings)",
        counts.join(", "),
        group_thousands(doc.stage_options as u64)
    ));
    d.blank();
    let keys: Vec<&str> =
        doc.ranked_by.iter().map(|k| if k == TO_BUY_KEY { "gears to buy" } else { k.as_str() }).collect();
    let keys = keys.join(", then ");
    let lower = doc.count_kind == CountKind::LowerBound;
    let status = match (doc.complete, lower) {
        (false, _) => "INCOMPLETE (interrupted): at least ",
        (true, true) => "At least ",
        (true, false) => "",
    };
    let listed = doc.trains.len();
    let by_set = doc.trains.iter().any(|t| t.arrangements.is_some());
    // What the trains are made of, and what is listed: gear sets when the search listed them.
    let some = if lower { "at least " } else { "" };
    let mut made_of = match doc.gear_set_count {
        Some(1) => format!(", made of {some}1 gear set"),
        Some(n) => format!(", made of {some}{} gear sets", group_thousands(n)),
        None if by_set => crate::report::words::NOT_COUNTED.to_string(),
        None => String::new(),
    };
    if let (true, Some(within)) = (lower, doc.counted_within) {
        let reach = match within {
            0.0 => "every train that hits the target exactly".to_string(),
            w => format!("every train within {} of the target", describe_error_f64(w).replacen('+', "±", 1)),
        };
        made_of.push_str(&format!(
            " ({reach}, as close as the last listed, counted; farther ones not all: --count lower-bound)"
        ));
    }
    let (one, many) = if by_set { ("gear set", "gear sets") } else { ("train", "trains") };
    let each = if by_set { ", each by its best arrangement" } else { "" };
    if let Some(front) = doc.pareto_size.filter(|_| doc.count > 0) {
        d.line(format!(
            "{status}{} trains meet every constraint{made_of}; {} {} form the Pareto front on error, \
             meshes and size (none beats them on all three){}{each}:",
            group_thousands(doc.count),
            group_thousands(front as u64),
            if front == 1 { one } else { many },
            if listed == front {
                format!(", listed by {keys}")
            } else {
                format!("; the first {listed} by {keys}")
            }
        ));
    } else {
        let all = doc.gear_set_count.filter(|_| by_set).unwrap_or(doc.count);
        match doc.count {
            0 => d.line(format!("{status}No train meets every constraint.")),
            1 => d.line(format!("{status}1 train meets every constraint{made_of}.")),
            n => d.line(format!(
                "{status}{} trains meet every constraint{made_of}; {} by {keys}{each}:",
                group_thousands(n),
                if listed as u64 == all && !lower {
                    "all listed".to_string()
                } else {
                    format!("the best {listed} {} listed", if listed == 1 { one } else { many })
                },
            )),
        }
    }
    if let Some(s) = &doc.shard {
        d.line(format!("(part {s} of a split search: combine the parts' JSON with gearsieve merge)"));
    }
    if !doc.trains.is_empty() {
        d.blank();
        let working =
            doc.trains.iter().any(|t| t.stages.iter().any(|s| s.working_centre_distance_mm.is_some()));
        let mut rows: Vec<Vec<String>> = Vec::new();
        let row = |n: String, tr: &TrainJson| {
            let mut cells = vec![
                n,
                tr.ratio.clone(),
                describe_error_f64(tr.error),
                tr.direction.as_str().to_string(),
                tr.size.to_string(),
            ];
            if let Some(b) = &tr.to_buy {
                cells.push(describe_to_buy(b));
            }
            if by_set {
                cells.push(tr.arrangements.map_or(String::new(), |a| a.to_string()));
            }
            cells.push(stages_text(tr, doc.mixed_modules));
            cells
        };
        for (i, tr) in doc.trains.iter().enumerate() {
            rows.push(row((i + 1).to_string(), tr));
            for (j, other) in tr.other_arrangements.iter().enumerate() {
                rows.push(row(format!("{}.{}", i + 1, j + 2), other));
            }
        }
        let stages = if working {
            "stages: driver→driven (working centre distance mm)"
        } else {
            "stages: driver→driven (reference centre distance mm)"
        };
        let mut head = vec!["#", "ratio", "error", "direction", "size"];
        let mut right = vec![0, 2, 4];
        if doc.buy.is_some() {
            head.push("to buy");
        }
        if by_set {
            right.push(head.len());
            head.push("arrangements");
        }
        head.push(stages);
        let right = right.as_slice();
        d.table(Table::new(&head, right).with_rows(rows));
    }
    on_hand(&doc.trains, &mut d);
    meshes(doc, &mut d);
    if doc.explain {
        explain(doc, &mut d);
        gear_tables(doc, &mut d);
    }
    d.blank();
    d.note(format!("{CONVENTION}."));
    d.note(CAUTION);
    d
}

/// `20→75 (47.5)  12→120 (66)`: the centre distance is the working one when the mesh was worked
/// out, else the reference one; module shown per stage when the gears come in several modules;
/// labels in brackets when the stock has them.
fn stages_text(t: &TrainJson, mixed_modules: bool) -> String {
    let mixed = mixed_modules
        || t.stages
            .windows(2)
            .any(|w| w[0].module_mm != w[1].module_mm || w[0].pressure_angle_deg != w[1].pressure_angle_deg);
    t.stages
        .iter()
        .map(|s| {
            let label =
                |l: &Vec<String>| if l.is_empty() { String::new() } else { format!("[{}]", l.join("/")) };
            let module = if mixed { format!("m{} ", fmt_num(s.module_mm)) } else { String::new() };
            format!(
                "{module}{}{}→{}{} ({})",
                s.driver,
                label(&s.driver_labels),
                s.driven,
                label(&s.driven_labels),
                fmt_num(s.working_centre_distance_mm.unwrap_or(s.reference_centre_distance_mm))
            )
        })
        .collect::<Vec<_>>()
        .join("  ")
}

/// Per-stage mesh geometry of the listed trains, when the search worked it out.
fn meshes(doc: &Doc, d: &mut Document) {
    let mut rows = Vec::new();
    for (i, t) in doc.trains.iter().enumerate() {
        for (n, s) in t.stages.iter().enumerate() {
            let (Some(aw), Some(x), Some(alpha), Some(eps), Some(da)) = (
                s.working_centre_distance_mm,
                s.shift,
                s.working_pressure_angle_deg,
                s.contact_ratio,
                s.tip_diameter_mm,
            ) else {
                continue;
            };
            rows.push(vec![
                if n == 0 { (i + 1).to_string() } else { String::new() },
                format!("{}→{}", s.driver, s.driven),
                format!("{aw:.3}"),
                format!("{:+.3}/{:+.3}", x[0], x[1]),
                format!("{alpha:.2}°"),
                format!("{eps:.2}"),
                format!("{:.2}/{:.2}", da[0], da[1]),
            ]);
        }
    }
    if rows.is_empty() {
        return;
    }
    d.blank();
    d.heading(
        "Meshes (x = profile shift in modules, driver/driven; aw = working centre distance mm; \
         αw = working pressure angle; εα = contact ratio; da = tip diameters mm):",
    );
    let head = ["#", "stage", "aw mm", "x driver/driven", "αw", "εα", "da mm driver/driven"];
    let table = Table::new(&head, &[0, 1, 2, 4])
        .headless_in_text()
        .min_widths(&[4, 9, 8, 0, 7])
        .prefix(2, "aw ")
        .prefix(3, "x ")
        .prefix(4, "αw ")
        .prefix(5, "εα ")
        .prefix(6, "da ");
    d.table(table.with_rows(rows));
    for (i, t) in doc.trains.iter().enumerate() {
        for s in &t.stages {
            if let (Some(j), Some(aw)) = (s.backlash_mm, s.working_centre_distance_mm) {
                d.line(format!(
                    "  #{} {}→{}: gears as made, pulled apart to {aw:.3} mm: backlash {j:.3} mm (nominal), \
                     working pressure angle {:.2}°",
                    i + 1,
                    s.driver,
                    s.driven,
                    s.working_pressure_angle_deg.unwrap_or(f64::NAN)
                ));
            }
        }
    }
}

/// The gear data of each listed train whose meshes were worked out.
fn gear_tables(doc: &Doc, d: &mut Document) {
    for (i, t) in doc.trains.iter().enumerate() {
        let mut labels = Vec::new();
        let mut gears = Vec::new();
        for (k, s) in t.stages.iter().enumerate() {
            if let Some(pair) = &s.gear_data {
                labels.extend(gear_data::pair_labels(
                    pair,
                    [format!("{} driver", k + 1), format!("{} driven", k + 1)],
                ));
                gears.extend(pair.gears.iter());
            }
        }
        if gears.is_empty() {
            continue;
        }
        d.blank();
        gear_data::add_table(
            d,
            &format!(
                "Train {}: gear data, allowances for the recommended least backlash (ISO/TR 10064-2) at exact centres",
                i + 1
            ),
            &labels,
            &gears,
        );
    }
}

/// Why stage pairings were left out by the mesh checks.
fn explain(doc: &Doc, d: &mut Document) {
    d.blank();
    let r = &doc.rejected;
    if r.is_empty() {
        d.line("The mesh checks left nothing out.");
        return;
    }
    d.heading("Left out by the mesh checks (count, reason, first example):");
    let rows = r
        .iter()
        .map(|x| vec![group_thousands(x.count), format!("{}: {}", plain_words(&x.kind), x.example)])
        .collect();
    let table = Table::new(&["count", "reason: first example"], &[0]).headless_in_text().spaced(2, 2);
    d.table(table.min_widths(&[9]).with_rows(rows));
}

fn fmt_value(v: f64) -> String {
    let s = format!("{v:.10}");
    s.trim_end_matches('0').trim_end_matches('.').to_string()
}
