//! The JSON format for clock trains. Each train is the train object of `search`
//! ([`crate::report::fields::TrainJson`]) plus the clock's own fields:
//!
//! ```text
//! going:  {"arbors": [{"arbor": "centre", "turns_per_hour": f64}, …], "rate_s_per_day": f64}
//! motion: {"stage_names": [{"driver": "cannon pinion", "driven": "minute wheel"}, …],
//!          "cycloidal": [{…one pair's proportions…}, …] (cycloidal teeth only)}
//! astro:  {"period_days": f64, "drift_days_per_year": f64, "days_to_one_day": f64|null}
//! ```
//! A document is `{"schema_version", "clock_train": "going"|"motion"|"astro", …what was asked…, "count",
//! "gear_set_count", "complete", "convention", "train_runs", "trains": […]}`; an astro document adds
//! `"convergents"` and, after `gear_set_count`, `"count_kind"` (`"exact"`, or `"lower_bound"` when
//! only the trains met on the way to the listed best were counted) with, for lower bounds only,
//! `"counted_within"` (the |error| within which every train was counted). Each listed train is a gear set's first arrangement in stage order, with
//! `"arrangements"` (how many its set has) and, when every arrangement was asked for,
//! `"other_arrangements"` (the others, each in the same form). A striking train's parts, and a
//! going train's `great_wheel`, carry their own `count`, `gear_set_count` and trains so.

use std::io::Write;

use serde::Serialize;

use super::document::arbor_names;
use super::train_json;
use crate::geometry::CycloidalMesh;
use crate::model::train::Train;
use crate::report::fields::{TargetJson, TrainJson};
use crate::report::search::json::CountKind;
use crate::report::words::CONVENTION;
use crate::report::{write_json, RenderError, SCHEMA_VERSION};
use crate::trades::clock::astro::AstroPlan;
use crate::trades::clock::going::{GoingPlan, GoingTrain};
use crate::trades::clock::motion::{stage_names, MotionPlan};
use crate::trades::clock::part::PartPlan;
use crate::trades::clock::strike::StrikePlan;

#[derive(Serialize)]
struct ArborJson {
    arbor: String,
    turns_per_hour: f64,
}

/// One cycloidal pair: each figure driver first.
#[derive(Serialize)]
struct CycloidalJson {
    centre_distance_mm: f64,
    pitch_diameter_mm: [f64; 2],
    addendum_mm: [f64; 2],
    dedendum_mm: [f64; 2],
    tip_diameter_mm: [f64; 2],
    root_diameter_mm: [f64; 2],
    thickness_mm: [f64; 2],
    tip_radius_mm: [f64; 2],
    contact_ratio: f64,
    before_line_fraction: f64,
}

fn cycloidal_json(pairs: &[CycloidalMesh]) -> Option<Vec<CycloidalJson>> {
    (!pairs.is_empty()).then(|| {
        pairs
            .iter()
            .map(|c| {
                let both = |f: fn(&crate::geometry::cycloidal::CycloidalGear) -> f64| {
                    [f(&c.gears[0]), f(&c.gears[1])]
                };
                CycloidalJson {
                    centre_distance_mm: c.centre_distance_mm,
                    pitch_diameter_mm: both(|g| g.pitch_diameter_mm),
                    addendum_mm: both(|g| g.addendum_mm),
                    dedendum_mm: both(|g| g.dedendum_mm),
                    tip_diameter_mm: both(|g| g.tip_diameter_mm),
                    root_diameter_mm: both(|g| g.root_diameter_mm),
                    thickness_mm: both(|g| g.thickness_mm),
                    tip_radius_mm: both(|g| g.tip_radius_mm),
                    contact_ratio: c.contact_ratio,
                    before_line_fraction: c.before_line_fraction,
                }
            })
            .collect()
    })
}

#[derive(Serialize)]
struct GoingTrainJson {
    #[serde(flatten)]
    train: TrainJson,
    arbors: Vec<ArborJson>,
    rate_s_per_day: f64,
    seconds_arbor: Option<String>,
    #[serde(skip_serializing_if = "Option::is_none")]
    cycloidal: Option<Vec<CycloidalJson>>,
    #[serde(skip_serializing_if = "Vec::is_empty")]
    other_arrangements: Vec<GoingTrainJson>,
}

