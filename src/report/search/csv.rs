//! The CSV format: a header, then one row per train, best first. Stage columns repeat per stage
//! (`stage1_driver`, `stage1_driven`, `stage1_module`, `stage1_centre_distance`, and with mesh
//! geometry `stage1_shift_driver`, `stage1_shift_driven`, `stage1_working_centre_distance`,
//! `stage1_contact_ratio`) up to the most stages the search allowed, so every row has the same
//! columns. [`header`] and [`row`] also serve the streaming mode.

use std::io::{self, Write};

use super::SearchReport;
use crate::model::problem::Problem;
use crate::model::train::Train;

const PLAIN: &[&str] = &["driver", "driven", "module", "centre_distance"];
const GEOMETRY: &[&str] = &[
    "driver",
    "driven",
    "module",
    "centre_distance",
    "shift_driver",
    "shift_driven",
    "working_centre_distance",
    "contact_ratio",
];

fn stage_fields(problem: &Problem) -> &'static [&'static str] {
    if problem.mesh.is_some() {
        GEOMETRY
    } else {
        PLAIN
    }
}

/// The header row for `problem`.
pub fn header(problem: &Problem) -> Vec<String> {
    let mut head: Vec<String> =
        ["rank", "ratio", "value", "error", "meshes", "direction", "size", "span"].map(String::from).to_vec();
    for n in 1..=problem.stages.hi as usize {
        for f in stage_fields(problem) {
            head.push(format!("stage{n}_{f}"));
        }
    }
    head
}

/// One train's row; `rank` is its place in the listing (1-based; in streaming, its order).
pub fn row(problem: &Problem, rank: u64, t: &Train) -> Vec<String> {
    let fields = stage_fields(problem);
    let mut row = vec![
        rank.to_string(),
        t.ratio.to_string(),
        t.ratio.to_f64().to_string(),
        fmt_error(t.error.to_f64()),
        t.meshes().to_string(),
        t.direction().as_str().to_string(),
        t.size().to_string(),
        t.span_mm().to_string(),
    ];
    for n in 0..problem.stages.hi as usize {
        match t.stages.get(n) {
            Some(s) => {
                row.extend([
                    s.driver.teeth.to_string(),
                    s.driven.teeth.to_string(),
                    s.module_mm.to_string(),
                    s.centre_distance_mm().to_string(),
                ]);
                if fields.len() > PLAIN.len() {
                    let f = |v: Option<f64>| v.map_or(String::new(), |v| v.to_string());
                    let m = s.mesh;
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
    row
}

/// Write the report as CSV.
pub fn write(report: &SearchReport, w: &mut dyn Write) -> io::Result<()> {
    let mut out = ::csv::Writer::from_writer(w);
    out.write_record(header(report.problem))?;
    for (i, t) in report.outcome.trains.iter().enumerate() {
        out.write_record(row(report.problem, i as u64 + 1, t))?;
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
