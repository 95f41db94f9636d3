//! Clock trains laid out for people: a header saying what was asked in the clockmaker's terms,
//! the trains in columns, and a footer with the conventions. It computes nothing about gears.

use crate::geometry::CycloidalMesh;
use crate::model::pool::fmt_num;
use crate::model::problem::ToothForm;
use crate::model::train::Train;
use crate::report::words::{
    count_line, describe_error, describe_error_f64, describe_tolerance, group_thousands, set_count_line,
    CONVENTION, NOT_COUNTED,
};
use crate::report::{Document, Table};
use crate::trades::clock::astro::AstroPlan;
use crate::trades::clock::beat::BeatSource;
use crate::trades::clock::going::GoingPlan;
use crate::trades::clock::motion::{stage_names, MotionPlan};
use crate::trades::clock::part::PartPlan;
use crate::trades::clock::strike::StrikePlan;

/// Arbor names of a going train of `stages` stages from the centre arbor: centre, third,
/// fourth…, escape; `driving` replaces `centre` when the train starts from another arbor.
pub fn arbor_names(stages: usize, driving: &str) -> Vec<String> {
    const ORDINALS: [&str; 6] = ["third", "fourth", "fifth", "sixth", "seventh", "eighth"];
    let mut v = vec![driving.to_string()];
    v.extend(ORDINALS.iter().take(stages.saturating_sub(1)).map(|s| s.to_string()));
    v.push("escape".into());
    v
}

/// How each listed gear set is shown, in the count line of every clock listing.
pub const EACH_SET: &str = "its first arrangement in stage order";

/// What a listed gear set is, under every clock listing.
pub const SETS_NOTE: [&str; 2] = [
    "A gear set is its wheels and pinions; its arrangements are the ways of pairing them into stages that pass every check.",
    "Each set is listed by its first arrangement in stage order (stages in order of ratio); the others follow as 1.2, 1.3… when asked for.",
];

/// The count line of a clock listing: trains and the gear sets they are made of, when counted.
pub fn listing_line(count: u64, sets: Option<u64>, listed: usize, complete: bool, order: &str) -> String {
    // A clock search lists gear sets; one that counted trains in bulk may not have counted them.
    match count {
        0 => count_line(count, listed, complete, "train", order),
        _ => set_count_line(count, sets, listed, complete, order, EACH_SET),
    }
}

/// The count line of a listing of gear sets whose counts are lower bounds (a search that
/// counted only the trains it met on the way to the listed best): at least so many trains and
/// gear sets, and within which |error| (`within`, the last listed train's) every train was
/// counted, in the words of the search's table.
pub fn lower_bound_line(
    count: u64,
    sets: Option<u64>,
    listed: usize,
    complete: bool,
    within: Option<f64>,
    order: &str,
) -> String {
    let status = if complete { "At least " } else { "INCOMPLETE (interrupted): at least " };
    let plural =
        |n: u64, what: &str| format!("{} {what}{}", group_thousands(n), if n == 1 { "" } else { "s" });
    let mut made_of = match sets {
        Some(n) => format!(", made of at least {}", plural(n, "gear set")),
        None => NOT_COUNTED.to_string(),
    };
    if let Some(w) = within {
        let reach = match w {
            0.0 => "every train that hits the target exactly".to_string(),
            w => format!("every train within {} of the target", describe_error_f64(w).replacen('+', "±", 1)),
        };
        made_of.push_str(&format!(
            " ({reach}, as close as the last listed, counted; farther ones not all: --count lower-bound)"
        ));
    }
    match count {
        0 => format!("{status}no train meets every constraint."),
        n => format!(
            "{status}{}{made_of}; the best {} listed {order}, each by {EACH_SET}:",
            plural(n, "train"),
            plural(listed as u64, "gear set")
        ),
    }
}

/// The rows of a listing of gear sets: each set's first arrangement numbered `n`, its others
/// `n.2`, `n.3`…, each made by `cells` from the set's index and one arrangement.
pub fn set_rows<T>(
    sets: usize,
    first: impl Fn(usize) -> T,
    others: impl Fn(usize) -> Vec<T>,
    cells: impl Fn(usize, T) -> Vec<String>,
) -> Vec<Vec<String>> {
    let mut rows = Vec::new();
    for k in 0..sets {
        let mut row = vec![(k + 1).to_string()];
        row.extend(cells(k, first(k)));
        rows.push(row);
        for (j, other) in others(k).into_iter().enumerate() {
            let mut row = vec![format!("{}.{}", k + 1, j + 2)];
            row.extend(cells(k, other));
            rows.push(row);
        }
    }
    rows
}

