//! The CSV format for setups and charts: one row per setup (or per thread of a chart), one
//! value per cell, the stages as numbered stage columns from the stud to the leadscrew (so an
//! intermediate pair is `stage1_driven` and `stage2_driver`). It computes nothing about gears.

use std::io::{self, Write};

use super::document::banjo_cell;
use super::{ChartReport, ThreadReport};
use crate::model::purchase::describe_to_buy;
use crate::report::fields::{decimals, mm, on_hand_summary, small, StageColumns, TrainJson};
use crate::trades::thread::pitch::Pitch;
use crate::trades::thread::{Lathe, Setup};

const SETUP_COLUMNS: [&str; 25] = [
    "gearbox_position",
    "stud",
    "idler",
    "leadscrew",
    "ratio",
    "meshes",
    "pitch_cut",
    "pitch_unit",
    "lead_cut_mm",
    "lead_cut_mm_exact",
    "pitch_error",
    "lead_error",
    "lead_error_unit",
    "exact_pitch",
    "intermediate_stud_from_leadscrew_mm",
    "idler_stud_from_leadscrew_mm",
    "error_shown",
    "error_of",
    "on_the_banjo",
    "banjo_checked",
    "studs_from_leadscrew_mm",
    "planes",
    "engage_every_leadscrew_turns",
    "dial_every_nth_line",
    "on_hand_defects",
];

/// The stage columns of a lathe's setups: as many as it allows, stud first, and two for a
/// simple setup through an idler on a banjo.
fn stage_columns(lathe: &Lathe) -> StageColumns {
    let hi = lathe.stages.hi as usize;
    StageColumns { stages: if lathe.banjo.is_some() { hi.max(2) } else { hi }, mesh: false }
}

fn header(first: &[&str], lathe: &Lathe) -> Vec<String> {
    let mut head: Vec<String> = first.iter().chain(SETUP_COLUMNS.iter()).map(|s| s.to_string()).collect();
    head.push("stud_mesh_inner".into());
    if lathe.buy.is_some() {
        head.extend(["to_buy_count".to_string(), "to_buy".to_string()]);
    }
    head.extend(stage_columns(lathe).header());
    head
}

/// Every column but the stages' of a setup, then its stages in stud-to-leadscrew order.
fn setup_fields(s: &Setup, pitch: &Pitch, lathe: &Lathe) -> Vec<String> {
    let place = s.fit.intermediate_from_leadscrew_mm.map_or(String::new(), mm);
    let (intermediate, idler) =
        if s.fit.idler.is_some() { (String::new(), place) } else { (place, String::new()) };
    let mut row = vec![
        s.position.as_ref().map_or(String::new(), |p| p.name.clone()),
        s.stud().to_string(),
        s.fit.idler.map_or(String::new(), |z| z.to_string()),
        s.leadscrew().to_string(),
        s.train.ratio.to_string(),
        s.meshes().to_string(),
        decimals(pitch.in_own_unit(s.pitch_cut_mm.value.to_f64()), 6),
        pitch.own_unit().to_string(),
        decimals(s.lead_cut_mm.value.to_f64(), 6),
        if s.lead_cut_mm.exact { s.lead_cut_mm.value.to_string() } else { String::new() },
        small(s.pitch_error.to_f64()),
        small(s.lead_error(pitch)),
        pitch.lead_error_basis().1.to_string(),
        s.is_exact().to_string(),
        intermediate,
        idler,
    ];
    let (shown, sense) = s.shown_error(pitch);
    let chain = s.fit.chain.as_ref();
    let mounted = TrainJson::from_train(&s.mounted_train());
    row.extend([
        small(shown.to_f64()),
        sense.as_str().to_string(),
        banjo_cell(s),
        s.fit.not_checked.is_none().to_string(),
        chain.map_or(String::new(), |c| {
            c.from_leadscrew_mm().iter().map(|r| decimals(*r, 1)).collect::<Vec<_>>().join(";")
        }),
        chain.map_or(String::new(), |c| c.planes.iter().map(|p| p.to_string()).collect::<Vec<_>>().join("-")),
        s.engagement.map_or(String::new(), |e| e.leadscrew_turns.to_string()),
        s.engagement.and_then(|e| e.every_nth_line).map_or(String::new(), |n| n.to_string()),
        on_hand_summary(&mounted),
        s.fit.stud_mesh_inner.map_or(String::new(), |b| b.to_string()),
    ]);
    if let Some(b) = &s.to_buy {
        row.extend([s.to_buy_count().to_string(), describe_to_buy(b)]);
    }
    // The stages as they sit on the machine, stud first (the setup's train is in that order
    // already), an idler as two.
    row.extend(stage_columns(lathe).cells(&mounted));
    row
}

/// Write a thread search as CSV.
pub fn write_thread(r: &ThreadReport, w: &mut dyn Write) -> io::Result<()> {
    let mut out = ::csv::Writer::from_writer(w);
    out.write_record(header(&["rank", "arrangements", "arrangement"], r.lathe))?;
    for (i, s) in r.plan.setups.iter().enumerate() {
        // The listed arrangement is 1; the others, when asked for, follow as 2, 3, …
        for (k, a) in std::iter::once(s).chain(&s.others).enumerate() {
            let mut row = vec![(i + 1).to_string(), s.arrangements.to_string(), (k + 1).to_string()];
            row.extend(setup_fields(a, &r.plan.thread.pitch, r.lathe));
            out.write_record(&row)?;
        }
    }
    out.flush()
}

/// Write a chart as CSV: one row per thread; `shown` is `best`, `nearest` or empty.
pub fn write_chart(r: &ChartReport, w: &mut dyn Write) -> io::Result<()> {
    let mut out = ::csv::Writer::from_writer(w);
    let head = header(&["thread", "pitch", "reachable", "count", "shown"], r.lathe);
    let width = head.len() - 5;
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
                rec.extend(setup_fields(s, &row.thread.pitch, r.lathe));
            }
            (None, Some(s)) => {
                rec.push("nearest".into());
                rec.extend(setup_fields(s, &row.thread.pitch, r.lathe));
            }
            (None, None) => {
                rec.push(String::new());
                rec.extend(std::iter::repeat_n(String::new(), width));
            }
        }
        out.write_record(&rec)?;
    }
    out.flush()
}