/// One train of a part (great wheel to centre arbor, or of a striking train).
#[derive(Serialize)]
struct PartTrainJson {
    #[serde(flatten)]
    train: TrainJson,
    arbors: Vec<ArborJson>,
    #[serde(skip_serializing_if = "Option::is_none")]
    cycloidal: Option<Vec<CycloidalJson>>,
    #[serde(skip_serializing_if = "Vec::is_empty")]
    other_arrangements: Vec<PartTrainJson>,
}

/// A part of a train searched on its own.
#[derive(Serialize)]
struct PartJson {
    from_arbor: String,
    to_arbor: String,
    ratio_needed: String,
    count: u64,
    gear_set_count: Option<u64>,
    complete: bool,
    trains: Vec<PartTrainJson>,
}

fn part_json(g: &PartPlan, from_turns_per_hour: f64) -> PartJson {
    let one =
        |t: &Train, pairs: &[CycloidalMesh], arrangements: u64, others: Vec<PartTrainJson>| PartTrainJson {
            train: TrainJson { arrangements: Some(arrangements), ..train_json(t, pairs) },
            arbors: g
                .part
                .arbor_names(t.stages.len())
                .into_iter()
                .zip(crate::trades::clock::arbor_speeds(t, from_turns_per_hour))
                .map(|(arbor, turns_per_hour)| ArborJson { arbor, turns_per_hour })
                .collect(),
            cycloidal: cycloidal_json(pairs),
            other_arrangements: others,
        };
    PartJson {
        from_arbor: g.part.arbors[0].clone(),
        to_arbor: g.part.arbors[g.part.arbors.len() - 1].clone(),
        ratio_needed: g.part.ratio.to_string(),
        count: g.count,
        gear_set_count: g.gear_set_count,
        complete: g.complete,
        trains: g
            .trains
            .iter()
            .enumerate()
            .map(|(k, t)| {
                let n = g.arrangements_of(k);
                let others =
                    g.others_of(k).iter().map(|a| one(&a.train, &a.cycloidal, n, Vec::new())).collect();
                one(t, g.pairs(k), n, others)
            })
            .collect(),
    }
}

/// What the run time asks of the barrel.
#[derive(Serialize)]
struct RunJson {
    run_hours: f64,
    barrel_turns: f64,
    drop_m: Option<f64>,
}

#[derive(Serialize)]
struct GoingDoc {
    schema_version: u32,
    clock_train: &'static str,
    period_s: f64,
    beats_per_hour: f64,
    beats_per_minute: f64,
    escape_teeth: u32,
    beats_per_tooth: u32,
    escape_turns_per_hour: f64,
    from_turns_per_hour: f64,
    ratio_needed: String,
    ratio_needed_exact: bool,
    rate_tolerance_s_per_day: f64,
    tooth_form: Option<&'static str>,
    run: Option<RunJson>,
    great_wheel: Option<PartJson>,
    count: u64,
    gear_set_count: Option<u64>,
    complete: bool,
    convention: &'static str,
    train_runs: &'static str,
    trains: Vec<GoingTrainJson>,
}

/// One going train with its set's arrangements, its others under it.
fn going_train_json(g: &GoingTrain) -> GoingTrainJson {
    let names = arbor_names(g.train.stages.len(), "centre");
    GoingTrainJson {
        train: TrainJson { arrangements: Some(g.arrangements), ..train_json(&g.train, &g.cycloidal) },
        cycloidal: cycloidal_json(&g.cycloidal),
        arbors: names
            .iter()
            .zip(&g.arbor_turns_per_hour)
            .map(|(arbor, v)| ArborJson { arbor: arbor.clone(), turns_per_hour: *v })
            .collect(),
        seconds_arbor: g.seconds_arbor.map(|k| names[k].clone()),
        rate_s_per_day: g.rate_s_per_day,
        other_arrangements: g.others.iter().map(going_train_json).collect(),
    }
}