/// A run time for people: `8 d`, `30 h`, `32 d 12 h`.
pub fn describe_hours(hours: f64) -> String {
    let days = (hours / 24.0).floor();
    let rest = hours - 24.0 * days;
    match (days > 0.0, rest > 1e-9) {
        (true, false) => format!("{} d", fmt_num(days)),
        (true, true) => format!("{} d {} h", fmt_num(days), fmt_num(rest)),
        _ => format!("{} h", fmt_num(hours)),
    }
}

/// The whole train from its driving arbor, a first part (named `names`) then the centre-to-escape
/// train: `great wheel 96 → centre pinion 8; centre wheel 64 → third pinion 8; …`.
pub fn whole_train(names: &[String], first: &Train, then: &Train) -> String {
    let centre_on = arbor_names(then.stages.len(), "centre");
    let mut all: Vec<String> = names.to_vec();
    all.extend(centre_on.into_iter().skip(1));
    first
        .stages
        .iter()
        .chain(&then.stages)
        .enumerate()
        .map(|(k, s)| {
            format!("{} wheel {} → {} pinion {}", all[k], s.driver.teeth, all[k + 1], s.driven.teeth)
        })
        .collect::<Vec<_>>()
        .join("; ")
        .replace("great wheel wheel", "great wheel")
}

/// A part of a train (its own search between two arbors of fixed speeds) as a table: the
/// count, then each train with its arbors' speeds and, when checked, its meshes.
/// `from_turns_per_hour` gives the first arbor's speed for a going train; without it (a striking
/// train, which runs only while it strikes) each arbor's turns per turn of the first are shown.
pub fn part_table(d: &mut Document, g: &PartPlan, from_turns_per_hour: Option<f64>) {
    d.line(listing_line(
        g.count,
        g.gear_set_count,
        g.trains.len(),
        g.complete,
        "by error, then meshes, then size",
    ));
    if g.trains.is_empty() {
        return;
    }
    let rows = set_rows(
        g.trains.len(),
        |k| (&g.trains[k], g.pairs(k)),
        |k| g.others_of(k).iter().map(|a| (&a.train, &a.cycloidal[..])).collect(),
        |k, (t, pairs)| {
            let stages: Vec<String> =
                t.stages.iter().map(|st| format!("{} → {}", st.driver.teeth, st.driven.teeth)).collect();
            let speeds = crate::trades::clock::arbor_speeds(t, from_turns_per_hour.unwrap_or(1.0));
            let arbors: Vec<String> = g
                .part
                .arbor_names(t.stages.len())
                .iter()
                .zip(&speeds)
                .map(|(a, v)| match from_turns_per_hour {
                    Some(_) => format!("{a} {}", speed(*v)),
                    None => format!("{a} {}", fmt_num(*v)),
                })
                .collect();
            let mut row = vec![
                stages.join(", "),
                t.ratio.to_string(),
                g.arrangements_of(k).to_string(),
                arbors.join("; "),
            ];
            if !pairs.is_empty() {
                row.push(pairs.iter().map(describe_cycloidal).collect::<Vec<_>>().join("; "));
            }
            row
        },
    );
    let arbors = if from_turns_per_hour.is_some() {
        "arbors (turns per hour, time per turn)"
    } else {
        "arbors (turns per turn of the first)"
    };
    let gears = if g.part.drivers.lo < g.part.driven.lo { "pinion → wheel" } else { "wheel → pinion" };
    let mut head = vec!["#", gears, "ratio i", "arrangements", arbors];
    if !g.cycloidal.is_empty() {
        head.push("meshes (module, centre distance, contact ratio, action before the line of centres)");
    }
    d.table(Table::new(&head, &[0, 3]).with_rows(rows));
}

