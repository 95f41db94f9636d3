//! The CSV format: a header, then one row per train, best first. Stage columns repeat per stage
//! (`stage1_driver`, `stage1_driven`, `stage1_module`, `stage1_centre_distance`, …) up to the
//! most stages the search allowed, so every row has the same columns.

use std::io::{self, Write};

use super::Report;

/// Write the report as CSV.
pub fn write(report: &Report, w: &mut dyn Write) -> io::Result<()> {
    let max = report.problem.stages.hi as usize;
    let geometry = report.problem.mesh.is_some();
    let fields: &[&str] = if geometry {
        &["driver", "driven", "module", "centre_distance", "shift_driver", "shift_driven", "working_centre_distance", "contact_ratio"]
    } else {
        &["driver", "driven", "module", "centre_distance"]
    };
    let mut out = ::csv::Writer::from_writer(w);
    let mut head: Vec<String> = [
        "rank",
        "ratio",
        "value",
        "error",
        "meshes",
        "direction",
        "size",
        "span",
    ]
    .iter()
    .map(|s| s.to_string())
    .collect();
    for n in 1..=max {
        for f in fields {
            head.push(format!("stage{n}_{f}"));
        }
    }
    out.write_record(&head)?;
    for (i, t) in report.outcome.trains.iter().enumerate() {
        let mut row = vec![
            (i + 1).to_string(),
            t.ratio.to_string(),
            t.ratio.to_f64().to_string(),
            fmt_error(t.error.to_f64()),
            t.meshes().to_string(),
            t.direction().as_str().to_string(),
            t.size().to_string(),
            t.span_mm().to_string(),
        ];
        for n in 0..max {
            match t.stages.get(n) {
                Some(s) => {
                    row.extend([
                        s.driver.teeth.to_string(),
                        s.driven.teeth.to_string(),
                        s.module_mm.to_string(),
                        s.centre_distance_mm().to_string(),
                    ]);
                    if geometry {
                        let m = s.mesh;
                        let f = |v: Option<f64>| v.map_or(String::new(), |v| v.to_string());
                        row.extend([
                            f(m.map(|m| m.shift[0])),
                            f(m.map(|m| m.shift[1])),
                            f(m.map(|m| m.centre_distance_mm)),
                            f(m.map(|m| m.contact_ratio)),
                        ]);
                    }
                }
                None => row.extend(std::iter::repeat_n(String::new(), fields.len())),
            }
        }
        out.write_record(&row)?;
    }
    out.flush()?;
    Ok(())
}

/// `0` for exact, else scientific notation (`1.2441610998071287e-9`) so small errors stay legible.
fn fmt_error(e: f64) -> String {
    if e == 0.0 {
        "0".to_string()
    } else {
        format!("{e:e}")
    }
}
