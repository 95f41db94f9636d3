//! The table format for setups and charts: a short header saying which lathe and gears, the
//! setups in aligned columns a machinist can print and keep by the machine, and a footer with the
//! conventions and the caution. A sink: it computes nothing about gears.

use std::io::{self, Write};

use crate::model::pool::fmt_num;
use crate::report::columns::columns;
use crate::report::describe_tolerance;
use crate::trades::thread::chart::Chart;
use crate::trades::thread::{Lathe, Rejected, Setup, ThreadPlan, CAUTION};

/// A thread search, ready to print.
pub struct ThreadReport<'a> {
    /// The lathe and how it was searched.
    pub lathe: &'a Lathe,
    /// What was found.
    pub plan: &'a ThreadPlan,
    /// Trains the banjo refused, when they were asked for.
    pub rejected: Option<&'a [Rejected]>,
}

/// A chart, ready to print.
pub struct ChartReport<'a> {
    /// The lathe and how it was searched.
    pub lathe: &'a Lathe,
    /// The series' name or file.
    pub series: &'a str,
    /// The rows.
    pub chart: &'a Chart,
}

/// `6tpi leadscrew, stud ratio 1, gearbox A=2 B=1`.
pub fn describe_machine(lathe: &Lathe) -> String {
    let m = &lathe.machine;
    let gearbox = if m.gearbox.is_empty() {
        "no gearbox".to_string()
    } else {
        let p: Vec<String> = m.gearbox.iter().map(|p| format!("{}={}", p.name, p.ratio)).collect();
        format!("gearbox positions {}", p.join(" "))
    };
    format!("{} leadscrew, spindle-to-stud ratio {}, {gearbox}", m.leadscrew, m.stud_ratio)
}

fn header(w: &mut dyn Write, lathe: &Lathe) -> io::Result<()> {
    writeln!(w, "Lathe: {}", describe_machine(lathe))?;
    writeln!(w, "Gears: {}", lathe.pool.describe())?;
    match &lathe.banjo {
        Some(b) => writeln!(w, "Banjo: {}", b.describe())?,
        None => writeln!(
            w,
            "Banjo: not checked (give --banjo FILE, or --stud-to-leadscrew, --intermediate-range \
             and --shaft-diameter)"
        )?,
    }
    writeln!(w, "Pitch tolerance {}; stages {}", describe_tolerance(lathe.tolerance.to_f64()), lathe.stages)
}

fn footer(w: &mut dyn Write, lead_basis: &str) -> io::Result<()> {
    writeln!(w)?;
    writeln!(w, "Pitch error = pitch cut / pitch wanted − 1; lead error is that over {lead_basis}.")?;
    writeln!(w, "Intermediate gears: driven, driver (the pair keyed together on one stud); int. stud and")?;
    writeln!(w, "idler stud distances are mm from the leadscrew axis. Ratios follow ISO 1122-1 (input")?;
    writeln!(w, "turns per output turn); gearbox ratios are input turns per leadscrew turn. Set the hand")?;
    writeln!(w, "of the thread with the tumbler reverse.")?;
    for (i, sentence) in CAUTION.split_inclusive(". ").enumerate() {
        let lead = if i == 0 { "CAUTION:" } else { "        " };
        writeln!(w, "{lead} {}", sentence.trim_end())?;
    }
    Ok(())
}

/// Cells shared by thread and chart rows: box, stud, idler, intermediates, leadscrew, pitch cut,
/// pitch error, lead error, banjo.
fn setup_cells(s: &Setup, lathe: &Lathe, pitch: &crate::trades::thread::pitch::Pitch) -> Vec<String> {
    let idler = match (s.fit.idler, s.train.stages.len(), &lathe.banjo) {
        (Some(z), _, _) => z.to_string(),
        (None, 1, None) => "any".to_string(),
        _ => "-".to_string(),
    };
    let mids: Vec<String> = s.intermediates().iter().map(|(a, b)| format!("{a}, {b}")).collect();
    let (basis, unit) = pitch.lead_error_basis();
    let lead = if s.is_exact() {
        "0".to_string()
    } else if basis == 1.0 {
        format!("{:+.6} {unit}", s.lead_error(pitch))
    } else {
        format!("{:+.4} {unit}", s.lead_error(pitch))
    };
    let error =
        if s.is_exact() { "exact".to_string() } else { crate::report::describe_error(&s.pitch_error) };
    let banjo = match (s.fit.stud_mesh_inner, s.fit.intermediate_from_leadscrew_mm) {
        (Some(true), Some(r)) => format!("stud mesh inner; int. stud {} mm", fmt_num(r)),
        (Some(false), Some(r)) => format!("leadscrew mesh inner; int. stud {} mm", fmt_num(r)),
        (None, Some(r)) => format!("idler stud {} mm", fmt_num(r)),
        _ if lathe.banjo.is_some() && s.train.stages.len() == 1 => "direct mesh".to_string(),
        _ => "-".to_string(),
    };
    vec![
        s.position.as_ref().map_or("-".to_string(), |p| p.name.clone()),
        s.stud().to_string(),
        idler,
        if mids.is_empty() { "-".to_string() } else { mids.join("; ") },
        s.leadscrew().to_string(),
        pitch.show(s.pitch_cut_mm.value.to_f64()),
        error,
        lead,
        banjo,
    ]
}

