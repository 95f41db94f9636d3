//! The JSON format for setups and charts. Each setup is a train object of `search`
//! ([`crate::report::fields::TrainJson`]: `ratio`, `stages`, `driver`, `driven`, …, with `error`
//! here the relative pitch error) plus the thread's own fields:
//!
//! ```text
//! {"gearbox_position": "A"|null, "positions": [{"position": "stud", "teeth": 90}, …],
//!  "pitch_cut": f64 (in pitch_unit), "pitch_unit": "mm"|"tpi"|"in",
//!  "lead_cut_mm": f64, "lead_cut_mm_exact": "p/q"|null, "exact_pitch": bool,
//!  "lead_error": f64, "lead_error_unit": "mm per 100 mm"|"in per in",
//!  "intermediate_stud_from_leadscrew_mm": f64|null,
//!  "idler_stud_from_leadscrew_mm": f64|null, "stud_mesh_inner": bool|null,
//!  "error_shown": f64, "error_of": "TPI"|"pitch"|"feed", "on_the_banjo": "…",
//!  "banjo_checked": bool,
//!  "chain": {"studs_from_leadscrew_mm": [f64…], "slots": [1…], "planes": [1…]}|null,
//!  "engagement": {"engage_every_leadscrew_turns": u64, "dial_every_nth_line": u32|null,
//!                 "dial": "any line"|…|null}|null}
//! ```
//! A thread document is `{"schema_version", "thread", "machine", "banjo", "tolerance", "count", "complete",
//! "convention", "caution", "buy"?, "trains": [setup…], "rejected"?}`, with `buy` (the gears that
//! may be bought) and each setup's `to_buy` only when gears may be bought; a chart document is `{"schema_version", "series",
//! "machine", "banjo", "tolerance", "complete", "caution", "rows": [{"thread", "pitch",
//! "reachable", "count", "setup", "nearest"}]}`. Stages run from the stud to the leadscrew.

use std::io::Write;

use serde::Serialize;

use super::document::banjo_cell;
use super::{ChartReport, ThreadReport};
use crate::report::fields::TrainJson;
use crate::report::words::CONVENTION;
use crate::report::words::THREAD_CAUTION;
use crate::report::{write_json, RenderError, SCHEMA_VERSION};
use crate::trades::thread::dial::Dial;
use crate::trades::thread::pitch::Pitch;
use crate::trades::thread::{Lathe, Setup};

/// One setup as JSON.
#[derive(Serialize, Debug, Clone, PartialEq)]
pub struct SetupJson {
    /// The train as `search` prints it; `error` is the relative pitch error.
    #[serde(flatten)]
    pub train: TrainJson,
    /// Gearbox position used.
    pub gearbox_position: Option<String>,
    /// Gears by position, stud to leadscrew.
    pub positions: Vec<PositionJson>,
    /// Pitch cut in `pitch_unit`.
    pub pitch_cut: f64,
    /// `mm`, `tpi` or `in`.
    pub pitch_unit: &'static str,
    /// Lead cut per spindle turn, mm.
    pub lead_cut_mm: f64,
    /// The same, exactly, when it is exact.
    pub lead_cut_mm_exact: Option<String>,
    /// Pitch cut equals pitch wanted exactly.
    pub exact_pitch: bool,
    /// Signed relative error of the pitch cut, `pitch cut / pitch wanted − 1`.
    pub pitch_error: f64,
    /// Lead error over the stated length.
    pub lead_error: f64,
    /// `mm per 100 mm` or `in per in`.
    pub lead_error_unit: &'static str,
    /// Where the intermediate stud of a compound setup sits, mm from the leadscrew axis, when a
    /// banjo was checked.
    pub intermediate_stud_from_leadscrew_mm: Option<f64>,
    /// Where the idler stud of a simple setup sits, mm from the leadscrew axis, when a banjo was
    /// checked.
    pub idler_stud_from_leadscrew_mm: Option<f64>,
    /// For two stages on a banjo: true when the stud mesh is the inner plane.
    pub stud_mesh_inner: Option<bool>,
    /// The error in the sense of the number the thread was given by (see `error_of`).
    pub error_shown: f64,
    /// `TPI` (TPI cut / TPI wanted − 1) or `pitch` (pitch cut / pitch wanted − 1).
    pub error_of: &'static str,
    /// Where the setup sits on the banjo in words, or why it was not checked.
    pub on_the_banjo: String,
    /// Whether the setup was placed on a banjo.
    pub banjo_checked: bool,
    /// For three stages or more on a banjo: each intermediate stud's distance from the
    /// leadscrew axis (mm), its slot (1 first) and the plane of each mesh (1 nearest the machine).
    pub chain: Option<ChainJson>,
    /// Where the half-nuts may be closed again.
    pub engagement: Option<EngagementJson>,
}

