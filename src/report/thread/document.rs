//! Setups and charts laid out for people: a short header saying which lathe and gears, the
//! setups in columns a machinist can print and keep by the machine, and a footer with the
//! conventions and the caution. It computes nothing about gears.

use super::{ChartReport, ThreadReport};
use crate::model::pool::fmt_num;
use crate::model::purchase::describe_to_buy;
use crate::model::train::standard_centre_distance_mm;
use crate::report::fields::{on_hand, on_hand_notes, on_hand_summary, TrainJson};
use crate::report::words::{describe_error, describe_tolerance, group_thousands, THREAD_CAUTION};
use crate::report::{Document, Table};
use crate::trades::thread::banjo::{MAX_PLACED_STAGES, NO_BANJO};
use crate::trades::thread::pitch::{Pitch, PitchKind};
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

/// The lathe, its gears and banjo, and the tolerance (of the feed, for a feed).
pub(super) fn header(d: &mut Document, lathe: &Lathe, feed: bool) {
    let e = &lathe.equipment;
    match &e.name {
        Some(name) => d.line(format!("Lathe: {name}: {}", describe_machine(lathe))),
        None => d.line(format!("Lathe: {}", describe_machine(lathe))),
    }
    d.line(format!("Gears: {}", lathe.pool.describe()));
    if let Some(b) = &lathe.buy {
        d.line(format!("To buy: {}; fewest to buy first", b.describe()));
    }
    if let Some(largest) = e.largest_teeth {
        let left: Vec<String> = e.left_out.iter().map(|z| z.to_string()).collect();
        let left = if left.is_empty() {
            "none left out".to_string()
        } else {
            format!("left out: {}", left.join(", "))
        };
        d.line(format!("Guard: closes over gears of at most {largest} teeth; {left}"));
    }
    match &lathe.banjo {
        Some(b) => d.line(format!("Banjo: {}", b.describe())),
        None => {
            d.line("Banjo: not checked (no banjo was described, so setups are not placed on the machine)")
        }
    }
    match e.tumbler_reverse {
        Some(true) => d.line("Hand: set with the tumbler reverse"),
        Some(false) => d.line(
            "Hand: no tumbler reverse, so the hand follows the way the leadscrew turns (column meshes); \
             add an idler to turn it the other way",
        ),
        None => {}
    }
    if let Some(dial) = &e.dial {
        d.line(format!("Thread dial: {}", dial.describe()));
    }
    d.line(format!(
        "{} tolerance {}; stages {}",
        if feed { "Feed" } else { "Pitch" },
        describe_tolerance(lathe.tolerance.to_f64()),
        lathe.stages
    ));
}