/// Turns per hour, and the time per turn, for people: `60/h (1 min)`.
pub fn speed(turns_per_hour: f64) -> String {
    let minutes = 60.0 / turns_per_hour;
    let per = if minutes < 1.0 {
        format!("{} s", fmt_num(minutes * 60.0))
    } else if minutes < 120.0 {
        format!("{} min", fmt_num(minutes))
    } else {
        format!("{} h", fmt_num(minutes / 60.0))
    };
    format!("{}/h ({per})", fmt_num(turns_per_hour))
}

/// The beat in words.
pub fn describe_beat(p: &GoingPlan) -> String {
    let b = &p.spec.beat;
    match b.source {
        BeatSource::Length { metres } => format!(
            "pendulum {} m at g = {} m/s² → period {} s, {} beats/h, {} beats/min",
            fmt_num(metres),
            b.gravity,
            fmt_num(b.period_s()),
            fmt_num(b.beats_per_hour),
            fmt_num(b.beats_per_hour / 60.0)
        ),
        BeatSource::Period(s) => format!(
            "period {s} s → {} beats/h, {} beats/min (simple pendulum {} m at g = {} m/s²)",
            fmt_num(b.beats_per_hour),
            fmt_num(b.beats_per_hour / 60.0),
            fmt_num(b.length_m()),
            b.gravity
        ),
        BeatSource::BeatsPerHour(r) => format!(
            "{r} beats/h → period {} s, {} beats/min (simple pendulum {} m at g = {} m/s²)",
            fmt_num(b.period_s()),
            fmt_num(b.beats_per_hour / 60.0),
            fmt_num(b.length_m()),
            b.gravity
        ),
    }
}

/// A rate error for people: `exact` or `+1.234 s/day`.
pub fn describe_rate(s_per_day: f64, exact: bool) -> String {
    if exact {
        "exact".into()
    } else {
        format!("{s_per_day:+.3} s/day")
    }
}

/// What is wrong with the listed trains' gears on hand, as they are made (see
/// [`crate::report::fields::on_hand`]).
fn on_hand<'a>(d: &mut Document, trains: impl Iterator<Item = &'a Train>) {
    let listed: Vec<crate::report::fields::TrainJson> =
        trains.map(crate::report::fields::TrainJson::from_train).collect();
    crate::report::fields::on_hand(&listed, d);
}

fn footer(d: &mut Document, extra: &[&str]) {
    d.blank();
    for line in extra {
        d.note(*line);
    }
    for line in SETS_NOTE {
        d.note(line);
    }
    d.note(format!("Ratios: {CONVENTION}."));
}

