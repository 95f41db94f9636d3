//! Setups and charts laid out for people: a short header saying which lathe and gears, the
//! setups in columns a machinist can print and keep by the machine, and a footer with the
//! conventions and the caution. It computes nothing about gears.

use super::{ChartReport, ThreadReport};
use crate::model::pool::fmt_num;
use crate::model::train::standard_centre_distance_mm;
use crate::report::words::{describe_error, describe_tolerance, group_thousands, THREAD_CAUTION};
use crate::report::{Document, Table};
use crate::trades::thread::pitch::Pitch;
use crate::trades::thread::{Lathe, Setup};

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

fn header(d: &mut Document, lathe: &Lathe) {
    d.line(format!("Lathe: {}", describe_machine(lathe)));
    d.line(format!("Gears: {}", lathe.pool.describe()));
    match &lathe.banjo {
        Some(b) => d.line(format!("Banjo: {}", b.describe())),
        None => {
            d.line("Banjo: not checked (no banjo was described, so setups are not placed on the machine)")
        }
    }
    d.line(format!(
        "Pitch tolerance {}; stages {}",
        describe_tolerance(lathe.tolerance.to_f64()),
        lathe.stages
    ));
}

fn footer(d: &mut Document, lead_basis: &str) {
    d.blank();
    d.line(format!("Pitch error = pitch cut / pitch wanted − 1; lead error is that over {lead_basis}."));
    d.line("Intermediate gears: driven, driver (the pair keyed together on one stud); int. stud and");
    d.line("idler stud distances are mm from the leadscrew axis. Ratios follow ISO 1122-1 (input");
    d.line("turns per output turn); gearbox ratios are input turns per leadscrew turn. Set the hand");
    d.line("of the thread with the tumbler reverse.");
    for (i, sentence) in THREAD_CAUTION.split_inclusive(". ").enumerate() {
        let lead = if i == 0 { "CAUTION:" } else { "        " };
        d.note(format!("{lead} {}", sentence.trim_end()));
    }
}

/// Cells shared by thread and chart rows: box, stud, idler, intermediates, leadscrew, pitch cut,
/// pitch error, lead error, banjo.
fn setup_cells(s: &Setup, lathe: &Lathe, pitch: &Pitch) -> Vec<String> {
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
    let error = if s.is_exact() { "exact".to_string() } else { describe_error(&s.pitch_error) };
    let mounted = s.mounted_train();
    let banjo = match (s.fit.stud_mesh_inner, s.fit.intermediate_from_leadscrew_mm) {
        (Some(true), Some(r)) => format!("stud mesh inner; int. stud {} mm", fmt_num(r)),
        (Some(false), Some(r)) => format!("leadscrew mesh inner; int. stud {} mm", fmt_num(r)),
        (None, Some(r)) => {
            let centres: Vec<String> = mounted
                .stages
                .iter()
                .map(|x| fmt_num(standard_centre_distance_mm(x.module_mm, x.driver.teeth, x.driven.teeth)))
                .collect();
            format!("idler stud {} mm; centres {} mm", fmt_num(r), centres.join(" and "))
        }
        _ if lathe.banjo.is_some() && s.train.stages.len() == 1 => "direct mesh".to_string(),
        _ => "-".to_string(),
    };
    vec![
        s.position.as_ref().map_or("-".to_string(), |p| p.name.clone()),
        s.stud().to_string(),
        idler,
        if mids.is_empty() { "-".to_string() } else { mids.join("; ") },
        s.leadscrew().to_string(),
        format!("{}, {} way", mounted.meshes(), mounted.direction().as_str()),
        pitch.show(s.pitch_cut_mm.value.to_f64()),
        error,
        lead,
        banjo,
    ]
}

const SETUP_HEAD: [&str; 10] = [
    "box",
    "stud",
    "idler",
    "intermediate",
    "leadscrew",
    "meshes",
    "pitch cut",
    "pitch error",
    "lead error",
    "on the banjo",
];

/// A thread search as a document.
pub fn thread(r: &ThreadReport) -> Document {
    let mut d = Document::new();
    let t = &r.plan.thread;
    let lead = t.lead_mm();
    let exact = if lead.exact { format!(" = {} mm exactly", lead.value) } else { String::new() };
    d.title(format!(
        "Thread {}, {} start{} (lead {} mm{exact})",
        t.pitch,
        t.starts,
        if t.starts == 1 { "" } else { "s" },
        fmt_num(lead.value.to_f64())
    ));
    header(&mut d, r.lathe);
    d.blank();
    let p = r.plan;
    let status = if p.complete { "" } else { "INCOMPLETE (interrupted): at least " };
    match p.count {
        0 => d.line(format!("{status}No setup cuts {} within the tolerance from these gears.", t.pitch)),
        1 => d.line(format!("{status}1 setup cuts it:")),
        n => d.line(format!(
            "{status}{} setups cut it; {} by pitch error, then meshes, then size:",
            group_thousands(n),
            if p.setups.len() as u64 == n {
                "all listed".to_string()
            } else {
                format!("the best {} listed", p.setups.len())
            }
        )),
    }
    if !p.setups.is_empty() {
        d.blank();
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
        d.table(Table::new(&head, &[0, 2, 3, 5]).with_rows(rows));
    }
    if let Some(rej) = r.rejected {
        d.blank();
        if r.lathe.banjo.is_none() {
            d.line("Explain: no banjo given, so no setup was refused for its geometry.");
        } else if rej.is_empty() {
            d.line("Explain: the banjo refused no train within the tolerance.");
        } else {
            d.heading("Trains within the tolerance that the banjo refuses:");
            for x in rej {
                let stages: Vec<String> =
                    x.train.stages.iter().map(|s| format!("{}→{}", s.driver.teeth, s.driven.teeth)).collect();
                let pos = x.position.as_ref().map_or(String::new(), |p| format!(" (gearbox {})", p.name));
                d.item(
                    1,
                    false,
                    format!("{}{pos}, pitch error {}:", stages.join(" "), describe_error(&x.pitch_error)),
                );
                for why in &x.reasons {
                    d.item(2, true, why.clone());
                }
            }
        }
    }
    footer(&mut d, if t.pitch.kind.is_inch() { "1 inch" } else { "100 mm" });
    d
}

/// A chart as a document.
pub fn chart(r: &ChartReport) -> Document {
    let mut d = Document::new();
    let c = r.chart;
    d.title(format!("Thread chart: {} ({} threads)", r.series, c.rows.len()));
    header(&mut d, r.lathe);
    d.blank();
    let status = if c.complete { "" } else { "INCOMPLETE (interrupted): " };
    if c.reachable() == c.rows.len() {
        d.line(format!("{status}All {} threads can be cut within the tolerance.", c.rows.len()));
    } else {
        d.line(format!(
            "{status}{} of {} threads can be cut within the tolerance; the others show the nearest pitch \
             that can be set up.",
            c.reachable(),
            c.rows.len()
        ));
    }
    d.blank();
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
    d.table(Table::new(&head, &[3, 4, 6]).with_rows(rows));
    let inch = c.rows.iter().any(|r| r.thread.pitch.kind.is_inch());
    let metric = c.rows.iter().any(|r| !r.thread.pitch.kind.is_inch());
    let basis = match (metric, inch) {
        (true, true) => "100 mm (1 inch for inch threads)",
        (false, true) => "1 inch",
        _ => "100 mm",
    };
    footer(&mut d, basis);
    d
}