fn footer(d: &mut Document, lathe: &Lathe, bases: Bases) {
    d.blank();
    d.heading("Legend");
    let mut lines: Vec<String> = Vec::new();
    if bases.tpi {
        lines.push(
            "error: for a thread given in TPI, TPI cut / TPI wanted − 1 (tagged TPI; a count too low is \
             negative)"
                .into(),
        );
    }
    if bases.feed {
        lines.push("error: feed cut / feed wanted − 1 (tagged feed)".into());
    }
    if bases.pitch {
        lines.push("error: pitch cut / pitch wanted − 1 (tagged pitch; a pitch too long is positive)".into());
    }
    lines.push(format!(
        "lead error: lead cut − lead wanted over {}, in the lead's length (positive: too long)",
        match (bases.inch_lead, bases.metric_lead) {
            (true, true) => "100 mm (1 inch for inch threads)",
            (true, false) => "1 inch",
            _ => "100 mm",
        }
    ));
    lines.push("intermediate: driven, driver (the pair keyed together on one stud), stud side first; none: a simple train".into());
    lines.push("idler: the gear between the stud and leadscrew gears of a simple train; any: no banjo chose one; none: no idler".into());
    lines.push("meshes: meshes on the machine and the way the leadscrew turns against the stud".into());
    if bases.sets {
        lines.push(
            "arrangements: the ways this setup's gears pair up into stages that cut the thread and fit the \
             machine, this one among them (the same gears, each other arrangement meshing them differently)"
                .into(),
        );
    }
    if lathe.banjo.is_some() {
        lines.push("on the banjo, where the setup sits (distances are mm from the leadscrew axis):".into());
        lines.push("  direct mesh: the stud gear meshes the leadscrew gear, no idler".into());
        lines.push("  idler stud R mm; centres A and B mm: the idler's stud, and the centre distances of its two meshes".into());
        lines.push(
            "  stud mesh inner: the stud's mesh in the plane nearest the machine, the leadscrew's outside it"
                .into(),
        );
        lines.push("  leadscrew mesh inner: the leadscrew's mesh in the plane nearest the machine".into());
        lines.push("  int. stud R mm: the intermediate stud of a compound train".into());
        lines.push(
            "  studs R1 (slot 1), R2 (slot 2) mm; planes 1-2-1: three or more stages, each stud in its slot, the \
             plane of each mesh from the stud (1 nearest the machine)"
                .into(),
        );
        lines.push(format!("  not checked: the banjo model places at most {MAX_PLACED_STAGES} stages"));
    } else {
        lines.push(format!("on the banjo: {NO_BANJO}, so no setup was placed"));
    }
    if lathe.equipment.dial.is_some() {
        lines.push(
            "dial: lines safe to close the half-nuts at, counted from the line of the first engagement: \
             safe when the spindle has made a whole number of turns since (so the tool meets its own groove); \
             none: keep the half-nuts closed and reverse the spindle to return"
                .into(),
        );
    }
    lines.push("Ratios follow ISO 1122-1 (input turns per output turn); gearbox ratios are input turns per leadscrew turn.".into());
    if lathe.equipment.tumbler_reverse != Some(false) {
        lines.push("Set the hand of the thread with the tumbler reverse.".into());
    }
    for l in lines {
        d.line(l);
    }
    for (i, sentence) in THREAD_CAUTION.split_inclusive(". ").enumerate() {
        let lead = if i == 0 { "CAUTION:" } else { "        " };
        d.note(format!("{lead} {}", sentence.trim_end()));
    }
}

/// Which senses of error and lengths of lead error a document shows, for its legend.
#[derive(Clone, Copy, Default)]
struct Bases {
    feed: bool,
    tpi: bool,
    pitch: bool,
    /// The listing is of gear sets (a thread search), with a column of arrangements.
    sets: bool,
    inch_lead: bool,
    metric_lead: bool,
}

impl Bases {
    fn add(&mut self, pitch: &Pitch) {
        if pitch.kind == PitchKind::Inch {
            self.tpi = true;
        } else {
            self.pitch = true;
        }
        if pitch.kind.is_inch() {
            self.inch_lead = true;
        } else {
            self.metric_lead = true;
        }
    }
}

/// Where a setup sits on the banjo, in the legend's words.
pub fn banjo_cell(s: &Setup) -> String {
    let f = &s.fit;
    if let Some(why) = &f.not_checked {
        return why.clone();
    }
    if let Some(chain) = &f.chain {
        let studs: Vec<String> = chain
            .from_leadscrew_mm()
            .iter()
            .zip(&chain.slots)
            // The studs were found by stepping angles: a tenth of a mm is what the search supports.
            .map(|(r, k)| format!("{:.1} (slot {})", r, k + 1))
            .collect();
        let planes: Vec<String> = chain.planes.iter().map(|p| p.to_string()).collect();
        return format!("studs {} mm; planes {}", studs.join(", "), planes.join("-"));
    }
    match (f.stud_mesh_inner, f.intermediate_from_leadscrew_mm) {
        (Some(true), Some(r)) => format!("stud mesh inner; int. stud {} mm", fmt_num(r)),
        (Some(false), Some(r)) => format!("leadscrew mesh inner; int. stud {} mm", fmt_num(r)),
        (None, Some(r)) => {
            let centres: Vec<String> = s
                .mounted_train()
                .stages
                .iter()
                .map(|x| fmt_num(standard_centre_distance_mm(x.module_mm, x.driver.teeth, x.driven.teeth)))
                .collect();
            format!("idler stud {} mm; centres {} mm", fmt_num(r), centres.join(" and "))
        }
        _ => "direct mesh".to_string(),
    }
}