/// A going-train search as a document.
pub fn going(p: &GoingPlan) -> Document {
    let mut d = Document::new();
    let s = &p.spec;
    let e = &s.escapement;
    let (ratio, exact) = s.needed_ratio();
    d.title("Going train");
    d.line(format!("Beat: {}", describe_beat(p)));
    d.line(format!(
        "Escape wheel: {} teeth, {} beats per tooth → escape arbor {}",
        e.teeth,
        e.beats_per_tooth,
        speed(p.escape_turns_per_hour)
    ));
    if let Some(run) = &p.run {
        let hours = run.run_hours.to_f64();
        let drop = match (run.drop_m, s.line_barrel) {
            (Some(m), Some(b)) => format!(
                "; the weight on a {} mm line barrel with {} fall{} drops {} m",
                fmt_num(b.diameter_mm),
                b.falls,
                if b.falls == 1 { "" } else { "s" },
                fmt_num(m)
            ),
            _ => String::new(),
        };
        d.line(format!(
            "Run: {} at a winding ({} h): the barrel (great wheel) turns {} times{drop}",
            describe_hours(hours),
            fmt_num(hours),
            fmt_num(run.barrel_turns.to_f64())
        ));
    }
    if let Some(g) = &p.great {
        d.line(format!(
            "From the great wheel turning {} to the centre arbor turning 1/h (60 min, the minute hand): i = {} \
             exactly",
            speed(s.from_turns_per_hour.to_f64()),
            g.part.ratio
        ));
    }
    d.line(format!(
        "From the centre arbor turning 1/h (60 min, the minute hand) to the escape arbor, wheels driving \
         pinions: i = {} (a speed-up, i < 1)",
        if exact {
            format!("{ratio} exactly")
        } else {
            format!("{:.9} (from the pendulum length)", ratio.to_f64())
        }
    ));
    d.line(format!(
        "Gears: {}; wheels {}, pinions {} leaves; stages {}; rate tolerance {} s/day",
        s.pool.describe(),
        s.wheels,
        s.pinions,
        s.stages,
        s.rate_tolerance_s_per_day
    ));
    if let Some(m) = s.meshes {
        d.line(format!(
            "Meshes checked: {} teeth, each pair at its standard centre distance; least contact ratio {}",
            m.tooth_form.as_str(),
            fmt_num(m.min_contact_ratio)
        ));
    }
    if let (Some(g), Some(first)) = (&p.great, p.trains.first()) {
        if let Some(great) = g.trains.first() {
            d.blank();
            d.line(format!(
                "Whole train 1: {}",
                whole_train(&g.part.arbor_names(great.stages.len()), great, &first.train)
            ));
        }
    }
    if let Some(g) = &p.great {
        d.blank();
        d.heading("Great wheel to centre arbor:");
        part_table(&mut d, g, Some(s.from_turns_per_hour.to_f64()));
        d.blank();
        d.heading("Centre arbor to escape arbor:");
    } else {
        d.blank();
    }
    d.line(listing_line(
        p.count,
        p.gear_set_count,
        p.trains.len(),
        p.complete,
        "by rate error, then meshes, then size",
    ));
    if !p.trains.is_empty() {
        let rows = set_rows(
            p.trains.len(),
            |k| &p.trains[k],
            |k| p.trains[k].others.iter().collect(),
            |_, g| {
                let names = arbor_names(g.train.stages.len(), "centre");
                let stages: Vec<String> = g
                    .train
                    .stages
                    .iter()
                    .map(|st| format!("{} → {}", st.driver.teeth, st.driven.teeth))
                    .collect();
                let arbors: Vec<String> = names
                    .iter()
                    .zip(&g.arbor_turns_per_hour)
                    .enumerate()
                    .map(|(k, (a, v))| match g.seconds_arbor {
                        Some(at) if at == k => format!("{a} {}", speed(*v).replace(')', ", seconds hand)")),
                        _ => format!("{a} {}", speed(*v)),
                    })
                    .collect();
                let mut row = vec![
                    stages.join(", "),
                    g.train.ratio.to_string(),
                    describe_rate(g.rate_s_per_day, g.train.error.is_exact() && exact),
                    g.arrangements.to_string(),
                    arbors.join("; "),
                ];
                if !g.cycloidal.is_empty() {
                    row.push(g.cycloidal.iter().map(describe_cycloidal).collect::<Vec<_>>().join("; "));
                }
                row
            },
        );
        let mut head = vec![
            "#",
            "wheel → pinion",
            "ratio i",
            "rate",
            "arrangements",
            "arbors (turns per hour, time per turn)",
        ];
        if p.trains.iter().any(|g| !g.cycloidal.is_empty()) {
            head.push("meshes (module, centre distance, contact ratio, action before the line of centres)");
        }
        d.table(Table::new(&head, &[0, 4]).with_rows(rows));
    }
    on_hand(&mut d, p.trains.iter().map(|g| &g.train));
    footer(
        &mut d,
        &[
            "Each stage is a wheel driving a pinion; stages run from the driving arbor to the escape arbor.",
            "A beat is one swing (half a period); rate error > 0 means the clock gains.",
        ],
    );
    d
}

/// A cycloidal pair for people: `m 0.5, a 12 mm, ε 1.49, 19% before the line`.
pub fn describe_cycloidal(c: &CycloidalMesh) -> String {
    format!(
        "m {}, a {} mm, ε {:.2}, {:.0}% before the line",
        fmt_num(c.module_mm),
        fmt_num(c.centre_distance_mm),
        c.contact_ratio,
        100.0 * c.before_line_fraction
    )
}

