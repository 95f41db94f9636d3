//! The CSV format for clock trains: a header row, then one row per train, best first. Stages
//! are written `driver>driven` separated by spaces, input arbor first. A sink.

use std::io::{self, Write};

use crate::model::train::Train;
use crate::trades::clock::astro::AstroPlan;
use crate::trades::clock::going::GoingPlan;
use crate::trades::clock::motion::MotionPlan;

fn stages(t: &Train) -> String {
    t.stages.iter().map(|s| format!("{}>{}", s.driver.teeth, s.driven.teeth)).collect::<Vec<_>>().join(" ")
}

fn write_rows(w: &mut dyn Write, head: &[&str], rows: Vec<Vec<String>>) -> io::Result<()> {
    let mut c = ::csv::Writer::from_writer(w);
    c.write_record(head)?;
    for r in rows {
        c.write_record(&r)?;
    }
    c.flush()
}

/// Write a going-train search: rank, stages (wheel>pinion), ratio, rate, arbor speeds.
pub fn write_going(p: &GoingPlan, w: &mut dyn Write) -> io::Result<()> {
    let rows = p
        .trains
        .iter()
        .enumerate()
        .map(|(n, g)| {
            vec![
                (n + 1).to_string(),
                stages(&g.train),
                g.train.ratio.to_string(),
                g.train.error.to_f64().to_string(),
                g.rate_s_per_day.to_string(),
                g.arbor_turns_per_hour.iter().map(|v| v.to_string()).collect::<Vec<_>>().join(" "),
                g.train.size().to_string(),
            ]
        })
        .collect();
    write_rows(
        w,
        &["rank", "wheel>pinion", "ratio", "error", "rate_s_per_day", "arbor_turns_per_hour", "size"],
        rows,
    )
}

/// Write a motion-work search: rank, stages (pinion>wheel), ratio, error, working centre
/// distances and shifts.
pub fn write_motion(p: &MotionPlan, w: &mut dyn Write) -> io::Result<()> {
    let rows = p
        .trains
        .iter()
        .enumerate()
        .map(|(n, t)| {
            let a: Vec<String> = t
                .stages
                .iter()
                .map(|s| s.mesh.map_or(s.centre_distance_mm(), |m| m.centre_distance_mm).to_string())
                .collect();
            let x: Vec<String> = t
                .stages
                .iter()
                .map(|s| s.mesh.map_or("0/0".to_string(), |m| format!("{}/{}", m.shift[0], m.shift[1])))
                .collect();
            vec![
                (n + 1).to_string(),
                stages(t),
                t.ratio.to_string(),
                t.error.to_f64().to_string(),
                a.join(" "),
                x.join(" "),
                t.size().to_string(),
            ]
        })
        .collect();
    write_rows(w, &["rank", "pinion>wheel", "ratio", "error", "centre_distance_mm", "shifts", "size"], rows)
}

/// Write an astronomical-train search: rank, stages, ratio, dial period, error, drift.
pub fn write_astro(p: &AstroPlan, w: &mut dyn Write) -> io::Result<()> {
    let rows = p
        .trains
        .iter()
        .enumerate()
        .map(|(n, a)| {
            vec![
                (n + 1).to_string(),
                stages(&a.train),
                a.train.ratio.to_string(),
                a.period_days.to_string(),
                a.train.error.to_f64().to_string(),
                a.drift_days_per_year.to_string(),
                a.days_to_one_day.map_or(String::new(), |d| d.to_string()),
            ]
        })
        .collect();
    write_rows(
        w,
        &["rank", "driver>driven", "ratio", "period_days", "error", "drift_days_per_year", "days_to_one_day"],
        rows,
    )
}