/// The error cell: `exact`, or the error and which number it is the error of.
pub fn error_cell(s: &Setup, pitch: &Pitch) -> String {
    let (e, sense) = s.shown_error(pitch);
    if s.is_exact() {
        "exact".to_string()
    } else {
        format!("{} {}", describe_error(&e), sense.as_str())
    }
}

/// Cells shared by thread and chart rows: box, stud, idler, intermediates, leadscrew, pitch cut,
/// error, lead error, banjo, and the dial when the lathe has one.
fn setup_cells(s: &Setup, lathe: &Lathe, pitch: &Pitch) -> Vec<String> {
    let idler = match (s.fit.idler, s.train.stages.len(), &lathe.banjo) {
        (Some(z), _, _) => z.to_string(),
        (None, 1, None) => "any".to_string(),
        _ => "none".to_string(),
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
    let mounted = s.mounted_train();
    let mut cells = vec![
        s.position.as_ref().map_or("-".to_string(), |p| p.name.clone()),
        s.stud().to_string(),
        idler,
        if mids.is_empty() { "none".to_string() } else { mids.join("; ") },
        s.leadscrew().to_string(),
        format!("{}, {} way", mounted.meshes(), mounted.direction().as_str()),
        pitch.show(s.pitch_cut_mm.value.to_f64()),
        error_cell(s, pitch),
        lead,
        banjo_cell(s),
    ];
    if let Some(b) = &s.to_buy {
        cells.push(describe_to_buy(b));
    }
    if let Some(dial) = &lathe.equipment.dial {
        cells.push(match &s.engagement {
            _ if s.feed => "not needed: a feed cuts no groove".to_string(),
            Some(e) => e.describe(dial),
            None => "not worked out: the ratio is not exact".to_string(),
        });
    }
    cells
}

fn setup_head(lathe: &Lathe) -> Vec<String> {
    let mut head: Vec<String> = SETUP_HEAD.iter().map(|s| s.to_string()).collect();
    if lathe.buy.is_some() {
        head.push("to buy".into());
    }
    if lathe.equipment.dial.is_some() {
        head.push("dial".into());
    }
    head
}

const SETUP_HEAD: [&str; 10] = [
    "box",
    "stud",
    "idler",
    "intermediate",
    "leadscrew",
    "meshes",
    "pitch cut",
    "error",
    "lead error",
    "on the banjo",
];

/// A thread search as a document.
pub fn thread(r: &ThreadReport) -> Document {
    let mut d = Document::new();
    let t = &r.plan.thread;
    let lead = t.lead_mm();
    let exact = if lead.exact { format!(" = {} mm exactly", lead.value) } else { String::new() };
    if t.feed {
        d.title(format!("Feed {} per spindle turn ({} mm{exact})", t.pitch, fmt_num(lead.value.to_f64())));
    } else {
        d.title(format!(
            "Thread {}, {} start{} (lead {} mm{exact})",
            t.pitch,
            t.starts,
            if t.starts == 1 { "" } else { "s" },
            fmt_num(lead.value.to_f64())
        ));
    }
    header(&mut d, r.lathe, t.feed);
    d.blank();
    let p = r.plan;
    let status = if p.complete { "" } else { "INCOMPLETE (interrupted): at least " };
    let (verb, verbs) = if t.feed { ("gives", "give") } else { ("cuts", "cut") };
    let order = if r.lathe.buy.is_some() { "gears to buy, then " } else { "" };
    match (p.count, p.gear_set_count) {
        (0, _) => {
            d.line(format!("{status}No setup {verb} {} within the tolerance from these gears.", t.pitch))
        }
        (1, _) => d.line(format!("{status}1 setup {verb} it:")),
        (n, Some(sets)) => d.line(format!(
            "{status}{} setups {verbs} it, made of {} gear set{}; {} listed by {order}pitch error, then \
             meshes, then size, each by its best arrangement on the machine:",
            group_thousands(n),
            group_thousands(sets),
            if sets == 1 { "" } else { "s" },
            if p.setups.len() as u64 == sets {
                "all".to_string()
            } else {
                format!("the best {}", p.setups.len())
            },
        )),
        (n, None) => d.line(format!(
            "{status}{} setups {verbs} it; {} by {}pitch error, then meshes, then size:",
            group_thousands(n),
            if p.setups.len() as u64 == n {
                "all listed".to_string()
            } else {
                format!("the best {} listed", p.setups.len())
            },
            order
        )),
    }
    if !p.setups.is_empty() {
        d.blank();
        let mut head = vec!["#".to_string()];
        head.extend(setup_head(r.lathe));
        if t.feed {
            head[7] = "feed cut".to_string();
        }
        head.push("arrangements".to_string());
        let rows: Vec<Vec<String>> = p
            .setups
            .iter()
            .enumerate()
            .flat_map(|(i, s)| {
                // The other arrangements, when asked for, under their set as `1.2`, `1.3`, …
                std::iter::once(s).chain(&s.others).enumerate().map(move |(k, a)| {
                    let mut row =
                        vec![if k == 0 { (i + 1).to_string() } else { format!("{}.{}", i + 1, k + 1) }];
                    row.extend(setup_cells(a, r.lathe, &t.pitch));
                    row.push(if k == 0 { s.arrangements.to_string() } else { String::new() });
                    row
                })
            })
            .collect();
        let right = [0, 2, 3, 5, head.len() - 1];
        d.table(Table::new(&head, &right).with_rows(rows));
        let mounted: Vec<TrainJson> =
            p.setups.iter().map(|s| TrainJson::from_train(&s.mounted_train())).collect();
        on_hand(&mounted, &mut d);
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
                let buy = match &x.to_buy {
                    Some(b) if !b.is_empty() => format!(", to buy {}", describe_to_buy(b)),
                    _ => String::new(),
                };
                d.item(
                    1,
                    false,
                    format!(
                        "{}{pos}, pitch error {}{buy}:",
                        stages.join(" "),
                        describe_error(&x.pitch_error)
                    ),
                );
                for why in &x.reasons {
                    d.item(2, true, why.clone());
                }
            }
        }
    }
    let mut bases = Bases::default();
    if t.feed {
        bases.feed = true;
        bases.metric_lead = !t.pitch.kind.is_inch();
        bases.inch_lead = t.pitch.kind.is_inch();
    } else {
        bases.add(&t.pitch);
    }
    bases.sets = !p.setups.is_empty();
    footer(&mut d, r.lathe, bases);
    d
}

/// A chart as a document.
pub fn chart(r: &ChartReport) -> Document {
    let mut d = Document::new();
    let c = r.chart;
    d.title(format!("Thread chart: {} ({} threads)", r.series, c.rows.len()));
    header(&mut d, r.lathe, false);
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
    let width = setup_head(r.lathe).len();
    head.extend(setup_head(r.lathe));
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
                    cells.extend(std::iter::repeat_n("-".to_string(), width));
                    cells.push("OUT OF REACH: nothing near can be set up".to_string());
                }
            }
            cells
        })
        .collect();
    d.table(Table::new(&head, &[3, 4, 6]).with_rows(rows));
    let notes = c.rows.iter().filter_map(|row| {
        let s = row.best.as_ref().or(row.nearest.as_ref())?;
        Some((row.label.clone(), on_hand_summary(&TrainJson::from_train(&s.mounted_train()))))
    });
    on_hand_notes(notes, &mut d);
    let mut bases = Bases::default();
    for row in &c.rows {
        bases.add(&row.thread.pitch);
    }
    footer(&mut d, r.lathe, bases);
    d
}