/// Write a going-train search as one JSON document.
pub fn write_going(p: &GoingPlan, w: &mut dyn Write) -> Result<(), RenderError> {
    let s = &p.spec;
    let (ratio, exact) = s.needed_ratio();
    let doc = GoingDoc {
        schema_version: SCHEMA_VERSION,
        clock_train: "going",
        period_s: s.beat.period_s(),
        beats_per_hour: s.beat.beats_per_hour,
        beats_per_minute: s.beat.beats_per_hour / 60.0,
        escape_teeth: s.escapement.teeth,
        beats_per_tooth: s.escapement.beats_per_tooth,
        escape_turns_per_hour: p.escape_turns_per_hour,
        from_turns_per_hour: s.from_turns_per_hour.to_f64(),
        ratio_needed: ratio.to_string(),
        ratio_needed_exact: exact,
        rate_tolerance_s_per_day: s.rate_tolerance_s_per_day.to_f64(),
        tooth_form: s.meshes.map(|m| m.tooth_form.as_str()),
        run: p.run.map(|r| RunJson {
            run_hours: r.run_hours.to_f64(),
            barrel_turns: r.barrel_turns.to_f64(),
            drop_m: r.drop_m,
        }),
        great_wheel: p.great.as_ref().map(|g| part_json(g, s.from_turns_per_hour.to_f64())),
        count: p.count,
        gear_set_count: p.gear_set_count,
        complete: p.complete,
        convention: CONVENTION,
        train_runs:
            "input = centre arbor (once an hour), output = escape arbor; wheels drive pinions, so i < 1; \
                     great_wheel: input = great wheel, output = centre arbor",
        trains: p.trains.iter().map(going_train_json).collect(),
    };
    write_json(&doc, w)
}

#[derive(Serialize)]
struct NamesJson {
    driver: String,
    driven: String,
}

#[derive(Serialize)]
struct MotionTrainJson {
    #[serde(flatten)]
    train: TrainJson,
    stage_names: Vec<NamesJson>,
    #[serde(skip_serializing_if = "Option::is_none")]
    cycloidal: Option<Vec<CycloidalJson>>,
    #[serde(skip_serializing_if = "Vec::is_empty")]
    other_arrangements: Vec<MotionTrainJson>,
}

#[derive(Serialize)]
struct MotionDoc {
    schema_version: u32,
    clock_train: &'static str,
    target: TargetJson,
    coaxial: bool,
    tooth_form: &'static str,
    allow_undercut: bool,
    min_contact_ratio: f64,
    count: u64,
    gear_set_count: Option<u64>,
    complete: bool,
    convention: &'static str,
    train_runs: &'static str,
    trains: Vec<MotionTrainJson>,
}

/// One motion-work train with its set's arrangements (`n`) and its others under it.
fn motion_train_json(
    p: &MotionPlan,
    t: &Train,
    pairs: &[CycloidalMesh],
    n: u64,
    others: Vec<MotionTrainJson>,
) -> MotionTrainJson {
    MotionTrainJson {
        train: TrainJson { arrangements: Some(n), ..train_json(t, pairs) },
        cycloidal: cycloidal_json(pairs),
        stage_names: (0..t.stages.len())
            .map(|k| {
                let (driver, driven) = stage_names(k, p.is_hour_motion_work(t));
                NamesJson { driver, driven }
            })
            .collect(),
        other_arrangements: others,
    }
}

/// Write a motion-work search as one JSON document.
pub fn write_motion(p: &MotionPlan, w: &mut dyn Write) -> Result<(), RenderError> {
    let s = &p.spec;
    let doc = MotionDoc {
        schema_version: SCHEMA_VERSION,
        clock_train: "motion",
        target: TargetJson {
            ratio: s.ratio_text.clone(),
            value: s.ratio.to_f64(),
            tolerance: s.tolerance.to_f64(),
            exact: s.ratio.to_string(),
        },
        coaxial: s.coaxial,
        tooth_form: s.tooth_form.as_str(),
        allow_undercut: s.allow_undercut,
        min_contact_ratio: s.min_contact_ratio,
        count: p.count,
        gear_set_count: p.gear_set_count,
        complete: p.complete,
        convention: CONVENTION,
        train_runs:
            "input = minute (cannon) arbor or the arbor given, output = hand; pinions drive wheels, so i > 1",
        trains: (0..p.trains.len())
            .map(|k| {
                let n = p.arrangements_of(k);
                let pairs = p.cycloidal.get(k).map_or(&[][..], |v| &v[..]);
                let others = p
                    .others_of(k)
                    .iter()
                    .map(|a| motion_train_json(p, &a.train, &a.cycloidal, n, Vec::new()));
                motion_train_json(p, &p.trains[k], pairs, n, others.collect())
            })
            .collect(),
    };
    write_json(&doc, w)
}

#[derive(Serialize)]
struct AstroTrainJson {
    #[serde(flatten)]
    train: TrainJson,
    period_days: f64,
    drift_days_per_year: f64,
    days_to_one_day: Option<f64>,
    significant_digits: Option<u32>,
}

#[derive(Serialize)]
struct ConvergentJson {
    ratio: String,
    drift_days_per_year: f64,
    significant_digits: Option<u32>,
    blocking_prime: Option<u64>,
}