const SETUP_HEAD: [&str; 9] = [
    "box",
    "stud",
    "idler",
    "intermediate",
    "leadscrew",
    "pitch cut",
    "pitch error",
    "lead error",
    "on the banjo",
];

/// Write a thread search as a table.
pub fn write_thread(r: &ThreadReport, w: &mut dyn Write) -> io::Result<()> {
    let t = &r.plan.thread;
    let lead = t.lead_mm();
    let exact = if lead.exact { format!(" = {} mm exactly", lead.value) } else { String::new() };
    writeln!(
        w,
        "Thread {}, {} start{} (lead {} mm{exact})",
        t.pitch,
        t.starts,
        if t.starts == 1 { "" } else { "s" },
        fmt_num(lead.value.to_f64()),
    )?;
    header(w, r.lathe)?;
    writeln!(w)?;
    let p = r.plan;
    let status = if p.complete { "" } else { "INCOMPLETE (interrupted): at least " };
    match p.count {
        0 => writeln!(w, "{status}No setup cuts {} within the tolerance from these gears.", t.pitch)?,
        1 => writeln!(w, "{status}1 setup cuts it:")?,
        n => writeln!(
            w,
            "{status}{n} setups cut it; {} by pitch error, then meshes, then teeth:",
            if p.setups.len() as u64 == n {
                "all listed".to_string()
            } else {
                format!("the best {} listed", p.setups.len())
            }
        )?,
    }
    if !p.setups.is_empty() {
        writeln!(w)?;
        let mut head = vec!["#".to_string()];
        head.extend(SETUP_HEAD.iter().map(|s| s.to_string()));
        let rows: Vec<Vec<String>> = p
            .setups
            .iter()
            .enumerate()
            .map(|(i, s)| {
                let mut row = vec![(i + 1).to_string()];
                row.extend(setup_cells(s, r.lathe, &t.pitch));
                row
            })
            .collect();
        columns(w, &head, &rows, &[0, 2, 3, 5])?;
    }
    if let Some(rej) = r.rejected {
        writeln!(w)?;
        if r.lathe.banjo.is_none() {
            writeln!(w, "Explain: no banjo given, so no setup was refused for its geometry.")?;
        } else if rej.is_empty() {
            writeln!(w, "Explain: the banjo refused no train within the tolerance.")?;
        } else {
            writeln!(w, "Trains within the tolerance that the banjo refuses:")?;
            for x in rej {
                let stages: Vec<String> =
                    x.train.stages.iter().map(|s| format!("{}→{}", s.driver.teeth, s.driven.teeth)).collect();
                let pos = x.position.as_ref().map_or(String::new(), |p| format!(" (gearbox {})", p.name));
                writeln!(
                    w,
                    "  {}{pos}, pitch error {}:",
                    stages.join(" "),
                    crate::report::describe_error(&x.pitch_error)
                )?;
                for why in &x.reasons {
                    writeln!(w, "    - {why}")?;
                }
            }
        }
    }
    footer(w, if t.pitch.kind.is_inch() { "1 inch" } else { "100 mm" })
}

/// Write a chart as a table.
pub fn write_chart(r: &ChartReport, w: &mut dyn Write) -> io::Result<()> {
    let c = r.chart;
    writeln!(w, "Thread chart: {} ({} threads)", r.series, c.rows.len())?;
    header(w, r.lathe)?;
    writeln!(w)?;
    writeln!(
        w,
        "{}{} of {} threads within the tolerance; the others show the nearest pitch that can be set up.",
        if c.complete { "" } else { "INCOMPLETE (interrupted): " },
        c.reachable(),
        c.rows.len()
    )?;
    writeln!(w)?;
    let mut head = vec!["thread".to_string(), "pitch".to_string()];
    head.extend(SETUP_HEAD.iter().map(|s| s.to_string()));
    head.push("note".to_string());
    let rows: Vec<Vec<String>> = c
        .rows
        .iter()
        .map(|row| {
            let mut cells = vec![row.label.clone(), row.thread.pitch.text.clone()];
            match (&row.best, &row.nearest) {
                (Some(s), _) => {
                    cells.extend(setup_cells(s, r.lathe, &row.thread.pitch));
                    cells.push(String::new());
                }
                (None, Some(s)) => {
                    cells.extend(setup_cells(s, r.lathe, &row.thread.pitch));
                    cells.push("OUT OF REACH: nearest shown".to_string());
                }
                (None, None) => {
                    cells.extend(std::iter::repeat_n("-".to_string(), SETUP_HEAD.len()));
                    cells.push("OUT OF REACH: nothing near can be set up".to_string());
                }
            }
            cells
        })
        .collect();
    columns(w, &head, &rows, &[3, 4, 6])?;
    let inch = c.rows.iter().any(|r| r.thread.pitch.kind.is_inch());
    let metric = c.rows.iter().any(|r| !r.thread.pitch.kind.is_inch());
    let basis = match (metric, inch) {
        (true, true) => "100 mm (1 inch for inch threads)",
        (false, true) => "1 inch",
        _ => "100 mm",
    };
    footer(w, basis)
}