/// A setup of three stages or more on the banjo.
#[derive(Serialize, Debug, Clone, PartialEq)]
pub struct ChainJson {
    /// Each intermediate stud's distance from the leadscrew axis, mm, stud side first.
    pub studs_from_leadscrew_mm: Vec<f64>,
    /// The slot each sits in, 1 first.
    pub slots: Vec<usize>,
    /// The plane of each mesh from the stud, 1 nearest the machine.
    pub planes: Vec<u32>,
}

/// Where the half-nuts may be closed again for a setup.
#[derive(Serialize, Debug, Clone, PartialEq)]
pub struct EngagementJson {
    /// Leadscrew turns from one safe engagement to the next.
    pub engage_every_leadscrew_turns: u64,
    /// On the lathe's dial: every how many lines, from the line of the first engagement; null
    /// when no line is safe or no dial is described.
    pub dial_every_nth_line: Option<u32>,
    /// The same in words, when a dial is described.
    pub dial: Option<String>,
}

/// A gear in a named position.
#[derive(Serialize, Debug, Clone, PartialEq)]
pub struct PositionJson {
    /// `stud`, `idler`, `intermediate driven`, `intermediate driver`, `leadscrew`.
    pub position: String,
    /// Teeth.
    pub teeth: u32,
}

impl SetupJson {
    /// The JSON view of a setup for a thread of `pitch`.
    pub fn from_setup(s: &Setup, pitch: &Pitch, dial: Option<&Dial>) -> SetupJson {
        let (shown, sense) = s.shown_error(pitch);
        // Every mesh the machine has: an idler is two stages, stud → idler → leadscrew.
        let mut train = TrainJson::from_train(&s.mounted_train());
        train.error = s.pitch_error.to_f64();
        train.to_buy = s.to_buy.clone();
        train.arrangements = Some(s.arrangements);
        // The other arrangements as the machine would have them, each with its pitch error.
        train.other_arrangements = s
            .others
            .iter()
            .map(|o| TrainJson { error: o.pitch_error.to_f64(), ..TrainJson::from_train(&o.mounted_train()) })
            .collect();
        SetupJson {
            train,
            gearbox_position: s.position.as_ref().map(|p| p.name.clone()),
            positions: s
                .positions()
                .into_iter()
                .map(|(position, teeth)| PositionJson { position, teeth })
                .collect(),
            pitch_cut: pitch.in_own_unit(s.pitch_cut_mm.value.to_f64()),
            pitch_unit: pitch.own_unit(),
            lead_cut_mm: s.lead_cut_mm.value.to_f64(),
            lead_cut_mm_exact: s.lead_cut_mm.exact.then(|| s.lead_cut_mm.value.to_string()),
            exact_pitch: s.is_exact(),
            pitch_error: s.pitch_error.to_f64(),
            lead_error: s.lead_error(pitch),
            lead_error_unit: pitch.lead_error_basis().1,
            intermediate_stud_from_leadscrew_mm: s
                .fit
                .intermediate_from_leadscrew_mm
                .filter(|_| s.fit.idler.is_none()),
            idler_stud_from_leadscrew_mm: s
                .fit
                .intermediate_from_leadscrew_mm
                .filter(|_| s.fit.idler.is_some()),
            stud_mesh_inner: s.fit.stud_mesh_inner,
            error_shown: shown.to_f64(),
            error_of: sense.as_str(),
            on_the_banjo: banjo_cell(s),
            banjo_checked: s.fit.not_checked.is_none(),
            chain: s.fit.chain.as_ref().map(|c| ChainJson {
                studs_from_leadscrew_mm: c
                    .from_leadscrew_mm()
                    .iter()
                    .map(|r| (r * 10.0).round() / 10.0)
                    .collect(),
                slots: c.slots.iter().map(|k| k + 1).collect(),
                planes: c.planes.clone(),
            }),
            engagement: s.engagement.map(|e| EngagementJson {
                engage_every_leadscrew_turns: e.leadscrew_turns,
                dial_every_nth_line: e.every_nth_line,
                dial: dial.map(|d| e.describe(d)),
            }),
        }
    }
}