#[derive(Serialize)]
struct AstroDoc {
    schema_version: u32,
    clock_train: &'static str,
    period: String,
    target_period_days: String,
    basis: &'static str,
    period_half_unit_days: String,
    input_turns_per_day: u64,
    target: TargetJson,
    count: u64,
    gear_set_count: Option<u64>,
    count_kind: CountKind,
    #[serde(skip_serializing_if = "Option::is_none")]
    counted_within: Option<f64>,
    complete: bool,
    convention: &'static str,
    train_runs: &'static str,
    trains: Vec<AstroTrainJson>,
    convergents: Vec<ConvergentJson>,
}

/// Write an astronomical-train search as one JSON document.
pub fn write_astro(p: &AstroPlan, w: &mut dyn Write) -> Result<(), RenderError> {
    let s = &p.spec;
    let doc = AstroDoc {
        schema_version: SCHEMA_VERSION,
        clock_train: "astro",
        period: s.period.name.clone(),
        target_period_days: s.period.days.to_string(),
        basis: s.period.basis,
        period_half_unit_days: s.period.half_unit_days.to_string(),
        input_turns_per_day: s.from.turns_per_day(),
        target: TargetJson {
            ratio: s.ratio().to_string(),
            value: s.ratio().to_f64(),
            tolerance: s.tolerance.to_f64(),
            exact: s.ratio().to_string(),
        },
        count: p.count,
        gear_set_count: p.gear_set_count,
        count_kind: if p.counted_all { CountKind::Exact } else { CountKind::LowerBound },
        counted_within: p.counted_within.map(|e| e.to_f64().abs()),
        complete: p.complete,
        convention: CONVENTION,
        train_runs: "input = daily or hourly arbor, output = dial turning once per period",
        trains: p
            .trains
            .iter()
            .map(|a| AstroTrainJson {
                train: TrainJson {
                    arrangements: Some(a.arrangements),
                    other_arrangements: a.others.iter().map(TrainJson::from_train).collect(),
                    ..TrainJson::from_train(&a.train)
                },
                period_days: a.period_days,
                drift_days_per_year: a.drift_days_per_year,
                days_to_one_day: a.days_to_one_day,
                significant_digits: a.significant_digits,
            })
            .collect(),
        convergents: p
            .convergents
            .iter()
            .map(|c| ConvergentJson {
                ratio: c.ratio.to_string(),
                drift_days_per_year: c.drift_days_per_year,
                significant_digits: c.significant_digits,
                blocking_prime: c.blocking_prime,
            })
            .collect(),
    };
    write_json(&doc, w)
}

#[derive(Serialize)]
struct StrikeDoc {
    schema_version: u32,
    clock_train: &'static str,
    pins: u32,
    half_hours: bool,
    blows_per_12_hours: u32,
    run_hours: f64,
    barrel_turns: f64,
    blows_in_run: f64,
    pin_wheel_turns: f64,
    warning_turns: u32,
    fly_turns: u32,
    tooth_form: Option<&'static str>,
    complete: bool,
    convention: &'static str,
    train_runs: &'static str,
    parts: Vec<PartJson>,
}

/// Write a striking-train search as one JSON document; each part's arbors turn so many times
/// per turn of its first arbor.
pub fn write_strike(p: &StrikePlan, w: &mut dyn Write) -> Result<(), RenderError> {
    let s = &p.spec;
    let doc = StrikeDoc {
        schema_version: SCHEMA_VERSION,
        clock_train: "strike",
        pins: s.pins,
        half_hours: s.half_hours,
        blows_per_12_hours: p.blows_per_12_hours,
        run_hours: s.run_hours.to_f64(),
        barrel_turns: s.barrel_turns.to_f64(),
        blows_in_run: p.blows_in_run.to_f64(),
        pin_wheel_turns: p.pin_wheel_turns.to_f64(),
        warning_turns: s.warning_turns,
        fly_turns: s.fly_turns,
        tooth_form: s.meshes.map(|m| m.tooth_form.as_str()),
        complete: p.complete(),
        convention: CONVENTION,
        train_runs: "each part: input = its first arbor, output = its last; wheels drive pinions, but a pinion \
                     drives the count wheel; an arbor's turns_per_hour is its turns per turn of the part's first arbor",
        parts: p.parts.iter().map(|g| part_json(g, 1.0)).collect(),
    };
    write_json(&doc, w)
}