fn mesh_cells(t: &Train, hour_work: bool, pairs: &[CycloidalMesh]) -> Vec<String> {
    let mut gears = Vec::new();
    let mut geometry = Vec::new();
    for (k, s) in t.stages.iter().enumerate() {
        let (a, b) = stage_names(k, hour_work);
        gears.push(format!("{a} {} → {b} {}", s.driver.teeth, s.driven.teeth));
        geometry.push(match (&s.mesh, pairs.get(k)) {
            (_, Some(c)) => describe_cycloidal(c),
            (Some(m), None) => format!(
                "a {} mm, x {:+.3}/{:+.3}{}, ε {:.2}",
                fmt_num(m.centre_distance_mm),
                m.shift[0],
                m.shift[1],
                if m.undercut[0] || m.undercut[1] { ", undercut" } else { "" },
                m.contact_ratio
            ),
            (None, None) => format!("a {} mm", fmt_num(s.centre_distance_mm())),
        });
    }
    vec![gears.join("; "), geometry.join("; ")]
}

/// A motion-work search as a document.
pub fn motion(p: &MotionPlan) -> Document {
    let mut d = Document::new();
    let s = &p.spec;
    // A named dial (`hour`, `24h`, `week`) is the hand the train drives.
    if matches!(s.ratio_text.as_str(), "hour" | "12h" | "24h" | "week") {
        d.title(format!("Motion work for the {} hand: {} input turns per hand turn", s.ratio_text, s.ratio));
    } else {
        d.title(format!("Motion work: {} input turns per hand turn", s.ratio));
    }
    d.line(format!(
        "Gears: {}; pinions {} leaves, wheels {}; stages {}; tolerance {}",
        s.pool.describe(),
        s.pinions,
        s.wheels,
        s.stages,
        describe_tolerance(s.tolerance.to_f64())
    ));
    let cycloidal = s.tooth_form == ToothForm::Cycloidal;
    let coaxial = match (s.coaxial, cycloidal, s.pool.from_stock) {
        (false, _, _) => "Not coaxial",
        (true, false, _) => "Hand arbor coaxial with the input (reverted train: one centre distance)",
        (true, true, false) => {
            "Hand arbor coaxial with the input (reverted train: one centre distance, a module per pair)"
        }
        (true, true, true) => {
            "Hand arbor coaxial with the input (reverted train: pairs of one centre distance)"
        }
    };
    if cycloidal {
        d.line(format!("{coaxial}; cycloidal teeth; least contact ratio {}", fmt_num(s.min_contact_ratio)));
    } else {
        d.line(format!(
            "{coaxial}; involute teeth; undercut pinions {}; least contact ratio {}",
            if s.allow_undercut { "accepted" } else { "refused" },
            fmt_num(s.min_contact_ratio)
        ));
    }
    d.blank();
    d.line(listing_line(
        p.count,
        p.gear_set_count,
        p.trains.len(),
        p.complete,
        "by error, then meshes, then size",
    ));
    if !p.trains.is_empty() {
        let rows = set_rows(
            p.trains.len(),
            |k| (&p.trains[k], p.cycloidal.get(k).map_or(&[][..], |v| &v[..])),
            |k| p.others_of(k).iter().map(|a| (&a.train, &a.cycloidal[..])).collect(),
            |k, (t, pairs)| {
                let mut r = mesh_cells(t, p.is_hour_motion_work(t), pairs);
                r.push(t.ratio.to_string());
                r.push(describe_error(&t.error));
                r.push(p.arrangements_of(k).to_string());
                r
            },
        );
        d.table(
            Table::new(
                &[
                    "#",
                    "pinion → wheel",
                    if cycloidal {
                        "mesh (module, centre distance, contact ratio, action before the line of centres)"
                    } else {
                        "mesh (working centre distance, shifts, contact ratio)"
                    },
                    "ratio i",
                    "error",
                    "arrangements",
                ],
                &[0, 5],
            )
            .with_rows(rows),
        );
    }
    on_hand(&mut d, p.trains.iter());
    if cycloidal {
        footer(&mut d, &[
            "Pinions drive wheels (a reduction). Teeth are cycloidal wheel-and-pinion teeth, unshifted, each pair at",
            "m·(z1 + z2)/2; ε is the leaves in action on average; the share of each leaf's action before the line",
            "of centres engages with friction (a driving pinion has most of it there).",
        ]);
    } else {
        footer(&mut d, &[
            "Pinions drive wheels (a reduction). Meshes are worked out as involute gears, shifts x in modules;",
            "clock wheels and pinions are usually cut with cycloidal teeth.",
        ]);
    }
    d
}

