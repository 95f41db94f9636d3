//! The table format: a short header saying what was searched, the count, the best trains in
//! aligned columns, and the convention and caution as a footer.

use std::io::{self, Write};

use crate::model::pool::fmt_num;
use crate::model::train::Train;
use crate::report::columns::columns;
use crate::report::{describe_error, describe_tolerance, Report, CAUTION, CONVENTION};

/// Write the report as a table for people.
pub fn write(report: &Report, w: &mut dyn Write) -> io::Result<()> {
    let p = report.problem;
    let o = report.outcome;
    let t = &p.target;
    let exact = t.ratio.to_string();
    if exact == t.text {
        writeln!(w, "Target ratio {}, tolerance {}", t.text, describe_tolerance(t.tolerance.to_f64()))?;
    } else {
        writeln!(
            w,
            "Target ratio {} (= {} ≈ {}), tolerance {}",
            t.text,
            exact,
            fmt_value(t.ratio.to_f64()),
            describe_tolerance(t.tolerance.to_f64())
        )?;
    }
    writeln!(w, "Gears: {}", p.pool.describe())?;
    let counts: Vec<String> = p.stage_counts().iter().map(|n| n.to_string()).collect();
    writeln!(w, "Stages: {} ({} allowed stage pairings)", counts.join(", "), o.stage_options)?;
    writeln!(w)?;
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
        writeln!(
            w,
            "{status}{} trains meet every constraint; {} of them form the Pareto front on error, meshes \
             and size (none beats them on all three){}:",
            group_thousands(o.count),
            group_thousands(front as u64),
            if o.trains.len() == front {
                format!(", listed by {}", keys.join(", then "))
            } else {
                format!("; the first {} by {}", o.trains.len(), keys.join(", then "))
            }
        )?;
    } else {
        match o.count {
            0 => writeln!(w, "{status}No train meets every constraint.")?,
            1 => writeln!(w, "{status}1 train meets every constraint.")?,
            n => writeln!(
                w,
                "{status}{} trains meet every constraint; {} by {}:",
                group_thousands(n),
                if o.trains.len() as u64 == n {
                    "all listed".to_string()
                } else {
                    format!("the best {} listed", o.trains.len())
                },
                keys.join(", then ")
            )?,
        }
    }
    if let Some(s) = report.shard {
        writeln!(w, "(part {s} of a split search: combine the parts' JSON with gearsieve merge)")?;
    }
    if !o.trains.is_empty() {
        writeln!(w)?;
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
        columns(w, &head, &rows, &[0, 2, 4])?;
    }
    write_meshes(report, w)?;
    if report.explain {
        write_explain(report, w)?;
    }
    writeln!(w)?;
    writeln!(w, "{CONVENTION}.")?;
    writeln!(w, "{CAUTION}")?;
    Ok(())
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
fn write_meshes(report: &Report, w: &mut dyn Write) -> io::Result<()> {
    let trains = &report.outcome.trains;
    if !trains.iter().any(|t| t.stages.iter().any(|s| s.mesh.is_some())) {
        return Ok(());
    }
    writeln!(w)?;
    writeln!(
        w,
        "Meshes (x = profile shift in modules, driver/driven; aw = working centre distance mm; \
         αw = working pressure angle; εα = contact ratio; da = tip diameters mm):"
    )?;
    for (i, t) in trains.iter().enumerate() {
        for (n, s) in t.stages.iter().enumerate() {
            let Some(m) = &s.mesh else { continue };
            let rank = if n == 0 { (i + 1).to_string() } else { String::new() };
            writeln!(
                w,
                "{rank:>4}  {:>9}  aw {:>8.3}  x {:+.3}/{:+.3}  αw {:>6.2}°  εα {:.2}  da {:.2}/{:.2}",
                format!("{}→{}", s.driver.teeth, s.driven.teeth),
                m.centre_distance_mm,
                m.shift[0],
                m.shift[1],
                m.working_pressure_angle_deg,
                m.contact_ratio,
                m.tip_diameter_mm[0],
                m.tip_diameter_mm[1],
            )?;
        }
    }
    Ok(())
}

/// Why stage pairings were left out by the mesh checks.
fn write_explain(report: &Report, w: &mut dyn Write) -> io::Result<()> {
    writeln!(w)?;
    let r = &report.outcome.rejected;
    if r.is_empty() {
        return writeln!(w, "The mesh checks left nothing out.");
    }
    writeln!(w, "Left out by the mesh checks (count, reason, first example):")?;
    for x in r {
        writeln!(w, "  {:>9}  {}: {}", group_thousands(x.count), x.kind, x.example)?;
    }
    Ok(())
}

fn fmt_value(v: f64) -> String {
    let s = format!("{v:.10}");
    s.trim_end_matches('0').trim_end_matches('.').to_string()
}

/// `1234567` → `1,234,567`.
pub fn group_thousands(n: u64) -> String {
    let s = n.to_string();
    let mut out = String::new();
    for (i, c) in s.chars().enumerate() {
        if i > 0 && (s.len() - i) % 3 == 0 {
            out.push(',');
        }
        out.push(c);
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn thousands() {
        assert_eq!(group_thousands(0), "0");
        assert_eq!(group_thousands(999), "999");
        assert_eq!(group_thousands(1000), "1,000");
        assert_eq!(group_thousands(1234567), "1,234,567");
    }
}
