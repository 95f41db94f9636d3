//! The CSV format for setups and charts: one row per setup (or per thread of a chart), fixed
//! columns. Intermediate pairs are written `driven:driver`, several joined with `;`, stud side
//! first. A sink: it computes nothing about gears.

use std::io::{self, Write};

use super::{ChartReport, ThreadReport};
use crate::trades::thread::pitch::Pitch;
use crate::trades::thread::Setup;

const SETUP_COLUMNS: [&str; 16] = [
    "position",
    "stud",
    "idler",
    "intermediates",
    "leadscrew",
    "meshes",
    "ratio",
    "pitch_cut",
    "pitch_unit",
    "lead_cut_mm",
    "lead_cut_mm_exact",
    "pitch_error",
    "lead_error",
    "lead_error_unit",
    "exact",
    "intermediate_from_leadscrew_mm",
];

fn setup_fields(s: &Setup, pitch: &Pitch) -> Vec<String> {
    let mids: Vec<String> = s.intermediates().iter().map(|(a, b)| format!("{a}:{b}")).collect();
    vec![
        s.position.as_ref().map_or(String::new(), |p| p.name.clone()),
        s.stud().to_string(),
        s.fit.idler.map_or(String::new(), |z| z.to_string()),
        mids.join(";"),
        s.leadscrew().to_string(),
        s.train.meshes().to_string(),
        s.train.ratio.to_string(),
        pitch.in_own_unit(s.pitch_cut_mm.value.to_f64()).to_string(),
        pitch.own_unit().to_string(),
        s.lead_cut_mm.value.to_f64().to_string(),
        if s.lead_cut_mm.exact { s.lead_cut_mm.value.to_string() } else { String::new() },
        s.pitch_error.to_f64().to_string(),
        s.lead_error(pitch).to_string(),
        pitch.lead_error_basis().1.to_string(),
        s.is_exact().to_string(),
        s.fit.intermediate_from_leadscrew_mm.map_or(String::new(), |v| v.to_string()),
    ]
}

/// Write a thread search as CSV.
pub fn write_thread(r: &ThreadReport, w: &mut dyn Write) -> io::Result<()> {
    let mut out = ::csv::Writer::from_writer(w);
    let mut head = vec!["rank"];
    head.extend(SETUP_COLUMNS);
    out.write_record(&head)?;
    for (i, s) in r.plan.setups.iter().enumerate() {
        let mut row = vec![(i + 1).to_string()];
        row.extend(setup_fields(s, &r.plan.thread.pitch));
        out.write_record(&row)?;
    }
    out.flush()
}

/// Write a chart as CSV: one row per thread; `shown` is `best`, `nearest` or empty.
pub fn write_chart(r: &ChartReport, w: &mut dyn Write) -> io::Result<()> {
    let mut out = ::csv::Writer::from_writer(w);
    let mut head = vec!["thread", "pitch", "reachable", "count", "shown"];
    head.extend(SETUP_COLUMNS);
    out.write_record(&head)?;
    for row in &r.chart.rows {
        let mut rec = vec![
            row.label.clone(),
            row.thread.pitch.text.clone(),
            row.best.is_some().to_string(),
            row.count.to_string(),
        ];
        match (&row.best, &row.nearest) {
            (Some(s), _) => {
                rec.push("best".into());
                rec.extend(setup_fields(s, &row.thread.pitch));
            }
            (None, Some(s)) => {
                rec.push("nearest".into());
                rec.extend(setup_fields(s, &row.thread.pitch));
            }
            (None, None) => {
                rec.push(String::new());
                rec.extend(std::iter::repeat_n(String::new(), SETUP_COLUMNS.len()));
            }
        }
        out.write_record(&rec)?;
    }
    out.flush()
}