/// `v` to `digits` significant figures, without trailing zeros after the point (all of
/// [`fmt_num`]'s for `None`).
fn significant(v: f64, digits: Option<u32>) -> String {
    match digits {
        Some(n) if n > 0 && v != 0.0 => {
            let places = (n as i32 - 1 - v.abs().log10().floor() as i32).max(0) as usize;
            let v = crate::trades::clock::astro::round_significant(v, Some(n));
            crate::report::fields::decimals(v, places)
        }
        _ => fmt_num(v),
    }
}

/// Days for people: `438200 d (1199.8 years)`, to the significant figures the period supports,
/// or `never (exact)`.
pub fn describe_days(d: Option<f64>, digits: Option<u32>) -> String {
    match (d, digits) {
        (None, _) => "never (exact)".into(),
        (Some(_), Some(0)) => "beyond the period's digits".into(),
        (Some(d), _) if d >= 1e12 => "over 10¹² d".into(),
        (Some(d), None) => {
            format!("{:.0} d ({} years)", d, fmt_num(d / crate::trades::clock::astro::DAYS_PER_YEAR))
        }
        (Some(d), digits) => format!(
            "{} d ({} years)",
            significant(d, digits),
            significant(d / crate::trades::clock::astro::DAYS_PER_YEAR, digits)
        ),
    }
}

/// Drift for people: `+0.000662 d/yr`, or `+1.5e-9 d/yr` when very small; "within the period's
/// digits" when the period's own uncertainty is larger.
pub fn describe_drift(d: f64, digits: Option<u32>) -> String {
    if digits == Some(0) {
        "within the period's digits".into()
    } else if d == 0.0 {
        "0 d/yr".into()
    } else if d.abs() < 1e-4 {
        format!("{d:+.2e} d/yr")
    } else {
        format!("{d:+.6} d/yr")
    }
}

/// A astronomical-train search as a document.
pub fn astro(p: &AstroPlan) -> Document {
    let mut d = Document::new();
    let s = &p.spec;
    let r = s.ratio();
    let from = match s.from {
        crate::trades::clock::astro::InputArbor::Daily => "an arbor turning once a day",
        crate::trades::clock::astro::InputArbor::Hourly => "an arbor turning once an hour",
    };
    d.title(format!("Astronomical train: {} ({}; {})", s.period.name, s.period.description, s.period.basis));
    d.line(format!("From {from} to a dial turning once per period: i = {r} = {:.9}", r.to_f64()));
    d.line(format!(
        "Gears: {}; stages {}; tolerance {}",
        s.pool.describe(),
        s.stages,
        describe_tolerance(s.tolerance.to_f64())
    ));
    d.blank();
    let order = "by error, then meshes, then size";
    if p.counted_all {
        d.line(listing_line(p.count, p.gear_set_count, p.trains.len(), p.complete, order));
    } else {
        let within = p.counted_within.map(|e| e.to_f64().abs());
        d.line(lower_bound_line(p.count, p.gear_set_count, p.trains.len(), p.complete, within, order));
    }
    if !p.trains.is_empty() {
        let rows = set_rows(
            p.trains.len(),
            |k| &p.trains[k].train,
            |k| p.trains[k].others.iter().collect(),
            |k, t| {
                let a = &p.trains[k];
                let st: Vec<String> =
                    t.stages.iter().map(|x| format!("{} → {}", x.driver.teeth, x.driven.teeth)).collect();
                vec![
                    st.join(", "),
                    t.ratio.to_string(),
                    format!("{:.9} d", a.period_days),
                    describe_error(&t.error),
                    describe_drift(a.drift_days_per_year, a.significant_digits),
                    describe_days(a.days_to_one_day, a.significant_digits),
                    a.arrangements.to_string(),
                ]
            },
        );
        d.table(
            Table::new(
                &[
                    "#",
                    "driver → driven",
                    "ratio i",
                    "dial period",
                    "error",
                    "drift",
                    "until 1 day out",
                    "arrangements",
                ],
                &[0, 7],
            )
            .with_rows(rows),
        );
    }
    d.blank();
    d.heading(format!("Convergents of {r} (the best fractions with small parts):"));
    let rows: Vec<Vec<String>> = p
        .convergents
        .iter()
        .map(|c| {
            vec![
                c.ratio.to_string(),
                describe_drift(c.drift_days_per_year, c.significant_digits),
                match c.blocking_prime {
                    Some(q) => format!("no train: needs the prime {q}, above the largest gear"),
                    None => String::new(),
                },
            ]
        })
        .collect();
    d.table(Table::new(&["fraction", "drift", ""], &[]).with_rows(rows));
    on_hand(&mut d, p.trains.iter().map(|a| &a.train));
    footer(&mut d, &["Drift > 0: the dial runs ahead. A year is 365.2425 days (mean Gregorian year)."]);
    d
}