#[derive(Serialize)]
pub(super) struct MachineJson {
    name: Option<String>,
    leadscrew: String,
    leadscrew_mm: f64,
    stud_ratio: String,
    gearbox: Vec<GearboxJson>,
    gears: String,
    stage_counts: Vec<usize>,
    largest_teeth: Option<u32>,
    left_out_by_the_guard: Vec<u32>,
    tumbler_reverse: Option<bool>,
    dial: Option<DialJson>,
}

#[derive(Serialize)]
struct DialJson {
    dial_teeth: u32,
    dial_marks: u32,
}

#[derive(Serialize)]
struct GearboxJson {
    name: String,
    ratio: String,
}

#[derive(Serialize)]
pub(super) struct BanjoJson {
    stud_to_leadscrew_mm: f64,
    intermediate_stud_from_leadscrew_mm: [f64; 2],
    slots_mm: Vec<[f64; 2]>,
    shaft_diameter_mm: f64,
}

pub(super) fn machine(l: &Lathe) -> MachineJson {
    let e = &l.equipment;
    MachineJson {
        name: e.name.clone(),
        leadscrew: l.machine.leadscrew.text.clone(),
        leadscrew_mm: l.machine.leadscrew.mm.value.to_f64(),
        stud_ratio: l.machine.stud_ratio.to_string(),
        gearbox: l
            .machine
            .gearbox
            .iter()
            .map(|p| GearboxJson { name: p.name.clone(), ratio: p.ratio.to_string() })
            .collect(),
        gears: l.pool.describe(),
        stage_counts: (l.stages.lo as usize..=l.stages.hi as usize).collect(),
        largest_teeth: e.largest_teeth,
        left_out_by_the_guard: e.left_out.clone(),
        tumbler_reverse: e.tumbler_reverse,
        dial: e.dial.map(|d| DialJson { dial_teeth: d.teeth, dial_marks: d.marks }),
    }
}

pub(super) fn banjo(l: &Lathe) -> Option<BanjoJson> {
    l.banjo.as_ref().map(|b| BanjoJson {
        stud_to_leadscrew_mm: b.stud_to_leadscrew_mm,
        intermediate_stud_from_leadscrew_mm: [b.slots[0].lo, b.slots[0].hi],
        slots_mm: b.slots.iter().map(|s| [s.lo, s.hi]).collect(),
        shaft_diameter_mm: b.shaft_diameter_mm,
    })
}

#[derive(Serialize)]
struct ThreadJson {
    pitch: String,
    feed: bool,
    starts: u32,
    lead_mm: f64,
    lead_mm_exact: Option<String>,
}

#[derive(Serialize)]
struct RejectedJson {
    train: TrainJson,
    gearbox_position: Option<String>,
    reasons: Vec<String>,
}

