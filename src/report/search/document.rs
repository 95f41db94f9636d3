//! A search laid out for people: a short header saying what was searched, the count, the best
//! trains in columns, the mesh geometry and the reasons for leaving pairings out when asked,
//! and the convention and caution as a footer.

use super::SearchReport;
use crate::model::pool::fmt_num;
use crate::model::train::Train;
use crate::report::words::{describe_error, describe_tolerance, group_thousands, CAUTION, CONVENTION};
use crate::report::{Document, Table};

/// The search as a document.
pub fn document(report: &SearchReport) -> Document {
    let mut d = Document::new();
    let p = report.problem;
    let o = report.outcome;
    let t = &p.target;
    let exact = t.ratio.to_string();
    if exact == t.text {
        d.title(format!("Target ratio {}, tolerance {}", t.text, describe_tolerance(t.tolerance.to_f64())));
    } else {
        d.title(format!(
            "Target ratio {} (= {} ≈ {}), tolerance {}",
            t.text,
            exact,
            fmt_value(t.ratio.to_f64()),
            describe_tolerance(t.tolerance.to_f64())
        ));
    }
    d.line(format!("Gears: {}", p.pool.describe()));
    let counts: Vec<String> = p.stage_counts().iter().map(|n| n.to_string()).collect();
    d.line(format!("Stages: {} ({} allowed stage pairings)", counts.join(", "), o.stage_options));
    d.blank();
    let keys: Vec<&str> = p
        .rank
        .iter()
        .map(|k| match (k, &p.extra_key) {
            (crate::model::rank::RankKey::Extra, Some(x)) => x.name,
            _ => k.name(),
        })
        .collect();
    let status = if o.complete { "" } else { "INCOMPLETE (interrupted): at least " };
    if let Some(front) = o.pareto_size.filter(|_| o.count > 0) {
        d.line(format!(
            "{status}{} trains meet every constraint; {} of them form the Pareto front on error, meshes \
             and size (none beats them on all three){}:",
            group_thousands(o.count),
            group_thousands(front as u64),
            if o.trains.len() == front {
                format!(", listed by {}", keys.join(", then "))
            } else {
                format!("; the first {} by {}", o.trains.len(), keys.join(", then "))
            }
        ));
    } else {
        match o.count {
            0 => d.line(format!("{status}No train meets every constraint.")),
            1 => d.line(format!("{status}1 train meets every constraint.")),
            n => d.line(format!(
                "{status}{} trains meet every constraint; {} by {}:",
                group_thousands(n),
                if o.trains.len() as u64 == n {
                    "all listed".to_string()
                } else {
                    format!("the best {} listed", o.trains.len())
                },
                keys.join(", then ")
            )),
        }
    }
    if let Some(s) = report.shard {
        d.line(format!("(part {s} of a split search: combine the parts' JSON with gearsieve merge)"));
    }
    if !o.trains.is_empty() {
        d.blank();
        let rows: Vec<[String; 6]> = o
            .trains
            .iter()
            .enumerate()
            .map(|(i, tr)| {
                [
                    (i + 1).to_string(),
                    tr.ratio.to_string(),
                    describe_error(&tr.error),
                    tr.direction().as_str().to_string(),
                    tr.size().to_string(),
                    stages_text(tr),
                ]
            })
            .collect();
        let head = ["#", "ratio", "error", "output", "teeth", "stages: driver→driven (centre distance mm)"];
        let rows: Vec<Vec<String>> = rows.into_iter().map(Vec::from).collect();
        d.table(Table::new(&head, &[0, 2, 4]).with_rows(rows));
    }
    meshes(report, &mut d);
    if report.explain {
        explain(report, &mut d);
    }
    d.blank();
    d.note(format!("{CONVENTION}."));
    d.note(CAUTION);
    d
}

/// `20→75 (47.5)  12→120 (66)`: the centre distance is the working one when the mesh was worked
/// out, else the standard one; module shown per stage when the train mixes modules; labels in
/// brackets when the stock has them.
fn stages_text(t: &Train) -> String {
    let mixed = t
        .stages
        .windows(2)
        .any(|w| w[0].module_mm != w[1].module_mm || w[0].pressure_angle_deg != w[1].pressure_angle_deg);
    t.stages
        .iter()
        .map(|s| {
            let label = |l: &Vec<String>| {
                if l.is_empty() {
                    String::new()
                } else {
                    format!("[{}]", l.join("/"))
                }
            };
            let module = if mixed { format!("m{} ", fmt_num(s.module_mm)) } else { String::new() };
            format!(
                "{module}{}{}→{}{} ({})",
                s.driver.teeth,
                label(&s.driver.labels),
                s.driven.teeth,
                label(&s.driven.labels),
                fmt_num(s.mesh.map_or_else(|| s.centre_distance_mm(), |m| m.centre_distance_mm))
            )
        })
        .collect::<Vec<_>>()
        .join("  ")
}

/// Per-stage mesh geometry of the listed trains, when the search worked it out.
fn meshes(report: &SearchReport, d: &mut Document) {
    let trains = &report.outcome.trains;
    if !trains.iter().any(|t| t.stages.iter().any(|s| s.mesh.is_some())) {
        return;
    }
    d.blank();
    d.heading(
        "Meshes (x = profile shift in modules, driver/driven; aw = working centre distance mm; \
         αw = working pressure angle; εα = contact ratio; da = tip diameters mm):",
    );
    let mut rows = Vec::new();
    for (i, t) in trains.iter().enumerate() {
        for (n, s) in t.stages.iter().enumerate() {
            let Some(m) = &s.mesh else { continue };
            let rank = if n == 0 { (i + 1).to_string() } else { String::new() };
            rows.push(vec![
                rank,
                format!("{}→{}", s.driver.teeth, s.driven.teeth),
                format!("{:.3}", m.centre_distance_mm),
                format!("{:+.3}/{:+.3}", m.shift[0], m.shift[1]),
                format!("{:.2}°", m.working_pressure_angle_deg),
                format!("{:.2}", m.contact_ratio),
                format!("{:.2}/{:.2}", m.tip_diameter_mm[0], m.tip_diameter_mm[1]),
            ]);
        }
    }
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
}

/// Why stage pairings were left out by the mesh checks.
fn explain(report: &SearchReport, d: &mut Document) {
    d.blank();
    let r = &report.outcome.rejected;
    if r.is_empty() {
        d.line("The mesh checks left nothing out.");
        return;
    }
    d.heading("Left out by the mesh checks (count, reason, first example):");
    let rows =
        r.iter().map(|x| vec![group_thousands(x.count), format!("{}: {}", x.kind, x.example)]).collect();
    let table = Table::new(&["count", "reason: first example"], &[0]).headless_in_text().spaced(2, 2);
    d.table(table.min_widths(&[9]).with_rows(rows));
}

fn fmt_value(v: f64) -> String {
    let s = format!("{v:.10}");
    s.trim_end_matches('0').trim_end_matches('.').to_string()
}