/// A striking-train search as a document: the blows and the run, the whole train, then each
/// part with its own table.
pub fn strike(p: &StrikePlan) -> Document {
    let mut d = Document::new();
    let s = &p.spec;
    d.title("Striking train (count wheel)");
    d.line(format!(
        "Blows: {} in 12 hours ({}); {} pins on the pin wheel, one blow each",
        p.blows_per_12_hours,
        if s.half_hours { "1 + 2 + … + 12 = 78, and one at each half hour" } else { "1 + 2 + … + 12" },
        s.pins
    ));
    let hours = s.run_hours.to_f64();
    d.line(format!(
        "Run: {} at a winding ({} h): {} blows, {} turns of the pin wheel, {} turns of the barrel (great wheel)",
        describe_hours(hours),
        fmt_num(hours),
        fmt_num(p.blows_in_run.to_f64()),
        fmt_num(p.pin_wheel_turns.to_f64()),
        fmt_num(s.barrel_turns.to_f64())
    ));
    d.line(format!(
        "Locking wheel: once a blow; warning wheel: {} turns a blow; fly: {} turns a turn of the warning wheel \
         ({} a blow); count wheel: once in 12 hours",
        s.warning_turns,
        s.fly_turns,
        s.warning_turns * s.fly_turns
    ));
    d.line(format!(
        "Gears: {}; wheels {}, pinions {} leaves{}",
        s.pool.describe(),
        s.wheels,
        s.pinions,
        match s.meshes {
            Some(m) => format!(
                "; meshes checked: {} teeth, least contact ratio {}",
                m.tooth_form.as_str(),
                fmt_num(m.min_contact_ratio)
            ),
            None => String::new(),
        }
    ));
    if p.found() {
        let firsts: Vec<String> = p
            .parts
            .iter()
            .map(|g| {
                let t = &g.trains[0];
                let names = g.part.arbor_names(t.stages.len());
                t.stages
                    .iter()
                    .enumerate()
                    .map(|(k, st)| {
                        let wheel =
                            |n: &str| if n.ends_with("wheel") { n.to_string() } else { format!("{n} wheel") };
                        if g.part.drivers.lo < g.part.driven.lo {
                            format!(
                                "{} pinion {} → {} {}",
                                names[k],
                                st.driver.teeth,
                                wheel(&names[k + 1]),
                                st.driven.teeth
                            )
                        } else {
                            format!(
                                "{} {} → {} pinion {}",
                                wheel(&names[k]),
                                st.driver.teeth,
                                names[k + 1],
                                st.driven.teeth
                            )
                        }
                    })
                    .collect::<Vec<_>>()
                    .join("; ")
            })
            .collect();
        d.blank();
        d.line(format!("Whole train 1: {}", firsts.join("; ")));
    }
    for g in &p.parts {
        d.blank();
        let (from, to) = (&g.part.arbors[0], &g.part.arbors[g.part.arbors.len() - 1]);
        d.heading(format!("{} to {}: i = {} exactly", capitalise(from), to, g.part.ratio));
        part_table(&mut d, g, None);
    }
    footer(
        &mut d,
        &[
            "Wheels drive pinions from the great wheel to the fly; a pinion on the pin wheel's arbor drives the count wheel.",
            "Each part's arbors turn so many times per turn of its first arbor; the train runs only while it strikes.",
        ],
    );
    d
}

fn capitalise(s: &str) -> String {
    let mut c = s.chars();
    match c.next() {
        Some(f) => f.to_uppercase().chain(c).collect(),
        None => String::new(),
    }
}