#[derive(Serialize)]
struct ThreadDoc {
    schema_version: u32,
    thread: ThreadJson,
    machine: MachineJson,
    banjo: Option<BanjoJson>,
    tolerance: f64,
    count: u64,
    gear_set_count: Option<u64>,
    complete: bool,
    convention: &'static str,
    caution: &'static str,
    #[serde(skip_serializing_if = "Option::is_none")]
    buy: Option<String>,
    trains: Vec<SetupJson>,
    #[serde(skip_serializing_if = "Option::is_none")]
    rejected: Option<Vec<RejectedJson>>,
}

/// Write a thread search as one JSON document and a newline.
pub fn write_thread(r: &ThreadReport, w: &mut dyn Write) -> Result<(), RenderError> {
    let t = &r.plan.thread;
    let lead = t.lead_mm();
    let doc = ThreadDoc {
        schema_version: SCHEMA_VERSION,
        thread: ThreadJson {
            pitch: t.pitch.text.clone(),
            feed: t.feed,
            starts: t.starts,
            lead_mm: lead.value.to_f64(),
            lead_mm_exact: lead.exact.then(|| lead.value.to_string()),
        },
        machine: machine(r.lathe),
        banjo: banjo(r.lathe),
        tolerance: r.lathe.tolerance.to_f64(),
        count: r.plan.count,
        gear_set_count: r.plan.gear_set_count,
        complete: r.plan.complete,
        convention: CONVENTION,
        caution: THREAD_CAUTION,
        buy: r.lathe.buy.as_ref().map(|b| b.describe()),
        trains: r
            .plan
            .setups
            .iter()
            .map(|s| SetupJson::from_setup(s, &t.pitch, r.lathe.equipment.dial.as_ref()))
            .collect(),
        rejected: r.rejected.map(|rej| {
            rej.iter()
                .map(|x| {
                    let mut train = TrainJson::from_train(&x.train);
                    train.error = x.pitch_error.to_f64();
                    train.to_buy = x.to_buy.clone();
                    RejectedJson {
                        train,
                        gearbox_position: x.position.as_ref().map(|p| p.name.clone()),
                        reasons: x.reasons.clone(),
                    }
                })
                .collect()
        }),
    };
    write_json(&doc, w)
}

#[derive(Serialize)]
struct RowJson {
    thread: String,
    pitch: String,
    reachable: bool,
    count: u64,
    setup: Option<SetupJson>,
    nearest: Option<SetupJson>,
}

#[derive(Serialize)]
struct ChartDoc {
    schema_version: u32,
    series: String,
    machine: MachineJson,
    banjo: Option<BanjoJson>,
    tolerance: f64,
    complete: bool,
    convention: &'static str,
    caution: &'static str,
    rows: Vec<RowJson>,
}

/// Write a chart as one JSON document and a newline.
pub fn write_chart(r: &ChartReport, w: &mut dyn Write) -> Result<(), RenderError> {
    let doc =
        ChartDoc {
            schema_version: SCHEMA_VERSION,
            series: r.series.to_string(),
            machine: machine(r.lathe),
            banjo: banjo(r.lathe),
            tolerance: r.lathe.tolerance.to_f64(),
            complete: r.chart.complete,
            convention: CONVENTION,
            caution: THREAD_CAUTION,
            rows: r
                .chart
                .rows
                .iter()
                .map(|row| RowJson {
                    thread: row.label.clone(),
                    pitch: row.thread.pitch.text.clone(),
                    reachable: row.best.is_some(),
                    count: row.count,
                    setup: row.best.as_ref().map(|s| {
                        SetupJson::from_setup(s, &row.thread.pitch, r.lathe.equipment.dial.as_ref())
                    }),
                    nearest: row.nearest.as_ref().map(|s| {
                        SetupJson::from_setup(s, &row.thread.pitch, r.lathe.equipment.dial.as_ref())
                    }),
                })
                .collect(),
        };
    write_json(&doc, w)
}
